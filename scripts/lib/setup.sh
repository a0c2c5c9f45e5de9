# Shared shell functions of scripts/start and scripts/test: install what is missing, run a private
# MariaDB instance on 127.0.0.1. Source it; it expects ROOT (the repository) to be set.

log() { printf '[plenum] %s\n' "$*"; }

apt_updated=0
apt_install() {
  if [ "$(id -u)" != 0 ] && ! command -v sudo >/dev/null 2>&1; then
    log "Need root (or sudo) to install Debian packages: $*"; return 1
  fi
  local SUDO=""; [ "$(id -u)" != 0 ] && SUDO=sudo
  if [ "$apt_updated" = 0 ]; then
    log "apt-get update"
    $SUDO apt-get update -qq >/dev/null || { log "apt-get update failed"; return 1; }
    apt_updated=1
  fi
  log "Installing Debian packages: $*"
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "$@" >/dev/null \
    || { log "apt-get install $* failed"; return 1; }
}

find_mariadbd() {
  command -v mariadbd 2>/dev/null || { [ -x /usr/sbin/mariadbd ] && echo /usr/sbin/mariadbd; } || true
}

ensure_mariadb() {
  if [ -z "$(find_mariadbd)" ]; then
    apt_install mariadb-server mariadb-client || return 1
  fi
  MARIADBD=$(find_mariadbd)
  [ -n "$MARIADBD" ] || { log "mariadbd not found after install"; return 1; }
}

ensure_chromium() {
  if ! command -v chromium >/dev/null 2>&1; then
    apt_install chromium fonts-dejavu-core || return 1
  fi
}

ensure_node_modules() {
  cd "$ROOT" || return 1
  # npm ci when node_modules is missing or older than the lock file.
  if [ ! -d node_modules ] || [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "Installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error || return 1
  fi
}

# start_mariadb DATADIR PORT: init (first time) and start a private server; sets MARIADB_PID, MARIADB_SOCK.
start_mariadb() {
  local dir="$1" port="$2"
  mkdir -p "$dir"
  MARIADB_SOCK="$dir/mysqld.sock"
  local pidfile="$dir/mysqld.pid" errlog="$dir/error.log"
  if [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null; then
    if mariadb-admin --no-defaults --socket="$MARIADB_SOCK" -uroot ping >/dev/null 2>&1; then
      log "MariaDB already running (pid $(cat "$pidfile"))"
      MARIADB_PID=$(cat "$pidfile"); MARIADB_OURS=0; return 0
    fi
  fi
  if [ ! -d "$dir/data/mysql" ]; then
    log "Initialising a MariaDB data directory"
    mkdir -p "$dir/data"
    mariadb-install-db --no-defaults --datadir="$dir/data" --user="$(id -un)" \
      --auth-root-authentication-method=socket --skip-test-db >"$dir/install.log" 2>&1 \
      || { log "mariadb-install-db failed: see $dir/install.log"; return 1; }
  fi
  if (echo >/dev/tcp/127.0.0.1/"$port") 2>/dev/null; then
    log "Port $port on 127.0.0.1 is taken: set DB_PORT to a free port"; return 1
  fi
  "$MARIADBD" --no-defaults --datadir="$dir/data" --socket="$MARIADB_SOCK" --pid-file="$pidfile" \
    --port="$port" --bind-address=127.0.0.1 --skip-networking=0 --user="$(id -un)" \
    --log-error="$errlog" --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --innodb-buffer-pool-size=256M --max-connections=500 --local-infile=1 >/dev/null 2>&1 &
  MARIADB_PID=$!
  MARIADB_OURS=1
  local i
  for i in $(seq 1 100); do
    if mariadb-admin --no-defaults --socket="$MARIADB_SOCK" -uroot ping >/dev/null 2>&1; then
      log "MariaDB listening on 127.0.0.1:$port"; return 0
    fi
    kill -0 "$MARIADB_PID" 2>/dev/null || { log "MariaDB exited: see $errlog"; tail -5 "$errlog"; return 1; }
    sleep 0.2
  done
  log "MariaDB did not answer in 20 s: see $errlog"; return 1
}

stop_mariadb() {
  [ "${MARIADB_OURS:-0}" = 1 ] || return 0
  mariadb-admin --no-defaults --socket="$MARIADB_SOCK" -uroot shutdown >/dev/null 2>&1 || kill "$MARIADB_PID" 2>/dev/null
  local i; for i in $(seq 1 50); do kill -0 "$MARIADB_PID" 2>/dev/null || return 0; sleep 0.2; done
  kill -9 "$MARIADB_PID" 2>/dev/null || true
}

# start_fake_s3 DIR PORT: the local S3-compatible store (s3rver) in the background; sets FAKE_S3_PID and
# exports the app's FILE_STORE/S3_* settings to use it.
start_fake_s3() {
  local dir="$1" port="$2"
  mkdir -p "$dir"
  export FILE_STORE=s3 S3_ENDPOINT="http://127.0.0.1:$port" S3_FORCE_PATH_STYLE=true S3_REGION=us-east-1
  export S3_BUCKET="${S3_BUCKET:-plenum-uploads}" S3_ACCESS_KEY_ID=S3RVER S3_SECRET_ACCESS_KEY=S3RVER
  # The SDK warns once per process that its 2027 releases need Node 22; nothing to act on here.
  export AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED=true
  S3_FAKE_PORT="$port" S3_FAKE_DIR="$dir" node --import tsx "$ROOT/backend/src/storage/fake-s3.main.ts" >"$dir.log" 2>&1 &
  FAKE_S3_PID=$!
  local i
  for i in $(seq 1 100); do
    if (echo >/dev/tcp/127.0.0.1/"$port") 2>/dev/null; then log "Local S3 store on 127.0.0.1:$port"; return 0; fi
    kill -0 "$FAKE_S3_PID" 2>/dev/null || { log "The local S3 store exited: see $dir.log"; tail -5 "$dir.log"; return 1; }
    sleep 0.1
  done
  log "The local S3 store did not answer in 10 s"; return 1
}

stop_fake_s3() {
  [ -n "${FAKE_S3_PID:-}" ] || return 0
  kill "$FAKE_S3_PID" 2>/dev/null || true
  wait "$FAKE_S3_PID" 2>/dev/null || true
  FAKE_S3_PID=""
}

# create_database NAME USER PASSWORD: the app's database and user (idempotent).
create_database() {
  local db="$1" user="$2" pass="$3"
  mariadb --no-defaults --socket="$MARIADB_SOCK" -uroot <<SQL
CREATE DATABASE IF NOT EXISTS \`$db\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$user'@'127.0.0.1' IDENTIFIED BY '$pass';
CREATE USER IF NOT EXISTS '$user'@'localhost' IDENTIFIED BY '$pass';
GRANT ALL PRIVILEGES ON \`$db\`.* TO '$user'@'127.0.0.1';
GRANT ALL PRIVILEGES ON \`$db\`.* TO '$user'@'localhost';
FLUSH PRIVILEGES;
SQL
}

# grant_test_databases USER: the test user may create and drop its own throw-away databases.
grant_all() {
  local user="$1"
  mariadb --no-defaults --socket="$MARIADB_SOCK" -uroot -e "GRANT ALL PRIVILEGES ON *.* TO '$user'@'127.0.0.1'; GRANT ALL PRIVILEGES ON *.* TO '$user'@'localhost'; FLUSH PRIVILEGES;"
}
