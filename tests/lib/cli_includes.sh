#!/usr/bin/env bash
# tests/lib/cli_includes.sh SRC_DIR - the command line's verbs that are
# clients of the public API include nothing of the library but its public
# headers (include/bootrung/*.h) and the command line's own (src/cli/*.h).
#
# The command line is being moved onto the public API one verb at a time;
# CLIENTS lists the verbs moved so far.  The script also names the files
# of src/cli/ that still include internal headers, so what remains shows.
set -uo pipefail
src=$1
CLIENTS=(src/cli/cmd_netlist.c src/cli/cmd_supply.c src/cli/cmd_pick.c src/cli/cmd_size.c src/cli/cmd_explore.c)
fail=0
for f in "${CLIENTS[@]}"; do
    # the public headers, and the command line's own (src/cli/*.h)
    bad=$(grep -E '^[[:space:]]*#[[:space:]]*include[[:space:]]*"' "$src/$f" \
        | grep -vE '"bootrung/[A-Za-z0-9_]+\.h"' \
        | while IFS= read -r line; do
            h=$(sed -E 's/.*"([^"]*)".*/\1/' <<<"$line")
            [ -f "$src/src/cli/$h" ] && [[ $h != */* ]] || echo "$line"
        done)
    if [ -n "$bad" ]; then
        echo "FAIL: $f includes more than the public headers and cli.h:"
        echo "$bad" | sed 's/^/  /'
        fail=1
    fi
done
left=$(grep -lE '#[[:space:]]*include[[:space:]]*"(core|model|io|engine|analyses|report)/' \
    "$src"/src/cli/*.c "$src"/src/cli/*.h | sed "s|^$src/||" | tr '\n' ' ')
echo "still on internal headers: ${left:-none}"
[ $fail = 0 ] && echo "PASS: ${#CLIENTS[@]} verb(s) use the public headers only"
exit $fail
