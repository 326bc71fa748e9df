-- Issued documents (round reports, laboratory reports, history exports): the exact bytes handed out and
-- their SHA-256, kept for verification. Append-only for every role: nothing issued is edited or regenerated
-- in place. An amendment is a new row that names the row it replaces; "superseded by" is read from that
-- newer row, never written into the old one.

CREATE TABLE issued_document (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    report_id             varchar(64)  NOT NULL UNIQUE,
    kind                  varchar(16)  NOT NULL CHECK (kind IN ('ROUND', 'LABORATORY', 'HISTORY_EXPORT')),
    status                varchar(16)  NOT NULL CHECK (status IN ('PRELIMINARY', 'FINAL', 'AMENDED')),
    round_id              bigint,
    laboratory_id         bigint,
    replaces_document_id  bigint       REFERENCES issued_document (id),
    amendment_reason      varchar(2000),
    content_type          varchar(128) NOT NULL,
    bytes                 bytea        NOT NULL,
    sha256                char(64)     NOT NULL UNIQUE CHECK (sha256 ~ '^[0-9a-f]{64}$'),
    issued_at             timestamptz  NOT NULL,
    issued_by             varchar(128) NOT NULL,
    -- an amendment names what it replaces and why; nothing else does
    CHECK ((status = 'AMENDED') = (replaces_document_id IS NOT NULL)),
    CHECK ((status = 'AMENDED') = (amendment_reason IS NOT NULL AND length(trim(amendment_reason)) > 0)),
    CHECK (kind <> 'LABORATORY' OR laboratory_id IS NOT NULL)
);
-- a document is superseded at most once, so the versions of a report form one line
CREATE UNIQUE INDEX issued_document_replaces_idx ON issued_document (replaces_document_id)
    WHERE replaces_document_id IS NOT NULL;
CREATE INDEX issued_document_round_idx ON issued_document (round_id) WHERE round_id IS NOT NULL;

REVOKE UPDATE, DELETE, TRUNCATE ON issued_document FROM ${appRole};
CREATE TRIGGER issued_document_is_append_only
    BEFORE UPDATE OR DELETE ON issued_document
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();
CREATE TRIGGER issued_document_no_truncate
    BEFORE TRUNCATE ON issued_document
    FOR EACH STATEMENT EXECUTE FUNCTION refuse_change_of_append_only_row();

-- ---------------------------------------------------------------------------------------------
-- Rate limit of the public verification: a fixed-window counter per client (SHA-256 of the address,
-- never the address itself) and minute. In the database so that every instance behind the load
-- balancer counts against the same limit. Old windows are deleted as new ones are counted.
-- ---------------------------------------------------------------------------------------------
CREATE TABLE verification_rate (
    client_hash   char(64)     NOT NULL,
    window_start  timestamptz  NOT NULL,
    hits          integer      NOT NULL CHECK (hits >= 1),
    PRIMARY KEY (client_hash, window_start)
);
CREATE INDEX verification_rate_window_idx ON verification_rate (window_start);
