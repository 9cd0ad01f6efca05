#!/bin/sh
# The store survives kill -9 (issue 23): a run of 200,000 titrations is
# killed 10 times at different moments while it appends; each time the
# database passes PRAGMA integrity_check, verify --store finds the chain
# intact, and the killed run is in the store whole (66,667 results and
# 200,000 replicates) or not at all.
# tests/store_pg.sh runs it against PostgreSQL too.
# usage: store_kill.sh ACIDLOT BENCH_GEN   (needs the sqlite3 shell)
set -u
acidlot=$1
gen=$2
# it kills runs, it reads no memory: not under valgrind or ASan (whose
# runs are 3 to 20 times slower and prove nothing more here)
[ -n "${ACIDLOT_VALGRIND:-}" ] && { echo "the kill test: skipped under valgrind"; exit 77; }
[ -n "${ASAN_OPTIONS:-}" ] && { echo "the kill test: skipped under ASan"; exit 77; }
command -v sqlite3 >/dev/null || { echo "needs sqlite3 (Debian package sqlite3)"; exit 2; }
. "$(cd "$(dirname "$0")" && pwd)/cli/store_lib.sh"
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 2
lab=$(store lab)
"$gen" 200000 >big.csv
start=$(date +%s.%N)
"$acidlot" assay big.csv --store "$lab" -o first.csv 2>/dev/null
[ $? -le 1 ] || { echo "the first run failed"; exit 1; }
took=$(echo "$(date +%s.%N) - $start" | bc -l)
echo "a whole run takes $(printf '%.2f' "$took") s here"
fail=0
runs=1
for i in 1 2 3 4 5 6 7 8 9 10; do
	"$acidlot" assay big.csv --store "$lab" --rerun "kill $i" -o out.csv \
		>/dev/null 2>&1 &
	pid=$!
	# 8 % to 116 % of a whole run in: reading, evaluating, appending,
	# committing, done
	sleep "$(awk "BEGIN { print $took * ($i * 0.12 - 0.04) }")"
	kill -9 "$pid" 2>/dev/null
	wait "$pid" 2>/dev/null
	check=$(integrity lab)
	now=$(sql lab "SELECT count(*) FROM runs")
	partial=$(sql lab "SELECT count(*) FROM runs WHERE (SELECT count(*) FROM results r WHERE r.run_id = runs.run_id) != 66667 OR (SELECT count(*) FROM replicates p WHERE p.run_id = runs.run_id) != 200000")
	verdict=$("$acidlot" verify --store "$lab" 2>&1)
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
