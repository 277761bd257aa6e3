-- Alert states get DriftWatch's own words: watching (seen, not yet confirmed by enough runs in a row), confirmed
-- (people are told) and cleared (a check showed the finding gone). Stored rows are converted in place; the columns
-- of the confirmation and clearing times and the outbox's mailing list follow the same words.
-- SQLite cannot alter a CHECK constraint, so alerts is rebuilt as 004 rebuilt runs (create, copy, drop, rename,
-- recreate the indexes); no table refers to alerts, and the migration runner checks foreign keys before committing.
CREATE TABLE alerts_006 (
    id                  INTEGER PRIMARY KEY AUTOINCREMENT,
    pair                TEXT    NOT NULL,
    kind                TEXT    NOT NULL,
    severity            TEXT    NOT NULL CHECK (severity IN ('info', 'warning', 'critical')),
    status              TEXT    NOT NULL CHECK (status IN ('watching', 'confirmed', 'cleared')),
    consecutive_runs    INTEGER NOT NULL,
    first_seen_ms       BIGINT  NOT NULL,
    last_seen_ms        BIGINT  NOT NULL,
    confirmed_at_ms     BIGINT,
    last_notified_at_ms BIGINT,
    cleared_at_ms       BIGINT,
    acked_at_ms         BIGINT,
    message             TEXT    NOT NULL,
    -- No foreign key: runs are pruned by retention, alerts outlive them.
    last_run_id         BIGINT
);
INSERT INTO alerts_006 (id, pair, kind, severity, status, consecutive_runs, first_seen_ms, last_seen_ms, confirmed_at_ms,
                        last_notified_at_ms, cleared_at_ms, acked_at_ms, message, last_run_id)
    SELECT id, pair, kind, severity,
           CASE status WHEN 'pending' THEN 'watching' WHEN 'firing' THEN 'confirmed' WHEN 'resolved' THEN 'cleared' ELSE status END,
           consecutive_runs, first_seen_ms, last_seen_ms, fired_at_ms,
           last_notified_at_ms, resolved_at_ms, acked_at_ms, message, last_run_id
    FROM alerts;
-- Keep AUTOINCREMENT's high-water mark: alert ids are shown to people (alerts ack ID) and must not be handed out twice.
DELETE FROM sqlite_sequence WHERE name = 'alerts_006';
INSERT INTO sqlite_sequence (name, seq) SELECT 'alerts_006', seq FROM sqlite_sequence WHERE name = 'alerts';
DROP TABLE alerts;
ALTER TABLE alerts_006 RENAME TO alerts;
-- The invariant the lifecycle relies on: at most one open alert per (pair, kind).
CREATE UNIQUE INDEX ux_alerts_open ON alerts (pair, kind) WHERE status <> 'cleared';
CREATE INDEX ix_alerts_pair ON alerts (pair, first_seen_ms DESC);
CREATE INDEX ix_alerts_cleared ON alerts (cleared_at_ms);

ALTER TABLE outbox RENAME COLUMN route TO mailing_list;
