#!/bin/sh
# No include circle among the library's modules (issue 20): every
# #include "x.h" of src/M.c, src/M.h and include/acidlot/M.h is an edge
# M -> x, and tsort(1) finds any loop. The umbrella acidlot.h is left out.
# usage: tests/circles.sh SOURCE_DIR
set -u
top=$1
edges=$(for f in "$top"/src/*.c "$top"/src/*.h "$top"/include/acidlot/*.h; do
	m=$(basename "$f"); m=${m%.*}
	[ "$m" = acidlot ] && continue
	sed -n 's/^#include "\(acidlot\/\)\{0,1\}\([a-z_0-9]*\)\.h".*/\2/p' "$f" |
		while read -r d; do [ "$d" != "$m" ] && echo "$m $d"; done
done)
if echo "$edges" | tsort >/dev/null 2>"${TMPDIR:-/tmp}/circles.$$"; then
	rm -f "${TMPDIR:-/tmp}/circles.$$"
	echo "no include circle among $(echo "$edges" | tr ' ' '\n' | sort -u | wc -l) modules"
	exit 0
fi
cat "${TMPDIR:-/tmp}/circles.$$"
rm -f "${TMPDIR:-/tmp}/circles.$$"
exit 1
