#!/usr/bin/env bash
# tests/golden/update.sh [BUILD_DIR] - regenerate the golden outputs that
# test_cli_check compares against, after a deliberate change of the output.
# Review the diff (git diff tests/golden) before committing it.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/../.."
bin=${1:-build}/bootrung
[ -x "$bin" ] || { echo "no $bin: build first (tests/run.sh)" >&2; exit 2; }
"$bin" --help >tests/golden/help.txt
"$bin" check --help >tests/golden/check-help.txt
for verb in startup steady analyze window map corners yield pick supply netlist size explore merge; do
    "$bin" "$verb" --help >"tests/golden/$verb-help.txt"
done
for f in examples/*.xml; do
    name=$(basename "$f" .xml)
    "$bin" check "$f" >"tests/golden/check-$name.txt" || [ $? -eq 1 ]
done
echo "updated the golden files in tests/golden/"
