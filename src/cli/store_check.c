/* acidlot command line: the results store read back: the chain
 * recomputed link by link (runs, signatures, certificates) for verify,
 * and a product's points for trend (docs/store.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdio.h>

#include "cli.h"
#include "store_int.h"

int
store_copy_row(const db_value *row, int n, db_value *out, char **storage)
{
	size_t size = 1, at = 0;

	for (int c = 0; c < n; c++)
		size += row[c].type == DB_TEXT ? row[c].len + 1 : 0;
	if ((*storage = al_malloc(size)) == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	for (int c = 0; c < n; c++) {
		out[c] = row[c];
		if (row[c].type != DB_TEXT)
			continue;
		memcpy(*storage + at, row[c].t, row[c].len);
		(*storage)[at + row[c].len] = '\0';
		out[c].t = *storage + at;
		at += row[c].len + 1;
	}
	return 0;
}

int
store_rows(db *d, const char *sql, const db_value *params, int n,
	   size_t size, void (*fill)(void *item, const db_value *row),
	   void **items, size_t *count)
{
	db_query *q = db_query_open(d, sql, params, n);
	const db_value *row;
	size_t cap = 0;
	int cols, rc;

	*items = NULL;
	*count = 0;
	if (q == NULL)
		return -1;
	while ((rc = db_next(q, &row, &cols)) == 1) {
		char *grown = al_reserve(*items, &cap, (*count + 1) * size);

		if (grown == NULL) {
			cli_error("%s", al_strerror(AL_ENOMEM));
			rc = -1;
			break;
		}
		*items = grown;
		fill(grown + (*count)++ * size, row);
	}
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

/* The chain's links in order: each one's number and kind. */
enum { LINK_RUN, LINK_SIGNATURE, LINK_CERTIFICATE };
static const char *const link_table[] = {"runs", "signatures",
					 "certificates"};
struct link {
	long long seq;
	int kind;
};

static void
fill_link(void *item, const db_value *row)
{
	struct link *l = item;

	l->seq = row[0].i;
	l->kind = (int)row[1].i;
}

static int
links(db *d, struct link **out, size_t *n)
{
	void *items;
	int rc = store_rows(d, "SELECT seq, 0 FROM runs UNION ALL SELECT seq, "
			       "1 FROM signatures UNION ALL SELECT seq, 2 FROM "
			       "certificates ORDER BY 1",
			    NULL, 0, sizeof **out, fill_link, &items, n);

	*out = items;
	return rc;
}

/* A link's row (n columns), copied: the next queries need the
 * connection (one query at a time). 0, or -1 after a message. */
static int
link_row(db *d, const struct link *l, int n, db_value *out, char **storage)
{
	char sql[64];
	db_value key = int_value(l->seq);
	db_query *q;
	const db_value *row;
	int cols, rc;

	snprintf(sql, sizeof sql, "SELECT * FROM %s WHERE seq = ?1",
		 link_table[l->kind]);
	if ((q = db_query_open(d, sql, &key, 1)) == NULL)
		return -1;
	rc = db_next(q, &row, &cols);
	if (rc == 1 && cols == n)
		rc = store_copy_row(row, n, out, storage);
	else if (rc >= 0) {
		cli_error("store: link %lld (%s) cannot be read", l->seq,
			  link_table[l->kind]);
		rc = -1;
	}
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

/* The signatures a changed run breaks, after why: "; it breaks the
 * signature of NAME (MEANING, TIME)". */
static void
broken_signatures(db *d, const db_value *run_id, char *why, size_t cap)
{
	db_query *q = db_query_open(d, "SELECT name, meaning, signed_utc FROM "
				       "signatures WHERE run_id = ?1 ORDER BY "
				       "seq",
				    run_id, 1);
	const db_value *row;
	int n;

	while (q && db_next(q, &row, &n) == 1) {
		size_t len = strlen(why);

		snprintf(why + len, cap - len,
			 "; it breaks the signature of %.*s (%.*s, %.*s)",
			 (int)row[0].len, row[0].t, (int)row[1].len, row[1].t,
			 (int)row[2].len, row[2].t);
	}
	db_query_close(q);
}

/* The hash of the stored run run_id, into hash (a signature's run). */
static int
run_hash_of(db *d, const db_value *run_id, char hash[65])
{
	db_query *q = db_query_open(d, "SELECT hash FROM runs WHERE run_id = ?1",
				    run_id, 1);
	const db_value *row;
	int n, rc;

	hash[0] = '\0';
	if (q == NULL)
		return -1;
	if ((rc = db_next(q, &row, &n)) == 1 && row[0].type == DB_TEXT)
		snprintf(hash, 65, "%.*s", (int)row[0].len, row[0].t);
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

/* One link checked against the hash before it (prev, then its own):
 * 0 intact, 1 broken (named in first_bad, why in why), -1 after a
 * message. */
static int
check_link(db *d, const struct link *l, char prev[65], char *first_bad,
	   char *why, size_t cap)
{
	static const int columns[] = {RUN_COLUMNS, SIGNATURE_COLUMNS,
				      CERTIFICATE_COLUMNS};
	db_value v[CERTIFICATE_COLUMNS > SIGNATURE_COLUMNS
			    ? CERTIFICATE_COLUMNS
			    : SIGNATURE_COLUMNS];
	char *copy, hash[65], signed_run[65];
	int n = columns[l->kind], rc = 1;

	if (link_row(d, l, n, v, &copy) != 0)
		return -1;
	if (l->kind == LINK_RUN) {
		if (store_rehash_run(d, v, hash) != 0)
			return al_free(copy), -1;
		snprintf(first_bad, cap, "run %s", v[1].t ? v[1].t : "?");
	} else if (l->kind == LINK_SIGNATURE) {
		store_signature_hash(v, hash);
		snprintf(first_bad, cap, "the signature of %s on run %s",
			 v[2].t ? v[2].t : "?", v[1].t ? v[1].t : "?");
	} else {
		store_certificate_hash(v, hash);
		snprintf(first_bad, cap, "certificate %s",
			 v[1].t ? v[1].t : "?");
	}
	if (v[n - 2].type != DB_TEXT || strcmp(v[n - 2].t, prev) != 0)
		snprintf(why, cap, "its prev_hash is not the hash of the link "
				   "before it");
	else if (v[n - 1].type != DB_TEXT || strcmp(v[n - 1].t, hash) != 0) {
		snprintf(why, cap, "its data no longer match its hash");
		if (l->kind == LINK_RUN)
			broken_signatures(d, &v[1], why, cap);
	} else if (l->kind == LINK_SIGNATURE &&
		   (run_hash_of(d, &v[1], signed_run) != 0 ||
		    v[9].type != DB_TEXT || strcmp(v[9].t, signed_run) != 0))
		snprintf(why, cap, "the run it signs is not the run that was "
				   "signed");
	else
		rc = 0, memcpy(prev, hash, 65);
	al_free(copy);
	return rc;
}

/* What is outside the links: the head (the last link's number and
 * hash: a deleted last link shows here), rows of no run. */
static int
outside_chain(db *d, long long last, const char *hash, char *why,
	      size_t cap)
{
	long long seq = 0, orphans = store_count(
		d, "SELECT (SELECT count(*) FROM results WHERE run_id NOT IN "
		   "(SELECT run_id FROM runs)) + (SELECT count(*) FROM "
		   "replicates WHERE run_id NOT IN (SELECT run_id FROM runs)) "
		   "+ (SELECT count(*) FROM run_inputs WHERE run_id NOT IN "
		   "(SELECT run_id FROM runs)) + (SELECT count(*) FROM "
		   "titrants WHERE run_id NOT IN (SELECT run_id FROM runs)) "
		   "+ (SELECT count(*) FROM signatures WHERE run_id NOT IN "
		   "(SELECT run_id FROM runs))",
		NULL, 0);
	char head[65];

	if (orphans < 0 || store_read_head(d, &seq, head) != 0)
		return -1;
	if (seq != last || strcmp(head, hash) != 0) {
		snprintf(why, cap, "the chain's head is link %lld but the last "
				   "link is %lld: a link was deleted or added "
				   "outside the chain",
			 seq, last);
		return 1;
	}
	if (orphans != 0) {
		snprintf(why, cap, "%lld row%s of no run", orphans,
			 orphans == 1 ? "" : "s");
		return 1;
	}
	return 0;
}

int
store_verify(store *s, unsigned long *runs, unsigned long *results,
	     char *first_bad, char *why, size_t cap)
{
	long long n_results;
	struct link *all;
	char prev[65];
	size_t n;
	int rc = 0;

	memset(prev, '0', 64);
	prev[64] = '\0';
	*runs = 0;
	first_bad[0] = why[0] = '\0';
	if (links(s->db, &all, &n) != 0)
		return -1;
	for (size_t i = 0; rc == 0 && i < n; i++)
		if ((rc = check_link(s->db, &all[i], prev, first_bad, why,
				     cap)) == 0)
			*runs += all[i].kind == LINK_RUN;
	if (rc == 0 && (rc = outside_chain(s->db, n ? all[n - 1].seq : 0, prev,
					   why, cap)) == 1)
		snprintf(first_bad, cap, "the store");
	al_free(all);
	if (rc != 0)
		return rc;
	n_results = store_count(s->db, "SELECT count(*) FROM results", NULL, 0);
	if (n_results < 0)
		return -1;
	*results = (unsigned long)n_results;
	first_bad[0] = '\0';
	return 0;
}

void
store_text(const db_value *row, int c, char *buf, size_t cap)
{
	snprintf(buf, cap, "%.*s", row[c].type == DB_TEXT ? (int)row[c].len : 0,
		 row[c].type == DB_TEXT ? row[c].t : "");
}

/* One row of store_points' query into p. */
static void
to_point(void *item, const db_value *row)
{
	store_point *p = item;

	store_text(row, 0, p->lot, sizeof p->lot);
	store_text(row, 1, p->sample, sizeof p->sample);
	store_text(row, 2, p->date, sizeof p->date);
	store_text(row, 6, p->unit, sizeof p->unit);
	p->value = row[3].r;
	p->has_min = row[4].type == DB_REAL;
	p->spec_min = row[4].r;
	p->has_max = row[5].type == DB_REAL;
	p->spec_max = row[5].r;
}

int
store_points(store *s, const char *product, const char *quantity,
	     const char *from, const char *to, store_point **out, size_t *n)
{
	static const char *const allowed[] = {"mean", "sd", "rsd_pct"};
	db_value params[3] = {text_value(product), text_value(from),
			      text_value(to)};
	char sql[1024];
	void *items;
	int rc;

	*out = NULL;
	*n = 0;
	if (al_name_index(allowed, 3, quantity) < 0) {
		cli_error("--quantity takes mean, sd or rsd_pct");
		return -1;
	}
	/* the column's name from the list above, never from the input */
	snprintf(sql, sizeof sql,
		 "SELECT r.lot, r.sample, coalesce(r.date, "
		 "substr(u.started_utc, 1, 10)) AS day, r.%s, r.spec_min, "
		 "r.spec_max, r.unit "
		 "FROM results r JOIN runs u ON u.run_id = r.run_id "
		 "WHERE r.product = ?1 AND r.%s IS NOT NULL "
		 "AND (CAST(?2 AS TEXT) IS NULL OR coalesce(r.date, "
		 "substr(u.started_utc, 1, 10)) >= CAST(?2 AS TEXT)) "
		 "AND (CAST(?3 AS TEXT) IS NULL OR coalesce(r.date, "
		 "substr(u.started_utc, 1, 10)) <= CAST(?3 AS TEXT)) "
		 "ORDER BY day, u.started_utc, u.seq, r.pos",
		 quantity, quantity);
	rc = store_rows(s->db, sql, params, 3, sizeof **out, to_point, &items,
			n);
	*out = items;
	return rc;
}
