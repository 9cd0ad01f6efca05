# acidlot tests: the same store test against SQLite (the default) or
# PostgreSQL (STORE_PG names the socket folder of a server that
# tests/store_pg.sh started; user postgres). A test sources this file
# ('. "$STORE_LIB"') and speaks of stores by name.
# SPDX-License-Identifier: GPL-3.0-or-later

# one database a store name and test run (the scratch folder's checksum)
store_db() {
	echo "t$(pwd | cksum | cut -d' ' -f1)_$1"
}

pg_admin() {
	psql -X -q -At -d "postgresql:///postgres?host=$STORE_PG&user=postgres" "$@"
}

# store NAME: the --store target (a PostgreSQL database made empty on
# first mention)
store() {
	if [ -z "${STORE_PG:-}" ]; then
		echo "$1.db"
		return
	fi
	db=$(store_db "$1")
	if [ -z "$(pg_admin -c "SELECT 1 FROM pg_database WHERE datname = '$db'")" ]; then
		pg_admin -c "CREATE DATABASE \"$db\"" >/dev/null
	fi
	echo "postgresql:///$db?host=$STORE_PG&user=postgres"
}

# sql NAME QUERY: its rows, columns split by |; sql_csv: as CSV
sql() {
	if [ -z "${STORE_PG:-}" ]; then
		sqlite3 "$1.db" "$2"
	else
		psql -X -q -At -F'|' -d "$(store "$1")" -c "$2"
	fi
}
sql_csv() {
	if [ -z "${STORE_PG:-}" ]; then
		sqlite3 -csv "$1.db" "$2"
	else
		psql -X -q -t --csv -d "$(store "$1")" -c "$2"
	fi
}

# drop_trigger NAME TABLE update|delete: what a tamperer does first
drop_trigger() {
	if [ -z "${STORE_PG:-}" ]; then
		sqlite3 "$1.db" "DROP TRIGGER $2_no_$3"
	else
		sql "$1" "DROP TRIGGER $2_no_$3 ON $2"
	fi
}

# copy_store FROM TO
copy_store() {
	if [ -z "${STORE_PG:-}" ]; then
		cp "$1.db" "$2.db"
	else
		pg_admin -c "CREATE DATABASE \"$(store_db "$2")\" TEMPLATE \"$(store_db "$1")\""
	fi
}

# integrity NAME: "ok" when the database's own check passes (SQLite's
# integrity_check; a PostgreSQL server keeps its own: "ok" when it
# answers)
integrity() {
	if [ -z "${STORE_PG:-}" ]; then
		sqlite3 "$1.db" "PRAGMA integrity_check"
	else
		sql "$1" "SELECT 'ok'"
	fi
}
