-- What the last shared read of a table learned about each of its columns: the mean (the next read shifts the
-- column's values by it, so one scan keeps every digit) and whether every row was finite (the pairs of such
-- columns get the lean statement). Kept here rather than in each worker's memory, so a restarted worker, a
-- one-shot check and the other workers of a shared schedule start from them. A hint only saves work: the read
-- checks both and falls back to a second scan or the full statement when one is stale.
-- column_key is the SHA-256 (hex) of the table or query, the filter and the column; times are Unix milliseconds.
CREATE TABLE column_hints (
    source      TEXT             NOT NULL,
    column_key  TEXT             NOT NULL,
    mean        DOUBLE PRECISION,
    all_finite  INTEGER          NOT NULL,
    read_ms     BIGINT           NOT NULL,
    PRIMARY KEY (source, column_key)
);
