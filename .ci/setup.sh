# shellcheck shell=bash
# .ci/setup.sh - the part examples/run.sh and tests/run.sh share: install the
# Debian packages the build needs (only those missing), then configure (only
# when needed) and build out of tree.  Sourced, not run; the caller has
# already done `set -euo pipefail` and changed to the repository root.

BR_PACKAGES=(cmake make gcc libc6-dev pkg-config libgsl-dev libxml2-dev libcunit1-dev python3)
# The browser test's headless Chromium, for CI only (.ci/run sets this).
if [ "${BR_WITH_BROWSER:-0}" = 1 ]; then
    BR_PACKAGES+=(chromium)
fi
# CI also runs valgrind and the libFuzzer target (clang's fuzzer runtime is
# in libclang-rt-NN-dev, which libclang-rt-dev pulls in).
if [ -n "${CI:-}" ]; then
    BR_PACKAGES+=(valgrind clang libclang-rt-dev)
fi

# Print the packages of BR_PACKAGES that dpkg does not know as installed.
br_missing_packages() {
    local p
    for p in "${BR_PACKAGES[@]}"; do
        dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'ok installed' || echo "$p"
    done
}

# Install what is missing with apt-get; sudo only when not root; no
# `apt-get update` and nothing else at all when everything is present.
br_install_packages() {
    if ! command -v dpkg-query >/dev/null 2>&1; then
        echo "note: not a Debian-like system; make sure these are installed: ${BR_PACKAGES[*]}" >&2
        return 0
    fi
    local missing
    mapfile -t missing < <(br_missing_packages)
    ((${#missing[@]} == 0)) && return 0
    local sudo=()
    if [ "$(id -u)" -ne 0 ]; then
        if ! command -v sudo >/dev/null 2>&1; then
            echo "error: need root or sudo to install: ${missing[*]}" >&2
            return 1
        fi
        sudo=(sudo)
    fi
    echo "installing: ${missing[*]}" >&2
    "${sudo[@]}" env DEBIAN_FRONTEND=noninteractive apt-get update -qq
    "${sudo[@]}" env DEBIAN_FRONTEND=noninteractive \
        apt-get install -y -qq --no-install-recommends "${missing[@]}"
}

# The Slurm test's daemons and clients, for CI only (.ci/run sets
# BR_WITH_SLURM): tests/slurm/run.sh builds a private one-node cluster from
# them.  Tried, not required: a machine where they do not install cleanly
# still runs everything else, and the test says it is skipped.
br_install_slurm() {
    [ "${BR_WITH_SLURM:-0}" = 1 ] || return 0
    local BR_PACKAGES=(slurmctld slurmd slurm-client munge)
    br_install_packages ||
        echo "note: the Slurm packages did not install: slurm_shards will be skipped" >&2
}

# True when every -DNAME=VALUE argument is already in the cache of dir.
br_cache_has() {
    local dir=$1 arg name value
    shift
    [ -f "$dir/CMakeCache.txt" ] || return 1
    for arg in "$@"; do
        [[ $arg == -D*=* ]] || continue
        name=${arg#-D}
        value=${name#*=}
        name=${name%%=*}
        grep -qxF -e "$name:BOOL=$value" -e "$name:STRING=$value" -e "$name:UNINITIALIZED=$value" \
            "$dir/CMakeCache.txt" || return 1
    done
}

# br_build DIR [-DNAME=VALUE ...]: configure DIR when it is new or an option
# differs from its cache, then build with two jobs.  With BR_QUIET=1 the
# tools' output goes to DIR/setup.log and is shown only when a step fails.
br_build() {
    local dir=$1
    shift
    local args=("$@")
    [[ " $* " == *" -DCMAKE_BUILD_TYPE="* ]] || args=(-DCMAKE_BUILD_TYPE=RelWithDebInfo "$@")
    local log=/dev/stdout
    if [ "${BR_QUIET:-0}" = 1 ]; then
        mkdir -p "$dir"
        log=$dir/setup.log
        : >"$log"
    fi
    if ! br_cache_has "$dir" "${args[@]}"; then
        cmake -S . -B "$dir" "${args[@]}" >>"$log" 2>&1 || br_build_failed "$log" configure
    fi
    cmake --build "$dir" --parallel 2 >>"$log" 2>&1 || br_build_failed "$log" build
}

br_build_failed() {
    [ "$1" != /dev/stdout ] && cat "$1" >&2
    echo "error: the $2 step failed" >&2
    exit 1
}
