#!/bin/sh
# Creates the two databases of the compose setup (deploy/compose.yaml). The postgres image runs this once,
# from /docker-entrypoint-initdb.d, when its data volume is empty; later starts skip it.
#   driftwatch  DriftWatch's history store, owned by the role driftwatch (it creates its own tables at start)
#   terminal    an invented sample source: gate moves and truck trips of an inland container terminal,
#               readable (SELECT only) by the role driftwatch_reader
set -eu
: "${DRIFTWATCH_STORE_PASSWORD:?set it in deploy/driftwatch.env}"
: "${DRIFTWATCH_READER_PASSWORD:?set it in deploy/driftwatch.env}"

psql -v ON_ERROR_STOP=1 --username "${POSTGRES_USER:-postgres}" --dbname postgres \
  -v store_password="$DRIFTWATCH_STORE_PASSWORD" -v reader_password="$DRIFTWATCH_READER_PASSWORD" <<'SQL'
CREATE ROLE driftwatch LOGIN PASSWORD :'store_password';
CREATE DATABASE driftwatch OWNER driftwatch;
REVOKE ALL ON DATABASE driftwatch FROM PUBLIC;

CREATE ROLE driftwatch_reader LOGIN PASSWORD :'reader_password';
-- Sessions of this role are read-only by default; DriftWatch also sets READ ONLY on each transaction.
ALTER ROLE driftwatch_reader SET default_transaction_read_only = on;
CREATE DATABASE terminal;
REVOKE ALL ON DATABASE terminal FROM PUBLIC;
GRANT CONNECT ON DATABASE terminal TO driftwatch_reader;

\connect terminal
CREATE SCHEMA yard;

-- Invented data: declared weight against the weighbridge's reading, within a few percent.
CREATE TABLE yard.gate_moves (
    id          bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    gated_at    timestamptz NOT NULL,
    declared_kg double precision,
    weighed_kg  double precision
);
INSERT INTO yard.gate_moves (gated_at, declared_kg, weighed_kg)
SELECT now() - g * interval '3 minutes', d, d * (1 + (random() - 0.5) * 0.06) + (random() - 0.5) * 200
FROM generate_series(1, 20000) AS g, LATERAL (SELECT 4000 + random() * 26000 + g * 0 AS d) AS declared;

-- Invented data: trip length against diesel burned, about 0.33 l/km with some spread.
CREATE TABLE yard.truck_trips (
    id          bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    started_at  timestamptz NOT NULL,
    trip_km     double precision,
    fuel_litres double precision
);
INSERT INTO yard.truck_trips (started_at, trip_km, fuel_litres)
SELECT now() - g * interval '20 minutes', k, 0.33 * k + (random() - 0.5) * 0.1 * k + random() * 2
FROM generate_series(1, 5000) AS g, LATERAL (SELECT 5 + random() * 300 + g * 0 AS k) AS trip;

ANALYZE yard.gate_moves;
ANALYZE yard.truck_trips;

GRANT USAGE ON SCHEMA yard TO driftwatch_reader;
GRANT SELECT ON ALL TABLES IN SCHEMA yard TO driftwatch_reader;
SQL
