-- Notices (issue 15): what a person is told, in the application and by e-mail, once.
--
-- A notice is keyed by (kind, object, recipient): the UNIQUE constraint makes a second attempt to create the same
-- notice (a retried request, a second instance running the same scheduled check) a no-op. Its e-mail is a job in the
-- job table, keyed by job.dedup_key, so it too exists once; the job runner's FOR UPDATE SKIP LOCKED claim lets one
-- worker send it, with retries and back-off when the SMTP server fails.

ALTER TABLE job ADD COLUMN dedup_key varchar(300);
CREATE UNIQUE INDEX job_dedup_key_idx ON job (dedup_key) WHERE dedup_key IS NOT NULL;

CREATE TABLE notice (
    id            bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    kind          varchar(40)   NOT NULL CHECK (kind ~ '^[a-z0-9-]{2,40}$'),
    object_key    varchar(200)  NOT NULL,
    recipient_id  bigint        NOT NULL REFERENCES app_user (id),
    -- the facts the words are made from (JSON object of strings); times are ISO instants, shown in the reader's zone
    params        text          NOT NULL DEFAULT '{}',
    -- the page concerned, a path of this application
    link          varchar(500),
    created_at    timestamptz   NOT NULL,
    read_at       timestamptz,
    mail_status   varchar(16)   NOT NULL DEFAULT 'QUEUED'
        CHECK (mail_status IN ('QUEUED', 'SENT', 'OPTED_OUT', 'NO_ADDRESS', 'MAIL_OFF', 'FAILED')),
    mailed_at     timestamptz,
    UNIQUE (kind, object_key, recipient_id)
);
CREATE INDEX notice_recipient_idx ON notice (recipient_id, created_at DESC, id DESC);
CREATE INDEX notice_unread_idx ON notice (recipient_id) WHERE read_at IS NULL;
CREATE INDEX notice_created_idx ON notice (created_at);

-- A person's choice not to receive one kind of notice by e-mail (the notice still appears in the application).
CREATE TABLE notice_opt_out (
    user_id     bigint       NOT NULL REFERENCES app_user (id),
    kind        varchar(40)  NOT NULL,
    chosen_at   timestamptz  NOT NULL,
    PRIMARY KEY (user_id, kind)
);

-- A coordinator's reminder to the laboratories of a round: each one is its own object of notices.
CREATE TABLE notice_reminder (
    id          bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    round_id    bigint         NOT NULL REFERENCES round (id),
    message     varchar(2000)  NOT NULL,
    sent_by     varchar(128)   NOT NULL,
    sent_at     timestamptz    NOT NULL
);
CREATE INDEX notice_reminder_round_idx ON notice_reminder (round_id);

-- Demo and installations without SMTP: the messages that would have been sent, exactly, for the admin to read.
CREATE TABLE mail_outbox (
    id          bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    notice_id   bigint         REFERENCES notice (id) ON DELETE SET NULL,
    to_address  varchar(254)   NOT NULL,
    subject     varchar(300)   NOT NULL,
    text_body   text           NOT NULL,
    html_body   text           NOT NULL,
    written_at  timestamptz    NOT NULL
);
CREATE INDEX mail_outbox_written_idx ON mail_outbox (written_at DESC, id DESC);
