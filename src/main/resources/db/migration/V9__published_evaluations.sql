-- Which evaluation run an issued document reports. Round and laboratory reports name the run they were rendered
-- from, so that what laboratories and auditors may read (scores, exports) follows from what has been issued:
-- laboratories see the run of the round's latest issued round report (preliminary on), auditors the run of the
-- latest final or amended one. Adding a nullable column does not touch existing rows; they stay as issued.

ALTER TABLE issued_document ADD COLUMN evaluation_run_id bigint REFERENCES evaluation_run (id);
CREATE INDEX issued_document_run_idx ON issued_document (evaluation_run_id) WHERE evaluation_run_id IS NOT NULL;
