/* acidlot command line: signatures in the results store (issue 24):
 * each a link of the chain, after the run it signs; and the list of
 * runs a reviewer picks from (docs/store.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdio.h>
#include <strings.h>

#include "cli.h"
#include "record.h"
#include "store_int.h"

/* A link's hash: "acidlot-link-1\n", its table's name and "\n", then its
 * row (all but the hash, the last column) as store_hash_row writes it. */
static void
link_hash(const char *table, const db_value *row, int n, char hex[65])
{
	struct sha256_ctx h;

	sha256_init(&h);
	sha256_update(&h, 15, (const uint8_t *)"acidlot-link-1\n");
	sha256_update(&h, strlen(table), (const uint8_t *)table);
	sha256_update(&h, 1, (const uint8_t *)"\n");
	store_hash_row(&h, row, n - 1);
	sha256_ctx_hex(&h, hex);
}

void
store_signature_hash(const db_value *row, char hex[65])
{
	link_hash("signatures", row, SIGNATURE_COLUMNS, hex);
}

void
store_certificate_hash(const db_value *row, char hex[65])
{
	link_hash("certificates", row, CERTIFICATE_COLUMNS, hex);
}

/* The run signed: its row, copied into run (storage: al_free it), and
 * its data checked against its hash. 0, or -1 after a message. */
static int
signed_run(db *d, const char *run_id, db_value *run, char **storage)
{
	db_value key = text_value(run_id);
	db_query *q = db_query_open(d, "SELECT * FROM runs WHERE run_id = ?1",
				    &key, 1);
	const db_value *row;
	char hash[65];
	int n, rc;

	*storage = NULL;
	if (q == NULL)
		return -1;
	rc = db_next(q, &row, &n);
	if (rc == 1 && n == RUN_COLUMNS)
		rc = store_copy_row(row, n, run, storage) == 0 ? 1 : -1;
	db_query_close(q);
	if (rc == 0)
		cli_error("no run %s in the store (acidlot runs lists them)",
			  run_id);
	if (rc != 1 || store_rehash_run(d, run, hash) != 0)
		return -1;
	if (run[RUN_HASHED].type != DB_TEXT ||
	    strcmp(run[RUN_HASHED].t, hash) != 0) {
		cli_error("run %s no longer matches its hash (acidlot verify "
			  "--store tells more); not signed",
			  run_id);
		return -1;
	}
	return 0;
}

/* The refusals: the same name and meaning twice; an approval by the
 * run's analyst without --allow-self-approval. 0, or -1 after a
 * message; *self 1 when the analyst approves their own run. */
static int
refusals(db *d, const store_signature *g, const db_value *run, int *self)
{
	db_value key[3] = {text_value(g->run_id), text_value(g->name),
			   text_value(g->meaning)};
	long long twice = store_count(d, "SELECT count(*) FROM signatures "
					 "WHERE run_id = ?1 AND name = ?2 AND "
					 "meaning = ?3",
				      key, 3);

	if (twice < 0)
		return -1;
	if (twice > 0) {
		cli_error("%s has signed run %s as %s already", g->name,
			  g->run_id, g->meaning);
		return -1;
	}
	*self = strcmp(g->meaning, "approved") == 0 &&
		run[3].type == DB_TEXT && strcasecmp(run[3].t, g->name) == 0;
	if (*self && !g->allow_self) {
		cli_error("%s analysed run %s: its approval needs another "
			  "person (or --allow-self-approval, which is stored "
			  "with the signature)",
			  g->name, g->run_id);
		return -1;
	}
	return 0;
}

int
store_sign(store *s, const store_signature *g, char when[32])
{
	db_value run[RUN_COLUMNS], v[SIGNATURE_COLUMNS];
	char *storage = NULL, prev[65], hash[65];
	long long seq;
	int self = 0, bad;

	if (db_begin_write(s->db) != 0)
		return -1;
	bad = store_read_head(s->db, &seq, prev) != 0 ||
	      signed_run(s->db, g->run_id, run, &storage) != 0 ||
	      refusals(s->db, g, run, &self) != 0 || record_now(when) != 0;
	if (!bad) {
		v[0] = int_value(seq + 1);
		v[1] = text_value(g->run_id);
		v[2] = text_value(g->name);
		v[3] = text_value(g->role);
		v[4] = text_value(g->meaning);
		v[5] = text_value(g->reason);
		v[6] = text_value(when);
		v[7] = text_value(g->os_user);
		v[8] = int_value(self);
		v[9] = run[RUN_HASHED];
		v[10] = text_value(prev);
		store_signature_hash(v, hash);
		v[11] = text_value(hash);
		bad = db_insert(s->db, "signatures", v, SIGNATURE_COLUMNS) != 0 ||
		      store_advance_head(s->db, seq + 1, hash) != 0 ||
		      db_commit(s->db) != 0;
	}
	al_free(storage);
	if (bad)
		db_rollback(s->db);
	return bad ? -1 : 0;
}

/* A run's own fields, for the list. */
static void
fill_run_info(void *item, const db_value *row)
{
	store_run_info *r = item;
	const char *cmd = memchr(row[4].t, ' ', row[4].len);

	memset(r, 0, sizeof *r);
	r->seq = row[0].i;
	store_text(row, 1, r->run_id, sizeof r->run_id);
	store_text(row, 2, r->started_utc, sizeof r->started_utc);
	store_text(row, 3, r->analyst, sizeof r->analyst);
	/* the command: the word after the program's name */
	snprintf(r->command, sizeof r->command, "%.*s",
		 cmd ? (int)strcspn(cmd + 1, " ") : 0, cmd ? cmd + 1 : "");
}

/* The runs matching lot and product (each NULL: any), in order, with
 * their own fields; statuses and signatures come after. */
static int
matching_runs(db *d, const char *lot, const char *product,
	      store_run_info **out, size_t *n)
{
	db_value params[2] = {text_value(lot), text_value(product)};
	void *items;
	int rc = store_rows(
		d, "SELECT seq, run_id, started_utc, analyst, command FROM runs "
		   "WHERE (CAST(?1 AS TEXT) IS NULL OR run_id IN (SELECT run_id "
		   "FROM results WHERE lot = CAST(?1 AS TEXT))) AND "
		   "(CAST(?2 AS TEXT) IS NULL OR run_id IN (SELECT run_id FROM "
		   "results WHERE product = CAST(?2 AS TEXT))) ORDER BY seq",
		params, 2, sizeof **out, fill_run_info, &items, n);

	*out = items;
	return rc;
}

/* Lines of a query of one run joined into buf: each row's columns by
 * format ("%s %s" of two texts, say), rows by "; ". */
static int
joined(db *d, const char *sql, const char *run_id, char *buf, size_t cap,
       int (*put)(char *, size_t, const db_value *))
{
	db_value key = text_value(run_id);
	db_query *q = db_query_open(d, sql, &key, 1);
	const db_value *row;
	size_t len = 0;
	int n, rc;

	buf[0] = '\0';
	if (q == NULL)
		return -1;
	while ((rc = db_next(q, &row, &n)) == 1 && len < cap) {
		if (len > 0)
			len += (size_t)snprintf(buf + len, cap - len, "; ");
		if (len < cap)
			len += (size_t)put(buf + len, cap - len, row);
	}
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

static int
put_status(char *buf, size_t cap, const db_value *row)
{
	return snprintf(buf, cap, "%lld %.*s", row[1].i, (int)row[0].len,
			row[0].t);
}

static int
put_signature(char *buf, size_t cap, const db_value *row)
{
	return snprintf(buf, cap, "%.*s by %.*s (%.*s) %.*s", (int)row[0].len,
			row[0].t, (int)row[1].len, row[1].t, (int)row[2].len,
			row[2].t, (int)row[3].len, row[3].t);
}

int
store_list_runs(store *s, const char *lot, const char *product,
		store_run_info **out, size_t *n)
{
	if (matching_runs(s->db, lot, product, out, n) != 0)
		return -1;
	for (size_t i = 0; i < *n; i++) {
		store_run_info *r = &(*out)[i];

		if (joined(s->db, "SELECT status, count(*) FROM results WHERE "
				  "run_id = ?1 GROUP BY status ORDER BY status",
			   r->run_id, r->statuses, sizeof r->statuses,
			   put_status) != 0 ||
		    joined(s->db, "SELECT 'titrant lots', count(*) FROM "
				  "titrants WHERE run_id = ?1 HAVING count(*) > 0",
			   r->run_id, r->titrants, sizeof r->titrants,
			   put_status) != 0 ||
		    joined(s->db, "SELECT meaning, name, role, signed_utc FROM "
				  "signatures WHERE run_id = ?1 ORDER BY seq",
			   r->run_id, r->signatures, sizeof r->signatures,
			   put_signature) != 0)
			return -1;
	}
	return 0;
}
