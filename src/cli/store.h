/* acidlot command line: the lab's results store, an append-only
 * database (an SQLite file, or PostgreSQL through a postgresql:// URI)
 * whose runs are chained by SHA-256 (docs/store.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_STORE_H
#define ACIDLOT_CLI_STORE_H

#include "acidlot/acidlot.h"

typedef struct store store;

/* The schema's version (PRAGMA user_version). */
#define STORE_VERSION 3

/* Opens the store at path, an SQLite file (created on first use when
 * create is 1) or a postgresql:// URI; the schema made on first use.
 * NULL after a message. Parallel runs wait for each other. */
store *store_open(const char *path, int create);
void store_close(store *s);

/* An input file of a run: its name and SHA-256 in hex. */
typedef struct store_input {
	const char *name;
	char sha256[65];
} store_input;

/* A run's own fields (the runs table). */
typedef struct store_run {
	const char *run_id, *started_utc, *analyst, *os_user, *command;
	const char *version, *reason; /* reason NULL unless a re-run */
	const store_input *inputs;
	size_t n_inputs;
} store_run;

/* Begins a run's transaction (holding the store's write lock until
 * store_commit or store_rollback) and reads the chain's head; 0, or -1
 * after a message. */
int store_begin(store *s);
/* With the transaction begun: the earlier run that stored an input of
 * this SHA-256, into run_id (cap bytes); 1 found, 0 none, -1 after a
 * message. */
int store_input_seen(store *s, const char *sha256, char *run_id, size_t cap);
/* The run's own fields and its inputs, after the checks; r's texts
 * stay valid until the commit. Then, in this order, the replicates
 * (each as it is read), the results, or the titrant lots: each 0, or
 * -1 after a message. */
int store_start_run(store *s, const store_run *r);
int store_add_replicate(store *s, const al_replicate *rep);
int store_add_results(store *s, const al_assay *run,
		      const char *report_id_prefix);
/* A standardised titrant lot (standardize), its valid_until a day
 * number. */
int store_add_titrant(store *s, long pos, const al_std_lot *l, double k,
		      long valid_until);
/* The run's row (with its hash) and the chain's head written, and the
 * transaction committed (0); after a failure it is rolled back. */
int store_commit(store *s);
void store_rollback(store *s);

/* One stored result of a product, for a trend. */
typedef struct store_point {
	char lot[96], sample[96], date[11]; /* date "" when none */
	char unit[16];
	double value;
	int has_min, has_max;
	double spec_min, spec_max;
} store_point;

/* The results of product with a value of quantity (mean, sd or rsd_pct),
 * dated from..to (each NULL for no bound; a result without a date is
 * dated by its run's start), ordered by date, run start and report
 * order: *n points in *out (al_free it). 0, or -1 after a message. */
int store_points(store *s, const char *product, const char *quantity,
		 const char *from, const char *to, store_point **out,
		 size_t *n);

/* A signature (acidlot sign): who, in what role, meaning reviewed,
 * approved or rejected, why. */
typedef struct store_signature {
	const char *run_id, *name, *role, *meaning, *reason, *os_user;
	int allow_self; /* --allow-self-approval */
} store_signature;

/* The signature appended as the chain's next link, its time in when
 * (UTC). Refused, after a message (-1): a run not in the store or no
 * longer matching its hash; the same name and meaning on the run
 * twice; an approval by the run's analyst unless allow_self (then
 * stored with it). 0 signed. */
int store_sign(store *s, const store_signature *g, char when[32]);

/* A run as acidlot runs lists it. */
typedef struct store_run_info {
	long long seq;
	char run_id[32], started_utc[32], analyst[128], command[32];
	char statuses[256];   /* "6 pass; 5 fail; ..." */
	char titrants[64];    /* "3 titrant lots" (standardize) */
	char signatures[1024]; /* "approved by NAME (ROLE) TIME; ..." */
} store_run_info;

/* The runs with a result of lot and of product (each NULL: any), in
 * order: *n of them in *out (al_free it). 0, or -1 after a message. */
int store_list_runs(store *s, const char *lot, const char *product,
		    store_run_info **out, size_t *n);

/* A result of a lot as its certificate shows it. */
typedef struct store_result {
	char sample[96], acid[32], unit[16], status[24], flags[256];
	char date[11], basis[16];
	long n;
	int has_mean, has_u, has_min, has_max;
	double mean, U, k, spec_min, spec_max;
} store_result;

/* What a certificate of a lot is made from: lot and product (product
 * "" when not given: the lot's one product), then what
 * store_certificate_begin finds. */
typedef struct store_lot {
	char lot[96], product[96];
	long long seq; /* the certificate's link */
	char certificate_id[32], issued_utc[32];
	char run_id[32], started_utc[32], analyst[128], command[4096];
	int approved; /* 0 only for a draft of an unapproved run */
	char approver[128], approver_role[128], approved_utc[32];
	long long signature_seq;
	char replaces[32], replaces_issued[32]; /* "" when none */
	store_result *results; /* n of them (al_free it) */
	size_t n;
} store_lot;

/* The store's write lock taken and the lot's latest approved run (for a
 * draft: its latest run) and its results read into l; refused, after a
 * message, when the lot has no approved run (and draft is 0), has
 * results of several products and no product was given, or its run no
 * longer matches its hash. 0, or -1 (then nothing is held). */
int store_certificate_begin(store *s, store_lot *l, int draft);
/* The certificate kept as the chain's next link (its file's SHA-256
 * given) and committed: 0, or -1 after a message. A draft is not kept:
 * store_rollback instead. */
int store_certificate_commit(store *s, const store_lot *l,
			     const char *customer, const char *content_sha256);

/* Recomputes the chain: 0 intact (with the counts), 1 broken (the run
 * named in *first_bad, cap bytes, and why in *why), -1 after a
 * message. */
int store_verify(store *s, unsigned long *runs, unsigned long *results,
		 char *first_bad, char *why, size_t cap);

#endif
