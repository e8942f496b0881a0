#!/usr/bin/env bash
# npm start: install what is missing, run PostgreSQL, migrate, seed once,
# build, and serve the app with the local e-mail and Stripe fakes beside it.
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

# Mail and billing go to this checkout's own fakes unless real services are
# configured; the server starts only once they listen.
start_local_fakes
if [ -n "$RESEND_FAKE_URL" ]; then
  ensure_outbox_operator_key
  mail_info="Outbox, your own mail:                http://$HOST:$PORT/outbox  (fake: $RESEND_FAKE_URL)
  All mail (operator only, keep secret): http://$HOST:$PORT/operator/outbox?key=$OUTBOX_OPERATOR_KEY"
else
  mail_info="E-mail:                               sent through ${RESEND_BASE_URL:-the Resend API}"
fi
if [ -n "$STRIPE_FAKE_URL" ]; then
  stripe_info="Stripe fake (test card 4242…):        $STRIPE_FAKE_URL/_fake/state"
else
  stripe_info="Billing:                              Stripe (${STRIPE_API_BASE:-api.stripe.com})"
fi

if [ "${DEMO_LIVE:-1}" = "0" ]; then
  live_info="off (DEMO_LIVE=0)"
else
  live_info="on: the demo gateway posts each hour as it ends (DEMO_LIVE=0 turns it off)"
fi

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
  Live demo readings:                   $live_info
  $mail_info
  $stripe_info
  Stop the database afterwards with:    npm run db:stop

INFO
# The demo gateway (scripts/demo-feeder.ts) waits for the server, fills the
# demo's readings up to now and posts each hour as it ends; it stops with
# this script, and by itself when DEMO_LIVE=0.
node --import tsx scripts/demo-feeder.ts &
demo_feeder_pid=$!
trap 'kill "$demo_feeder_pid" 2>/dev/null || true; stop_local_fakes' EXIT
node --import tsx server.ts
