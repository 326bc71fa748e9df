-- A laboratory's corrective-action record for its unsatisfactory (optionally questionable) results: cause found,
-- action taken, evidence (text and attachments), verification of effectiveness (the later round that showed it
-- worked) and closure. Members create and edit an open entry; the laboratory's manager closes it. Once closed an
-- entry is frozen: the trigger below refuses any UPDATE of a closed row and every DELETE, for every role, the
-- owner included; a correction is a new entry that names the closed one (corrects_id). Every change is also in
-- the audit trail.

CREATE TABLE corrective_action (
    id                       bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    laboratory_id            bigint         NOT NULL REFERENCES laboratory (id),
    round_id                 bigint         NOT NULL REFERENCES round (id),
    element                  varchar(2)     NOT NULL,
    item_label               varchar(8)     NOT NULL,
    round_code               varchar(64)    NOT NULL,
    verdict                  varchar(32)    NOT NULL,
    cause                    varchar(4000)  NOT NULL DEFAULT '',
    action_taken             varchar(4000)  NOT NULL DEFAULT '',
    evidence                 varchar(4000)  NOT NULL DEFAULT '',
    effectiveness_round_id   bigint         REFERENCES round (id),
    effectiveness_note       varchar(4000)  NOT NULL DEFAULT '',
    corrects_id              bigint         REFERENCES corrective_action (id),
    created_by               varchar(128)   NOT NULL,
    created_at               timestamptz    NOT NULL,
    updated_by               varchar(128)   NOT NULL,
    updated_at               timestamptz    NOT NULL,
    closed_by                varchar(128),
    closed_at                timestamptz,
    version                  integer        NOT NULL DEFAULT 0,
    CHECK ((closed_at IS NULL) = (closed_by IS NULL))
);
CREATE INDEX corrective_action_lab_idx ON corrective_action (laboratory_id, round_id);
-- a closed entry is corrected at most once, so corrections form one line
CREATE UNIQUE INDEX corrective_action_corrects_idx ON corrective_action (corrects_id) WHERE corrects_id IS NOT NULL;

CREATE FUNCTION refuse_change_of_closed_corrective_action() RETURNS trigger
    LANGUAGE plpgsql AS
$$
BEGIN
    IF TG_OP = 'DELETE' THEN
        RAISE EXCEPTION 'corrective actions are never deleted' USING ERRCODE = 'insufficient_privilege';
    END IF;
    IF OLD.closed_at IS NOT NULL THEN
        RAISE EXCEPTION 'corrective action % is closed: % refused', OLD.id, TG_OP
            USING ERRCODE = 'insufficient_privilege';
    END IF;
    RETURN NEW;
END
$$;
CREATE TRIGGER corrective_action_frozen_once_closed
    BEFORE UPDATE OR DELETE ON corrective_action
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_closed_corrective_action();
REVOKE DELETE, TRUNCATE ON corrective_action FROM ${appRole};

-- Attachments of an entry: PDF, PNG or JPEG up to 10 MiB (checked by the file's signature before storing).
-- Append-only; none may be added to a closed entry.
CREATE TABLE corrective_action_attachment (
    id            bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    action_id     bigint         NOT NULL REFERENCES corrective_action (id),
    file_name     varchar(200)   NOT NULL,
    content_type  varchar(64)    NOT NULL CHECK (content_type IN ('application/pdf', 'image/png', 'image/jpeg')),
    bytes         bytea          NOT NULL CHECK (octet_length(bytes) BETWEEN 1 AND 10485760),
    sha256        char(64)       NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
    added_by      varchar(128)   NOT NULL,
    added_at      timestamptz    NOT NULL
);
CREATE INDEX corrective_action_attachment_action_idx ON corrective_action_attachment (action_id);
REVOKE UPDATE, DELETE, TRUNCATE ON corrective_action_attachment FROM ${appRole};
CREATE TRIGGER corrective_action_attachment_is_append_only
    BEFORE UPDATE OR DELETE ON corrective_action_attachment
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();

CREATE FUNCTION refuse_attachment_to_closed_corrective_action() RETURNS trigger
    LANGUAGE plpgsql AS
$$
BEGIN
    IF EXISTS (SELECT 1 FROM corrective_action WHERE id = NEW.action_id AND closed_at IS NOT NULL) THEN
        RAISE EXCEPTION 'corrective action % is closed: no attachment may be added', NEW.action_id
            USING ERRCODE = 'insufficient_privilege';
    END IF;
    RETURN NEW;
END
$$;
CREATE TRIGGER corrective_action_attachment_only_while_open
    BEFORE INSERT ON corrective_action_attachment
    FOR EACH ROW EXECUTE FUNCTION refuse_attachment_to_closed_corrective_action();
