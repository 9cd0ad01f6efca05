#!/bin/sh
# The store survives kill -9 (issue 23): a run of 200,000 titrations is
# killed 10 times at different moments while it appends; each time the
# database passes PRAGMA integrity_check, verify --store finds the chain
# intact, and the killed run is in the store whole (66,667 results and
# 200,000 replicates) or not at all.
# usage: store_kill.sh ACIDLOT BENCH_GEN   (needs the sqlite3 shell)
set -u
acidlot=$1
gen=$2
[ -n "${ACIDLOT_VALGRIND:-}" ] && { echo "skipped under valgrind"; exit 77; }
command -v sqlite3 >/dev/null || { echo "needs sqlite3 (Debian package sqlite3)"; exit 2; }
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 2
"$gen" 200000 >big.csv
"$acidlot" assay big.csv --store lab.db -o first.csv 2>/dev/null
[ $? -le 1 ] || { echo "the first run failed"; exit 1; }
fail=0
runs=1
for i in 1 2 3 4 5 6 7 8 9 10; do
	"$acidlot" assay big.csv --store lab.db --rerun "kill $i" -o out.csv \
		>/dev/null 2>&1 &
	pid=$!
	# 0.1 s to 2.0 s in: reading, evaluating, appending, committing
	sleep "$(awk "BEGIN { print $i * 0.2 - 0.1 }")"
	kill -9 "$pid" 2>/dev/null
	wait "$pid" 2>/dev/null
	check=$(sqlite3 lab.db "PRAGMA integrity_check")
	now=$(sqlite3 lab.db "SELECT count(*) FROM runs")
	partial=$(sqlite3 lab.db "SELECT count(*) FROM runs WHERE (SELECT count(*) FROM results r WHERE r.run_id = runs.run_id) != 66667 OR (SELECT count(*) FROM replicates p WHERE p.run_id = runs.run_id) != 200000")
	verdict=$("$acidlot" verify --store lab.db 2>&1)
	vrc=$?
	stored=no
	[ "$now" -gt "$runs" ] && stored=yes
	echo "kill $i: integrity $check, run stored: $stored, runs $now, incomplete runs $partial, verify exit $vrc"
	if [ "$check" != ok ] || [ "$partial" != 0 ] || [ $vrc -ne 0 ] ||
	   [ "$now" -lt "$runs" ] || [ "$now" -gt $((runs + 1)) ]; then
		echo "  FAIL: $verdict"
		fail=1
	fi
	runs=$now
done
exit $fail
