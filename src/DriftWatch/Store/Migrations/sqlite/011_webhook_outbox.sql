-- The webhook channel: outbox rows may be for channel 'webhook' (their mime column then holds the JSON document that is
-- posted, byte for byte, so a retry posts the same body), and a message a receiver refused for good (HTTP 4xx other
-- than 408 and 429) is marked failed_at_ms: kept for audit, never claimed again.
-- SQLite cannot alter a CHECK constraint, so outbox is rebuilt as 006 rebuilt alerts (create, copy, drop, rename,
-- recreate the indexes); no table refers to outbox.
CREATE TABLE outbox_011 (
    id                 INTEGER PRIMARY KEY AUTOINCREMENT,
    message_id         TEXT    NOT NULL UNIQUE,
    mailing_list       TEXT    NOT NULL,
    channel            TEXT    NOT NULL CHECK (channel IN ('smtp', 'file', 'webhook')),
    created_at_ms      BIGINT  NOT NULL,
    next_attempt_at_ms BIGINT  NOT NULL,
    attempts           INTEGER NOT NULL DEFAULT 0,
    last_error         TEXT,
    sent_at_ms         BIGINT,
    subject            TEXT    NOT NULL,
    recipients         TEXT    NOT NULL,
    mime               BLOB    NOT NULL,
    claimed_by         TEXT,
    failed_at_ms       BIGINT
);
INSERT INTO outbox_011 (id, message_id, mailing_list, channel, created_at_ms, next_attempt_at_ms, attempts, last_error,
                        sent_at_ms, subject, recipients, mime, claimed_by)
    SELECT id, message_id, mailing_list, channel, created_at_ms, next_attempt_at_ms, attempts, last_error,
           sent_at_ms, subject, recipients, mime, claimed_by
    FROM outbox;
-- Keep AUTOINCREMENT's high-water mark: a pruned row's id is never handed out again.
DELETE FROM sqlite_sequence WHERE name = 'outbox_011';
INSERT INTO sqlite_sequence (name, seq) SELECT 'outbox_011', seq FROM sqlite_sequence WHERE name = 'outbox';
DROP TABLE outbox;
ALTER TABLE outbox_011 RENAME TO outbox;
CREATE INDEX ix_outbox_due ON outbox (next_attempt_at_ms) WHERE sent_at_ms IS NULL AND failed_at_ms IS NULL;
CREATE INDEX ix_outbox_sent ON outbox (sent_at_ms);
CREATE INDEX ix_outbox_failed ON outbox (failed_at_ms) WHERE failed_at_ms IS NOT NULL;
