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
ensure_outbox_operator_key
echo "All mail (operator only): http://${HOST:-127.0.0.1}:${PORT:-3000}/operator/outbox?key=$OUTBOX_OPERATOR_KEY"
# Billing goes to the local Stripe fake unless a key or a base URL is given.
stripe_pid=""
if [ -z "${STRIPE_API_BASE:-}" ] && [ -z "${STRIPE_SECRET_KEY:-}" ]; then
  export STRIPE_FAKE_PORT="${STRIPE_FAKE_PORT:-54331}"
  export STRIPE_API_BASE="http://127.0.0.1:$STRIPE_FAKE_PORT"
  export STRIPE_SECRET_KEY="sk_test_local_fake_key"
  export STRIPE_WEBHOOK_SECRET="${STRIPE_WEBHOOK_SECRET:-whsec_local_fake_development_secret}"
  app_host="${HOST:-127.0.0.1}"; [ "$app_host" = "0.0.0.0" ] && app_host="127.0.0.1"
  STRIPE_FAKE_STATE_FILE="$DATA_DIR/stripe-fake.json" \
    STRIPE_FAKE_WEBHOOK_URL="http://$app_host:${PORT:-3000}/api/v1/billing/webhook" \
    node --import tsx fakes/stripe-fake.ts &
  stripe_pid=$!
fi
trap 'kill $fake_pid 2>/dev/null; [ -n "$stripe_pid" ] && kill "$stripe_pid" 2>/dev/null; true' EXIT
NODE_ENV=development node --import tsx server.ts
