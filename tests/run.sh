#!/usr/bin/env bash
# tests/run.sh - install what is missing, build, and run the whole test
# suite through ctest with every CUnit summary shown.  Exits non-zero when
# any test fails.  Warnings are errors when CI is set.
#
#   tests/run.sh              build/ (or BR_BUILD_DIR), optimised build
#   tests/run.sh --sanitize   build-asan/, AddressSanitizer + UBSan, debug
#
# The plain run then fuzzes the design-file loader for BR_FUZZ_SECONDS
# (default 60; 0 skips it) when clang can build a libFuzzer target, and
# says why when it cannot (tests/fuzz/run.sh).
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
# shellcheck source=.ci/setup.sh
source .ci/setup.sh

dir=${BR_BUILD_DIR:-build}
opts=()
fuzz=${BR_FUZZ_SECONDS:-60}
case "${1:-}" in
"") ;;
--sanitize)
    fuzz=0
    dir=${BR_BUILD_DIR:-build-asan}
    # -O1: sanitizers stay exact and the suite runs about three times
    # faster than at -O0, which keeps CI within its budget
    opts=(-DBR_SANITIZE=ON -DCMAKE_BUILD_TYPE=Debug "-DCMAKE_C_FLAGS_DEBUG=-g -O1")
    export ASAN_OPTIONS=detect_leaks=1:abort_on_error=0
    export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
    ;;
*)
    echo "usage: tests/run.sh [--sanitize]" >&2
    exit 2
    ;;
esac
if [ -n "${CI:-}" ]; then
    opts+=(-DBR_WERROR=ON)
fi

br_install_packages
br_install_slurm
br_build "$dir" "${opts[@]}"
if [ ! -x /usr/bin/chromium ]; then
    echo "note: /usr/bin/chromium not found: the browser test (browser_report) will be skipped;" \
        "install Debian's chromium package to run it (.ci/run does)" >&2
fi
# every processor: the suites are independent processes (each makes its
# own temporary files), and the sanitizer pass takes half the time
ctest --test-dir "$dir" --output-on-failure -V -j "$(nproc)"
if [ "$fuzz" != 0 ]; then
    status=0
    bash tests/fuzz/run.sh "$fuzz" || status=$?
    [ "$status" = 77 ] && status=0 # no libFuzzer: said so, not a failure
    exit "$status"
fi
