#!/bin/sh
# The bash completion (completion/acidlot.bash) completes commands and
# each command's options from its --help. usage: tests/completion.sh ACIDLOT
set -u
acidlot=$1
here=$(cd "$(dirname "$0")/.." && pwd)
complete_line() { # the completions of the words given, the last being completed
	bash -c '
		. "$1/completion/acidlot.bash"
		shift
		COMP_WORDS=("$@")
		COMP_CWORD=$(($# - 1))
		_acidlot
		printf "%s\n" "${COMPREPLY[@]}"
	' sh "$here" "$@"
}
fail=0
check() { # expected, then the words
	want=$1
	shift
	got=$(complete_line "$@" | sort | tr '\n' ' ')
	[ "$got" = "$want" ] || { echo "completing '$*': got '$got', want '$want'"; fail=1; }
}
check "acids assay " "$acidlot" a
check "standardize " "$acidlot" sta
check "template " "$acidlot" tem
check "--spec --spec-column --spec-columns " "$acidlot" assay --sp
check "--decimal-comma --decimals --decision --delimiter --density-g-ml " "$acidlot" assay --de
check "--date-format " "$acidlot" assay --da
check "--record --register --repeatability-rsd --rerun " "$acidlot" standardize --re
[ $fail = 0 ] && echo "completion: commands and options as --help lists them"
exit $fail
