#!/usr/bin/env bash
# tests/slurm/run.sh BOOTRUNG - examples/shards/slurm-yield.sh on a real
# Slurm: a private one-node cluster is built in a temporary directory (its
# own slurm.conf through SLURM_CONF, its own munge key and socket, state and
# spool directories, ports nobody listens on), munged, slurmctld and slurmd
# are started, the example submits a small yield as a job array and a merge
# job with the real sbatch, and the merged report and CSV must be byte for
# byte the unsharded run's, with its exit status.
#
# Skipped (exit 77, the reason printed) when not root or when sbatch,
# sinfo, squeue, scontrol, scancel, slurmctld, slurmd or munged is
# missing.  Once the tools are there, anything else that goes wrong (a
# daemon that does not start, a job that does not end in time) is a
# failure, with the daemons' logs.
# Whatever happens the test ends within about 100 s and the trap stops
# every daemon it started and removes the temporary directory.
set -euo pipefail

skip() {
    echo "SKIP: $*"
    exit 77
}

[ $# -eq 1 ] || { echo "usage: $0 BOOTRUNG" >&2; exit 2; }
[ "$(id -u)" -eq 0 ] || skip "needs root to run slurmctld and slurmd"
for tool in sbatch sinfo squeue scontrol scancel slurmctld slurmd munged; do
    command -v "$tool" >/dev/null 2>&1 ||
        PATH=$PATH:/usr/sbin:/sbin command -v "$tool" >/dev/null 2>&1 ||
        skip "$tool is not installed (Debian: slurmctld slurmd slurm-client munge)"
done
export PATH=$PATH:/usr/sbin:/sbin

bin=$(realpath "$1")
src=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)
limit=75 # seconds until the jobs must have ended, from here
# in /tmp, not TMPDIR: a Unix socket path must stay under 108 bytes
work=$(mktemp -d /tmp/bootrung-slurm.XXXXXX)
pids=()

# The daemons by the ids we started them with; slurmstepd (forked by
# slurmd for a job, then on its own) is found by the private SLURM_CONF in
# its environment, so nothing else on the machine is touched.
cleanup() {
    local status=$? pid
    trap - EXIT INT TERM
    if [ -n "${SLURM_CONF:-}" ] && [ -n "${ctld_up:-}" ]; then
        timeout 5 scancel --quiet --user=root 2>/dev/null || true
    fi
    for pid in /proc/[0-9]*; do
        pid=${pid#/proc/}
        [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = slurmstepd ] || continue
        tr '\0' '\n' 2>/dev/null <"/proc/$pid/environ" | grep -qxF "SLURM_CONF=$work/slurm.conf" &&
            kill "$pid" 2>/dev/null
    done
    for ((i = ${#pids[@]} - 1; i >= 0; i--)); do
        stop "${pids[i]}"
    done
    [ -s "$work/munged.pid" ] && stop "$(cat "$work/munged.pid")"
    rm -rf "$work"
    exit "$status"
}
trap cleanup EXIT
trap 'exit 143' TERM
trap 'exit 130' INT

# stop PID: SIGTERM, then SIGKILL after 3 s
stop() {
    kill "$1" 2>/dev/null || return 0
    for _ in $(seq 1 30); do
        kill -0 "$1" 2>/dev/null || return 0
        sleep 0.1
    done
    kill -KILL "$1" 2>/dev/null || true
}

fail() {
    echo "FAIL: $*"
    local log
    for log in munged.log slurmctld.log slurmd.log; do
        [ -f "$work/$log" ] && { echo "--- $log (end)"; tail -n 25 "$work/$log"; }
    done
    [ -d "$work/run/shards" ] && for log in "$work"/run/shards/task-*.log; do
        [ -f "$log" ] && { echo "--- ${log##*/}"; cat "$log"; }
    done
    exit 1
}

# wait_for SECONDS WHAT COMMAND...: poll COMMAND every 0.5 s, bounded both
# by SECONDS and by what is left of the test's limit
wait_for() {
    local secs=$1 what=$2 end
    shift 2
    end=$((SECONDS + secs))
    ((end > limit)) && end=$limit
    until "$@" >/dev/null 2>&1; do
        ((SECONDS < end)) || fail "$what not within ${secs} s"
        sleep 0.5
    done
}

# A TCP port nobody listens on (IPv4 or IPv6), from a range left to
# ordinary services, different from $1; status 1 when none is found.
free_port() {
    local p hex
    for _ in $(seq 1 50); do
        p=$((20000 + RANDOM % 20000))
        [ "$p" = "${1:-}" ] && continue
        printf -v hex ':%04X ' "$p"
        grep -qF "$hex" /proc/net/tcp /proc/net/tcp6 2>/dev/null || { echo "$p"; return 0; }
    done
    return 1
}

SECONDS=0
mkdir -p "$work"/{state,spool,run/examples}
chmod 711 "$work" # munged wants its socket's directory searchable

# munge: its own key, socket, pid, seed and log files
dd if=/dev/urandom of="$work/munge.key" bs=1024 count=1 status=none
chmod 400 "$work/munge.key"
munged --force --key-file="$work/munge.key" --socket="$work/munge.socket" \
    --pid-file="$work/munged.pid" --seed-file="$work/munged.seed" \
    --log-file="$work/munged.log" || fail "munged did not start"
wait_for 10 "munged's socket" test -S "$work/munge.socket"

# slurm.conf: this host as the controller, one node "brnode" at 127.0.0.1
# with the CPUs this machine has, one default partition
host=$(hostname -s)
ctld_port=$(free_port) || fail "no free TCP port found"
slurmd_port=$(free_port "$ctld_port") || fail "no free TCP port found"
cpus=$(nproc)
cat >"$work/slurm.conf" <<EOF
ClusterName=brtest
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=$ctld_port
SlurmdPort=$slurmd_port
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$work/munge.socket
StateSaveLocation=$work/state
SlurmdSpoolDir=$work/spool
SlurmctldPidFile=$work/slurmctld.pid
SlurmdPidFile=$work/slurmd.pid
SlurmctldLogFile=$work/slurmctld.log
SlurmdLogFile=$work/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
SwitchType=switch/none
SchedulerType=sched/builtin
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
MessageTimeout=5
MinJobAge=300
NodeName=brnode NodeAddr=127.0.0.1 NodeHostname=$host CPUs=$cpus State=UNKNOWN
PartitionName=brtest Nodes=brnode Default=YES MaxTime=10 State=UP
EOF
export SLURM_CONF=$work/slurm.conf

slurmctld -D -i -f "$SLURM_CONF" >"$work/slurmctld.out" 2>&1 &
pids+=($!)
ctld_up=1
wait_for 20 "slurmctld answering" timeout 5 scontrol ping
slurmd -D -N brnode -f "$SLURM_CONF" >"$work/slurmd.out" 2>&1 &
pids+=($!)
idle() { timeout 5 sinfo -h -n brnode -o %t | grep -qx idle; }
wait_for 30 "the node idle" idle
echo "cluster up in ${SECONDS} s: slurmctld on port $ctld_port, slurmd on $slurmd_port, $cpus CPUs"

# The unsharded run, then the example with the real sbatch: 3 shards of a
# 24-sample yield, one thread each (the same settings as examples_shards).
run=$work/run
cp "$src/examples/demo-3level.xml" "$run/examples/"
export BOOTRUNG="$bin" DESIGN=examples/demo-3level.xml SHARDS=3 SAMPLES=24 THREADS=1
whole_status=0
(cd "$run" && mkdir -p shards &&
    timeout 30 "$bin" yield --samples 24 --seed 1 --threads 1 --csv shards/yield.csv \
        examples/demo-3level.xml >whole.txt) || whole_status=$?
[ "$whole_status" -le 1 ] || fail "the unsharded yield exited $whole_status"
mv "$run/shards/yield.csv" "$run/whole.csv"

said=$(cd "$run" && timeout 20 bash "$src/examples/shards/slurm-yield.sh") ||
    fail "slurm-yield.sh did not submit"
echo "$said"
merge=$(sed -n 's/.* and merge \([0-9][0-9]*\);.*/\1/p' <<<"$said")
[ -n "$merge" ] || fail "no merge job id in: $said"

# Done when the queue is empty: the merge runs after the array, and with
# afterok it is cancelled (never left pending) when a task fails.
empty() { [ -z "$(timeout 5 squeue -h -o %i)" ]; }
wait_for 60 "every job ended" empty
echo "jobs ended after ${SECONDS} s"

state=$(timeout 5 scontrol -o show job "$merge") || fail "merge job $merge unknown"
exit_code=$(sed -n 's/.* ExitCode=\([0-9]*\):.*/\1/p' <<<"$state")
[ -s "$run/shards/yield.txt" ] || fail "no merged report; merge job: $state"
cmp "$run/whole.txt" "$run/shards/yield.txt" || fail "merged report differs"
cmp "$run/whole.csv" "$run/shards/yield.csv" || fail "merged CSV differs"
[ "$exit_code" = "$whole_status" ] ||
    fail "merge job exited $exit_code, the unsharded run $whole_status"
echo "slurm: merged report and CSV identical to the unsharded run (exit $whole_status) in ${SECONDS} s"
