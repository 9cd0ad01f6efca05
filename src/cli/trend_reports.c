/* acidlot command line: trend's points from earlier report CSVs instead
 * of a store (acidlot trend REPORT.csv... --product P).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "trend_reports.h"

enum { R_PRODUCT, R_LOT, R_SAMPLE, R_VALUE, R_MIN, R_MAX, R_UNIT, R_COUNT };

struct reader {
	const char *product, *file;
	const char *names[R_COUNT];
	int col[R_COUNT], header_done;
	store_point **out;
	size_t *n, cap;
	al_diags *diags;
};

/* A text cell into a point's field. */
static void
text(const al_csv_row *row, int col, char *buf, size_t cap)
{
	size_t len;
	const char *s = al_cell(row, col, &len);

	snprintf(buf, cap, "%.*s", (int)len, s);
}

static al_status
report_row(void *ud, const al_csv_row *row)
{
	struct reader *r = ud;
	store_point *p;
	size_t len;
	const char *s;

	if (!r->header_done) {
		r->header_done = 1;
		for (int k = 0; k < R_COUNT; k++) {
			r->col[k] = -1;
			for (size_t i = 0; i < row->nfields; i++)
				if (al_word_eq(row->fields[i], row->lens[i],
					       r->names[k]))
					r->col[k] = (int)i;
		}
		if (r->col[R_PRODUCT] < 0 || r->col[R_VALUE] < 0)
			al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
				     NULL, "not a report of acidlot assay: no "
				     "product or %s column",
				     r->names[R_VALUE]);
		return AL_OK;
	}
	s = al_cell(row, r->col[R_PRODUCT], &len);
	if (r->col[R_VALUE] < 0 || len != strlen(r->product) ||
	    memcmp(s, r->product, len) != 0)
		return AL_OK;
	if (*r->n == r->cap) {
		store_point *grown;

		r->cap = 2 * r->cap + 64;
		if ((grown = al_realloc(*r->out, r->cap * sizeof *grown)) == NULL)
			return AL_ENOMEM;
		*r->out = grown;
	}
	p = &(*r->out)[*r->n];
	memset(p, 0, sizeof *p);
	/* an empty value (no replicates) is no point */
	if (al_cell_number(row, r->col[R_VALUE], r->names[R_VALUE], '.', r->file,
			   r->diags, &p->value) != 1)
		return AL_OK;
	p->has_min = al_cell_number(row, r->col[R_MIN], "spec_min", '.',
				    r->file, r->diags, &p->spec_min) == 1;
	p->has_max = al_cell_number(row, r->col[R_MAX], "spec_max", '.',
				    r->file, r->diags, &p->spec_max) == 1;
	text(row, r->col[R_LOT], p->lot, sizeof p->lot);
	text(row, r->col[R_SAMPLE], p->sample, sizeof p->sample);
	text(row, r->col[R_UNIT], p->unit, sizeof p->unit);
	(*r->n)++;
	return AL_OK;
}

int
trend_reports_read(char *const *files, int n_files, const char *product,
		   const char *quantity, store_point **out, size_t *n)
{
	al_diags d = {0};
	al_csv_options csv = {.delimiter = AL_CSV_AUTO};
	struct reader r = {
		.product = product,
		.names = {"product", "lot", "sample", quantity, "spec_min",
			  "spec_max", "unit"},
		.out = out,
		.n = n,
		.diags = &d,
	};
	int bad = 0;

	*out = NULL;
	*n = 0;
	for (int i = 0; i < n_files && !bad; i++) {
		FILE *in = cli_open_input(files[i]);
		al_status st;

		if (in == NULL) {
			cli_error("%s: %s", files[i], cli_reason(AL_OK));
			return -1;
		}
		r.file = files[i];
		r.header_done = 0;
		st = al_csv_read_file(&csv, in, files[i], report_row, &r, &d);
		fclose(in);
		if (st == AL_ENOMEM || st == AL_EIO) {
			cli_error("%s: %s", files[i], al_strerror(st));
			bad = 1;
		}
	}
	cli_print_diags(&d);
	bad |= d.errors > 0;
	al_diags_clear(&d);
	return bad ? -1 : 0;
}
