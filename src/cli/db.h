/* acidlot command line: the database under the results store, one
 * interface with two backends: SQLite (db_sqlite.c, a file: the
 * embedded default) and PostgreSQL through libpq (db_pg.c, a
 * postgresql:// URI). store.c speaks only through this.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * SQL given here is the subset both speak: parameters are ?1, ?2, ...;
 * types TEXT, BIGINT and DOUBLE PRECISION. */
#ifndef ACIDLOT_CLI_DB_H
#define ACIDLOT_CLI_DB_H

#include <stddef.h>

typedef struct db db;
typedef struct db_query db_query;

/* One value, a parameter or a column of a row read. */
typedef enum { DB_NULL, DB_INT, DB_REAL, DB_TEXT } db_type;
typedef struct db_value {
	db_type type;
	long long i;
	double r;
	const char *t; /* DB_TEXT: len bytes, not always terminated */
	size_t len;
} db_value;

/* A table of the schema: its name, its column definitions and the
 * schema version that brought it; a statement run when the schema is
 * made, and its version. */
typedef struct db_table {
	const char *name, *columns;
	int since;
} db_table;
typedef struct db_statement {
	const char *sql;
	int since;
} db_statement;

/* Is target a PostgreSQL connection URI (postgresql:// or
 * postgres://)? Otherwise it names an SQLite file. */
int db_is_postgresql(const char *target);

/* Opens the database (an SQLite file created when create is 1); NULL
 * after a message naming target. */
db *db_open(const char *target, int create);
void db_close(db *d);

/* The schema made on first use, or brought from an earlier version to
 * want, in one transaction: the tables (those since the database's
 * version), their append-only triggers (<table>_no_update and
 * _no_delete, except that the table named advancing may be updated
 * when its seq grows by one), the statements in extra, and the version.
 * *version is what the database holds afterwards (a later version than
 * want is left alone). 0, or -1 after a message. */
int db_create(db *d, const db_table *tables, size_t n,
	      const char *advancing, const db_statement *extra,
	      size_t n_extra, int want, int *version);

/* A statement with no rows: 0, or -1 after a message. */
int db_exec(db *d, const char *sql, const db_value *params, int n);
/* The write transaction begun, holding the store's write lock (other
 * writers wait for it). */
int db_begin_write(db *d);
int db_commit(db *d);
void db_rollback(db *d);

/* One row appended to table, a value for every column in order. Rows
 * go in fast (a prepared insert; COPY) and are all in place before the
 * next query or the commit. 0, or -1 after a message. */
int db_insert(db *d, const char *table, const db_value *v, int n);

/* A query's rows, one at a time: db_next gives 1 and the row's values
 * (valid until the next call), 0 at the end, -1 after a message. */
db_query *db_query_open(db *d, const char *sql, const db_value *params,
			int n);
int db_next(db_query *q, const db_value **row, int *n);
void db_query_close(db_query *q);

/* Reports a database error: "TARGET: store: WHAT: the database's
 * words"; -1. */
int db_fail(db *d, const char *what);

#endif
