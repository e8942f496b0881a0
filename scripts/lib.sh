# Shared set-up steps for `npm start`, `npm test` and `npm run db:*`.
# Each step checks before it acts, so a second run reuses what the first made.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
DATA_DIR="${JOULEBOOK_DATA_DIR:-$ROOT/.data}"
PG_DIR="$DATA_DIR/postgres"
PG_PORT_FILE="$DATA_DIR/pg-port"
PG_USER="joulebook"
PG_PASSWORD_FILE="$DATA_DIR/db-password"

log() { printf '\033[1;36m[joulebook]\033[0m %s\n' "$*"; }
die() { printf '\033[1;31m[joulebook] %s\033[0m\n' "$*" >&2; exit 1; }

is_root() { [ "$(id -u)" = "0" ]; }

apt_install() {
  is_root || die "Missing $*; install it with: sudo apt-get install -y $*"
  log "Installing $* with apt-get (one time)…"
  for attempt in 1 2 3; do
    if (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@") >"$DATA_DIR/apt.log" 2>&1; then
      return 0
    fi
    log "apt-get failed (attempt $attempt, see $DATA_DIR/apt.log); retrying in 10 s"
    sleep 10
  done
  die "apt-get install $* failed; see $DATA_DIR/apt.log"
}

# npm ci when node_modules is missing or older than the lock file.
ensure_node_modules() {
  cd "$ROOT"
  local stamp="node_modules/.package-lock.json"
  if [ ! -f "$stamp" ] || [ package-lock.json -nt "$stamp" ]; then
    log "Installing npm packages (npm ci)…"
    npm ci --no-audit --no-fund
  fi
}

pg_bindir() {
  local dir
  dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n1 || true)"
  [ -n "$dir" ] && [ -x "$dir/initdb" ] && echo "$dir"
}

ensure_postgres_binaries() {
  mkdir -p "$DATA_DIR"
  if [ -z "$(pg_bindir)" ]; then apt_install postgresql; fi
  PG_BIN="$(pg_bindir)" || die "PostgreSQL binaries not found after install"
}

# PostgreSQL refuses to run as root: the cluster belongs to the `postgres`
# system user when we are root, and to the current user otherwise.
as_pg() {
  if is_root; then runuser -u postgres -- "$@"; else "$@"; fi
}

# The postgres user must be able to walk down to the data folder.
ensure_traversable() {
  is_root || return 0
  local dir="$DATA_DIR"
  while [ "$dir" != "/" ]; do
    if ! runuser -u postgres -- test -x "$dir"; then
      log "Letting the postgres user traverse $dir (chmod o+x)"
      chmod o+x "$dir"
    fi
    dir="$(dirname "$dir")"
  done
}

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

# The cluster keeps the port it was created with (recorded beside it); a new
# cluster takes the first free port from 54329 up, so two checkouts coexist.
choose_pg_port() {
  if [ -f "$PG_PORT_FILE" ]; then PG_PORT="$(cat "$PG_PORT_FILE")"; return; fi
  PG_PORT="${JOULEBOOK_PG_PORT:-54329}"
  while port_in_use "$PG_PORT"; do PG_PORT=$((PG_PORT + 1)); done
  echo "$PG_PORT" >"$PG_PORT_FILE"
}

ensure_cluster() {
  ensure_postgres_binaries
  mkdir -p "$DATA_DIR"
  chmod 755 "$DATA_DIR"
  ensure_traversable
  if [ ! -f "$PG_DIR/PG_VERSION" ]; then
    rm -f "$PG_PORT_FILE"
    choose_pg_port
    log "Creating a private PostgreSQL cluster in $PG_DIR"
    umask 077
    head -c 24 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' >"$PG_PASSWORD_FILE"
    umask 022
    mkdir -p "$PG_DIR"
    is_root && chown postgres:postgres "$PG_DIR"
    chmod 700 "$PG_DIR"
    local pwfile="$PG_DIR.pw"
    cp "$PG_PASSWORD_FILE" "$pwfile"
    is_root && chown postgres "$pwfile"
    as_pg "$PG_BIN/initdb" -D "$PG_DIR" -U "$PG_USER" --pwfile="$pwfile" \
      --auth=scram-sha-256 --encoding=UTF8 --locale=C.UTF-8 >"$DATA_DIR/initdb.log"
    rm -f "$pwfile"
    cat >>"$PG_DIR/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $PG_PORT
unix_socket_directories = '$PG_DIR'
fsync = on
CONF
  fi
  choose_pg_port
  if ! as_pg "$PG_BIN/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
    log "Starting PostgreSQL on 127.0.0.1:$PG_PORT"
    as_pg "$PG_BIN/pg_ctl" -D "$PG_DIR" -l "$PG_DIR/server.log" -w -t 60 start >/dev/null ||
      { tail -n 20 "$PG_DIR/server.log" >&2; die "PostgreSQL did not start (log above)"; }
  fi
}

managed_url() {
  local db="$1"
  echo "postgres://$PG_USER:$(cat "$PG_PASSWORD_FILE")@127.0.0.1:$PG_PORT/$db"
}

psql_admin() {
  PGPASSWORD="$(cat "$PG_PASSWORD_FILE")" "$PG_BIN/psql" -h 127.0.0.1 -p "$PG_PORT" \
    -U "$PG_USER" -d postgres -v ON_ERROR_STOP=1 -qtA "$@"
}

ensure_database() {
  local db="$1"
  if [ -z "$(psql_admin -c "select 1 from pg_database where datname = '$db'")" ]; then
    log "Creating database $db"
    psql_admin -c "create database $db"
  fi
}

recreate_database() {
  local db="$1"
  psql_admin -c "drop database if exists $db with (force)"
  psql_admin -c "create database $db"
}

stop_cluster() {
  local bin; bin="$(pg_bindir || true)"
  if [ -n "$bin" ] && [ -f "$PG_DIR/PG_VERSION" ] && as_pg "$bin/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
    as_pg "$bin/pg_ctl" -D "$PG_DIR" -m fast -w stop >/dev/null
    log "PostgreSQL stopped (data kept in $PG_DIR)"
  else
    log "PostgreSQL is not running"
  fi
}

ensure_chromium() {
  if ! command -v chromium >/dev/null 2>&1; then apt_install chromium; fi
}

# pdfsig, pdftotext, pdftoppm check reports; certutil lets a test trust the
# signing CA the way an NSS-based PDF reader would.
ensure_poppler() {
  local missing=()
  command -v pdfsig >/dev/null 2>&1 || missing+=(poppler-utils)
  command -v certutil >/dev/null 2>&1 || missing+=(libnss3-tools)
  if [ ${#missing[@]} -gt 0 ]; then apt_install "${missing[@]}"; fi
}

# The key that opens every message of the local e-mail fake to the machine's
# operator (/operator/outbox); made once, readable by this user only.
ensure_outbox_operator_key() {
  local file="$DATA_DIR/outbox-operator-key"
  if [ ! -s "$file" ]; then
    (umask 077; head -c 32 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' >"$file")
  fi
  export OUTBOX_OPERATOR_KEY="${OUTBOX_OPERATOR_KEY:-$(cat "$file")}"
}
