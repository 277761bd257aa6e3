-- Alert states, snoozes and the outbox of messages to send. Times are Unix milliseconds (UTC).
-- One row per alert: a (pair, kind) from first sighting to resolution; a later occurrence is a new row.
CREATE TABLE alerts (
    id                  INTEGER PRIMARY KEY AUTOINCREMENT,
    pair                TEXT    NOT NULL,
    kind                TEXT    NOT NULL,
    severity            TEXT    NOT NULL CHECK (severity IN ('info', 'warning', 'critical')),
    status              TEXT    NOT NULL CHECK (status IN ('pending', 'firing', 'resolved')),
    consecutive_runs    INTEGER NOT NULL,
    first_seen_ms       BIGINT  NOT NULL,
    last_seen_ms        BIGINT  NOT NULL,
    fired_at_ms         BIGINT,
    last_notified_at_ms BIGINT,
    resolved_at_ms      BIGINT,
    acked_at_ms         BIGINT,
    message             TEXT    NOT NULL,
    -- No foreign key: runs are pruned by retention, alerts outlive them.
    last_run_id         BIGINT
);
-- The invariant the lifecycle relies on: at most one open alert per (pair, kind).
CREATE UNIQUE INDEX ux_alerts_open ON alerts (pair, kind) WHERE status <> 'resolved';
CREATE INDEX ix_alerts_pair ON alerts (pair, first_seen_ms DESC);
CREATE INDEX ix_alerts_resolved ON alerts (resolved_at_ms);

CREATE TABLE snoozes (
    pair          TEXT   PRIMARY KEY,
    until_ms      BIGINT NOT NULL,
    created_at_ms BIGINT NOT NULL,
    reason        TEXT
);

-- Written in the same transaction as the alert states it announces; sent (and retried) by the dispatcher.
CREATE TABLE outbox (
    id                 INTEGER PRIMARY KEY AUTOINCREMENT,
    message_id         TEXT    NOT NULL UNIQUE,
    route              TEXT    NOT NULL,
    channel            TEXT    NOT NULL CHECK (channel IN ('smtp', 'file')),
    created_at_ms      BIGINT  NOT NULL,
    next_attempt_at_ms BIGINT  NOT NULL,
    attempts           INTEGER NOT NULL DEFAULT 0,
    last_error         TEXT,
    sent_at_ms         BIGINT,
    subject            TEXT    NOT NULL,
    recipients         TEXT    NOT NULL,
    mime               BLOB    NOT NULL
);
CREATE INDEX ix_outbox_due ON outbox (next_attempt_at_ms) WHERE sent_at_ms IS NULL;
CREATE INDEX ix_outbox_sent ON outbox (sent_at_ms);
