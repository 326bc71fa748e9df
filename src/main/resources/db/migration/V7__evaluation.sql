-- Evaluation runs of a round. Each run is a new, immutable version (re-running never touches an older one);
-- it records the hash of its inputs (plan version and results read), the plan version and every output.
-- Numbers are stored as double precision: exactly the binary values the statistics computed.

CREATE TABLE evaluation_run (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id        bigint        NOT NULL REFERENCES round (id),
    version         integer       NOT NULL CHECK (version >= 1),
    preview         boolean       NOT NULL,
    round_state     varchar(32)   NOT NULL,
    plan_version    integer       NOT NULL,
    plan_sha256     char(64)      NOT NULL,
    inputs_sha256   char(64)      NOT NULL CHECK (inputs_sha256 ~ '^[0-9a-f]{64}$'),
    outputs_sha256  char(64)      NOT NULL CHECK (outputs_sha256 ~ '^[0-9a-f]{64}$'),
    code_version    varchar(64)   NOT NULL,
    created_by      varchar(128)  NOT NULL,
    created_at      timestamptz   NOT NULL,
    UNIQUE (round_id, version)
);

CREATE TABLE measurand_evaluation (
    run_id                  bigint        NOT NULL REFERENCES evaluation_run (id),
    element                 varchar(2)    NOT NULL,
    item_label              varchar(8)    NOT NULL,
    position                integer       NOT NULL,
    unit                    varchar(16)   NOT NULL,
    n                       integer       NOT NULL,
    censored                integer       NOT NULL,
    excluded                integer       NOT NULL,
    assigned_value_method   varchar(32)   NOT NULL,
    assigned_value          double precision,
    assigned_value_uncertainty double precision,
    sigma_pt                double precision,
    sigma_pt_method         varchar(32)   NOT NULL,
    sigma_pt_source         varchar(16),
    score_used              varchar(16),
    score_used_reason       varchar(1000),
    median                  double precision,
    made                    double precision,
    niqr                    double precision,
    robust_mean             double precision,
    robust_sd               double precision,
    iterations              integer,
    converged               boolean,
    warnings_json           text          NOT NULL,
    method_groups_json      text          NOT NULL,
    PRIMARY KEY (run_id, element, item_label)
);

CREATE TABLE participant_score (
    run_id              bigint        NOT NULL REFERENCES evaluation_run (id),
    element             varchar(2)    NOT NULL,
    item_label          varchar(8)    NOT NULL,
    laboratory_id       bigint        NOT NULL REFERENCES laboratory (id),
    position            integer       NOT NULL,
    participant_code    varchar(16)   NOT NULL,
    reported            varchar(64)   NOT NULL,
    method_group        varchar(32)   NOT NULL,
    value               double precision,
    z                   double precision,
    z_prime             double precision,
    zeta                double precision,
    en                  double precision,
    classification      varchar(32),
    excluded_reason     varchar(200),
    PRIMARY KEY (run_id, element, item_label, laboratory_id)
);

DO $$
DECLARE
    t text;
BEGIN
    FOREACH t IN ARRAY ARRAY['evaluation_run', 'measurand_evaluation', 'participant_score']
    LOOP
        EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %I FROM ${appRole}', t);
        EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW '
                       'EXECUTE FUNCTION refuse_change_of_append_only_row()', t || '_is_append_only', t);
    END LOOP;
END
$$;
