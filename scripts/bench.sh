#!/usr/bin/env bash
# npm run bench: the benchmark sections of scripts/bench.ts, with a local PostgreSQL for the push
# section (the test cluster, never the demo's data). Arguments go to scripts/bench.ts.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$root"
ensure_node_modules
ensure_apt "/usr/bin/python3 -c 'import igraph'" python3-igraph
export PINCHPOINT_PG_PORT=${PINCHPOINT_TEST_PG_PORT:-54339} PINCHPOINT_PG_NAME=pg-test
export PINCHPOINT_PG_OPTIONS="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
eval "$(bash scripts/pg.sh start)"
export PINCHPOINT_BENCH_ADMIN_URL=$DATABASE_URL
unset DATABASE_URL
exec npx tsx scripts/bench.ts "$@"
