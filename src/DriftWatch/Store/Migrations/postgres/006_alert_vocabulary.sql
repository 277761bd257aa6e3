-- Alert states get DriftWatch's own words: watching (seen, not yet confirmed by enough runs in a row), confirmed
-- (people are told) and cleared (a check showed the finding gone). Stored rows are converted in place; the columns
-- of the confirmation and clearing times and the outbox's mailing list follow the same words.
-- The open-alert index is dropped first: its predicate names the closed state, and converting rows under the old
-- predicate would count every closed alert as open and break its uniqueness.
DROP INDEX ux_alerts_open;
ALTER TABLE alerts DROP CONSTRAINT alerts_status_check;
UPDATE alerts SET status = CASE status
    WHEN 'pending' THEN 'watching'
    WHEN 'firing' THEN 'confirmed'
    WHEN 'resolved' THEN 'cleared'
    ELSE status END;
ALTER TABLE alerts ADD CONSTRAINT alerts_status_check CHECK (status IN ('watching', 'confirmed', 'cleared'));
ALTER TABLE alerts RENAME COLUMN fired_at_ms TO confirmed_at_ms;
ALTER TABLE alerts RENAME COLUMN resolved_at_ms TO cleared_at_ms;
ALTER INDEX ix_alerts_resolved RENAME TO ix_alerts_cleared;
-- The invariant the lifecycle relies on: at most one open alert per (pair, kind).
CREATE UNIQUE INDEX ux_alerts_open ON alerts (pair, kind) WHERE status <> 'cleared';

ALTER TABLE outbox RENAME COLUMN route TO mailing_list;
