#!/usr/bin/env bash
# examples/run.sh - install what is missing, build bootrung if needed, and
# run it on the demo design (a 7-level flying-capacitor leg on an 1100 V
# bus).  Works from any directory; quick when already built.  The build
# directory is build/ (override with BR_BUILD_DIR).
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
# shellcheck source=.ci/setup.sh
source .ci/setup.sh

dir=${BR_BUILD_DIR:-build}
br_install_packages
BR_QUIET=1 br_build "$dir"
echo "\$ $dir/bootrung analyze examples/leg-7level.xml"
"$dir/bootrung" analyze examples/leg-7level.xml
