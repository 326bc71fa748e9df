-- Homogeneity of a precision experiment's materials: the same checks as a proficiency round's sample (table
-- qualification_check), one per level (material) and measurand. level_label names the level; it is NULL for the
-- checks of a proficiency round, whose items are one material. sigma_pt holds the target standard deviation the
-- between-item SD is compared with (for a precision experiment the expected s_R the coordinator gives).
ALTER TABLE qualification_check ADD COLUMN level_label varchar(8);
CREATE INDEX qualification_check_level_idx ON qualification_check (round_id, level_label, element, kind, id)
    WHERE level_label IS NOT NULL;
