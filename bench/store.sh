#!/bin/sh
# acidlot bench: the results store (issue 23). Median of 3 runs each:
#   the assay of ROWS rows (default 1e6) with --store into a fresh store,
#   against the same assay without it (the issue asks for at most 1.5 x);
#   the peer: the sqlite3 shell's .import of the same run's replicates
#   file into a fresh database (rows in, no key, no hash: what any
#   program pays SQLite to hold these rows);
#   trend over 100,000 stored results (the issue asks for under 1 s).
# usage: bench/store.sh ACIDLOT GEN [ROWS]
set -u
acidlot=$1
gen=$2
rows=${3:-1000000}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

median() {
	for k in 1 2 3; do
		rm -f "$work"/s.db*
		s=$(date +%s.%N)
		"$@" >/dev/null 2>&1
		e=$(date +%s.%N)
		echo "$e - $s" | bc -l
	done | sort -n | sed -n 2p
}

"$gen" "$rows" >"$work/t.csv"
t_plain=$(median "$acidlot" assay "$work/t.csv" -o "$work/r.csv")
t_store=$(median "$acidlot" assay "$work/t.csv" -o "$work/r.csv" --store "$work/s.db")
"$acidlot" assay "$work/t.csv" -o "$work/r.csv" -r "$work/reps.csv" >/dev/null 2>&1
t_import=$(median sqlite3 "$work/s.db" ".import --csv $work/reps.csv replicates")
printf 'assay of %d rows, -o:            %.3f s\n' "$rows" "$t_plain"
printf 'the same with --store:           %.3f s\n' "$t_store"
printf 'with / without the store:        %.2f (target <= 1.5)\n' \
	"$(echo "$t_store / $t_plain" | bc -l)"
printf 'peer: sqlite3 .import of its %d replicates: %.3f s\n' \
	"$(($(wc -l <"$work/reps.csv") - 1))" "$t_import"
printf 'the store'"'"'s cost / the peer'"'"'s:        %.2f\n' \
	"$(echo "($t_store - $t_plain) / $t_import" | bc -l)"
# about 100,000 results of one product: gen spreads 500,000 results of
# 3 rows over 5 products
"$gen" 1500000 500000 >"$work/p.csv"
"$acidlot" assay "$work/p.csv" -o "$work/p-r.csv" --store "$work/trend.db" \
	>/dev/null 2>&1
product=$(sed -n 2p "$work/p.csv" | cut -d, -f1)
n=$(sqlite3 "$work/trend.db" "SELECT count(*) FROM results WHERE product = '$product'" 2>/dev/null)
s=$(date +%s.%N)
"$acidlot" trend --store "$work/trend.db" --product "$product" >/dev/null 2>&1
e=$(date +%s.%N)
printf 'trend over %s stored results:   %.3f s (target < 1)\n' "$n" \
	"$(echo "$e - $s" | bc -l)"
