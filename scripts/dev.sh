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
# Mail and billing go to this checkout's own fakes unless real services are
# configured (the same rule as npm start).
start_local_fakes
if [ -n "$RESEND_FAKE_URL" ]; then
  ensure_outbox_operator_key
  log "All mail (operator only): http://${HOST:-127.0.0.1}:${PORT:-3000}/operator/outbox?key=$OUTBOX_OPERATOR_KEY"
fi
NODE_ENV=development node --import tsx server.ts
