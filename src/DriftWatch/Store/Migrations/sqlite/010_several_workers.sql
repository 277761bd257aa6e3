-- Several workers on one store. worker_instances: one row per running `driftwatch run` process (its heartbeat, the
-- configuration it runs and its last check), shown in /healthz and on the dashboard; a worker on a SQLite store
-- reads it to notice a second worker. worker_leases: named, expiring leases held by one worker at a time (alert
-- evaluation, store maintenance); a lease of a worker that died runs out on its own. runs.slot_at_ms: the schedule
-- slot a run was for (NULL for runs not started by the schedule, and for older rows).
CREATE TABLE worker_instances (
    id               TEXT    PRIMARY KEY,
    host             TEXT    NOT NULL,
    pid              INTEGER NOT NULL,
    started_at_ms    BIGINT  NOT NULL,
    last_seen_at_ms  BIGINT  NOT NULL,
    config_sha256    TEXT    NOT NULL,
    shared_schedule  INTEGER NOT NULL DEFAULT 0,
    last_pair        TEXT,
    last_check_at_ms BIGINT
);

CREATE TABLE worker_leases (
    name          TEXT   PRIMARY KEY,
    holder        TEXT   NOT NULL,
    expires_at_ms BIGINT NOT NULL
);

ALTER TABLE runs ADD COLUMN slot_at_ms BIGINT;
CREATE INDEX ix_runs_pair_slot ON runs (pair, slot_at_ms);
