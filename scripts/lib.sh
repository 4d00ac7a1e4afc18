# Shared by scripts/start.sh and scripts/test.sh. Sourced, not run.
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
export NEXT_TELEMETRY_DISABLED=1

log() { echo "[pinchpoint] $*" >&2; }

# npm dependencies: install when node_modules is missing or older than the lockfile.
ensure_node_modules() {
  if [ ! -f "$root/node_modules/.package-lock.json" ] || [ "$root/package-lock.json" -nt "$root/node_modules/.package-lock.json" ]; then
    log "installing npm dependencies (npm ci)"
    (cd "$root" && npm ci --no-audit --no-fund --loglevel=error) >&2
  fi
}

# Debian packages, installed only when a command they provide is missing.
ensure_apt() {
  local missing=()
  while [ $# -gt 0 ]; do
    local probe=$1 pkg=$2
    shift 2
    eval "$probe" >/dev/null 2>&1 || missing+=("$pkg")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  if [ "$(id -u)" != 0 ]; then log "missing Debian packages (${missing[*]}) and not root: install them first"; return 1; fi
  log "installing Debian packages: ${missing[*]}"
  DEBIAN_FRONTEND=noninteractive apt-get update -qq >&2
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >&2
}

# A secret kept in .data/, generated once.
ensure_secret() {
  local file="$root/.data/$1"
  mkdir -p "$root/.data"
  [ -s "$file" ] || { head -c 32 /dev/urandom | base64 | tr -d '\n' > "$file"; chmod 600 "$file"; }
  cat "$file"
}

# Rebuild when any source file is newer than the last build.
needs_build() {
  local stamp="$root/.next/BUILD_ID"
  [ -f "$stamp" ] || return 0
  [ -n "$(cd "$root" && find app components lib models importers fonts public proxy.ts next.config.mjs package-lock.json postcss.config.mjs \
      -newer "$stamp" -type f -print -quit 2>/dev/null)" ]
}

wait_for_http() {
  local url=$1 tries=0
  until curl -fsS -o /dev/null "$url" 2>/dev/null; do
    tries=$((tries + 1))
    [ $tries -gt 150 ] && { log "no answer from $url after 30 s"; return 1; }
    sleep 0.2
  done
}

# Is nothing listening on 127.0.0.1:PORT? (bash's /dev/tcp: no extra tool needed)
port_free() { ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

# The first free port from $1 upward, so that a second checkout's tests do not collide with the first's.
pick_port() {
  local p=$1
  while ! port_free "$p"; do p=$((p + 1)); done
  echo "$p"
}

# Start the project-local cluster (scripts/pg.sh) and export DATABASE_URL. When the caller chose no
# port ($1 is "pick"), another checkout can take the picked one between the pick and the start: then
# the next free port is tried, twice at most. Any other failure, or a port the caller chose, stops
# here with pg.sh's own message instead of running on without a database.
start_local_pg() {
  local choice=$1 out tries=0
  while :; do
    if out=$(bash "$root/scripts/pg.sh" start); then
      eval "$out"
      export DATABASE_URL
      return 0
    fi
    tries=$((tries + 1))
    if [ "$choice" = pick ] && [ $tries -lt 3 ] && ! port_free "$PINCHPOINT_PG_PORT"; then
      log "port $PINCHPOINT_PG_PORT was taken by another process as the cluster started; trying the next free one"
      PINCHPOINT_PG_PORT=$(pick_port $((PINCHPOINT_PG_PORT + 1)))
      export PINCHPOINT_PG_PORT
      continue
    fi
    log "could not start PostgreSQL on 127.0.0.1:$PINCHPOINT_PG_PORT (see the lines above)"
    return 1
  done
}
