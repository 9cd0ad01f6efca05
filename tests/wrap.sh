#!/bin/sh
# Runs a test program, under valgrind (memcheck) when ACIDLOT_VALGRIND is
# set: any memory error or definite/indirect leak turns into exit 99.
if [ -n "${ACIDLOT_VALGRIND:-}" ]; then
	exec valgrind -q --error-exitcode=99 --leak-check=full \
		--errors-for-leak-kinds=definite,indirect "$@"
fi
exec "$@"
