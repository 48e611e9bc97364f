#!/usr/bin/env bash
# tests/format.sh - every C file of the project is as clang-format (with the
# repository's .clang-format) would write it.  Exit 77 (skipped) when
# clang-format or git is missing, saying why.
set -uo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.." || exit 2
if ! command -v clang-format >/dev/null 2>&1; then
    echo "SKIP: clang-format is not installed"
    exit 77
fi
if ! files=$(git ls-files '*.c' '*.h' 2>/dev/null) || [ -z "$files" ]; then
    echo "SKIP: not a git checkout, no file list"
    exit 77
fi
# shellcheck disable=SC2086
if ! clang-format --dry-run -Werror $files; then
    echo "FAIL: run clang-format -i on the files above"
    exit 1
fi
echo "PASS: $(echo "$files" | wc -l) files formatted"
