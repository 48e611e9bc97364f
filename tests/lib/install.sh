#!/usr/bin/env bash
# tests/lib/install.sh BUILD_DIR VERSION [CFLAGS] - install the build and
# build programs against the installed copy, as a user would:
#   1. `cmake --install` into a DESTDIR staging tree (prefix /opt/bootrung):
#      every file in its place; the consumer built with pkg-config alone
#      from the staged bootrung.pc (which must find its own prefix), run
#      against the staged shared library;
#   2. `cmake --install --prefix` into a second tree: the consumer built by
#      a CMake project with find_package(bootrung), once against the shared
#      and once against the static library, both run.
# Each run loads examples/demo-3level.xml through the public API and must
# see tests/bad/bad-version.xml refused.  CFLAGS (the sanitizers' flags in
# a sanitizer build) go to every compile and link.
set -uo pipefail
build=$(cd "$1" && pwd) version=$2 cflags=${3:-}
src=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)
for tool in pkg-config cc cmake; do
    if ! command -v $tool >/dev/null; then
        echo "SKIP: $tool is not installed"
        exit 77
    fi
done
tmp=$(mktemp -d "$build/install-check.XXXXXX")
trap "[ -n \"${BR_KEEP:-}\" ] || rm -rf \"$tmp\"" EXIT
fail=0
good=$src/examples/demo-3level.xml bad=$src/tests/bad/bad-version.xml

need() { # FILE...: each exists
    for f in "$@"; do
        [ -e "$f" ] || { echo "FAIL: not installed: ${f#"$tmp"/}"; fail=1; }
    done
}
run() { # LABEL PROGRAM: run the consumer, expect exit 0 and its lines
    local out
    out=$("${@:2}" "$version" "$good" "$bad" 2>&1)
    local rc=$?
    if [ $rc -ne 0 ] || ! grep -q "^loaded .* built its chain" <<<"$out" \
        || ! grep -q "^start-up time [0-9.e-]* s over [0-9]* rails" <<<"$out" \
        || ! grep -q "^refused: .*bad-version.xml" <<<"$out"; then
        echo "FAIL: $1 (status $rc):"
        sed 's/^/  /' <<<"$out"
        fail=1
    else
        echo "ok: $1"
    fi
}

# 1. DESTDIR staging, pkg-config
stage=$tmp/stage/opt/bootrung
DESTDIR=$tmp/stage cmake --install "$build" --prefix /opt/bootrung >"$tmp/install1.log" 2>&1 \
    || { echo "FAIL: cmake --install (DESTDIR)"; cat "$tmp/install1.log"; exit 1; }
pc=$(find "$stage" -name bootrung.pc | head -1)
libdir=$(dirname "$(dirname "$pc")")
need "$stage/bin/bootrung" "$stage/include/bootrung/bootrung.h" "$pc" \
    "$libdir/libbootrung.a" "$libdir/libbootrung.so" \
    "$libdir/cmake/bootrung/bootrungConfig.cmake" \
    "$libdir/cmake/bootrung/bootrungConfigVersion.cmake" \
    "$stage/share/man/man1/bootrung.1" "$stage/share/bash-completion/completions/bootrung"
[ -n "$pc" ] || exit 1
export PKG_CONFIG_PATH=$libdir/pkgconfig
got=$(pkg-config --modversion bootrung)
[ "$got" = "$version" ] || { echo "FAIL: pkg-config says version '$got', expected $version"; fail=1; }
inc=$(pkg-config --variable=includedir bootrung)
[ "$(cd "$inc" 2>/dev/null && pwd)" = "$stage/include" ] \
    || { echo "FAIL: bootrung.pc's includedir '$inc' is not the staged $stage/include"; fail=1; }
# shellcheck disable=SC2046,SC2086
if cc -std=c11 -Wall -Werror $cflags -o "$tmp/consumer_pc" "$src/tests/lib/consumer/consumer.c" \
    $(pkg-config --cflags --libs bootrung) 2>"$tmp/cc.log"; then
    run "pkg-config build, shared library" env LD_LIBRARY_PATH="$libdir" "$tmp/consumer_pc"
    # (grep -q on a pipe would stop its writer early: pipefail would see that)
    if ! grep -q "libbootrung.so.* => $libdir/" <<<"$(LD_LIBRARY_PATH=$libdir ldd "$tmp/consumer_pc")"; then
        echo "FAIL: the consumer does not load the staged libbootrung.so"
        fail=1
    fi
else
    echo "FAIL: building against the staged copy with pkg-config:"
    cat "$tmp/cc.log"
    fail=1
fi
grep -q "^bootrung $version\$" <<<"$("$stage/bin/bootrung" --version)" \
    || { echo "FAIL: the installed program does not say version $version"; fail=1; }

# 2. --prefix, find_package
prefix=$tmp/prefix
cmake --install "$build" --prefix "$prefix" >"$tmp/install2.log" 2>&1 \
    || { echo "FAIL: cmake --install --prefix"; cat "$tmp/install2.log"; exit 1; }
if cmake -S "$src/tests/lib/consumer" -B "$tmp/cb" -DCMAKE_PREFIX_PATH="$prefix" \
    -DBR_EXPECT_VERSION="$version" -DCMAKE_C_FLAGS="$cflags" \
    -DCMAKE_EXE_LINKER_FLAGS="$cflags" >"$tmp/cb.log" 2>&1 \
    && cmake --build "$tmp/cb" >>"$tmp/cb.log" 2>&1; then
    run "find_package build, shared library" "$tmp/cb/consumer_shared"
    run "find_package build, static library" "$tmp/cb/consumer_static"
    if grep -q libbootrung <<<"$(ldd "$tmp/cb/consumer_static")"; then
        echo "FAIL: the static consumer loads libbootrung.so"
        fail=1
    fi
else
    echo "FAIL: configuring or building the find_package project:"
    cat "$tmp/cb.log"
    fail=1
fi
[ $fail = 0 ] && echo "PASS: installed, and built against the installed copy three ways"
exit $fail
