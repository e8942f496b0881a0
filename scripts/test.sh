#!/usr/bin/env bash
# npm test: the same preparation as npm start for a fresh test database, then
# typecheck, lint, unit, integration and browser tests.
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
started=$SECONDS

ensure_node_modules
mkdir -p "$DATA_DIR"
ensure_chromium
ensure_poppler
if [ -n "${TEST_DATABASE_URL:-}" ]; then
  export DATABASE_URL="$TEST_DATABASE_URL"
else
  ensure_cluster
  recreate_database joulebook_test
  export DATABASE_URL="$(managed_url joulebook_test)"
  # The database-outage test stops and starts this cluster under a server.
  export JOULEBOOK_PG_DIR="$PG_DIR" JOULEBOOK_PG_BIN="$PG_BIN"
fi
node --import tsx scripts/migrate.ts
export SIGNING_DIR="${SIGNING_DIR:-$DATA_DIR/signing}"
node --import tsx scripts/ensure-signing-identity.ts

log "Typecheck"
npm run --silent typecheck
log "Lint"
npm run --silent lint
log "Build (the integration and browser tests run the production server)"
npm run --silent build >"$DATA_DIR/build-test.log" 2>&1 || { cat "$DATA_DIR/build-test.log"; die "build failed"; }

results="$DATA_DIR/test-results"
rm -rf "$results" && mkdir -p "$results"
for suite in unit integration browser; do
  log "${suite^} tests"
  npx vitest run --project "$suite" --reporter=default --reporter=json --outputFile.json="$results/$suite.json"
done

log "All tests passed in $((SECONDS - started)) s"
# One closing line with the counts of every suite, for people and CI alike.
node -e '
  const fs = require("fs");
  let passed = 0, failed = 0, skipped = 0;
  for (const f of fs.readdirSync(process.argv[1])) {
    const r = JSON.parse(fs.readFileSync(process.argv[1] + "/" + f, "utf8"));
    passed += r.numPassedTests; failed += r.numFailedTests; skipped += r.numPendingTests + r.numTodoTests;
  }
  console.log(`Tests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
' "$results"
