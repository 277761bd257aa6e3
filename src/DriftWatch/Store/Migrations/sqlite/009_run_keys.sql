-- Runs get a key chosen when their check starts (the worker's spool writes a run again after a crash between the
-- store write and the spool delete; the key makes that second write a no-op), and runs.status gains 'interrupted':
-- a check whose process ended before it could record anything, recorded at the next start from its marker.
-- SQLite cannot alter a CHECK constraint, so runs is rebuilt as 004 rebuilt it (create, copy, drop, rename,
-- recreate the index, keep AUTOINCREMENT's high-water mark); the migration runner turns foreign keys off around
-- SQLite scripts and checks them before committing. Old rows keep a NULL key; SQLite's unique index allows many NULLs.
CREATE TABLE runs_009 (
    id                  INTEGER PRIMARY KEY AUTOINCREMENT,
    pair                TEXT    NOT NULL,
    started_at_ms       BIGINT  NOT NULL,
    finished_at_ms      BIGINT  NOT NULL,
    status              TEXT    NOT NULL CHECK (status IN ('succeeded', 'failed', 'unmeasurable', 'interrupted')),
    error               TEXT,
    sample_method       TEXT,
    profile_json        TEXT,
    source_figures_json TEXT,
    points              BLOB,
    baseline_json       TEXT,
    run_key             TEXT
);
INSERT INTO runs_009 (id, pair, started_at_ms, finished_at_ms, status, error, sample_method, profile_json, source_figures_json, points, baseline_json)
    SELECT id, pair, started_at_ms, finished_at_ms, status, error, sample_method, profile_json, source_figures_json, points, baseline_json FROM runs;
DELETE FROM sqlite_sequence WHERE name = 'runs_009';
INSERT INTO sqlite_sequence (name, seq) SELECT 'runs_009', seq FROM sqlite_sequence WHERE name = 'runs';
DROP TABLE runs;
ALTER TABLE runs_009 RENAME TO runs;
CREATE INDEX ix_runs_pair_started ON runs (pair, started_at_ms DESC);
CREATE UNIQUE INDEX ux_runs_run_key ON runs (run_key);
