#!/usr/bin/env bash
# npm start: everything from a fresh machine to a served app on http://127.0.0.1:3000 —
# npm packages, Debian's PostgreSQL, the local stand-ins, migrations, the demo seed, build, serve,
# an analysis worker kept running by a supervisor, and a last check of /api/health.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$root"

ensure_node_modules
if [ -z "${DATABASE_URL:-}" ]; then eval "$(bash scripts/pg.sh start)"; fi
export DATABASE_URL

host=${PINCHPOINT_HOST:-127.0.0.1}
port=${PORT:-3000}
# Say which port is taken before anything starts, rather than fail halfway with EADDRINUSE.
port_taken_by_other() { ! port_free "$1" && { log "port $1 on 127.0.0.1 is taken by another process; $2"; return 0; }; return 1; }
if port_taken_by_other "$port" "choose another with PORT"; then exit 1; fi
if [ -z "${PINCHPOINT_SMTP_URL:-}" ] && port_taken_by_other "${PINCHPOINT_SMTP_PORT:-2525}" "choose another with PINCHPOINT_SMTP_PORT"; then exit 1; fi
if [ -z "${PINCHPOINT_OIDC_ISSUER:-}" ] && port_taken_by_other "${PINCHPOINT_OIDC_PORT:-3001}" "choose another with PINCHPOINT_OIDC_PORT"; then exit 1; fi
export NEXTAUTH_URL=${NEXTAUTH_URL:-http://$host:$port}
export NEXTAUTH_SECRET=${NEXTAUTH_SECRET:-$(ensure_secret nextauth-secret)}
export PINCHPOINT_DEMO=${PINCHPOINT_DEMO:-1}

# Scripts that reach lib/data run under the react-server condition: its modules import "server-only".
node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx --conditions=react-server scripts/seed.ts

pids=()
cleanup() { for pid in "${pids[@]}"; do kill "$pid" 2>/dev/null || true; done; }
trap cleanup EXIT INT TERM

source scripts/services.sh
start_services pids

# The server reads the caller's address from the socket (scripts/serve.ts), not from a header the
# caller wrote; the worker is restarted with a growing wait whenever it stops.
if [ "${1:-}" = "--dev" ]; then
  node_modules/.bin/tsx scripts/supervise-worker.ts & pids+=($!)
  exec_cmd=(node_modules/.bin/tsx scripts/serve.ts --dev -H "$host" -p "$port")
else
  if needs_build; then
    # A production install (npm ci --omit=dev) runs a build made elsewhere; it has no tools to make one.
    if [ ! -d node_modules/tailwindcss ]; then log "the app needs a build, and this install has no build tools (npm ci --omit=dev): build with npm ci && npm run build, then bring ${PINCHPOINT_DIST_DIR:-.next} along"; exit 1; fi
    log "building (first build takes about two minutes)"; npx next build >&2
  fi
  node_modules/.bin/tsx scripts/supervise-worker.ts & pids+=($!)
  exec_cmd=(node_modules/.bin/tsx scripts/serve.ts -H "$host" -p "$port")
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
server=${pids[-1]}
# Our own readiness check: the health endpoint answers once the app, its database and a worker are up.
health="http://127.0.0.1:$port/api/health"
for _ in $(seq 1 150); do
  kill -0 "$server" 2>/dev/null || break
  if report=$(curl -fsS "$health" 2>/dev/null); then
    case "$report" in
      *'"status":"ok"'*) log "ready: $NEXTAUTH_URL (health: ok)"; break ;;
      *) ;; # degraded: the worker has not reported yet; give it a moment
    esac
  fi
  sleep 0.2
done
curl -fsS "$health" 2>/dev/null | grep -q '"status":"ok"' || log "health check: $(curl -sS "$health" 2>/dev/null || echo "no answer from $health")"
wait "$server"
