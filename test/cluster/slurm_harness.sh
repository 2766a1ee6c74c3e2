#!/usr/bin/env bash
# rvwalk's own single-host Slurm cluster for tests: a real slurmctld + slurmd
# pair with munge authentication on localhost, without systemd or cgroups.
# Debian/Ubuntu packages (slurmctld slurmd slurm-client munge) are installed
# with apt-get when missing; that needs root.
#
# Usage:  slurm_harness.sh start DIR    install if missing, write DIR/slurm.conf,
#                                       start the daemons, wait for the node
#         . DIR/env.sh                  exports SLURM_CONF for sbatch/squeue/scancel
#         slurm_harness.sh stop DIR [--purge]
#                                       cancel every job, stop the daemons by pid
#                                       file (never by name), remove runtime files
#         slurm_harness.sh status DIR   exit 0 when the node answers idle/mixed/allocated
#
# Exit codes of start: 0 up; 3 Slurm cannot be installed here (not root, no
# apt-get, install failed); 1 it is installed but would not start.
#
# DIR holds slurm.conf, env.sh, state/, log/ (slurmctld.log, slurmd.log,
# jobcomp.txt) and run/ (pid files). Unix sockets (munge socket, slurmd spool)
# live in /run/slurm-local-<hash of DIR>: socket paths are limited to 108
# bytes, and munged refuses socket and key directories whose parents are not
# world-traversable, so a private munged runs as user munge with its own key.
#
# Knobs (environment): SLURM_LOCAL_CTLD_PORT (6817), SLURM_LOCAL_SLURMD_PORT
# (6818), SLURM_LOCAL_CPUS (nproc), SLURM_LOCAL_MEM_MB (1024),
# SLURM_LOCAL_TIMEOUT (seconds to wait for each daemon, 60).
#
# Gotchas met on Debian 12 (Slurm 22.05, munge 0.5.15), as found by the
# recipe this follows:
# - package scripts cannot start services (no init system): a temporary
#   /usr/sbin/policy-rc.d (exit 101) keeps them from trying, daemons start here;
# - no accounting database, so sacct does not work: use
#   `squeue -t all -j ID -o '%K %T'` (finished jobs stay for MinJobAge=3600 s);
# - batch_sched_delay=0, else each wave of array tasks waits about 3 s;
# - MailProg=/usr/bin/true silences a warning; pmix/hwloc errors in slurmd.log
#   and "Could not open ... state file" on the first start are harmless.
set -uo pipefail

die() { echo "slurm_harness: $1" >&2; exit "${2:-1}"; }
log() { echo "slurm_harness: $*"; }

cmd=${1:-}
[ $# -ge 2 ] || die "usage: $0 start|stop|status DIR [--purge]" 2
shift
mkdir -p "$1" 2>/dev/null || die "cannot create $1"
DIR=$(cd "$1" && pwd -P)
case "$DIR" in *[[:space:]]*) die "DIR must not contain whitespace: $DIR" 2;; esac
PURGE=${2:-}

CTLD_PORT=${SLURM_LOCAL_CTLD_PORT:-6817}
SLURMD_PORT=${SLURM_LOCAL_SLURMD_PORT:-6818}
CPUS=${SLURM_LOCAL_CPUS:-$(nproc)}
MEM_MB=${SLURM_LOCAL_MEM_MB:-1024}
TIMEOUT=${SLURM_LOCAL_TIMEOUT:-60}
NODE=$(uname -n | cut -d. -f1)
HASH=$(printf '%s' "$DIR" | sha256sum | cut -c1-10)
RT=/run/slurm-local-$HASH
CONF=$DIR/slurm.conf
export SLURM_CONF=$CONF

# pid_of PIDFILE COMM: print the pid in PIDFILE if that process is alive and is COMM
pid_of() {
  local pid
  [ -s "$1" ] || return 1
  pid=$(cat "$1")
  [ -n "$pid" ] && [ -r "/proc/$pid/comm" ] && [ "$(cat "/proc/$pid/comm")" = "$2" ] && echo "$pid"
}
alive() { pid_of "$1" "$2" >/dev/null; }

show_logs() {
  for f in "$DIR"/log/*.log "$RT"/munge/munged.log; do
    [ -f "$f" ] && { echo "---- $f (tail)"; tail -n 20 "$f"; }
  done >&2
}

node_state() { sinfo -h -n "$NODE" -o %T 2>/dev/null || true; }

install_packages() {
  local b need=0
  for b in /usr/sbin/slurmctld /usr/sbin/slurmd /usr/bin/sbatch /usr/bin/sinfo \
           /usr/sbin/munged /usr/sbin/mungekey /usr/bin/munge; do
    [ -x "$b" ] || need=1
  done
  [ "$need" = 0 ] && return 0
  [ "$(id -u)" = 0 ] || die "Slurm is not installed and installing it needs root" 3
  command -v apt-get >/dev/null || die "Slurm is not installed and there is no apt-get" 3
  log "installing slurmctld slurmd slurm-client munge with apt-get"
  local t0 made_policy=0 ok=1
  t0=$(date +%s)
  if [ ! -e /usr/sbin/policy-rc.d ]; then
    printf '#!/bin/sh\nexit 101\n' > /usr/sbin/policy-rc.d
    chmod 0755 /usr/sbin/policy-rc.d
    made_policy=1
  fi
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq >/dev/null 2>&1 || ok=0
  if [ "$ok" = 1 ]; then
    apt-get install -y -qq --no-install-recommends \
      slurmctld slurmd slurm-client munge >/dev/null 2>&1 || ok=0
  fi
  [ "$made_policy" = 1 ] && rm -f /usr/sbin/policy-rc.d
  [ "$ok" = 1 ] || die "apt-get could not install slurmctld slurmd slurm-client munge" 3
  log "installed in $(( $(date +%s) - t0 ))s"
}

start() {
  [ "$(id -u)" = 0 ] || die "starting slurmctld/slurmd as configured here needs root" 3
  install_packages
  local t0; t0=$(date +%s)
  mkdir -p "$DIR/state" "$DIR/log" "$DIR/run" "$RT/spool"
  chmod 0755 "$RT"

  # munge: a private instance with its own key and socket
  local M=$RT/munge
  mkdir -p "$M"
  chown munge:munge "$M"
  chmod 0711 "$M"
  if [ ! -s "$M/munge.key" ]; then
    mungekey --create --keyfile="$M/munge.key" || die "mungekey failed"
    chown munge:munge "$M/munge.key"
    chmod 0400 "$M/munge.key"
  fi
  if ! alive "$M/munged.pid" munged; then
    rm -f "$M/munge.socket" "$M/munge.socket.lock"
    runuser -u munge -- /usr/sbin/munged \
      --socket="$M/munge.socket" --key-file="$M/munge.key" \
      --pid-file="$M/munged.pid" --log-file="$M/munged.log" \
      --seed-file="$M/munged.seed" || { show_logs; die "munged failed to start"; }
  fi
  munge -S "$M/munge.socket" -n | unmunge -S "$M/munge.socket" >/dev/null \
    || { show_logs; die "munge self-test failed"; }

  local newconf
  newconf=$(cat <<CONF
# written by rvwalk test/cluster/slurm_harness.sh: single-host test cluster
ClusterName=rvwalkci
SlurmctldHost=$NODE(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$M/munge.socket
SlurmctldPort=$CTLD_PORT
SlurmdPort=$SLURMD_PORT
StateSaveLocation=$DIR/state
SlurmdSpoolDir=$RT/spool
SlurmctldPidFile=$DIR/run/slurmctld.pid
SlurmdPidFile=$DIR/run/slurmd.pid
SlurmctldLogFile=$DIR/log/slurmctld.log
SlurmdLogFile=$DIR/log/slurmd.log
SlurmctldDebug=info
SlurmdDebug=info
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/filetxt
JobCompLoc=$DIR/log/jobcomp.txt
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
ReturnToService=2
MpiDefault=none
MailProg=/usr/bin/true
MinJobAge=3600
KillWait=10
NodeName=$NODE NodeAddr=127.0.0.1 CPUs=$CPUS RealMemory=$MEM_MB State=UNKNOWN
PartitionName=debug Nodes=$NODE Default=YES MaxTime=INFINITE State=UP
CONF
)
  local ctld_up=0 slurmd_up=0
  alive "$DIR/run/slurmctld.pid" slurmctld && ctld_up=1
  alive "$DIR/run/slurmd.pid" slurmd && slurmd_up=1
  if [ ! -f "$CONF" ] || [ "$(cat "$CONF")" != "$newconf" ]; then
    if [ "$ctld_up" = 1 ] || [ "$slurmd_up" = 1 ]; then
      log "config changed while running: stop first (slurm_harness.sh stop $DIR)"
    else
      printf '%s\n' "$newconf" > "$CONF"
    fi
  fi
  printf 'export SLURM_CONF=%s\n' "$CONF" > "$DIR/env.sh"

  if [ "$ctld_up" = 0 ]; then
    /usr/sbin/slurmctld -f "$CONF" || { show_logs; die "slurmctld failed to start"; }
  fi
  local i
  for i in $(seq 1 $((TIMEOUT * 5))); do
    scontrol ping >/dev/null 2>&1 && break
    sleep 0.2
  done
  scontrol ping >/dev/null 2>&1 || { show_logs; die "slurmctld does not answer"; }
  if [ "$slurmd_up" = 0 ]; then
    /usr/sbin/slurmd -f "$CONF" -N "$NODE" || { show_logs; die "slurmd failed to start"; }
  fi
  local state=""
  for i in $(seq 1 $((TIMEOUT * 5))); do
    state=$(node_state)
    case "$state" in idle|mixed|allocated|completing) break;; esac
    sleep 0.2
  done
  case "$state" in
    idle|mixed|allocated|completing) ;;
    *) sinfo -R >&2 || true; show_logs; die "node $NODE not ready (state '$state')";;
  esac
  log "cluster up: node $NODE $state, $CPUS CPUs, took $(( $(date +%s) - t0 ))s; . $DIR/env.sh"
}

# stop_all PIDFILE:COMM ...: SIGTERM each live daemon, wait, then SIGKILL what is left
stop_all() {
  local spec pid pids="" names="" left=""
  for spec in "$@"; do
    pid=$(pid_of "${spec%%:*}" "${spec##*:}") || continue
    kill -TERM "$pid" 2>/dev/null && pids="$pids $pid" && names="$names ${spec##*:}($pid)"
  done
  [ -n "$pids" ] || return 0
  for _ in $(seq 1 75); do
    left=""
    for pid in $pids; do [ -d "/proc/$pid" ] && left="$left $pid"; done
    [ -z "$left" ] && { log "stopped$names"; return 0; }
    sleep 0.2
  done
  log "still running after SIGTERM:$left, sending SIGKILL"
  for pid in $left; do kill -KILL "$pid" 2>/dev/null; done
  sleep 0.5
}

stop() {
  if [ -f "$CONF" ] && alive "$DIR/run/slurmctld.pid" slurmctld; then
    local jobs
    jobs=$(squeue -h -o %A 2>/dev/null | sort -u)
    if [ -n "$jobs" ]; then
      # shellcheck disable=SC2086
      scancel $jobs 2>/dev/null
      for _ in $(seq 1 75); do
        [ -z "$(squeue -h -t PD,R,CG,S 2>/dev/null)" ] && break
        sleep 0.2
      done
    fi
  fi
  stop_all "$DIR/run/slurmd.pid:slurmd" "$DIR/run/slurmctld.pid:slurmctld"
  stop_all "$RT/munge/munged.pid:munged"
  rm -rf "$RT"
  if [ "$PURGE" = --purge ]; then
    rm -rf "$DIR/state" "$DIR/log" "$DIR/run" "$CONF" "$DIR/env.sh"
    rmdir "$DIR" 2>/dev/null || true
  fi
  log "stopped"
}

status() {
  [ -f "$CONF" ] || die "no cluster in $DIR"
  local state; state=$(node_state)
  case "$state" in
    idle|mixed|allocated|completing) log "node $NODE $state";;
    *) die "node $NODE not ready (state '$state')";;
  esac
}

case "$cmd" in
  start) start;;
  stop) stop;;
  status) status;;
  *) die "usage: $0 start|stop|status DIR [--purge]" 2;;
esac
