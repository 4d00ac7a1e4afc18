#!/usr/bin/env bash
# npm start: everything from a fresh machine to a served app on http://127.0.0.1:3000 —
# npm packages, Debian's PostgreSQL, the local stand-ins, migrations, the demo seed, build, serve.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$root"

ensure_node_modules
if [ -z "${DATABASE_URL:-}" ]; then eval "$(bash scripts/pg.sh start)"; fi
export DATABASE_URL

host=${PINCHPOINT_HOST:-127.0.0.1}
port=${PORT:-3000}
export NEXTAUTH_URL=${NEXTAUTH_URL:-http://$host:$port}
export NEXTAUTH_SECRET=${NEXTAUTH_SECRET:-$(ensure_secret nextauth-secret)}
export PINCHPOINT_DEMO=${PINCHPOINT_DEMO:-1}

npx tsx scripts/migrate.ts
npx tsx scripts/seed.ts

pids=()
cleanup() { for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done; }
trap cleanup EXIT INT TERM

source scripts/services.sh
start_services pids

if [ "${1:-}" = "--dev" ]; then
  node_modules/.bin/tsx scripts/analysis-worker.ts & pids+=($!)
  exec_cmd=(node node_modules/next/dist/bin/next dev -H "$host" -p "$port")
else
  if needs_build; then log "building (first build takes about two minutes)"; npx next build >&2; fi
  node_modules/.bin/tsx scripts/analysis-worker.ts & pids+=($!)
  exec_cmd=(node node_modules/next/dist/bin/next start -H "$host" -p "$port")
fi

if [ "$PINCHPOINT_DEMO" = 1 ]; then
  cat >&2 <<TXT

  Pinchpoint is starting on $NEXTAUTH_URL (demo: Harbor Pantry, environment "production")
  Demo accounts, password "pinchpoint-demo":
    admin@harbor-pantry.example      architect@harbor-pantry.example
    lead@harbor-pantry.example       engineer@harbor-pantry.example
    viewer@harbor-pantry.example

TXT
fi
"${exec_cmd[@]}" & pids+=($!)
wait "${pids[-1]}"
