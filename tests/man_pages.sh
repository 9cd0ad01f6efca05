#!/bin/sh
# The manual pages (made from each command's --help by man/help2mdoc.sh)
# are all there and lint clean: groff -mdoc -ww -z warns of nothing.
# usage: tests/man_pages.sh MAN_DIR
set -u
dir=$1
fail=0
n=0
for c in "" -assay -standardize -convert -recovery -verify -acids -template -endpoint -trend; do
	page=$dir/acidlot$c.1
	[ -s "$page" ] || { echo "missing $page"; fail=1; continue; }
	n=$((n + 1))
	out=$(groff -mdoc -ww -z "$page" 2>&1)
	[ -z "$out" ] || { echo "$page: $out"; fail=1; }
	grep -q '^\.Sh OPTIONS' "$page" || { echo "$page: no options"; fail=1; }
done
[ $fail = 0 ] && echo "$n manual pages, lint clean"
exit $fail
