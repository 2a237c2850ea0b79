#!/usr/bin/env bash
# A project-local PostgreSQL cluster for `npm start` and `npm test` when DATABASE_URL is not set.
#   scripts/local-postgres.sh start         install Debian's server if missing, init, start (idempotent)
#   scripts/local-postgres.sh stop          stop the cluster if it runs
#   scripts/local-postgres.sh running       exit 0 when the cluster is up (callers then leave it up)
#   scripts/local-postgres.sh create-db DB  create DB if it does not exist; (re)make its two roles
#   scripts/local-postgres.sh recreate-db DB   drop and create DB with its roles (the test run's fresh database)
#   scripts/local-postgres.sh url DB        print the app role's connection URL for DB (DATABASE_URL)
#   scripts/local-postgres.sh owner-url DB  print the owner role's connection URL for DB (DATABASE_OWNER_URL)
#   scripts/local-postgres.sh env DB        print both as `export` lines, for eval "$(… env DB)"
# It listens on 127.0.0.1 only, on KINETWIN_PG_PORT (default 54329), with its data in .data/pg.
# Every database it creates gets the roles of scripts/sql/local-roles.sql: kinetwin_owner owns it
# and migrates, kinetwin_app serves; the superuser kinetwin is kept for this script alone.
set -euo pipefail

root=$(cd "$(dirname "$0")/.." && pwd)
data_dir="$root/.data/pg"
port="${KINETWIN_PG_PORT:-54329}"
db_user=kinetwin
owner_role=kinetwin_owner
app_role=kinetwin_app

say() { printf '[postgres] %s\n' "$*" >&2; }
die() { printf '[postgres] error: %s\n' "$*" >&2; exit 1; }

bin_dir() {
  local d
  d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
  [ -n "$d" ] && [ -x "$d/initdb" ] && printf '%s' "$d"
}

as_root() {
  if [ "$(id -u)" -eq 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else
    die "need root to run: $* (install Debian's postgresql package, or set DATABASE_URL)"; fi
}

ensure_installed() {
  [ -n "$(bin_dir)" ] && return 0
  say "PostgreSQL server binaries not found; installing Debian's postgresql package (one time)"
  as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq >&2
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >&2
  [ -n "$(bin_dir)" ] || die "apt-get installed postgresql but no initdb was found under /usr/lib/postgresql"
}

# initdb and postgres refuse to run as root: then the cluster belongs to the postgres user.
as_owner() {
  if [ "$(id -u)" -eq 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

pg_running() {
  [ -f "$data_dir/postmaster.pid" ] && as_owner "$(bin_dir)/pg_ctl" -D "$data_dir" status >/dev/null 2>&1
}

psql_admin() {
  PGPASSWORD= as_owner "$(bin_dir)/psql" -h 127.0.0.1 -p "$port" -U "$db_user" -d postgres -v ON_ERROR_STOP=1 -qAt "$@"
}

start() {
  ensure_installed
  local bin
  bin=$(bin_dir)
  mkdir -p "$root/.data"
  if [ "$(id -u)" -eq 0 ]; then
    # The postgres user must be able to reach the data folder through every parent directory.
    chmod o+x "$root/.data" || true
    local p="$root"
    while [ "$p" != "/" ]; do chmod o+x "$p" 2>/dev/null || true; p=$(dirname "$p"); done
  fi
  if [ ! -f "$data_dir/PG_VERSION" ]; then
    say "initialising a new cluster in $data_dir"
    mkdir -p "$data_dir"
    [ "$(id -u)" -eq 0 ] && chown postgres:postgres "$data_dir"
    chmod 700 "$data_dir"
    as_owner "$bin/initdb" -D "$data_dir" -U "$db_user" --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if pg_running; then
    say "reusing the cluster already running on 127.0.0.1:$port"
    return 0
  fi
  if (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; then
    die "port $port on 127.0.0.1 is taken by another program; stop it or set KINETWIN_PG_PORT"
  fi
  as_owner "$bin/pg_ctl" -D "$data_dir" -l "$data_dir/server.log" -w -t 60 \
    -o "-c listen_addresses=127.0.0.1 -p $port -k $data_dir -c unix_socket_permissions=0700" start >/dev/null ||
    die "PostgreSQL did not start; see $data_dir/server.log"
  say "started on 127.0.0.1:$port"
}

stop() {
  local bin
  bin=$(bin_dir) || true
  if [ -n "$bin" ] && pg_running; then
    as_owner "$bin/pg_ctl" -D "$data_dir" -m fast -w stop >/dev/null && say "stopped"
  fi
}

valid_db_name() { [[ "$1" =~ ^[a-z_][a-z0-9_]{0,62}$ ]] || die "bad database name: $1"; }

# Creates or updates both roles and hands DB to the owner (idempotent; see the SQL file).
prepare_roles() {
  psql_admin -d "$1" -f - < "$root/scripts/sql/local-roles.sql"
}

create_db() {
  valid_db_name "$1"
  if [ "$(psql_admin -c "SELECT 1 FROM pg_database WHERE datname = '$1'")" != "1" ]; then
    psql_admin -c "CREATE DATABASE $1" && say "created database $1"
  fi
  prepare_roles "$1"
}

recreate_db() {
  valid_db_name "$1"
  psql_admin -c "DROP DATABASE IF EXISTS $1 WITH (FORCE)"
  psql_admin -c "CREATE DATABASE $1" && say "created fresh database $1"
  prepare_roles "$1"
}

role_url() { printf 'postgres://%s@127.0.0.1:%s/%s' "$1" "$port" "$2"; }

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  running) [ -n "$(bin_dir)" ] && pg_running ;;
  create-db) create_db "${2:?database name}" ;;
  recreate-db) recreate_db "${2:?database name}" ;;
  url) valid_db_name "${2:?database name}"; printf '%s\n' "$(role_url "$app_role" "$2")" ;;
  owner-url) valid_db_name "${2:?database name}"; printf '%s\n' "$(role_url "$owner_role" "$2")" ;;
  env)
    valid_db_name "${2:?database name}"
    printf 'export DATABASE_URL=%s\nexport DATABASE_OWNER_URL=%s\n' "$(role_url "$app_role" "$2")" "$(role_url "$owner_role" "$2")" ;;
  *) die "usage: $0 start|stop|running|create-db DB|recreate-db DB|url DB|owner-url DB|env DB" ;;
esac
