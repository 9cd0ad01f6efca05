/* acidlot: header mapping and cell conversion shared by every CSV table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/table.h"

#include <stdio.h>
#include <string.h>

#include "acidlot/number.h"

al_status
al_header_map(const al_csv_row *header, const char *const *names,
	      size_t n_names, int *index, const char *file, al_diags *diags)
{
	char unknown[512];
	size_t ulen = 0, n_unknown = 0;
	al_status st = AL_OK;

	unknown[0] = '\0';
	for (size_t k = 0; k < n_names; k++)
		index[k] = -1;
	for (size_t i = 0; i < header->nfields; i++) {
		size_t len = header->lens[i];
		const char *h = al_trim(header->fields[i], &len);
		int known = 0;

		for (size_t k = 0; k < n_names; k++) {
			if (!al_word_eq(h, len, names[k]))
				continue;
			known = 1;
			if (index[k] >= 0) {
				al_diags_add(diags, AL_SEV_ERROR, file,
					     header->line, names[k],
					     "column given twice (fields %d "
					     "and %zu)",
					     index[k] + 1, i + 1);
				st = AL_EINPUT;
			} else
				index[k] = (int)i;
		}
		if (!known) {
			int w = snprintf(unknown + ulen, sizeof unknown - ulen,
					 "%s'%.*s'", n_unknown ? ", " : "",
					 (int)len, h);
			if (w > 0 && (size_t)w < sizeof unknown - ulen)
				ulen += (size_t)w;
			n_unknown++;
		}
	}
	if (n_unknown > 0)
		al_diags_add(diags, AL_SEV_WARNING, file, header->line, NULL,
			     "ignoring %zu unknown column%s: %s", n_unknown,
			     n_unknown == 1 ? "" : "s", unknown);
	return st;
}

const char *
al_cell(const al_csv_row *row, int col, size_t *len)
{
	if (col < 0 || (size_t)col >= row->nfields) {
		*len = 0;
		return "";
	}
	*len = row->lens[col];
	return al_trim(row->fields[col], len);
}

int
al_cell_number(const al_csv_row *row, int col, const char *column,
	       char decimal_point, const char *file, al_diags *diags,
	       double *value)
{
	size_t len;
	const char *s = al_cell(row, col, &len);
	al_numerr err;

	if (len == 0)
		return 0;
	err = al_number_parse(s, len, decimal_point, value);
	if (err == AL_NUM_OK)
		return 1;
	al_diags_add(diags, AL_SEV_ERROR, file, row->line, column,
		     "'%.*s' %s", (int)(len > 60 ? 60 : len), s,
		     al_numerr_phrase(err));
	return -1;
}
