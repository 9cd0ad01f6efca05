#!/bin/sh
# acidlot bench: times the libcsv parse-only floor, GNU datamash (mean and
# sample SD per sample), DuckDB doing the same assay (bench/duckdb.mjs),
# the build before the redesign (git 4a3318e, or BENCH_BEFORE) and
# `acidlot assay` on the same generated files, a
# few runs each, and prints medians, rows/s, MB/s, peak memory and the
# ratios to the floor and to datamash, all from the same run. `acidlot`
# writes the report to standard output (discarded, as datamash's output
# is); `acidlot-o` writes it to a file with the run's record.
# usage: bench/run.sh BUILD_DIR [ROWS...]   (default 100000 1000000 10000000)
set -u
build=$(cd "$1" && pwd)
shift
[ $# -eq 0 ] && set -- 100000 1000000 10000000
here=$(cd "$(dirname "$0")" && pwd)
work=$build/bench-work
mkdir -p "$work"
runs=${BENCH_RUNS:-3}
cc -O2 -o "$work/gen" "$here/gen.c" || exit 2
cc -O2 -o "$work/floor" "$here/floor.c" -lcsv || exit 2
cc -O1 -pthread -o "$work/cores" "$here/cores.c" || exit 2
have_datamash=1
command -v datamash >/dev/null || have_datamash=0
# DuckDB through Node's @duckdb/node-api (prebuilt on the npm registry;
# the older `duckdb` package builds from source, over half an hour here)
have_duckdb=0
if command -v node >/dev/null && command -v npm >/dev/null; then
	[ -d "$work/node_modules/@duckdb/node-api" ] ||
		(cd "$work" && npm install --silent --no-audit --no-fund \
			@duckdb/node-api@1.5.6-r.1 >/dev/null 2>&1)
	[ -d "$work/node_modules/@duckdb/node-api" ] && have_duckdb=1
	cp "$here/duckdb.mjs" "$work/duckdb.mjs"
fi
[ $have_duckdb = 1 ] || echo "DuckDB: skipped (no node and npm, or the npm registry is not reachable)"
# the build before the redesign (issue 20), built from git beside this one
before=${BENCH_BEFORE:-4a3318e}
have_before=0
if git -C "$here/.." cat-file -e "$before^{commit}" 2>/dev/null; then
	if [ ! -x "$work/before/build/acidlot" ]; then
		rm -rf "$work/before" && mkdir -p "$work/before" &&
			git -C "$here/.." archive "$before" | tar -x -C "$work/before" &&
			cmake -S "$work/before" -B "$work/before/build" \
				-DACIDLOT_TESTS=OFF >/dev/null &&
			cmake --build "$work/before/build" -j2 --target acidlot-cli \
				>/dev/null 2>&1
	fi
	[ -x "$work/before/build/acidlot" ] && have_before=1
fi
[ $have_before = 1 ] || echo "the build before the redesign ($before): skipped (not in this clone's history)"
[ -x /usr/bin/time ] || { echo "bench needs /usr/bin/time (Debian package time)"; exit 2; }
printf 'product,acid,unit,min,max,max_rsd_pct,min_n\n' >"$work/spec.csv"
for p in 1 2 3 4 5; do printf 'P%s,citric,g/100g,0.8,1.2,1.5,2\n' "$p" >>"$work/spec.csv"; done

# median seconds and peak KiB of a command, over $runs runs
measure() {
	: >"$work/times"
	i=0
	while [ $i -lt "$runs" ]; do
		/usr/bin/time -q -f "%e %M" -o "$work/one" "$@" >/dev/null 2>&1
		cat "$work/one" >>"$work/times"
		i=$((i + 1))
	done
	sort -n "$work/times" | awk -v n="$runs" 'NR == int((n + 1) / 2) { print $1, $2 }'
}

# measure into NAME_s and NAME_kb
timed() {
	name=$1
	shift
	set -- $(measure "$@")
	eval "${name}_s=\$1 ${name}_kb=\$2"
}

echo "cores this process gets now: $("$work/cores") (bench/cores.c; 2.00 on two free cores)"
printf '%-10s %-10s %9s %12s %8s %9s %9s %10s\n' rows tool median_s rows_per_s MB_per_s peak_MiB x_floor x_datamash
for rows in "$@"; do
	# named by the generator's checksum: a changed generator makes new files
	f=$work/t$rows-$(cksum <"$here/gen.c" | cut -d' ' -f1).csv
	[ -s "$f" ] || "$work/gen" "$rows" >"$f"
	mb=$(du -m "$f" | cut -f1)
	dm_s=0 dk_s=0 bf_s=0
	timed floor "$work/floor" "$f"
	[ $have_datamash = 1 ] &&
		timed dm sh -c "datamash -t, -H -g 3 mean 6 sstdev 6 <'$f'"
	[ $have_duckdb = 1 ] &&
		timed dk node "$work/duckdb.mjs" "$f" "$work/spec.csv" "$work/duck.csv"
	[ $have_before = 1 ] &&
		timed bf sh -c "'$work/before/build/acidlot' assay '$f' --spec '$work/spec.csv' >/dev/null"
	# the report to standard output, discarded as datamash's is; then to a
	# file, with its record (SHA-256 of input and report) and fsync
	timed al sh -c "'$build/acidlot' assay '$f' --spec '$work/spec.csv' >/dev/null"
	timed alo "$build/acidlot" assay "$f" --spec "$work/spec.csv" -o "$work/out.csv"
	for t in floor datamash duckdb before acidlot acidlot-o; do
		case $t in
		floor) s=$floor_s; kb=$floor_kb ;;
		datamash) [ $have_datamash = 1 ] || { echo "$rows datamash: not installed (apt-get install datamash)"; continue; }; s=$dm_s; kb=$dm_kb ;;
		duckdb) [ $have_duckdb = 1 ] || continue; s=$dk_s; kb=$dk_kb ;;
		before) [ $have_before = 1 ] || continue; s=$bf_s; kb=$bf_kb ;;
		acidlot) s=$al_s; kb=$al_kb ;;
		acidlot-o) s=$alo_s; kb=$alo_kb ;;
		esac
		awk -v r="$rows" -v t="$t" -v s="$s" -v kb="$kb" -v mb="$mb" \
		    -v fl="$floor_s" -v dm="$dm_s" 'BEGIN {
			if (s <= 0) s = 0.005
			if (fl <= 0) fl = 0.005
			xd = "-"
			if (dm > 0) xd = sprintf("%.2f", s / dm)
			printf("%-10d %-10s %9.3f %12.0f %8.1f %9.1f %9.2f %10s\n",
			       r, t, s, r / s, mb / s, kb / 1024, s / fl, xd) }'
	done
	# the redesign's targets (issue 20), from this run's medians
	awk -v r="$rows" -v al="$al_s" -v alo="$alo_s" -v dm="$dm_s" \
	    -v dk="$dk_s" -v bf="$bf_s" 'function ratio(a, b) {
		return b > 0 ? sprintf("%.2f", (a > 0 ? a : 0.005) / b) : "-" }
	BEGIN {
		printf("%-10d targets: acidlot/datamash %s (<= 1.10), ", r, ratio(al, dm))
		printf("acidlot/before %s (<= 1.20), ", ratio(al, bf))
		printf("acidlot -o/duckdb %s (<= 0.75)\n", ratio(alo, dk)) }'
done
echo "cores this process gets now: $("$work/cores")"
