#!/usr/bin/env bash
# tests/lib/cli_includes.sh SRC_DIR CC CLIENTS INTERNAL - the command line
# is a client of the public API.  CLIENTS and INTERNAL are the two
# ;-separated lists of CMakeLists.txt (BR_CLI_CLIENTS, BR_CLI_INTERNAL:
# the sources not moved yet).  Checked here:
#  - every source of src/cli/ is in exactly one list;
#  - every client compiles with include/ and src/cli/ alone on the include
#    path (the build's rule), and that rule does refuse an internal header;
#  - every source still on the internal list does include an internal
#    header (one that no longer does belongs on the clients' list).
# What is still internal is printed; the list shrinks to empty.
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
for f in "$src"/src/cli/*.c; do
    b=$(basename "$f")
    if [ -z "${seen[$b]:-}" ]; then
        echo "FAIL: src/cli/$b is in neither list of CMakeLists.txt"; fail=1
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
for f in "${internal[@]}"; do
    [ -n "$f" ] || continue
    if ! grep -qE '^[[:space:]]*#[[:space:]]*include[[:space:]]*"(core|model|io|engine|analyses|report)/' "$f"; then
        echo "FAIL: $(basename "$f") includes no internal header: move it to BR_CLI_CLIENTS"
        fail=1
    fi
done
left=$(for f in "${internal[@]}"; do [ -n "$f" ] && basename "$f"; done | tr '\n' ' ')
echo "clients of the public API: ${#clients[@]}; still internal: ${left:-none}"
[ $fail = 0 ] && echo PASS
exit $fail
