-- Two-step sign-in (ASVS v5.0.0-6.3.3): time-based one-time passwords (RFC 6238) and single-use recovery codes.
-- The TOTP secret is stored encrypted (AES-GCM, key derived from the configured session key).
CREATE TABLE user_two_step (
    user_id          bigint       PRIMARY KEY REFERENCES app_user (id),
    secret_encrypted text         NOT NULL,
    confirmed_at     timestamptz,
    last_used_step   bigint       NOT NULL DEFAULT 0,
    created_at       timestamptz  NOT NULL
);

CREATE TABLE recovery_code (
    code_hash        char(64)     PRIMARY KEY,
    user_id          bigint       NOT NULL REFERENCES app_user (id),
    created_at       timestamptz  NOT NULL,
    used_at          timestamptz
);
CREATE INDEX recovery_code_user_idx ON recovery_code (user_id) WHERE used_at IS NULL;

-- A password-checked sign-in that still needs its second step: not a session yet.
ALTER TABLE user_session ADD COLUMN awaiting_second_step boolean NOT NULL DEFAULT false;
