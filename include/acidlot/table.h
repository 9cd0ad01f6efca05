/* acidlot: header mapping and cell conversion shared by every CSV table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TABLE_H
#define ACIDLOT_TABLE_H

#include <stddef.h>

#include "acidlot/csvread.h"
#include "acidlot/number.h"
#include "acidlot/status.h"

/* A header of an instrument export standing for one of our columns,
 * e.g. {"titrant_ml", "Vol (mL)"} (--column titrant_ml="Vol (mL)"). */
typedef struct al_column_alias {
	const char *name;   /* our column name */
	const char *header; /* the file's header text */
	int optional; /* 0: every file read must have the header (a pair
			 given as an option); 1: from a lab-wide map */
} al_column_alias;

/* What an unknown header is: listed in one warning (a titration file
 * may carry columns of its own), or an error naming the closest known
 * column (a specification, where a misspelt limit would silently be no
 * limit). Either way a header that names a known column in a common form
 * ("Blank (mL)", "endpoint pH", "NaOH (mol/L)") is an error naming the
 * --column that maps it: read as unknown, its values would be lost. */
typedef enum al_unknown_columns {
	AL_UNKNOWN_WARN = 0,
	AL_UNKNOWN_ERROR = 1
} al_unknown_columns;

/* index[k] of a column that a header names in a common form (reported
 * with the --column that maps it, not mapped). */
#define AL_COLUMN_NAMED (-2)

/* Maps a header row onto known column names (matched ignoring case and
 * surrounding blanks), and onto aliases (n_aliases may be 0). index[k]
 * gets the field number of names[k], or -1. A column given twice is an
 * error; unknown headers as `unknown` says; a header that names one in
 * a common form is an error naming the option (e.g. "--column") that
 * maps it, or asking for the column's own name when option is NULL.
 * Returns AL_EINPUT after adding the errors to diags. */
al_status al_header_map(al_unknown_columns unknown,
			const al_csv_row *header, const char *const *names,
			size_t n_names, const al_column_alias *aliases,
			size_t n_aliases, int *index, const char *file,
			al_diags *diags, const char *option);

/* The header of one of our own tables (specification, register):
 * unknown columns are errors; aliases (--spec-column) name other
 * headers for its columns, and each must be a header of the file;
 * *fields gets its field count. AL_OK, or AL_EINPUT after the errors
 * went to diags. */
al_status al_own_header(const al_csv_row *header, const char *const *names,
			size_t n_names, const al_column_alias *aliases,
			size_t n_aliases, int *index, size_t *fields,
			const char *file, al_diags *diags, const char *option);

/* The index of name in names[0..n), or -1. */
int al_name_index(const char *const *names, size_t n, const char *name);

/* Every alias not optional (given as an option, e.g. "--column") names
 * a header of the file (blanks around and ASCII case aside); each that
 * does not is an error. AL_OK, or AL_EINPUT. */
al_status al_aliases_present(const al_csv_row *header,
			     const al_column_alias *aliases, size_t n,
			     const char *option, const char *file,
			     al_diags *diags);

/* The header cell closest to `name` (edit distance, ignoring case, '_'
 * and blanks), or NULL when none is close. */
const char *al_header_closest(const al_csv_row *header, const char *name);

/* Reads a column-mapping CSV of name,header pairs (a header row naming
 * "name" and "header"). The strings and the array are owned by the
 * caller: free with al_column_aliases_free. */
al_status al_column_aliases_read(FILE *in, const char *file,
				 al_column_alias **aliases, size_t *n,
				 al_diags *diags);
void al_column_aliases_free(al_column_alias *aliases, size_t n);

/* A conflict among aliases[0..n), of which the first n_first may
 * override the rest's name (options before a file): one name mapped
 * twice (AL_ALIAS_NAME_TWICE), or one header (ignoring case and blanks)
 * mapped to two names (AL_ALIAS_HEADER_TWICE), at *i < *j; else
 * AL_ALIAS_OK. */
typedef enum {
	AL_ALIAS_OK,
	AL_ALIAS_NAME_TWICE,
	AL_ALIAS_HEADER_TWICE
} al_alias_conflict;
al_alias_conflict al_column_aliases_check(const al_column_alias *aliases,
					  size_t n, size_t n_first, size_t *i,
					  size_t *j);

/* The length of the well-formed UTF-8 sequence that starts s (of len
 * bytes), 1 to 4, or 0 when none does (RFC 3629: no overlong forms, no
 * surrogates, nothing above U+10FFFF, not cut short). */
size_t al_utf8_seq(const char *s, size_t len);
/* 1 when s[0..len) is well-formed UTF-8, sequence after sequence. */
int al_utf8_valid(const char *s, size_t len);

/* The text of cell `col` of a row, trimmed; "" when col < 0. */
const char *al_cell(const al_csv_row *row, int col, size_t *len);

/* Parses cell `col` as a number. Returns 1 with *value set, 0 when the
 * cell is empty or absent, -1 after adding an error naming the file,
 * line and column to diags. */
int al_cell_number_at(const al_csv_row *row, int col, const char *column,
		      char decimal_point, const char *file, al_diags *diags,
		      double *value);
/* The same, inline where the answer needs no call (an absent column),
 * for the many cells of every row. */
static inline int
al_cell_number(const al_csv_row *row, int col, const char *column,
	       char decimal_point, const char *file, al_diags *diags,
	       double *value)
{
	if (col < 0 || (size_t)col >= row->nfields)
		return 0;
	return al_cell_number_at(row, col, column, decimal_point, file, diags,
				 value);
}

#endif
