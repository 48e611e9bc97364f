#!/usr/bin/env bash
# tests/lib/cli_includes.sh SRC_DIR CC CLIENTS [INTERNAL] - the command
# line is a client of the public API.  CLIENTS is CMakeLists.txt's
# ;-separated BR_CLI_CLIENTS; INTERNAL is BR_CLI_INTERNAL, the list of
# sources that once still saw the library's internals, which must stay
# empty (undefined).  Checked here:
#  - every source of src/cli/ is in CLIENTS exactly once, none in INTERNAL;
#  - every client compiles with include/ and src/cli/ alone on the include
#    path (the build's rule), and that rule does refuse an internal header;
#  - no source or header of src/cli/ includes an internal header, and the
#    internal list's forced include (src/cli/internal.h) is gone.
set -uo pipefail
src=$1 cc=$2
IFS=';' read -r -a clients <<<"$3"
IFS=';' read -r -a internal <<<"${4:-}"
fail=0
flags=(-std=c11 -D_POSIX_C_SOURCE=200809L -DBR_VERSION='"0"' -fsyntax-only
       -I "$src/include" -I "$src/src/cli")
declare -A seen
for f in "${clients[@]}" "${internal[@]}"; do
    [ -n "$f" ] || continue
    b=$(basename "$f")
    if [ -n "${seen[$b]:-}" ]; then echo "FAIL: $b is in both lists (or twice)"; fail=1; fi
    seen[$b]=1
done
for f in "${internal[@]}"; do
    [ -n "$f" ] || continue
    echo "FAIL: $(basename "$f") is on BR_CLI_INTERNAL: the command line uses the public API only"
    fail=1
done
if [ -e "$src/src/cli/internal.h" ]; then
    echo "FAIL: src/cli/internal.h is back: the command line uses the public API only"; fail=1
fi
for f in "$src"/src/cli/*.c; do
    b=$(basename "$f")
    if [ -z "${seen[$b]:-}" ]; then
        echo "FAIL: src/cli/$b is not in BR_CLI_CLIENTS (CMakeLists.txt)"; fail=1
    fi
done
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
printf '#include "cli.h"\n#include "core/error.h"\n' >"$tmp/probe.c"
if "$cc" "${flags[@]}" "$tmp/probe.c" 2>/dev/null; then
    echo "FAIL: an internal header compiles under the clients' include path"; fail=1
fi
for f in "${clients[@]}"; do
    [ -n "$f" ] || continue
    if ! "$cc" "${flags[@]}" "$f" 2>"$tmp/err"; then
        echo "FAIL: $(basename "$f") needs more than the public headers:"
        sed 's/^/  /' "$tmp/err" | head -5; fail=1
    fi
done
for f in "$src"/src/cli/*.[ch]; do
    if grep -qE '^[[:space:]]*#[[:space:]]*include[[:space:]]*"(core|model|io|engine|analyses|report|api)/' "$f"; then
        echo "FAIL: $(basename "$f") includes an internal header"; fail=1
    fi
done
echo "clients of the public API: ${#clients[@]}"
[ $fail = 0 ] && echo PASS
exit $fail
