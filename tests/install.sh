#!/bin/sh
# make install lays out the program, the static library, its headers and
# a pkg-config file, and a small program builds against the library with
# pkg-config alone (issue 21). usage: tests/install.sh BUILD_DIR
set -u
build=$1
dest=$(mktemp -d)
trap 'rm -rf "$dest"' EXIT
DESTDIR=$dest cmake --install "$build" >/dev/null || { echo "install failed"; exit 1; }
prefix=$(sed -n 's/^prefix=//p' "$build/acidlot.pc")
root=$dest$prefix
for f in bin/acidlot include/acidlot/acidlot.h lib/pkgconfig/acidlot.pc \
	share/man/man1/acidlot.1 share/man/man1/acidlot-assay.1 \
	share/bash-completion/completions/acidlot; do
	[ -e "$root/$f" ] || { echo "missing $f"; exit 1; }
done
ls "$root"/lib*/libacidlot.a >/dev/null 2>&1 || { echo "missing libacidlot.a"; exit 1; }
cat >"$dest/prog.c" <<'PROG'
#include <stdio.h>
#include "acidlot/acidlot.h"

int main(void)
{
	char val[32], unc[32];
	double y;

	if (al_number_parse("4.9679271", 9, '.', &y) != AL_NUM_OK)
		return 1;
	al_round_to_u(y, 0.02252998289, val, sizeof val, unc, sizeof unc);
	printf("%s +/- %s\n", val, unc);
	return 0;
}
PROG
PKG_CONFIG_PATH=$root/lib/pkgconfig:$(ls -d "$root"/lib/*/pkgconfig 2>/dev/null | tr '\n' ':')
export PKG_CONFIG_PATH
flags=$(pkg-config --define-variable=prefix="$root" --cflags --libs acidlot) ||
	{ echo "pkg-config does not know acidlot"; exit 1; }
cc -o "$dest/prog" "$dest/prog.c" $flags || { echo "the program does not build: cc prog.c $flags"; exit 1; }
out=$("$dest/prog")
[ "$out" = "4.968 +/- 0.023" ] || { echo "the program printed '$out'"; exit 1; }
echo "installed under $prefix; a program built with: $flags"
