-- The lines a run appended to its inputs text after the result lines: the blunder marks and the qualification
-- decisions in force when it ran (EvaluationAdjustments). Kept with the run so that an export can rebuild the
-- exact inputs text of a past run and prove it against the run's inputs hash. Empty for a run without them.
-- Adding a column with a default does not touch existing rows.

ALTER TABLE evaluation_run ADD COLUMN inputs_trailer text NOT NULL DEFAULT '';
