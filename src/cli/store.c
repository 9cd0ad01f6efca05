/* acidlot command line: the results store on SQLite (docs/store.md).
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Append-only: triggers refuse UPDATE and DELETE. Each run's hash is
 * SHA-256 over the previous run's hash and a canonical serialisation of
 * the run's rows as the database holds them (read back with the same
 * code that verify uses), so that a row changed, added or deleted after
 * the run breaks the chain at that run. */
#define _XOPEN_SOURCE 700
#include <nettle/sha2.h>
#include <sqlite3.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "store.h"

struct store {
	sqlite3 *db;
	const char *path;
	sqlite3_stmt *rep; /* the insert of a replicate */
	long pos;	   /* of the next replicate of the run */
};

static const char schema[] =
	"CREATE TABLE runs(seq INTEGER PRIMARY KEY AUTOINCREMENT,"
	" run_id TEXT NOT NULL UNIQUE, started_utc TEXT NOT NULL,"
	" analyst TEXT, os_user TEXT, command TEXT NOT NULL,"
	" version TEXT NOT NULL, inputs TEXT NOT NULL, reason TEXT,"
	" prev_hash TEXT NOT NULL, hash TEXT NOT NULL);"
	"CREATE TABLE run_inputs(run_id TEXT NOT NULL, pos INTEGER NOT NULL,"
	" name TEXT NOT NULL, sha256 TEXT NOT NULL);"
	"CREATE INDEX run_inputs_sha256 ON run_inputs(sha256);"
	"CREATE TABLE results(run_id TEXT NOT NULL, pos INTEGER NOT NULL,"
	" report_id TEXT NOT NULL, product TEXT, lot TEXT, sample TEXT,"
	" acid TEXT, unit TEXT, n INTEGER NOT NULL, mean REAL, sd REAL,"
	" rsd_pct REAL, ci95_low REAL, ci95_high REAL, spec_min REAL,"
	" spec_max REAL, status TEXT NOT NULL, flags TEXT, median REAL,"
	" grubbs_g REAL, dixon_q REAL, \"range\" REAL, critical_range REAL,"
	" horrat REAL, u REAL, expanded_u REAL, k REAL, brix REAL,"
	" brix_corrected REAL, brix_acid_ratio REAL, water_pct REAL,"
	" basis TEXT, date TEXT);"
	"CREATE INDEX results_run ON results(run_id, pos);"
	"CREATE INDEX results_product ON results(product);"
	"CREATE TABLE replicates(run_id TEXT NOT NULL, pos INTEGER NOT NULL,"
	" file TEXT, line INTEGER, product TEXT, lot TEXT, sample TEXT,"
	" replicate TEXT, meq REAL, value REAL, unit TEXT, flags TEXT,"
	" curve TEXT, endpoint_mode TEXT);"
	"CREATE INDEX replicates_run ON replicates(run_id, pos);"
	"CREATE TABLE titrants(run_id TEXT NOT NULL, pos INTEGER NOT NULL,"
	" titrant_lot TEXT NOT NULL, standard TEXT, n INTEGER NOT NULL,"
	" concentration_mol_l REAL, sd_mol_l REAL, rsd_pct REAL,"
	" u_mol_l REAL, expanded_u_mol_l REAL, k REAL, standardised_on TEXT,"
	" valid_until TEXT, status TEXT NOT NULL, reason TEXT);"
	"CREATE INDEX titrants_run ON titrants(run_id, pos);";

/* The tables a run's hash covers, in the hash's order, each with the
 * query verify and the append both read it back by. */
static const char *const covered[][2] = {
	{"run_inputs", "SELECT * FROM run_inputs WHERE run_id = ?1 ORDER BY pos"},
	{"results", "SELECT * FROM results WHERE run_id = ?1 ORDER BY pos"},
	{"replicates", "SELECT * FROM replicates WHERE run_id = ?1 ORDER BY pos"},
	{"titrants", "SELECT * FROM titrants WHERE run_id = ?1 ORDER BY pos"},
};

/* The run's own fields as hashed: the runs row but seq and hash. */
#define RUN_FIELDS                                                           \
	"run_id, started_utc, analyst, os_user, command, version, inputs, "   \
	"reason, prev_hash"

static int
fail(store *s, const char *what)
{
	cli_error("%s: store: %s: %s", s->path, what,
		  s->db ? sqlite3_errmsg(s->db) : "cannot open");
	return -1;
}

/* A statement prepared, or -1 after a message. */
static int
prepare(store *s, const char *sql, sqlite3_stmt **st)
{
	return sqlite3_prepare_v2(s->db, sql, -1, st, NULL) == SQLITE_OK
		       ? 0
		       : fail(s, "prepare");
}

static int
exec(store *s, const char *sql)
{
	return sqlite3_exec(s->db, sql, NULL, NULL, NULL) == SQLITE_OK
		       ? 0
		       : fail(s, sql);
}

/* The schema and its append-only triggers, on first use. */
static int
create_schema(store *s)
{
	static const char *const tables[] = {"runs", "run_inputs", "results",
					     "replicates", "titrants"};
	sqlite3_stmt *st;
	int version = -1;
	char sql[256];

	if (exec(s, "BEGIN IMMEDIATE") != 0)
		return -1;
	if (sqlite3_prepare_v2(s->db, "PRAGMA user_version", -1, &st, NULL) ==
		    SQLITE_OK &&
	    sqlite3_step(st) == SQLITE_ROW)
		version = sqlite3_column_int(st, 0);
	sqlite3_finalize(st);
	if (version == 0) {
		if (exec(s, schema) != 0)
			return exec(s, "ROLLBACK"), -1;
		for (size_t i = 0; i < 5; i++)
			for (int del = 0; del < 2; del++) {
				snprintf(sql, sizeof sql,
					 "CREATE TRIGGER %s_no_%s BEFORE %s ON %s "
					 "BEGIN SELECT RAISE(ABORT, 'the store is "
					 "append-only'); END",
					 tables[i], del ? "delete" : "update",
					 del ? "DELETE" : "UPDATE", tables[i]);
				if (exec(s, sql) != 0)
					return exec(s, "ROLLBACK"), -1;
			}
		snprintf(sql, sizeof sql, "PRAGMA user_version = %d",
			 STORE_VERSION);
		if (exec(s, sql) != 0)
			return exec(s, "ROLLBACK"), -1;
		version = STORE_VERSION;
	}
	if (exec(s, "COMMIT") != 0)
		return -1;
	if (version != STORE_VERSION) {
		cli_error("%s: not an acidlot store of version %d (it says %d)",
			  s->path, STORE_VERSION, version);
		return -1;
	}
	return 0;
}

store *
store_open(const char *path, int create)
{
	store *s = al_calloc(1, sizeof *s);

	if (s == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	s->path = path;
	if (sqlite3_open_v2(path, &s->db,
			    SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX |
				    (create ? SQLITE_OPEN_CREATE : 0),
			    NULL) != SQLITE_OK ||
	    sqlite3_busy_timeout(s->db, 600000) != SQLITE_OK ||
	    exec(s, "PRAGMA journal_mode = WAL") != 0 ||
	    exec(s, "PRAGMA synchronous = FULL") != 0 ||
	    exec(s, "PRAGMA cache_size = -65536") != 0 ||
	    create_schema(s) != 0) {
		if (s->db && sqlite3_errcode(s->db) != SQLITE_OK)
			fail(s, "open");
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
	sqlite3_finalize(s->rep);
	sqlite3_close(s->db);
	al_free(s);
}

int
store_begin(store *s)
{
	s->pos = 0;
	if (exec(s, "BEGIN IMMEDIATE") != 0)
		return -1;
	return prepare(s,
		       "INSERT INTO replicates VALUES (?1, ?2, ?3, ?4, ?5, ?6, "
		       "?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14)",
		       &s->rep);
}

int
store_input_seen(store *s, const char *sha256, char *run_id, size_t cap)
{
	sqlite3_stmt *st;
	int rc;

	if (prepare(s, "SELECT run_id FROM run_inputs WHERE sha256 = ?1 "
			       "LIMIT 1", &st) != 0)
		return -1;
	sqlite3_bind_text(st, 1, sha256, -1, SQLITE_STATIC);
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW)
		snprintf(run_id, cap, "%s", sqlite3_column_text(st, 0));
	sqlite3_finalize(st);
	if (rc != SQLITE_ROW && rc != SQLITE_DONE)
		return fail(s, "select");
	return rc == SQLITE_ROW;
}

/* Binds text, or NULL for a NULL or empty one. */
static void
bind_text(sqlite3_stmt *st, int i, const char *s)
{
	if (s && *s)
		sqlite3_bind_text(st, i, s, -1, SQLITE_TRANSIENT);
	else
		sqlite3_bind_null(st, i);
}

static void
bind_real(sqlite3_stmt *st, int i, int has, double v)
{
	if (has)
		sqlite3_bind_double(st, i, v);
	else
		sqlite3_bind_null(st, i);
}

static int
step_done(store *s, sqlite3_stmt *st, const char *what)
{
	int rc = sqlite3_step(st);

	sqlite3_reset(st);
	sqlite3_clear_bindings(st);
	return rc == SQLITE_DONE ? 0 : fail(s, what);
}

int
store_add_replicate(store *s, const char *run_id, const al_replicate *rep)
{
	sqlite3_stmt *st = s->rep;
	char flags[512];

	al_flags_format(rep->flags, rep->endpoint_ph_needed, flags,
			sizeof flags);
	bind_text(st, 1, run_id);
	sqlite3_bind_int64(st, 2, s->pos++);
	bind_text(st, 3, rep->file);
	sqlite3_bind_int64(st, 4, (sqlite3_int64)rep->line);
	bind_text(st, 5, rep->product);
	bind_text(st, 6, rep->lot);
	bind_text(st, 7, rep->sample);
	bind_text(st, 8, rep->replicate);
	sqlite3_bind_double(st, 9, rep->meq);
	sqlite3_bind_double(st, 10, rep->value);
	bind_text(st, 11, al_unit_name(rep->unit));
	bind_text(st, 12, flags);
	bind_text(st, 13, rep->curve);
	bind_text(st, 14, rep->mode);
	return step_done(s, st, "insert a replicate");
}

int
store_add_results(store *s, const char *run_id, const al_assay *run,
		  const char *prefix)
{
	sqlite3_stmt *st;
	int bad = 0;

	if (prepare(s, "INSERT INTO results VALUES (?1, ?2, ?3, ?4, ?5, "
			       "?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, "
			       "?16, ?17, ?18, ?19, ?20, ?21, ?22, ?23, ?24, "
			       "?25, ?26, ?27, ?28, ?29, ?30, ?31, ?32, ?33)", &st) != 0)
		return -1;
	for (size_t i = 0; !bad && i < al_assay_group_count(run); i++) {
		const al_group_result *r = al_assay_result(run, i);
		const al_spec *sp = r->spec;
		const al_summary *m = &r->stats;
		char id[64], flags[512];

		snprintf(id, sizeof id, "%s-%04zu", prefix, i + 1);
		al_flags_format(r->flags, r->endpoint_ph_needed, flags,
				sizeof flags);
		bind_text(st, 1, run_id);
		sqlite3_bind_int64(st, 2, (sqlite3_int64)i);
		bind_text(st, 3, id);
		bind_text(st, 4, r->product);
		bind_text(st, 5, r->lot);
		bind_text(st, 6, r->sample);
		bind_text(st, 7, r->acid->name);
		bind_text(st, 8, al_unit_name(r->unit));
		sqlite3_bind_int64(st, 9, (sqlite3_int64)m->n);
		bind_real(st, 10, m->n > 0, m->mean);
		bind_real(st, 11, m->has_sd, m->sd);
		bind_real(st, 12, m->has_rsd, m->rsd_pct);
		bind_real(st, 13, m->has_sd, m->ci_low);
		bind_real(st, 14, m->has_sd, m->ci_high);
		bind_real(st, 15, sp && sp->has_min, sp ? sp->min : 0);
		bind_real(st, 16, sp && sp->has_max, sp ? sp->max : 0);
		bind_text(st, 17, al_verdict_name(r->verdict));
		bind_text(st, 18, flags);
		bind_real(st, 19, r->has_median, r->median);
		bind_real(st, 20, r->has_grubbs, r->grubbs_g);
		bind_real(st, 21, r->has_dixon, r->dixon_q);
		bind_real(st, 22, m->n > 1, r->range);
		bind_real(st, 23, r->has_critical_range, r->critical_range);
		bind_real(st, 24, r->has_horrat, r->horrat);
		bind_real(st, 25, r->has_u, r->u);
		bind_real(st, 26, r->has_u, r->U);
		bind_real(st, 27, r->has_u, r->k);
		bind_real(st, 28, r->has_brix, r->brix);
		bind_real(st, 29, r->has_brix_corrected, r->brix_corrected);
		bind_real(st, 30, r->has_ratio, r->ratio);
		bind_real(st, 31, r->has_water, r->water_pct);
		bind_text(st, 32, r->anhydrous ? "anhydrous" : "as-is");
		if (r->has_date) {
			char day[11];

			al_date_format(r->date, day);
			bind_text(st, 33, day);
		} else
			sqlite3_bind_null(st, 33);
		bad = step_done(s, st, "insert a result") != 0;
	}
	sqlite3_finalize(st);
	return bad ? -1 : 0;
}

int
store_add_titrant(store *s, const char *run_id, long pos,
		  const al_std_lot *l, double k, long valid_until)
{
	sqlite3_stmt *st;
	char on[11], until[11];
	int bad;

	if (prepare(s, "INSERT INTO titrants VALUES (?1, ?2, ?3, ?4, ?5, "
			       "?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15)", &st) != 0)
		return -1;
	al_date_format(l->date, on);
	al_date_format(valid_until, until);
	bind_text(st, 1, run_id);
	sqlite3_bind_int64(st, 2, pos);
	bind_text(st, 3, l->lot);
	bind_text(st, 4, l->standard->name);
	sqlite3_bind_int64(st, 5, (sqlite3_int64)l->n);
	sqlite3_bind_double(st, 6, l->mean);
	bind_real(st, 7, l->has_sd, l->sd);
	bind_real(st, 8, l->has_sd, l->rsd_pct);
	sqlite3_bind_double(st, 9, l->budget.u);
	sqlite3_bind_double(st, 10, l->U);
	sqlite3_bind_double(st, 11, k);
	bind_text(st, 12, on);
	bind_text(st, 13, until);
	bind_text(st, 14, l->valid ? "accepted" : "rejected");
	bind_text(st, 15, l->valid ? NULL : l->why);
	bad = step_done(s, st, "insert a titrant lot") != 0;
	sqlite3_finalize(st);
	return bad ? -1 : 0;
}

/* Every row a query yields into the hash, each value tagged with its
 * type: N; I<integer>; R<16 hex digits of the IEEE 754 bits>;
 * T<bytes>:<text>; a row ends in '\n'. 0, or -1 on a database error. */
static int
hash_rows(struct sha256_ctx *h, sqlite3_stmt *st)
{
	int rc;

	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		for (int c = 0; c < sqlite3_column_count(st); c++) {
			char v[64];
			const unsigned char *t;
			int len;

			switch (sqlite3_column_type(st, c)) {
			case SQLITE_NULL:
				snprintf(v, sizeof v, "N;");
				break;
			case SQLITE_INTEGER:
				snprintf(v, sizeof v, "I%lld;",
					 (long long)sqlite3_column_int64(st, c));
				break;
			case SQLITE_FLOAT: {
				double d = sqlite3_column_double(st, c);
				uint64_t bits;

				memcpy(&bits, &d, sizeof bits);
				snprintf(v, sizeof v, "R%016llx;",
					 (unsigned long long)bits);
				break;
			}
			default:
				t = sqlite3_column_text(st, c);
				len = sqlite3_column_bytes(st, c);
				snprintf(v, sizeof v, "T%d:", len);
				sha256_update(h, strlen(v), (const uint8_t *)v);
				sha256_update(h, (size_t)len, t);
				snprintf(v, sizeof v, ";");
			}
			sha256_update(h, strlen(v), (const uint8_t *)v);
		}
		sha256_update(h, 1, (const uint8_t *)"\n");
	}
	return rc == SQLITE_DONE ? 0 : -1;
}

/* The hash of a run: "acidlot-store-1", then its own fields (the rows
 * of run, a query of one row), then each covered table's rows of it. */
static int
run_hash(store *s, sqlite3_stmt *run, const char *run_id, char hex[65])
{
	struct sha256_ctx h;
	uint8_t digest[SHA256_DIGEST_SIZE];
	int bad;

	sha256_init(&h);
	sha256_update(&h, 16, (const uint8_t *)"acidlot-store-1\n");
	bad = hash_rows(&h, run) != 0;
	for (size_t t = 0; !bad && t < sizeof covered / sizeof covered[0]; t++) {
		sqlite3_stmt *st;

		sha256_update(&h, strlen(covered[t][0]),
			      (const uint8_t *)covered[t][0]);
		sha256_update(&h, 1, (const uint8_t *)"\n");
		if (prepare(s, covered[t][1], &st) != 0)
			return -1;
		sqlite3_bind_text(st, 1, run_id, -1, SQLITE_STATIC);
		bad = hash_rows(&h, st) != 0;
		sqlite3_finalize(st);
	}
	if (bad)
		return fail(s, "read back");
	sha256_digest(&h, SHA256_DIGEST_SIZE, digest);
	for (int i = 0; i < SHA256_DIGEST_SIZE; i++)
		snprintf(hex + 2 * i, 3, "%02x", digest[i]);
	return 0;
}

/* The last run's hash, or 64 zeros for the first run. */
static int
last_hash(store *s, char hex[65])
{
	sqlite3_stmt *st;
	int rc;

	memset(hex, '0', 64);
	hex[64] = '\0';
	if (prepare(s, "SELECT hash FROM runs ORDER BY seq DESC LIMIT 1", &st) != 0)
		return -1;
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW)
		snprintf(hex, 65, "%s", sqlite3_column_text(st, 0));
	sqlite3_finalize(st);
	return rc == SQLITE_ROW || rc == SQLITE_DONE ? 0 : fail(s, "select");
}

/* The run's inputs, as one text and as rows of run_inputs. */
static int
add_inputs(store *s, const store_run *r, char *text, size_t cap)
{
	sqlite3_stmt *st;
	size_t len = 0;
	int bad = 0;

	text[0] = '\0';
	if (prepare(s, "INSERT INTO run_inputs VALUES (?1, ?2, ?3, ?4)", &st) != 0)
		return -1;
	for (size_t i = 0; !bad && i < r->n_inputs; i++) {
		if (len < cap)
			len += (size_t)snprintf(text + len, cap - len,
						"%s%s sha256:%s", i ? "; " : "",
						r->input_names[i],
						r->input_sha256[i]);
		bind_text(st, 1, r->run_id);
		sqlite3_bind_int64(st, 2, (sqlite3_int64)i);
		bind_text(st, 3, r->input_names[i]);
		bind_text(st, 4, r->input_sha256[i]);
		bad = step_done(s, st, "insert an input") != 0;
	}
	sqlite3_finalize(st);
	return bad ? -1 : 0;
}

int
store_add_run(store *s, const store_run *r)
{
	char prev[65], hash[65], inputs[8192];
	sqlite3_stmt *own, *ins;
	const char *v[9];
	int bad;

	if (last_hash(s, prev) != 0 ||
	    add_inputs(s, r, inputs, sizeof inputs) != 0)
		return -1;
	v[0] = r->run_id, v[1] = r->started_utc, v[2] = r->analyst;
	v[3] = r->os_user, v[4] = r->command, v[5] = r->version;
	v[6] = inputs, v[7] = r->reason, v[8] = prev;
	/* the run's fields hashed as a query of them yields them, the
	 * same way verify reads them back from the table */
	if (prepare(s, "SELECT ?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9", &own) != 0)
		return -1;
	for (int i = 0; i < 9; i++)
		bind_text(own, i + 1, v[i]);
	bad = run_hash(s, own, r->run_id, hash) != 0;
	sqlite3_finalize(own);
	if (bad)
		return -1;
	if (prepare(s,
		    "INSERT INTO runs (" RUN_FIELDS ", hash) VALUES (?1, ?2, "
		    "?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10)",
		    &ins) != 0)
		return -1;
	for (int i = 0; i < 9; i++)
		bind_text(ins, i + 1, v[i]);
	bind_text(ins, 10, hash);
	bad = step_done(s, ins, "insert the run") != 0;
	sqlite3_finalize(ins);
	return bad ? -1 : 0;
}

int
store_commit(store *s)
{
	sqlite3_finalize(s->rep);
	s->rep = NULL;
	return exec(s, "COMMIT");
}

void
store_rollback(store *s)
{
	sqlite3_finalize(s->rep);
	s->rep = NULL;
	sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
}

/* A count from a query of one number, or -1. */
static long
count_of(store *s, const char *sql)
{
	sqlite3_stmt *st;
	long n = -1;

	if (sqlite3_prepare_v2(s->db, sql, -1, &st, NULL) == SQLITE_OK &&
	    sqlite3_step(st) == SQLITE_ROW)
		n = (long)sqlite3_column_int64(st, 0);
	sqlite3_finalize(st);
	return n;
}

/* Rows of no run, or runs missing from the sequence (a run deleted, the
 * last one too: sqlite_sequence keeps the highest number ever given). */
static int
outside_chain(store *s, long runs, char *why, size_t cap)
{
	long ever = count_of(s, "SELECT coalesce(max(seq), 0) FROM "
				"sqlite_sequence WHERE name = 'runs'");
	long orphans = count_of(
		s, "SELECT (SELECT count(*) FROM results WHERE run_id NOT IN "
		   "(SELECT run_id FROM runs)) + (SELECT count(*) FROM "
		   "replicates WHERE run_id NOT IN (SELECT run_id FROM runs)) "
		   "+ (SELECT count(*) FROM run_inputs WHERE run_id NOT IN "
		   "(SELECT run_id FROM runs))");

	if (ever != runs) {
		snprintf(why, cap, "%ld run%s numbered but %ld in the store: a "
				   "run was deleted",
			 ever, ever == 1 ? "" : "s", runs);
		return 1;
	}
	if (orphans != 0) {
		snprintf(why, cap, "%ld row%s of no run", orphans,
			 orphans == 1 ? "" : "s");
		return 1;
	}
	return 0;
}

int
store_verify(store *s, unsigned long *runs, unsigned long *results,
	     char *first_bad, char *why, size_t cap)
{
	sqlite3_stmt *all, *own;
	char prev[65], hash[65];
	int rc, broken = 0;

	memset(prev, '0', 64);
	prev[64] = '\0';
	*runs = 0;
	first_bad[0] = why[0] = '\0';
	if (sqlite3_prepare_v2(s->db, "SELECT run_id, prev_hash, hash FROM runs "
				      "ORDER BY seq",
			       -1, &all, NULL) != SQLITE_OK ||
	    sqlite3_prepare_v2(s->db, "SELECT " RUN_FIELDS
				      " FROM runs WHERE run_id = ?1",
			       -1, &own, NULL) != SQLITE_OK)
		return sqlite3_finalize(all), fail(s, "prepare");
	while (!broken && (rc = sqlite3_step(all)) == SQLITE_ROW) {
		const char *id = (const char *)sqlite3_column_text(all, 0);
		const char *p = (const char *)sqlite3_column_text(all, 1);
		const char *h = (const char *)sqlite3_column_text(all, 2);

		sqlite3_bind_text(own, 1, id, -1, SQLITE_STATIC);
		if (run_hash(s, own, id, hash) != 0) {
			broken = -1;
			break;
		}
		sqlite3_reset(own);
		snprintf(first_bad, cap, "%s", id ? id : "(no id)");
		if (p == NULL || strcmp(p, prev) != 0) {
			snprintf(why, cap, "its prev_hash is not the hash of "
					   "the run before it");
			broken = 1;
		} else if (h == NULL || strcmp(h, hash) != 0) {
			snprintf(why, cap, "its data no longer match its hash");
			broken = 1;
		} else {
			snprintf(prev, sizeof prev, "%s", h);
			(*runs)++;
		}
	}
	sqlite3_finalize(all);
	sqlite3_finalize(own);
	if (broken < 0)
		return -1;
	if (broken)
		return 1;
	*results = (unsigned long)count_of(s, "SELECT count(*) FROM results");
	if (outside_chain(s, (long)*runs, why, cap)) {
		snprintf(first_bad, cap, "the store");
		return 1;
	}
	first_bad[0] = '\0';
	return 0;
}

/* Column i's text, "" for NULL. */
static const char *
text_at(sqlite3_stmt *st, int i)
{
	const unsigned char *t = sqlite3_column_text(st, i);

	return t ? (const char *)t : "";
}

int
store_points(store *s, const char *product, const char *quantity,
	     const char *from, const char *to, store_point **out, size_t *n)
{
	static const char *const allowed[] = {"mean", "sd", "rsd_pct"};
	char sql[1024];
	sqlite3_stmt *st;
	size_t cap = 0;
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
		 "substr(u.started_utc, 1, 10)), r.%s, r.spec_min, r.spec_max, "
		 "r.unit "
		 "FROM results r JOIN runs u ON u.run_id = r.run_id "
		 "WHERE r.product = ?1 AND r.%s IS NOT NULL "
		 "AND (?2 IS NULL OR coalesce(r.date, substr(u.started_utc, 1, "
		 "10)) >= ?2) AND (?3 IS NULL OR coalesce(r.date, "
		 "substr(u.started_utc, 1, 10)) <= ?3) "
		 "ORDER BY 3, u.started_utc, u.seq, r.pos",
		 quantity, quantity);
	if (prepare(s, sql, &st) != 0)
		return -1;
	bind_text(st, 1, product);
	bind_text(st, 2, from);
	bind_text(st, 3, to);
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		store_point *p;

		if (*n == cap) {
			store_point *grown;

			cap = 2 * cap + 64;
			grown = al_realloc(*out, cap * sizeof *grown);
			if (grown == NULL) {
				sqlite3_finalize(st);
				cli_error("%s", al_strerror(AL_ENOMEM));
				return -1;
			}
			*out = grown;
		}
		p = &(*out)[(*n)++];
		snprintf(p->lot, sizeof p->lot, "%s", text_at(st, 0));
		snprintf(p->sample, sizeof p->sample, "%s", text_at(st, 1));
		snprintf(p->date, sizeof p->date, "%s", text_at(st, 2));
		snprintf(p->unit, sizeof p->unit, "%s", text_at(st, 6));
		p->value = sqlite3_column_double(st, 3);
		p->has_min = sqlite3_column_type(st, 4) != SQLITE_NULL;
		p->spec_min = sqlite3_column_double(st, 4);
		p->has_max = sqlite3_column_type(st, 5) != SQLITE_NULL;
		p->spec_max = sqlite3_column_double(st, 5);
	}
	sqlite3_finalize(st);
	return rc == SQLITE_DONE ? 0 : fail(s, "select");
}
