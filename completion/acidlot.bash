# bash completion for acidlot: commands, and each command's options as
# its own --help lists them (so the two never disagree), then files.
# SPDX-License-Identifier: GPL-3.0-or-later
_acidlot()
{
	local cur=${COMP_WORDS[COMP_CWORD]} cmd=${COMP_WORDS[1]} words
	if [ "$COMP_CWORD" -eq 1 ]; then
		words=$("${COMP_WORDS[0]}" --help 2>/dev/null |
			sed -n 's/^  \([a-z][a-z]*\) .*/\1/p' | grep -v '^acidlot$')
		COMPREPLY=($(compgen -W "$words --help --version" -- "$cur"))
	elif [[ $cur == -* ]]; then
		words=$("${COMP_WORDS[0]}" "$cmd" --help 2>/dev/null |
			grep -o -- '--[a-z][a-z0-9-]*' | sort -u)
		COMPREPLY=($(compgen -W "$words" -- "$cur"))
	else
		COMPREPLY=($(compgen -f -- "$cur"))
	fi
}
complete -F _acidlot acidlot
