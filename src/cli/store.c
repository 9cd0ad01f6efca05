/* acidlot command line: the results store (docs/store.md), on either
 * database of db.h.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Append-only: triggers refuse UPDATE and DELETE. Each run's hash is
 * SHA-256 over a canonical serialisation of the run's own fields (its
 * prev_hash among them) and of its rows, hashed from the very values
 * handed to the database as they go in; verify reads them back and
 * hashes them the same way, so that a row changed, added or deleted
 * after the run breaks the chain at that run. */
#define _XOPEN_SOURCE 700
#include <stdint.h>
#include <stdio.h>

#include "cli.h"
#include "store_int.h"

/* The covered tables, in the hash's order (the order a run writes
 * them in). */
enum { T_INPUTS, T_REPLICATES, T_RESULTS, T_TITRANTS, N_COVERED };

static const db_table tables[] = {
	{"head", "one BIGINT PRIMARY KEY, seq BIGINT NOT NULL,"
		 " hash TEXT NOT NULL", 2},
	{"runs", "seq BIGINT PRIMARY KEY, run_id TEXT NOT NULL UNIQUE,"
		 " started_utc TEXT NOT NULL, analyst TEXT, os_user TEXT,"
		 " command TEXT NOT NULL, version TEXT NOT NULL,"
		 " inputs TEXT NOT NULL, reason TEXT, prev_hash TEXT NOT NULL,"
		 " hash TEXT NOT NULL", 2},
	{"run_inputs", "run_id TEXT NOT NULL, pos BIGINT NOT NULL,"
		       " name TEXT NOT NULL, sha256 TEXT NOT NULL,"
		       " PRIMARY KEY (run_id, pos)", 2},
	{"replicates", "run_id TEXT NOT NULL, pos BIGINT NOT NULL, file TEXT,"
		       " line BIGINT, product TEXT, lot TEXT, sample TEXT,"
		       " replicate TEXT, meq DOUBLE PRECISION,"
		       " value DOUBLE PRECISION, unit TEXT, flags TEXT,"
		       " curve TEXT, endpoint_mode TEXT,"
		       " PRIMARY KEY (run_id, pos)", 2},
	{"results", "run_id TEXT NOT NULL, pos BIGINT NOT NULL,"
		    " report_id TEXT NOT NULL, product TEXT, lot TEXT,"
		    " sample TEXT, acid TEXT, unit TEXT, n BIGINT NOT NULL,"
		    " mean DOUBLE PRECISION, sd DOUBLE PRECISION,"
		    " rsd_pct DOUBLE PRECISION, ci95_low DOUBLE PRECISION,"
		    " ci95_high DOUBLE PRECISION, spec_min DOUBLE PRECISION,"
		    " spec_max DOUBLE PRECISION, status TEXT NOT NULL,"
		    " flags TEXT, median DOUBLE PRECISION,"
		    " grubbs_g DOUBLE PRECISION, dixon_q DOUBLE PRECISION,"
		    " \"range\" DOUBLE PRECISION,"
		    " critical_range DOUBLE PRECISION, horrat DOUBLE PRECISION,"
		    " u DOUBLE PRECISION, expanded_u DOUBLE PRECISION,"
		    " k DOUBLE PRECISION, brix DOUBLE PRECISION,"
		    " brix_corrected DOUBLE PRECISION,"
		    " brix_acid_ratio DOUBLE PRECISION,"
		    " water_pct DOUBLE PRECISION, basis TEXT, date TEXT,"
		    " PRIMARY KEY (run_id, pos)", 2},
	{"titrants", "run_id TEXT NOT NULL, pos BIGINT NOT NULL,"
		     " titrant_lot TEXT NOT NULL, standard TEXT, n BIGINT NOT NULL,"
		     " concentration_mol_l DOUBLE PRECISION,"
		     " sd_mol_l DOUBLE PRECISION, rsd_pct DOUBLE PRECISION,"
		     " u_mol_l DOUBLE PRECISION,"
		     " expanded_u_mol_l DOUBLE PRECISION, k DOUBLE PRECISION,"
		     " standardised_on TEXT, valid_until TEXT,"
		     " status TEXT NOT NULL, reason TEXT,"
		     " PRIMARY KEY (run_id, pos)", 2},
	/* version 3: signatures and certificates, links of the chain */
	{"signatures", "seq BIGINT PRIMARY KEY, run_id TEXT NOT NULL,"
		       " name TEXT NOT NULL, role TEXT NOT NULL,"
		       " meaning TEXT NOT NULL, reason TEXT NOT NULL,"
		       " signed_utc TEXT NOT NULL, os_user TEXT,"
		       " self_approval BIGINT NOT NULL, run_hash TEXT NOT NULL,"
		       " prev_hash TEXT NOT NULL, hash TEXT NOT NULL", 3},
	{"certificates", "seq BIGINT PRIMARY KEY,"
			 " certificate_id TEXT NOT NULL UNIQUE,"
			 " product TEXT, lot TEXT NOT NULL, run_id TEXT NOT NULL,"
			 " signature_seq BIGINT NOT NULL, customer TEXT,"
			 " issued_utc TEXT NOT NULL, replaces TEXT,"
			 " content_sha256 TEXT NOT NULL,"
			 " prev_hash TEXT NOT NULL, hash TEXT NOT NULL", 3},
};

static const db_statement extra[] = {
	{"CREATE INDEX run_inputs_sha256 ON run_inputs (sha256)", 2},
	{"CREATE INDEX results_product ON results (product)", 2},
	{"INSERT INTO head VALUES (1, 0, "
	 "'0000000000000000000000000000000000000000000000000000000000000000')",
	 2},
	{"CREATE INDEX signatures_run ON signatures (run_id)", 3},
	{"CREATE INDEX certificates_lot ON certificates (lot)", 3},
};

/* The covered tables' names; verify reads a run's rows of each back
 * in pos order. */
static const char *const covered[N_COVERED] = {"run_inputs", "replicates",
					       "results", "titrants"};

/* A row into the hash, each value tagged with its type: N; I<integer>;
 * R<16 hex digits of the IEEE 754 bits>; T<bytes>:<text>; the row ends
 * in '\n'. Written into a buffer, hashed in one piece. */
void
store_hash_row(struct sha256_ctx *h, const db_value *v, int n)
{
	static const char hex[] = "0123456789abcdef";
	char buf[1024];
	size_t len = 0;

	for (int c = 0; c < n; c++) {
		uint64_t bits;

		if (len > sizeof buf - 64) {
			sha256_update(h, len, (const uint8_t *)buf);
			len = 0;
		}
		switch (v[c].type) {
		case DB_NULL:
			buf[len++] = 'N';
			break;
		case DB_INT:
			len += (size_t)snprintf(buf + len, sizeof buf - len,
						"I%lld", v[c].i);
			break;
		case DB_REAL:
			memcpy(&bits, &v[c].r, sizeof bits);
			buf[len++] = 'R';
			for (int k = 60; k >= 0; k -= 4)
				buf[len++] = hex[(bits >> k) & 15];
			break;
		default:
			len += (size_t)snprintf(buf + len, sizeof buf - len,
						"T%zu:", v[c].len);
			sha256_update(h, len, (const uint8_t *)buf);
			sha256_update(h, v[c].len, (const uint8_t *)v[c].t);
			len = 0;
		}
		buf[len++] = ';';
	}
	buf[len++] = '\n';
	sha256_update(h, len, (const uint8_t *)buf);
}

/* The covered tables up to table named in the hash (each name and
 * '\n' before its rows, an empty table's name too). */
static void
hash_tables_to(struct sha256_ctx *h, int *at, int table)
{
	while (*at < table) {
		const char *name = covered[++*at];

		sha256_update(h, strlen(name), (const uint8_t *)name);
		sha256_update(h, 1, (const uint8_t *)"\n");
	}
}

/* The start of a run's hash: the format's name, then its fields. */
static void
hash_run_fields(struct sha256_ctx *h, const db_value *run)
{
	sha256_init(h);
	sha256_update(h, 16, (const uint8_t *)"acidlot-store-2\n");
	store_hash_row(h, run, RUN_HASHED);
}

/* One row of the run into a covered table, hashed as it goes in. */
static int
put_row(store *s, int table, const db_value *v, int n)
{
	if (table < s->table) { /* the order the hash is defined by */
		cli_error("store: %s written after %s", covered[table],
			  covered[s->table]);
		return -1;
	}
	hash_tables_to(&s->h, &s->table, table);
	store_hash_row(&s->h, v, n);
	return db_insert(s->db, covered[table], v, n);
}

store *
store_open(const char *path, int create)
{
	store *s = al_calloc(1, sizeof *s);
	int version;

	if (s == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	if ((s->db = db_open(path, create)) == NULL ||
	    db_create(s->db, tables, sizeof tables / sizeof tables[0], "head",
		      extra, sizeof extra / sizeof extra[0], STORE_VERSION,
		      &version) != 0) {
		store_close(s);
		return NULL;
	}
	if (version != STORE_VERSION) {
		cli_error("%s: not an acidlot store of version %d (it says %d)",
			  path, STORE_VERSION, version);
		store_close(s);
		return NULL;
	}
	return s;
}

void
store_close(store *s)
{
	if (s == NULL)
		return;
	db_close(s->db);
	al_free(s->inputs);
	al_free(s);
}

/* The chain's head: the last run's number and hash (0 and 64 zeros
 * before the first run). 0, or -1 after a message. */
int
store_read_head(db *d, long long *seq, char hash[65])
{
	db_query *q = db_query_open(d, "SELECT seq, hash FROM head", NULL, 0);
	const db_value *row;
	int n, rc;

	if (q == NULL)
		return -1;
	rc = db_next(q, &row, &n);
	if (rc == 1 && n == 2 && row[0].type == DB_INT &&
	    row[1].type == DB_TEXT && row[1].len == 64) {
		*seq = row[0].i;
		memcpy(hash, row[1].t, 64);
		hash[64] = '\0';
	} else if (rc >= 0) {
		rc = -1;
		cli_error("store: its head row is missing or damaged");
	}
	db_query_close(q);
	return rc < 0 ? -1 : 0;
}

int
store_begin(store *s)
{
	if (db_begin_write(s->db) != 0)
		return -1;
	if (store_read_head(s->db, &s->seq, s->prev) != 0) {
		db_rollback(s->db);
		return -1;
	}
	s->seq++;
	return 0;
}

int
store_input_seen(store *s, const char *sha256, char *run_id, size_t cap)
{
	db_value v = text_value(sha256);
	db_query *q = db_query_open(
		s->db, "SELECT run_id FROM run_inputs WHERE sha256 = ?1 LIMIT 1",
		&v, 1);
	const db_value *row;
	int n, rc;

	if (q == NULL)
		return -1;
	rc = db_next(q, &row, &n);
	if (rc == 1)
		snprintf(run_id, cap, "%.*s", (int)row[0].len, row[0].t);
	db_query_close(q);
	return rc;
}

/* The run's inputs as one text: "name sha256:HEX; ...". */
static char *
inputs_text(const store_run *r)
{
	size_t cap = 1, len = 0;
	char *text;

	for (size_t i = 0; i < r->n_inputs; i++)
		cap += strlen(r->inputs[i].name) + 64 + 16;
	if ((text = al_malloc(cap)) == NULL)
		return NULL;
	text[0] = '\0';
	for (size_t i = 0; i < r->n_inputs; i++)
		len += (size_t)snprintf(text + len, cap - len, "%s%s sha256:%s",
					i ? "; " : "", r->inputs[i].name,
					r->inputs[i].sha256);
	return text;
}

int
store_start_run(store *s, const store_run *r)
{
	const char *fields[] = {r->run_id, r->started_utc, r->analyst,
				r->os_user, r->command, r->version,
				NULL /* inputs */, r->reason, s->prev};

	if ((s->inputs = inputs_text(r)) == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	fields[6] = s->inputs;
	s->run[0] = int_value(s->seq);
	for (int i = 0; i < 9; i++)
		s->run[i + 1] = text_value(fields[i]);
	hash_run_fields(&s->h, s->run);
	s->table = -1;
	s->replicates = 0;
	for (size_t i = 0; i < r->n_inputs; i++) {
		db_value v[4] = {s->run[1], int_value((long long)i),
				 text_value(r->inputs[i].name),
				 text_value(r->inputs[i].sha256)};

		if (put_row(s, T_INPUTS, v, 4) != 0)
			return -1;
	}
	return 0;
}

int
store_add_replicate(store *s, const al_replicate *rep)
{
	char flags[512];

	al_flags_format(rep->flags, rep->endpoint_ph_needed, flags,
			sizeof flags);
	db_value v[] = {
		s->run[1],
		int_value(s->replicates++),
		text_value(rep->file),
		int_value((long long)rep->line),
		text_value(rep->product),
		text_value(rep->lot),
		text_value(rep->sample),
		text_value(rep->replicate),
		real_value(1, rep->meq),
		real_value(1, rep->value),
		text_value(al_unit_name(rep->unit)),
		text_value(flags),
		text_value(rep->curve),
		text_value(rep->mode),
	};
	return put_row(s, T_REPLICATES, v, (int)(sizeof v / sizeof v[0]));
}

/* One result's row, its texts in id, flags and day. */
static int
put_result(store *s, size_t i, const al_group_result *r, const char *prefix)
{
	const al_spec *sp = r->spec;
	const al_summary *m = &r->stats;
	char id[64], flags[512], day[11];

	snprintf(id, sizeof id, "%s-%04zu", prefix, i + 1);
	al_flags_format(r->flags, r->endpoint_ph_needed, flags, sizeof flags);
	if (r->has_date)
		al_date_format(r->date, day);
	db_value v[] = {
		s->run[1],
		int_value((long long)i),
		text_value(id),
		text_value(r->product),
		text_value(r->lot),
		text_value(r->sample),
		text_value(r->acid->name),
		text_value(al_unit_name(r->unit)),
		int_value((long long)m->n),
		real_value(m->n > 0, m->mean),
		real_value(m->has_sd, m->sd),
		real_value(m->has_rsd, m->rsd_pct),
		real_value(m->has_sd, m->ci_low),
		real_value(m->has_sd, m->ci_high),
		real_value(sp && sp->has_min, sp ? sp->min : 0),
		real_value(sp && sp->has_max, sp ? sp->max : 0),
		text_value(al_verdict_name(r->verdict)),
		text_value(flags),
		real_value(r->has_median, r->median),
		real_value(r->has_grubbs, r->grubbs_g),
		real_value(r->has_dixon, r->dixon_q),
		real_value(m->n > 1, r->range),
		real_value(r->has_critical_range, r->critical_range),
		real_value(r->has_horrat, r->horrat),
		real_value(r->has_u, r->u),
		real_value(r->has_u, r->U),
		real_value(r->has_u, r->k),
		real_value(r->has_brix, r->brix),
		real_value(r->has_brix_corrected, r->brix_corrected),
		real_value(r->has_ratio, r->ratio),
		real_value(r->has_water, r->water_pct),
		text_value(r->anhydrous ? "anhydrous" : "as-is"),
		text_value(r->has_date ? day : NULL),
	};
	return put_row(s, T_RESULTS, v, (int)(sizeof v / sizeof v[0]));
}

int
store_add_results(store *s, const al_assay *run, const char *prefix)
{
	for (size_t i = 0; i < al_assay_group_count(run); i++)
		if (put_result(s, i, al_assay_result(run, i), prefix) != 0)
			return -1;
	return 0;
}

int
store_add_titrant(store *s, long pos, const al_std_lot *l, double k,
		  long valid_until)
{
	char on[11], until[11];

	al_date_format(l->date, on);
	al_date_format(valid_until, until);
	db_value v[] = {
		s->run[1],
		int_value(pos),
		text_value(l->lot),
		text_value(l->standard->name),
		int_value((long long)l->n),
		real_value(1, l->mean),
		real_value(l->has_sd, l->sd),
		real_value(l->has_sd, l->rsd_pct),
		real_value(1, l->budget.u),
		real_value(1, l->U),
		real_value(1, k),
		text_value(on),
		text_value(until),
		text_value(l->valid ? "accepted" : "rejected"),
		text_value(l->valid ? NULL : l->why),
	};
	return put_row(s, T_TITRANTS, v, (int)(sizeof v / sizeof v[0]));
}

int
store_advance_head(db *d, long long seq, const char *hash)
{
	db_value head[2] = {int_value(seq), text_value(hash)};

	return db_exec(d, "UPDATE head SET seq = ?1, hash = ?2 WHERE one = 1",
		       head, 2);
}

int
store_commit(store *s)
{
	hash_tables_to(&s->h, &s->table, N_COVERED - 1);
	sha256_ctx_hex(&s->h, s->hash);
	s->run[RUN_HASHED] = text_value(s->hash);
	if (db_insert(s->db, "runs", s->run, RUN_COLUMNS) != 0 ||
	    store_advance_head(s->db, s->seq, s->hash) != 0 ||
	    db_commit(s->db) != 0) {
		db_rollback(s->db);
		return -1;
	}
	return 0;
}

void
store_rollback(store *s)
{
	db_rollback(s->db);
}

/* A count from a query of one number, or -1 after a message. */
long long
store_count(db *d, const char *sql, const db_value *params, int n)
{
	db_query *q = db_query_open(d, sql, params, n);
	const db_value *row;
	long long c = -1;
	int cols;

	if (q && db_next(q, &row, &cols) == 1 && row[0].type == DB_INT)
		c = row[0].i;
	db_query_close(q);
	return c;
}

/* Recomputes one run's hash from its stored rows (run, the runs row as
 * read) into hex. 0, or -1 after a message. */
int
store_rehash_run(db *d, const db_value *run, char hex[65])
{
	struct sha256_ctx h;
	int at = -1;

	hash_run_fields(&h, run);
	for (int t = 0; t < N_COVERED; t++) {
		const db_value *row;
		char sql[96];
		db_query *q;
		int n, rc;

		snprintf(sql, sizeof sql, "SELECT * FROM %s WHERE run_id = ?1 "
					  "ORDER BY pos",
			 covered[t]);
		if ((q = db_query_open(d, sql, &run[1], 1)) == NULL)
			return -1;
		hash_tables_to(&h, &at, t);
		while ((rc = db_next(q, &row, &n)) == 1)
			store_hash_row(&h, row, n);
		db_query_close(q);
		if (rc < 0)
			return -1;
	}
	sha256_ctx_hex(&h, hex);
	return 0;
}

