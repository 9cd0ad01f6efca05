#!/bin/sh
# The store's tests against PostgreSQL (issue 23): a throwaway server
# (initdb and pg_ctl from Debian's postgresql package) on a Unix socket
# in a temporary folder, no TCP; the CLI cases store_chain, sign_off and
# trend_charts and the kill -9 test run against it, with the same
# expected output as against SQLite, then four first uses of a new
# store at once and a certificate issued from it; the server is stopped and removed
# at the end. initdb refuses to run as root: as root the server runs as
# the package's postgres user (runuser).
# usage: store_pg.sh ACIDLOT SAMPLES_DIR BENCH_GEN
# Exit 77 (skipped, and says so) when the server binaries are missing.
set -u
abs() { echo "$(cd "$(dirname "$1")" && pwd)/$(basename "$1")"; }
acidlot=$(abs "$1")
samples=$(cd "$2" && pwd)
gen=$(abs "$3")
here=$(cd "$(dirname "$0")" && pwd)
[ -n "${ACIDLOT_VALGRIND:-}" ] && { echo "skipped under valgrind"; exit 77; }
bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
if [ -z "$bin" ] || [ ! -x "$bin/initdb" ] || ! command -v psql >/dev/null; then
	echo "SKIPPED: no PostgreSQL server here (Debian package postgresql):" \
		"the PostgreSQL store tests did not run"
	exit 77
fi
dir=$(mktemp -d /tmp/acidlot-pg.XXXXXX)
as_server() {
	if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}
[ "$(id -u)" = 0 ] && chown postgres "$dir"
stop() {
	as_server "$bin/pg_ctl" -D "$dir/data" -m immediate -w stop >/dev/null 2>&1
	rm -rf "$dir"
}
trap stop EXIT
if ! as_server "$bin/initdb" -D "$dir/data" -A trust -U postgres -E UTF8 \
	--locale=C >"$dir/initdb.log" 2>&1 ||
   ! as_server "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w \
	-o "-k $dir -h ''" start >/dev/null; then
	echo "the PostgreSQL server did not start:"
	cat "$dir/initdb.log" "$dir/server.log" 2>/dev/null | tail -20
	exit 1
fi
echo "PostgreSQL $("$bin/postgres" --version | awk '{ print $3 }') on $dir"
STORE_PG=$dir
export STORE_PG
fail=0
for c in store_chain trend_charts sign_off; do
	if sh "$here/cli/run_case.sh" "$here/cli/cases/$c" "$acidlot" "$samples"; then
		echo "$c: passed against PostgreSQL"
	else
		fail=1
	fi
done
sh "$here/store_kill.sh" "$acidlot" "$gen"
case $? in 0 | 77) ;; *) fail=1 ;; esac
# four runs making the same new store at once: one makes the tables,
# the others wait for it (an advisory lock), then all four are stored
psql -X -q -d "postgresql:///postgres?host=$dir&user=postgres" \
	-c "CREATE DATABASE first_use" || fail=1
uri="postgresql:///first_use?host=$dir&user=postgres"
for i in 1 2 3 4; do
	"$acidlot" assay "$samples/titrations.csv" --titrant-mol-l 0.1 --store "$uri" \
		--rerun "first use $i" -o "$dir/r$i.csv" >/dev/null 2>"$dir/e$i" &
done
wait
said=$("$acidlot" verify --store "$uri" 2>&1)
echo "four first uses at once: $said"
# a certificate from PostgreSQL: refused before the approval, then
# issued, then issued again naming the one it replaces; the chain holds
run=$("$acidlot" runs --store "$uri" --format csv 2>/dev/null | sed -n 2p | cut -d, -f2)
cert() {
	"$acidlot" certificate --store "$uri" --lot OJ-4471 \
		--lab "$samples/lab.conf" -o "$dir/$1.html" 2>&1
}
said=$(cert refused)
case $said in *"has no approved run"*) ;; *) echo "not refused: $said"; fail=1 ;; esac
"$acidlot" sign --store "$uri" --run "$run" --name "M. Sato" \
	--role "QC manager" --meaning approved --reason "released" >/dev/null || fail=1
first=$(cert first) || fail=1
second=$(cert second) || fail=1
echo "certificates from PostgreSQL: ${first#*: }; ${second#*: }"
case $second in *"replaces COA-"*) ;; *) fail=1 ;; esac
said=$("$acidlot" verify --store "$uri" 2>&1)
echo "with the signature and certificates: $said"
[ "$said" = "4 runs, 64 results, chain intact" ] || fail=1
if [ "$said" != "4 runs, 64 results, chain intact" ]; then
	cat "$dir"/e[1-4]
	fail=1
fi
exit $fail
