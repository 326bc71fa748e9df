-- Blank-corrected trace elements may legitimately be negative: whether a measurand accepts negative results is the
-- evaluation plan's choice (negativeAllowed), checked by the intake before anything is stored. The stored numbers
-- therefore lose their "not negative" checks; the reported text stays exactly as reported beside them.
ALTER TABLE reported_result DROP CONSTRAINT reported_result_reported_number_check;
ALTER TABLE reported_result DROP CONSTRAINT reported_result_value_in_measurand_unit_check;
