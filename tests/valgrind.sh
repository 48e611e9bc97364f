#!/usr/bin/env bash
# tests/valgrind.sh - valgrind memcheck over the command line: every
# analysis verb on every example (a line cycle's on a short one), plus the
# error paths (missing file, bad input, bad usage, an unwritable output).
# Zero errors and zero leaks of any kind, or it fails.  Uses the plain build
# in build/ (or BR_BUILD_DIR);
# run tests/run.sh first.  Without --track-origins (it doubles the time):
# add it by hand to find where an uninitialised value comes from.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

dir=${BR_BUILD_DIR:-build}
bin=$dir/bootrung
if ! command -v valgrind >/dev/null 2>&1; then
    echo "valgrind: not installed (Debian: apt-get install valgrind)" >&2
    exit 1
fi
[ -x "$bin" ] || { echo "valgrind: no $bin: build first (tests/run.sh)" >&2; exit 1; }

log=$dir/valgrind.log
: >"$log"
runs=0 bad=0
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

# vg EXPECTED_STATUS ARGS...: one run under memcheck, in the background,
# at most one per processor at a time (memcheck is single-threaded; two
# lanes halve the step); 99 means memcheck found an error or a leak.  A
# bad run leaves its report in $tmp/bad.N.
lanes=$(nproc)
vg() {
    local want=$1
    shift
    runs=$((runs + 1))
    while [ "$(jobs -rp | wc -l)" -ge "$lanes" ]; do wait -n || true; done
    vg_one "$runs" "$want" "$@" &
}
vg_one() {
    local id=$1 want=$2 status=0
    shift 2
    valgrind -q --error-exitcode=99 --leak-check=full --show-leak-kinds=all \
        --errors-for-leak-kinds=all --log-file="$tmp/vg.$id.log" \
        "$bin" "$@" >/dev/null 2>"$tmp/stderr.$id" || status=$?
    if [ "$status" = 99 ] || [ -s "$tmp/vg.$id.log" ] || ! [[ " $want " == *" $status "* ]]; then
        {
            echo "=== bootrung $* (exit $status, expected $want)"
            cat "$tmp/vg.$id.log" "$tmp/stderr.$id"
        } >"$tmp/bad.$id"
    fi
}

# The AC example's line cycle is 2000 switching periods a line period, a
# few minutes under memcheck: the line-cycle paths run on the short line
# cycle of tests/data/line-3level.xml instead (50 periods), every verb.
for f in examples/*.xml tests/data/line-3level.xml; do
    [ "$f" = examples/inverter-7level.xml ] && { vg "0 1" check "$f"; continue; }
    vg "0 1" check "$f"
    vg "0 1 3" startup "$f"
    vg "0 1 3" steady "$f"
    b=$(basename "$f" .xml)
    vg "0 1 3" analyze --xml "$tmp/$b.out.xml" --csv "$tmp/$b.out.csv" "$f"
done
vg "1 3" analyze --solver-limit 1 examples/demo-3level.xml # undetermined path
vg "1 3" steady --solver-limit 1 tests/data/line-3level.xml  # an unsettled line cycle
vg "0 1" window tests/data/line-3level.xml
vg "0 1 3" yield --samples 4 --threads 2 tests/data/line-3level.xml
vg 2 map --duty 0.2:0.8:3 --freq 50k:200k:3 tests/data/line-3level.xml
vg 0 netlist --periods 5 --out "$tmp/out.cir" examples/leg-7level.xml
vg 2 netlist tests/data/line-3level.xml
vg 2 check tests/bad/spice-model-range.xml
# a sweep in two shards and their merge, and a merge that is refused
for k in 1 2; do
    vg 0 map --duty 0.3:0.7:3 --freq 50k:200k:3 --shard $k/2 --shard-file "$tmp/m$k.shard" \
        examples/demo-3level.xml
done
wait # the merges read both shards
vg "0 1 3" merge "$tmp/m1.shard" "$tmp/m2.shard"
vg 2 merge "$tmp/m1.shard"
vg 2 analyze no-such-file.xml
vg 2 analyze tests/bad/unit-nan.xml
vg 2 check tests/bad/doctype-billion-laughs.xml
vg 2 check tests/bad/mismatched-tag.xml
vg 2 check tests/extreme/levels-64.xml
vg 2 analyze --no-such-option examples/demo-3level.xml
vg 2 analyze --xml /dev/full examples/demo-3level.xml

wait
for r in "$tmp"/bad.*; do
    [ -e "$r" ] || continue
    bad=$((bad + 1))
    tee -a "$log" <"$r" >&2
done
if [ "$bad" -ne 0 ]; then
    echo "valgrind: $bad of $runs runs had memory errors, leaks or a wrong exit status (see $log)" >&2
    exit 1
fi
