#!/usr/bin/env bash
# `npm test`: every check Kinetwin has, in order, against real parts:
#   1 type checks (shared + sim-server + drizzle, the app, its specs, the browser tests)
#   2 unit tests (vitest: shared/ and sim-server/)
#   3 app unit tests (Angular's vitest-based runner)
#   4 integration tests (real PostgreSQL in a fresh database, real sockets)
#   5 browser tests (Debian's Chromium through playwright-core against the built app)
# Every runner runs even when an earlier one failed; the run ends with a line per runner, a
# total, and a non-zero exit on any failure. Logs go to test-results/.
set -uo pipefail
cd "$(dirname "$0")/.."
export NG_CLI_ANALYTICS=false CI="${CI:-true}" FORCE_COLOR=0 NO_COLOR=1

results=test-results
rm -rf "$results"
mkdir -p "$results"

own_cluster=0
cleanup() { if [ "$own_cluster" = 1 ]; then scripts/local-postgres.sh stop || true; fi; }
trap cleanup EXIT

declare -a names=() verdicts=() counts=()
total_passed=0
total_failed=0

# Runs one runner, keeps its log, and reads its "Tests  N passed" / "N failed" line.
run() {
  local name=$1
  shift
  local log="$results/$name.log" started=$SECONDS
  echo "=== $name: $*"
  "$@" 2>&1 | tee "$log"
  local rc=${PIPESTATUS[0]}
  local line passed failed
  line=$(sed 's/\x1b\[[0-9;]*m//g' "$log" | grep -E '^ *Tests +[0-9]' | tail -n 1)
  passed=$(grep -oE '[0-9]+ passed' <<<"$line" | grep -oE '[0-9]+' || echo 0)
  failed=$(grep -oE '[0-9]+ failed' <<<"$line" | grep -oE '[0-9]+' || echo 0)
  if [ -z "$line" ]; then
    # A runner without test counts (the type checks) counts as one check.
    if [ "$rc" -eq 0 ]; then passed=1; else failed=1; fi
  elif [ "$rc" -ne 0 ] && [ "$failed" -eq 0 ]; then
    failed=1
  fi
  names+=("$name")
  verdicts+=("$([ "$rc" -eq 0 ] && echo ok || echo FAILED)")
  counts+=("$passed passed, $failed failed, $((SECONDS - started)) s")
  total_passed=$((total_passed + passed))
  total_failed=$((total_failed + failed))
}

typecheck() {
  npx tsc -p tsconfig.node.json --noEmit &&
    npx tsc -p e2e/tsconfig.json --noEmit &&
    npx tsc -p app/tsconfig.app.json --noEmit &&
    npx tsc -p app/tsconfig.spec.json --noEmit
}

ensure_chromium() {
  [ -x /usr/bin/chromium ] && return 0
  echo "[test] installing Debian's chromium for the browser tests (one time)"
  local sudo=""
  [ "$(id -u)" -eq 0 ] || sudo=sudo
  $sudo env DEBIAN_FRONTEND=noninteractive apt-get update -qq &&
    $sudo env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
}

browser_tests() {
  ensure_chromium || { echo "[test] error: could not install chromium with apt-get"; return 1; }
  echo "[test] building the app"
  npx ng build > "$results/app-build.log" 2>&1 || { tail -n 40 "$results/app-build.log"; return 1; }
  npx vitest run --config vitest.e2e.config.ts
}

run typecheck typecheck
run unit npx vitest run --config vitest.config.ts
run app npx ng test --watch=false

if [ -z "${DATABASE_URL:-}" ]; then
  # Stop the cluster on exit only if this script started it (another command may be using it).
  scripts/local-postgres.sh running || own_cluster=1
  scripts/local-postgres.sh start
  scripts/local-postgres.sh recreate-db kinetwin_test
  # Both roles: the owner migrates and writes fixtures, the server serves as the app role.
  eval "$(scripts/local-postgres.sh env kinetwin_test)"
else
  echo "[test] using DATABASE_URL and DATABASE_OWNER_URL from the environment; its tables are migrated and seeded"
fi
run integration npx vitest run --config vitest.integration.config.ts
run browser browser_tests

echo
echo "=== summary"
for i in "${!names[@]}"; do
  printf '%-12s %-7s %s\n' "${names[$i]}:" "${verdicts[$i]}" "${counts[$i]}"
done
echo "total: $total_passed passed, $total_failed failed"
[ "$total_failed" -eq 0 ] && ! printf '%s\n' "${verdicts[@]}" | grep -q FAILED
