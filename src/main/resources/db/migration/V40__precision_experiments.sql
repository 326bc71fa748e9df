-- Precision experiments (ISO 5725-2): a second kind of round. It shares schemes, enrolment, participant codes,
-- submissions and their revisions and receipts, the audit trail and issued documents with proficiency rounds;
-- its plan, replicate results, exclusion decisions and evaluation runs live in the tables below. Its levels
-- (materials) are the round's items, so dispatch and receipt work as for a proficiency round.

ALTER TABLE round ADD COLUMN kind varchar(24) NOT NULL DEFAULT 'PROFICIENCY_TEST'
    CHECK (kind IN ('PROFICIENCY_TEST', 'PRECISION_EXPERIMENT'));
-- a precision experiment sends one item per level (up to 12); a proficiency round still one item or a pair
ALTER TABLE round DROP CONSTRAINT round_items_per_laboratory_check;
ALTER TABLE round ADD CONSTRAINT round_items_per_laboratory_check
    CHECK (items_per_laboratory IN (1, 2) OR (kind = 'PRECISION_EXPERIMENT' AND items_per_laboratory BETWEEN 1 AND 12));
ALTER TABLE round ALTER COLUMN item_labels TYPE varchar(120);

-- Frozen plans of precision experiments: canonical JSON and its SHA-256; a change is a new version with a reason.
CREATE TABLE precision_plan (
    round_id        bigint        NOT NULL REFERENCES round (id),
    plan_version    integer       NOT NULL CHECK (plan_version >= 1),
    canonical_json  text          NOT NULL,
    sha256          char(64)      NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
    reason          varchar(1000) NOT NULL,
    frozen_by       varchar(128)  NOT NULL,
    frozen_at       timestamptz   NOT NULL,
    PRIMARY KEY (round_id, plan_version)
);

-- The replicate results of a submission revision of a precision experiment, one row per replicate as reported.
CREATE TABLE precision_replicate (
    revision_id        bigint       NOT NULL REFERENCES submission_revision (id),
    element            varchar(2)   NOT NULL,
    level_label        varchar(8)   NOT NULL,
    replicate          integer      NOT NULL CHECK (replicate BETWEEN 1 AND 10),
    value_as_reported  varchar(64)  NOT NULL,
    unit_as_reported   varchar(16)  NOT NULL,
    -- the reported number converted exactly to the measurand's unit
    value              numeric      NOT NULL,
    PRIMARY KEY (revision_id, element, level_label, replicate)
);

-- The coordinator's decisions to exclude a laboratory's cell (one measurand at one level) from the precision
-- values, and withdrawals of such decisions. Append-only, like result_exclusion: a decision is current while no
-- withdrawal names it. Nothing is ever excluded automatically.
CREATE TABLE precision_exclusion (
    id             bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id       bigint        NOT NULL REFERENCES round (id),
    action         varchar(8)    NOT NULL CHECK (action IN ('MARK', 'WITHDRAW')),
    laboratory_id  bigint        NOT NULL REFERENCES laboratory (id),
    element        varchar(2)    NOT NULL,
    level_label    varchar(8)    NOT NULL,
    withdraws      bigint        UNIQUE REFERENCES precision_exclusion (id),
    reason         varchar(500)  NOT NULL CHECK (length(btrim(reason)) > 0),
    recorded_by    varchar(128)  NOT NULL,
    recorded_at    timestamptz   NOT NULL,
    CHECK ((action = 'MARK') = (withdraws IS NULL))
);
CREATE INDEX precision_exclusion_round_idx ON precision_exclusion (round_id, id);

-- Evaluation runs of a precision experiment: numbered per round, never changed; the latest is in force.
CREATE TABLE precision_evaluation_run (
    id             bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id       bigint        NOT NULL REFERENCES round (id),
    run_number     integer       NOT NULL CHECK (run_number >= 1),
    plan_version   integer       NOT NULL,
    -- SHA-256 of the inputs: plan, current revisions' replicates and current exclusion decisions
    inputs_sha256  char(64)      NOT NULL,
    result_json    text          NOT NULL,
    created_by     varchar(128)  NOT NULL,
    created_at     timestamptz   NOT NULL,
    UNIQUE (round_id, run_number)
);

-- Which run an issued precision report was rendered from.
CREATE TABLE precision_report (
    document_id    bigint        PRIMARY KEY REFERENCES issued_document (id),
    run_id         bigint        NOT NULL REFERENCES precision_evaluation_run (id)
);

DO $$
DECLARE
    t text;
BEGIN
    FOREACH t IN ARRAY ARRAY['precision_plan', 'precision_replicate', 'precision_exclusion', 'precision_evaluation_run',
                             'precision_report']
    LOOP
        EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %I FROM ${appRole}', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_is_append_only', t);
    END LOOP;
END
$$;
