#!/bin/sh
# acidlot CLI case runner. SPDX-License-Identifier: GPL-3.0-or-later
#
# usage: run_case.sh CASE_DIR ACIDLOT_BINARY SAMPLES_DIR [--regen]
#
# A case is a folder holding:
#   cmd           a shell command line; $ACIDLOT is the binary, $SAMPLES
#                 the samples/ folder; it runs in a scratch copy of the case
#   expected.out  standard output, compared byte for byte
#   expected.err  extended regular expressions, one a line: each must match
#                 some line of standard error (no file: stderr not checked)
#   expected.rc   the exit status
#   anything else: input files for the command
# With --regen, expected.out and expected.rc are rewritten from this run;
# review the diff before committing.
set -u
case_dir=$1
ACIDLOT=$(cd "$(dirname "$2")" && pwd)/$(basename "$2")
SAMPLES=$3
regen=${4:-}
STORE_LIB=$(cd "$(dirname "$0")" && pwd)/store_lib.sh
export ACIDLOT SAMPLES STORE_LIB
# a fixed run time (2026-12-02T00:00:00Z), so records and report ids repeat
SOURCE_DATE_EPOCH=1796169600
export SOURCE_DATE_EPOCH
name=$(basename "$case_dir")
work=$(mktemp -d)
tools=$(mktemp -d)
trap 'rm -rf "$work" "$tools"' EXIT
if [ -n "${ACIDLOT_VALGRIND:-}" ]; then
	# the same command under valgrind; a memory error or leak exits 99
	wrap=$(cd "$(dirname "$0")/.." && pwd)/wrap.sh
	printf '#!/bin/sh\nexec sh "%s" "%s" "$@"\n' "$wrap" "$ACIDLOT" >"$tools/acidlot"
	chmod +x "$tools/acidlot"
	ACIDLOT=$tools/acidlot
fi
cp -R "$case_dir"/. "$work"/
(cd "$work" && sh ./cmd) >"$work/.out" 2>"$work/.err" </dev/null
rc=$?
if [ "$regen" = "--regen" ]; then
	cp "$work/.out" "$case_dir/expected.out"
	echo "$rc" >"$case_dir/expected.rc"
	echo "regenerated $name (rc $rc)"
	exit 0
fi
status=0
want_rc=$(cat "$case_dir/expected.rc")
if [ "$rc" != "$want_rc" ]; then
	echo "$name: exit status $rc, expected $want_rc"
	status=1
fi
if ! cmp -s "$work/.out" "$case_dir/expected.out"; then
	echo "$name: standard output differs:"
	diff -u "$case_dir/expected.out" "$work/.out" | head -40
	status=1
fi
if [ -f "$case_dir/expected.err" ]; then
	while IFS= read -r pattern; do
		[ -z "$pattern" ] && continue
		if ! grep -Eq -- "$pattern" "$work/.err"; then
			echo "$name: no stderr line matches: $pattern"
			status=1
		fi
	done <"$case_dir/expected.err"
fi
if [ $status -ne 0 ]; then
	echo "--- stderr of $name:"
	head -40 "$work/.err"
fi
exit $status
