-- runs.status gains 'unmeasurable': a check that ran but had nothing to measure (no rows, too few usable rows,
-- a constant column). runs_status_check is the name PostgreSQL gave the column constraint of 001_history.
ALTER TABLE runs DROP CONSTRAINT runs_status_check;
ALTER TABLE runs ADD CONSTRAINT runs_status_check CHECK (status IN ('succeeded', 'failed', 'unmeasurable'));
