#!/bin/sh
# Push one inventory file to Pinchpoint: a dry run on pull requests, a real push on the
# main branch. Needs curl; uses jq for readable output when it is installed.
#
#   push-inventory.sh [--dry-run | --push | --gate] [--env ENV] [--format F --source S]
#                     [--param NAME=VALUE ...] [--sarif OUT] [--markdown OUT] FILE
#   push-inventory.sh [...] --format compose [--source S] [--profiles a,b] FILE...
#
# --param adds a query parameter of the push, e.g. the kubernetes format's
# `--param teams=shop:storefront` or `--param cluster_domain=corp.internal`.
# A Compose project split over several files (compose.yaml, then its overrides in order,
# .env and env_file files anywhere) goes in one request: give every file, base first.
#
# --gate is a dry run that asks for the change's impact on the estate's failure points
# and holds it to the environment's change policies: it prints the impact as a Markdown
# pull-request comment (also to --markdown OUT, and to GITHUB_STEP_SUMMARY on GitHub
# Actions), writes the policy findings as a SARIF 2.1.0 file (--sarif OUT, default
# pinchpoint-impact.sarif) located at FILE's lines, and fails when a blocking policy fails.
#
# Environment:
#   PINCHPOINT_URL          base URL, e.g. https://pinchpoint.example.org (required)
#   PINCHPOINT_TOKEN        API token with the inventory:write scope (required)
#   PINCHPOINT_ENV          environment slug (default: production)
#   PINCHPOINT_MODE         dry-run | push | auto (default: auto; a flag wins over it)
#   PINCHPOINT_MAIN_BRANCH  the branch whose builds really push (default: main)
#   PINCHPOINT_BRANCH       the branch being built, when the CI's own variable is not
#                           one of GITHUB_REF_NAME, CI_COMMIT_BRANCH, BRANCH_NAME, GIT_BRANCH
#   PINCHPOINT_SARIF        where --gate writes the SARIF file (a flag wins over it)
#
# In auto mode the script looks at common CI variables (an event in CI_EVENT,
# GITHUB_EVENT_NAME or CI_PIPELINE_SOURCE; the branch): a pull- or merge-request event
# gives a dry run; a build of the main branch gives a push; anything it cannot tell is a
# dry run, so a misconfigured pipeline never changes the stored graph by accident.
#
# Exit status: 0 accepted (or dry run passed, or the gate passed, warnings included),
# 1 rejected by the server, 2 usage or set-up problem, 3 the server could not be reached,
# 4 the gate failed: a change policy at `block` fails.
set -eu

usage() {
  # The header comment above is the help text.
  awk 'NR > 1 && /^#/ { sub(/^# ?/, ""); print; next } NR > 1 { exit }' "$0" >&2
  exit 2
}

die() {
  printf 'push-inventory: %s\n' "$1" >&2
  exit 2
}

mode_flag=""
env_slug="${PINCHPOINT_ENV:-production}"
format=""
source_name=""
params=""
file=""
files=""
profiles=""
sarif_out="${PINCHPOINT_SARIF:-pinchpoint-impact.sarif}"
markdown_out=""

while [ "$#" -gt 0 ]; do
  case "$1" in
    --dry-run) mode_flag="dry-run" ;;
    --push) mode_flag="push" ;;
    --gate) mode_flag="gate" ;;
    --sarif) [ "$#" -ge 2 ] || usage; sarif_out="$2"; shift ;;
    --markdown) [ "$#" -ge 2 ] || usage; markdown_out="$2"; shift ;;
    --env) [ "$#" -ge 2 ] || usage; env_slug="$2"; shift ;;
    --format) [ "$#" -ge 2 ] || usage; format="$2"; shift ;;
    --source) [ "$#" -ge 2 ] || usage; source_name="$2"; shift ;;
    --param)
      [ "$#" -ge 2 ] || usage
      case "$2" in
        [a-z_]*=*) ;;
        *) die "--param takes NAME=VALUE (got '$2')" ;;
      esac
      params="$params $2"; shift ;;
    --profiles) [ "$#" -ge 2 ] || usage; profiles="$2"; shift ;;
    -h | --help) usage ;;
    -*) die "unknown option $1" ;;
    *)
      [ -f "$1" ] || die "no such file: $1"
      [ -z "$file" ] && file="$1"
      files="$files
$1" ;;
  esac
  shift
done

[ -n "$file" ] || usage
count="$(printf '%s\n' "$files" | grep -c .)"
if [ "$count" -gt 1 ] && [ "$format" != "compose" ]; then
  die "several files make one Compose project: add --format compose (push-all.sh pushes inventories one by one)"
fi
case "$files" in *";"* | *","*) die "file names with ; or , cannot be sent as form parts" ;; esac
[ -n "${PINCHPOINT_URL:-}" ] || die "PINCHPOINT_URL is not set"
[ -n "${PINCHPOINT_TOKEN:-}" ] || die "PINCHPOINT_TOKEN is not set"
command -v curl >/dev/null 2>&1 || die "curl is not installed"
case "$env_slug" in
  "" | -* | *[!a-z0-9-]*) die "not an environment slug: $env_slug" ;;
esac

# --- decide between a dry run and a real push ---------------------------------------
main_branch="${PINCHPOINT_MAIN_BRANCH:-main}"
mode="${mode_flag:-${PINCHPOINT_MODE:-auto}}"
reason="requested"
if [ "$mode" = "auto" ]; then
  event="${CI_EVENT:-${GITHUB_EVENT_NAME:-${CI_PIPELINE_SOURCE:-}}}"
  branch="${PINCHPOINT_BRANCH:-${GITHUB_REF_NAME:-${CI_COMMIT_BRANCH:-${BRANCH_NAME:-${GIT_BRANCH:-}}}}}"
  branch="${branch#origin/}"
  case "$event" in
    *pull_request* | *merge_request*)
      mode="dry-run"; reason="CI event '$event'" ;;
    *)
      if [ -n "$branch" ] && [ "$branch" = "$main_branch" ]; then
        mode="push"; reason="branch '$branch'"
      elif [ -n "$branch" ]; then
        mode="dry-run"; reason="branch '$branch' is not '$main_branch'"
      else
        mode="dry-run"; reason="no CI event or branch found"
      fi ;;
  esac
fi
case "$mode" in
  dry-run | push | gate) ;;
  *) die "PINCHPOINT_MODE must be dry-run, push, gate or auto (got '$mode')" ;;
esac

# --- build the request ---------------------------------------------------------------
case "$file" in
  *.json) content_type="application/json" ;;
  *.csv) content_type="text/csv" ;;
  *) content_type="application/yaml" ;;
esac

query=""
add_query() {
  if [ -z "$query" ]; then query="?$1"; else query="$query&$1"; fi
}
[ "$mode" = "push" ] || add_query "dry_run=true"
[ -n "$format" ] && add_query "format=$format"
[ -n "$source_name" ] && add_query "source=$source_name"
for p in $params; do add_query "$p"; done
[ -n "$profiles" ] && add_query "profiles=$profiles"

base="${PINCHPOINT_URL%/}/api/v1/environments/$env_slug/inventory"
body="$(mktemp)"
headers="$(mktemp)"
trap 'rm -f "$body" "$headers"' EXIT
trap 'exit 130' HUP INT TERM

# One file is the body; several are form parts in the order given, each named by the path given
# here, so issues point at the repository's own paths (Pinchpoint matches the paths compose files
# write for include, extends and env_file against these names, or their base names).
set --
if [ "$count" -gt 1 ]; then
  while IFS= read -r f; do
    [ -n "$f" ] && set -- "$@" --form "file=@$f;filename=${f#./}"
  done <<EOF_FILES
$files
EOF_FILES
  shown="$count files ($(printf '%s\n' "$files" | grep . | xargs -n 1 basename | tr '\n' ' ' | sed 's/ $//'))"
else
  set -- --header "Content-Type: $content_type" --data-binary "@$file"
  shown="$file"
fi

printf '%s %s to %s (%s)\n' "$mode" "$shown" "$env_slug" "$reason"

# POST with the query in $1 into the file $2 (response headers into $headers); the rest of the
# arguments are curl's body options. Prints the HTTP status, or fails when the server cannot be reached.
post() {
  post_query="$1"
  post_out="$2"
  shift 2
  # The token goes to curl on stdin, not on its command line, so it never shows in `ps`.
  printf 'Authorization: Bearer %s\n' "$PINCHPOINT_TOKEN" |
    curl --silent --show-error --location --max-time 120 \
      --request POST \
      --header @- \
      --header "Accept: application/json" \
      "$@" \
      --dump-header "$headers" \
      --output "$post_out" \
      --write-out '%{http_code}' \
      "$base$post_query"
}

# Percent-encode a query value, byte by byte (file paths may hold spaces or '&').
urlencode() {
  rest="$1"
  out=""
  while [ -n "$rest" ]; do
    c="${rest%"${rest#?}"}"
    rest="${rest#?}"
    case "$c" in
      [A-Za-z0-9._~/-]) out="$out$c" ;;
      *) out="$out$(printf '%s' "$c" | od -An -tx1 | tr -d ' \n' | sed 's/../%&/g')" ;;
    esac
  done
  printf '%s' "$out"
}

if [ "$mode" = "gate" ]; then
  # The path as the repository knows it, for the SARIF locations and the comment (a Compose
  # project's files name themselves in their form parts).
  [ "$count" -gt 1 ] || add_query "file=$(urlencode "${file#./}")"
  if ! status="$(post "$query&impact_format=sarif" "$body" "$@")"; then
    printf 'push-inventory: could not reach %s\n' "$PINCHPOINT_URL" >&2
    exit 3
  fi
else
  if ! status="$(post "$query" "$body" "$@")"; then
    printf 'push-inventory: could not reach %s\n' "$PINCHPOINT_URL" >&2
    exit 3
  fi
fi

have_jq=false
if command -v jq >/dev/null 2>&1 && jq -e . "$body" >/dev/null 2>&1; then
  have_jq=true
fi

# Issues and warnings as file:line:column: message, the shape editors and CI log
# viewers turn into links.
print_issues() { # $1 = jq path to the list, $2 = error | warning
  jq -r --arg file "$file" --arg level "$2" '
    ('"$1"' // [])[]
    | (.file // $file) as $f
    | (if .line then "\($f):\(.line):\(.column // 1)" else $f end) as $where
    | "\($where): \($level): \(.message)" + (if .path and .path != "" then " (at \(.path))" else "" end)
  ' "$body"
}

# GitHub Actions reads workflow commands from standard output.
annotate() { # $1 = jq path to the list, $2 = error | warning
  if [ "${GITHUB_ACTIONS:-}" = "true" ]; then
    jq -r --arg file "$file" --arg level "$2" '
      ('"$1"' // [])[]
      | "::\($level) file=\(.file // $file)" + (if .line then ",line=\(.line),col=\(.column // 1)" else "" end)
        + "::" + (.message | gsub("%"; "%25") | gsub("\r"; "%0D") | gsub("\n"; "%0A"))
    ' "$body"
  fi
}

# The gate: the SARIF answer is in $body; the Markdown comment is a second dry run (the
# server answers each format on its own, and a dry run changes nothing).
if [ "$mode" = "gate" ] && [ "$status" = "200" ]; then
  verdict="$(tr -d '\r' <"$headers" | awk -F': *' 'tolower($1) == "pinchpoint-impact" { v = $2 } END { print v }')"
  cp "$body" "$sarif_out"
  markdown="$(mktemp)"
  trap 'rm -f "$body" "$headers" "$markdown"' EXIT
  if ! status="$(post "$query&impact_format=markdown" "$markdown" "$@")"; then
    printf 'push-inventory: could not reach %s\n' "$PINCHPOINT_URL" >&2
    exit 3
  fi
  if [ "$status" = "200" ]; then
    cat "$markdown"
    [ -z "$markdown_out" ] || cp "$markdown" "$markdown_out"
    [ -z "${GITHUB_STEP_SUMMARY:-}" ] || cat "$markdown" >>"$GITHUB_STEP_SUMMARY"
  fi
  # The findings once more as file:line:column lines, the shape CI log viewers link.
  if command -v jq >/dev/null 2>&1; then
    jq -r '.runs[0].results[] | .locations[0].physicalLocation as $l
      | "\($l.artifactLocation.uri)" + (if $l.region then ":\($l.region.startLine):\($l.region.startColumn // 1)" else "" end)
        + ": \(.level): \(.message.text) [\(.ruleId)]"' "$sarif_out"
    # GitHub Actions turns workflow commands into annotations on the pull request's lines.
    if [ "${GITHUB_ACTIONS:-}" = "true" ]; then
      jq -r '.runs[0].results[] | .locations[0].physicalLocation as $l
        | "::\(.level) file=\($l.artifactLocation.uri)" + (if $l.region then ",line=\($l.region.startLine),col=\($l.region.startColumn // 1)" else "" end)
          + "::" + (.message.text | gsub("%"; "%25") | gsub("\r"; "%0D") | gsub("\n"; "%0A"))' "$sarif_out"
    fi
  fi
  printf 'SARIF written to %s\n' "$sarif_out"
  case "$verdict" in
    blocked)
      printf 'gate: FAILED, a change policy that blocks fails (an architect or admin can still push with a reason)\n' >&2
      exit 4 ;;
    warn) echo "gate: passed with warnings" ;;
    *) echo "gate: passed" ;;
  esac
  exit 0
fi

case "$status" in
  2??)
    if $have_jq; then
      jq -r '
        "changed: \(.changed)",
        (if .snapshot then "snapshot: #\(.snapshot.number) (\(.snapshot.createdAt))"
         else "snapshot: none" end),
        ((.diff // {}) | to_entries[]
          | "  \(.key): \(.value | if type == "array" then length else . end)")
      ' "$body"
      # Needs inferred from configuration (kubernetes, compose): each with its reason, to check in review.
      jq -r --arg file "$file" '
        (.inferred // null) | select(. != null)
        | "inferred needs: \(.total)",
          (.needs[] | "  \(.at.file // $file):\(.at.line // 1): \(.from) -> \(.to | join(" | ")) (\(.strength), via \(.via // "-")): \(.reason // "")")
      ' "$body"
      # What else Pinchpoint read into the files (start-up-only needs, kinds, left-out profiles), first 50.
      jq -r '(.notes // []) as $n | if ($n | length) > 0 then
          "notes: \($n | length)",
          ($n[0:50][] | "  \(.kind): \(.component)\(if .target then " → \(.target)" else "" end): \(.reason)"),
          (if ($n | length) > 50 then "  … \(($n | length) - 50) more in the JSON answer" else empty end)
        else empty end' "$body"
      count="$(jq -r '(.warnings // []) | length' "$body")"
      printf 'warnings: %s\n' "$count"
      print_issues .warnings warning
      annotate .warnings warning
    else
      cat "$body"; echo
    fi
    if [ "$mode" != "push" ]; then
      echo "dry run: nothing was stored"
    fi
    exit 0
    ;;
  422)
    printf 'rejected (HTTP 422): the file is not a valid inventory\n' >&2
    if $have_jq; then
      print_issues .issues error >&2
      annotate .issues error
    else
      cat "$body" >&2; echo >&2
    fi
    exit 1
    ;;
  000)
    printf 'push-inventory: no HTTP answer from %s\n' "$PINCHPOINT_URL" >&2
    exit 3
    ;;
  *)
    if $have_jq; then
      jq -r --arg status "$status" \
        '"rejected (HTTP \($status)): \(.error // "error"): \(.message // "")"' "$body" >&2
      print_issues .issues error >&2
    else
      printf 'rejected (HTTP %s):\n' "$status" >&2
      cat "$body" >&2; echo >&2
    fi
    exit 1
    ;;
esac
