/* acidlot: evaluation of one result (internal to the library).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_EVALUATE_H
#define ACIDLOT_EVALUATE_H

#include <stdint.h>

#include "acidlot/result.h"
#include "groups.h"

/* Means of a result's inputs, for its uncertainty budget. */
typedef struct al_eval_inputs {
	const al_stream *stream; /* NULL: r->values holds them all */
	double titrant_ml, blank_ml, conc, amount, made_up_ml, aliquot_ml;
	double conc_u;   /* mean standard uncertainty of the concentration */
	int all_conc_u;  /* every row had one */
	al_basis basis;
	size_t n;
	int has_brix, has_water;
	double brix, water_pct, density; /* means; density 0 when unknown */
	int impossible;  /* a value is more than a sample can hold */
	size_t n_conc_u, n_brix, n_water, n_density; /* rows with each */
	const al_row_inputs *extremes; /* [0] the lowest result's row, [1] the
					highest's; NULL: not kept */
} al_eval_inputs;

/* The first part of al_eval_result: fills r->stats (after an excluded
 * outlier, if the options exclude one), Grubbs's screen and the flags
 * these set, from stream or from r->values (n_values of them, with the
 * flags r had; what it sets only at times it clears first); an outlier
 * is left out only from n = 4 on (ISO 5725-2 applies these tests to more
 * data than a triplicate), and a tie (res_rel) is never one; *used is
 * the count of values in the statistics, and scratch then holds them in
 * input order. Enough for Cochran's test. */
void al_eval_stats(const al_assay_options *opt, const al_stream *stream,
		   double res_rel, double *scratch, al_group_result *r,
		   size_t *used);

/* The reading resolution relative to a result: the spec's resolution_ml
 * (else the options') over the mean net titrant volume; 0 when there is
 * none. A replicate within res_rel x mean of its nearest neighbour is a
 * tie, never an outlier (burettes are read to 0.02-0.05 mL). */
double al_eval_resolution(const al_assay_options *opt, const al_spec *spec,
			  double titrant_ml, double blank_ml);

/* Fills r (whose values, n_values, acid, unit and spec are set) with its
 * statistics, screens, uncertainty and verdict. scratch holds n_values
 * doubles. */
void al_eval_result(const al_assay_options *opt, const al_eval_inputs *in,
		    double *scratch, al_group_result *r);

/* Cochran's test per product over its results with the modal n (the
 * larger n on a tie), accumulated result by result: per (product, n)
 * the count, the sum of the variances in result order and the largest
 * variance (the first, on a tie), so that no per-result list is kept.
 * Products must stay valid strings until finish. */
typedef struct al_cochran_acc al_cochran_acc;

al_cochran_acc *al_cochran_acc_new(void);
void al_cochran_acc_free(al_cochran_acc *acc);
/* 0, or -1 when memory runs out. */
int al_cochran_acc_add(al_cochran_acc *acc, const char *product, size_t n,
		       double variance, size_t result);
/* The tests, products in strcmp order; the caller owns the array (count
 * in *n); NULL with *n = 0 when none applies or memory runs out (then
 * *oom is set). */
al_cochran *al_cochran_acc_finish(al_cochran_acc *acc, size_t *n, int *oom);

#endif
