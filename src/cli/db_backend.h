/* acidlot command line: what a backend of the store's database gives
 * (db.h): its functions, called through db.c.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_DB_BACKEND_H
#define ACIDLOT_CLI_DB_BACKEND_H

#include "db.h"

struct db_ops {
	void (*close)(db *d);
	const char *(*errmsg)(db *d);
	int (*create)(db *d, const db_table *tables, size_t n,
		      const char *advancing, const db_statement *extra,
		      size_t n_extra, int want, int *version);
	int (*exec)(db *d, const char *sql, const db_value *params, int n);
	int (*begin_write)(db *d);
	int (*commit)(db *d);
	void (*rollback)(db *d);
	int (*insert)(db *d, const char *table, const db_value *v, int n);
	db_query *(*query_open)(db *d, const char *sql,
				const db_value *params, int n);
	int (*next)(db_query *q, const db_value **row, int *n);
	void (*query_close)(db_query *q);
};

/* The head of every backend's connection and query. */
struct db {
	const struct db_ops *ops;
	const char *target;
};
struct db_query {
	db *d;
};

/* Is a schema to be made (from 0) or brought up to want? */
int db_needs_schema(const db_table *tables, size_t n, int from, int want);

db *db_sqlite_open(const char *target, int create);
db *db_pg_open(const char *target, int create);

#endif
