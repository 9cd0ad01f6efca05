#!/bin/sh
# acidlot bench: one speed mechanism, side by side. Runs the same assay
# with two builds in alternation (WITH, WITHOUT, WITH, ...), PAIRS pairs,
# and prints each build's median wall time and the median of the paired
# ratios (time without / time with: above 1, the mechanism helps). The
# outputs of the two builds are compared byte for byte first.
# usage: [ABLATE_OUTPUT=1] bench/ablate.sh WITH_BIN WITHOUT_BIN INPUT PAIRS
#        [assay options]
set -u
export SOURCE_DATE_EPOCH=${SOURCE_DATE_EPOCH:-1767225600}
abs() { case $1 in /*) echo "$1" ;; *) echo "$PWD/$1" ;; esac; }
with=$(abs "$1") without=$(abs "$2") input=$(abs "$3") pairs=$4
shift 4
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
# the same output name on both sides: the run's identifier depends on it
mkdir "$work/a" "$work/b"
(cd "$work/a" && "$with" assay "$input" "$@" -o out.csv >/dev/null 2>&1)
(cd "$work/b" && "$without" assay "$input" "$@" -o out.csv >/dev/null 2>&1)
cmp -s "$work/a/out.csv" "$work/b/out.csv" || { echo "outputs differ"; exit 1; }
# ABLATE_OUTPUT=1: the timed runs write the report and its record
# (-o, with hashes and fsync) instead of standard output
out=
[ "${ABLATE_OUTPUT:-0}" = 1 ] && out="-o out.csv"
i=0
: >"$work/pairs"
while [ "$i" -lt "$pairs" ]; do
	a=$(cd "$work/a" && /usr/bin/time -q -f %e -o "$work/t" "$with" assay "$input" "$@" $out >/dev/null 2>&1; cat "$work/t")
	b=$(cd "$work/b" && /usr/bin/time -q -f %e -o "$work/t" "$without" assay "$input" "$@" $out >/dev/null 2>&1; cat "$work/t")
	echo "$a $b" >>"$work/pairs"
	i=$((i + 1))
done
awk '
function median(v, n,   i, j, t) {
	for (i = 2; i <= n; i++) { t = v[i]; for (j = i - 1; j >= 1 && v[j] > t; j--) v[j + 1] = v[j]; v[j + 1] = t }
	return n % 2 ? v[(n + 1) / 2] : (v[n / 2] + v[n / 2 + 1]) / 2
}
{ a[NR] = $1; b[NR] = $2; r[NR] = ($1 > 0 ? $2 / $1 : 1) }
END { printf "with %.3f s  without %.3f s  paired ratio %.2f (%d pairs)\n", median(a, NR), median(b, NR), median(r, NR), NR }
' "$work/pairs"
