#!/usr/bin/env bash
# tests/lib/exports.sh LIBRARY SONAME HEADER... - the shared library
# exports the public API and nothing else:
#   - its soname is SONAME;
#   - every symbol it defines for the dynamic linker starts with br_;
#   - every function a public header declares is marked BR_API and is
#     exported (so a header and the library cannot drift apart).
set -uo pipefail
lib=$1 soname=$2
shift 2
fail=0
if ! command -v nm >/dev/null || ! command -v objdump >/dev/null; then
    echo "SKIP: nm or objdump (binutils) is not installed"
    exit 77
fi
got=$(objdump -p "$lib" | awk '$1 == "SONAME" {print $2}')
if [ "$got" != "$soname" ]; then
    echo "FAIL: soname '$got', expected '$soname'"
    fail=1
fi
exported=$(nm -D --defined-only "$lib" | awk '{print $NF}' | sort -u)
if [ -z "$exported" ]; then
    echo "FAIL: $lib exports nothing"
    exit 1
fi
stray=$(echo "$exported" | grep -v '^br_')
if [ -n "$stray" ]; then
    echo "FAIL: exported symbols outside the br_ namespace:"
    echo "$stray" | sed 's/^/  /'
    fail=1
fi
# Declarations: a line that starts a br_ function's prototype at file
# level (clang-format keeps the return type and the name on one line).
decls=$(cat "$@" | grep -E '^[A-Za-z_].*[ *]br_[A-Za-z0-9_]+\(' | grep -v '^typedef' | grep -v '^#')
unmarked=$(echo "$decls" | grep -v '^BR_API ')
if [ -n "$unmarked" ]; then
    echo "FAIL: public functions declared without BR_API (they would stay hidden):"
    echo "$unmarked" | sed 's/^/  /'
    fail=1
fi
names=$(echo "$decls" | sed -E 's/^[^(]*[ *](br_[A-Za-z0-9_]+)\(.*/\1/' | sort -u)
for n in $names; do
    if ! grep -qx "$n" <<<"$exported"; then
        echo "FAIL: $n is declared in the public header but not exported"
        fail=1
    fi
done
extra=$(comm -23 <(echo "$exported") <(echo "$names"))
if [ -n "$extra" ]; then
    echo "FAIL: exported but not declared in a public header:"
    echo "$extra" | sed 's/^/  /'
    fail=1
fi
[ $fail = 0 ] && echo "PASS: $(echo "$names" | wc -l) public functions exported, nothing else; soname $soname"
exit $fail
