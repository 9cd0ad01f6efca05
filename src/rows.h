/* acidlot: titration rows (internal): a file's header mapped onto the
 * assay's columns, a record's cells turned into a checked titration, and
 * the titration's value in a result's unit. Stages 2 and 3 of the
 * pipeline (DEVELOPERS.md); it calls the table, chemistry and lookup
 * modules (spec, register, catalogue), never a later stage.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_ROWS_H
#define ACIDLOT_ROWS_H

#include <stddef.h>

#include "acidlot/csvread.h"
#include "acidlot/result.h"
#include "acidlot/ta.h"

/* The assay's columns. */
enum {
	AL_C_SAMPLE, AL_C_TITRANT, AL_C_MASS, AL_C_VOLUME, AL_C_PRODUCT,
	AL_C_LOT, AL_C_REPLICATE, AL_C_BLANK, AL_C_CONC, AL_C_MADE_UP,
	AL_C_ALIQUOT, AL_C_ACID, AL_C_DENSITY, AL_C_ENDPOINT,
	AL_C_TITRANT_LOT, AL_C_DATE, AL_C_BRIX, AL_C_WATER, AL_C_CURVE,
	AL_C_MODE, AL_C_READINGS, AL_C_CURVE_FLAGS, AL_C_PH, AL_C_START,
	AL_C_COUNT
};

/* A row's text cells, in this order. */
enum { AL_T_PRODUCT, AL_T_LOT, AL_T_SAMPLE, AL_T_REPLICATE, AL_T_ACID };

/* The reading of one run's files, header by header. */
typedef struct al_rows {
	const al_assay_options *opt;
	const char *file;   /* the file being read */
	al_diags *diags;    /* the run's: file errors and warnings */
	al_diags row_diags; /* the current row's errors, before they are
			       reported or the row rejected */
	char point;         /* decimal point of numbers */
	int header_done, header_ok;
	size_t header_fields;
	int col[AL_C_COUNT];
	char *header_text; /* the header's cells, trimmed, NUL-separated */
	char *scratch;     /* the current row's text cells, NUL-terminated */
	size_t scratch_cap;
	char *ident[5]; /* or those of a row with non-ASCII bytes, in NFC */
	size_t ident_cap[5];
	char *lot; /* the current row's titrant lot, in NFC */
	size_t lot_cap;
	const al_titrant **lots_used; /* register lots, in order of use */
	size_t n_lots_used;
	char *last_product; /* the product whose specification ... */
	size_t last_len, last_cap;
	const al_spec *last_spec; /* ... was looked up last */
} al_rows;

/* A data row's cells, checked. */
typedef struct al_row {
	unsigned long line;
	const char *text[5]; /* AL_T_: trimmed C strings */
	size_t len[5];
	al_titration t;
	double conc_u; /* the register's standard uncertainty, or -1 */
	double density, endpoint, brix, water; /* where has_ says */
	int has_density, has_endpoint, has_brix, has_water;
	const al_spec *spec; /* the product's, or NULL */
	const al_acid *acid; /* the spec's, else the row's, else the default */
	al_unit unit;        /* the spec's, else the options', else by basis */
	int anhydrous;       /* the spec's basis, else the options' */
	unsigned flags;      /* AL_FLAG_ bits of the row */
	long date;	     /* the row's date, when has_date */
	int has_date;
	const char *curve, *mode; /* from a curve file (acidlot endpoint):
				     the curve and the mode that gave the
				     volume; "" for a volume read off */
	size_t curve_len, mode_len;
	double value;        /* after al_titration_value: the result */
	double needed;       /* the endpoint pH that would suffice, when low */
	int impossible;      /* more acid than a sample can hold */
} al_row;

void al_rows_init(al_rows *rs, const al_assay_options *opt, al_diags *diags);
void al_rows_free(al_rows *rs);
void al_rows_begin_file(al_rows *rs, const char *file);

/* Maps the header, with an error for each column missing or mapped
 * twice; AL_EINPUT when the file's rows cannot be read. */
al_status al_rows_header(al_rows *rs, const al_csv_row *row);

/* 1 when a record is a comment: its first cell starts with "# " or is
 * "#" (a bench sheet's line of units, a note), skipped like a blank
 * line wherever it stands. */
int al_rows_comment(const al_csv_row *row);

/* What a record is: nothing to read (a blank or repeated header line:
 * AL_ROW_SKIP), a malformed one (AL_ROW_BAD, its error in row_diags) or
 * a data row. */
typedef enum { AL_ROW_DATA, AL_ROW_SKIP, AL_ROW_BAD } al_row_kind;
al_row_kind al_rows_kind(al_rows *rs, const al_csv_row *row);

/* The text cells of a row, trimmed, as C strings (AL_T_ order). */
al_status al_rows_text(al_rows *rs, const al_csv_row *row,
		       const char *out[5], size_t lens[5]);

/* Reads a data row's cells into r, in two steps: its names (product,
 * lot, sample, replicate, acid), then the rest. Every error goes to
 * row_diags; the status is AL_ENOMEM only. */
al_status al_rows_names(al_rows *rs, const al_csv_row *row, al_row *r);
al_status al_rows_values(al_rows *rs, const al_csv_row *row, al_row *r);

/* Adds an error for the current row (reported or rejected at its end). */
#define AL_ROW_ERR(rs, line, column, ...)                                     \
	al_diags_add(&(rs)->row_diags, AL_SEV_ERROR, (rs)->file, (line),       \
		     (column), __VA_ARGS__)
/* A file-level error or a warning: straight to the run's list. */
#define AL_RUN_DIAG(rs, sev, line, column, ...)                               \
	al_diags_add((rs)->diags, (sev), (rs)->file, (line), (column),         \
		     __VA_ARGS__)

#endif
