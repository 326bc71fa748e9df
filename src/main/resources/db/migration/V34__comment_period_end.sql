-- The comment period on a round's preliminary report has an end that laboratories are told in time: its length is
-- a setting of the round (days, 14 unless set), its end is fixed when the coordinator opens the period.
ALTER TABLE round ADD COLUMN comment_period_days integer NOT NULL DEFAULT 14
    CHECK (comment_period_days BETWEEN 1 AND 90);
ALTER TABLE round ADD COLUMN comment_period_ends_at timestamptz;
CREATE INDEX round_comment_period_end_idx ON round (comment_period_ends_at) WHERE comment_period_ends_at IS NOT NULL;
