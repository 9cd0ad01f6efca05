#!/bin/sh
# acidlot bench: start-up and a 30-row assay, wall time per run over many
# runs, beside /bin/true in the same loop (what any program costs to
# start on this machine). The assay is the demo's first 30 rows with its
# specifications and titrant register, the report to standard output, and
# again written to a file (replaced each run) with its record (SHA-256,
# fsync, in a temporary folder).
# usage: bench/startup.sh ACIDLOT SAMPLES_DIR [RUNS]   (default 200)
set -u
bin=$1
samples=$2
runs=${3:-200}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
head -31 "$samples/titrations.csv" >"$work/t30.csv"
"$bin" standardize "$samples/standardisation.csv" -o "$work/reg.csv" \
	>/dev/null 2>&1
[ -s "$work/reg.csv" ] || { echo "startup: no titrant register"; exit 2; }
"$bin" assay "$work/t30.csv" --spec "$samples/specs.csv" \
	--titrants "$work/reg.csv" >/dev/null 2>&1
rc=$?
[ $rc -le 1 ] || { echo "startup: the 30-row assay failed (exit $rc)"; exit 2; }

# mean milliseconds a run of "$@" over $runs runs
per_run() {
	t0=$(date +%s%N)
	i=0
	while [ $i -lt "$runs" ]; do
		"$@" >/dev/null 2>&1
		i=$((i + 1))
	done
	t1=$(date +%s%N)
	echo "$t0 $t1 $runs" | awk '{ printf("%.2f", ($2 - $1) / 1e6 / $3) }'
}

printf '%-34s %8s\n' "command ($runs runs)" ms_per_run
printf '%-34s %8s\n' "/bin/true" "$(per_run /bin/true)"
printf '%-34s %8s\n' "acidlot --version" "$(per_run "$bin" --version)"
printf '%-34s %8s\n' "acidlot assay, 30 rows, to stdout" \
	"$(per_run "$bin" assay "$work/t30.csv" --spec "$samples/specs.csv" \
		--titrants "$work/reg.csv")"
printf '%-34s %8s\n' "acidlot assay -o, 30 rows" \
	"$(per_run "$bin" assay "$work/t30.csv" --spec "$samples/specs.csv" \
		--titrants "$work/reg.csv" -o "$work/o.csv")"
