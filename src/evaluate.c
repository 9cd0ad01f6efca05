/* acidlot: evaluation of one result: replicate statistics, screens,
 * measurement uncertainty and the verdict under the decision rule.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "evaluate.h"

#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/juice.h"
#include "acidlot/screens.h"
#include "hash.h"

void
al_qc_options_default(al_qc_options *q)
{
	memset(q, 0, sizeof *q);
	q->decision = AL_DECISION_SIMPLE;
	q->guard_r = 1;
	/* ISO 385 class A 50 mL burette, +/-0.05 mL (issue 5; from memory) */
	q->burette_tol_ml = 0.05;
	/* analytical balance linearity, QUAM 2012 A2 (seen) */
	q->balance_linearity_g = 0.00015;
	q->k = 2;
	/* a 50 mL burette graduated in 0.1 mL is read to half a division
	 * (common practice); 0.02 mL for a 25 mL burette in 0.05 mL */
	q->resolution_ml = 0.05;
	/* a water determination by Karl Fischer or loss on drying, +/-0.1 %
	 * w/w as a standard uncertainty (common practice; set the method's
	 * own with --water-u-pct) */
	q->water_u_pct = 0.1;
}

/* Class A tolerances, +/- mL, by nominal volume: bulb pipettes ISO 648
 * and volumetric flasks ISO 1042 (from memory). A volume between
 * nominals takes the next larger; above the largest, in proportion. */
static double
tolerance(const double (*table)[2], size_t n, double v)
{
	for (size_t i = 0; i < n; i++)
		if (v <= table[i][0] * 1.000001)
			return table[i][1];
	return table[n - 1][1] * v / table[n - 1][0];
}

static const double pipettes[][2] = {
	{1, 0.008},  {2, 0.010},  {5, 0.015},  {10, 0.020},
	{20, 0.030}, {25, 0.030}, {50, 0.050}, {100, 0.080},
};
static const double flasks[][2] = {
	{10, 0.025},  {25, 0.040},  {50, 0.060},  {100, 0.100},
	{200, 0.150}, {250, 0.150}, {500, 0.250}, {1000, 0.400},
};

static void
term(al_group_result *r, const char *name, const char *unit, double value,
     double u, int power)
{
	al_gum_term *t = &r->budget[r->n_budget++];

	memset(t, 0, sizeof *t);
	t->name = name;
	t->unit = unit;
	t->value = value;
	t->u = u;
	t->power = power;
}

/* GUM product/quotient model of TA = (V - Vb) c E DF per / m at the mean
 * inputs, with the repeatability of the mean s / sqrt n. */
static void
uncertainty(const al_assay_options *opt, const al_eval_inputs *in,
	    al_group_result *r)
{
	const al_qc_options *q = &opt->qc;
	double u_v = al_gum_triangular(q->burette_tol_ml);
	double net = in->titrant_ml - in->blank_ml;
	/* the titrant and the blank are two burette readings */
	double u_net = in->blank_ml > 0 ? sqrt(2.0) * u_v : u_v;
	double u_conc = in->all_conc_u ? in->conc_u
			: q->has_titrant_u ? q->titrant_u
					   : 0;

	r->n_budget = 0;
	if (r->stats.n == 0 || !(net > 0))
		return;
	term(r, "titrant volume (net of blank)", "mL", net, u_net, 1);
	term(r, "titrant concentration", "mol/L", in->conc, u_conc, 1);
	if (u_conc == 0)
		r->flags |= AL_FLAG_NO_TITRANT_U;
	if (in->basis == AL_BASIS_MASS)
		term(r, "sample mass", "g", in->amount,
		     sqrt(2.0) * al_gum_rectangular(q->balance_linearity_g), -1);
	else
		term(r, "sample volume (pipette)", "mL", in->amount,
		     al_gum_triangular(tolerance(pipettes, 8, in->amount)), -1);
	if (in->made_up_ml > 0) {
		term(r, "made-up volume (flask)", "mL", in->made_up_ml,
		     al_gum_triangular(tolerance(flasks, 8, in->made_up_ml)), 1);
		term(r, "aliquot (pipette)", "mL", in->aliquot_ml,
		     al_gum_triangular(tolerance(pipettes, 8, in->aliquot_ml)),
		     -1);
	}
	/* anhydrous = as-is / (1 - w/100): u_rel = u(w) / (100 - w) */
	if (r->anhydrous && in->has_water)
		term(r, "water content (1 - water/100)", "", 1 - in->water_pct / 100,
		     q->water_u_pct / 100, -1);
	if (r->stats.has_sd)
		term(r, "repeatability of the mean", "", 1.0,
		     r->stats.sd / sqrt((double)r->stats.n) / r->stats.mean, 1);
	r->u = al_gum_product(r->stats.mean, r->budget, r->n_budget);
	r->k = q->k;
	r->U = r->k * r->u;
	r->has_u = 1;
}

/* The acid's mass fraction for Horwitz: per 100 g (or 100 mL, taken as
 * 100 g: juices are near 1 g/mL) over 100, per kg (L) over 1000. */
static double
mass_fraction(const al_group_result *r)
{
	double per = al_unit_per(r->unit);
	double grams = al_unit_is_meq(r->unit) ? r->stats.mean * r->acid->g_per_meq
					       : r->stats.mean;

	return grams / per;
}

/* TA as % w/w of the result's acid: per 100 g (or 100 mL over the
 * density), meq through the factor. 0 when a volume result has no
 * density to go by. */
static double
ta_pct_w_w(const al_group_result *r, double density)
{
	double v = al_unit_is_meq(r->unit) ? r->stats.mean * r->acid->g_per_meq
					   : r->stats.mean;

	v *= 100 / al_unit_per(r->unit);
	if (al_unit_basis(r->unit) == AL_BASIS_VOLUME)
		v = density > 0 ? v / density : 0;
	return v;
}

/* Brix, the acid-corrected Brix and the ratio (Kimball 1991): the
 * correction is for citric acid, so it applies to results expressed as
 * citric acid (either form, taken as anhydrous citric). */
static void
juice(const al_eval_inputs *in, al_group_result *r)
{
	double pct, density = in->density;

	r->has_water = in->has_water;
	r->water_pct = in->water_pct;
	if (!in->has_brix || r->stats.n == 0)
		return;
	r->has_brix = 1;
	r->brix = in->brix;
	if (!(density > 0) && al_density_from_brix(in->brix, &density) != AL_OK)
		density = 0;
	pct = ta_pct_w_w(r, density);
	if (!(pct > 0))
		return;
	if (strncmp(r->acid->name, "citric", 6) == 0) {
		double citric = pct * 192.123 / 3 / 1000 / r->acid->g_per_meq, c;

		if (al_brix_acid_correction(citric, &c) == AL_OK) {
			r->has_brix_corrected = 1;
			r->brix_corrected = in->brix + c;
		}
	} else
		r->flags |= AL_FLAG_BRIX_UNCORRECTED;
	r->has_ratio = 1;
	r->ratio = (r->has_brix_corrected ? r->brix_corrected : r->brix) / pct;
}

/* Brix, ratio and water limits join the decision: any outside fails;
 * limits without values to judge can only turn a pass into a retest,
 * never hide a fail. */
/* A value against a pair of limits: the flag low below min, high above
 * max, 0 inside; *missing set when a limit has no value to judge. */
static unsigned
outside(int has_min, double min, int has_max, double max, int has, double v,
	const unsigned flag[2], int *missing)
{
	if (!has_min && !has_max)
		return 0;
	if (!has) {
		*missing = 1;
		return 0;
	}
	if (has_min && v < min)
		return flag[0];
	return has_max && v > max ? flag[1] : 0;
}

static void
other_limits(al_group_result *r)
{
	static const unsigned brix_flags[2] = {AL_FLAG_BRIX_LOW,
					       AL_FLAG_BRIX_HIGH};
	static const unsigned ratio_flags[2] = {AL_FLAG_RATIO_LOW,
						AL_FLAG_RATIO_HIGH};
	static const unsigned water_flags[2] = {AL_FLAG_WATER_LOW,
						AL_FLAG_WATER_HIGH};
	const al_spec *sp = r->spec;
	double brix = r->has_brix_corrected ? r->brix_corrected : r->brix;
	unsigned out = 0;
	int missing = 0;

	if (sp == NULL || r->stats.n == 0)
		return;
	out |= outside(sp->has_brix_min, sp->brix_min, sp->has_brix_max,
		       sp->brix_max, r->has_brix, brix, brix_flags, &missing);
	out |= outside(sp->has_ratio_min, sp->ratio_min, sp->has_ratio_max,
		       sp->ratio_max, r->has_ratio, r->ratio, ratio_flags,
		       &missing);
	out |= outside(sp->has_water_min, sp->water_min, sp->has_water_max,
		       sp->water_max, r->has_water, r->water_pct, water_flags,
		       &missing);
	r->flags |= out | (missing ? AL_FLAG_NO_BRIX : 0);
	if (out)
		r->verdict = AL_VERDICT_FAIL;
	else if (missing && (r->verdict == AL_VERDICT_PASS ||
			     r->verdict == AL_VERDICT_COND_PASS))
		r->verdict = AL_VERDICT_RETEST;
}

/* What cannot be a pass: a result made of a value no sample can give,
 * or one whose figures left the range of the arithmetic (the rows'
 * checks keep them in it; this is the last guard), or one titrated on a
 * curve whose pH fell or scattered (electrode or mixing). It asks for a
 * retest unless it already fails. */
static void
never_pass(const al_eval_inputs *in, al_group_result *r)
{
	int broken = r->stats.n > 0 &&
		     !(isfinite(r->stats.mean) && isfinite(r->stats.sd) &&
		       (!r->has_u || isfinite(r->U)));
	int curve = (r->flags & (AL_FLAG_CURVE_FALLS | AL_FLAG_CURVE_NOISY)) != 0;

	if (in->impossible || broken)
		r->flags |= AL_FLAG_IMPLAUSIBLE;
	if ((in->impossible || broken || curve) &&
	    r->verdict != AL_VERDICT_FAIL && r->verdict != AL_VERDICT_NO_SPEC)
		r->verdict = AL_VERDICT_RETEST;
}

/* Readings one resolution apart come out a hair either side of res once
 * converted to the result's unit: a part in a million covers that. */
#define TIE_SLACK (1 + 1e-6)

/* 1 when a suspect value lies within the reading resolution res of
 * another replicate: equal readings are no outlier, whatever G says
 * (with two equal values Grubbs' G at n = 3 is at its maximum). */
static int
tied(const double *x, size_t n, size_t suspect, double res)
{
	for (size_t i = 0; i < n; i++)
		if (i != suspect && fabs(x[i] - x[suspect]) <= res * TIE_SLACK)
			return 1;
	return 0;
}

/* Grubbs's flags for a G that is no tie. */
static void
grubbs_flags(al_group_result *r, size_t n, int tie)
{
	if (tie)
		return;
	if (r->grubbs_g > al_grubbs_critical(n, 0.01))
		r->flags |= AL_FLAG_OUTLIER;
	else if (r->grubbs_g > al_grubbs_critical(n, 0.05))
		r->flags |= AL_FLAG_STRAGGLER;
}

/* Whether a flagged outlier is left out: asked for, and n above 3. */
static int
excludes(const al_assay_options *opt, const al_group_result *r, size_t n)
{
	return opt->qc.exclude_outliers && (r->flags & AL_FLAG_OUTLIER) &&
	       n > 3;
}

double
al_eval_resolution(const al_assay_options *opt, const al_spec *spec,
		   double titrant_ml, double blank_ml)
{
	double res = spec && spec->has_resolution ? spec->resolution_ml
						  : opt->qc.resolution_ml;
	double net = titrant_ml - blank_ml;

	return net > 0 ? res / net : 0;
}

/* The statistics of a result past AL_VALUES_KEPT values, from running
 * sums: mean and SD (Welford), Grubbs from the farther extreme, the
 * range from the extremes; an excluded outlier comes off the sums. No
 * median (it needs every value) and no Dixon (n > 10). */
static void
many_values(const al_assay_options *opt, const al_stream *s, size_t n,
	    double res_rel, al_group_result *r, size_t *used)
{
	double mean = s->mean, m2 = s->m2, lo = s->lo, hi = s->hi;
	double sd = sqrt(m2 / (double)(n - 1));

	r->flags |= AL_FLAG_MANY;
	if (sd > 0) {
		int low = mean - s->lo > s->hi - mean ||
			  (mean - s->lo == s->hi - mean && s->lo_i < s->hi_i);
		double gap = low ? s->lo2 - s->lo : s->hi - s->hi2;

		r->has_grubbs = 1;
		r->grubbs_index = low ? s->lo_i : s->hi_i;
		r->grubbs_g = (low ? mean - s->lo : s->hi - mean) / sd;
		grubbs_flags(r, n, gap <= res_rel * fabs(mean) * TIE_SLACK);
		if (excludes(opt, r, n)) {
			double x = low ? s->lo : s->hi;
			double mean2 = ((double)n * mean - x) / (double)(n - 1);

			m2 -= (x - mean) * (x - mean2);
			mean = mean2;
			if (low)
				lo = s->lo2;
			else
				hi = s->hi2;
			*used = n - 1;
			r->has_excluded = 1;
			r->excluded_index = r->grubbs_index;
			r->flags |= AL_FLAG_EXCLUDED;
		}
	}
	al_stats_from_moments(*used, mean, m2 > 0 ? m2 : 0, opt->confidence,
			      &r->stats);
	r->range = hi - lo;
}

void
al_eval_stats(const al_assay_options *opt, const al_stream *stream,
	      double res_rel, double *scratch, al_group_result *r,
	      size_t *used)
{
	size_t n = r->n_values;
	int excluded;

	*used = n;
	r->has_grubbs = r->has_excluded = 0;
	r->grubbs_index = 0;
	if (stream) {
		many_values(opt, stream, n, res_rel, r, used);
		return;
	}
	al_stats_summarise(r->values, n, opt->confidence, &r->stats);
	if (n >= 3 && r->stats.has_sd) {
		r->has_grubbs = 1;
		r->grubbs_g = al_grubbs_g(r->values, n, r->stats.mean,
					  r->stats.sd, &r->grubbs_index);
		grubbs_flags(r, n,
			     tied(r->values, n, r->grubbs_index,
				  res_rel * fabs(r->stats.mean)));
	}
	/* the values the result is made of: all, or all but an excluded
	 * outlier (ISO 5725-2 keeps it in the record; so do we) */
	excluded = excludes(opt, r, n);
	for (size_t i = 0, k = 0; i < n; i++)
		if (!excluded || i != r->grubbs_index)
			scratch[k++] = r->values[i];
	if (excluded) {
		*used = n - 1;
		r->has_excluded = 1;
		r->excluded_index = r->grubbs_index;
		r->flags |= AL_FLAG_EXCLUDED;
		al_stats_summarise(scratch, *used, opt->confidence, &r->stats);
	}
}

/* A mean of k values with one of them, x, taken off. */
static double
mean_without(double mean, size_t k, double x)
{
	return k > 1 ? ((double)k * mean - x) / (double)(k - 1) : 0;
}

/* Takes one row's inputs off the means of a result's inputs (n rows);
 * the quantities few rows have come off their own counts. */
static void
leave_out(al_eval_inputs *in, const al_row_inputs *x)
{
	in->titrant_ml = mean_without(in->titrant_ml, in->n, x->titrant_ml);
	in->blank_ml = mean_without(in->blank_ml, in->n, x->blank_ml);
	in->conc = mean_without(in->conc, in->n, x->conc);
	in->amount = mean_without(in->amount, in->n, x->amount);
	in->made_up_ml = mean_without(in->made_up_ml, in->n, x->made_up_ml);
	in->aliquot_ml = mean_without(in->aliquot_ml, in->n, x->aliquot_ml);
	in->n--;
	if (x->conc_u >= 0)
		in->conc_u = mean_without(in->conc_u, in->n_conc_u--, x->conc_u);
	in->all_conc_u = in->n > 0 && in->n_conc_u == in->n;
	if (x->brix >= 0) {
		in->brix = mean_without(in->brix, in->n_brix--, x->brix);
		in->has_brix = in->n_brix > 0;
	}
	if (x->water_pct >= 0) {
		in->water_pct = mean_without(in->water_pct, in->n_water--,
					     x->water_pct);
		in->has_water = in->n_water > 0;
	}
	if (x->density >= 0)
		in->density = mean_without(in->density, in->n_density--,
					   x->density);
}

void
al_eval_result(const al_assay_options *opt, const al_eval_inputs *in,
	       double *scratch, al_group_result *r)
{
	const al_qc_options *q = &opt->qc;
	size_t n = r->n_values, used;
	double lo, hi;
	unsigned why;
	int range_exceeded = 0;
	double res_rel = al_eval_resolution(opt, r->spec, in->titrant_ml,
					    in->blank_ml);
	al_eval_inputs kept;

	al_eval_stats(opt, in->stream, res_rel, scratch, r, &used);
	if (r->has_excluded && in->extremes) {
		/* the excluded outlier is the lowest or the highest value:
		 * every figure comes from the rows kept */
		double x = in->stream ? (r->excluded_index == in->stream->lo_i
						 ? in->stream->lo
						 : in->stream->hi)
				      : r->values[r->excluded_index];

		kept = *in;
		leave_out(&kept, &in->extremes[x == in->extremes[0].value ? 0
									 : 1]);
		in = &kept;
	}
	if (!in->stream) {
		if (n >= 3 && n <= 10) {
			r->has_dixon = 1;
			r->dixon_q = al_dixon_q(r->values, n, &r->dixon_index);
			if (r->dixon_q > al_dixon_critical(n, 0.95) &&
			    !tied(r->values, n, r->dixon_index,
				  res_rel * fabs(r->stats.mean)))
				r->flags |= AL_FLAG_DIXON;
		}
		if (used > 0) {
			gsl_sort(scratch, 1, used);
			r->has_median = 1;
			r->median = gsl_stats_median_from_sorted_data(scratch, 1,
								      used);
			lo = scratch[0];
			hi = scratch[used - 1];
			r->range = hi - lo;
		}
	}
	if (r->spec && r->spec->has_sr && used >= 2) {
		r->has_critical_range = 1;
		r->critical_range = al_critical_range_factor(used) * r->spec->sr;
		if (r->range > r->critical_range) {
			range_exceeded = 1;
			r->flags |= AL_FLAG_RANGE;
		}
	}
	if (r->stats.has_rsd) {
		double c = mass_fraction(r);

		if (c > 0) {
			r->has_horrat = 1;
			r->horrat = r->stats.rsd_pct / al_horwitz_rsd(c);
		}
	}
	uncertainty(opt, in, r);
	r->verdict = al_judge_rule(r->spec, &r->stats, q->decision,
				   r->has_u ? q->guard_r * r->U : 0,
				   range_exceeded, &why);
	if (r->stats.n == 1)
		r->flags |= AL_FLAG_SINGLE;
	if (why & AL_WHY_FEW)
		r->flags |= AL_FLAG_FEW;
	if (why & AL_WHY_RSD)
		r->flags |= AL_FLAG_RSD;
	if (why & AL_WHY_BELOW_MIN)
		r->flags |= AL_FLAG_BELOW_MIN;
	if (why & AL_WHY_ABOVE_MAX)
		r->flags |= AL_FLAG_ABOVE_MAX;
	juice(in, r);
	other_limits(r);
	never_pass(in, r);
}

struct cochran_cell {
	const char *product;
	uint64_t hash;
	size_t n, count, first, best_result;
	double sum, best;
};

struct al_cochran_acc {
	struct cochran_cell *cells;
	size_t n_cells, cap_cells;
	uint32_t *slots; /* 1 + cell, 0 empty */
	size_t n_slots;
	size_t last; /* 1 + the cell of the previous result */
};

void
al_cochran_acc_free(al_cochran_acc *acc)
{
	if (acc == NULL)
		return;
	AL_FREE_ALL(acc->cells, acc->slots, acc);
}

al_cochran_acc *
al_cochran_acc_new(void)
{
	return al_calloc(1, sizeof(al_cochran_acc));
}

static uint64_t
cell_hash(const char *product, size_t n)
{
	uint64_t h = al_fnv1a(AL_FNV_OFFSET, product, strlen(product));

	return (h ^ n) * 1099511628211ULL;
}

static int
cell_regrow(al_cochran_acc *acc)
{
	size_t n = acc->n_slots ? 2 * acc->n_slots : 64;
	uint32_t *slots = al_calloc(n, sizeof *slots);

	if (slots == NULL)
		return -1;
	for (size_t i = 0; i < acc->n_cells; i++) {
		size_t j = (size_t)acc->cells[i].hash & (n - 1);

		while (slots[j])
			j = (j + 1) & (n - 1);
		slots[j] = (uint32_t)(i + 1);
	}
	al_free(acc->slots);
	acc->slots = slots;
	acc->n_slots = n;
	return 0;
}

int
al_cochran_acc_add(al_cochran_acc *acc, const char *product, size_t n,
		   double variance, size_t result)
{
	struct cochran_cell *c = NULL;

	if (acc->last) {
		c = &acc->cells[acc->last - 1];
		if (c->n != n || strcmp(c->product, product) != 0)
			c = NULL;
	}
	if (c == NULL) {
		uint64_t h = cell_hash(product, n);
		size_t j;

		if (2 * (acc->n_cells + 1) > acc->n_slots && cell_regrow(acc))
			return -1;
		for (j = (size_t)h & (acc->n_slots - 1); acc->slots[j];
		     j = (j + 1) & (acc->n_slots - 1)) {
			struct cochran_cell *x = &acc->cells[acc->slots[j] - 1];

			if (x->hash == h && x->n == n &&
			    strcmp(x->product, product) == 0) {
				c = x;
				break;
			}
		}
		if (c == NULL) {
			if (acc->n_cells == UINT32_MAX - 1)
				return -1;
			if (acc->n_cells == acc->cap_cells) {
				size_t cap = acc->cap_cells ? 2 * acc->cap_cells : 16;
				struct cochran_cell *grown =
					al_realloc(acc->cells, cap * sizeof *grown);

				if (grown == NULL)
					return -1;
				acc->cells = grown;
				acc->cap_cells = cap;
			}
			c = &acc->cells[acc->n_cells++];
			memset(c, 0, sizeof *c);
			c->product = product;
			c->hash = h;
			c->n = n;
			c->first = c->best_result = result;
			acc->slots[j] = (uint32_t)acc->n_cells;
		}
		acc->last = (size_t)(c - acc->cells) + 1;
	}
	/* as al_cochran_c over the variances in result order */
	c->sum += variance;
	if (variance > c->best) {
		c->best = variance;
		c->best_result = result;
	}
	c->count++;
	return 0;
}

static int
by_product_n(const void *a, const void *b)
{
	const struct cochran_cell *x = a, *y = b;
	int c = strcmp(x->product, y->product);

	if (c != 0)
		return c;
	return x->n < y->n ? -1 : x->n > y->n;
}

al_cochran *
al_cochran_acc_finish(al_cochran_acc *acc, size_t *n_out, int *oom)
{
	al_cochran *out = NULL;
	size_t n_found = 0, m = acc->n_cells;
	struct cochran_cell *e = acc->cells;

	*n_out = 0;
	*oom = 0;
	if (m == 0)
		return NULL;
	qsort(e, m, sizeof *e, by_product_n);
	acc->last = 0; /* the cells moved */
	for (size_t start = 0; start < m;) {
		size_t end = start, best = start;
		const struct cochran_cell *c;
		al_cochran *grown;

		while (end < m && strcmp(e[end].product, e[start].product) == 0)
			end++;
		/* the modal n, the larger on a tie (cells in increasing n) */
		for (size_t a = start; a < end; a++)
			if (e[a].count >= e[best].count)
				best = a;
		start = end;
		c = &e[best];
		if (c->count < 2)
			continue;
		grown = al_realloc(out, (n_found + 1) * sizeof *grown);
		if (grown == NULL)
			goto nomem;
		out = grown;
		out[n_found].product = c->product;
		out[n_found].l = c->count;
		out[n_found].n = c->n;
		out[n_found].c = c->sum > 0 ? c->best / c->sum : 0;
		out[n_found].crit5 = al_cochran_critical(c->count, c->n, 0.05);
		out[n_found].crit1 = al_cochran_critical(c->count, c->n, 0.01);
		out[n_found].result = c->sum > 0 ? c->best_result : c->first;
		n_found++;
	}
	*n_out = n_found;
	return out;
nomem:
	al_free(out);
	*oom = 1;
	return NULL;
}
