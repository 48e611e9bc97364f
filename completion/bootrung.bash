# bash completion for bootrung: verbs, each verb's options, and file names
# (design and catalog files: *.xml; output files: any name).
# Installed to share/bash-completion/completions/bootrung; tests/lib/docs.sh
# checks that every verb and option the program's help lists is here.

_bootrung_verbs="check startup steady analyze window map corners yield pick supply netlist size explore merge help"

# The options of one verb (--help and --quiet are everybody's).
_bootrung_options()
{
    local common="--quiet --help"
    case $1 in
    check) echo "--strict --report $common" ;;
    startup) echo "--xml --csv --report --plot --solver-limit --startup-method $common" ;;
    steady) echo "--xml --csv --report --plot --solver-limit $common" ;;
    analyze | analyse) echo "--xml --csv --report --pack --catalog --solver-limit --startup-method $common" ;;
    window) echo "--xml --report --plot --fmin --fmax --startup --startup-method $common" ;;
    map) echo "--duty --freq --csv --svg --plot --report --threads --shard --shard-file $common" ;;
    corners) echo "--xml --report --exhaustive --no-startup --solver-limit --startup-method --threads $common" ;;
    yield) echo "--samples --seed --startup --min-yield --xml --csv --report --plot --solver-limit --startup-method --threads --shard --shard-file $common" ;;
    pick) echo "--catalog --top --min-margin --no-startup --no-per-rail --xml --report --solver-limit --startup-method --threads $common" ;;
    supply) echo "--xml --report --threads --startup-method $common" ;;
    netlist) echo "--out --current --periods $common" ;;
    size) echo "--catalog --target --no-links --supply --write-design --threads --solver-limit --startup-method $common" ;;
    explore) echo "--catalog --parts --vin --levels --fsw --load-current --derating --min-margin --max-startup --max-cost --scale-caps --corners --csv --svg --designs --yield --seed --threads --shard --shard-file $common" ;;
    merge) echo "--help" ;;
    esac
}

_bootrung()
{
    local cur prev verb="" i
    cur=${COMP_WORDS[COMP_CWORD]}
    prev=${COMP_WORDS[COMP_CWORD - 1]}
    COMPREPLY=()
    for ((i = 1; i < COMP_CWORD; i++)); do
        case ${COMP_WORDS[i]} in
        -*) ;;
        *) verb=${COMP_WORDS[i]}; break ;;
        esac
    done
    if [[ -z $verb ]]; then
        COMPREPLY=($(compgen -W "$_bootrung_verbs --help --version" -- "$cur"))
        return
    fi
    if [[ $verb == help ]]; then
        ((COMP_CWORD == i + 1)) && COMPREPLY=($(compgen -W "${_bootrung_verbs% help}" -- "$cur"))
        return
    fi
    case $prev in
    --xml | --csv | --report | --plot | --svg | --out | --shard-file | --write-design)
        compopt -o filenames 2>/dev/null
        COMPREPLY=($(compgen -f -- "$cur"))
        return ;;
    --pack | --designs)
        compopt -o dirnames 2>/dev/null
        COMPREPLY=($(compgen -d -- "$cur"))
        return ;;
    --catalog | --parts)
        compopt -o filenames 2>/dev/null
        COMPREPLY=($(compgen -f -X '!*.xml' -- "$cur") $(compgen -d -- "$cur"))
        return ;;
    --startup-method)
        COMPREPLY=($(compgen -W "envelope periods" -- "$cur"))
        return ;;
    --current)
        COMPREPLY=($(compgen -W "step-down step-up none" -- "$cur"))
        return ;;
    --solver-limit | --threads | --fmin | --fmax | --duty | --freq | --exhaustive | \
        --samples | --seed | --min-yield | --top | --min-margin | --periods | --shard | --target | \
        --vin | --levels | --fsw | --load-current | --derating | --max-startup | --max-cost | --yield)
        return ;; # a number or a range: nothing to offer
    esac
    if [[ $cur == -* ]]; then
        COMPREPLY=($(compgen -W "$(_bootrung_options "$verb")" -- "$cur"))
    elif [[ $verb == merge ]]; then
        compopt -o filenames 2>/dev/null
        COMPREPLY=($(compgen -f -- "$cur")) # shard files: any name
    else
        compopt -o filenames 2>/dev/null
        COMPREPLY=($(compgen -f -X '!*.xml' -- "$cur") $(compgen -d -- "$cur"))
    fi
}
complete -F _bootrung bootrung
