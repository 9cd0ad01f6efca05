#!/bin/sh
# Rewrites expected.out and expected.rc of every CLI case (or those named)
# from the current build. Review `git diff tests/cli` before committing.
# usage: tests/cli/regen.sh BUILD_DIR [CASE...]
set -eu
here=$(cd "$(dirname "$0")" && pwd)
build=$(cd "$1" && pwd)
shift
if [ $# -eq 0 ]; then set -- "$here"/cases/*; fi
for c in "$@"; do
	sh "$here/run_case.sh" "$c" "$build/acidlot" "$here/../../samples" --regen
done
