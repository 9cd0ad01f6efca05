/* acidlot: a file of titration curves, one row per (volume, pH) reading,
 * read into one row per curve with its endpoint: the rows an assay reads.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CURVES_H
#define ACIDLOT_CURVES_H

#include "acidlot/csvread.h"
#include "acidlot/curve.h"
#include "acidlot/status.h"
#include "acidlot/table.h"

/* The default endpoint pH (AOAC 942.15, IFU method 3). */
#define AL_CURVES_DEFAULT_PH 8.1

/* Takes each row the reader makes: the header first, then one row per
 * curve (its line the curve's first reading's). */
typedef al_status (*al_curves_row_fn)(void *ud, const al_csv_row *row);

/* Sees each curve as its endpoint is found (for pictures): its id, the
 * readings, the work array of al_curve_find and the endpoint. */
typedef al_status (*al_curves_curve_fn)(void *ud, const char *id,
					 const al_curve *curve,
					 const double *work,
					 const al_curve_endpoint *e);

typedef struct al_curves_options {
	al_curve_mode mode;
	int has_endpoint_ph;
	double endpoint_ph; /* for rows without endpoint_ph; else 8.1 */
	char decimal_point; /* of the file's numbers: '.' when 0, or ',' */
	int decimals;       /* of the volume and pH written; -1: every digit
			       (the assay's own reading uses -1) */
	const al_column_alias *aliases; /* other headers for our columns (and
					   the assay's): a mapped header is
					   handed on as our column's name */
	size_t n_aliases;
	al_curves_row_fn on_row;
	al_curves_curve_fn on_curve; /* may be NULL */
	void *ud;
} al_curves_options;

typedef struct al_curves al_curves;

/* 1 when name is a column the curve reader reads (curve, titrant_ml,
 * ph, endpoint_ph, start_ml, volume_ml, mass_g, density_g_ml). */
int al_curves_is_column(const char *name);

/* The column names that make a header a curve file's: curve and ph,
 * as named or through aliases. */
int al_curves_is_header(const al_csv_row *header,
			const al_column_alias *aliases, size_t n_aliases);

/* A reader of one file's rows (diagnostics into diags, naming file);
 * NULL when memory runs out. */
al_curves *al_curves_new(const al_curves_options *opt, const char *file,
			 al_diags *diags);
/* One row of the file, the header first; AL_OK, or the on_row's or
 * on_curve's status, or AL_ENOMEM. An invalid reading is an error in
 * diags and the reader goes on. */
al_status al_curves_row(al_curves *c, const al_csv_row *row);
/* The last curve, at the file's end. */
al_status al_curves_finish(al_curves *c);
/* Curves read, those with a flag, and those without a volume. */
void al_curves_counts(const al_curves *c, unsigned long *curves,
		      unsigned long *flagged, unsigned long *no_volume);
void al_curves_free(al_curves *c);

/* v with fixed decimals (when >= 0), or else the shortest decimal text
 * that reads back as v (at most 17 significant digits, never an
 * exponent), with decimal_point. */
void al_curves_number(double v, int decimals, char decimal_point, char *buf,
		      size_t cap);

#endif
