/* acidlot: streaming CSV reader over libcsv, with physical line numbers.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CSVREAD_H
#define ACIDLOT_CSVREAD_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>

#include "acidlot/status.h"
#include "acidlot/text.h"


typedef struct al_csv_options {
	char delimiter;     /* ',' when 0; AL_CSV_AUTO to detect it */
	size_t max_field;   /* bytes; AL_CSV_MAX_FIELD when 0 */
	char decimal_point; /* '.' when 0; ',' needs another delimiter */
	int recover;        /* on a malformed record, hand it to the row
			       callback with syntax_error set and go on with
			       the next line, instead of stopping */
	int no_fast_path;   /* every record through libcsv, none through
			       the reader's own path for plain lines (for
			       tests that compare the two) */
} al_csv_options;

#define AL_CSV_MAX_FIELD 4096
/* Records longer than this, or with more fields, are refused. */
#define AL_CSV_MAX_RECORD (1024 * 1024)
#define AL_CSV_MAX_FIELDS 4096
/* delimiter value asking the reader to detect ',', ';' or tab from the
 * header line; a header holding more than one of them is an error. */
#define AL_CSV_AUTO 'A'

/* One record. fields[i] is NUL-terminated and lens[i] its length; both
 * are valid only during the callback. line is the physical line (1-based)
 * on which the record starts. */
typedef struct al_csv_row {
	size_t nfields;
	const char *const *fields;
	const size_t *lens;
	unsigned long line;
	const char *raw;  /* the record's bytes as in the file, without its */
	size_t raw_len;   /* line end */
	char delimiter;   /* the delimiter in force (detected or given) */
	const char *syntax_error; /* recover mode: why the record is malformed
				     (then nfields is 0); NULL otherwise */
	/* set by the reader's path for plain lines (0 says nothing):
	 * trimmed, every field is trimmed of blanks already (al_cell need
	 * not look); ascii, every byte of the record is below 0x80 (so it is
	 * valid UTF-8) */
	unsigned char trimmed, ascii;
} al_csv_row;

/* Called for every record that has at least one field. Blank lines are
 * skipped (their line numbers still count). Return AL_OK to go on; any
 * other status stops the reader, which then returns that status. */
typedef al_status (*al_csv_row_fn)(void *ud, const al_csv_row *row);

/* Reads a source: returns bytes put in buf (0 at the end) and sets
 * *failed on a read error. */
typedef size_t (*al_read_fn)(void *ctx, void *buf, size_t cap, int *failed);

/* Reads all records from a source, calling row_fn for each. A UTF-8
 * byte-order mark at the start is skipped. Syntax errors (strict RFC 4180
 * quoting, an unterminated quote, a field over max_field bytes, a NUL
 * byte, an ambiguous header under AL_CSV_AUTO) are added to diags with
 * `name` and the line, and give AL_ESYNTAX; a read error AL_EIO;
 * AL_ENOMEM when memory runs out. The field cap is enforced in libcsv's
 * allocator hook, so a huge field never costs more than the cap. */
al_status al_csv_read(const al_csv_options *opt, al_read_fn read_fn,
		      void *read_ctx, const char *name, al_csv_row_fn row_fn,
		      void *ud, al_diags *diags);
/* An al_read_fn over a stdio stream (ctx is the FILE *). */
size_t al_read_stdio(void *ctx, void *buf, size_t cap, int *failed);

al_status al_csv_read_file(const al_csv_options *opt, FILE *in,
			   const char *name, al_csv_row_fn row_fn, void *ud,
			   al_diags *diags);
al_status al_csv_read_mem(const al_csv_options *opt, const char *data,
			  size_t len, const char *name, al_csv_row_fn row_fn,
			  void *ud, al_diags *diags);

#endif
