# Local stand-ins for outside services (DESIGN §7), started by start.sh. Sourced, not run.
# start_services ARRAY_NAME: starts each stand-in in the background, appends its pid, and exports
# the settings the app needs to reach it. A setting already given in the environment wins, and
# pointing one at a real service (PINCHPOINT_OIDC_ISSUER, PINCHPOINT_SMTP_URL) skips its stand-in.
start_services() {
  local -n _pids=$1
  if [ -z "${PINCHPOINT_SMTP_URL:-}" ]; then
    # The stand-ins are development tools: a production install points at real services instead.
    if [ ! -d "$root/node_modules/smtp-server" ]; then log "set PINCHPOINT_SMTP_URL: the local mail sink is not installed here (npm ci --omit=dev)"; return 1; fi
    export PINCHPOINT_SMTP_PORT=${PINCHPOINT_SMTP_PORT:-2525}
    export PINCHPOINT_MAIL_DIR=${PINCHPOINT_MAIL_DIR:-$root/.data/mail}
    export PINCHPOINT_SMTP_URL="smtp://127.0.0.1:$PINCHPOINT_SMTP_PORT"
    # tsx itself, not npx: npx does not pass SIGTERM on, and the sink would outlive us.
    node_modules/.bin/tsx scripts/mail-sink.ts & _pids+=($!)
  fi
  if [ -z "${PINCHPOINT_OIDC_ISSUER:-}" ]; then
    if [ ! -d "$root/node_modules/oidc-provider" ]; then log "set PINCHPOINT_OIDC_ISSUER: the local sign-on stand-in is not installed here (npm ci --omit=dev)"; return 1; fi
    export PINCHPOINT_OIDC_PORT=${PINCHPOINT_OIDC_PORT:-3001}
    export PINCHPOINT_OIDC_ISSUER="http://127.0.0.1:$PINCHPOINT_OIDC_PORT"
    node_modules/.bin/tsx scripts/oidc-standin.ts & _pids+=($!)
    wait_for_http "$PINCHPOINT_OIDC_ISSUER/.well-known/openid-configuration"
  fi
}
