#!/usr/bin/env bash
# `npm run bench`: measured figures for the README (closed form, twin, live-run capacity).
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
  DATABASE_URL=$(scripts/local-postgres.sh url kinetwin_bench)
  export DATABASE_URL
fi
node --import tsx sim-server/bench/run-benchmarks.ts
