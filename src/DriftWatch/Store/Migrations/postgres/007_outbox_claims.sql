-- Who holds the lease of an unsent outbox row: a worker's id (worker.id, or its host name). At start a worker
-- takes back its own claims at once instead of waiting for their leases to run out; sending or failing clears it.
ALTER TABLE outbox ADD COLUMN claimed_by TEXT;
