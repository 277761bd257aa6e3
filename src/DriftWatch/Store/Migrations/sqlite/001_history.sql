-- Runs, their findings and the baselines. Times are Unix milliseconds (UTC); profile_json and
-- source_figures_json are JSON text (snake_case); points are interleaved little-endian float64 x,y pairs.
CREATE TABLE runs (
    id                  INTEGER PRIMARY KEY AUTOINCREMENT,
    pair                TEXT    NOT NULL,
    started_at_ms       BIGINT  NOT NULL,
    finished_at_ms      BIGINT  NOT NULL,
    status              TEXT    NOT NULL CHECK (status IN ('succeeded', 'failed')),
    error               TEXT,
    sample_method       TEXT,
    profile_json        TEXT,
    source_figures_json TEXT,
    points              BLOB
);
CREATE INDEX ix_runs_pair_started ON runs (pair, started_at_ms DESC);

CREATE TABLE findings (
    id        INTEGER PRIMARY KEY AUTOINCREMENT,
    run_id    BIGINT  NOT NULL REFERENCES runs (id) ON DELETE CASCADE,
    pair      TEXT    NOT NULL,
    kind      TEXT    NOT NULL,
    severity  TEXT    NOT NULL,
    p_value   DOUBLE PRECISION,
    effect    DOUBLE PRECISION,
    message   TEXT    NOT NULL
);
CREATE INDEX ix_findings_run ON findings (run_id);
CREATE INDEX ix_findings_pair ON findings (pair, kind);

CREATE TABLE baselines (
    pair           TEXT    PRIMARY KEY,
    policy         TEXT    NOT NULL,
    policy_text    TEXT    NOT NULL,
    created_at_ms  BIGINT  NOT NULL,
    covers_from_ms BIGINT  NOT NULL,
    covers_to_ms   BIGINT  NOT NULL,
    run_count      INTEGER NOT NULL,
    accepted       INTEGER NOT NULL DEFAULT 0,
    profile_json   TEXT    NOT NULL,
    points         BLOB    NOT NULL,
    -- Mean usable rows per pooled run: the yardstick for a run's sample size (the pool is larger).
    mean_run_used  DOUBLE PRECISION
);
