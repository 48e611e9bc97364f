#!/usr/bin/env bash
# tests/fuzz/run.sh - build the fuzz targets of the design-file and the
# part-catalog loaders with clang (libFuzzer + ASan + UBSan) in build-fuzz/
# (or BR_FUZZ_DIR) and run them for a bounded time in all, on seed corpora
# made of the examples, tests/bad and tests/extreme, and of the example
# catalog.
#
#   tests/fuzz/run.sh [SECONDS]     default 60
#
# Exit status: 0 when nothing was found, 1 when the fuzzer found a crash,
# leak or timeout (the input is saved under build-fuzz/artifacts/; turn it
# into a regression test in tests/bad/), 77 when no working libFuzzer.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/../.."

secs=${1:-60}
dir=${BR_FUZZ_DIR:-build-fuzz}
cc=${BR_FUZZ_CC:-clang}

# Does this clang link a trivial libFuzzer target?  (Debian: the runtime is
# in libclang-rt-NN-dev, pulled in by libclang-rt-dev.)
fuzzer_works() {
    command -v "$cc" >/dev/null 2>&1 || return 1
    local tmp
    tmp=$(mktemp -d)
    printf '%s\n' '#include <stddef.h>' '#include <stdint.h>' \
        'int LLVMFuzzerTestOneInput(const uint8_t *d, size_t n);' \
        'int LLVMFuzzerTestOneInput(const uint8_t *d, size_t n) { (void)d; (void)n; return 0; }' \
        >"$tmp/t.c"
    local ok=0
    "$cc" -fsanitize=fuzzer,address,undefined "$tmp/t.c" -o "$tmp/t" >/dev/null 2>&1 || ok=1
    rm -rf "$tmp"
    return $ok
}

if ! fuzzer_works; then
    echo "fuzz: skipped: '$cc' cannot build a libFuzzer target (install clang and libclang-rt-dev)"
    exit 77
fi

mkdir -p "$dir"
log=$dir/build.log
if [ ! -f "$dir/CMakeCache.txt" ]; then
    CC=$cc cmake -S . -B "$dir" -DBR_FUZZ=ON -DCMAKE_BUILD_TYPE=RelWithDebInfo >"$log" 2>&1 ||
        { cat "$log" >&2; exit 1; }
fi
cmake --build "$dir" --parallel 2 --target fuzz_design fuzz_catalog >"$log" 2>&1 ||
    { cat "$log" >&2; exit 1; }

# fuzz TARGET SECONDS DICT SEEDS...: run one target on its own corpus (it
# grows across runs; the seeds are copied in each time).
fuzz() {
    local target=$1 t=$2 dict=$3
    shift 3
    local corpus=$dir/corpus-$target
    mkdir -p "$corpus" "$dir/artifacts"
    cp "$@" "$corpus/" 2>/dev/null || true
    echo "fuzz: running $target for ${t} s (log: $dir/$target.log)"
    set +e
    ASAN_OPTIONS=detect_leaks=1 UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1 \
        "$dir/$target" -max_total_time="$t" -timeout=5 -rss_limit_mb=2048 \
        -max_len=65536 -print_final_stats=1 -artifact_prefix="$dir/artifacts/$target-" \
        -dict="$dict" "$corpus" >"$dir/$target.log" 2>&1
    local rc=$?
    set -e
    grep -E '^stat::number_of_executed_units|^#[0-9]+ *DONE' "$dir/$target.log" | tail -2 || true
    if [ $rc -ne 0 ]; then
        tail -40 "$dir/$target.log" >&2
        echo "fuzz: $target FAILED (exit $rc); inputs in $dir/artifacts/" >&2
        return 1
    fi
}

# the design loader gets two thirds of the time, the catalog loader the
# rest; a libFuzzer run keeps one processor busy, so with two or more the
# two run side by side (the same time each, in two thirds of the wall time)
design_loader() {
    fuzz fuzz_design $((secs - secs / 3)) tests/fuzz/design.dict \
        examples/*.xml tests/bad/*.xml tests/extreme/*.xml
}
catalog_loader() {
    fuzz fuzz_catalog $((secs / 3 > 0 ? secs / 3 : 1)) tests/fuzz/catalog.dict examples/parts/*.xml
}
status=0
if [ "$(nproc)" -ge 2 ]; then
    design_loader &
    design=$!
    catalog_loader || status=1
    wait "$design" || status=1
else
    design_loader || status=1
    catalog_loader || status=1
fi
[ $status = 0 ] || exit 1
echo "fuzz: nothing found in ${secs} s"
