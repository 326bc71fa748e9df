-- Score rows reference their run and laboratory; the run writes them with COPY, a million rows for a round of
-- 10,000 laboratories x 100 measurands. A foreign key checks each row with its own lookup and row lock, which
-- doubled the cost of that COPY (docs/performance.md, "Evaluation"). The same references are now checked once per
-- statement, set-based, over the rows the statement inserted.
--
-- What the foreign keys also did, keeping a referenced row from going away, holds without them: runs are
-- append-only (no DELETE, V7), and a laboratory that has scores has a submission whose revisions are append-only
-- and reference it (V6), so it cannot be deleted either.

ALTER TABLE participant_score DROP CONSTRAINT participant_score_run_id_fkey;
ALTER TABLE participant_score DROP CONSTRAINT participant_score_laboratory_id_fkey;

CREATE FUNCTION check_participant_score_references() RETURNS trigger
    LANGUAGE plpgsql AS
$$
BEGIN
    -- one pass over the inserted rows; then a lookup per distinct reference (a run's rows share one run id and
    -- have as many laboratories as the round)
    IF EXISTS (WITH refs AS MATERIALIZED (SELECT DISTINCT run_id, laboratory_id FROM inserted)
               SELECT 1 FROM refs i
                WHERE NOT EXISTS (SELECT 1 FROM evaluation_run r WHERE r.id = i.run_id)
                   OR NOT EXISTS (SELECT 1 FROM laboratory l WHERE l.id = i.laboratory_id)) THEN
        RAISE EXCEPTION 'participant_score references an evaluation run or a laboratory that does not exist'
            USING ERRCODE = 'foreign_key_violation';
    END IF;
    RETURN NULL;
END
$$;

CREATE TRIGGER participant_score_references AFTER INSERT ON participant_score
    REFERENCING NEW TABLE AS inserted
    FOR EACH STATEMENT EXECUTE FUNCTION check_participant_score_references();
