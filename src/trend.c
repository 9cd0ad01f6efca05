/* acidlot: control charts of a series of results (METHODS.md s.9).
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Individuals: centre and sigma from the baseline (mean; mean moving
 * range / d2), limits centre +/- 3 sigma, moving-range UCL D4 MR-bar.
 * EWMA (Roberts 1959; NIST/SEMATECH e-Handbook 6.3.2.4): z_0 = centre,
 * z_i = lambda x_i + (1 - lambda) z_(i-1), limits centre +/- W sigma
 * sqrt(lambda / (2 - lambda) (1 - (1 - lambda)^(2i))).
 * Tabular CUSUM (Page 1954; Montgomery, Introduction to Statistical
 * Quality Control, ch. 9): C+_i = max(0, x_i - (centre + K) + C+_(i-1)),
 * C-_i = max(0, (centre - K) - x_i + C-_(i-1)), K = k sigma, a signal
 * above H = h sigma.
 * Run rules: the eight of Nelson (J. Quality Technology 16(4), 1984); a
 * point signals a rule when it completes the rule's pattern. */
#include "acidlot/trend.h"

#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdio.h>

void
al_trend_params_default(al_trend_params *p)
{
	*p = (al_trend_params){.lambda = 0.2, .width = 3, .cusum_k = 0.5,
			       .cusum_h = 5};
}

/* -1, 0 or 1: the side of the centre x lies on beyond `sigmas` sigma. */
static int
side(double x, const al_trend_limits *l, double sigmas)
{
	double d = x - l->centre;

	if (d > sigmas * l->sigma)
		return 1;
	return d < -sigmas * l->sigma ? -1 : 0;
}

/* How many of x[i-w+1..i] lie beyond `sigmas` sigma on side s. */
static size_t
count_beyond(const double *x, size_t i, size_t w, const al_trend_limits *l,
	     double sigmas, int s)
{
	size_t c = 0;

	for (size_t k = i + 1 - w; k <= i; k++)
		c += side(x[k], l, sigmas) == s;
	return c;
}

/* The Nelson rules point i completes. */
static unsigned
nelson(const double *x, size_t i, const al_trend_limits *l)
{
	unsigned r = 0;
	int s = side(x[i], l, 0);
	size_t k;

	if (side(x[i], l, 3) != 0)
		r |= AL_TREND_NELSON_1;
	for (k = 1; s != 0 && k < 9 && k <= i && side(x[i - k], l, 0) == s; k++)
		;
	if (s != 0 && k == 9)
		r |= AL_TREND_NELSON_2;
	for (k = 1; k < 6 && k <= i && x[i - k + 1] > x[i - k]; k++)
		;
	if (k == 6)
		r |= AL_TREND_NELSON_3;
	for (k = 1; k < 6 && k <= i && x[i - k + 1] < x[i - k]; k++)
		;
	if (k == 6)
		r |= AL_TREND_NELSON_3;
	/* 14 points: 13 differences, each of the other sign than the next */
	for (k = 1; k < 13 && k + 1 <= i; k++) {
		double a = x[i - k + 1] - x[i - k], b = x[i - k] - x[i - k - 1];

		if (!(a * b < 0))
			break;
	}
	if (k == 13)
		r |= AL_TREND_NELSON_4;
	if (i >= 2 && side(x[i], l, 2) != 0 &&
	    count_beyond(x, i, 3, l, 2, side(x[i], l, 2)) >= 2)
		r |= AL_TREND_NELSON_5;
	if (i >= 4 && side(x[i], l, 1) != 0 &&
	    count_beyond(x, i, 5, l, 1, side(x[i], l, 1)) >= 4)
		r |= AL_TREND_NELSON_6;
	if (i >= 14 && count_beyond(x, i, 15, l, 1, 0) == 15)
		r |= AL_TREND_NELSON_7;
	if (i >= 7 && count_beyond(x, i, 8, l, 1, 0) == 0)
		r |= AL_TREND_NELSON_8;
	return r;
}

/* Centre and sigma from the baseline x[0..b), or as given. */
static al_status
limits(const double *x, size_t n, const al_trend_params *p,
       al_trend_limits *l)
{
	size_t b = p->baseline ? p->baseline : n;
	double sum = 0;

	if (n < 2 || b < 2 || b > n)
		return AL_EINVAL;
	for (size_t i = 1; i < b; i++)
		sum += fabs(x[i] - x[i - 1]);
	l->mr_bar = sum / (double)(b - 1);
	l->mr_ucl = AL_TREND_D4 * l->mr_bar;
	if (p->has_target) {
		l->centre = p->target;
		l->sigma = p->sigma;
	} else {
		l->centre = gsl_stats_mean(x, 1, b);
		l->sigma = l->mr_bar / AL_TREND_D2;
	}
	if (!(l->sigma > 0) || !isfinite(l->sigma))
		return AL_EINVAL;
	l->lcl = l->centre - 3 * l->sigma;
	l->ucl = l->centre + 3 * l->sigma;
	return AL_OK;
}

al_status
al_trend_chart(const double *x, size_t n, const al_trend_params *p,
	       al_trend_limits *lim, al_trend_point *out)
{
	double z, hi = 0, lo = 0, kk, h, keep = 1;
	al_status st = limits(x, n, p, lim);

	if (st != AL_OK)
		return st;
	z = lim->centre;
	kk = p->cusum_k * lim->sigma;
	h = p->cusum_h * lim->sigma;
	for (size_t i = 0; i < n; i++) {
		al_trend_point *o = &out[i];
		double half;

		o->value = x[i];
		o->has_mr = i > 0;
		o->mr = i > 0 ? fabs(x[i] - x[i - 1]) : 0;
		z = p->lambda * x[i] + (1 - p->lambda) * z;
		keep *= (1 - p->lambda) * (1 - p->lambda);
		half = p->width * lim->sigma *
		       sqrt(p->lambda / (2 - p->lambda) * (1 - keep));
		o->ewma = z;
		o->ewma_lcl = lim->centre - half;
		o->ewma_ucl = lim->centre + half;
		hi = fmax(0, x[i] - (lim->centre + kk) + hi);
		lo = fmax(0, (lim->centre - kk) - x[i] + lo);
		o->cusum_hi = hi;
		o->cusum_lo = lo;
		o->signals = nelson(x, i, lim);
		if (z > o->ewma_ucl)
			o->signals |= AL_TREND_EWMA_HIGH;
		if (z < o->ewma_lcl)
			o->signals |= AL_TREND_EWMA_LOW;
		if (hi > h)
			o->signals |= AL_TREND_CUSUM_HIGH;
		if (lo > h)
			o->signals |= AL_TREND_CUSUM_LOW;
	}
	return AL_OK;
}

void
al_trend_capability_of(const double *x, size_t n, double centre,
		       double sigma_within, int has_lsl, double lsl,
		       int has_usl, double usl, al_trend_capability *c)
{
	double so = n > 1 ? gsl_stats_sd(x, 1, n) : NAN;
	double lo = has_lsl ? centre - lsl : INFINITY;
	double up = has_usl ? usl - centre : INFINITY;

	c->sigma_overall = so;
	c->has_cp = has_lsl && has_usl;
	c->has_cpk = has_lsl || has_usl;
	c->cp = c->has_cp ? (usl - lsl) / (6 * sigma_within) : NAN;
	c->pp = c->has_cp ? (usl - lsl) / (6 * so) : NAN;
	c->cpk = c->has_cpk ? fmin(lo, up) / (3 * sigma_within) : NAN;
	c->ppk = c->has_cpk ? fmin(lo, up) / (3 * so) : NAN;
}

void
al_trend_signals_format(unsigned signals, char *buf, size_t cap)
{
	static const char *const names[] = {
		"nelson-1", "nelson-2",	 "nelson-3",   "nelson-4",
		"nelson-5", "nelson-6",	 "nelson-7",   "nelson-8",
		"ewma-high", "ewma-low", "cusum-high", "cusum-low"};
	size_t len = 0;

	buf[0] = '\0';
	for (size_t k = 0; k < sizeof names / sizeof names[0]; k++)
		if ((signals & (1u << k)) && len < cap)
			len += (size_t)snprintf(buf + len, cap - len, "%s%s",
						len ? ";" : "", names[k]);
}
