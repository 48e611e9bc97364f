#!/usr/bin/env bash
# examples/shards/parallel-ssh-yield.sh - a Monte Carlo yield split over
# machines reached by ssh with GNU parallel, then merged here into the one
# report the unsharded run gives.
#
#   HOSTS=4/alpha,4/beta examples/shards/parallel-ssh-yield.sh
#
# HOSTS is GNU parallel's --sshlogin list (N/host: at most N jobs there at
# once); ":" is this machine, the default, so the script runs anywhere.
# Each host needs bootrung on its PATH (the same version on the same kind
# of machine: merge refuses anything else).  Nothing needs to be shared:
# parallel copies the design file to each job's host and brings its shard
# file back, so every path below is relative to this directory.
#
# Settings (environment):
#   BOOTRUNG  the program on every host (default: bootrung)
#   DESIGN    the design file, relative (default examples/leg-7level.xml)
#   SHARDS    number of shards (default 8)
#   SAMPLES   Monte Carlo samples in all (default 2000)
#   THREADS   threads per shard (default 2)
set -euo pipefail

bootrung=${BOOTRUNG:-bootrung}
design=${DESIGN:-examples/leg-7level.xml}
hosts=${HOSTS:-:}
shards=${SHARDS:-8}
samples=${SAMPLES:-2000}
threads=${THREADS:-2}

case $design in /*) echo "DESIGN must be a relative path (it is copied to the hosts)" >&2; exit 2 ;; esac
mkdir -p shards
rm -f shards/part-*.shard

# The same arguments for every shard and the merge (merge checks them).
args="yield --samples $samples --seed 1 --threads $threads --csv shards/yield.csv $design"

# --transferfile copies the design, --return fetches the shard, --cleanup
# removes both from the remote host; on ":" they stay where they are.
seq 1 "$shards" | parallel --sshlogin "$hosts" --halt now,fail=1 \
    --transferfile "$design" --return "shards/part-{}.shard" --cleanup \
    "mkdir -p shards && $bootrung $args --shard {}/$shards --shard-file shards/part-{}.shard"

# The merge runs here: the report on stdout, shards/yield.csv beside it.
# shellcheck disable=SC2086
exec "$bootrung" merge shards/part-*.shard
