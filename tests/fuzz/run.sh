#!/bin/sh
# Runs every libFuzzer target for SECONDS each, two at a time, from the
# committed seed corpus (new inputs go to BUILD/fuzz-work, not the repo),
# and prints the executions per target.
# usage: tests/fuzz/run.sh BUILD_DIR SECONDS
set -u
build=$(cd "$1" && pwd)
seconds=$2
here=$(cd "$(dirname "$0")" && pwd)
work=$build/fuzz-work
mkdir -p "$work"
run_one() {
	t=$1
	mkdir -p "$work/$t" "$work/$t-crashes"
	"$build/tests/fuzz_$t" -max_total_time="$seconds" -max_len=8192 \
		-close_fd_mask=3 \
		-print_final_stats=1 -artifact_prefix="$work/$t-crashes/" \
		"$work/$t" "$here/corpus/$t" >"$work/$t.log" 2>&1
	echo $? >"$work/$t.rc"
}
targets="csv number spec assay register standardize columns date options record"
set -- $targets
while [ $# -gt 0 ]; do
	run_one "$1" &
	[ $# -gt 1 ] && run_one "$2" &
	wait
	shift; [ $# -gt 0 ] && shift
done
status=0
for t in $targets; do
	execs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$work/$t.log" | tail -1)
	rc=$(cat "$work/$t.rc")
	crashes=$(ls "$work/$t-crashes" | wc -l)
	echo "fuzz_$t: ${execs:-?} executions in ${seconds} s, exit $rc, $crashes crash files"
	if [ "$rc" != 0 ] || [ "$crashes" != 0 ]; then
		status=1
		tail -30 "$work/$t.log"
	fi
done
exit $status
