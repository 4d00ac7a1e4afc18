#!/bin/sh
# Push every Harbor Pantry inventory file (examples/harbor-pantry/*.yaml except
# teams.yaml, which is not an inventory) in turn with push-inventory.sh. Options are
# passed on, e.g. `push-all.sh --dry-run`. Keeps going after a rejected file and exits
# non-zero if any file was rejected.
#
# The first push to an environment that does not exist yet needs an admin token: the
# server creates the environment then (DESIGN §4). Needs on keys that a later file
# declares show as undeclared placeholders until that file is pushed; they disappear
# once every file is in.
set -eu

here="$(cd "$(dirname "$0")" && pwd)"
demo="${PINCHPOINT_DEMO_DIR:-$here/../harbor-pantry}"

failed=""
pushed=0
for file in "$demo"/*.yaml; do
  [ -f "$file" ] || { echo "push-all: no inventory files in $demo" >&2; exit 2; }
  [ "$(basename "$file")" = "teams.yaml" ] && continue
  if sh "$here/push-inventory.sh" "$@" "$file"; then
    pushed=$((pushed + 1))
  else
    status=$?
    failed="$failed $(basename "$file")"
    # A usage problem or an unreachable server will not get better on the next file.
    if [ "$status" -ge 2 ]; then
      echo "push-all: stopping (exit $status)" >&2
      exit "$status"
    fi
  fi
  echo
done

echo "push-all: $pushed file(s) accepted"
if [ -n "$failed" ]; then
  echo "push-all: rejected:$failed" >&2
  exit 1
fi
