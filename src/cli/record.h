/* acidlot command line: the record of a run (JSON) and file hashing.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_RECORD_H
#define ACIDLOT_CLI_RECORD_H

#include <jansson.h>
#include <nettle/sha2.h>
#include <pthread.h>
#include <stdio.h>

#include "acidlot/acidlot.h"

/* A source that hashes and counts what it reads, for al_csv_read. */
typedef struct hashing_reader {
	FILE *in;
	struct sha256_ctx ctx;
	unsigned long long bytes;
} hashing_reader;

void hashing_reader_init(hashing_reader *h, FILE *in);
size_t hashing_read(void *ctx, void *buf, size_t cap, int *failed);
void hashing_reader_hex(hashing_reader *h, char hex[65]);
/* The digest of ctx in lower-case hex (ctx is reset, as by
 * sha256_digest). */
void sha256_ctx_hex(struct sha256_ctx *ctx, char hex[65]);

/* SHA-256 of a whole file; 0 on success. */
int sha256_file(const char *path, char hex[65], unsigned long long *bytes);

/* The SHA-256 of a few files whose bytes are all written, taken by a
 * thread of its own while the caller does other work (the outputs'
 * fsyncs); where no thread can be had, at once. Set path[] and n, then
 * start; finish (once, after start) gives 0 when every file was hashed. */
#define FILE_HASHES_MAX 5
typedef struct file_hashes {
	const char *path[FILE_HASHES_MAX];
	size_t n;
	char hex[FILE_HASHES_MAX][65];
	unsigned long long bytes[FILE_HASHES_MAX];
	int large; /* the run's input is 1 MiB or more: hash in a thread */
	int failed, threaded;
	pthread_t th;
} file_hashes;

void file_hashes_start(file_hashes *h);
int file_hashes_finish(file_hashes *h);

typedef struct run_record {
	json_t *root;
	json_t *inputs, *outputs;
	long today;  /* day number of the run (UTC) */
	char id[16]; /* the run's report id, set by record_seal */
} run_record;

/* s as a JSON string for the record, which is UTF-8: a byte that does
 * not begin a valid UTF-8 sequence (a name from a Latin-1 file, say)
 * becomes U+FFFD, the replacement character (the Unicode Standard, 3.9,
 * "U+FFFD substitution of maximal subparts", one byte at a time here).
 * NULL when memory runs out; json_pack's "o" takes it. */
json_t *record_text(const char *s);

/* A decision rule (ILAC G8:09/2019) as the record and the certificate
 * state it: simple or guarded acceptance. */
typedef struct record_rule {
	const char *name, *reference, *statement;
} record_rule;
const record_rule *record_rule_of(int guarded);

/* Now in UTC as YYYY-MM-DDTHH:MM:SSZ (SOURCE_DATE_EPOCH when set, as
 * for a record): 0, or -1 after saying why SOURCE_DATE_EPOCH is
 * refused. */
int record_now(char when[32]);

/* Starts a record: program, version, command line, UTC time (or
 * SOURCE_DATE_EPOCH when set, for reproducible tests), analyst. 0 on
 * success, -1 out of memory, -2 when SOURCE_DATE_EPOCH is refused (said
 * on stderr). */
int record_start(run_record *r, const char *command, int argc, char **argv,
		 const char *analyst);
int record_input(run_record *r, const char *role, const char *path,
		 unsigned long long bytes, long rows, const char *sha256);
/* The same for a file read whole before: hashed again here; 0, or -1
 * after a message. */
int record_hash_input(run_record *r, const char *role, const char *path,
		      long rows);
/* Lists an output under its path, hashing the bytes now at written_path
 * (its temporary file before the rename). */
int record_output(run_record *r, const char *role, const char *path,
		  const char *written_path);
/* An output written in place (a device, a FIFO, standard output), not
 * read back and so not hashed: listed with sha256 null. verify skips
 * it and says why. */
int record_output_unhashed(run_record *r, const char *role,
			   const char *path);
/* The same with its hash and size known (file_hashes). */
int record_output_hashed(run_record *r, const char *role, const char *path,
			 const char *hex, unsigned long long bytes);
/* Derives the run's id from the time, command line and input hashes, and
 * stores it ("report_id"). */
int record_seal(run_record *r);
/* Writes the record as JSON to path through an output file not yet in
 * place (*file, for the caller to commit or abort); 0 on success. */
int record_write(run_record *r, const char *path, al_outfile **file);
void record_free(run_record *r);

/* Sets jansson to allocate through al_malloc/al_free. */
void record_use_library_alloc(void);

/* The bytes of a file name the record keeps in hex under key (a name
 * that is not UTF-8), into out (cap bytes); NULL when there are none. */
const char *record_name(json_t *f, const char *key, char *out, size_t cap);
/* How verify hashes a file: 0 and its SHA-256 in hex, or -1. */
typedef int (*cli_hash_fn)(const char *path, char hex[65],
			   unsigned long long *bytes);
/* Checks the files a record (its parsed JSON) names against their
 * hashes, writing a CSV line for each into out (none when out is NULL):
 * the count that changed or are missing, or -1 when it is no record. */
int cli_verify_root(FILE *out, json_t *root, const char *record,
		    cli_hash_fn hash);

#endif
