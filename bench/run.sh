#!/bin/sh
# acidlot bench: times the libcsv parse-only floor, GNU datamash (mean and
# sample SD per sample) and `acidlot assay` on the same generated files, a
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

echo "cores this process gets now: $("$work/cores") (bench/cores.c; 2.00 on two free cores)"
printf '%-10s %-10s %9s %12s %8s %9s %9s %10s\n' rows tool median_s rows_per_s MB_per_s peak_MiB x_floor x_datamash
for rows in "$@"; do
	# named by the generator's checksum: a changed generator makes new files
	f=$work/t$rows-$(cksum <"$here/gen.c" | cut -d' ' -f1).csv
	[ -s "$f" ] || "$work/gen" "$rows" >"$f"
	mb=$(du -m "$f" | cut -f1)
	set -- $(measure "$work/floor" "$f")
	floor_s=$1
	floor_kb=$2
	dm_s=0
	if [ $have_datamash = 1 ]; then
		set -- $(measure sh -c "datamash -t, -H -g 3 mean 6 sstdev 6 <'$f'")
		dm_s=$1
		dm_kb=$2
	fi
	# the report to standard output, discarded as datamash's is; then to a
	# file, with its record (SHA-256 of input and report) and fsync
	set -- $(measure sh -c "'$build/acidlot' assay '$f' --spec '$work/spec.csv' >/dev/null")
	al_s=$1
	al_kb=$2
	set -- $(measure "$build/acidlot" assay "$f" --spec "$work/spec.csv" -o "$work/out.csv")
	alo_s=$1
	alo_kb=$2
	for t in floor datamash acidlot acidlot-o; do
		case $t in
		floor) s=$floor_s; kb=$floor_kb ;;
		datamash) [ $have_datamash = 1 ] || { echo "$rows datamash: not installed (apt-get install datamash)"; continue; }; s=$dm_s; kb=$dm_kb ;;
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
done
echo "cores this process gets now: $("$work/cores")"
