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

# How long apt-get waits for another apt or dpkg (say, unattended upgrades)
# to let go of its lock before giving up.
APT_LOCK_TIMEOUT="${JOULEBOOK_APT_LOCK_TIMEOUT:-600}"
# Pause between tries of `apt-get update` while the package-lists lock is held.
APT_LOCK_POLL_SECONDS="${JOULEBOOK_APT_LOCK_POLL_SECONDS:-5}"

apt_install() {
  is_root || die "Missing $*; install it with: sudo apt-get install -y $*"
  log "Installing $* with apt-get (one time)…"
  APT_LOG="$DATA_DIR/apt.log"
  : >"$APT_LOG"
  local deadline=$((SECONDS + APT_LOCK_TIMEOUT))
  apt_get_waiting_for_lock "$deadline" update ||
    die "apt-get update failed; see $APT_LOG"
  apt_get_waiting_for_lock "$deadline" install -y "$@" ||
    die "apt-get install $* failed; see $APT_LOG"
}

# One apt-get command, its output added to $APT_LOG. apt waits for the dpkg
# lock itself (DPkg::Lock::Timeout) and retries downloads (Acquire::Retries);
# this says on the terminal when it waits. `apt-get update` does not wait for
# the package-lists lock (apt 2.6 refuses at once even with the timeout), so
# that refusal is tried again every few seconds until the same deadline.
apt_get_waiting_for_lock() {
  local deadline="$1"; shift
  local output status announced=""
  output="$(mktemp)"
  while :; do
    local remaining=$((deadline - SECONDS))
    [ "$remaining" -ge 1 ] || remaining=1
    DEBIAN_FRONTEND=noninteractive apt-get -q -o DPkg::Lock::Timeout="$remaining" \
      -o Acquire::Retries=3 "$@" >"$output" 2>&1 &
    local pid=$!
    while kill -0 "$pid" 2>/dev/null; do
      [ -z "$announced" ] && grep -q 'Waiting for cache lock' "$output" &&
        announce_apt_lock_wait "$output" "$remaining" && announced=1
      sleep 0.2
    done
    if wait "$pid"; then status=0; else status=$?; fi
    cat "$output" >>"$APT_LOG"
    if [ "$status" -ne 0 ] && grep -q 'Could not get lock' "$output" && [ "$SECONDS" -lt "$deadline" ]; then
      [ -z "$announced" ] && announce_apt_lock_wait "$output" "$((deadline - SECONDS))" && announced=1
      sleep "$APT_LOCK_POLL_SECONDS"
      continue
    fi
    rm -f "$output"
    return "$status"
  done
}

# "Waiting for the apt lock (held by process 812 (unattended-upgr)), up to 600 s…"
announce_apt_lock_wait() {
  local holder
  holder="$(grep -o -m1 'held by process [0-9]* ([^)]*)' "$1" || true)"
  log "Waiting for the apt lock${holder:+ ($holder)}, up to $2 s…"
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
    start_cluster
  fi
}

# Starts the cluster on its recorded port. Choosing a free port and binding it
# are two steps, so another checkout (or any program) may take the port in
# between: then the cluster moves to the next free port, recorded for later
# runs (the last `port =` line of postgresql.conf wins).
start_cluster() {
  local attempt
  for attempt in 1 2 3 4 5; do
    log "Starting PostgreSQL on 127.0.0.1:$PG_PORT"
    if as_pg "$PG_BIN/pg_ctl" -D "$PG_DIR" -l "$PG_DIR/server.log" -w -t 60 start >/dev/null; then
      return 0
    fi
    if ! tail -n 20 "$PG_DIR/server.log" | grep -q "could not bind\|Address already in use"; then
      break
    fi
    log "Port $PG_PORT is taken; moving this cluster to the next free port"
    while port_in_use "$PG_PORT"; do PG_PORT=$((PG_PORT + 1)); done
    echo "port = $PG_PORT" >>"$PG_DIR/postgresql.conf"
    echo "$PG_PORT" >"$PG_PORT_FILE"
  done
  tail -n 20 "$PG_DIR/server.log" >&2
  die "PostgreSQL did not start (log above)"
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

# A streaming standby of the managed cluster (the read-replica test) ---------

# Lets the cluster's owner role stream WAL over loopback: wal_level must be
# replica or above (the default; minimal needs a restart, so it is only
# reported), the role needs REPLICATION (initdb's superuser has it), and
# pg_hba.conf a replication line for 127.0.0.1 (initdb writes one; it is
# added, and the configuration reloaded, where it is missing).
ensure_replication_access() {
  [ "$(psql_admin -c "show wal_level")" != "minimal" ] ||
    die "wal_level is minimal in $PG_DIR/postgresql.conf: set it to replica and restart the cluster"
  if [ "$(psql_admin -c "select rolreplication from pg_roles where rolname = current_user")" != "t" ]; then
    psql_admin -c "alter role $PG_USER replication"
  fi
  if [ -z "$(psql_admin -c "select 1 from pg_hba_file_rules where 'replication' = any(database) and address = '127.0.0.1' and error is null")" ]; then
    log "Allowing replication connections from 127.0.0.1 (pg_hba.conf)"
    as_pg sh -c "echo 'host replication $PG_USER 127.0.0.1/32 scram-sha-256' >>'$PG_DIR/pg_hba.conf'"
    psql_admin -c "select pg_reload_conf()" >/dev/null
  fi
}

# start_standby DIR PORT: a hot standby of the managed cluster in a data
# folder of its own (DIR, which must not exist yet; the postgres user's when
# we are root), streaming from the cluster over loopback and serving reads on
# 127.0.0.1:PORT. pg_basebackup -R writes standby.signal and primary_conninfo;
# the primary's port and socket settings, copied with its configuration, are
# overridden on the command line. It is a throwaway copy for tests, so
# neither the copy nor the standby syncs to disk (seconds saved on a busy
# machine).
start_standby() {
  local dir="$1" port="$2"
  ensure_cluster >/dev/null
  ensure_replication_access
  [ ! -e "$dir" ] || die "$dir exists already"
  mkdir -p "$dir"
  chmod 700 "$dir"
  if is_root; then chown postgres:postgres "$dir"; fi
  as_pg env PGPASSWORD="$(cat "$PG_PASSWORD_FILE")" "$PG_BIN/pg_basebackup" \
    -h 127.0.0.1 -p "$PG_PORT" -U "$PG_USER" -D "$dir" -R -X stream -c fast -w --no-sync
  as_pg "$PG_BIN/pg_ctl" -D "$dir" -l "$dir/standby.log" -w -t 60 \
    -o "-c port=$port -c listen_addresses=127.0.0.1 -c unix_socket_directories=$dir -c hot_standby=on -c fsync=off" \
    start >/dev/null
  log "Standby of $PG_DIR serving reads on 127.0.0.1:$port"
}

# stop_standby DIR: stops a standby start_standby made and removes its folder.
stop_standby() {
  local dir="$1"
  ensure_postgres_binaries
  if [ -f "$dir/PG_VERSION" ]; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir" -m immediate -w stop >/dev/null 2>&1 || true
  fi
  rm -rf "$dir"
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

# Local fakes of hosted services ---------------------------------------------
# Every checkout runs fakes of its own on ports of its own: each fake binds the
# port recorded in the data folder (like the cluster's), or any free one, and
# reports the port it got; see fakes/listen-as-script.ts.

# The fakes this script started, and their names, index by index.
FAKE_PIDS=()
FAKE_NAMES=()

# Mail and billing go to local fakes unless real services are configured:
# exports RESEND_BASE_URL and STRIPE_API_BASE (with their keys) for the server,
# and sets RESEND_FAKE_URL / STRIPE_FAKE_URL to the fakes it started. The
# fakes stop when the calling script exits.
start_local_fakes() {
  local app_host="${HOST:-127.0.0.1}"
  [ "$app_host" = "0.0.0.0" ] && app_host="127.0.0.1"
  RESEND_FAKE_URL="" STRIPE_FAKE_URL=""
  mkdir -p "$DATA_DIR"
  trap stop_local_fakes EXIT
  local mail="" billing=""
  if [ -z "${RESEND_BASE_URL:-}" ] && [ -z "${RESEND_API_KEY:-}" ]; then
    launch_fake resend-fake OUTBOX_FILE="$DATA_DIR/outbox.json"
    mail=1
  fi
  if [ -z "${STRIPE_API_BASE:-}" ] && [ -z "${STRIPE_SECRET_KEY:-}" ]; then
    export STRIPE_WEBHOOK_SECRET="${STRIPE_WEBHOOK_SECRET:-whsec_local_fake_development_secret}"
    launch_fake stripe-fake STRIPE_FAKE_STATE_FILE="$DATA_DIR/stripe-fake.json" \
      STRIPE_FAKE_WEBHOOK_URL="http://$app_host:${PORT:-3000}/api/v1/billing/webhook"
    billing=1
  fi
  # Both start at once; each is waited for before the server may call it.
  if [ -n "$mail" ]; then
    wait_for_fake resend-fake "the e-mail fake" RESEND_FAKE_PORT
    RESEND_FAKE_URL="http://127.0.0.1:$FAKE_PORT"
    export RESEND_BASE_URL="$RESEND_FAKE_URL"
  fi
  if [ -n "$billing" ]; then
    wait_for_fake stripe-fake "the Stripe fake" STRIPE_FAKE_PORT
    STRIPE_FAKE_URL="http://127.0.0.1:$FAKE_PORT"
    export STRIPE_API_BASE="$STRIPE_FAKE_URL"
    export STRIPE_SECRET_KEY="sk_test_local_fake_key"
  fi
}

# launch_fake NAME [VAR=value…]: starts fakes/NAME.ts in the background. Its
# pid file names the fake and the script that started it (see
# stop_leftover_fake).
launch_fake() {
  local name="$1"; shift
  stop_leftover_fake "$name"
  rm -f "$DATA_DIR/$name.ready"
  env "$@" FAKE_PREFERRED_PORT="$(cat "$DATA_DIR/$name-port" 2>/dev/null || true)" \
    FAKE_READY_FILE="$DATA_DIR/$name.ready" node --import tsx "$ROOT/fakes/$name.ts" &
  FAKE_PIDS+=("$!")
  FAKE_NAMES+=("$name")
  echo "$! $$" >"$DATA_DIR/$name.pid"
}

# Sets FAKE_PORT once the fake listens, and records the port it chose for the
# next run (a port given in PORT_VARIABLE is the caller's, not recorded). A
# fake that cannot listen stops the script: the server must never fall back
# to another checkout's fake.
wait_for_fake() {
  local name="$1" what="$2" port_variable="$3"
  local ready="$DATA_DIR/$name.ready" pid
  read -r pid _ <"$DATA_DIR/$name.pid"
  local deadline=$((SECONDS + 60))
  until [ -s "$ready" ]; do
    kill -0 "$pid" 2>/dev/null || die "$what did not start (its message is above)"
    [ "$SECONDS" -lt "$deadline" ] || die "$what did not listen within 60 s"
    sleep 0.1
  done
  FAKE_PORT="$(cat "$ready")"
  rm -f "$ready"
  [ -n "${!port_variable:-}" ] || echo "$FAKE_PORT" >"$DATA_DIR/$name-port"
}

# A fake of this checkout may still run when a start is begun: left behind by
# a start that was killed (its starter is gone), which is stopped so its port
# and files are free again; or serving another start of this checkout that is
# still running, which this start refuses to share files with.
stop_leftover_fake() {
  local name="$1" pid_file="$DATA_DIR/$1.pid" fake="" starter=""
  [ -f "$pid_file" ] || return 0
  read -r fake starter <"$pid_file" || true
  if is_fake_of_this_checkout "$fake" "$name"; then
    if [ "$starter" != "$$" ] && is_running_script "$starter"; then
      die "This checkout's $name already runs (pid $fake) for another start (pid $starter); stop that one first, or give this one its own JOULEBOOK_DATA_DIR"
    fi
    log "Stopping the $name left running by an earlier start (pid $fake)"
    kill "$fake" 2>/dev/null || true
    local tries=0
    while kill -0 "$fake" 2>/dev/null && [ "$tries" -lt 50 ]; do sleep 0.1; tries=$((tries + 1)); done
    kill -0 "$fake" 2>/dev/null && kill -9 "$fake" 2>/dev/null
  fi
  rm -f "$pid_file"
}

# Guards against a recycled pid: the process must be node running this
# checkout's fakes/NAME.ts.
is_fake_of_this_checkout() {
  local pid="$1" name="$2"
  [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null || return 1
  tr '\0' ' ' <"/proc/$pid/cmdline" 2>/dev/null | grep -qF "$ROOT/fakes/$name.ts"
}

is_running_script() {
  [ -n "$1" ] && kill -0 "$1" 2>/dev/null &&
    tr '\0' ' ' <"/proc/$1/cmdline" 2>/dev/null | grep -q bash
}

stop_local_fakes() {
  local i
  for i in "${!FAKE_PIDS[@]}"; do
    kill "${FAKE_PIDS[$i]}" 2>/dev/null || true
    rm -f "$DATA_DIR/${FAKE_NAMES[$i]}.pid"
  done
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
