/* acidlot: the assay run's results: each group evaluated (statistics,
 * screens, uncertainty, verdict: evaluate.c), Cochran's test across
 * them, and what the run used. assay.c reads the rows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/assay.h"

#include <string.h>

#include "acidlot/alloc.h"
#include "evaluate.h"
#include "run.h"

static void evaluate(const al_assay *run, struct al_assay_reader *rd,
		     size_t i);

/* Evaluated on demand: a run of millions of results keeps none of them;
 * the one returned is the reader's. */
static const al_group_result *
reader_result(struct al_assay_reader *rd, size_t i)
{
	if (!rd->run->finished || i >= rd->run->groups.n)
		return NULL;
	if (rd->cur_index != i + 1) {
		evaluate(rd->run, rd, i);
		rd->cur_index = i + 1;
	}
	return &rd->cur;
}

const al_group_result *
al_assay_result(const al_assay *run, size_t i)
{
	return reader_result(&((al_assay *)run)->own, i);
}

al_assay_reader *
al_assay_reader_new(const al_assay *run)
{
	al_assay_reader *rd = al_calloc(1, sizeof *rd);

	if (rd != NULL)
		rd->run = run;
	return rd;
}

const al_group_result *
al_assay_reader_result(al_assay_reader *rd, size_t i)
{
	return reader_result(rd, i);
}

void
al_assay_reader_free(al_assay_reader *rd)
{
	al_free(rd);
}

/* The group's reading resolution relative to its results
 * (al_eval_resolution at its mean titrant and blank). */
static double
resolution_of(const al_assay *run, const al_group *g)
{
	const char *product = run->groups.arena + g->key;
	const al_group_extra *x = al_groups_extra_of(&run->groups, g);
	double n = g->n ? (double)g->n : 1;

	return al_eval_resolution(&run->opt,
				  al_spec_find(run->opt.specs, product),
				  g->sum_titrant / n,
				  x ? x->sum_blank / n : 0);
}

/* The acid a result is expressed as: its rows', or, when every row of
 * it was rejected, its spec's or the run's default. */
static const al_acid *
result_acid(const al_assay *run, const al_group *g, const al_spec *spec)
{
	if (g->acid != 0)
		return al_groups_acid(&run->groups, g);
	return spec && spec->acid ? spec->acid : run->opt.default_acid;
}

/* Evaluates group i into the reader's result: statistics, screens,
 * uncertainty, verdict. Reads the run, but for the verdict and flags
 * that the first evaluation of a result keeps in its group. */
static void
evaluate(const al_assay *run, struct al_assay_reader *rd, size_t i)
{
	al_group_result *r = &rd->cur;
	const al_group *g = &run->groups.g[i];
	const al_group_extra *x = al_groups_extra_of(&run->groups, g);
	size_t pl, ll;
	const char *k = al_groups_key(&run->groups, g, &pl, &ll);
	al_eval_inputs in;
	double n = g->n ? (double)g->n : 1;
	const al_spec *spec = al_spec_find(run->opt.specs, k);

	memset(r, 0, sizeof *r);
	r->product = k;
	r->lot = k + pl + 1;
	r->sample = k + pl + ll + 2;
	r->spec = spec;
	r->acid = result_acid(run, g, spec);
	if (g->acid == 0) {
		/* every row of it was rejected: name it as its spec or the
		 * defaults would */
		r->unit = spec && spec->has_unit ? spec->unit
			  : run->opt.has_unit	 ? run->opt.unit
						 : AL_UNIT_G_100G;
	} else {
		r->unit = (al_unit)g->unit;
	}
	r->values = al_group_values(g);
	r->n_values = g->n;
	r->flags = g->flags;
	memset(&in, 0, sizeof in);
	if (g->bits & AL_G_STREAM)
		in.stream = g->values.stream;
	in.titrant_ml = g->sum_titrant / n;
	in.conc = g->sum_conc / n;
	in.amount = g->sum_amount / n;
	in.basis = g->bits & AL_G_VOLUME ? AL_BASIS_VOLUME : AL_BASIS_MASS;
	in.n = g->n;
	if (x) {
		in.blank_ml = x->sum_blank / n;
		in.made_up_ml = x->sum_made_up / n;
		in.aliquot_ml = x->sum_aliquot / n;
		in.all_conc_u = g->n > 0 && x->n_conc_u == g->n;
		in.conc_u = x->n_conc_u ? x->sum_conc_u / x->n_conc_u : 0;
		in.has_brix = x->n_brix > 0;
		in.brix = x->n_brix ? x->sum_brix / x->n_brix : 0;
		in.has_water = x->n_water > 0;
		in.water_pct = x->n_water ? x->sum_water / x->n_water : 0;
		in.density = x->n_density ? x->sum_density / x->n_density : 0;
		in.n_conc_u = x->n_conc_u;
		in.n_brix = x->n_brix;
		in.n_water = x->n_water;
		in.n_density = x->n_density;
	}
	in.extremes = al_groups_extremes(&run->groups, i);
	r->anhydrous = (g->bits & AL_G_ANHYDROUS) != 0;
	in.impossible = (g->bits & AL_G_IMPOSSIBLE) != 0;
	al_eval_result(&run->opt, &in, rd->scratch, r);
	if (!(g->bits & AL_G_JUDGED)) {
		/* the run keeps each result's verdict and flags from its
		 * first evaluation, in whichever thread: each result is
		 * evaluated by one at a time (al_assay_finish,
		 * al_report_write). Evaluation only adds flags, so keeping
		 * them all changes no later evaluation and lets
		 * al_assay_result_flags answer without one. */
		al_group *w = &run->groups.g[i];

		w->verdict = (uint8_t)r->verdict;
		w->flags = r->flags;
		w->bits |= AL_G_JUDGED;
	}
	r->has_date = x && x->n_dates > 0;
	r->date = r->has_date ? x->latest_date : 0;
	if ((g->flags & AL_FLAG_ENDPOINT_LOW) && x) {
		r->endpoint_ph = x->min_endpoint;
		if (al_endpoint_ph_needed(r->acid->pka, r->acid->n_pka,
					  r->acid->protons, AL_ENDPOINT_SHARE,
					  &r->endpoint_ph_needed) != AL_OK)
			r->endpoint_ph_needed = 14;
	}
}

/* Adds an item to a short list of pointers in order of first
 * appearance; 0, or -1 when memory runs out. */
static int
note_used(const void ***list, size_t *n, const void *item)
{
	const void **grown;

	if (item == NULL || (*n > 0 && (*list)[*n - 1] == item))
		return 0;
	for (size_t i = 0; i < *n; i++)
		if ((*list)[i] == item)
			return 0;
	grown = al_realloc((void *)*list, (*n + 1) * sizeof *grown);
	if (grown == NULL)
		return -1;
	grown[(*n)++] = item;
	*list = grown;
	return 0;
}

/* What Cochran's test takes of a result: its product, n and variance,
 * from its statistics as evaluate gives them, without the rest of an
 * evaluation: al_stats_sd of its values, or al_eval_stats where an
 * outlier may be left out or only running sums are kept. */
struct spread {
	const char *product;
	double var;
	size_t n;
	int has_sd;
};

static void
spread_of(const al_assay *run, struct al_assay_reader *rd, size_t i,
	  struct spread *x)
{
	const al_group *g = &run->groups.g[i];
	al_group_result *r = &rd->cur;
	size_t used;

	x->product = run->groups.arena + g->key;
	if (!run->opt.qc.exclude_outliers && !(g->bits & AL_G_STREAM)) {
		/* no value is left out: the statistics of all of them */
		double mean, sd = 0;

		x->has_sd = al_stats_sd(al_group_values(g), g->n, &mean, &sd);
		x->var = sd * sd;
		x->n = g->n;
		return;
	}
	rd->cur_index = 0; /* cur holds no whole result from here on */
	r->values = al_group_values(g);
	r->n_values = g->n;
	r->flags = g->flags;
	al_eval_stats(&run->opt, g->bits & AL_G_STREAM ? g->values.stream : NULL,
		      resolution_of(run, g), rd->scratch, r, &used);
	x->has_sd = r->stats.has_sd;
	x->var = r->stats.sd * r->stats.sd;
	x->n = r->stats.n;
}

/* Cochran's tests, and their flags on the results they single out. */
static al_status
finish_cochran(al_assay *run)
{
	al_cochran_acc *acc = al_cochran_acc_new();
	int oom = 0;

	if (acc == NULL)
		return AL_ENOMEM;
	/* the key index is not needed any more */
	al_groups_drop_index(&run->groups);
	run->finished = 1;
	run->own.run = run;
	run->own.cur_index = 0;
	memset(run->counts.by_verdict, 0, sizeof run->counts.by_verdict);
	run->counts.groups = run->groups.n;
	for (size_t i = 0; !oom && i < run->groups.n; i++) {
		struct spread x;

		spread_of(run, &run->own, i, &x);
		oom = x.has_sd &&
		      al_cochran_acc_add(acc, x.product, x.n, x.var, i) != 0;
	}
	if (!oom)
		run->cochran = al_cochran_acc_finish(acc, &run->n_cochran, &oom);
	al_cochran_acc_free(acc);
	if (oom)
		return AL_ENOMEM;
	for (size_t i = 0; i < run->n_cochran; i++) {
		const al_cochran *c = &run->cochran[i];

		if (c->c > c->crit1)
			run->groups.g[c->result].flags |= AL_FLAG_COCHRAN_OUTLIER;
		else if (c->c > c->crit5)
			run->groups.g[c->result].flags |= AL_FLAG_COCHRAN_STRAGGLER;
	}
	run->own.cur_index = 0;
	return AL_OK;
}

al_status
al_assay_finish_lazy(al_assay *run)
{
	al_status st = finish_cochran(run);

	if (st != AL_OK)
		return st;
	return run->on_row ? al_run_replay(run) : AL_OK;
}

al_status
al_assay_settle(al_assay *run)
{
	memset(run->counts.by_verdict, 0, sizeof run->counts.by_verdict);
	run->n_acids_used = run->n_specs_used = 0;
	for (size_t i = 0; i < run->groups.n; i++) {
		const al_group *g = &run->groups.g[i];
		const al_spec *spec;
		const char *product = run->groups.arena + g->key;

		if (!(g->bits & AL_G_JUDGED))
			reader_result(&run->own, i);
		run->counts.by_verdict[g->verdict]++;
		spec = al_spec_find(run->opt.specs, product);
		if (note_used((const void ***)&run->acids_used,
			      &run->n_acids_used,
			      result_acid(run, g, spec)) != 0 ||
		    note_used((const void ***)&run->specs_used,
			      &run->n_specs_used, spec) != 0)
			return AL_ENOMEM;
	}
	return AL_OK;
}

al_status
al_assay_finish(al_assay *run)
{
	al_status st = finish_cochran(run);

	if (st == AL_OK)
		st = al_assay_settle(run);
	if (st != AL_OK)
		return st;
	return run->on_row ? al_run_replay(run) : AL_OK;
}

unsigned
al_assay_result_flags(const al_assay *run, size_t i)
{
	return run->finished && i < run->groups.n ? run->groups.g[i].flags : 0;
}

al_verdict
al_assay_result_verdict(const al_assay *run, size_t i)
{
	return (al_verdict)run->groups.g[i].verdict;
}

const al_acid *
al_assay_acid_used(const al_assay *run, size_t i)
{
	return i < run->n_acids_used ? run->acids_used[i] : NULL;
}

const al_spec *
al_assay_spec_used(const al_assay *run, size_t i)
{
	return i < run->n_specs_used ? run->specs_used[i] : NULL;
}

const al_cochran *
al_assay_cochran(const al_assay *run, size_t *n)
{
	*n = run->n_cochran;
	return run->cochran;
}


