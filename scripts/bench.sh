#!/usr/bin/env bash
# `npm run bench`: measured figures for the README (closed form, twin, live-run capacity).
# `npm run bench -- "log upload"` measures only the sections named.
# Uses the project-local PostgreSQL unless DATABASE_URL is set; run it on a quiet machine.
set -euo pipefail
cd "$(dirname "$0")/.."
own_cluster=0
cleanup() { if [ "$own_cluster" = 1 ]; then scripts/local-postgres.sh stop || true; fi; }
trap cleanup EXIT
if [ -z "${DATABASE_URL:-}" ]; then
  # Stop the cluster on exit only if this script started it (another command may be using it).
  scripts/local-postgres.sh running || own_cluster=1
  scripts/local-postgres.sh start
  scripts/local-postgres.sh recreate-db kinetwin_bench
  # The owner (DATABASE_OWNER_URL) migrates and seeds; the server serves as the app role (DATABASE_URL).
  # Assigned first so that set -e stops here if the script fails (eval of nothing would not).
  db_env=$(scripts/local-postgres.sh env kinetwin_bench)
  eval "$db_env"
fi
node --import tsx sim-server/bench/run-benchmarks.ts "$@"
