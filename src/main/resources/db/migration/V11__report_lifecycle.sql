-- The life of a round's reports after evaluation: preliminary issue, comment period (laboratories comment on the
-- preliminary report, coordinators answer), sign-off, final issue and amendments. Every table here is
-- append-only for every role: a comment, an answer, a sign-off or a request to issue is a record, never edited.

-- Whether the scheme requires a second reviewer to sign each final or amended report (a different coordinator).
ALTER TABLE scheme ADD COLUMN second_reviewer_required boolean NOT NULL DEFAULT false;

-- A request to issue a round's reports from one evaluation run, carried out by a background job (kind
-- 'report-issue', payload {"reportIssue":id}). The round report is issued last, so "the round report with this
-- number exists" means the request is done; a request whose job failed may be made again and reuses the numbers
-- (laboratory reports issued already are kept, not issued twice).
CREATE TABLE report_issue (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id              bigint        NOT NULL REFERENCES round (id),
    status                varchar(16)   NOT NULL CHECK (status IN ('PRELIMINARY', 'FINAL', 'AMENDED')),
    evaluation_run_id     bigint        NOT NULL REFERENCES evaluation_run (id),
    round_report_id       varchar(64)   NOT NULL,
    report_suffix         varchar(8)    NOT NULL,
    sign_off_sequence     integer,
    coordinator_comments  varchar(20000) NOT NULL DEFAULT '',
    amendment_reason      varchar(2000),
    requested_by          varchar(128)  NOT NULL,
    requested_by_name     varchar(200)  NOT NULL,
    requested_at          timestamptz   NOT NULL,
    CHECK ((status = 'AMENDED') = (amendment_reason IS NOT NULL AND length(trim(amendment_reason)) > 0)),
    CHECK ((status = 'PRELIMINARY') = (sign_off_sequence IS NULL))
);
CREATE INDEX report_issue_round_idx ON report_issue (round_id);

-- Sign-off of the next final or amended report of a round. sequence 0 signs the final report, 1 the first
-- amendment, and so on; all sign-offs of one sequence name the same evaluation run. One coordinator signs; a
-- scheme that requires it has a second, different coordinator sign as second reviewer.
CREATE TABLE report_sign_off (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id              bigint        NOT NULL REFERENCES round (id),
    sequence              integer       NOT NULL CHECK (sequence >= 0),
    evaluation_run_id     bigint        NOT NULL REFERENCES evaluation_run (id),
    role                  varchar(16)   NOT NULL CHECK (role IN ('COORDINATOR', 'SECOND_REVIEWER')),
    username              varchar(128)  NOT NULL,
    display_name          varchar(200)  NOT NULL,
    signed_at             timestamptz   NOT NULL,
    UNIQUE (round_id, sequence, role),
    UNIQUE (round_id, sequence, username)
);

-- A laboratory's comment on a preliminary round report, made during the comment period. Kept with the
-- participant code, so that coordinators read it as the laboratories are known in the report.
CREATE TABLE report_comment (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id              bigint        NOT NULL REFERENCES round (id),
    document_id           bigint        NOT NULL REFERENCES issued_document (id),
    laboratory_id         bigint        NOT NULL REFERENCES laboratory (id),
    participant_code      varchar(16)   NOT NULL,
    body                  varchar(4000) NOT NULL CHECK (length(trim(body)) > 0),
    written_by            varchar(128)  NOT NULL,
    written_at            timestamptz   NOT NULL
);
CREATE INDEX report_comment_round_idx ON report_comment (round_id);

-- A coordinator's answer to a comment; a comment may be answered more than once (a later answer adds to it).
CREATE TABLE report_comment_answer (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    comment_id            bigint        NOT NULL REFERENCES report_comment (id),
    body                  varchar(4000) NOT NULL CHECK (length(trim(body)) > 0),
    answered_by           varchar(128)  NOT NULL,
    answered_at           timestamptz   NOT NULL
);
CREATE INDEX report_comment_answer_comment_idx ON report_comment_answer (comment_id);

DO $$
DECLARE
    t text;
BEGIN
    FOREACH t IN ARRAY ARRAY['report_issue', 'report_sign_off', 'report_comment', 'report_comment_answer']
    LOOP
        EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %I FROM ${appRole}', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_is_append_only', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %I FOR EACH STATEMENT '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_no_truncate', t);
    END LOOP;
END
$$;
