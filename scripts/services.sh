# Local stand-ins for outside services (DESIGN §7). Sourced by start.sh and test.sh.
# start_services ARRAY_NAME: starts each stand-in in the background and appends its pid.
start_services() {
  local -n _pids=$1
  : "${_pids[@]+}"
}
