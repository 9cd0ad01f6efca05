/* acidlot: the CSV reader's state (internal), shared by csvread.c
 * (libcsv, line numbers, malformed records) and csvplain.c (the path
 * for plain lines).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CSVREADER_H
#define ACIDLOT_CSVREADER_H

#include <stdint.h>

#include "acidlot/status.h"

struct al_csv_options;
struct al_csv_row;

struct reader {
	const struct al_csv_options *opt;
	size_t max_field;
	char delimiter;
	const char *name;
	al_status (*row_fn)(void *ud, const struct al_csv_row *row);
	void *ud;
	al_diags *diags;

	/* the record being assembled */
	char *buf;
	size_t buf_len, buf_cap;
	size_t *offsets, *lens;
	const char **ptrs;
	size_t nfields, fields_cap;
	char *raw; /* its bytes as read */
	size_t raw_len, raw_cap;

	unsigned long cur_line; /* line on which the next record starts */
	unsigned long extra;    /* line ends inside quoted fields so far */
	int last_term;          /* terminator of the previous record */
	al_status stop;         /* first failure; callbacks do nothing after */
	char record_error[160]; /* recover mode: the record is malformed */

	/* the quoting of the record being read through libcsv, followed
	 * beside it (quote_scan), so that a malformed record is skipped
	 * whole and an unclosed quote's line is known */
	int quote;                /* Q_* */
	int quote_cr;             /* the last byte scanned was a CR */
	unsigned long quote_lines; /* line ends inside the record so far */
	unsigned long quote_open; /* line of the last quote opened */
	int skipping;             /* recover mode: past a malformed record's
				     error, up to its end */
};

enum { Q_FIELD, Q_PLAIN, Q_QUOTED, Q_QUOTE_SEEN };

/* The first failure stops the reader; its message, if any, is an error
 * at line. */
void al_reader_fail(struct reader *r, al_status st, unsigned long line,
		    const char *msg);
/* Room for need fields, or need bytes of the record; 0 when memory runs
 * out. */
int al_reader_grow_fields(struct reader *r, size_t need);
int al_reader_grow_buf(struct reader *r, size_t need);

/* Lines the vector scan looks at whole: up to SCAN_BLOCKS of 16 bytes.
 * The chunk keeps SCAN_PAD zero bytes past its data, so that a block
 * may be loaded past the end of what was read. */
#define SCAN_BLOCKS 8
#define SCAN_PAD (16 * SCAN_BLOCKS)

/* A line at a record boundary, len bytes ended by term, handed to the
 * row callback when it is plain (see csvplain.c); 0 when it must go
 * through libcsv. */
int al_reader_plain_line(struct reader *r, const char *line, size_t len,
			 char term, const uint16_t *dmask, int blanks,
			 int ascii);
/* The line at s: its length, delimiters and blanks, 16 bytes a step
 * (see csvplain.c): 1 found, -1 libcsv's, 0 the byte-by-byte path's. */
int al_scan_line(const char *s, size_t avail, char d, size_t *len,
		 uint16_t dmask[SCAN_BLOCKS], int *blanks, int *ascii);

#endif
