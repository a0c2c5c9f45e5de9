# Shared shell functions of scripts/cluster and the cluster tests: a three-node MariaDB Galera cluster on
# loopback (Debian's mariadb-server + galera-4, state transfer with mariadb-backup) and HAProxy in front of
# it and of the app processes. Source it after scripts/lib/setup.sh; it expects ROOT to be set.
#
# Ports from one base B (scripts/cluster: 3310): HAProxy for SQL on B, node i (1..3) SQL on B+i,
# group communication on B+10+i, incremental state transfer (IST) on B+20+i, full state transfer (SST)
# on B+30+i. Every process started here is a child of the calling shell (no daemonising), so it stays
# in the caller's process group and Ctrl-C reaches it.

CLUSTER_NODES=3
CLUSTER_SST_USER=plenum_sst
CLUSTER_SST_PASSWORD=plenum-sst-local
CLUSTER_CHECK_USER=plenum_check

find_galera() {
  local p
  for p in /usr/lib/galera/libgalera_smm.so /usr/lib/libgalera_smm.so /usr/lib/x86_64-linux-gnu/galera/libgalera_smm.so; do
    [ -f "$p" ] && { echo "$p"; return 0; }
  done
  dpkg -L galera-4 2>/dev/null | grep -m1 'libgalera_smm\.so$' || true
}

# ensure_cluster_packages: galera-4, mariadb-backup (the SST method), socat (its stream), haproxy.
ensure_cluster_packages() {
  ensure_mariadb || return 1
  local want=()
  [ -n "$(find_galera)" ] || want+=(galera-4)
  command -v mariadb-backup >/dev/null 2>&1 || want+=(mariadb-backup)
  command -v socat >/dev/null 2>&1 || want+=(socat)
  command -v haproxy >/dev/null 2>&1 || [ -x /usr/sbin/haproxy ] || want+=(haproxy)
  [ ${#want[@]} -eq 0 ] || apt_install "${want[@]}" || return 1
  GALERA_LIB=$(find_galera)
  [ -n "$GALERA_LIB" ] || { log "libgalera_smm.so not found after installing galera-4"; return 1; }
  HAPROXY=$(command -v haproxy 2>/dev/null || echo /usr/sbin/haproxy)
}

# cluster_node_config DIR I BASE: writes DIR/node$I/my.cnf (read alone with --defaults-file, so no
# system-wide option file applies, as --no-defaults does for scripts/start).
cluster_node_config() {
  local dir="$1" i="$2" base="$3" n="$dir/node$2"
  local members="" donors="" j
  for j in $(seq 1 $CLUSTER_NODES); do members="${members:+$members,}127.0.0.1:$((base + 10 + j))"; done
  # A joiner takes its state from the last node first: node 2 is HAProxy's first backup and should keep
  # serving (a mariadb-backup donor is briefly out of rotation); the trailing comma allows any other.
  for j in $(seq $CLUSTER_NODES -1 1); do [ "$j" = "$i" ] || donors="${donors}node$j,"; done
  mkdir -p "$n/data"
  cat >"$n/my.cnf" <<CNF
[mariadbd]
user=$(id -un)
datadir=$n/data
socket=$n/mysqld.sock
pid-file=$n/mysqld.pid
log-error=$n/error.log
port=$((base + i))
bind-address=127.0.0.1
skip-networking=0
character-set-server=utf8mb4
collation-server=utf8mb4_unicode_ci
innodb-buffer-pool-size=128M
max-connections=300
local-infile=1
# What Galera requires: row-based replication, InnoDB, interleaved auto-increment locks.
binlog_format=ROW
default-storage-engine=InnoDB
innodb_autoinc_lock_mode=2
innodb_flush_log_at_trx_commit=2
wsrep_on=ON
wsrep_provider=$GALERA_LIB
wsrep_cluster_name=plenum
wsrep_cluster_address=gcomm://$members
wsrep_node_name=node$i
wsrep_node_address=127.0.0.1:$((base + 10 + i))
wsrep_node_incoming_address=127.0.0.1:$((base + i))
wsrep_provider_options="gmcast.listen_addr=tcp://127.0.0.1:$((base + 10 + i));ist.recv_addr=127.0.0.1:$((base + 20 + i));gcache.size=128M;pc.wait_prim_timeout=PT30S;evs.suspect_timeout=PT3S;evs.inactive_timeout=PT6S"
wsrep_sst_receive_address=127.0.0.1:$((base + 30 + i))
wsrep_sst_method=mariabackup
wsrep_sst_donor=$donors
wsrep_sst_auth=$CLUSTER_SST_USER:$CLUSTER_SST_PASSWORD
wsrep_slave_threads=2

[sst]
sockopt=",reuseaddr"

[mariabackup]
socket=$n/mysqld.sock
CNF
}

# cluster_init DIR BASE: data directories (first time only) and option files for the three nodes.
cluster_init() {
  local dir="$1" base="$2" i
  for i in $(seq 1 $CLUSTER_NODES); do
    cluster_node_config "$dir" "$i" "$base"
    if [ ! -d "$dir/node$i/data/mysql" ] && [ "$i" = 1 ]; then
      log "Initialising the data directory of node 1 (nodes 2 and 3 receive it by state transfer)"
      mariadb-install-db --no-defaults --datadir="$dir/node1/data" --user="$(id -un)" \
        --auth-root-authentication-method=socket --skip-test-db >"$dir/node1/install.log" 2>&1 \
        || { log "mariadb-install-db failed: see $dir/node1/install.log"; return 1; }
    fi
  done
}

# cluster_node_sql DIR I SQL…: runs SQL as root on node I through its socket.
cluster_node_sql() {
  local dir="$1" i="$2"; shift 2
  mariadb --no-defaults --socket="$dir/node$i/mysqld.sock" -uroot -N -B -e "$*"
}

cluster_node_status() { # cluster_node_status DIR I VARIABLE → value or nothing
  cluster_node_sql "$1" "$2" "SHOW GLOBAL STATUS LIKE '$3'" 2>/dev/null | awk '{print $2}'
}

# cluster_recovered_position DIR I: the last committed position (uuid:seqno) in node I's InnoDB, as
# galera_recovery finds it (mariadbd --wsrep-recover); nothing when it cannot be read.
cluster_recovered_position() {
  local n="$1/node$2"
  : >"$n/recover.log"
  "$MARIADBD" --defaults-file="$n/my.cnf" --wsrep-recover --log-error="$n/recover.log" >/dev/null 2>&1 || true
  grep -o 'WSREP: Recovered position: [^ ]*' "$n/recover.log" | tail -1 | sed 's/.*position: //'
}

# cluster_start_node DIR I [--wsrep-new-cluster]: starts node I as a child of this shell; sets NODE_PID[I].
# After a crash (grastate.dat seqno -1) the position is recovered first, so the node asks for the
# missing write-sets only (IST) instead of a full copy (SST).
declare -A NODE_PID
cluster_start_node() {
  local dir="$1" i="$2"; shift 2
  local g="$dir/node$i/data/grastate.dat" pos=""
  if [ -f "$g" ] && grep -q '^seqno: *-1' "$g" && [ -d "$dir/node$i/data/mysql" ]; then
    pos=$(cluster_recovered_position "$dir" "$i")
  fi
  "$MARIADBD" --defaults-file="$dir/node$i/my.cnf" ${pos:+--wsrep-start-position="$pos"} "$@" >/dev/null 2>&1 &
  NODE_PID[$i]=$!
}

# cluster_wait_synced DIR I [SECONDS]: waits until node I is Synced (wsrep_local_state 4).
cluster_wait_synced() {
  local dir="$1" i="$2" limit="${3:-120}" t=0
  while [ $t -lt $((limit * 5)) ]; do
    [ "$(cluster_node_status "$dir" "$i" wsrep_local_state)" = 4 ] && return 0
    kill -0 "${NODE_PID[$i]}" 2>/dev/null || { log "node $i exited: see $dir/node$i/error.log"; tail -5 "$dir/node$i/error.log"; return 1; }
    sleep 0.2; t=$((t + 1))
  done
  log "node $i not synced after ${limit} s: see $dir/node$i/error.log"; return 1
}

# cluster_bootstrap_node DIR: which node may start a new cluster after a full stop. The node whose
# grastate.dat says safe_to_bootstrap: 1 (the last to leave cleanly); else the one with the highest
# recovered sequence number (mariadbd --wsrep-recover), which is then marked safe to bootstrap.
cluster_bootstrap_node() {
  local dir="$1" i best=1 bestseq=-2 seq
  for i in $(seq 1 $CLUSTER_NODES); do
    local g="$dir/node$i/data/grastate.dat"
    [ -f "$g" ] || continue
    if grep -q '^safe_to_bootstrap: *1' "$g"; then echo "$i"; return 0; fi
  done
  for i in $(seq 1 $CLUSTER_NODES); do
    [ -d "$dir/node$i/data/mysql" ] || continue
    seq=$("$MARIADBD" --defaults-file="$dir/node$i/my.cnf" --wsrep-recover --log-error="$dir/node$i/recover.log" >/dev/null 2>&1; \
      grep -o 'WSREP: Recovered position: [^ ]*' "$dir/node$i/recover.log" | tail -1 | sed 's/.*://')
    seq=${seq:--1}
    if [ "$seq" -gt "$bestseq" ]; then best=$i; bestseq=$seq; fi
  done
  [ -f "$dir/node$best/data/grastate.dat" ] && sed -i 's/^safe_to_bootstrap: *0/safe_to_bootstrap: 1/' "$dir/node$best/data/grastate.dat"
  echo "$best"
}

# cluster_start DIR BASE: init, bootstrap one node (--wsrep-new-cluster), join the others, wait for
# wsrep_cluster_size 3; creates the SST and health-check users on a fresh cluster.
cluster_start() {
  local dir="$1" base="$2" i first
  local p; for p in $base $(seq $((base + 1)) $((base + 3))) $(seq $((base + 11)) $((base + 13))); do
    if (echo >/dev/tcp/127.0.0.1/"$p") 2>/dev/null; then log "Port $p on 127.0.0.1 is taken: choose another base port"; return 1; fi
  done
  cluster_init "$dir" "$base" || return 1
  first=$(cluster_bootstrap_node "$dir")
  log "Starting Galera node $first as a new cluster (--wsrep-new-cluster)"
  cluster_start_node "$dir" "$first" --wsrep-new-cluster
  cluster_wait_synced "$dir" "$first" 60 || return 1
  cluster_node_sql "$dir" "$first" "
    CREATE USER IF NOT EXISTS '$CLUSTER_SST_USER'@'localhost' IDENTIFIED BY '$CLUSTER_SST_PASSWORD';
    GRANT RELOAD, PROCESS, LOCK TABLES, BINLOG MONITOR ON *.* TO '$CLUSTER_SST_USER'@'localhost';
    CREATE USER IF NOT EXISTS '$CLUSTER_CHECK_USER'@'127.0.0.1';
    FLUSH PRIVILEGES;" || return 1
  for i in $(seq 1 $CLUSTER_NODES); do
    [ "$i" = "$first" ] && continue
    log "Joining Galera node $i"
    cluster_start_node "$dir" "$i"
    cluster_wait_synced "$dir" "$i" 120 || return 1
  done
  local size; size=$(cluster_node_status "$dir" "$first" wsrep_cluster_size)
  [ "$size" = $CLUSTER_NODES ] || { log "wsrep_cluster_size is $size, expected $CLUSTER_NODES"; return 1; }
  log "Galera cluster of $size nodes on 127.0.0.1:$((base + 1))-$((base + CLUSTER_NODES))"
}

# cluster_stop DIR: stops every running node cleanly (the last one leaves safe_to_bootstrap: 1).
cluster_stop() {
  local dir="$1" i j
  for i in $(seq $CLUSTER_NODES -1 1); do
    local pid="${NODE_PID[$i]:-}"
    [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null || continue
    kill -TERM "$pid" 2>/dev/null
    for j in $(seq 1 150); do kill -0 "$pid" 2>/dev/null || break; sleep 0.2; done
    kill -9 "$pid" 2>/dev/null || true
    wait "$pid" 2>/dev/null || true
  done
}

# cluster_check_script DIR: the HAProxy external check: a node takes SQL only while it is Synced (4)
# and ready; a joining or donor node, or one outside the primary component, is out of rotation.
cluster_check_script() {
  local f="$1/galera-check.sh"
  cat >"$f" <<'SH'
#!/bin/sh
# HAProxy external-check: $3 address, $4 port of the node.
state=$(mariadb --no-defaults --connect-timeout=2 -h "$3" -P "$4" -u plenum_check -N -B \
  -e "SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_local_state','wsrep_ready')" 2>/dev/null | awk '{printf "%s=%s ", $1, $2}')
case "$state" in *wsrep_local_state=4*wsrep_ready=ON*|*wsrep_ready=ON*wsrep_local_state=4*) exit 0 ;; esac
exit 1
SH
  chmod +x "$f"
  echo "$f"
}

# haproxy_config FILE DBDIR DBBASE HTTPPORT APPPORT…: SQL on DBBASE (node 1 active, 2 and 3 backups: one
# writer at a time keeps certification conflicts rare), HTTP on HTTPPORT over the app processes.
# DBBASE 0 leaves out the SQL part, HTTPPORT 0 the HTTP part (the tests run them as two HAProxies).
haproxy_config() {
  local file="$1" dir="$2" base="$3" http="$4"; shift 4
  local check; check=$(cluster_check_script "$dir")
  {
    cat <<CFG
global
  maxconn 2000
  external-check
  insecure-fork-wanted

defaults
  timeout connect 2s
  timeout client 60s
  timeout server 60s
  timeout check 3s
CFG
    if [ "$base" != 0 ]; then
    cat <<CFG

frontend sql
  mode tcp
  bind 127.0.0.1:$base
  default_backend galera

backend galera
  mode tcp
  option external-check
  external-check path "/usr/bin:/bin"
  external-check command $check
  default-server inter 1s fall 2 rise 2 on-marked-down shutdown-sessions on-marked-up shutdown-backup-sessions
CFG
    local i
    for i in $(seq 1 $CLUSTER_NODES); do
      printf '  server node%s 127.0.0.1:%s check%s\n' "$i" $((base + i)) "$([ "$i" = 1 ] || echo ' backup')"
    done
    fi
    [ "$http" != 0 ] || return 0
    cat <<CFG

frontend web
  mode http
  bind 127.0.0.1:$http
  option forwardfor
  default_backend app

backend app
  mode http
  balance roundrobin
  option httpchk GET /api/health
  http-check expect status 200
  # A request that never reached a process goes to the other one; one whose process died before
  # answering gets a 503 (below), never a second try (a write may have been done).
  retry-on conn-failure
  option redispatch
  retries 2
  # A fresh connection to a process for each request: when a reused idle connection turns out dead,
  # HAProxy closes the client's connection without an answer (for the client to retry), which is no
  # clean refusal.
  http-reuse never
  # When no process can answer: a clean 503 with Retry-After, as the app itself answers while its database
  # is away (a write cut off by a dying process is one to check and try again, like a 503).
  http-error status 502 content-type application/json string '{"error":{"code":"service_unavailable","message":"Plenum did not answer; the change may not have been made. Check, then try again."}}'
  http-error status 503 content-type application/json string '{"error":{"code":"service_unavailable","message":"Plenum is not reachable just now; nothing was changed. Try again in a moment."}}'
  http-error status 504 content-type application/json string '{"error":{"code":"service_unavailable","message":"Plenum did not answer in time; the change may not have been made. Check, then try again."}}'
  http-after-response set-status 503 if { status 502 } || { status 504 }
  http-after-response set-header Retry-After 5 if { status 503 } !{ res.hdr(retry-after) -m found }
  default-server inter 1s fall 2 rise 1
CFG
    local n=1 p
    for p in "$@"; do printf '  server app%s 127.0.0.1:%s check\n' "$n" "$p"; n=$((n + 1)); done
  } >"$file"
}

# haproxy_start FILE: HAProxy in the foreground mode (-db) as a child of this shell; sets HAPROXY_PID.
haproxy_start() {
  "$HAPROXY" -c -q -f "$1" || { log "HAProxy configuration $1 is invalid"; return 1; }
  "$HAPROXY" -db -f "$1" >"${1%.cfg}.log" 2>&1 &
  HAPROXY_PID=$!
}
