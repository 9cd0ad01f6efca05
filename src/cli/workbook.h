/* acidlot command line: a workbook (.xlsx, libxlsxwriter) made from the
 * program's own CSV outputs and its record: numbers as numeric cells,
 * text as text cells (never a formula), a header row with units,
 * frozen, with an autofilter.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_WORKBOOK_H
#define ACIDLOT_CLI_WORKBOOK_H

#include <jansson.h>
#include <stddef.h>

typedef struct wbook wbook;

/* A workbook to be written to path (the file appears at
 * workbook_close); name is the output's name for messages. NULL after
 * a message. */
wbook *wbook_new(const char *path, const char *name);

/* A sheet from CSV text the program wrote (',' between cells, '.' as
 * decimal point, a header row first; numbers with 17 significant
 * digits, so that each reads back as the very double). A column is
 * numeric by its name (workbook.c: the columns the program computes);
 * an empty cell stays empty. The header names the unit: unit when the
 * whole sheet has one, else "in unit" where the rows have a unit
 * column. 0, or -1 after a message. */
int wbook_csv_sheet(wbook *w, const char *sheet, const char *csv,
		    size_t len, const char *unit);

/* A sheet of the record's fields, one a row (field, value), every
 * member of root but those named in skip. */
int wbook_json_sheet(wbook *w, const char *sheet, json_t *root,
			const char *const *skip, size_t n_skip);

/* The file written (0), or -1 after a message; w is freed either way.
 * wbook_close(NULL) is 0. */
int wbook_close(wbook *w);


#endif
