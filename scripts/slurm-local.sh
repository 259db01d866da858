#!/usr/bin/env bash
# A one-node Slurm cluster on this machine, for CI and the B10 benchmark (needs root and the
# Debian packages slurm-wlm and munge):
#   scripts/slurm-local.sh start    generates a munge key and a minimal slurm.conf under a temp
#                                   folder, starts munged, slurmctld and slurmd, waits until the
#                                   node is idle, and prints `export SLURM_CONF=...` for eval
#   scripts/slurm-local.sh stop     stops the three daemons by their pid files, removes the folder
#   scripts/slurm-local.sh env      prints the export line again
# The folder is $FRINGEKIT_SLURM_DIR (default: ${TMPDIR:-/tmp}/fringekit-slurm-UID). The daemons
# run as root with a private munge socket; nothing outside that folder is written.
# The daemons listen on 127.0.0.1 only: CommunicationParameters=NoCtldInAddrAny,NoInAddrAny makes
# slurmctld and slurmd bind to the address the machine's host name resolves to instead of every
# interface. When that name does not resolve to a loopback address (or FRINGEKIT_SLURM_NAMESPACE=1),
# the daemons run in their own UTS namespace (unshare --uts) under the host name "localhost".
# After the start, every TCP socket the daemons listen on is checked to be on 127.0.0.1.
set -euo pipefail

DIR="${FRINGEKIT_SLURM_DIR:-${TMPDIR:-/tmp}/fringekit-slurm-$(id -u)}"
CONF="$DIR/slurm.conf"
CTLD_PORT="${FRINGEKIT_SLURM_PORT:-6817}"
SLURMD_PORT=$((CTLD_PORT + 1))

say() { echo "slurm-local: $*" >&2; }

stop_pid() { # name pidfile
  local pid
  [ -f "$2" ] || return 0
  pid="$(cat "$2" 2>/dev/null || true)"
  if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then
    kill "$pid" 2>/dev/null || true
    for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    kill -0 "$pid" 2>/dev/null && kill -9 "$pid" 2>/dev/null || true
    say "stopped $1 (pid $pid)"
  fi
}

loopback_name() { # whether the first IPv4 address of the name is a loopback address
  local address
  address="$(getent ahostsv4 "$1" 2>/dev/null | awk 'NR == 1 { print $1 }')"
  case "$address" in 127.*) return 0 ;; *) return 1 ;; esac
}

check_loopback() { # every TCP socket slurmctld and slurmd listen on is on 127.0.0.1
  command -v ss >/dev/null || { say "ss not found: cannot check the listening addresses (install iproute2)"; return 0; }
  local pids sockets wide
  pids="$(cat "$DIR/slurmctld.pid" "$DIR/slurmd.pid" 2>/dev/null | paste -sd'|')"
  sockets="$(ss -Hltnp 2>/dev/null | grep -E "pid=($pids)," || true)"
  wide="$(echo "$sockets" | awk 'NF > 0 && $4 !~ /^127\./')"
  if [ -z "$pids" ] || [ "$(echo "$sockets" | grep -c pid=)" -lt 2 ]; then say "cannot see the daemons' listening sockets (ss -ltnp): $sockets"; return 1; fi
  [ -z "$wide" ] && return 0
  say "a daemon listens beyond 127.0.0.1: $wide"
  return 1
}

start() {
  for tool in munged slurmctld slurmd sinfo; do
    command -v "$tool" >/dev/null || { say "$tool not found: install the Debian packages slurm-wlm and munge"; exit 1; }
  done
  [ "$(id -u)" = 0 ] || { say "run as root (the CI machine); on a real cluster use its own Slurm"; exit 1; }
  if [ -f "$DIR/slurmctld.pid" ] && kill -0 "$(cat "$DIR/slurmctld.pid")" 2>/dev/null; then
    say "already running ($CONF)"; echo "export SLURM_CONF=$CONF"; return 0
  fi
  rm -rf "$DIR"
  mkdir -p "$DIR/state" "$DIR/spool" "$DIR/munge"
  chmod 700 "$DIR/munge"
  local host cpus mem wrap=()
  host="$(hostname -s)"
  if [ "${FRINGEKIT_SLURM_NAMESPACE:-0}" = 1 ] || ! loopback_name "$(hostname)"; then
    # Own host name for the daemons only, one that always resolves to 127.0.0.1.
    unshare --uts true 2>/dev/null || { say "the host name $(hostname) does not resolve to 127.0.0.1 and unshare --uts is not allowed here; add '127.0.0.1 $(hostname)' to /etc/hosts"; exit 1; }
    host=localhost
    wrap=(unshare --uts sh -c 'hostname localhost && exec "$@"' sh)
  fi
  cpus="$(nproc)"
  # Modest memory: half of the machine, at most 8 GB (slurmd drains a node that has less than this).
  mem=$(awk '/MemTotal/ { m = int($2 / 1024 / 2); print (m > 8192 ? 8192 : m) }' /proc/meminfo)

  dd if=/dev/urandom of="$DIR/munge/munge.key" bs=1024 count=1 status=none
  chmod 400 "$DIR/munge/munge.key"
  munged --force --key-file="$DIR/munge/munge.key" --socket="$DIR/munge/munge.socket" \
    --pid-file="$DIR/munge/munged.pid" --log-file="$DIR/munge/munged.log" --seed-file="$DIR/munge/munged.seed"

  cat >"$CONF" <<CONF
# One-node cluster for fringekit's CI (written by scripts/slurm-local.sh).
ClusterName=fringekit-ci
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=$CTLD_PORT
SlurmdPort=$SLURMD_PORT
# Listen on the loopback address only (SlurmctldHost and NodeAddr above and below), not on every interface.
CommunicationParameters=NoCtldInAddrAny,NoInAddrAny
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
AuthInfo=socket=$DIR/munge/munge.socket
CredType=cred/munge
StateSaveLocation=$DIR/state
SlurmdSpoolDir=$DIR/spool
SlurmctldPidFile=$DIR/slurmctld.pid
SlurmdPidFile=$DIR/slurmd.pid
SlurmctldLogFile=$DIR/slurmctld.log
SlurmdLogFile=$DIR/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SchedulerType=sched/builtin
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU_Memory
ReturnToService=2
MpiDefault=none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SwitchType=switch/none
SlurmctldTimeout=30
SlurmdTimeout=30
InactiveLimit=0
MinJobAge=300
KillWait=5
NodeName=$host NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$mem State=UNKNOWN
PartitionName=local Nodes=$host Default=YES MaxTime=INFINITE State=UP
CONF
  export SLURM_CONF="$CONF"
  "${wrap[@]}" slurmctld -f "$CONF" -c
  "${wrap[@]}" slurmd -f "$CONF" -N "$host"
  for _ in $(seq 1 60); do
    state="$(sinfo -h -N -o '%T' 2>/dev/null | head -1 || true)"
    case "$state" in idle|mixed|allocated)
      check_loopback || { stop; exit 1; }
      say "node $host up ($cpus CPUs, $mem MB, listening on 127.0.0.1:$CTLD_PORT and :$SLURMD_PORT) with $CONF"; echo "export SLURM_CONF=$CONF"; return 0 ;;
    esac
    sleep 1
  done
  say "the node did not come up (state: ${state:-none}); logs: $DIR/slurmctld.log $DIR/slurmd.log"
  tail -5 "$DIR/slurmctld.log" "$DIR/slurmd.log" >&2 || true
  exit 1
}

stop() {
  stop_pid slurmd "$DIR/slurmd.pid"
  stop_pid slurmctld "$DIR/slurmctld.pid"
  stop_pid munged "$DIR/munge/munged.pid"
  rm -rf "$DIR"
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  env) echo "export SLURM_CONF=$CONF" ;;
  *) echo "usage: $0 start|stop|env" >&2; exit 2 ;;
esac
