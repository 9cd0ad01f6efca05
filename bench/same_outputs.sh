#!/bin/sh
# Every output of two builds, byte for byte (issue 20: a redesign step
# keeps them identical): the samples' standardisation and assay (register,
# budget, report, replicates, rejects, records) and generated files of
# 1e5 and 1e6 rows (report, replicates, rejects, budget, record), with
# SOURCE_DATE_EPOCH set.
# usage: bench/same_outputs.sh OLD_ACIDLOT NEW_ACIDLOT GEN [SAMPLES_DIR]
set -u
abs() { (cd "$(dirname "$1")" && echo "$(pwd)/$(basename "$1")"); }
old=$(abs "$1") new=$(abs "$2") gen=$(abs "$3")
samples=$(cd "${4:-$(dirname "$0")/../samples}" && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
"$gen" 100000 >"$work/b5.csv"
"$gen" 1000000 >"$work/b6.csv"
for side in old new; do
	bin=$old; [ $side = new ] && bin=$new
	mkdir "$work/$side"
	cp "$samples"/*.csv "$work/$side/"
	(cd "$work/$side" && export SOURCE_DATE_EPOCH=1796169600 &&
	 "$bin" standardize standardisation.csv -o register.csv --budget sbudget.csv >std.out 2>std.err
	 "$bin" assay titrations.csv --spec specs.csv --titrants register.csv -o rep.csv -r reps.csv --rejects rej.csv --budget budget.csv >out.txt 2>err.txt
	 "$bin" assay ../b5.csv -o b5.csv -r b5r.csv --rejects b5j.csv --budget b5b.csv 2>b5.err
	 "$bin" assay ../b6.csv -o b6.csv -r b6r.csv --budget b6b.csv 2>b6.err)
done
if diff -r "$work/old" "$work/new" >"$work/diff"; then
	echo "identical: $(ls "$work/new" | wc -l) files"
	exit 0
fi
head -40 "$work/diff"
exit 1
