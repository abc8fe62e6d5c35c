#!/usr/bin/env bash
# A private PostgreSQL cluster for Thermotome, listening on loopback only.
#
#   bash scripts/postgres.sh start|stop|status|url [app]|psql [psql args...]
#
# Environment:
#   THERMOTOME_DATA_DIR  data folder (default: <repo root>/.data). Holds pg/ (the cluster),
#                        pg-socket/ (its private unix socket folder), pg.log and pg-password.
#   THERMOTOME_PG_PORT   TCP port on 127.0.0.1 (default 54329)
#   THERMOTOME_PG_DB     database created on start (default thermotome)
#   DATABASE_URL         when set, an external server is used: start/stop do nothing,
#                        url prints it, psql connects to it, status checks it with pg_isready.
#
# Security: the cluster listens on 127.0.0.1 only, on its own port, with its socket in a
# private folder (mode 700), and every connection needs a password (scram-sha-256).
# Two roles: the owner (the cluster's superuser `postgres`, password made at initdb and kept in
# <data>/pg-password) owns the tables and runs migrations and the seed; `url` prints its URL.
# The app role `thermotome_app` (NOSUPERUSER, owns nothing, password in <data>/pg-app-password,
# made on start) is what the server connects as; `url app` prints its URL. Migrations grant it
# SELECT/INSERT only on the frozen tables (server/database/migrate.ts), so the app cannot
# disable triggers, set session_replication_role, or rewrite signed or audit rows.
#
# As root, initdb/pg_ctl/postgres run as the `postgres` system user (they refuse to run as
# root). That user cannot enter mode-700 folders such as /root: when the data folder is not
# reachable by it, the cluster goes to /var/tmp/thermotome-pg-<hash>/ instead (one line says
# so). Exit codes: 0 ok, 1 error, 2 usage, 3 `status` when not running.
set -euo pipefail

SCRIPT_DIR=$(cd -- "$(dirname -- "${BASH_SOURCE[0]}")" && pwd -P)
REPO_ROOT=$(cd -- "$SCRIPT_DIR/.." && pwd -P)

PORT=${THERMOTOME_PG_PORT:-54329}
DB=${THERMOTOME_PG_DB:-thermotome}
PG_SUPERUSER=postgres
APP_ROLE=thermotome_app
SYSTEM_USER=postgres # the OS account that owns the cluster when this script runs as root

say() { printf 'postgres.sh: %s\n' "$*" >&2; }
die() { say "error: $*"; exit 1; }

usage() {
  cat >&2 <<'EOF'
usage: bash scripts/postgres.sh start|stop|status|url [app]|psql [psql args...]
  start   create (once) and start the private cluster, create the database if missing
  stop    stop the private cluster (fast shutdown)
  status  print running/stopped (exit 0 when running, 3 when not)
  url     print the owner's connection URL (migrations, seed: DATABASE_OWNER_URL)
  url app print the app role's connection URL (the server's DATABASE_URL)
  psql    run psql against the database, extra arguments go to psql
env: THERMOTOME_DATA_DIR, THERMOTOME_PG_PORT (54329), THERMOTOME_PG_DB (thermotome), DATABASE_URL
EOF
}

if ! [[ $PORT =~ ^[1-9][0-9]{0,4}$ ]] || ((PORT > 65535)); then
  die "THERMOTOME_PG_PORT must be a port number (1-65535), got '$PORT'"
fi
[[ $DB =~ ^[A-Za-z_][A-Za-z0-9_]*$ ]] ||
  die "THERMOTOME_PG_DB must be letters, digits and underscores, got '$DB'"

IS_ROOT=0
[[ $(id -u) -eq 0 ]] && IS_ROOT=1

# ---------------------------------------------------------------- binaries
BIN_DIR=""
find_server_bin() {
  # Newest installed major version that has the server binary.
  local candidate
  BIN_DIR=""
  while IFS= read -r candidate; do
    [[ -x $candidate ]] && BIN_DIR=${candidate%/postgres}
  done < <(compgen -G '/usr/lib/postgresql/*/bin/postgres' | sort -V)
  [[ -n $BIN_DIR ]]
}

install_server() {
  ((IS_ROOT)) || die "no PostgreSQL server found under /usr/lib/postgresql/*/bin; install it with 'sudo apt-get install postgresql' (or run this script as root, or set DATABASE_URL to an existing server)"
  command -v apt-get >/dev/null || die "no PostgreSQL server found and apt-get is not available; install PostgreSQL or set DATABASE_URL"
  say "installing Debian's postgresql package (once; its own default cluster is not used)"
  local out
  if ! out=$(apt-get update -qq 2>&1); then
    printf '%s\n' "$out" >&2
    die "apt-get update failed"
  fi
  if ! out=$(DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends postgresql 2>&1); then
    printf '%s\n' "$out" >&2
    die "apt-get install postgresql failed"
  fi
  find_server_bin || die "postgresql was installed but no /usr/lib/postgresql/*/bin/postgres was found"
}

client_bin() { # client_bin psql -> path to a psql (or other client) binary
  local name=$1
  if [[ -n $BIN_DIR && -x $BIN_DIR/$name ]]; then
    printf '%s\n' "$BIN_DIR/$name"
  elif find_server_bin && [[ -x $BIN_DIR/$name ]]; then
    printf '%s\n' "$BIN_DIR/$name"
  elif command -v "$name" >/dev/null; then
    command -v "$name"
  else
    local c
    c=$(compgen -G "/usr/lib/postgresql/*/bin/$name" | sort -V | tail -n 1 || true)
    [[ -n $c ]] || die "$name not found; install postgresql-client"
    printf '%s\n' "$c"
  fi
}

RUNUSER=""
# Run a command as the cluster owner, from / (postgres cannot enter e.g. /root). fd 9 (our
# flock) is closed so that the long-lived postmaster does not inherit the lock.
as_owner() {
  if ((IS_ROOT)); then
    (cd / && "$RUNUSER" -u "$SYSTEM_USER" -- "$@" 9>&-)
  else
    "$@" 9>&-
  fi
}

# ---------------------------------------------------------------- data folder
short_hash() { printf '%s' "$1" | sha256sum | cut -c1-10; }

owner_can_reach() { # the postgres user can search this existing folder (and every parent)
  as_owner test -x "$1" -a -r "$1"
}

nearest_existing() {
  local p=$1
  while [[ ! -e $p ]]; do p=$(dirname -- "$p"); done
  printf '%s\n' "$p"
}

resolve_data_dir() { # sets DATA; $1=1 to print the fallback notice
  local notice=${1:-0} wanted key
  if [[ -n ${THERMOTOME_DATA_DIR:-} ]]; then
    wanted=$(realpath -m -- "$THERMOTOME_DATA_DIR")
    key=$wanted
  else
    wanted=$REPO_ROOT/.data
    key=$REPO_ROOT
  fi
  DATA=$wanted
  ((IS_ROOT)) || return 0
  RUNUSER=$(command -v runuser || true)
  [[ -n $RUNUSER ]] || for RUNUSER in /usr/sbin/runuser /sbin/runuser ""; do [[ -x $RUNUSER ]] && break; done
  [[ -n $RUNUSER ]] || die "runuser (util-linux) is needed to run PostgreSQL as the $SYSTEM_USER user"
  id -u "$SYSTEM_USER" >/dev/null 2>&1 || return 0 # checked later, once the package is installed
  # Folders this script creates get mode 755, so the nearest existing one decides.
  if ! owner_can_reach "$(nearest_existing "$wanted")"; then
    DATA=/var/tmp/thermotome-pg-$(short_hash "$key")
    # /var/tmp is world-writable: only use a folder that we made (owned by us, not writable
    # by others), never one someone else planted under the predictable name.
    if [[ -e $DATA || -L $DATA ]]; then
      [[ -d $DATA && ! -L $DATA && -O $DATA && $(stat -c %A -- "$DATA") != ?????w???? && $(stat -c %A -- "$DATA") != ????????w? ]] ||
        die "$DATA exists but is not a folder owned by $(id -un) and closed to others; remove it or set THERMOTOME_DATA_DIR"
    fi
    ((notice)) && say "$wanted is not reachable by the $SYSTEM_USER user; using $DATA instead (set THERMOTOME_DATA_DIR to a folder $SYSTEM_USER can enter to override)"
  fi
  return 0
}

set_paths() {
  PGDATA=$DATA/pg
  SOCKET_DIR=$DATA/pg-socket
  LOG_FILE=$DATA/pg.log
  PW_FILE=$DATA/pg-password
  APP_PW_FILE=$DATA/pg-app-password
}

make_dirs() { # create missing folders with mode 755, whatever the umask
  local p=$1 missing=()
  while [[ ! -e $p ]]; do missing=("$p" "${missing[@]}"); p=$(dirname -- "$p"); done
  for p in "${missing[@]}"; do mkdir -m 755 -- "$p" 2>/dev/null || [[ -d $p ]] || die "cannot create $p"; done
  [[ -d $1 ]] || die "$1 is not a folder"
}

lock_data_dir() { # serialise start/stop on one data folder
  exec 9>>"$DATA/pg.lock"
  flock -w 120 9 || die "another postgres.sh start/stop holds $DATA/pg.lock"
}

# ---------------------------------------------------------------- process checks
# postmaster.pid: line 1 the postmaster's pid, line 4 its port. The file may vanish at any
# moment (server stopping), hence the `|| true`.
pid_from_file() { { head -n 1 -- "$PGDATA/postmaster.pid" 2>/dev/null || true; } | tr -dc '0-9'; }

# The postmaster named in postmaster.pid is alive: a live process whose command is postgres
# and (when we can see it) whose working folder is our cluster. The cwd check catches a pid
# reused by another cluster's postgres after a reboot/container restart.
postmaster_alive() {
  local pid
  pid=$(pid_from_file)
  [[ -n $pid ]] || return 1
  local stat state
  stat=$(cat "/proc/$pid/stat" 2>/dev/null) || return 1
  state=${stat##*) } # fields after "pid (comm) "
  state=${state%% *}
  [[ $state != [ZX] ]] || return 1 # a killed postmaster can linger as a zombie
  [[ $(cat "/proc/$pid/comm" 2>/dev/null) == postgres ]] || return 1
  # -e/-ef stat /proc/<pid>/cwd (no fork); unreadable (other user, not root): trust comm.
  if [[ -e /proc/$pid/cwd ]]; then
    [[ /proc/$pid/cwd -ef $PGDATA ]] || return 1
  fi
  return 0
}

running_port() { { sed -n 4p -- "$PGDATA/postmaster.pid" 2>/dev/null || true; } | tr -dc '0-9'; }

clear_stale_lock() {
  [[ -f $PGDATA/postmaster.pid ]] || return 0
  postmaster_alive && return 0
  say "removing stale postmaster.pid (pid $(pid_from_file) is not a live postgres) and socket lock files"
  rm -f -- "$PGDATA/postmaster.pid"
  local f
  for f in "$SOCKET_DIR"/.s.PGSQL.*.lock "$SOCKET_DIR"/.s.PGSQL.[0-9]* "$PGDATA"/.s.PGSQL.*.lock; do
    [[ -e $f || -S $f ]] && rm -f -- "$f"
  done
  wait_for_orphans
}

# After a postmaster crash its children exit on their own within moments; until they do,
# the old shared memory is still attached and postgres refuses to start. Wait, never kill.
wait_for_orphans() {
  local i p found
  for ((i = 0; i < 100; i++)); do
    found=0
    for p in /proc/[0-9]*; do
      [[ $p/cwd -ef $PGDATA ]] && { found=1; break; }
    done
    ((found)) || return 0
    sleep 0.1
  done
  say "warning: old server processes still use $PGDATA; trying to start anyway"
}

# ---------------------------------------------------------------- sql helpers
PASSWORD=""
load_password() { # sets PASSWORD (call in the main shell, not in $(...), so die exits)
  [[ -r $PW_FILE ]] || die "$PW_FILE is missing or unreadable; the cluster in $PGDATA needs it (remove $PGDATA to start afresh)"
  IFS= read -r PASSWORD <"$PW_FILE" || true
  [[ $PASSWORD =~ ^[0-9a-f]+$ ]] || die "$PW_FILE does not hold a generated password"
}

url_for() { # url_for <port>
  load_password
  printf 'postgres://%s:%s@127.0.0.1:%s/%s\n' "$PG_SUPERUSER" "$PASSWORD" "$1" "$DB"
}

APP_PASSWORD=""
load_app_password() { # sets APP_PASSWORD, making it once (mode 600)
  if [[ ! -s $APP_PW_FILE ]]; then
    (umask 077 && od -An -tx1 -N24 /dev/urandom | tr -d ' \n' >"$APP_PW_FILE" && echo >>"$APP_PW_FILE")
  fi
  IFS= read -r APP_PASSWORD <"$APP_PW_FILE" || true
  [[ $APP_PASSWORD =~ ^[0-9a-f]+$ ]] || die "$APP_PW_FILE does not hold a generated password"
}

app_url_for() { # app_url_for <port>
  load_app_password
  printf 'postgres://%s:%s@127.0.0.1:%s/%s\n' "$APP_ROLE" "$APP_PASSWORD" "$1" "$DB"
}

ensure_app_role() { # ensure_app_role <port>: the server's role, never a superuser, owning nothing
  load_app_password
  local exists
  exists=$(admin_psql "$1" "SELECT 1 FROM pg_roles WHERE rolname = '$APP_ROLE'") ||
    die "cannot connect to the cluster on 127.0.0.1:$1 (log: $LOG_FILE)"
  if [[ $exists != 1 ]]; then
    admin_psql "$1" "CREATE ROLE $APP_ROLE LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS PASSWORD '$APP_PASSWORD'" >/dev/null ||
      die "could not create the app role $APP_ROLE"
    say "created the app role $APP_ROLE"
  else
    admin_psql "$1" "ALTER ROLE $APP_ROLE LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS PASSWORD '$APP_PASSWORD'" >/dev/null ||
      die "could not update the app role $APP_ROLE"
  fi
}

PSQL=""
admin_psql() { # admin_psql <port> <sql>
  PGPASSWORD=$PASSWORD "$PSQL" -X -q -t -A -v ON_ERROR_STOP=1 \
    -h 127.0.0.1 -p "$1" -U "$PG_SUPERUSER" -d postgres -c "$2"
}

ensure_database() { # ensure_database <port>
  local exists
  load_password
  PSQL=$(client_bin psql)
  exists=$(admin_psql "$1" "SELECT 1 FROM pg_database WHERE datname = '$DB'") ||
    die "cannot connect to the cluster on 127.0.0.1:$1 (log: $LOG_FILE)"
  if [[ $exists != 1 ]]; then
    PGPASSWORD=$PASSWORD "$BIN_DIR/createdb" -h 127.0.0.1 -p "$1" -U "$PG_SUPERUSER" "$DB" ||
      die "could not create database $DB"
    say "created database $DB"
  fi
  ensure_app_role "$1"
}

# ---------------------------------------------------------------- init
init_cluster() {
  local owner_uid
  if ((IS_ROOT)); then
    owner_uid=$(id -u "$SYSTEM_USER")
  else
    owner_uid=$(id -u)
  fi
  make_dirs "$DATA"
  local d
  for d in "$PGDATA" "$SOCKET_DIR"; do
    [[ -d $d ]] || mkdir -m 700 -- "$d"
  done
  [[ -e $LOG_FILE ]] || : >"$LOG_FILE"
  if ((IS_ROOT)); then
    chown "$SYSTEM_USER:" -- "$SOCKET_DIR" "$LOG_FILE"
    [[ -f $PGDATA/PG_VERSION ]] || chown "$SYSTEM_USER:" -- "$PGDATA"
  fi
  chmod 700 -- "$SOCKET_DIR"
  [[ $(stat -c %u -- "$PGDATA") == "$owner_uid" ]] ||
    die "$PGDATA belongs to another user; remove it or choose another THERMOTOME_DATA_DIR"

  if [[ -f $PGDATA/PG_VERSION ]]; then
    [[ -f $PW_FILE ]] || die "$PW_FILE is missing; the cluster in $PGDATA cannot be used without it (remove $PGDATA to start afresh)"
    return 0
  fi

  # Fresh cluster (an empty or half-made pg/ from an interrupted initdb is redone).
  if [[ -n $(ls -A -- "$PGDATA") ]]; then
    say "removing incomplete cluster folder $PGDATA"
    find "$PGDATA" -mindepth 1 -delete
  fi
  if [[ ! -s $PW_FILE ]]; then
    (umask 077 && od -An -tx1 -N24 /dev/urandom | tr -d ' \n' >"$PW_FILE" && echo >>"$PW_FILE")
  fi
  chmod 600 -- "$PW_FILE"
  ((IS_ROOT)) && chown "$SYSTEM_USER:" -- "$PW_FILE" # initdb --pwfile reads it as that user

  say "initialising a new cluster in $PGDATA"
  local out
  if ! out=$(as_owner "$BIN_DIR/initdb" -D "$PGDATA" -U "$PG_SUPERUSER" --pwfile="$PW_FILE" \
    --auth-local=scram-sha-256 --auth-host=scram-sha-256 --encoding=UTF8 --locale=C 2>&1); then
    printf '%s\n' "$out" >&2
    die "initdb failed"
  fi
  local sock_q=${SOCKET_DIR//\'/\'\'}
  cat >>"$PGDATA/postgresql.conf" <<EOF

# --- Thermotome private cluster (scripts/postgres.sh) ---
listen_addresses = '127.0.0.1'
port = $PORT
unix_socket_directories = '$sock_q'
unix_socket_permissions = 0700
EOF
}

# ---------------------------------------------------------------- commands
cmd_start() {
  if [[ -n ${DATABASE_URL:-} ]]; then
    say "DATABASE_URL is set; using that external server (no private cluster started)"
    return 0
  fi
  find_server_bin || install_server
  ((IS_ROOT)) && { id -u "$SYSTEM_USER" >/dev/null 2>&1 || die "the $SYSTEM_USER system user does not exist (install Debian's postgresql package)"; }
  resolve_data_dir 1
  set_paths
  make_dirs "$DATA"
  lock_data_dir

  # A cluster made by another major version needs that version's binaries.
  if [[ -f $PGDATA/PG_VERSION ]]; then
    local v
    v=$(cat "$PGDATA/PG_VERSION")
    if [[ $BIN_DIR != "/usr/lib/postgresql/$v/bin" ]]; then
      [[ -x /usr/lib/postgresql/$v/bin/postgres ]] ||
        die "$PGDATA was made by PostgreSQL $v, which is not installed (remove $PGDATA to start afresh)"
      BIN_DIR=/usr/lib/postgresql/$v/bin
    fi
  fi

  clear_stale_lock
  if postmaster_alive; then
    local p
    p=$(running_port)
    [[ -n $p && $p != "$PORT" ]] && say "note: it runs on port $p, not THERMOTOME_PG_PORT=$PORT"
    ensure_database "${p:-$PORT}"
    say "already running (pid $(pid_from_file), 127.0.0.1:${p:-$PORT}, $PGDATA)"
    return 0
  fi

  init_cluster
  local out
  if ! out=$(as_owner "$BIN_DIR/pg_ctl" -D "$PGDATA" -l "$LOG_FILE" -w -t 30 \
    -o "-p $PORT -c listen_addresses=127.0.0.1" start 2>&1); then
    printf '%s\n' "$out" >&2
    say "last lines of $LOG_FILE:"
    tail -n 8 -- "$LOG_FILE" >&2 || true
    die "could not start PostgreSQL (is port $PORT in use?)"
  fi
  ensure_database "$PORT"
  say "started (pid $(pid_from_file), 127.0.0.1:$PORT, database $DB, data $PGDATA)"
}

cmd_stop() {
  if [[ -n ${DATABASE_URL:-} ]]; then
    say "DATABASE_URL is set; the external server is not ours to stop"
    return 0
  fi
  resolve_data_dir 1
  set_paths
  if ! postmaster_alive; then
    say "not running ($PGDATA)"
    return 0
  fi
  find_server_bin || die "no PostgreSQL server binaries found"
  [[ -f $PGDATA/PG_VERSION && -x /usr/lib/postgresql/$(cat "$PGDATA/PG_VERSION")/bin/pg_ctl ]] &&
    BIN_DIR=/usr/lib/postgresql/$(cat "$PGDATA/PG_VERSION")/bin
  lock_data_dir
  local out
  if ! out=$(as_owner "$BIN_DIR/pg_ctl" -D "$PGDATA" -w -t 60 stop -m fast 2>&1); then
    printf '%s\n' "$out" >&2
    die "pg_ctl stop failed"
  fi
  say "stopped ($PGDATA)"
}

cmd_status() {
  if [[ -n ${DATABASE_URL:-} ]]; then
    if "$(client_bin pg_isready)" -q -d "$DATABASE_URL"; then
      echo "running (external server from DATABASE_URL)"
      return 0
    fi
    echo "stopped (external server from DATABASE_URL does not answer)"
    return 3
  fi
  resolve_data_dir 1
  set_paths
  if postmaster_alive; then
    echo "running (pid $(pid_from_file), 127.0.0.1:$(running_port), data $PGDATA)"
    return 0
  fi
  echo "stopped (data $PGDATA)"
  return 3
}

cmd_url() { # cmd_url [app]
  local which=${1:-owner}
  [[ $which == owner || $which == app ]] || { usage; exit 2; }
  if [[ -n ${DATABASE_URL:-} ]]; then
    if [[ $which == owner ]]; then printf '%s\n' "${DATABASE_OWNER_URL:-$DATABASE_URL}"; else printf '%s\n' "$DATABASE_URL"; fi
    return 0
  fi
  resolve_data_dir 0
  set_paths
  local p=$PORT
  if postmaster_alive; then p=$(running_port); fi
  if [[ $which == app ]]; then app_url_for "${p:-$PORT}"; else url_for "${p:-$PORT}"; fi
}

cmd_psql() {
  local psql
  psql=$(client_bin psql)
  if [[ -n ${DATABASE_URL:-} ]]; then
    exec "$psql" -d "$DATABASE_URL" "$@"
  fi
  resolve_data_dir 0
  set_paths
  postmaster_alive || die "the private cluster is not running; run: bash scripts/postgres.sh start"
  load_password
  PGHOST=127.0.0.1 PGPORT=$(running_port) PGUSER=$PG_SUPERUSER PGDATABASE=$DB \
    PGPASSWORD=$PASSWORD exec "$psql" "$@"
}

case ${1:-} in
  start) cmd_start ;;
  stop) cmd_stop ;;
  status) cmd_status ;;
  url) cmd_url "${2:-owner}" ;;
  psql) shift; cmd_psql "$@" ;;
  -h | --help | help) usage ;;
  *) usage; exit 2 ;;
esac
