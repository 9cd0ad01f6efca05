#!/bin/sh
# acidlot bench: titration curves (issue 22). Times, median of 3 runs:
#   endpoint on a curve file of about 100 MB (10,000 curves), and assay
#   on a volume file of the same size (bench/gen.c): the issue asks for
#   at most 2 x; assay reading the same curve file directly; endpoint
#   in each mode on one curve of 10,000 readings.
# usage: bench/curves.sh ACIDLOT          (prints the figures; exit 0)
set -u
acidlot=$1
here=$(cd "$(dirname "$0")" && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cc -O2 -o "$work/gen_curves" "$here/gen_curves.c" -lm || exit 2
cc -O2 -o "$work/gen" "$here/gen.c" || exit 2

# the median wall time of 3 runs of a command, in seconds
median() {
	for k in 1 2 3; do
		s=$(date +%s.%N)
		"$@" >/dev/null 2>&1
		e=$(date +%s.%N)
		echo "$e - $s" | bc -l
	done | sort -n | sed -n 2p
}

"$work/gen_curves" 10000 212 >"$work/curves.csv"
size=$(wc -c <"$work/curves.csv")
# a volume file of about the same size: gen's bytes per row from 1e5 rows
per=$("$work/gen" 100000 | wc -c)
rows=$((size * 100000 / per))
"$work/gen" "$rows" >"$work/volumes.csv"
vsize=$(wc -c <"$work/volumes.csv")
t_end=$(median "$acidlot" endpoint "$work/curves.csv" -o "$work/ep.csv")
t_direct=$(median "$acidlot" assay "$work/curves.csv" --format csv)
t_vol=$(median "$acidlot" assay "$work/volumes.csv" --format csv)
printf 'curve file   %d bytes, 10000 curves of 212 readings\n' "$size"
printf 'volume file  %d bytes, %d rows\n' "$vsize" "$rows"
printf 'endpoint on the curve file       %.3f s\n' "$t_end"
printf 'assay on the curve file          %.3f s\n' "$t_direct"
printf 'assay on the volume file         %.3f s\n' "$t_vol"
printf 'endpoint / assay of volumes      %.2f (target <= 2)\n' \
	"$(echo "$t_end / $t_vol" | bc -l)"
"$work/gen_curves" 1 10000 >"$work/one.csv"
for mode in fixed inflection gran; do
	printf 'one curve of 10000 readings, %-10s %.3f s\n' "$mode" \
		"$(median "$acidlot" endpoint "$work/one.csv" --mode "$mode")"
done
