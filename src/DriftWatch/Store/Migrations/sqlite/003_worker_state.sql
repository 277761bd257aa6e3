-- Small durable facts of the worker, such as how far alert evaluation has read the runs.
CREATE TABLE worker_state (
    key   TEXT PRIMARY KEY,
    value TEXT NOT NULL
);
