/* acidlot command line: the end of an assay on the screen: warnings on
 * results, the summary and the exit status.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>

#include "assay_cli.h"

/* Decimals enough for x[0..n) printed with %.*f to differ wherever the
 * numbers do, so that a comparison the line states can be seen (at
 * least 4, at most 12). */
static int
same_at(double a, double b, int d)
{
	char p[64], q[64];

	snprintf(p, sizeof p, "%.*f", d, a);
	snprintf(q, sizeof q, "%.*f", d, b);
	return strcmp(p, q) == 0;
}

static int
telling_decimals(const double *x, size_t n)
{
	int d = 4;

	for (size_t i = 0; i < n; i++)
		for (size_t j = i + 1; j < n; j++)
			while (d < 12 && x[i] != x[j] && same_at(x[i], x[j], d))
				d++;
	return d;
}

/* The results with one verdict, named: "fail: P/L/S, ..." (the first
 * ten, then how many more). */
static void
name_results(const al_assay *run, al_verdict v, unsigned long count)
{
	size_t shown = 0;

	if (count == 0)
		return;
	fprintf(stderr, PROG ": %s:", al_verdict_name(v));
	for (size_t i = 0; i < al_assay_group_count(run) && shown < 10; i++) {
		const al_group_result *r;

		if (al_assay_result_verdict(run, i) != v)
			continue;
		r = al_assay_result(run, i);
		fputs(shown++ ? ", " : " ", stderr);
		cli_put_escaped(stderr, r->product);
		fputc('/', stderr);
		cli_put_escaped(stderr, r->lot);
		fputc('/', stderr);
		cli_put_escaped(stderr, r->sample);
	}
	if (count > shown)
		fprintf(stderr, " and %lu more", count - shown);
	fputc('\n', stderr);
}

static void
summary(const al_assay *run, const struct args *a, unsigned long rejected)
{
	al_assay_counts c = al_assay_get_counts(run);
	size_t n;
	const al_cochran *tests = al_assay_cochran(run, &n);

	for (size_t i = 0; i < n; i++) {
		const al_cochran *t = &tests[i];
		const al_group_result *r = al_assay_result(run, t->result);
		double x[3] = {t->c, t->crit5, t->crit1};
		int d = telling_decimals(x, 3);

		cli_error("Cochran %s: C = %.*f over %zu results of n = %zu "
			"(critical %.*f at 5 %%, %.*f at 1 %%)%s%s/%s",
			t->product, d, t->c, t->l, t->n, d, t->crit5, d, t->crit1,
			t->c > t->crit1	  ? ": variance outlier "
			: t->c > t->crit5 ? ": variance straggler "
					  : ": largest variance ",
			r->lot, r->sample);
	}
	fprintf(stderr,
		PROG ": %lu result%s: %lu pass, %lu fail, %lu retest, %lu "
		     "no-spec",
		c.groups, c.groups == 1 ? "" : "s",
		c.by_verdict[AL_VERDICT_PASS], c.by_verdict[AL_VERDICT_FAIL],
		c.by_verdict[AL_VERDICT_RETEST],
		c.by_verdict[AL_VERDICT_NO_SPEC]);
	if (a->aopt.qc.decision == AL_DECISION_GUARDED)
		fprintf(stderr, ", %lu conditional-pass, %lu conditional-fail",
			c.by_verdict[AL_VERDICT_COND_PASS],
			c.by_verdict[AL_VERDICT_COND_FAIL]);
	fprintf(stderr, "; %lu rows read = %lu used + %lu rejected",
		c.rows_read, c.rows_used, c.rows_bad);
	if (a->ropt.guarded)
		fprintf(stderr, "; %lu text cell%s guarded against formulas",
			a->ropt.guarded, a->ropt.guarded == 1 ? "" : "s");
	fputc('\n', stderr);
	name_results(run, AL_VERDICT_FAIL, c.by_verdict[AL_VERDICT_FAIL]);
	name_results(run, AL_VERDICT_COND_FAIL,
		     c.by_verdict[AL_VERDICT_COND_FAIL]);
	name_results(run, AL_VERDICT_RETEST, c.by_verdict[AL_VERDICT_RETEST]);
	name_results(run, AL_VERDICT_COND_PASS,
		     c.by_verdict[AL_VERDICT_COND_PASS]);
	if (rejected)
		cli_error("%lu row%s rejected: see %s", rejected,
			rejected == 1 ? "" : "s", a->rejects);
}

/* Results that nothing judged (no-spec; with --spec a result whose
 * rows were all rejected is a retest): with --spec, each product without
 * a specification row is named once, with any row it matches ignoring
 * case and punctuation (never matched silently); without --spec, the
 * summary says so. The number of results not judged, or -1 when memory
 * runs out. Only the no-spec results are evaluated again. */
long
assay_unjudged(const al_assay *run, al_spec_table *specs)
{
	long count = (long)al_assay_get_counts(run).by_verdict[AL_VERDICT_NO_SPEC];
	const char *last = NULL; /* in the run's keys: stays valid */

	for (size_t i = 0; specs && count && i < al_assay_group_count(run);
	     i++) {
		const al_group_result *r;
		const al_spec *near;
		int oom;

		if (al_assay_result_verdict(run, i) != AL_VERDICT_NO_SPEC)
			continue;
		r = al_assay_result(run, i);
		if (last && strcmp(last, r->product) == 0)
			continue;
		last = r->product;
		near = al_spec_find_loose(specs, r->product, &oom);
		if (oom)
			return -1;
		if (near)
			cli_error("warning: product '%s' (%s/%s) has no "
				  "specification row; '%s' (line %lu) differs "
				  "only in case, blanks or punctuation: not "
				  "judged",
				  r->product, r->lot, r->sample, near->product,
				  near->line);
		else
			cli_error("warning: product '%s' (%s/%s) has no "
				  "specification row: not judged",
				  r->product, r->lot, r->sample);
	}
	return count;
}

static void
endpoint_warnings(const al_assay *run)
{
	for (size_t i = 0; i < al_assay_group_count(run); i++) {
		const al_group_result *r;
		double got;

		if (!(al_assay_result_flags(run, i) &
		      (AL_FLAG_RANGE | AL_FLAG_ENDPOINT_LOW)))
			continue;
		r = al_assay_result(run, i);

		if (r->flags & AL_FLAG_RANGE)
			cli_error("warning: %s/%s/%s: the range %.4g of %zu "
				"results exceeds the critical range %.4g = "
				"f(%zu) sr (ISO 5725-6): take further results; "
				"if the range of all of them still exceeds its "
				"critical range, report the median",
				r->product, r->lot, r->sample, r->range, r->stats.n,
				r->critical_range, r->stats.n);

		if (!(r->flags & AL_FLAG_ENDPOINT_LOW))
			continue;
		got = al_protons_titrated(r->acid->pka, r->acid->n_pka,
					  r->endpoint_ph);
		cli_error("warning: %s/%s/%s: endpoint pH %.2f titrates "
			"%.3f of the %d protons of %s the factor assumes; "
			"pH %.1f or above would titrate 99 %%",
			r->product, r->lot, r->sample, r->endpoint_ph, got,
			r->acid->protons, r->acid->name,
			ceil(r->endpoint_ph_needed * 10 - 1e-9) / 10);
	}
}

/* The warnings and summary on stderr, and the exit status. */
int
assay_conclude(const struct job *j)
{
	al_assay_counts c = al_assay_get_counts(j->run);

	endpoint_warnings(j->run);
	summary(j->run, &j->a, j->rejs.count);
	if (j->specs == NULL)
		cli_error("nothing was judged: no --spec was given");
	/* conditional statements are not a pass (ILAC G8 4.2.2); a result
	 * no specification judged is not released */
	return c.by_verdict[AL_VERDICT_FAIL] ||
			       c.by_verdict[AL_VERDICT_RETEST] ||
			       c.by_verdict[AL_VERDICT_COND_PASS] ||
			       c.by_verdict[AL_VERDICT_COND_FAIL] ||
			       (j->specs && j->open_results > 0)
		       ? EXIT_NOT_PASS
		       : EXIT_ALL_PASS;
}

