#!/usr/bin/env bash
# npm run bench: the benchmark sections of scripts/bench.ts. Sections that need PostgreSQL (push, kubernetes, compose,
# responsiveness, scale, http, components-list) get a cluster of their own (.data/pg-bench, never the demo's or the tests'), on
# the first free port from 54349 up, stopped again when the run ends; `--edge-list FILE` and the
# in-memory sections need none. Arguments go to scripts/bench.ts.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$root"
ensure_node_modules
ensure_apt "/usr/bin/python3 -c 'import igraph'" python3-igraph

needs_db=1
args=" $* "
only=""
prev=""
for a in "$@"; do
  [ "$prev" = "--only" ] && only=$a
  prev=$a
done
case "$args" in *" --edge-list "*) needs_db=0 ;; esac
case " $only " in "  " | " push " | " impact " | " kubernetes " | " compose " | " traces " | " responsiveness " | " scale " | " http " | " components-list ") ;; *) needs_db=0 ;; esac

if [ "$needs_db" = 1 ]; then
  export PINCHPOINT_PG_NAME=pg-bench
  export PINCHPOINT_PG_OPTIONS="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  bash scripts/pg.sh stop 2>/dev/null || true   # a cluster an interrupted run of this checkout left behind
  export PINCHPOINT_PG_PORT=${PINCHPOINT_BENCH_PG_PORT:-$(pick_port 54349)}
  trap 'bash scripts/pg.sh stop || true' EXIT
  trap 'exit 130' INT TERM
  start_local_pg "$([ -n "${PINCHPOINT_BENCH_PG_PORT:-}" ] && echo given || echo pick)"
  export PINCHPOINT_BENCH_ADMIN_URL=$DATABASE_URL
  unset DATABASE_URL
fi
# The HTTP and components-list sections serve the production build.
if [ "$needs_db" = 1 ] && { [ -z "$only" ] || [ "$only" = http ] || [ "$only" = components-list ]; } && needs_build; then log "building the app for the HTTP section"; npx next build >/dev/null; fi
# bench.ts reaches lib/data, whose modules import "server-only" (empty under the react-server condition).
node_modules/.bin/tsx --conditions=react-server scripts/bench.ts "$@"
