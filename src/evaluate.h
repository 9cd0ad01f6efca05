/* acidlot: evaluation of one result (internal to the library).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_EVALUATE_H
#define ACIDLOT_EVALUATE_H

#include "acidlot/assay.h"

/* Means of a result's inputs, for its uncertainty budget. */
typedef struct al_eval_inputs {
	double titrant_ml, blank_ml, conc, amount, made_up_ml, aliquot_ml;
	double conc_u;   /* mean standard uncertainty of the concentration */
	int all_conc_u;  /* every row had one */
	al_basis basis;
	size_t n;
	int has_brix, has_water;
	double brix, water_pct, density; /* means; density 0 when unknown */
} al_eval_inputs;

/* Fills r (whose values, n_values, acid, unit and spec are set) with its
 * statistics, screens, uncertainty and verdict. scratch holds n_values
 * doubles. */
void al_eval_result(const al_assay_options *opt, const al_eval_inputs *in,
		    double *scratch, al_group_result *r);

/* Cochran per product over results with the modal n; the caller owns the
 * returned array (count in *n); NULL with *n = 0 when none applies or
 * memory runs out (then *oom is set). */
al_cochran *al_eval_cochran(al_group_result *results, size_t count,
			    size_t *n, int *oom);

#endif
