-- Result submissions. A laboratory has one submission per round; every accepted submit is a new, immutable
-- revision (the latest counts). Revisions, their results, uploaded files and messages are append-only.

CREATE TABLE submission (
    id                bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id          bigint       NOT NULL REFERENCES round (id),
    laboratory_id     bigint       NOT NULL REFERENCES laboratory (id),
    current_revision  integer      NOT NULL DEFAULT 0 CHECK (current_revision >= 0),
    created_at        timestamptz  NOT NULL,
    updated_at        timestamptz  NOT NULL,
    version           integer      NOT NULL DEFAULT 0,
    UNIQUE (round_id, laboratory_id)
);

CREATE TABLE submission_revision (
    id                   bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    submission_id        bigint       NOT NULL REFERENCES submission (id),
    revision             integer      NOT NULL CHECK (revision >= 1),
    channel              varchar(16)  NOT NULL CHECK (channel IN ('FORM', 'CSV', 'XLSX', 'JSON', 'CORRECTION')),
    receipt_id           varchar(40)  NOT NULL UNIQUE,
    payload_sha256       char(64)     NOT NULL CHECK (payload_sha256 ~ '^[0-9a-f]{64}$'),
    canonical_payload    text         NOT NULL,
    -- SHA-256 of the reported values only, to find identical result vectors from different laboratories
    values_sha256        char(64)     NOT NULL,
    submitted_by         varchar(128) NOT NULL,
    submitted_role       varchar(32)  NOT NULL,
    submitted_at         timestamptz  NOT NULL,
    late                 boolean      NOT NULL,
    warnings_json        text         NOT NULL DEFAULT '[]',
    detection_json       text,
    -- keyed hash of the client address, for the near-simultaneous-submission flag; never the address itself
    client_fingerprint   char(64),
    correction_reason    varchar(2000),
    correction_evidence  varchar(2000),
    UNIQUE (submission_id, revision),
    CHECK ((channel = 'CORRECTION') = (correction_reason IS NOT NULL))
);
CREATE INDEX submission_revision_values_idx ON submission_revision (values_sha256);

CREATE TABLE reported_result (
    revision_id               bigint        NOT NULL REFERENCES submission_revision (id),
    element                   varchar(2)    NOT NULL,
    item_label                varchar(8)    NOT NULL,
    value_as_reported         varchar(64)   NOT NULL,
    unit_as_reported          varchar(16)   NOT NULL,
    less_than                 boolean       NOT NULL,
    -- the reported number in the reported unit, and the same converted exactly to the measurand's unit
    reported_number           numeric       NOT NULL CHECK (reported_number >= 0),
    value_in_measurand_unit   numeric       NOT NULL CHECK (value_in_measurand_unit >= 0),
    expanded_uncertainty_as_reported varchar(64),
    expanded_uncertainty      numeric       CHECK (expanded_uncertainty > 0),
    coverage_factor           numeric       NOT NULL CHECK (coverage_factor >= 1 AND coverage_factor <= 4),
    method_group              varchar(32)   NOT NULL,
    replicates                integer       CHECK (replicates >= 1),
    replicate_values          varchar(1000),
    PRIMARY KEY (revision_id, element, item_label)
);

CREATE TABLE submission_upload (
    revision_id     bigint        PRIMARY KEY REFERENCES submission_revision (id),
    file_name       varchar(200)  NOT NULL,
    content_type    varchar(100)  NOT NULL,
    size_bytes      integer       NOT NULL CHECK (size_bytes >= 0),
    sha256          char(64)      NOT NULL,
    content         bytea         NOT NULL
);

-- Questions and comments between a laboratory and the coordinator about a submission.
CREATE TABLE submission_message (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id        bigint        NOT NULL REFERENCES round (id),
    laboratory_id   bigint        NOT NULL REFERENCES laboratory (id),
    from_coordinator boolean      NOT NULL,
    author          varchar(128)  NOT NULL,
    body            varchar(4000) NOT NULL CHECK (length(body) > 0),
    posted_at       timestamptz   NOT NULL
);
CREATE INDEX submission_message_thread_idx ON submission_message (round_id, laboratory_id, id);

-- Automatic flags for the coordinator's review (never shown to laboratories).
CREATE TABLE review_flag (
    id                   bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id             bigint        NOT NULL REFERENCES round (id),
    kind                 varchar(32)   NOT NULL CHECK (kind IN ('IDENTICAL_RESULTS', 'NEAR_SIMULTANEOUS')),
    laboratory_id        bigint        NOT NULL REFERENCES laboratory (id),
    other_laboratory_id  bigint        NOT NULL REFERENCES laboratory (id),
    detail               varchar(1000) NOT NULL,
    raised_at            timestamptz   NOT NULL
);
CREATE INDEX review_flag_round_idx ON review_flag (round_id);

DO $$
DECLARE
    t text;
BEGIN
    FOREACH t IN ARRAY ARRAY['submission_revision', 'reported_result', 'submission_upload', 'submission_message', 'review_flag']
    LOOP
        EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %I FROM ${appRole}', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_is_append_only', t);
    END LOOP;
END
$$;
