#!/usr/bin/env bash
# tests/lib/docs.sh BOOTRUNG MANPAGE COMPLETION - the man page and the bash
# completion cover the program as it is: the verbs are read from
# `bootrung --help` and each verb's options from `bootrung VERB --help`, so
# a verb or option added without them fails here.
#   - man page: an entry `.B VERB` for every verb, and every option of a
#     verb in a section (.SS) whose title names the verb or "Every verb";
#   - completion: every verb, and for each verb exactly the options its
#     help lists; and the completion function, run as bash would, completes
#     a verb, an option and a design file.
set -uo pipefail
bin=$1 man=$2 comp=$3
fail=0
say() { echo "FAIL: $*"; fail=1; }

verbs=$("$bin" --help | awk '/^verbs:/ {on = 1; next} on && NF == 0 {on = 0} on {print $1}')
[ -n "$verbs" ] || { echo "FAIL: no verbs in bootrung --help"; exit 1; }
options_of() { # VERB: its long options, one a line
    "$bin" "$1" --help | grep -oE '^  (-[a-z], )?--[a-z][a-z0-9-]*' | grep -oE -- '--[a-z0-9-]+'
}

# The man page's text of the option sections that apply to VERB.
man_sections() {
    awk -v verb="$1" '
        /^\.SS / { title = substr($0, 5); n = split(title, w, /[ ,]+/); on = 0
                   for (i = 1; i <= n; i++) if (w[i] == verb) on = 1
                   if (title == "Every verb") on = 1; next }
        /^\.S[HS] / { on = 0 }
        on { print }' "$man"
}

# shellcheck disable=SC1090
source "$comp" || { echo "FAIL: $comp does not load"; exit 1; }
nopts=0
for v in $verbs; do
    grep -qx "\.B $v" "$man" || say "man page: no entry for the verb $v"
    grep -qw -- "$v" <<<"$_bootrung_verbs" || say "completion: verb $v missing"
    mine=$(options_of "$v")
    [ -n "$mine" ] || say "$v --help lists no options"
    text=$(man_sections "$v")
    offered=$(_bootrung_options "$v" | tr ' ' '\n' | sort -u)
    for o in $mine; do
        nopts=$((nopts + 1))
        esc=${o//-/\\-}
        grep -qF -- "$esc" <<<"$text" || say "man page: $v's option $o is not in a section for $v"
        grep -qx -- "$o" <<<"$offered" || say "completion: $v's option $o missing"
    done
    for o in $offered; do
        grep -qx -- "$o" <<<"$mine" || say "completion offers $o for $v, which has no such option"
    done
done

# The completion function at work.
complete_words() { # WORD...: the last word is completed
    COMP_WORDS=("$@")
    COMP_CWORD=$((${#COMP_WORDS[@]} - 1))
    COMPREPLY=()
    _bootrung
    echo "${COMPREPLY[*]}"
}
[ "$(complete_words bootrung analy)" = analyze ] || say "completion: 'bootrung analy' gives '$(complete_words bootrung analy)'"
[ "$(complete_words bootrung check --st)" = --strict ] || say "completion: 'check --st' gives '$(complete_words bootrung check --st)'"
[ "$(complete_words bootrung analyze --startup-method e)" = envelope ] || say "completion: '--startup-method e' is not completed"
cd "$(dirname "${BASH_SOURCE[0]}")/../.." || exit 2
got=$(complete_words bootrung check examples/demo-3)
[ "$got" = examples/demo-3level.xml ] || say "completion: 'check examples/demo-3' gives '$got'"

[ $fail = 0 ] && echo "PASS: $(wc -w <<<"$verbs") verbs and $nopts verb options in the man page and the completion"
exit $fail
