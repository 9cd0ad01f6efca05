/* acidlot command line: the results store's SQLite backend (db.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <sqlite3.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "db_backend.h"

#define MAX_COLUMNS 64

/* The prepared inserts, one a table, kept for the run. */
struct insert {
	const char *table;
	sqlite3_stmt *st;
};

struct sq {
	db base; /* first */
	sqlite3 *db;
	struct insert inserts[8];
};

struct sq_query {
	db_query base; /* first */
	sqlite3_stmt *st;
	db_value row[MAX_COLUMNS];
};

static const struct db_ops ops;

static struct sq *
sq(db *d)
{
	return (struct sq *)d;
}

static const char *
errmsg(db *d)
{
	return sq(d)->db ? sqlite3_errmsg(sq(d)->db) : "cannot open";
}

static void
bind(sqlite3_stmt *st, const db_value *v, int n)
{
	for (int i = 0; i < n; i++)
		switch (v[i].type) {
		case DB_INT:
			sqlite3_bind_int64(st, i + 1, v[i].i);
			break;
		case DB_REAL:
			sqlite3_bind_double(st, i + 1, v[i].r);
			break;
		case DB_TEXT:
			sqlite3_bind_text(st, i + 1, v[i].t, (int)v[i].len,
					  SQLITE_STATIC);
			break;
		default:
			sqlite3_bind_null(st, i + 1);
		}
}

static int
exec_plain(db *d, const char *sql)
{
	return sqlite3_exec(sq(d)->db, sql, NULL, NULL, NULL) == SQLITE_OK
		       ? 0
		       : db_fail(d, sql);
}

static void sq_close(db *d);

db *
db_sqlite_open(const char *target, int create)
{
	struct sq *s = al_calloc(1, sizeof *s);
	db *d;

	if (s == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	d = &s->base;
	d->ops = &ops;
	d->target = target;
	if (sqlite3_open_v2(target, &s->db,
			    SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX |
				    (create ? SQLITE_OPEN_CREATE : 0),
			    NULL) != SQLITE_OK) {
		db_fail(d, "open");
		sq_close(d);
		return NULL;
	}
	/* parallel runs wait up to 10 minutes for the write lock; a
	 * commit is on disk when it returns */
	if (sqlite3_busy_timeout(s->db, 600000) != SQLITE_OK ||
	    exec_plain(d, "PRAGMA journal_mode = WAL") != 0 ||
	    exec_plain(d, "PRAGMA synchronous = FULL") != 0) {
		sq_close(d);
		return NULL;
	}
	return d;
}

static void
drop_inserts(db *d)
{
	struct insert *ins = sq(d)->inserts;

	for (size_t i = 0; i < sizeof sq(d)->inserts / sizeof *ins; i++) {
		sqlite3_finalize(ins[i].st);
		ins[i] = (struct insert){0};
	}
}

static void
sq_close(db *d)
{
	drop_inserts(d);
	sqlite3_close(sq(d)->db);
	al_free(sq(d));
}

static int
sq_exec(db *d, const char *sql, const db_value *params, int n)
{
	sqlite3_stmt *st;
	int rc;

	if (sqlite3_prepare_v2(sq(d)->db, sql, -1, &st, NULL) != SQLITE_OK)
		return db_fail(d, sql);
	bind(st, params, n);
	rc = sqlite3_step(st);
	sqlite3_finalize(st);
	return rc == SQLITE_DONE || rc == SQLITE_ROW ? 0 : db_fail(d, sql);
}

static int
user_version(db *d)
{
	sqlite3_stmt *st;
	int v = -1;

	if (sqlite3_prepare_v2(sq(d)->db, "PRAGMA user_version", -1, &st, NULL) ==
		    SQLITE_OK &&
	    sqlite3_step(st) == SQLITE_ROW)
		v = sqlite3_column_int(st, 0);
	sqlite3_finalize(st);
	return v;
}

/* The triggers that make table append-only. */
static int
append_only(db *d, const char *table, int advancing)
{
	static const char raise[] =
		"BEGIN SELECT RAISE(ABORT, 'the store is append-only'); END";
	char sql[512];

	snprintf(sql, sizeof sql, "CREATE TRIGGER %s_no_delete BEFORE DELETE "
				  "ON %s %s",
		 table, table, raise);
	if (exec_plain(d, sql) != 0)
		return -1;
	snprintf(sql, sizeof sql, "CREATE TRIGGER %s_no_update BEFORE UPDATE "
				  "ON %s %s %s",
		 table, table,
		 advancing ? "WHEN NEW.seq <> OLD.seq + 1" : "", raise);
	return exec_plain(d, sql);
}

static void sq_rollback(db *d);
static int sq_commit(db *d);

static int
sq_create(db *d, const db_table *tables, size_t n, const char *advancing,
	  const db_statement *extra, size_t n_extra, int want, int *version)
{
	char sql[2048];
	int from;

	if (exec_plain(d, "BEGIN IMMEDIATE") != 0)
		return -1;
	from = *version = user_version(d);
	if (!db_needs_schema(tables, n, from, want))
		return sq_commit(d);
	for (size_t i = 0; i < n; i++) {
		if (tables[i].since <= from)
			continue;
		/* every table has a primary key, its rows kept in it */
		snprintf(sql, sizeof sql, "CREATE TABLE %s (%s) WITHOUT ROWID",
			 tables[i].name, tables[i].columns);
		if (exec_plain(d, sql) != 0 ||
		    append_only(d, tables[i].name,
				strcmp(tables[i].name, advancing) == 0) != 0)
			return sq_rollback(d), -1;
	}
	for (size_t i = 0; i < n_extra; i++)
		if (extra[i].since > from && exec_plain(d, extra[i].sql) != 0)
			return sq_rollback(d), -1;
	snprintf(sql, sizeof sql, "PRAGMA user_version = %d", want);
	if (exec_plain(d, sql) != 0)
		return sq_rollback(d), -1;
	*version = want;
	return sq_commit(d);
}

static int
sq_begin_write(db *d)
{
	/* a run's rows in 64 MiB of cache before they spill (a reader
	 * keeps SQLite's 2 MiB: its pages are read once); IMMEDIATE: the
	 * write lock now, so that the chain's head read next is still the
	 * head at the commit */
	return exec_plain(d, "PRAGMA cache_size = -65536") != 0
		       ? -1
		       : exec_plain(d, "BEGIN IMMEDIATE");
}

static int
sq_commit(db *d)
{
	drop_inserts(d);
	return exec_plain(d, "COMMIT");
}

static void
sq_rollback(db *d)
{
	drop_inserts(d);
	sqlite3_exec(sq(d)->db, "ROLLBACK", NULL, NULL, NULL);
}

/* The prepared insert into table: "INSERT INTO t VALUES (?1, ...)". */
static sqlite3_stmt *
insert_of(db *d, const char *table, int n)
{
	struct insert *ins = sq(d)->inserts, *slot = NULL;
	char sql[1024];
	size_t len;

	for (size_t i = 0; i < sizeof sq(d)->inserts / sizeof *ins; i++) {
		if (ins[i].table == table)
			return ins[i].st;
		if (slot == NULL && ins[i].table == NULL)
			slot = &ins[i];
	}
	if (slot == NULL)
		return NULL;
	len = (size_t)snprintf(sql, sizeof sql, "INSERT INTO %s VALUES (", table);
	for (int i = 0; i < n && len < sizeof sql; i++)
		len += (size_t)snprintf(sql + len, sizeof sql - len, "%s?%d",
					i ? ", " : "", i + 1);
	if (len < sizeof sql)
		snprintf(sql + len, sizeof sql - len, ")");
	if (sqlite3_prepare_v2(sq(d)->db, sql, -1, &slot->st, NULL) != SQLITE_OK)
		return NULL;
	slot->table = table;
	return slot->st;
}

static int
sq_insert(db *d, const char *table, const db_value *v, int n)
{
	sqlite3_stmt *st = insert_of(d, table, n);
	int rc;

	if (st == NULL)
		return db_fail(d, table);
	bind(st, v, n);
	rc = sqlite3_step(st);
	sqlite3_reset(st);
	return rc == SQLITE_DONE ? 0 : db_fail(d, table);
}

static void sq_query_close(db_query *q);

static db_query *
sq_query_open(db *d, const char *sql, const db_value *params, int n)
{
	struct sq_query *q = al_calloc(1, sizeof *q);

	if (q == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	q->base.d = d;
	if (sqlite3_prepare_v2(sq(d)->db, sql, -1, &q->st, NULL) != SQLITE_OK) {
		db_fail(d, sql);
		sq_query_close(&q->base);
		return NULL;
	}
	bind(q->st, params, n);
	return &q->base;
}

static int
sq_next(db_query *query, const db_value **row, int *n)
{
	struct sq_query *q = (struct sq_query *)query;
	int rc = sqlite3_step(q->st);

	if (rc == SQLITE_DONE)
		return 0;
	if (rc != SQLITE_ROW)
		return db_fail(query->d, "read");
	*n = sqlite3_column_count(q->st);
	if (*n > MAX_COLUMNS)
		*n = MAX_COLUMNS;
	for (int c = 0; c < *n; c++) {
		db_value *v = &q->row[c];

		switch (sqlite3_column_type(q->st, c)) {
		case SQLITE_NULL:
			*v = (db_value){.type = DB_NULL};
			break;
		case SQLITE_INTEGER:
			*v = (db_value){.type = DB_INT,
					.i = sqlite3_column_int64(q->st, c)};
			break;
		case SQLITE_FLOAT:
			*v = (db_value){.type = DB_REAL,
					.r = sqlite3_column_double(q->st, c)};
			break;
		default:
			v->type = DB_TEXT;
			v->t = (const char *)sqlite3_column_text(q->st, c);
			v->len = (size_t)sqlite3_column_bytes(q->st, c);
		}
	}
	*row = q->row;
	return 1;
}

static void
sq_query_close(db_query *query)
{
	struct sq_query *q = (struct sq_query *)query;

	sqlite3_finalize(q->st);
	al_free(q);
}

static const struct db_ops ops = {
	.close = sq_close,
	.errmsg = errmsg,
	.create = sq_create,
	.exec = sq_exec,
	.begin_write = sq_begin_write,
	.commit = sq_commit,
	.rollback = sq_rollback,
	.insert = sq_insert,
	.query_open = sq_query_open,
	.next = sq_next,
	.query_close = sq_query_close,
};
