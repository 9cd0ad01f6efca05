/* acidlot fuzz target: a file of titration curves, in each mode (the
 * first byte chooses it). Every endpoint found lies between the curve's
 * first and last volume, with a pH in 0 to 14, and every row handed on
 * has the header's width.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "fuzz.h"

#include <math.h>

struct check {
	size_t width;
};

static al_status
on_row(void *ud, const al_csv_row *row)
{
	struct check *k = ud;

	if (k->width == 0)
		k->width = row->nfields;
	else if (row->nfields != k->width)
		__builtin_trap();
	return AL_OK;
}

static al_status
on_curve(void *ud, const char *id, const al_curve *c, const double *work,
	 const al_curve_endpoint *e)
{
	(void)ud;
	(void)id;
	(void)work;
	if (e->has_volume &&
	    (!(e->volume_ml >= c->ml[0] && e->volume_ml <= c->ml[c->n - 1]) ||
	     !(e->ph >= 0 && e->ph <= 14)))
		__builtin_trap();
	return AL_OK;
}

static al_status
curves_row(void *ud, const al_csv_row *row)
{
	return al_curves_row(ud, row);
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct check k = {0};
	al_curves_options o = {0};
	al_diags d = {0};
	al_csv_options csv = {0};
	al_curves *c;
	FILE *f;

	if (size < 2 || (f = fuzz_stream(data + 1, size - 1)) == NULL)
		return 0;
	o.mode = (al_curve_mode)(data[0] % 3);
	o.decimals = -1;
	o.on_row = on_row;
	o.on_curve = on_curve;
	o.ud = &k;
	if ((c = al_curves_new(&o, "fuzz.csv", &d)) == NULL)
		__builtin_trap();
	if (al_csv_read_file(&csv, f, "fuzz.csv", curves_row, c, &d) == AL_OK)
		(void)al_curves_finish(c);
	fclose(f);
	al_curves_free(c);
	al_diags_clear(&d);
	return 0;
}
