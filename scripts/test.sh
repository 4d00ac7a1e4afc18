#!/usr/bin/env bash
# npm test: the whole suite from a fresh machine — installs what is missing (npm packages,
# Debian's PostgreSQL, Chromium and the Python reference libraries), starts its own PostgreSQL
# (never the demo's), then lint, typecheck, unit, integration and end-to-end tests.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$root"
started=$(date +%s)
step() { log "── $* ($(( $(date +%s) - started )) s)"; }

ensure_node_modules
ensure_apt \
  "test -x /usr/bin/chromium" chromium \
  "/usr/bin/python3 -c 'import networkx'" python3-networkx \
  "/usr/bin/python3 -c 'import scipy'" python3-scipy \
  "/usr/bin/python3 -c 'import igraph'" python3-igraph \
  "command -v curl" curl \
  "command -v jq" jq

# Our own cluster: another port and folder than the demo's, fsync off (throwaway data). Ports not
# set by the caller are the first free ones from the defaults up, so two checkouts can test at once.
export PINCHPOINT_PG_NAME=pg-test
export PINCHPOINT_PG_OPTIONS="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
bash scripts/pg.sh stop 2>/dev/null || true   # a cluster this checkout left running earlier
export PINCHPOINT_PG_PORT=${PINCHPOINT_TEST_PG_PORT:-$(pick_port 54339)}
export PINCHPOINT_E2E_PORT=${PINCHPOINT_E2E_PORT:-$(pick_port 3100)}
export PINCHPOINT_E2E_OIDC_PORT=${PINCHPOINT_E2E_OIDC_PORT:-$(pick_port 3111)}
export PINCHPOINT_E2E_SMTP_PORT=${PINCHPOINT_E2E_SMTP_PORT:-$(pick_port 2535)}
# What the suite starts, it stops, whether it passes, fails or is interrupted.
trap 'bash scripts/pg.sh stop || true' EXIT
trap 'exit 130' INT TERM
start_local_pg "$([ -n "${PINCHPOINT_TEST_PG_PORT:-}" ] && echo given || echo pick)"
export PINCHPOINT_TEST_ADMIN_URL=$DATABASE_URL
export NEXTAUTH_SECRET=test-secret-not-for-production
export PINCHPOINT_DEMO=1

step "lint"
npm run --silent lint   # eslint (the layers included) and knip (no unused files, dependencies or exports: knip.jsonc)
step "typecheck"
npx tsc --noEmit
step "unit tests"
results="$root/test-results/vitest"
rm -rf "$results" && mkdir -p "$results"
run_vitest() { npx vitest run --project "$1" --reporter=default --reporter=json --outputFile.json="$results/$1.json"; }
run_vitest unit
step "integration tests"
run_vitest integration

step "end-to-end: build"
if needs_build; then npx next build >/dev/null; fi
step "end-to-end: tests"
run_vitest e2e
step "all passed"
# One closing line over the three runs, in the plain form CI reads.
node -e '
  const fs = require("fs"); let p = 0, f = 0, s = 0;
  for (const n of ["unit", "integration", "e2e"]) {
    const r = JSON.parse(fs.readFileSync(process.argv[1] + "/" + n + ".json", "utf8"));
    p += r.numPassedTests; f += r.numFailedTests; s += r.numPendingTests + (r.numTodoTests || 0);
  }
  console.log(`${p} passed, ${f} failed, ${s} skipped`);
' "$results"
