#!/bin/sh
# The bad-input corpus: every file in files/ gives the exit status and a
# stderr line matching the pattern listed in expect.tsv; and in --rejects
# mode no file crashes and the row accounting adds up:
# "N rows read = A used + R rejected" with N = A + R and R rows in the
# rejects file.
# usage: run.sh ACIDLOT
set -u
bin=$1
here=$(cd "$(dirname "$0")" && pwd)
wrap=$here/../wrap.sh
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
tab=$(printf '\t')
pass=0
fail=0
while IFS="$tab" read -r file want pattern opts; do
	case "$file" in '#'*|'') continue ;; esac
	eval "set -- $opts"
	rm -f "$work"/*
	(cd "$here/files" && sh "$wrap" "$bin" assay "$file" "$@" -o "$work/out.csv") \
		>/dev/null 2>"$work/err"
	rc=$?
	ok=1
	if [ "$rc" != "$want" ]; then
		echo "$file: exit status $rc, expected $want"
		ok=0
	fi
	if ! grep -Eq -- "$pattern" "$work/err"; then
		echo "$file: no stderr line matches: $pattern"
		ok=0
	fi
	if [ "$rc" = 2 ] && [ -e "$work/out.csv" ]; then
		echo "$file: a report was written despite the error"
		ok=0
	fi
	# keep-going mode
	(cd "$here/files" && sh "$wrap" "$bin" assay "$file" "$@" --rejects "$work/rej.csv" \
		-o "$work/out2.csv") >/dev/null 2>"$work/err2"
	rc2=$?
	if [ "$rc2" -gt 2 ]; then
		echo "$file: --rejects run exited $rc2"
		ok=0
	fi
	line=$(grep -E 'rows read = [0-9]+ used \+ [0-9]+ rejected' "$work/err2" | tail -1)
	if [ -n "$line" ]; then
		n=$(echo "$line" | sed -E 's/.* ([0-9]+) rows read = ([0-9]+) used \+ ([0-9]+) rejected.*/\1 \2 \3/')
		set -- $n
		rows=$(grep -c "^$file," "$work/rej.csv" 2>/dev/null)
		if [ $(($2 + $3)) -ne "$1" ] || [ "${rows:-0}" -ne "$3" ]; then
			echo "$file: accounting: read $1, used $2, rejected $3, rejects file $rows rows"
			ok=0
		fi
	elif [ "$rc2" != 2 ]; then
		echo "$file: --rejects run printed no summary"
		ok=0
	fi
	if [ $ok = 1 ]; then
		pass=$((pass + 1))
	else
		fail=$((fail + 1))
		sed 's/^/    /' "$work/err" | head -5
	fi
done <"$here/expect.tsv"
echo "corpus: $pass passed, $fail failed"
[ $fail -eq 0 ]
