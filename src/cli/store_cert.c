/* acidlot command line: certificates of analysis in the results store
 * (issue 24): the lot's latest approved run and its results read, and
 * the certificate kept as a link of the chain (docs/store.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdio.h>

#include "cli.h"
#include "record.h"
#include "store_int.h"

/* The products the lot has results of: 1 one (into product when it was
 * not given), 0 none, -1 after a message (several, or an error). */
static int
lot_product(db *d, const char *lot, char *product, size_t cap)
{
	db_value key = text_value(lot);
	db_query *q = db_query_open(d, "SELECT DISTINCT product FROM results "
				       "WHERE lot = ?1 ORDER BY product",
				    &key, 1);
	const db_value *row;
	char names[512] = "";
	int n, rc, count = 0;

	if (q == NULL)
		return -1;
	while ((rc = db_next(q, &row, &n)) == 1) {
		size_t len = strlen(names);

		if (count++ == 0)
			store_text(row, 0, product, cap);
		snprintf(names + len, sizeof names - len, "%s%.*s",
			 len ? ", " : "", (int)row[0].len,
			 row[0].type == DB_TEXT ? row[0].t : "");
	}
	db_query_close(q);
	if (rc < 0)
		return -1;
	if (count > 1) {
		cli_error("lot %s has results of %d products (%s): name one "
			  "with --product", lot, count, names);
		return -1;
	}
	return count;
}

/* The run's last approving or rejecting signature: 1 approved (its
 * signer in l), 0 not, -1 after a message. */
static int
approval(db *d, const char *run_id, store_lot *l)
{
	db_value key = text_value(run_id);
	db_query *q = db_query_open(
		d, "SELECT meaning, name, role, signed_utc, seq FROM signatures "
		   "WHERE run_id = ?1 AND meaning IN ('approved', 'rejected') "
		   "ORDER BY seq DESC",
		&key, 1);
	const db_value *row;
	int n, rc, approved = 0;

	if (q == NULL)
		return -1;
	if ((rc = db_next(q, &row, &n)) == 1 && row[0].len == 8 &&
	    memcmp(row[0].t, "approved", 8) == 0) {
		approved = 1;
		store_text(row, 1, l->approver, sizeof l->approver);
		store_text(row, 2, l->approver_role, sizeof l->approver_role);
		store_text(row, 3, l->approved_utc, sizeof l->approved_utc);
		l->signature_seq = row[4].i;
	}
	db_query_close(q);
	return rc < 0 ? -1 : approved;
}

static void
fill_id(void *item, const db_value *row)
{
	store_text(row, 0, item, 32);
}

/* The runs with results of the lot and product, newest first. */
static int
lot_runs(db *d, const store_lot *l, char (**ids)[32], size_t *n)
{
	db_value key[2] = {text_value(l->lot), text_value(l->product)};
	void *items;
	int rc = store_rows(d, "SELECT run_id FROM runs WHERE run_id IN "
			       "(SELECT run_id FROM results WHERE lot = ?1 AND "
			       "product = ?2) ORDER BY seq DESC",
			    key, 2, 32, fill_id, &items, n);

	*ids = items;
	return rc;
}

/* The run the certificate is made from: the newest approved one (or,
 * for a draft, the newest), its data checked against its hash. */
static int
pick_run(db *d, store_lot *l, int draft)
{
	char(*ids)[32];
	size_t n;
	int rc = 0;

	if (lot_runs(d, l, &ids, &n) != 0)
		return -1;
	for (size_t i = 0; rc == 0 && i < n; i++)
		if ((rc = approval(d, ids[i], l)) == 1 || (draft && i == 0 && rc == 0)) {
			snprintf(l->run_id, sizeof l->run_id, "%s", ids[i]);
			l->approved = rc == 1;
			rc = 1;
		}
	if (rc == 0 && n == 0)
		cli_error("no result of lot %s (%s) in the store", l->lot,
			  l->product);
	else if (rc == 0)
		cli_error("lot %s (%s) has no approved run: approve its latest, "
			  "%s, with '" PROG " sign --run %s --meaning approved "
			  "...', or make a --draft",
			  l->lot, l->product, ids[0], ids[0]);
	al_free(ids);
	return rc == 1 ? 0 : -1;
}

/* The run's row: its time, command and analyst, and its integrity. */
static int
run_fields(db *d, store_lot *l)
{
	db_value key = text_value(l->run_id), run[RUN_COLUMNS];
	db_query *q = db_query_open(d, "SELECT * FROM runs WHERE run_id = ?1",
				    &key, 1);
	const db_value *row;
	char *copy = NULL, hash[65];
	int n, rc;

	if (q == NULL)
		return -1;
	if ((rc = db_next(q, &row, &n)) == 1 && n == RUN_COLUMNS)
		rc = store_copy_row(row, n, run, &copy) == 0 ? 1 : -1;
	db_query_close(q);
	if (rc != 1 || store_rehash_run(d, run, hash) != 0)
		return al_free(copy), -1;
	store_text(run, 2, l->started_utc, sizeof l->started_utc);
	store_text(run, 3, l->analyst, sizeof l->analyst);
	store_text(run, 5, l->command, sizeof l->command);
	rc = strcmp(run[RUN_HASHED].t, hash) == 0 ? 0 : -1;
	if (rc != 0)
		cli_error("run %s no longer matches its hash ('" PROG " verify "
			  "--store' tells more): no certificate made",
			  l->run_id);
	al_free(copy);
	return rc;
}

/* One result row of the lot into r. */
static void
to_result(void *item, const db_value *row)
{
	store_result *r = item;

	memset(r, 0, sizeof *r);
	store_text(row, 0, r->sample, sizeof r->sample);
	store_text(row, 1, r->acid, sizeof r->acid);
	store_text(row, 2, r->unit, sizeof r->unit);
	r->n = (long)row[3].i;
	r->has_mean = row[4].type == DB_REAL;
	r->mean = row[4].r;
	r->has_u = row[5].type == DB_REAL && row[6].type == DB_REAL;
	r->U = row[5].r;
	r->k = row[6].r;
	r->has_min = row[7].type == DB_REAL;
	r->spec_min = row[7].r;
	r->has_max = row[8].type == DB_REAL;
	r->spec_max = row[8].r;
	store_text(row, 9, r->status, sizeof r->status);
	store_text(row, 10, r->flags, sizeof r->flags);
	store_text(row, 11, r->date, sizeof r->date);
	store_text(row, 12, r->basis, sizeof r->basis);
}

static int
lot_results(db *d, store_lot *l)
{
	db_value key[3] = {text_value(l->run_id), text_value(l->lot),
			   text_value(l->product)};
	void *items;
	int rc = store_rows(
		d, "SELECT sample, acid, unit, n, mean, expanded_u, k, "
		   "spec_min, spec_max, status, flags, date, basis FROM results "
		   "WHERE run_id = ?1 AND lot = ?2 AND product = ?3 ORDER BY pos",
		key, 3, sizeof *l->results, to_result, &items, &l->n);

	l->results = items;
	return rc;
}

/* The lot's latest certificate, which this one replaces (7.8.8). */
static int
replaced(db *d, store_lot *l)
{
	db_value key[2] = {text_value(l->lot), text_value(l->product)};
	db_query *q = db_query_open(
		d, "SELECT certificate_id, issued_utc FROM certificates WHERE "
		   "lot = ?1 AND product = ?2 ORDER BY seq DESC",
		key, 2);
	const db_value *row;
	int n, rc;

	if (q == NULL)
		return -1;
	if ((rc = db_next(q, &row, &n)) == 1) {
		store_text(row, 0, l->replaces, sizeof l->replaces);
		store_text(row, 1, l->replaces_issued, sizeof l->replaces_issued);
	}
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

int
store_certificate_begin(store *s, store_lot *l, int draft)
{
	char prev[65];
	int found;

	if (db_begin_write(s->db) != 0)
		return -1;
	if (store_read_head(s->db, &l->seq, s->prev) != 0 ||
	    record_now(l->issued_utc) != 0)
		goto fail;
	memcpy(prev, s->prev, 65);
	l->seq++;
	/* COA-YYYY-NNNNN: the year of issue and the link's number */
	snprintf(l->certificate_id, sizeof l->certificate_id, "COA-%.4s-%05lld",
		 l->issued_utc, l->seq);
	if (l->product[0] == '\0' &&
	    (found = lot_product(s->db, l->lot, l->product,
				 sizeof l->product)) <= 0) {
		if (found == 0)
			cli_error("no result of lot %s in the store", l->lot);
		goto fail;
	}
	if (pick_run(s->db, l, draft) != 0 || run_fields(s->db, l) != 0 ||
	    lot_results(s->db, l) != 0 || replaced(s->db, l) != 0)
		goto fail;
	return 0;
fail:
	db_rollback(s->db);
	return -1;
}

int
store_certificate_commit(store *s, const store_lot *l, const char *customer,
			 const char *content_sha256)
{
	db_value v[CERTIFICATE_COLUMNS];
	char hash[65];

	v[0] = int_value(l->seq);
	v[1] = text_value(l->certificate_id);
	v[2] = text_value(l->product);
	v[3] = text_value(l->lot);
	v[4] = text_value(l->run_id);
	v[5] = int_value(l->signature_seq);
	v[6] = text_value(customer);
	v[7] = text_value(l->issued_utc);
	v[8] = text_value(l->replaces);
	v[9] = text_value(content_sha256);
	v[10] = text_value(s->prev);
	store_certificate_hash(v, hash);
	v[11] = text_value(hash);
	if (db_insert(s->db, "certificates", v, CERTIFICATE_COLUMNS) != 0 ||
	    store_advance_head(s->db, l->seq, hash) != 0 ||
	    db_commit(s->db) != 0) {
		db_rollback(s->db);
		return -1;
	}
	return 0;
}
