-- The audit page no longer re-verifies the whole chain on every view. A checkpoint records how far the chain was
-- verified (the last entry found intact and its hash, or the first broken entry and what is wrong with it) and
-- when; a view verifies only the entries after the latest checkpoint (a bounded number of them) and appends a new
-- checkpoint. The full check stays in `verify-audit` and in the page's on-demand job, which append a checkpoint
-- with full_check = true. Checkpoints are append-only like the trail itself.
CREATE TABLE audit_checkpoint (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    verified_to     bigint       NOT NULL CHECK (verified_to >= 0),
    head_hash       char(64)     NOT NULL,
    full_check      boolean      NOT NULL,
    intact          boolean      NOT NULL,
    broken_at       bigint,
    problem         varchar(1000),
    checked_by      varchar(128) NOT NULL,
    checked_at      timestamptz  NOT NULL,
    CHECK (intact = (broken_at IS NULL))
);

REVOKE UPDATE, DELETE, TRUNCATE ON audit_checkpoint FROM ${appRole};
CREATE TRIGGER audit_checkpoint_is_append_only
    BEFORE UPDATE OR DELETE ON audit_checkpoint
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

-- The page's filters walk these newest first (keyset paging on sequence_no), so a page of one actor, one kind of
-- action or one object is an index range scan however long the trail grows; the lists of actions and object types
-- offered by the filter are read with a loose index scan over the same indexes.
CREATE INDEX audit_event_actor_idx ON audit_event (actor, sequence_no);
CREATE INDEX audit_event_action_idx ON audit_event (action, sequence_no);
CREATE INDEX audit_event_object_idx ON audit_event (object_type, object_id, sequence_no);

-- The evaluation review's summary counts each measurand's results by verdict. A run never changes, so the counts
-- are taken once, on the first view of the run's summary (one pass over its scores, 500,000 rows for 10,000
-- laboratories x 50 measurands), and read from here afterwards: every later view reads one row per measurand.
CREATE TABLE measurand_verdict_count (
    run_id          bigint       NOT NULL REFERENCES evaluation_run (id),
    element         varchar(2)   NOT NULL,
    item_label      varchar(8)   NOT NULL,
    results         bigint       NOT NULL,
    satisfactory    bigint       NOT NULL,
    questionable    bigint       NOT NULL,
    unsatisfactory  bigint       NOT NULL,
    unclassified    bigint       NOT NULL,
    excluded        bigint       NOT NULL,
    PRIMARY KEY (run_id, element, item_label)
);

REVOKE UPDATE, DELETE, TRUNCATE ON measurand_verdict_count FROM ${appRole};
CREATE TRIGGER measurand_verdict_count_is_append_only
    BEFORE UPDATE OR DELETE ON measurand_verdict_count
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();
