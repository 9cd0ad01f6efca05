/* acidlot command line: the results store's parts (store.c appends a
 * run, store_check.c reads the chain back, store_sign.c appends
 * signatures): what they share. Not for other modules.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_STORE_INT_H
#define ACIDLOT_CLI_STORE_INT_H

#include <math.h>
#include <nettle/sha2.h>
#include <string.h>

#include "db.h"
#include "record.h"
#include "store.h"

/* The runs row: its fields, the last (hash) not hashed. */
enum { RUN_HASHED = 10, RUN_COLUMNS = 11 };

struct store {
	db *db;
	/* the run being appended */
	struct sha256_ctx h;
	int table;	 /* the covered table being hashed; -1 none yet */
	long long seq;	 /* the run's number */
	long replicates; /* written */
	db_value run[RUN_COLUMNS];
	char prev[65], hash[65];
	char *inputs; /* the runs.inputs text */
};

static inline db_value
text_value(const char *s)
{
	if (s == NULL || *s == '\0')
		return (db_value){.type = DB_NULL};
	return (db_value){.type = DB_TEXT, .t = s, .len = strlen(s)};
}

static inline db_value
int_value(long long i)
{
	return (db_value){.type = DB_INT, .i = i};
}

/* A number, NULL when it is undefined (has 0) or not finite. */
static inline db_value
real_value(int has, double r)
{
	if (!has || !isfinite(r))
		return (db_value){.type = DB_NULL};
	return (db_value){.type = DB_REAL, .r = r};
}

/* A row into a hash (docs/store.md: N; I<integer>; R<hex bits>;
 * T<bytes>:<text>; and '\n'); record.h's sha256_ctx_hex gives the
 * digest. */
void store_hash_row(struct sha256_ctx *h, const db_value *v, int n);
/* The chain's head: the last link's number and hash (0 and 64 zeros
 * before the first). 0, or -1 after a message. */
int store_read_head(db *d, long long *seq, char hash[65]);
/* The head moved on to the link seq of hash. */
int store_advance_head(db *d, long long seq, const char *hash);
/* A run's hash recomputed from its stored rows (run: its runs row as
 * read). 0, or -1 after a message. */
int store_rehash_run(db *d, const db_value *run, char hex[65]);
/* A count from a query of one number, or -1 after a message. */
long long store_count(db *d, const char *sql, const db_value *params,
		      int n);

/* Every row of a query into a growing array of items of size bytes,
 * each filled from its row: *items (al_free it), *count. 0, or -1
 * after a message. */
int store_rows(db *d, const char *sql, const db_value *params, int n,
	       size_t size, void (*fill)(void *item, const db_value *row),
	       void **items, size_t *count);

/* Column c's text into buf ("" for NULL). */
void store_text(const db_value *row, int c, char *buf, size_t cap);

/* row's n values copied into out, their texts into *storage (al_free
 * it): 0, or -1 when memory runs out (said). */
int store_copy_row(const db_value *row, int n, db_value *out,
		   char **storage);

/* The signatures and certificates tables' columns (store_sign.c):
 * the last two are prev_hash and hash; all but the hash are hashed. */
enum { SIGNATURE_COLUMNS = 12, CERTIFICATE_COLUMNS = 12 };
/* A signature's or a certificate's link hash from its row. */
void store_signature_hash(const db_value *row, char hex[65]);
void store_certificate_hash(const db_value *row, char hex[65]);

#endif
