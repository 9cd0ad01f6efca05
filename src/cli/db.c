/* acidlot command line: the store's database, whichever backend holds
 * it (db.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>

#include "cli.h"
#include "db_backend.h"

int
db_is_postgresql(const char *target)
{
	return strncmp(target, "postgresql://", 13) == 0 ||
	       strncmp(target, "postgres://", 11) == 0;
}

db *
db_open(const char *target, int create)
{
	return db_is_postgresql(target) ? db_pg_open(target, create)
					: db_sqlite_open(target, create);
}

int
db_needs_schema(const db_table *tables, size_t n, int from, int want)
{
	int oldest = want;

	for (size_t i = 0; i < n; i++)
		if (tables[i].since < oldest)
			oldest = tables[i].since;
	/* none yet, or one this program can bring up to date (an older
	 * one, from before the oldest table here, is left as it is) */
	return from == 0 || (from >= oldest && from < want);
}

void
db_close(db *d)
{
	if (d)
		d->ops->close(d);
}

int
db_fail(db *d, const char *what)
{
	cli_error("%s: store: %s: %s", d->target, what, d->ops->errmsg(d));
	return -1;
}

int
db_create(db *d, const db_table *tables, size_t n, const char *advancing,
	  const db_statement *extra, size_t n_extra, int want, int *version)
{
	return d->ops->create(d, tables, n, advancing, extra, n_extra, want,
			      version);
}

int
db_exec(db *d, const char *sql, const db_value *params, int n)
{
	return d->ops->exec(d, sql, params, n);
}

int
db_begin_write(db *d)
{
	return d->ops->begin_write(d);
}

int
db_commit(db *d)
{
	return d->ops->commit(d);
}

void
db_rollback(db *d)
{
	d->ops->rollback(d);
}

int
db_insert(db *d, const char *table, const db_value *v, int n)
{
	return d->ops->insert(d, table, v, n);
}

db_query *
db_query_open(db *d, const char *sql, const db_value *params, int n)
{
	return d->ops->query_open(d, sql, params, n);
}

int
db_next(db_query *q, const db_value **row, int *n)
{
	return q->d->ops->next(q, row, n);
}

void
db_query_close(db_query *q)
{
	if (q)
		q->d->ops->query_close(q);
}
