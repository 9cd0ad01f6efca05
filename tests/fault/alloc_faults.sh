#!/bin/sh
# Makes every allocation of a whole run fail in turn (ACIDLOT_FAIL_ALLOC_AT):
# each time the tool must exit 2 with "out of memory", leave no output file
# behind, and (under ASan or valgrind) leak nothing.
# usage: alloc_faults.sh ACIDLOT SAMPLES_DIR MESSY_CSV
set -u
bin=$1
samples=$2
messy=$3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
wrap=$(cd "$(dirname "$0")/.." && pwd)/wrap.sh
fails=0
SOURCE_DATE_EPOCH=1796169600
export SOURCE_DATE_EPOCH
# every index normally; under valgrind (slow) every 7th, ASan covers the rest
step=1
[ -n "${ACIDLOT_VALGRIND:-}" ] && step=7

scenario() {
	name=$1
	shift
	total=$(cd "$work" && ACIDLOT_COUNT_ALLOC=1 sh "$wrap" "$bin" "$@" 2>&1 >/dev/null |
		sed -n 's/^acidlot: \([0-9]*\) allocations$/\1/p')
	if [ -z "$total" ] || [ "$total" -lt 10 ]; then
		echo "$name: could not count allocations"
		fails=$((fails + 1))
		return
	fi
	n=1
	while [ "$n" -le "$total" ]; do
		rm -f "$work"/*.csv "$work"/.acidlot-*
		err=$(cd "$work" && ACIDLOT_FAIL_ALLOC_AT=$n sh "$wrap" "$bin" "$@" 2>&1 >/dev/null)
		rc=$?
		if [ $rc -ne 2 ] || ! printf '%s\n' "$err" | grep -q 'out of memory'; then
			echo "$name: allocation $n of $total: exit $rc"
			printf '%s\n' "$err" | head -5
			fails=$((fails + 1))
		fi
		if ls "$work"/*.csv "$work"/.acidlot-* >/dev/null 2>&1; then
			echo "$name: allocation $n of $total left a file behind"
			fails=$((fails + 1))
		fi
		n=$((n + step))
	done
	echo "$name: $total allocation failures each handled"
}

# a register for the assay scenario, outside the scratch folder
"$bin" standardize "$samples/standardisation.csv" -o "$work/../reg-$$.csv" \
	>/dev/null 2>&1
reg=$work/../reg-$$.csv
trap 'rm -rf "$work" "$reg" "$reg.record.json"' EXIT
scenario demo assay "$samples/titrations.csv" --spec "$samples/specs.csv" \
	--titrants "$reg" -o out.csv -r reps.csv
scenario standardize standardize "$samples/standardisation.csv" \
	-o reg.csv --budget budget.csv
cp "$reg" "$work/../keep-$$.csv"
scenario verify verify "$reg.record.json" 
scenario rejects assay "$messy" --rejects rej.csv -o out.csv --delimiter auto \
	--column "titrant_ml=Vol (mL)"
rm -f "$work/../keep-$$.csv"
scenario acids acids
scenario convert convert 7.5 g/L --acid tartaric --to-acid sulfuric
scenario recovery recovery --ta 4.8 --unit g/100g --acid citric --start-kg 1000 \
	--recovered-kg 44.5 --assay 99.8 --base NaOH
scenario guarded assay "$samples/titrations.csv" --spec "$samples/specs.csv" \
	--titrants "$reg" --decision guarded --exclude-outliers --budget b.csv \
	-o out.csv
if [ $fails -ne 0 ]; then
	echo "$fails failures"
	exit 1
fi
echo "1 passed, 0 failed"
