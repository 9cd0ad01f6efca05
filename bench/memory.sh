#!/bin/sh
# acidlot bench: memory and layout checks on generated files streamed
# through a pipe (no file on disk), measured with GNU time:
#   1e7 rows in 1,000 groups                 peak RSS < 32 MiB
#   1e7 rows in 3.33 million groups          peak RSS < 16 MiB + 120 B/group
#   1e6 rows, adjacent and interleaved       the same report (report_id
#                                            aside: it hashes the input)
# usage: bench/memory.sh ACIDLOT GEN [ROWS]   (ROWS default 10000000)
# Exit 0 when all hold, 1 otherwise, 77 (skipped) under valgrind or a
# sanitizer build, whose memory says nothing about ours.
set -u
acidlot=$1
gen=$2
rows=${3:-10000000}
[ -n "${ACIDLOT_VALGRIND:-}" ] && { echo "skipped under valgrind"; exit 77; }
[ -x /usr/bin/time ] || { echo "needs /usr/bin/time (Debian package time)"; exit 2; }
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
printf 'product,acid,unit,min,max,max_rsd_pct,min_n\n' >"$work/spec.csv"
for p in 1 2 3 4 5; do printf 'P%s,citric,g/100g,0.8,1.2,1.5,2\n' "$p" >>"$work/spec.csv"; done
fail=0

# peak KiB of `gen ARGS | acidlot assay -`
peak() {
	"$gen" "$@" | /usr/bin/time -f "%M" -o "$work/kib" \
		"$acidlot" assay - --spec "$work/spec.csv" -o "$work/out.csv" \
		2>"$work/err" >/dev/null
	rc=$?
	if [ $rc -gt 1 ]; then
		echo "acidlot failed ($rc):"
		cat "$work/err"
		echo 999999999
		return
	fi
	tail -n 1 "$work/kib"
}

check() {
	name=$1 kib=$2 limit=$3
	if [ "$kib" -lt "$limit" ]; then
		echo "ok   $name: peak $((kib / 1024)) MiB ($kib KiB), limit $((limit / 1024)) MiB"
	else
		echo "FAIL $name: peak $((kib / 1024)) MiB ($kib KiB), limit $((limit / 1024)) MiB"
		fail=1
	fi
}

kib=$(peak "$rows" 1000)
check "$rows rows in 1000 groups" "$kib" $((32 * 1024))
groups=$(((rows + 2) / 3))
kib=$(peak "$rows")
check "$rows rows in $groups groups" "$kib" $((16 * 1024 + groups * 120 / 1024))

small=$((rows / 10))
"$gen" "$small" >"$work/adjacent.csv"
"$gen" "$small" --interleaved >"$work/interleaved.csv"
for layout in adjacent interleaved; do
	SOURCE_DATE_EPOCH=1796169600 "$acidlot" assay "$work/$layout.csv" \
		--spec "$work/spec.csv" -o "$work/$layout.report.csv" \
		2>"$work/$layout.err" >/dev/null
	sed 's/,R[0-9a-f]*-[0-9]*$//' "$work/$layout.report.csv" >"$work/$layout.cut"
done
if cmp -s "$work/adjacent.cut" "$work/interleaved.cut" &&
   cmp -s "$work/adjacent.err" "$work/interleaved.err"; then
	echo "ok   $small rows adjacent and interleaved: same $(($(wc -l <"$work/adjacent.cut") - 1)) results, same messages"
else
	echo "FAIL $small rows adjacent and interleaved give different reports"
	fail=1
fi
exit $fail
