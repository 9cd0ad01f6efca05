/* acidlot: header mapping and cell conversion shared by every CSV table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TABLE_H
#define ACIDLOT_TABLE_H

#include <stddef.h>

#include "acidlot/csvread.h"
#include "acidlot/status.h"

/* Maps a header row onto known column names (matched ignoring case and
 * surrounding blanks). index[k] gets the field number of names[k], or -1.
 * A known name given twice is an error; unknown headers are listed in one
 * warning. Returns AL_EINPUT after adding the errors to diags. */
al_status al_header_map(const al_csv_row *header, const char *const *names,
			size_t n_names, int *index, const char *file,
			al_diags *diags);

/* The text of cell `col` of a row, trimmed; "" when col < 0. */
const char *al_cell(const al_csv_row *row, int col, size_t *len);

/* Parses cell `col` as a number. Returns 1 with *value set, 0 when the
 * cell is empty or absent, -1 after adding an error naming the file,
 * line and column to diags. */
int al_cell_number(const al_csv_row *row, int col, const char *column,
		   char decimal_point, const char *file, al_diags *diags,
		   double *value);

#endif
