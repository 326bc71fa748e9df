-- Results the coordinator marks as blunders, and withdrawals of such marks. Append-only: a mark is never edited or
-- deleted; withdrawing it adds a row that names the mark and gives its own reason. A mark is current while no
-- withdrawal names it; an evaluation run leaves the current marks' results out of every statistic (they are still
-- scored against the assigned value) and hashes them into its inputs.
CREATE TABLE result_exclusion (
    id             bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id       bigint        NOT NULL REFERENCES round (id),
    action         varchar(8)    NOT NULL CHECK (action IN ('MARK', 'WITHDRAW')),
    laboratory_id  bigint        NOT NULL REFERENCES laboratory (id),
    element        varchar(2)    NOT NULL,
    item_label     varchar(8)    NOT NULL,
    -- the result as reported when it was marked (marks only)
    reported       varchar(64),
    -- the mark a withdrawal withdraws (withdrawals only; at most one withdrawal per mark)
    withdraws      bigint        UNIQUE REFERENCES result_exclusion (id),
    reason         varchar(500)  NOT NULL CHECK (length(btrim(reason)) > 0),
    recorded_by    varchar(128)  NOT NULL,
    recorded_at    timestamptz   NOT NULL,
    CHECK ((action = 'MARK') = (withdraws IS NULL)),
    CHECK ((action = 'MARK') = (reported IS NOT NULL))
);
CREATE INDEX result_exclusion_round_idx ON result_exclusion (round_id, id);
REVOKE UPDATE, DELETE, TRUNCATE ON result_exclusion FROM ${appRole};
CREATE TRIGGER result_exclusion_is_append_only
    BEFORE UPDATE OR DELETE ON result_exclusion
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

-- How each measurand was evaluated: the plan's quartile, stopping and boundary rules, its exclusion rules in words
-- and the qualification decision applied (JSON). Null for runs stored before this column existed. Adding a
-- nullable column and widening a varchar touch no existing row.
ALTER TABLE measurand_evaluation ADD COLUMN rules_json text;
-- room for "blunder: <reason>" (reasons have at most 500 characters)
ALTER TABLE participant_score ALTER COLUMN excluded_reason TYPE varchar(600);
