#!/usr/bin/env bash
# npm test: the same preparation as npm start for a fresh test database, then
# typecheck, lint, unit, integration and browser tests.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
started=$SECONDS

ensure_node_modules
mkdir -p "$DATA_DIR"
ensure_chromium
if [ -n "${TEST_DATABASE_URL:-}" ]; then
  export DATABASE_URL="$TEST_DATABASE_URL"
else
  ensure_cluster
  recreate_database joulebook_test
  export DATABASE_URL="$(managed_url joulebook_test)"
fi
node --import tsx scripts/migrate.ts

log "Typecheck"
npm run --silent typecheck
log "Lint"
npm run --silent lint
log "Build (the integration and browser tests run the production server)"
npm run --silent build >"$DATA_DIR/build-test.log" 2>&1 || { cat "$DATA_DIR/build-test.log"; die "build failed"; }

log "Unit tests"
npx vitest run --project unit
log "Integration tests"
npx vitest run --project integration
log "Browser tests"
npx vitest run --project browser

log "All tests passed in $((SECONDS - started)) s"
