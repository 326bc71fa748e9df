-- Schemes and rounds: the measurand catalogue, rounds and their state, frozen evaluation plans,
-- enrolment with participant codes, item dispatch and receipt, notices to participants, and the sample
-- qualification record (homogeneity and stability data, check figures, coordinator decisions).

CREATE TABLE scheme (
    id               bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    name             varchar(200) NOT NULL UNIQUE,
    material_family  varchar(32)  NOT NULL CHECK (material_family IN ('LOW_ALLOY_STEEL', 'STAINLESS_STEEL',
                         'CAST_IRON', 'ALUMINIUM_ALLOY', 'COPPER_ALLOY', 'NICKEL_ALLOY', 'OTHER')),
    created_at       timestamptz  NOT NULL,
    version          integer      NOT NULL DEFAULT 0
);

-- The measurand catalogue of a scheme: one row per element. The expected range only warns, never rejects.
CREATE TABLE measurand (
    id               bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    scheme_id        bigint       NOT NULL REFERENCES scheme (id),
    element          varchar(2)   NOT NULL CHECK (element ~ '^[A-Z][a-z]?$'),
    unit             varchar(8)   NOT NULL CHECK (unit IN ('%', 'mg/kg')),
    reporting_digits integer      NOT NULL CHECK (reporting_digits BETWEEN 0 AND 6),
    expected_min     numeric,
    expected_max     numeric,
    -- comma-separated method groups, each one of the MethodGroup names
    method_groups    varchar(200) NOT NULL,
    version          integer      NOT NULL DEFAULT 0,
    UNIQUE (scheme_id, element),
    CHECK (expected_min IS NULL OR expected_max IS NULL OR expected_min <= expected_max)
);

CREATE TABLE round (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    scheme_id             bigint       NOT NULL REFERENCES scheme (id),
    code                  varchar(40)  NOT NULL UNIQUE,
    item_description      varchar(1000) NOT NULL,
    items_per_laboratory  integer      NOT NULL CHECK (items_per_laboratory IN (1, 2)),
    -- comma-separated labels, one per item (e.g. "A" or "A,B" for a split-level pair)
    item_labels           varchar(40)  NOT NULL,
    dispatch_date         date         NOT NULL,
    result_deadline       timestamptz  NOT NULL,
    deadline_time_zone    varchar(64)  NOT NULL,
    instructions          text         NOT NULL,
    late_policy           varchar(32)  NOT NULL CHECK (late_policy IN ('REFUSE', 'ACCEPT_FLAGGED_SCORED',
                              'ACCEPT_FLAGGED_UNSCORED')),
    code_scope            varchar(16)  NOT NULL DEFAULT 'ROUND' CHECK (code_scope IN ('ROUND', 'SCHEME')),
    state                 varchar(24)  NOT NULL CHECK (state IN ('DRAFT', 'PLAN_FROZEN', 'ENROLLING',
                              'ITEMS_QUALIFIED', 'DISPATCHED', 'OPEN_FOR_RESULTS', 'CLOSED', 'EVALUATING',
                              'PRELIMINARY_ISSUED', 'COMMENT_PERIOD', 'FINAL_ISSUED', 'AMENDED', 'ARCHIVED',
                              'CANCELLED')),
    state_changed_at      timestamptz  NOT NULL,
    -- the plan being edited while the round is a draft (canonical JSON); frozen versions live in evaluation_plan
    draft_plan            text,
    created_at            timestamptz  NOT NULL,
    version               integer      NOT NULL DEFAULT 0,
    CHECK (dispatch_date <= (result_deadline AT TIME ZONE 'UTC')::date)
);
CREATE INDEX round_scheme_idx ON round (scheme_id);

-- Frozen evaluation plans: canonical JSON and its SHA-256; a change is a new version with a reason.
CREATE TABLE evaluation_plan (
    round_id        bigint       NOT NULL REFERENCES round (id),
    plan_version    integer      NOT NULL CHECK (plan_version >= 1),
    canonical_json  text         NOT NULL,
    sha256          char(64)     NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
    reason          varchar(1000) NOT NULL,
    frozen_by       varchar(128) NOT NULL,
    frozen_at       timestamptz  NOT NULL,
    PRIMARY KEY (round_id, plan_version)
);
REVOKE UPDATE, DELETE, TRUNCATE ON evaluation_plan FROM ${appRole};
CREATE TRIGGER evaluation_plan_is_append_only
    BEFORE UPDATE OR DELETE ON evaluation_plan
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

-- Codes kept for the whole scheme when a round's plan says so (code_scope = 'SCHEME').
CREATE TABLE scheme_participant_code (
    scheme_id         bigint      NOT NULL REFERENCES scheme (id),
    laboratory_id     bigint      NOT NULL REFERENCES laboratory (id),
    participant_code  varchar(12) NOT NULL,
    PRIMARY KEY (scheme_id, laboratory_id),
    UNIQUE (scheme_id, participant_code)
);

-- The code table: which laboratory is behind which participant code. Read by coordinators only
-- (enforced in RoundService / EnrolmentService; laboratories see only their own code).
CREATE TABLE round_participant (
    id                bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id          bigint       NOT NULL REFERENCES round (id),
    laboratory_id     bigint       NOT NULL REFERENCES laboratory (id),
    participant_code  varchar(12)  NOT NULL CHECK (participant_code ~ '^[A-HJKMNP-Z2-9]{4,12}$'),
    enrolled_at       timestamptz  NOT NULL,
    enrolled_by       varchar(128) NOT NULL,
    UNIQUE (round_id, laboratory_id),
    UNIQUE (round_id, participant_code)
);
CREATE INDEX round_participant_laboratory_idx ON round_participant (laboratory_id);

-- One row per physical item sent to a laboratory. A replacement is a new row pointing at the one it replaces.
CREATE TABLE item_dispatch (
    id                bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id          bigint       NOT NULL REFERENCES round (id),
    laboratory_id     bigint       NOT NULL REFERENCES laboratory (id),
    item_label        varchar(8)   NOT NULL,
    status            varchar(16)  NOT NULL CHECK (status IN ('DISPATCHED', 'RECEIVED', 'REPLACED', 'WITHDRAWN')),
    dispatched_at     timestamptz  NOT NULL,
    received_at       timestamptz,
    received_by       varchar(128),
    item_condition    varchar(16)  CHECK (item_condition IN ('GOOD', 'DAMAGED', 'CONTAMINATED', 'OTHER')),
    condition_note    varchar(1000),
    replaces_id       bigint REFERENCES item_dispatch (id),
    version           integer      NOT NULL DEFAULT 0,
    CHECK ((received_at IS NULL) = (item_condition IS NULL))
);
CREATE INDEX item_dispatch_round_lab_idx ON item_dispatch (round_id, laboratory_id);
-- at most one current (not replaced) item per laboratory and label
CREATE UNIQUE INDEX item_dispatch_current_idx ON item_dispatch (round_id, laboratory_id, item_label)
    WHERE status <> 'REPLACED';

-- Notices to all participants of a round (e.g. a withdrawn item). Append-only.
CREATE TABLE round_notice (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id     bigint        NOT NULL REFERENCES round (id),
    body         varchar(4000) NOT NULL,
    posted_by    varchar(128)  NOT NULL,
    posted_at    timestamptz   NOT NULL
);
CREATE INDEX round_notice_round_idx ON round_notice (round_id);
REVOKE UPDATE, DELETE, TRUNCATE ON round_notice FROM ${appRole};
CREATE TRIGGER round_notice_is_append_only
    BEFORE UPDATE OR DELETE ON round_notice
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

-- Sample qualification: each upload and the check figures computed from it. Append-only; the latest
-- upload of a kind for a measurand is the one in force.
CREATE TABLE qualification_check (
    id               bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id         bigint        NOT NULL REFERENCES round (id),
    element          varchar(2)    NOT NULL,
    kind             varchar(16)   NOT NULL CHECK (kind IN ('HOMOGENEITY', 'STABILITY')),
    sigma_pt         numeric       NOT NULL CHECK (sigma_pt > 0),
    sigma_pt_source  varchar(32)   NOT NULL,
    data_csv         text          NOT NULL,
    data_sha256      char(64)      NOT NULL,
    figures_json     text          NOT NULL,
    passed           boolean       NOT NULL,
    uploaded_by      varchar(128)  NOT NULL,
    uploaded_at      timestamptz   NOT NULL
);
CREATE INDEX qualification_check_round_idx ON qualification_check (round_id, element, kind, id);
REVOKE UPDATE, DELETE, TRUNCATE ON qualification_check FROM ${appRole};
CREATE TRIGGER qualification_check_is_append_only
    BEFORE UPDATE OR DELETE ON qualification_check
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

-- The coordinator's decision per measurand. Append-only; the latest decision is the one in force.
CREATE TABLE qualification_decision (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id     bigint        NOT NULL REFERENCES round (id),
    element      varchar(2)    NOT NULL,
    decision     varchar(32)   NOT NULL CHECK (decision IN ('ACCEPT', 'WIDEN_SIGMA_PT', 'ADD_HOMOGENEITY_UNCERTAINTY',
                                   'WITHDRAW_MEASURAND')),
    reason       varchar(2000),
    decided_by   varchar(128)  NOT NULL,
    decided_at   timestamptz   NOT NULL
);
CREATE INDEX qualification_decision_round_idx ON qualification_decision (round_id, element, id);
REVOKE UPDATE, DELETE, TRUNCATE ON qualification_decision FROM ${appRole};
CREATE TRIGGER qualification_decision_is_append_only
    BEFORE UPDATE OR DELETE ON qualification_decision
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();
