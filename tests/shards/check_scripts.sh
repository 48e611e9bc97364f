#!/usr/bin/env bash
# tests/shards/check_scripts.sh BOOTRUNG - the example shard scripts run a
# small yield and their merged report and CSV are byte for byte the
# unsharded run's.  GNU parallel on this machine (HOSTS ":"); Slurm only
# when a cluster answers (sinfo), else that half is skipped.  Exit 77 when
# neither could run.
set -euo pipefail
bin=$(realpath "$1")
src=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
ran=0

# the run both scripts make, unsharded, in directory $1
whole() {
    (cd "$1" && mkdir -p shards &&
        "$bin" yield --samples 24 --seed 1 --threads 1 --csv shards/yield.csv \
            examples/demo-3level.xml >whole.txt || [ $? -eq 1 ]) &&
        mv "$1/shards/yield.csv" "$1/whole.csv"
}

setup() {
    mkdir -p "$1/examples" && cp "$src/examples/demo-3level.xml" "$1/examples/"
}

export BOOTRUNG="$bin" DESIGN=examples/demo-3level.xml SHARDS=3 SAMPLES=24 THREADS=1

if command -v parallel >/dev/null; then
    d=$work/parallel
    setup "$d" && whole "$d"
    (cd "$d" && HOSTS=: bash "$src/examples/shards/parallel-ssh-yield.sh" >merged.txt 2>err.txt) ||
        [ $? -eq 1 ] || { cat "$d/err.txt"; exit 1; }
    cmp "$d/whole.txt" "$d/merged.txt" && cmp "$d/whole.csv" "$d/shards/yield.csv"
    echo "parallel: merged report and CSV identical to the unsharded run"
    ran=1
else
    echo "parallel: not installed, skipped"
fi

if command -v sbatch >/dev/null && sinfo -h >/dev/null 2>&1; then
    d=$work/slurm
    setup "$d" && whole "$d"
    (cd "$d" && bash "$src/examples/shards/slurm-yield.sh")
    for _ in $(seq 1 120); do # the merge job writes the report last
        [ -s "$d/shards/yield.txt" ] && ! squeue -h -n bootrung-merge | grep -q . && break
        sleep 1
    done
    cmp "$d/whole.txt" "$d/shards/yield.txt" && cmp "$d/whole.csv" "$d/shards/yield.csv"
    echo "slurm: merged report and CSV identical to the unsharded run"
    ran=1
else
    echo "slurm: no cluster answers (sinfo), skipped"
fi
[ "$ran" = 1 ] || exit 77
