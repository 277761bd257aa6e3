-- The webhook channel: outbox rows may be for channel 'webhook' (their mime column then holds the JSON document that is
-- posted, byte for byte, so a retry posts the same body), and a message a receiver refused for good (HTTP 4xx other
-- than 408 and 429) is marked failed_at_ms: kept for audit, never claimed again.
ALTER TABLE outbox DROP CONSTRAINT outbox_channel_check;
ALTER TABLE outbox ADD CONSTRAINT outbox_channel_check CHECK (channel IN ('smtp', 'file', 'webhook'));
ALTER TABLE outbox ADD COLUMN failed_at_ms BIGINT;
DROP INDEX ix_outbox_due;
CREATE INDEX ix_outbox_due ON outbox (next_attempt_at_ms) WHERE sent_at_ms IS NULL AND failed_at_ms IS NULL;
CREATE INDEX ix_outbox_failed ON outbox (failed_at_ms) WHERE failed_at_ms IS NOT NULL;
