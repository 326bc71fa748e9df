-- Accounts: laboratories (the tenants), users and their roles, database-backed sessions, login
-- throttling, API tokens for LIMS, one-time password-reset links and auditors' access grants.

CREATE TABLE laboratory (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    name            varchar(200) NOT NULL,
    organisation    varchar(200) NOT NULL,
    country         char(2)      NOT NULL CHECK (country ~ '^[A-Z]{2}$'),
    contact_name    varchar(200),
    contact_email   varchar(254),
    created_at      timestamptz  NOT NULL DEFAULT now(),
    version         integer      NOT NULL DEFAULT 0,
    UNIQUE (organisation, name)
);

CREATE TABLE app_user (
    id                  bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    username            varchar(64)  NOT NULL CHECK (username ~ '^[a-z0-9][a-z0-9._@-]{2,63}$'),
    display_name        varchar(200) NOT NULL,
    email               varchar(254),
    role                varchar(16)  NOT NULL
        CHECK (role IN ('admin', 'coordinator', 'lab-manager', 'lab-member', 'auditor')),
    laboratory_id       bigint REFERENCES laboratory (id),
    -- bcrypt in modular crypt format; NULL until the user sets a password through a one-time link
    password_hash       varchar(100),
    enabled             boolean      NOT NULL DEFAULT true,
    password_changed_at timestamptz,
    created_at          timestamptz  NOT NULL DEFAULT now(),
    version             integer      NOT NULL DEFAULT 0,
    UNIQUE (username),
    -- laboratory roles belong to exactly one laboratory; the other roles to none
    CHECK ((role IN ('lab-manager', 'lab-member')) = (laboratory_id IS NOT NULL))
);
CREATE INDEX app_user_laboratory_idx ON app_user (laboratory_id);

-- A session cookie holds a random 256-bit token; only its SHA-256 is stored.
CREATE TABLE user_session (
    token_hash      char(64)     PRIMARY KEY,
    user_id         bigint       NOT NULL REFERENCES app_user (id),
    created_at      timestamptz  NOT NULL,
    last_seen_at    timestamptz  NOT NULL,
    expires_at      timestamptz  NOT NULL,
    ended_at        timestamptz,
    end_reason      varchar(32),
    CHECK (expires_at > created_at)
);
CREATE INDEX user_session_user_idx ON user_session (user_id) WHERE ended_at IS NULL;

-- Every sign-in attempt, kept for throttling (counted per username over a sliding window).
CREATE TABLE login_attempt (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    username        varchar(64)  NOT NULL,
    succeeded       boolean      NOT NULL,
    attempted_at    timestamptz  NOT NULL,
    remote_address  varchar(64)
);
CREATE INDEX login_attempt_recent_idx ON login_attempt (username, attempted_at);

-- API tokens for a laboratory's LIMS: random 256 bits, shown once, stored as SHA-256.
CREATE TABLE api_token (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    laboratory_id   bigint       NOT NULL REFERENCES laboratory (id),
    name            varchar(100) NOT NULL,
    token_hash      char(64)     NOT NULL UNIQUE,
    token_prefix    varchar(16)  NOT NULL,
    created_by      bigint       NOT NULL REFERENCES app_user (id),
    created_at      timestamptz  NOT NULL,
    last_used_at    timestamptz,
    revoked_at      timestamptz,
    revoked_by      bigint REFERENCES app_user (id),
    version         integer      NOT NULL DEFAULT 0
);
CREATE UNIQUE INDEX api_token_active_name_idx ON api_token (laboratory_id, lower(name)) WHERE revoked_at IS NULL;

-- One-time links to set a password (first sign-in or reset), started by an admin or a lab manager.
CREATE TABLE password_reset (
    token_hash      char(64)     PRIMARY KEY,
    user_id         bigint       NOT NULL REFERENCES app_user (id),
    created_by      bigint REFERENCES app_user (id),
    created_at      timestamptz  NOT NULL,
    expires_at      timestamptz  NOT NULL,
    used_at         timestamptz,
    CHECK (expires_at > created_at)
);
CREATE INDEX password_reset_user_idx ON password_reset (user_id) WHERE used_at IS NULL;

-- A laboratory lets an auditor see its history and per-laboratory reports, for a limited time.
CREATE TABLE auditor_grant (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    laboratory_id   bigint       NOT NULL REFERENCES laboratory (id),
    auditor_id      bigint       NOT NULL REFERENCES app_user (id),
    granted_by      bigint       NOT NULL REFERENCES app_user (id),
    granted_at      timestamptz  NOT NULL,
    valid_until     timestamptz  NOT NULL,
    revoked_at      timestamptz,
    revoked_by      bigint REFERENCES app_user (id),
    version         integer      NOT NULL DEFAULT 0,
    CHECK (valid_until > granted_at)
);
CREATE INDEX auditor_grant_lookup_idx ON auditor_grant (auditor_id, laboratory_id);
