#!/usr/bin/env bash
# tests/browser/check_report.sh BOOTRUNG OUTDIR - open the demo report in
# headless Chromium: fail on any console message or script error, check
# that the page's plots are in the rendered DOM, and keep a screenshot
# (OUTDIR/demo-report.png) for people to look at.
#
# The page has no scripts, so anything on the console means something is
# wrong (a resource it tried to load, a parse problem).  Network names do
# not resolve in the browser, so a page that tried to fetch anything would
# log the failure.  Before the real page, the same check runs on a page
# that does log an error, so a check that no longer sees errors cannot
# pass silently.
#
# Exit status: 0 pass, 1 fail, 77 skipped (no browser: install Debian's
# `chromium` package; .ci/run does).
set -euo pipefail

browser=${BR_CHROMIUM:-/usr/bin/chromium}
if [ ! -x "$browser" ]; then
    echo "SKIPPED: $browser not found; install Debian's chromium package to run the browser test"
    exit 77
fi
[ $# -eq 2 ] || { echo "usage: $0 BOOTRUNG OUTDIR" >&2; exit 2; }
bin=$1
out=$(mkdir -p "$2" && cd "$2" && pwd)
src=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)

# browse PAGE PNG LOG [extra flags]: load the page once, headless.
browse() {
    local page=$1 png=$2 log=$3
    shift 3
    rm -f "$png"
    timeout 120 "$browser" --headless --disable-gpu --no-sandbox --no-first-run \
        --disable-background-networking --disable-component-update --disable-sync \
        --user-data-dir="$out/chromium-profile" --enable-logging=stderr --v=0 \
        --host-resolver-rules="MAP * ~NOTFOUND" --hide-scrollbars \
        --window-size=1280,3000 "$@" "file://$page" 2>"$log"
}

# Lines of the log that report the page's console or a failed load (the
# browser's own background noise, D-Bus and GPU warnings, is not the
# page's and is left alone).
console_errors() {
    grep -E ':CONSOLE|Uncaught|Failed to load' "$1" || true
}

# 1. The check itself: a page that logs an error must be caught.
probe=$out/console-probe.html
printf '<!DOCTYPE html>\n<html><body><p>probe</p><script>console.error("bootrung-probe")</script></body></html>\n' >"$probe"
browse "$probe" "$out/console-probe.png" "$out/console-probe.log" --screenshot="$out/console-probe.png" >/dev/null || true
if ! console_errors "$out/console-probe.log" | grep -q bootrung-probe; then
    echo "FAIL: the console check does not see a console error (see $out/console-probe.log)"
    exit 1
fi

# 2. The demo report.
page=$out/demo-report.html
png=$out/demo-report.png
log=$out/demo-report.log
"$bin" analyze "$src/examples/leg-7level.xml" --report "$page" >/dev/null || {
    echo "FAIL: bootrung analyze did not write the demo report"
    exit 1
}
# Nothing to fetch: no src/href attributes, no url() in the style.
if grep -Eq '(src|href)=|url\(' "$page"; then
    echo "FAIL: the report refers to an outside resource:"
    grep -Eo '(src|href)=[^ >]*|url\([^)]*\)' "$page" | head -5
    exit 1
fi
if ! browse "$page" "$png" "$log" --screenshot="$png" >/dev/null; then
    echo "FAIL: chromium did not finish (see $log)"
    exit 1
fi
errors=$(console_errors "$log")
if [ -n "$errors" ]; then
    echo "FAIL: console messages while showing the report:"
    echo "$errors"
    exit 1
fi
if [ ! -s "$png" ]; then
    echo "FAIL: no screenshot written"
    exit 1
fi

# 3. The plots made it into the rendered page.
dom=$out/demo-report.dom.html
browse "$page" "$out/unused.png" "$out/demo-report-dom.log" --dump-dom >"$dom" || true
svgs=$(grep -o '<svg' "$dom" | wc -l)
errors=$(console_errors "$out/demo-report-dom.log")
if [ "$svgs" -lt 4 ] || [ -n "$errors" ]; then
    echo "FAIL: rendered page has $svgs plots (want at least 4) ${errors:+and console messages: $errors}"
    exit 1
fi

# 4. What the page must show, as the browser built it: one group of rows
# per current direction, one floor per rail (the regulator's output plus
# its dropout), the displacement current as its own series, limit lines.
want() {
    local n
    n=$({ grep -o -- "$1" "$dom" || true; } | wc -l)
    if [ "$n" -lt "$2" ]; then
        echo "FAIL: the rendered page has $n of '$1' (want at least $2)"
        exit 1
    fi
}
want 'class="group" data-direction="step-down"' 3
want 'class="group" data-direction="step-up"' 3
want '6.3 V (regulator output + dropout)' 24
want 'data-series="disp_' 1
want 'data-limit="regulator-headroom"' 36
want 'data-limit="uvlo-falling"' 36
want 'data-limit="minimum-drive"' 36

echo "PASS: demo report shown without console messages, $svgs plots rendered"
echo "screenshot: $png ($(stat -c %s "$page") bytes of HTML)"
