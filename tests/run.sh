#!/usr/bin/env bash
# tests/run.sh - install what is missing, build, and run the whole test
# suite through ctest with every CUnit summary shown.  Exits non-zero when
# any test fails.  Warnings are errors when CI is set.
#
#   tests/run.sh              build/ (or BR_BUILD_DIR), optimised build
#   tests/run.sh --sanitize   build-asan/, AddressSanitizer + UBSan, debug
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
# shellcheck source=.ci/setup.sh
source .ci/setup.sh

dir=${BR_BUILD_DIR:-build}
opts=()
case "${1:-}" in
"") ;;
--sanitize)
    dir=${BR_BUILD_DIR:-build-asan}
    opts=(-DBR_SANITIZE=ON -DCMAKE_BUILD_TYPE=Debug)
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
br_build "$dir" "${opts[@]}"
if [ ! -x /usr/bin/chromium ]; then
    echo "note: /usr/bin/chromium not found: the browser test (browser_report) will be skipped;" \
        "install Debian's chromium package to run it (.ci/run does)" >&2
fi
ctest --test-dir "$dir" --output-on-failure -V
