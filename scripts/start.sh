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
# Reports are signed with REPORT_SIGNING_P12 when given, else with a local CA
# and certificate made once and kept with the data.
export SIGNING_DIR="${SIGNING_DIR:-$DATA_DIR/signing}"
node --import tsx scripts/ensure-signing-identity.ts

log "Building…"
npm run --silent build >"$DATA_DIR/build.log" 2>&1 || { cat "$DATA_DIR/build.log"; die "build failed"; }

export PORT="${PORT:-3000}"
export HOST="${HOST:-127.0.0.1}"
export NODE_ENV=production

# Mail goes to the local fake unless a real key and no base URL are given.
fake_pid=""
outbox_info="E-mail:                               sent through Resend"
if [ -z "${RESEND_BASE_URL:-}" ] && [ -z "${RESEND_API_KEY:-}" ]; then
  export RESEND_FAKE_PORT="${RESEND_FAKE_PORT:-54330}"
  export RESEND_BASE_URL="http://127.0.0.1:$RESEND_FAKE_PORT"
  OUTBOX_FILE="$DATA_DIR/outbox.json" node --import tsx fakes/resend-fake.ts &
  fake_pid=$!
  ensure_outbox_operator_key
  outbox_info="Outbox, your own mail:                http://$HOST:$PORT/outbox
  All mail (operator only, keep secret): http://$HOST:$PORT/operator/outbox?key=$OUTBOX_OPERATOR_KEY"
fi

# Billing goes to the local Stripe fake unless a key or a base URL is given.
stripe_pid=""
stripe_info="Billing:                              Stripe (${STRIPE_API_BASE:-api.stripe.com})"
if [ -z "${STRIPE_API_BASE:-}" ] && [ -z "${STRIPE_SECRET_KEY:-}" ]; then
  export STRIPE_FAKE_PORT="${STRIPE_FAKE_PORT:-54331}"
  export STRIPE_API_BASE="http://127.0.0.1:$STRIPE_FAKE_PORT"
  export STRIPE_SECRET_KEY="sk_test_local_fake_key"
  export STRIPE_WEBHOOK_SECRET="${STRIPE_WEBHOOK_SECRET:-whsec_local_fake_development_secret}"
  app_host="$HOST"; [ "$app_host" = "0.0.0.0" ] && app_host="127.0.0.1"
  STRIPE_FAKE_STATE_FILE="$DATA_DIR/stripe-fake.json" \
    STRIPE_FAKE_WEBHOOK_URL="http://$app_host:$PORT/api/v1/billing/webhook" \
    node --import tsx fakes/stripe-fake.ts &
  stripe_pid=$!
  stripe_info="Stripe fake (test card 4242…):        $STRIPE_API_BASE/_fake/state"
fi
trap '[ -n "$fake_pid" ] && kill "$fake_pid" 2>/dev/null; [ -n "$stripe_pid" ] && kill "$stripe_pid" 2>/dev/null; true' EXIT

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
  $outbox_info
  $stripe_info
  Stop the database afterwards with:    npm run db:stop

INFO
node --import tsx server.ts
