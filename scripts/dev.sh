#!/usr/bin/env bash
# npm run dev: like npm start, with Vite's hot reload instead of a build.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_cluster
  ensure_database joulebook
  export DATABASE_URL="$(managed_url joulebook)"
fi
node --import tsx scripts/migrate.ts
node --import tsx seeds/seed.ts
export RESEND_FAKE_PORT="${RESEND_FAKE_PORT:-54330}"
export RESEND_BASE_URL="${RESEND_BASE_URL:-http://127.0.0.1:$RESEND_FAKE_PORT}"
OUTBOX_FILE="$DATA_DIR/outbox.json" node --import tsx fakes/resend-fake.ts &
fake_pid=$!
trap 'kill $fake_pid 2>/dev/null; true' EXIT
NODE_ENV=development node --import tsx server.ts
