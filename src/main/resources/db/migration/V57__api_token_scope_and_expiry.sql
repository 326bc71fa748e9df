-- API tokens get a scope (what a LIMS may do with the token) and an optional expiry.
-- Existing tokens submitted results (and read everything a member reads): they become SUBMIT without expiry.
ALTER TABLE api_token ADD COLUMN scope varchar(16) NOT NULL DEFAULT 'SUBMIT'
    CHECK (scope IN ('SUBMIT', 'READ_SCORES'));
ALTER TABLE api_token ADD COLUMN expires_at timestamptz;
ALTER TABLE api_token ADD CONSTRAINT api_token_expiry_after_creation CHECK (expires_at IS NULL OR expires_at > created_at);
