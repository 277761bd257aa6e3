-- Who checks a pair's schedule slot: a pair's job that runs for slot time T claims every pair of its table group
-- due at T (one shared read), and the other pairs' jobs for T find their claim taken and return. The primary key
-- makes the claim insert-if-absent (INSERT ... ON CONFLICT DO NOTHING), so with several workers on one store
-- exactly one of them checks a pair's slot. Times are Unix milliseconds (UTC); rows older than two days are pruned.
CREATE TABLE slot_claims (
    pair        TEXT   NOT NULL,
    slot_ms     BIGINT NOT NULL,
    claimed_by  TEXT   NOT NULL,
    claimed_ms  BIGINT NOT NULL,
    PRIMARY KEY (pair, slot_ms)
);
CREATE INDEX ix_slot_claims_slot ON slot_claims (slot_ms);
