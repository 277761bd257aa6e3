-- runs.status gains 'unmeasurable': a check that ran but had nothing to measure (no rows, too few usable rows,
-- a constant column). SQLite cannot alter a CHECK constraint, so the table is rebuilt the documented way
-- (create the new table, copy, drop, rename, recreate the index). The migration runner turns foreign keys off
-- around SQLite scripts and runs foreign_key_check before committing, so dropping the old table does not
-- cascade into findings, and the findings' reference to "runs" binds to the renamed table.
CREATE TABLE runs_004 (
    id                  INTEGER PRIMARY KEY AUTOINCREMENT,
    pair                TEXT    NOT NULL,
    started_at_ms       BIGINT  NOT NULL,
    finished_at_ms      BIGINT  NOT NULL,
    status              TEXT    NOT NULL CHECK (status IN ('succeeded', 'failed', 'unmeasurable')),
    error               TEXT,
    sample_method       TEXT,
    profile_json        TEXT,
    source_figures_json TEXT,
    points              BLOB
);
INSERT INTO runs_004 (id, pair, started_at_ms, finished_at_ms, status, error, sample_method, profile_json, source_figures_json, points)
    SELECT id, pair, started_at_ms, finished_at_ms, status, error, sample_method, profile_json, source_figures_json, points FROM runs;
-- Keep AUTOINCREMENT's high-water mark: ids of pruned runs must never be handed out again (the alert watermark
-- in worker_state is a run id, and a reused lower id would never be evaluated).
DELETE FROM sqlite_sequence WHERE name = 'runs_004';
INSERT INTO sqlite_sequence (name, seq) SELECT 'runs_004', seq FROM sqlite_sequence WHERE name = 'runs';
DROP TABLE runs;
ALTER TABLE runs_004 RENAME TO runs;
CREATE INDEX ix_runs_pair_started ON runs (pair, started_at_ms DESC);
