#!/usr/bin/env bash
# The project's one test command (README "Quick start", called by .ci/run).
# Installs and starts what the tests need when it is missing, runs every test project, and ends with
# one line "N passed, N failed" totalled over all projects.
#   - PostgreSQL: DRIFTWATCH_TEST_PG if set; else Testcontainers when a Docker engine answers; else a
#     throwaway cluster from the operating system's packages (installed if missing), on a free loopback port.
#   - MariaDB (the mysql source kind): DRIFTWATCH_TEST_MYSQL if set; else a throwaway mariadbd from the
#     operating system's packages (installed if missing: about 75 s once), on a free loopback port, with
#     its socket and data in the temp dir; no systemd.
#   - Chromium for the browser tests: /usr/bin/chromium, installed from packages if missing.
#   - SMTP: an in-process server inside the tests (netDumbster); nothing to install.
set -uo pipefail
cd "$(dirname "$0")/.."
root=$(pwd)
work=$(mktemp -d /tmp/driftwatch-test.XXXXXX)
pgdata=""
pg_bin=""
mariadb_dir=""

log() { printf '[run-all] %s\n' "$*" >&2; }

apt_updated=0
apt_install() {
  if [ "$(id -u)" != 0 ]; then log "need root to install $*; install them and re-run"; return 1; fi
  if [ $apt_updated = 0 ]; then apt-get update -qq >"$work/apt.log" 2>&1 || true; apt_updated=1; fi
  log "installing $* from the operating system's packages"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >>"$work/apt.log" 2>&1
}

cleanup() {
  if [ -n "$pgdata" ] && [ -n "$pg_bin" ]; then
    runuser -u postgres -- "$pg_bin/pg_ctl" -D "$pgdata" -m fast -w stop >/dev/null 2>&1 || true
  fi
  if [ -n "$mariadb_dir" ] && [ -f "$mariadb_dir/mysqld.pid" ]; then
    mariadb-admin --no-defaults --socket="$mariadb_dir/mysqld.sock" -uroot shutdown >/dev/null 2>&1 \
      || kill -TERM "$(cat "$mariadb_dir/mysqld.pid")" 2>/dev/null || true
  fi
  rm -rf "$work"
}
trap cleanup EXIT

free_port() {
  local p from=${1:-55432}
  for p in $(seq "$from" $((from + 100))); do
    if ! ss -ltn 2>/dev/null | grep -q ":$p "; then echo "$p"; return 0; fi
  done
  return 1
}

start_postgres() {
  pg_bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
  if [ -z "$pg_bin" ] || [ ! -x "$pg_bin/initdb" ]; then
    apt_install postgresql-15 || return 1
    pg_bin=$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -n 1)
  fi
  id postgres >/dev/null 2>&1 || useradd --system --no-create-home postgres
  pgdata="$work/pg"
  mkdir -p "$pgdata" && chown postgres "$work" "$pgdata" && chmod 700 "$pgdata"
  local port; port=$(free_port) || { log "no free port for PostgreSQL"; return 1; }
  # initdb refuses root; trust auth is fine on a loopback-only throwaway cluster.
  runuser -u postgres -- "$pg_bin/initdb" -D "$pgdata" -U postgres -A trust -E UTF8 --locale=C.UTF-8 --no-sync >"$work/initdb.log" 2>&1 \
    || { cat "$work/initdb.log" >&2; return 1; }
  runuser -u postgres -- "$pg_bin/pg_ctl" -D "$pgdata" -l "$pgdata/log" -w \
    -o "-c listen_addresses=127.0.0.1 -p $port -k $pgdata -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200" start >/dev/null \
    || { cat "$pgdata/log" >&2; return 1; }
  export DRIFTWATCH_TEST_PG="Host=127.0.0.1;Port=$port;Username=postgres;Database=postgres"
  log "PostgreSQL $("$pg_bin/postgres" --version | awk '{print $3}') on 127.0.0.1:$port"
}

start_mariadb() {
  if [ ! -x /usr/sbin/mariadbd ]; then
    # The package's service start is refused without systemd; the install still succeeds.
    apt_install mariadb-server || return 1
  fi
  mariadb_dir="$work/mariadb"
  mkdir -p "$mariadb_dir" && chown mysql:mysql "$mariadb_dir"
  chmod o+x "$work"
  local port; port=$(free_port 33306) || { log "no free port for MariaDB"; return 1; }
  # --no-defaults keeps /etc/mysql out; the small InnoDB settings make install and start take about a second.
  local small="--innodb-log-file-size=8M --innodb-buffer-pool-size=32M --innodb-doublewrite=0 --innodb-flush-log-at-trx-commit=0"
  # shellcheck disable=SC2086
  mariadb-install-db --no-defaults --user=mysql --datadir="$mariadb_dir/data" --skip-test-db $small >"$work/mariadb-install.log" 2>&1 \
    || { cat "$work/mariadb-install.log" >&2; return 1; }
  # shellcheck disable=SC2086
  runuser -u mysql -- /usr/sbin/mariadbd --no-defaults --datadir="$mariadb_dir/data" --bind-address=127.0.0.1 --port="$port" \
    --socket="$mariadb_dir/mysqld.sock" --pid-file="$mariadb_dir/mysqld.pid" --log-error="$mariadb_dir/error.log" \
    --skip-name-resolve $small >/dev/null 2>&1 &
  local i
  for i in $(seq 1 300); do
    mariadb-admin --no-defaults --socket="$mariadb_dir/mysqld.sock" -uroot ping >/dev/null 2>&1 && break
    if [ "$i" = 300 ]; then cat "$mariadb_dir/error.log" >&2; return 1; fi
    sleep 0.1
  done
  # Tests create a database of their own per class: the account needs every right on this throwaway server.
  mariadb --no-defaults --socket="$mariadb_dir/mysqld.sock" -uroot -e \
    "CREATE USER 'driftwatch'@'127.0.0.1' IDENTIFIED BY 'driftwatch'; GRANT ALL ON *.* TO 'driftwatch'@'127.0.0.1' WITH GRANT OPTION;" \
    || return 1
  export DRIFTWATCH_TEST_MYSQL="Server=127.0.0.1;Port=$port;User ID=driftwatch;Password=driftwatch"
  log "MariaDB $(/usr/sbin/mariadbd --version | awk '{print $3}') on 127.0.0.1:$port"
}

if [ -z "${DRIFTWATCH_TEST_MYSQL:-}" ]; then
  start_mariadb || { log "could not start MariaDB"; [ "${CI:-}" = true ] && exit 1; }
fi

if [ -z "${DRIFTWATCH_TEST_PG:-}" ]; then
  if command -v docker >/dev/null 2>&1 && docker info >/dev/null 2>&1; then
    log "Docker engine found: integration tests start PostgreSQL with Testcontainers"
  else
    start_postgres || { log "could not start PostgreSQL"; [ "${CI:-}" = true ] && exit 1; }
  fi
fi

if [ -z "${DRIFTWATCH_CHROMIUM:-}" ]; then
  if [ ! -x /usr/bin/chromium ]; then apt_install chromium || log "could not install chromium"; fi
  [ -x /usr/bin/chromium ] && export DRIFTWATCH_CHROMIUM=/usr/bin/chromium
fi

log "building"
if ! dotnet build DriftWatch.sln -c Release -nologo -v q >"$work/build.log" 2>&1; then
  grep -E "error|Error" "$work/build.log" | sort -u | head -40 >&2
  echo "0 passed, 1 failed"
  exit 1
fi

status=0
out="$work/test.log"
for project in tests/*/; do
  name=$(basename "$project")
  [ -f "$project/$name.csproj" ] || continue
  grep -q '<IsTestProject>true' "$project/$name.csproj" || continue
  log "testing $name"
  dotnet test "$project" -c Release --no-build -nologo --logger "console;verbosity=normal" 2>&1 | tee -a "$out" \
    | grep -E "^\s*(Failed|Passed|Skipped) [A-Za-z]|error|Passed!|Failed!|Total tests|Error Message" | grep -vE "^\s*Passed [A-Za-z]" >&2
  [ "${PIPESTATUS[0]}" = 0 ] || status=1
done

# Each failure in full (the filter above keeps the run readable but cuts the message itself).
if grep -qE '^\s*Failed [A-Za-z]' "$out"; then
  log "failures in detail:"
  grep -E -A 14 '^\s*Failed [A-Za-z]' "$out" >&2
fi

passed=$(grep -Eo 'Passed: +[0-9]+' "$out" | awk '{s+=$2} END {print s+0}')
failed=$(grep -Eo 'Failed: +[0-9]+' "$out" | awk '{s+=$2} END {print s+0}')
[ "$failed" -gt 0 ] && status=1
if [ "$status" != 0 ] && [ "$failed" = 0 ]; then failed=1; fi
echo "$passed passed, $failed failed"
exit $status
