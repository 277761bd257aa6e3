-- Runs get a key chosen when their check starts (the worker's spool writes a run again after a crash between the
-- store write and the spool delete; the key makes that second write a no-op), and runs.status gains 'interrupted':
-- a check whose process ended before it could record anything, recorded at the next start from its marker.
-- Old rows keep a NULL key; PostgreSQL's unique index allows many NULLs.
ALTER TABLE runs ADD COLUMN run_key TEXT;
CREATE UNIQUE INDEX ux_runs_run_key ON runs (run_key);
ALTER TABLE runs DROP CONSTRAINT runs_status_check;
ALTER TABLE runs ADD CONSTRAINT runs_status_check CHECK (status IN ('succeeded', 'failed', 'unmeasurable', 'interrupted'));
