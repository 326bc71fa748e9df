-- Idempotency records: a retried request with the same Idempotency-Key (per scope, e.g. a laboratory) gets the
-- original answer back instead of doing the work twice. The record is written in the same transaction as the work,
-- so a failed attempt leaves nothing behind and a concurrent duplicate waits on the primary key until the first
-- attempt commits or rolls back.
CREATE TABLE idempotency_record (
    scope            varchar(128) NOT NULL,
    idempotency_key  varchar(255) NOT NULL CHECK (length(idempotency_key) >= 8),
    request_hash     char(64)     NOT NULL,
    status_code      integer,
    response_body    text,
    created_at       timestamptz  NOT NULL,
    completed_at     timestamptz,
    PRIMARY KEY (scope, idempotency_key)
);
CREATE INDEX idempotency_record_age_idx ON idempotency_record (created_at);
