-- Who did what to an alert, a snooze or a baseline, when and why (the dashboard's actions and the CLI's).
-- Times are Unix milliseconds (UTC). Never pruned with runs: the record of decisions outlives the data.
CREATE TABLE audit_log (
    id       INTEGER PRIMARY KEY AUTOINCREMENT,
    at_ms    BIGINT  NOT NULL,
    actor    TEXT    NOT NULL,
    via      TEXT    NOT NULL CHECK (via IN ('dashboard', 'cli')),
    action   TEXT    NOT NULL CHECK (action IN ('ack', 'snooze', 'unsnooze', 'baseline_accept', 'baseline_reset')),
    pair     TEXT,
    alert_id BIGINT,
    run_id   BIGINT,
    reason   TEXT,
    detail   TEXT
);
CREATE INDEX ix_audit_log_pair ON audit_log (pair, at_ms DESC);
CREATE INDEX ix_audit_log_at ON audit_log (at_ms DESC);

-- A baseline reset: the pair's next baseline is pooled only from runs started at or after reset_at_ms,
-- never from the runs already stored (they describe what was just reset).
CREATE TABLE baseline_resets (
    pair        TEXT   PRIMARY KEY,
    reset_at_ms BIGINT NOT NULL
);
