/* acidlot command line: the results store's PostgreSQL backend (db.h),
 * through libpq: a lab whose benches or sites share one history.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Rows go in by COPY (text format), a query's rows come back one at a
 * time (single-row mode); parameters ?N become $N. */
#define _XOPEN_SOURCE 700
#include <libpq-fe.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "db_backend.h"

#define MAX_COLUMNS 64
#define MAX_PARAMS 16
#define COPY_CHUNK 65536

/* Type OIDs (the catalogue pg_type, stable since PostgreSQL 7). */
enum { BOOLOID = 16, INT8OID = 20, INT2OID = 21, INT4OID = 23,
       TEXTOID = 25, FLOAT4OID = 700, FLOAT8OID = 701, NUMERICOID = 1700 };

struct pg {
	db base; /* first */
	PGconn *conn;
	int create;
	const char *copying; /* the table a COPY is open into, or NULL */
	char *buf;	     /* the COPY's rows not sent yet */
	size_t len, cap;
	char err[512];
};

struct pg_query {
	db_query base; /* first */
	PGresult *res; /* the row given last */
	int done;
	db_value row[MAX_COLUMNS];
};

static const struct db_ops ops;

static struct pg *
pg(db *d)
{
	return (struct pg *)d;
}

/* The server's last words, on one line. */
static const char *
errmsg(db *d)
{
	struct pg *p = pg(d);
	size_t n;

	if (p->err[0] == '\0')
		snprintf(p->err, sizeof p->err, "%s",
			 p->conn ? PQerrorMessage(p->conn) : "out of memory");
	n = strlen(p->err);
	while (n > 0 && (p->err[n - 1] == '\n' || p->err[n - 1] == ' '))
		p->err[--n] = '\0';
	/* its lines on one: "...failed: No such file; Is the server..."
	 * (libpq starts a further line with a tab) */
	for (char *at = p->err; *at; at++)
		if (*at == '\n')
			*at = ';';
		else if (*at == '\t')
			*at = ' ';
	return p->err;
}

static int
fail(db *d, const char *what)
{
	pg(d)->err[0] = '\0';
	return db_fail(d, what);
}

static void
quiet(void *arg, const char *message)
{
	(void)arg;
	(void)message;
}

/* Parameters as libpq takes them: text for numbers, the bytes of a text
 * (binary format, so that no terminating NUL is needed). */
struct params {
	const char *values[MAX_PARAMS];
	int lengths[MAX_PARAMS], formats[MAX_PARAMS];
	unsigned types[MAX_PARAMS];
	char numbers[MAX_PARAMS][32];
};

static void
to_params(const db_value *v, int n, struct params *p)
{
	for (int i = 0; i < n && i < MAX_PARAMS; i++) {
		p->formats[i] = 0;
		p->lengths[i] = 0;
		p->values[i] = p->numbers[i];
		switch (v[i].type) {
		case DB_INT:
			p->types[i] = INT8OID;
			snprintf(p->numbers[i], 32, "%lld", v[i].i);
			break;
		case DB_REAL:
			p->types[i] = FLOAT8OID;
			snprintf(p->numbers[i], 32, "%.17g", v[i].r);
			break;
		case DB_TEXT:
			p->types[i] = TEXTOID;
			p->values[i] = v[i].t;
			p->lengths[i] = (int)v[i].len;
			p->formats[i] = 1;
			break;
		default:
			p->types[i] = 0;
			p->values[i] = NULL;
		}
	}
}

/* sql with ?N written $N, into a new string (al_free it). */
static char *
dollars(const char *sql)
{
	char *out = al_malloc(strlen(sql) + 1);

	if (out == NULL)
		return NULL;
	for (size_t i = 0; (out[i] = sql[i]) != '\0'; i++)
		if (sql[i] == '?' && sql[i + 1] >= '0' && sql[i + 1] <= '9')
			out[i] = '$';
	return out;
}

/* The open COPY finished (abort: given up): 0, or -1 after a message. */
static int
end_copy(db *d, int abort)
{
	struct pg *p = pg(d);
	PGresult *res;
	int bad = 0;

	if (p->copying == NULL)
		return 0;
	p->copying = NULL;
	if (!abort && p->len > 0 &&
	    PQputCopyData(p->conn, p->buf, (int)p->len) != 1)
		bad = 1;
	p->len = 0;
	if (PQputCopyEnd(p->conn, abort || bad ? "given up" : NULL) != 1)
		bad = 1;
	while ((res = PQgetResult(p->conn)) != NULL) {
		if (PQresultStatus(res) != PGRES_COMMAND_OK)
			bad = 1;
		PQclear(res);
	}
	return bad && !abort ? fail(d, "copy") : 0;
}

/* One statement run to its end; its status kept in *status (the
 * command tag, e.g. "COMMIT"), when status is not NULL. */
static int
run(db *d, const char *sql, const db_value *v, int n, char *status,
    size_t cap)
{
	struct params p;
	PGresult *res;
	char *text;
	int ok;

	if (end_copy(d, 0) != 0)
		return -1;
	if ((text = dollars(sql)) == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	to_params(v, n, &p);
	res = PQexecParams(pg(d)->conn, text, n, p.types, p.values, p.lengths,
			   p.formats, 0);
	al_free(text);
	ok = PQresultStatus(res) == PGRES_COMMAND_OK ||
	     PQresultStatus(res) == PGRES_TUPLES_OK;
	if (ok && status)
		snprintf(status, cap, "%s", PQcmdStatus(res));
	PQclear(res);
	return ok ? 0 : fail(d, sql);
}

static int
pg_exec(db *d, const char *sql, const db_value *params, int n)
{
	return run(d, sql, params, n, NULL, 0);
}

static void
pg_close(db *d)
{
	end_copy(d, 1);
	PQfinish(pg(d)->conn);
	al_free(pg(d)->buf);
	al_free(pg(d));
}

db *
db_pg_open(const char *target, int create)
{
	struct pg *p = al_calloc(1, sizeof *p);

	if (p == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	p->base.ops = &ops;
	p->base.target = target;
	p->create = create;
	p->conn = PQconnectdb(target);
	if (p->conn == NULL || PQstatus(p->conn) != CONNECTION_OK) {
		fail(&p->base, "connect");
		pg_close(&p->base);
		return NULL;
	}
	PQsetNoticeProcessor(p->conn, quiet, NULL);
	return &p->base;
}

/* The schema's version: 0 when the database holds no store. */
static int
read_version(db *d, int *version)
{
	db_query *q;
	const db_value *row;
	int n, rc;

	*version = -1;
	q = db_query_open(d, "SELECT CASE WHEN to_regclass('store_version') "
			     "IS NULL THEN 0 ELSE 1 END",
			  NULL, 0);
	if (q == NULL)
		return -1;
	rc = db_next(q, &row, &n);
	if (rc == 1)
		*version = (int)row[0].i;
	db_query_close(q);
	if (rc != 1 || *version == 0)
		return rc == 1 ? 0 : -1;
	q = db_query_open(d, "SELECT max(version) FROM store_version", NULL, 0);
	if (q == NULL)
		return -1;
	rc = db_next(q, &row, &n);
	*version = rc == 1 && row[0].type == DB_INT ? (int)row[0].i : -1;
	db_query_close(q);
	return rc == 1 ? 0 : -1;
}

/* The functions the append-only triggers call. */
static const char *const functions[] = {
	"CREATE FUNCTION acidlot_append_only() RETURNS trigger LANGUAGE "
	"plpgsql AS $$ BEGIN RAISE EXCEPTION 'the store is append-only'; "
	"END $$",
	"CREATE FUNCTION acidlot_advance_only() RETURNS trigger LANGUAGE "
	"plpgsql AS $$ BEGIN IF NEW.seq <> OLD.seq + 1 THEN RAISE EXCEPTION "
	"'the store is append-only'; END IF; RETURN NEW; END $$",
};

/* table made append-only: no DELETE, no TRUNCATE, no UPDATE (but the
 * advancing one's). */
static int
append_only(db *d, const char *table, int advancing)
{
	static const char *const kinds[][3] = {
		{"delete", "DELETE", "ROW"},
		{"truncate", "TRUNCATE", "STATEMENT"},
		{"update", "UPDATE", "ROW"},
	};
	char sql[512];

	for (int k = 0; k < 3; k++) {
		snprintf(sql, sizeof sql,
			 "CREATE TRIGGER %s_no_%s BEFORE %s ON %s FOR EACH %s "
			 "EXECUTE FUNCTION acidlot_%s_only()",
			 table, kinds[k][0], kinds[k][1], table, kinds[k][2],
			 k == 2 && advancing ? "advance" : "append");
		if (pg_exec(d, sql, NULL, 0) != 0)
			return -1;
	}
	return 0;
}

static int pg_commit(db *d);
static void pg_rollback(db *d);

/* The tables and statements since version from (0: all, with the
 * trigger functions and the version table), then want noted. */
static int
make_schema(db *d, const db_table *tables, size_t n, const char *advancing,
	    const db_statement *extra, size_t n_extra, int from, int want)
{
	db_value v = {.type = DB_INT, .i = want};
	char sql[2048];

	for (size_t i = 0; from == 0 && i < 2; i++)
		if (pg_exec(d, functions[i], NULL, 0) != 0)
			return -1;
	for (size_t i = 0; i < n; i++) {
		if (tables[i].since <= from)
			continue;
		snprintf(sql, sizeof sql, "CREATE TABLE %s (%s)",
			 tables[i].name, tables[i].columns);
		if (pg_exec(d, sql, NULL, 0) != 0 ||
		    append_only(d, tables[i].name,
				strcmp(tables[i].name, advancing) == 0) != 0)
			return -1;
	}
	for (size_t i = 0; i < n_extra; i++)
		if (extra[i].since > from &&
		    pg_exec(d, extra[i].sql, NULL, 0) != 0)
			return -1;
	if (from == 0 &&
	    (pg_exec(d, "CREATE TABLE store_version (version BIGINT NOT NULL)",
		     NULL, 0) != 0 ||
	     append_only(d, "store_version", 0) != 0))
		return -1;
	return pg_exec(d, "INSERT INTO store_version VALUES (?1)", &v, 1);
}

static int
pg_create(db *d, const db_table *tables, size_t n, const char *advancing,
	  const db_statement *extra, size_t n_extra, int want, int *version)
{
	/* one first use at a time: the others wait, then find the store */
	if (pg_exec(d, "BEGIN", NULL, 0) != 0 ||
	    pg_exec(d, "SELECT pg_advisory_xact_lock(2302)", NULL, 0) != 0 ||
	    read_version(d, version) != 0)
		return pg_rollback(d), -1;
	if (*version == 0 && !pg(d)->create) {
		pg_rollback(d);
		cli_error("%s: holds no acidlot store", d->target);
		return -1;
	}
	if (db_needs_schema(tables, n, *version, want)) {
		if (make_schema(d, tables, n, advancing, extra, n_extra,
				*version, want) != 0)
			return pg_rollback(d), -1;
		*version = want;
	}
	return pg_commit(d);
}

static int
pg_begin_write(db *d)
{
	/* writers one at a time (readers go on): the chain's head read
	 * next is still the head at the commit */
	if (pg_exec(d, "BEGIN", NULL, 0) != 0)
		return -1;
	if (pg_exec(d, "LOCK TABLE head IN EXCLUSIVE MODE", NULL, 0) != 0)
		return pg_rollback(d), -1;
	return 0;
}

static int
pg_commit(db *d)
{
	char status[64] = "";

	if (run(d, "COMMIT", NULL, 0, status, sizeof status) != 0)
		return -1;
	/* a transaction in error answers COMMIT with ROLLBACK */
	if (strcmp(status, "COMMIT") != 0) {
		cli_error("%s: store: the commit was refused (%s)", d->target,
			  status);
		return -1;
	}
	return 0;
}

static void
pg_rollback(db *d)
{
	PGresult *res;

	end_copy(d, 1);
	res = PQexec(pg(d)->conn, "ROLLBACK");
	PQclear(res);
}

/* One value in COPY's text format into the buffer (room made by the
 * caller: 2 bytes a text byte, 32 a number). */
static void
copy_value(struct pg *p, const db_value *v)
{
	switch (v->type) {
	case DB_INT:
		p->len += (size_t)snprintf(p->buf + p->len, 32, "%lld", v->i);
		break;
	case DB_REAL:
		p->len += (size_t)snprintf(p->buf + p->len, 32, "%.17g", v->r);
		break;
	case DB_TEXT:
		for (size_t i = 0; i < v->len; i++) {
			char c = v->t[i];
			char e = c == '\\'   ? '\\'
				 : c == '\t' ? 't'
				 : c == '\n' ? 'n'
				 : c == '\r' ? 'r'
					     : 0;

			if (e) /* COPY's escapes */
				p->buf[p->len++] = '\\', c = e;
			p->buf[p->len++] = c;
		}
		break;
	default:
		memcpy(p->buf + p->len, "\\N", 2);
		p->len += 2;
	}
}

static int
pg_insert(db *d, const char *table, const db_value *v, int n)
{
	struct pg *p = pg(d);
	size_t need = 1;
	char sql[128];
	PGresult *res;

	if (p->copying != table) {
		if (end_copy(d, 0) != 0)
			return -1;
		snprintf(sql, sizeof sql, "COPY %s FROM STDIN", table);
		res = PQexec(p->conn, sql);
		if (PQresultStatus(res) != PGRES_COPY_IN) {
			PQclear(res);
			return fail(d, sql);
		}
		PQclear(res);
		p->copying = table;
	}
	for (int i = 0; i < n; i++)
		need += 32 + (v[i].type == DB_TEXT ? 2 * v[i].len : 0);
	if (p->len + need > p->cap) {
		char *grown;
		size_t cap = p->len + need + COPY_CHUNK;

		if ((grown = al_realloc(p->buf, cap)) == NULL) {
			cli_error("%s", al_strerror(AL_ENOMEM));
			return -1;
		}
		p->buf = grown;
		p->cap = cap;
	}
	for (int i = 0; i < n; i++) {
		copy_value(p, &v[i]);
		p->buf[p->len++] = i + 1 < n ? '\t' : '\n';
	}
	if (p->len >= COPY_CHUNK) {
		if (PQputCopyData(p->conn, p->buf, (int)p->len) != 1)
			return fail(d, "copy");
		p->len = 0;
	}
	return 0;
}

static void pg_query_close(db_query *q);

static db_query *
pg_query_open(db *d, const char *sql, const db_value *params, int n)
{
	struct pg_query *q = al_calloc(1, sizeof *q);
	struct params p;
	char *text = dollars(sql);

	if (q == NULL || text == NULL) {
		AL_FREE_ALL(q, text);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	q->base.d = d;
	to_params(params, n, &p);
	if (end_copy(d, 0) != 0 ||
	    PQsendQueryParams(pg(d)->conn, text, n, p.types, p.values,
			      p.lengths, p.formats, 0) != 1 ||
	    PQsetSingleRowMode(pg(d)->conn) != 1) {
		al_free(text);
		fail(d, sql);
		q->done = 1;
		pg_query_close(&q->base);
		return NULL;
	}
	al_free(text);
	return &q->base;
}

/* Column c of the row given last. */
static db_value
column(PGresult *res, int c)
{
	const char *t = PQgetvalue(res, 0, c);

	if (PQgetisnull(res, 0, c))
		return (db_value){.type = DB_NULL};
	switch (PQftype(res, c)) {
	case INT2OID:
	case INT4OID:
	case INT8OID:
		return (db_value){.type = DB_INT, .i = strtoll(t, NULL, 10)};
	case BOOLOID:
		return (db_value){.type = DB_INT, .i = t[0] == 't'};
	case FLOAT4OID:
	case FLOAT8OID:
	case NUMERICOID:
		/* the server writes the shortest text that reads back as
		 * the same double (extra_float_digits 1, the default) */
		return (db_value){.type = DB_REAL, .r = strtod(t, NULL)};
	default:
		return (db_value){.type = DB_TEXT, .t = t,
				  .len = (size_t)PQgetlength(res, 0, c)};
	}
}

static int
pg_next(db_query *query, const db_value **row, int *n)
{
	struct pg_query *q = (struct pg_query *)query;
	PGconn *conn = pg(query->d)->conn;
	int bad = 0;

	PQclear(q->res);
	q->res = NULL;
	if (q->done)
		return 0;
	q->res = PQgetResult(conn);
	if (q->res && PQresultStatus(q->res) == PGRES_SINGLE_TUPLE) {
		*n = PQnfields(q->res) < MAX_COLUMNS ? PQnfields(q->res)
						     : MAX_COLUMNS;
		for (int c = 0; c < *n; c++)
			q->row[c] = column(q->res, c);
		*row = q->row;
		return 1;
	}
	/* the end (TUPLES_OK, no row) or an error; then no more results */
	if (q->res == NULL || PQresultStatus(q->res) != PGRES_TUPLES_OK)
		bad = 1;
	q->done = 1;
	if (bad)
		fail(query->d, "read");
	PQclear(q->res);
	q->res = NULL;
	while ((q->res = PQgetResult(conn)) != NULL)
		PQclear(q->res);
	return bad ? -1 : 0;
}

static void
pg_query_close(db_query *query)
{
	struct pg_query *q = (struct pg_query *)query;
	PGresult *res;

	PQclear(q->res);
	/* the rows not read, read (the connection takes one query at a
	 * time) */
	while (!q->done && (res = PQgetResult(pg(query->d)->conn)) != NULL)
		PQclear(res);
	al_free(q);
}

static const struct db_ops ops = {
	.close = pg_close,
	.errmsg = errmsg,
	.create = pg_create,
	.exec = pg_exec,
	.begin_write = pg_begin_write,
	.commit = pg_commit,
	.rollback = pg_rollback,
	.insert = pg_insert,
	.query_open = pg_query_open,
	.next = pg_next,
	.query_close = pg_query_close,
};
