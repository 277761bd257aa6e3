-- Runs say where their window ended (window.anchor: the check time, or the newest value of the window column read
-- by anchor latest), so a check of the same load again is known as a repeat and people can read "window ended at";
-- and a run made later for a past time (check --as-of) keeps the wall-clock time it was made in back_dated_at_ms
-- (started_at_ms is the as-of time). Both are NULL for older rows and for runs without a window or made at their own time.
ALTER TABLE runs ADD COLUMN window_end_ms BIGINT;
ALTER TABLE runs ADD COLUMN back_dated_at_ms BIGINT;
