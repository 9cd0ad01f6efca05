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
# Every index in the plain build (exit status, message, no file left);
# every 3rd under ASan and every 23rd under valgrind (leaks), whose runs
# cost 0.1 s and 1 s each: together they stay within CI's time.
step=1
[ -n "${ASAN_OPTIONS:-}" ] && step=3
[ -n "${ACIDLOT_VALGRIND:-}" ] && step=23

# one run with allocation $1 failing, in a folder of its own; problems
# are appended to $work/problems. Few processes: on this kind of machine
# starting one costs milliseconds.
one() {
	n=$1
	shift
	dir=$work/run-$n
	mkdir "$dir"
	cd "$dir" || return
	if [ -n "${ACIDLOT_VALGRIND:-}" ]; then
		err=$(ACIDLOT_FAIL_ALLOC_AT=$n sh "$wrap" "$bin" "$@" 2>&1 >/dev/null)
	else
		err=$(ACIDLOT_FAIL_ALLOC_AT=$n "$bin" "$@" 2>&1 >/dev/null)
	fi
	rc=$?
	ok=0
	case $err in
	*"out of memory"*) [ $rc -eq 2 ] && ok=1 ;;
	esac
	if [ $ok = 0 ]; then
		{
			echo "$name: allocation $n of $total: exit $rc"
			printf '%s\n' "$err" | head -5
		} >>"$work/problems"
	fi
	for f in * .acidlot-*; do
		if [ -e "$f" ]; then
			echo "$name: allocation $n of $total left a file behind ($f)" \
				>>"$work/problems"
			rm -f -- "$f"
		fi
	done
	cd "$work" && rmdir "$dir"
}

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
	rm -f "$work"/*.csv "$work"/.acidlot-* "$work/problems"
	# a scenario may put back what its counting run changed
	if [ -n "${after_count:-}" ]; then eval "$after_count"; fi
	# two runs at a time: the machine has two cores
	n=1
	while [ "$n" -le "$total" ]; do
		one "$n" "$@" &
		m=$((n + step))
		if [ "$m" -le "$total" ]; then
			one "$m" "$@" &
		fi
		wait
		n=$((m + step))
	done
	if [ -s "$work/problems" ]; then
		cat "$work/problems"
		fails=$((fails + $(grep -c "^$name: allocation" "$work/problems")))
	fi
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
scenario endpoint endpoint "$samples/curves.csv" -o ep.csv --plots pics \
	--mode gran
scenario curves assay "$samples/curves.csv" --spec "$samples/specs.csv" \
	--rejects rej.csv -o out.csv -r reps.csv --endpoint-mode inflection
# a store outside the run folders, with one run in it (and the one of
# the scenario's counting run): a failed run must leave it as it was
db=$work/../store-$$.db
"$bin" assay "$samples/titrations.csv" --spec "$samples/specs.csv" \
	--titrants "$reg" --store "$db" >/dev/null 2>&1
# the counting run stores its run (of the same id as every run after
# it): the store is put back as it was before it
cp "$db" "$db.before"
after_count='cp "$db.before" "$db"; rm -f "$db-wal" "$db-shm"'
scenario store assay "$samples/titrations.csv" --spec "$samples/specs.csv" \
	--titrants "$reg" --store "$db" --rerun "fault test" -o out.csv \
	-r reps.csv
after_count=
# signing and a draft certificate on the same store (runs makes too few
# allocations of its own to count: SQLite allocates for it)
rid=$("$bin" runs --store "$db" --format csv 2>/dev/null | sed -n 2p | cut -d, -f2)
scenario certificate certificate --store "$db" --lot OJ-4471 \
	--lab "$samples/lab.conf" --draft -o cert.html
after_count='cp "$db.before" "$db"; rm -f "$db-wal" "$db-shm"'
scenario sign sign --store "$db" --run "$rid" --name "T. Brandt" \
	--role "QC reviewer" --meaning reviewed --reason "checked"
after_count=
if [ "$("$bin" verify --store "$db" 2>/dev/null)" != "1 run, 16 results, chain intact" ]; then
	echo "store: a failed run changed the store"
	"$bin" verify --store "$db"
	fails=$((fails + 1))
fi
rm -f "$db" "$db-wal" "$db-shm" "$db.before"
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
