-- The proficiency-testing provider named on a scheme's reports, where it differs from the installation's
-- (roundtable.reports.provider-*). Read when a report is issued, so a change applies to documents issued afterwards.

ALTER TABLE scheme ADD COLUMN provider_name varchar(200);
ALTER TABLE scheme ADD COLUMN provider_address varchar(500);
ALTER TABLE scheme ADD COLUMN provider_accreditation varchar(100);
