/* acidlot: replicate statistics (GSL).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_STATS_H
#define ACIDLOT_STATS_H

#include <stddef.h>

typedef struct al_summary {
	size_t n;
	double mean;
	int has_sd;    /* 0 when n < 2: sd, rsd and the interval are undefined */
	double sd;     /* sample standard deviation, n - 1 in the denominator */
	double rsd_pct;/* 100 sd / |mean|; undefined when mean is 0 */
	int has_rsd;
	double t;      /* Student t quantile used for the interval */
	double ci_low, ci_high; /* mean -/+ t sd / sqrt(n) */
} al_summary;

/* Summarises x[0..n) with a two-sided confidence interval at `level`
 * (0.95 for 95 %). n = 0 gives n = 0 and a NaN-free zeroed record. */
void al_stats_summarise(const double *x, size_t n, double level,
			al_summary *out);

/* The mean and the sample standard deviation of x[0..n) alone, the
 * same doubles as al_stats_summarise's: 1 with both set, or 0 with only
 * the mean (0 for no values) when n < 2. */
int al_stats_sd(const double *x, size_t n, double *mean, double *sd);

/* The same summary from running moments: n values, their mean and the
 * sum of squared deviations from it (m2), as Welford's algorithm keeps
 * them (Welford 1962; Knuth TAOCP vol. 2, 4.2.2). */
void al_stats_from_moments(size_t n, double mean, double m2, double level,
			   al_summary *out);

/* Upper quantile of Student's t: the t with P(T <= t) = p, df degrees
 * of freedom (GSL gsl_cdf_tdist_Pinv). */
double al_stats_t_quantile(double p, double df);

#endif
