#!/bin/sh
# The sizes issue 20 asks for: files in src/ and include/ over 800
# lines, functions over 90 lines (from the line naming it to its closing
# brace, in the project's style: name at column 0, braces alone).
# usage: bench/sizes.sh [SOURCE_DIR]
top=${1:-$(dirname "$0")/..}
echo "files over 800 lines:"
wc -l "$top"/src/*.c "$top"/src/*.h "$top"/src/cli/*.c "$top"/src/cli/*.h \
	"$top"/include/acidlot/*.h | awk '$2 != "total" && $1 > 800 { print "  " $1, $2 }'
echo "functions over 90 lines:"
for f in "$top"/src/*.c "$top"/src/cli/*.c; do
	awk -v file="$f" '
		/^[a-z_][a-z_0-9]*\(/ && !inside { name = $0; sub(/\(.*/, "", name); start = NR; want = 1; next }
		want && /^\{$/ { inside = 1; want = 0; next }
		inside && /^\}$/ { if (NR - start + 1 > 90) printf "  %d %s %s\n", NR - start + 1, file, name; inside = 0 }
	' "$f"
done | sort -rn
