-- Platform: the restricted application role, the background job table and the audit trail table.
-- Flyway runs as the owning login; the application switches every connection to ${appRole}
-- (see application.properties), so the privileges below are what the application really has.

DO $$
BEGIN
    IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '${appRole}') THEN
        CREATE ROLE ${appRole} NOLOGIN;
    END IF;
END
$$;

-- The owning login must be able to SET ROLE to the application role. A superuser always can; for an
-- ordinary owner this grant needs CREATEROLE or an administrator's help (docs/operations.md).
DO $$
BEGIN
    IF NOT pg_has_role(current_user, '${appRole}', 'MEMBER') THEN
        EXECUTE format('GRANT %I TO %I', '${appRole}', current_user);
    END IF;
END
$$;

GRANT USAGE ON SCHEMA public TO ${appRole};
-- Tables created by later migrations get ordinary read/write rights; append-only tables revoke them.
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${appRole};
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO ${appRole};

-- A trigger function shared by every append-only table: refuses UPDATE and DELETE for every role,
-- the owner included. Removing it takes a migration, which is itself reviewed and recorded.
CREATE FUNCTION refuse_change_of_append_only_row() RETURNS trigger
    LANGUAGE plpgsql AS
$$
BEGIN
    RAISE EXCEPTION 'table % is append-only: % refused', TG_TABLE_NAME, TG_OP
        USING ERRCODE = 'insufficient_privilege';
END
$$;

-- ---------------------------------------------------------------------------------------------
-- Background jobs: claimed with FOR UPDATE SKIP LOCKED so that several instances can poll safely.
-- ---------------------------------------------------------------------------------------------
CREATE TABLE job (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    kind            varchar(64)  NOT NULL,
    payload         text         NOT NULL DEFAULT '{}',
    status          varchar(16)  NOT NULL DEFAULT 'QUEUED'
        CHECK (status IN ('QUEUED', 'RUNNING', 'SUCCEEDED', 'FAILED')),
    progress_done   integer      NOT NULL DEFAULT 0 CHECK (progress_done >= 0),
    progress_total  integer      NOT NULL DEFAULT 0 CHECK (progress_total >= 0),
    attempts        integer      NOT NULL DEFAULT 0 CHECK (attempts >= 0),
    max_attempts    integer      NOT NULL DEFAULT 3 CHECK (max_attempts >= 1),
    claimed_by      varchar(128),
    claimed_at      timestamptz,
    heartbeat_at    timestamptz,
    not_before      timestamptz  NOT NULL DEFAULT now(),
    result          text,
    error           text,
    created_by      varchar(128),
    created_at      timestamptz  NOT NULL DEFAULT now(),
    finished_at     timestamptz,
    version         integer      NOT NULL DEFAULT 0,
    CHECK ((status = 'RUNNING') = (claimed_by IS NOT NULL))
);
CREATE INDEX job_queued_idx ON job (not_before, id) WHERE status = 'QUEUED';
CREATE INDEX job_running_idx ON job (heartbeat_at) WHERE status = 'RUNNING';

-- ---------------------------------------------------------------------------------------------
-- Audit trail: append-only, hash-chained. Rows are written by AuditTrail (audit package).
-- ---------------------------------------------------------------------------------------------
CREATE TABLE audit_event (
    sequence_no     bigint       PRIMARY KEY CHECK (sequence_no >= 1),
    occurred_at     timestamptz  NOT NULL,
    actor           varchar(128) NOT NULL,
    actor_role      varchar(32),
    laboratory_id   bigint,
    action          varchar(64)  NOT NULL,
    object_type     varchar(64)  NOT NULL,
    object_id       varchar(128),
    before_hash     char(64),
    after_hash      char(64),
    detail          text,
    request_id      varchar(64),
    previous_hash   char(64)     NOT NULL,
    entry_hash      char(64)     NOT NULL UNIQUE
);

REVOKE UPDATE, DELETE, TRUNCATE ON audit_event FROM ${appRole};
CREATE TRIGGER audit_event_is_append_only
    BEFORE UPDATE OR DELETE ON audit_event
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();
CREATE TRIGGER audit_event_no_truncate
    BEFORE TRUNCATE ON audit_event
    FOR EACH STATEMENT EXECUTE FUNCTION refuse_change_of_append_only_row();
