/* acidlot: replicate statistics on GSL.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * GSL's gsl_stats_sd returns NaN for n = 1 and 0 for n = 0 without a
 * word, so the preconditions are checked here (STYLE.md). */
#include "acidlot/stats.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <string.h>

double
al_stats_t_quantile(double p, double df)
{
	return gsl_cdf_tdist_Pinv(p, df);
}

/* The interval's t for n values at `level`, remembered for small n:
 * it depends only on them (PERF-NOTES.md). */
static double
t_for(double level, size_t n)
{
	/* one per thread: the report may evaluate in two */
	static _Thread_local double at_level, cache[64];

	if (n < 64 && level == at_level && cache[n] != 0)
		return cache[n];
	if (n < 64 && level != at_level) {
		memset(cache, 0, sizeof cache);
		at_level = level;
	}
	/* two-sided: the (1 + level)/2 quantile, 0.975 for 95 % */
	double t = al_stats_t_quantile(0.5 + level / 2.0, (double)(n - 1));

	if (n < 64)
		cache[n] = t;
	return t;
}

/* The rest of a summary of n >= 2 values once its mean and sd are known:
 * RSD and the two-sided interval mean -/+ t sd / sqrt(n). */
static void
spread(al_summary *out, double sd, double level)
{
	out->has_sd = 1;
	out->sd = sd;
	if (out->mean != 0) {
		out->has_rsd = 1;
		out->rsd_pct = 100.0 * out->sd / fabs(out->mean);
	}
	out->t = t_for(level, out->n);
	out->ci_low = out->mean - out->t * out->sd / sqrt((double)out->n);
	out->ci_high = out->mean + out->t * out->sd / sqrt((double)out->n);
}

void
al_stats_from_moments(size_t n, double mean, double m2, double level,
		      al_summary *out)
{
	memset(out, 0, sizeof *out);
	out->n = n;
	if (n == 0)
		return;
	out->mean = mean;
	if (n < 2)
		return;
	spread(out, sqrt(m2 / (double)(n - 1)), level);
}

int
al_stats_sd(const double *x, size_t n, double *mean, double *sd)
{
	*mean = n > 0 ? gsl_stats_mean(x, 1, n) : 0;
	if (n < 2)
		return 0;
	*sd = gsl_stats_sd_m(x, 1, n, *mean);
	return 1;
}

void
al_stats_summarise(const double *x, size_t n, double level, al_summary *out)
{
	double sd;

	memset(out, 0, sizeof *out);
	out->n = n;
	if (al_stats_sd(x, n, &out->mean, &sd))
		spread(out, sd, level);
}
