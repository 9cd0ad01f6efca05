#!/bin/sh
# Runs a test program, under valgrind (memcheck) when ACIDLOT_VALGRIND is
# set: any memory error or definite/indirect leak turns into exit 99.
# memcheck watches malloc only in a dynamically linked program: where the
# program has a dynamic twin (PROGRAM-dynamic, CMakeLists.txt), that runs.
if [ -n "${ACIDLOT_VALGRIND:-}" ]; then
	if [ -x "$1-dynamic" ]; then
		prog=$1-dynamic
		shift
		set -- "$prog" "$@"
	fi
	exec valgrind -q --error-exitcode=99 --leak-check=full \
		--errors-for-leak-kinds=definite,indirect "$@"
fi
exec "$@"
