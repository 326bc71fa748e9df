-- A laboratory's record over rounds (feature "history"). The history keeps its own copy of what was published,
-- written when a round report naming an evaluation run is issued (report.RoundReportIssued): one row per issued
-- round report, each laboratory's scores in that report's run, and per measurand and method group the counts of
-- the field's verdicts. Pages read these tables only, never a live scan of every evaluation. All three are
-- append-only: what was published stays as published; a later report of the round is a new publication row, and
-- queries take the round's latest publication visible to the reader (laboratories: preliminary on; auditors:
-- final and amended only), as report.ReportVisibility does.

CREATE TABLE history_publication (
    document_id           bigint        PRIMARY KEY REFERENCES issued_document (id),
    round_id              bigint        NOT NULL REFERENCES round (id),
    scheme_id             bigint        NOT NULL REFERENCES scheme (id),
    scheme_name           varchar(200)  NOT NULL,
    round_code            varchar(64)   NOT NULL,
    report_id             varchar(64)   NOT NULL,
    status                varchar(16)   NOT NULL CHECK (status IN ('PRELIMINARY', 'FINAL', 'AMENDED')),
    report_sha256         char(64)      NOT NULL,
    evaluation_run_id     bigint        NOT NULL REFERENCES evaluation_run (id),
    evaluation_version    integer       NOT NULL,
    issued_at             timestamptz   NOT NULL,
    replaces_document_id  bigint
);
-- the round's publications, newest first (latest visible publication per round)
CREATE INDEX history_publication_round_idx ON history_publication (round_id, issued_at DESC, document_id DESC);
-- "is this publication replaced?" (amendments)
CREATE INDEX history_publication_replaces_idx ON history_publication (replaces_document_id)
    WHERE replaces_document_id IS NOT NULL;
-- the field view: a scheme's publications
CREATE INDEX history_publication_scheme_idx ON history_publication (scheme_id, issued_at);

-- One laboratory's result and scores in one publication. information_only: scores the plan marks for
-- information only (left out of combined scores and warnings); false until the evaluation publishes the flag.
CREATE TABLE history_score (
    document_id                bigint           NOT NULL REFERENCES history_publication (document_id),
    laboratory_id              bigint           NOT NULL REFERENCES laboratory (id),
    round_id                   bigint           NOT NULL,
    element                    varchar(2)       NOT NULL,
    item_label                 varchar(8)       NOT NULL,
    unit                       varchar(16)      NOT NULL,
    reported                   varchar(64)      NOT NULL,
    method_group               varchar(32)      NOT NULL,
    value                      double precision,
    assigned_value             double precision,
    assigned_value_uncertainty double precision,
    sigma_pt                   double precision,
    score_used                 varchar(16),
    z                          double precision,
    z_prime                    double precision,
    zeta                       double precision,
    en                         double precision,
    classification             varchar(32),
    excluded_reason            varchar(200),
    information_only           boolean          NOT NULL DEFAULT false,
    PRIMARY KEY (laboratory_id, document_id, element, item_label)
);
-- the history page: the primary key (laboratory_id first) serves "every score of this laboratory"; this index
-- serves "the rounds this laboratory took part in" without reading the scores
CREATE INDEX history_score_lab_round_idx ON history_score (laboratory_id, round_id);

-- The field view: per publication, measurand and method group, how many results were satisfactory,
-- questionable, unsatisfactory or not scored. Filled at issue from the published run.
CREATE TABLE history_field_summary (
    document_id     bigint       NOT NULL REFERENCES history_publication (document_id),
    element         varchar(2)   NOT NULL,
    method_group    varchar(32)  NOT NULL,
    satisfactory    integer      NOT NULL CHECK (satisfactory >= 0),
    questionable    integer      NOT NULL CHECK (questionable >= 0),
    unsatisfactory  integer      NOT NULL CHECK (unsatisfactory >= 0),
    not_scored      integer      NOT NULL CHECK (not_scored >= 0),
    PRIMARY KEY (document_id, element, method_group)
);

DO $$
DECLARE
    t text;
BEGIN
    FOREACH t IN ARRAY ARRAY['history_publication', 'history_score', 'history_field_summary']
    LOOP
        EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %I FROM ${appRole}', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_is_append_only', t);
    END LOOP;
END
$$;

-- An auditor grant's data window, separate from its validity: the auditor sees only rounds whose final report
-- was first issued within [data_from, data_until] (either end open when null), and only while the grant is valid.
ALTER TABLE auditor_grant ADD COLUMN data_from date;
ALTER TABLE auditor_grant ADD COLUMN data_until date;
ALTER TABLE auditor_grant ADD CONSTRAINT auditor_grant_data_window_check
    CHECK (data_from IS NULL OR data_until IS NULL OR data_from <= data_until);
