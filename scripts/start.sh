#!/usr/bin/env bash
# `npm start`: local PostgreSQL (unless DATABASE_URL is set), build the app, migrate, seed, serve.
# With DATABASE_URL set, set DATABASE_OWNER_URL too (or migrate separately: npm run db:migrate).
# Ctrl-C stops the server and then the cluster this script started.
set -euo pipefail
cd "$(dirname "$0")/.."
export NG_CLI_ANALYTICS=false

own_cluster=0
server_pid=""
cleanup() {
  if [ -n "$server_pid" ]; then kill -TERM "$server_pid" 2>/dev/null || true; wait "$server_pid" 2>/dev/null || true; fi
  if [ "$own_cluster" = 1 ]; then scripts/local-postgres.sh stop || true; fi
}
trap cleanup EXIT
trap 'exit 130' INT TERM

if [ -z "${DATABASE_URL:-}" ]; then
  # Stop the cluster on exit only if this script started it (another command may be using it).
  scripts/local-postgres.sh running || own_cluster=1
  scripts/local-postgres.sh start
  scripts/local-postgres.sh create-db kinetwin
  # The owner (DATABASE_OWNER_URL) migrates and seeds; the server serves as the app role (DATABASE_URL).
  # Assigned first so that set -e stops here if the script fails (eval of nothing would not).
  db_env=$(scripts/local-postgres.sh env kinetwin)
  eval "$db_env"
fi

# Sessions outlive a restart only with a stable secret; keep one beside the local data.
mkdir -p .data
if [ -z "${SESSION_SECRET:-}" ]; then
  [ -s .data/session-secret ] || { umask 077; head -c 32 /dev/urandom | base64 > .data/session-secret; }
  SESSION_SECRET=$(cat .data/session-secret)
  export SESSION_SECRET
fi

echo "[start] building the app (Angular, production configuration)"
if ! npx ng build > .data/build.log 2>&1; then
  tail -n 40 .data/build.log
  echo "[start] error: the app did not build; the full log is in .data/build.log" >&2
  exit 1
fi

node --import tsx sim-server/main.ts &
server_pid=$!
wait "$server_pid"
