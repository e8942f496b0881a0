#!/usr/bin/env bash
# npm start: install what is missing, run PostgreSQL, migrate, seed once,
# build, and serve the app with the local e-mail fake beside it.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
started=$SECONDS

ensure_node_modules
mkdir -p "$DATA_DIR"
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_cluster
  ensure_database joulebook
  export DATABASE_URL="$(managed_url joulebook)"
else
  log "Using DATABASE_URL from the environment"
fi

node --import tsx scripts/migrate.ts
node --import tsx seeds/seed.ts

log "Building…"
npm run --silent build >"$DATA_DIR/build.log" 2>&1 || { cat "$DATA_DIR/build.log"; die "build failed"; }

export PORT="${PORT:-3000}"
export HOST="${HOST:-127.0.0.1}"
export NODE_ENV=production

# Mail goes to the local fake unless a real key and no base URL are given.
fake_pid=""
if [ -z "${RESEND_BASE_URL:-}" ] && [ -z "${RESEND_API_KEY:-}" ]; then
  export RESEND_FAKE_PORT="${RESEND_FAKE_PORT:-54330}"
  export RESEND_BASE_URL="http://127.0.0.1:$RESEND_FAKE_PORT"
  OUTBOX_FILE="$DATA_DIR/outbox.json" node --import tsx fakes/resend-fake.ts &
  fake_pid=$!
fi
trap '[ -n "$fake_pid" ] && kill "$fake_pid" 2>/dev/null; true' EXIT

demo_key="${DEMO_GATEWAY_KEY:-$(node --import tsx -e 'import("./seeds/demo-people.ts").then(m => console.log(m.DEFAULT_DEMO_GATEWAY_KEY))')}"
cat <<INFO

  Joulebook is ready in $((SECONDS - started)) s:  http://$HOST:$PORT

  Demo sign-ins (password: larchmere-demo-2026)
    owner            owner@larchmere.example
    energy manager   manager@larchmere.example
    finance          finance@larchmere.example
    auditor          auditor@larchmere.example
    other org owner  owner@hollowmead.example
    two orgs         consultant@fernbank.example
  Demo gateway key (development only): $demo_key
  Outbox (e-mail caught locally):       http://$HOST:$PORT/outbox
  Stop the database afterwards with:    npm run db:stop

INFO
node --import tsx server.ts
