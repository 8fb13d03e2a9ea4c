#!/usr/bin/env bash
# Integration test of `horologium batch` under a real Slurm scheduler, on this one machine, as root.
#
# It starts its own munged, slurmctld and slurmd (private sockets, ports, state and spool folders in a
# temporary folder; no system configuration is touched), simulates a small quasar catalogue, writes a
# job array with `horologium batch plan`, submits it with sbatch, waits for it, joins the shards with
# `horologium batch merge`, and checks that the merged table equals a single-process run of the same
# catalogue (every cell but the wall-clock diagnostics.seconds). The daemons it started are stopped on
# exit, whatever happens (trap). Every wait is bounded.
#
# Needs: root, Debian's slurm-wlm and munge (bash .ci/setup-slurm.sh), and a build (npm run build).
# The fit is Horologium's damped-random-walk fit on about 80 points per light curve, with a sampling
# budget of 2e5 log-likelihood evaluations so that the test takes minutes, not hours: results may be
# reported as not converged, which does not matter here, since the check is that the scheduler's run
# and the single-process run agree cell for cell.
#
# Environment: HOROLOGIUM_SLURM_OBJECTS (default 4), HOROLOGIUM_SLURM_SHARDS (default 3),
#   HOROLOGIUM_SLURM_WAIT (seconds for the job array, default 420),
#   HOROLOGIUM_SLURM_FIT_MODULE (fit with this module instead of Horologium's DRW fit),
#   HOROLOGIUM_SLURM_KEEP=1 (keep the temporary folder for inspection).
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
CLI="$ROOT/dist/src/cli/bin.js"
SIMULATE="$ROOT/dist/bench/batch-simulated-catalogue.js"
OBJECTS="${HOROLOGIUM_SLURM_OBJECTS:-4}"
SHARDS="${HOROLOGIUM_SLURM_SHARDS:-3}"
WAIT_LIMIT="${HOROLOGIUM_SLURM_WAIT:-420}"
NODE="$(command -v node)"

say() { echo "slurm-integration: $*"; }
fail() {
  echo "slurm-integration: FAILED: $*" >&2
  exit 1
}

[ "$(id -u)" = 0 ] || fail "must run as root (it starts munged, slurmctld and slurmd)"
for command in munged slurmctld slurmd sbatch squeue sinfo scontrol timeout; do
  command -v "$command" >/dev/null || fail "$command not found: install slurm-wlm and munge (bash .ci/setup-slurm.sh)"
done
[ -f "$CLI" ] && [ -f "$SIMULATE" ] || fail "the build is missing ($CLI, $SIMULATE): run npm run build"

WORK="$(mktemp -d /tmp/horologium-slurm.XXXXXX)"
chmod 755 "$WORK"
mkdir -p "$WORK/munge-key" "$WORK/munge-run" "$WORK/state" "$WORK/spool" "$WORK/log"
chmod 700 "$WORK/munge-key"
chmod 755 "$WORK/munge-run"

# --- stop exactly the daemons this script started, on any exit -------------------------------------
stop_daemons() {
  local pidfile pid waited
  for pidfile in "$WORK/slurmd.pid" "$WORK/slurmctld.pid" "$WORK/munge-run/munged.pid"; do
    [ -s "$pidfile" ] || continue
    pid="$(cat "$pidfile")"
    kill "$pid" 2>/dev/null || continue
    for waited in $(seq 1 50); do
      kill -0 "$pid" 2>/dev/null || break
      sleep 0.2
    done
    if kill -0 "$pid" 2>/dev/null; then
      say "daemon $pid did not stop in 10 s; killing it"
      kill -9 "$pid" 2>/dev/null || true
    fi
  done
}
finish() {
  local status=$?
  if [ "$status" -ne 0 ]; then
    say "logs of the failed run:"
    for log in "$WORK"/log/*.log "$WORK"/array/logs/*.log; do
      [ -f "$log" ] && { echo "----- $log (last 25 lines)"; tail -n 25 "$log"; }
    done
  fi
  stop_daemons
  if [ "${HOROLOGIUM_SLURM_KEEP:-0}" = 1 ]; then say "kept $WORK"; else rm -rf "$WORK"; fi
  exit "$status"
}
trap finish EXIT
trap 'exit 130' INT TERM

# --- munge, on a private socket and key ------------------------------------------------------------
dd if=/dev/urandom of="$WORK/munge-key/munge.key" bs=1024 count=1 status=none
chmod 400 "$WORK/munge-key/munge.key"
munged --force --socket="$WORK/munge-run/munge.sock" --key-file="$WORK/munge-key/munge.key" \
  --pid-file="$WORK/munge-run/munged.pid" --log-file="$WORK/log/munged.log" --seed-file="$WORK/munge-run/munged.seed"
say "munged started (pid $(cat "$WORK/munge-run/munged.pid"))"

# --- a single-node Slurm cluster -------------------------------------------------------------------
port_free() { ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
CTLD_PORT=""
for attempt in $(seq 1 50); do
  candidate=$((20000 + RANDOM % 20000))
  if port_free "$candidate" && port_free "$((candidate + 1))"; then CTLD_PORT="$candidate"; break; fi
done
[ -n "$CTLD_PORT" ] || fail "no free pair of ports found"
HOST="$(hostname -s)"
CPUS="$(nproc)"
export SLURM_CONF="$WORK/slurm.conf"
cat >"$SLURM_CONF" <<CONF
ClusterName=horologium-test
SlurmctldHost=$HOST(127.0.0.1)
SlurmUser=root
SlurmdUser=root
SlurmctldPort=$CTLD_PORT
SlurmdPort=$((CTLD_PORT + 1))
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$WORK/munge-run/munge.sock
StateSaveLocation=$WORK/state
SlurmdSpoolDir=$WORK/spool
SlurmctldPidFile=$WORK/slurmctld.pid
SlurmdPidFile=$WORK/slurmd.pid
SlurmctldLogFile=$WORK/log/slurmctld.log
SlurmdLogFile=$WORK/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SchedulerType=sched/builtin
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
MpiDefault=none
ReturnToService=2
MinJobAge=600
NodeName=$HOST NodeAddr=127.0.0.1 CPUs=$CPUS RealMemory=1000 State=UNKNOWN
PartitionName=horologium Nodes=$HOST Default=YES MaxTime=INFINITE State=UP
CONF
slurmctld -f "$SLURM_CONF"
slurmd -f "$SLURM_CONF"
say "slurmctld (port $CTLD_PORT) and slurmd started"

deadline=$((SECONDS + 60))
until sinfo -h -o '%T' 2>/dev/null | grep -qx idle; do
  [ "$SECONDS" -lt "$deadline" ] || { sinfo 2>&1 || true; fail "the node did not become idle within 60 s"; }
  sleep 1
done
say "node $HOST is idle with $CPUS CPUs"

# --- the catalogue, the plan, the job array --------------------------------------------------------
CATALOGUE="$WORK/lanternfield-quasars.csv"
timeout 120 "$NODE" "$SIMULATE" --objects "$OBJECTS" --seed 4242 --seasons 2 --out "$CATALOGUE"
FIT=(--model drw --seed 11 --id-col object_id --max-evaluations 200000 --timeout 600)
if [ -n "${HOROLOGIUM_SLURM_FIT_MODULE:-}" ]; then FIT+=(--fit-module "$HOROLOGIUM_SLURM_FIT_MODULE"); fi

timeout 60 "$NODE" "$CLI" batch plan "$CATALOGUE" "${FIT[@]}" --shards "$SHARDS" --out-dir "$WORK/array" \
  --cpus-per-task 1 --time-limit 00:15:00 --job-name horologium-it
JOB="$(sbatch --parsable "$WORK/array/batch-job.sh")"
JOB="${JOB%%;*}"
say "submitted job array $JOB ($SHARDS tasks)"

deadline=$((SECONDS + WAIT_LIMIT))
while [ -n "$(squeue -h -j "$JOB" 2>/dev/null)" ]; do
  if [ "$SECONDS" -ge "$deadline" ]; then
    squeue -j "$JOB" || true
    scancel "$JOB" 2>/dev/null || true
    fail "the job array did not finish within $WAIT_LIMIT s"
  fi
  sleep 2
done
states="$(scontrol -o show job "$JOB" | grep -o 'JobState=[A-Z_]*' | sort | uniq -c | tr -s ' ')"
say "job array ended:$states"
bad="$(scontrol -o show job "$JOB" | grep -v 'JobState=COMPLETED' || true)"
[ -z "$bad" ] || fail "some tasks did not complete: $(echo "$bad" | grep -o 'ArrayTaskId=[0-9]* JobName=[^ ]*\|JobState=[A-Z_]*\|ExitCode=[0-9:]*' | tr '\n' ' ')"

# --- single process, merge, compare ----------------------------------------------------------------
timeout "$WAIT_LIMIT" "$NODE" "$CLI" batch "$CATALOGUE" "${FIT[@]}" --workers "$CPUS" --out "$WORK/single.csv" --quiet
say "single-process run done"
timeout 120 "$NODE" "$CLI" batch merge "$WORK"/array/shard-*.csv --catalogue "$CATALOGUE" --id-col object_id \
  --out "$WORK/merged.csv"
timeout 120 "$NODE" "$ROOT/scripts/compare-result-tables.mjs" "$WORK/single.csv" "$WORK/merged.csv" --ignore diagnostics.seconds
say "PASSED: the merged job-array results equal the single-process run"
