#!/bin/sh
# acidlot bench: lookups in large tables (issue 18 C17). A 200,000-row
# specification and a 200,000-row titrant register, and 600 titrations
# whose products and lots are spread over both, against the peer that
# reads the same two files whole: sort(1) keyed on the first column. The
# ratio is acidlot's time over sort's, both measured here in one run.
# usage: bench/tables.sh ACIDLOT [ROWS]   (ROWS default 200000)
set -u
acidlot=$1
rows=${2:-200000}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
awk -v n="$rows" 'BEGIN { print "product,acid,unit,min,max";
	for (i = 0; i < n; i++) printf "P%d,citric,g/100g,0.5,1.5\n", i }' >"$work/spec.csv"
awk -v n="$rows" 'BEGIN { print "titrant_lot,standard,concentration_mol_l,u_mol_l,n,rsd_pct,standardised_on,valid_until,valid";
	for (i = 0; i < n; i++) printf "N%d,KHP,0.1,0.0001,3,0.05,2026-11-20,2026-12-20,yes\n", i }' >"$work/reg.csv"
awk -v n="$rows" 'BEGIN { print "product,sample,mass_g,titrant_ml,titrant_lot,date";
	for (i = 0; i < n; i += n / 200) for (r = 0; r < 3; r++)
		printf "P%d,S,10,14.%d,N%d,2026-12-01\n", i, r, n - 1 - i }' >"$work/t.csv"
# best of three, seconds
best() {
	b=
	for k in 1 2 3; do
		/usr/bin/time -f %e -o "$work/s" "$@" >/dev/null 2>&1
		s=$(cat "$work/s")
		if [ -z "$b" ] || [ "$(echo "$s < $b" | bc)" = 1 ]; then b=$s; fi
	done
	echo "$b"
}
a=$(best "$acidlot" assay "$work/t.csv" -s "$work/spec.csv" --titrants "$work/reg.csv" -o "$work/r.csv")
p=$(best sh -c "sort -t, -k1,1 '$work/spec.csv' >/dev/null; sort -t, -k1,1 '$work/reg.csv' >/dev/null")
echo "tables of $rows rows: acidlot $a s, sort of both $p s, ratio $(echo "scale=2; $a / ($p + 0.001)" | bc)"
