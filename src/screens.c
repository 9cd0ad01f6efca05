/* acidlot: replicate screens.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/screens.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <math.h>
#include <pthread.h>
#include <string.h>

#include "acidlot/number.h"

/* Quantiles that depend only on n are computed once (PERF-NOTES.md). */
#define CACHE_N 64

double
al_grubbs_g(const double *x, size_t n, double mean, double sd, size_t *index)
{
	double g = 0;

	*index = 0;
	if (n < 3 || !(sd > 0))
		return 0;
	for (size_t i = 0; i < n; i++) {
		double d = fabs(x[i] - mean) / sd;

		if (d > g) {
			g = d;
			*index = i;
		}
	}
	return g;
}

static double
grubbs_critical_uncached(size_t n, double alpha)
{
	double t = gsl_cdf_tdist_Qinv(alpha / (2.0 * (double)n),
				      (double)(n - 2));

	return (double)(n - 1) / sqrt((double)n) *
	       sqrt(t * t / ((double)n - 2 + t * t));
}

double
al_grubbs_critical(size_t n, double alpha)
{
	static _Thread_local double at5[CACHE_N], at1[CACHE_N]; /* per thread */
	double *slot = NULL;

	if (n < 3)
		return 0;
	if (n < CACHE_N && alpha == 0.05)
		slot = &at5[n];
	else if (n < CACHE_N && alpha == 0.01)
		slot = &at1[n];
	if (slot && *slot > 0)
		return *slot;
	if (slot)
		return *slot = grubbs_critical_uncached(n, alpha);
	return grubbs_critical_uncached(n, alpha);
}

double
al_dixon_q(const double *x, size_t n, size_t *index)
{
	size_t lo = 0, hi = 0, lo2, hi2;
	double range, gap_lo, gap_hi;

	*index = 0;
	if (n < 3)
		return 0;
	for (size_t i = 1; i < n; i++) {
		if (x[i] < x[lo])
			lo = i;
		if (x[i] > x[hi])
			hi = i;
	}
	range = x[hi] - x[lo];
	if (!(range > 0))
		return 0;
	/* the nearest neighbours of the two ends */
	lo2 = hi;
	hi2 = lo;
	for (size_t i = 0; i < n; i++) {
		if (i != lo && x[i] < x[lo2])
			lo2 = i;
		if (i != hi && x[i] > x[hi2])
			hi2 = i;
	}
	gap_lo = x[lo2] - x[lo];
	gap_hi = x[hi] - x[hi2];
	if (gap_hi >= gap_lo) {
		*index = hi;
		return gap_hi / range;
	}
	*index = lo;
	return gap_lo / range;
}

/* Rorabacher (1991) r10 critical values, read once from the embedded
 * reference/dixon_r10.csv (n, q90, q95, q99, source). */
extern const unsigned char al_ref_dixon_r10[];
extern const size_t al_ref_dixon_r10_len;

static double dixon[11][3];

static void
load_dixon(void)
{
	const char *p = (const char *)al_ref_dixon_r10;
	const char *end = p + al_ref_dixon_r10_len;

	p = memchr(p, '\n', (size_t)(end - p)); /* skip the header */
	while (p && ++p < end) {
		const char *eol = memchr(p, '\n', (size_t)(end - p));
		double v[4];
		const char *f = p;
		int k;

		if (eol == NULL)
			eol = end;
		for (k = 0; k < 4 && f < eol; k++) {
			const char *comma = memchr(f, ',', (size_t)(eol - f));

			if (comma == NULL ||
			    al_number_parse(f, (size_t)(comma - f), '.', &v[k]) !=
				    AL_NUM_OK)
				break;
			f = comma + 1;
		}
		if (k == 4 && v[0] >= 3 && v[0] <= 10 && v[0] == (int)v[0])
			for (int j = 0; j < 3; j++)
				dixon[(int)v[0]][j] = v[j + 1];
		p = eol;
	}
}

double
al_dixon_critical(size_t n, double level)
{
	int col = level == 0.90 ? 0 : level == 0.95 ? 1 : level == 0.99 ? 2 : -1;

	if (n < 3 || n > 10 || col < 0)
		return 0;
	static pthread_once_t once = PTHREAD_ONCE_INIT;

	/* once, whichever thread asks first (the results may be
	 * evaluated in two) */
	pthread_once(&once, load_dixon);
	return dixon[n][col];
}

/* P(range of n standard normals <= w) = n * integral of
 * phi(x) [Phi(x + w) - Phi(x)]^(n-1) dx (Hartley's formula). */
struct range_params {
	double n, w;
};

static double
range_integrand(double x, void *p)
{
	const struct range_params *r = p;
	double inner = gsl_cdf_ugaussian_P(x + r->w) - gsl_cdf_ugaussian_P(x);

	/* 0.398942... = 1 / sqrt(2 pi) */
	return exp(-0.5 * x * x) * 0.39894228040143267794 * pow(inner, r->n - 1);
}

static double
range_cdf(size_t n, double w, gsl_integration_workspace *ws)
{
	struct range_params p = {(double)n, w};
	gsl_function f = {range_integrand, &p};
	double result = 0, err;

	/* the integrand is negligible beyond 9 standard deviations */
	gsl_integration_qags(&f, -9, 9, 1e-13, 1e-11, 256, ws, &result, &err);
	return (double)n * result;
}

double
al_critical_range_factor(size_t n)
{
	static _Thread_local double cache[CACHE_N]; /* per thread */
	/* larger n, by n mod 256: a run of results of 100 replicates
	 * integrates once, not once a result */
	static _Thread_local struct {
		size_t n;
		double f;
	} big[256];
	gsl_integration_workspace *ws;
	double lo = 0, hi = 12;

	if (n < 2)
		return 0;
	if (n < CACHE_N && cache[n] > 0)
		return cache[n];
	if (n >= CACHE_N && big[n & 255].n == n)
		return big[n & 255].f;
	ws = gsl_integration_workspace_alloc(256);
	if (ws == NULL)
		return 0;
	/* the cdf rises in w: bisect to 1e-10 */
	for (int k = 0; k < 60 && hi - lo > 1e-10; k++) {
		double mid = 0.5 * (lo + hi);

		if (range_cdf(n, mid, ws) < 0.95)
			lo = mid;
		else
			hi = mid;
	}
	gsl_integration_workspace_free(ws);
	if (n < CACHE_N)
		cache[n] = 0.5 * (lo + hi);
	else {
		big[n & 255].n = n;
		big[n & 255].f = 0.5 * (lo + hi);
	}
	return 0.5 * (lo + hi);
}

double
al_cochran_c(const double *variances, size_t l, size_t *index)
{
	double sum = 0, max = 0;

	*index = 0;
	for (size_t i = 0; i < l; i++) {
		sum += variances[i];
		if (variances[i] > max) {
			max = variances[i];
			*index = i;
		}
	}
	return sum > 0 ? max / sum : 0;
}

/* Upper p quantile of F(d1, d2) by Paulson's normal approximation
 * (Paulson 1942; Abramowitz and Stegun 26.6.15): with A = 1 - 2/(9 d2),
 * B = 1 - 2/(9 d1), (A y - B) / sqrt(2/(9 d1) + 2/(9 d2) y^2) is about
 * standard normal for y = F^(1/3), solved here for y. Good to 1e-4 at a
 * few hundred degrees of freedom and better beyond, where GSL's inverse
 * gives up (tests/unit/test_screens.c). */
static double
f_quantile_paulson(double p, double d1, double d2)
{
	double z = gsl_cdf_ugaussian_Qinv(p);
	double a = 1 - 2 / (9 * d2), b = 1 - 2 / (9 * d1);
	double c1 = 2 / (9 * d1), c2 = 2 / (9 * d2);
	double q = a * a - z * z * c2;
	double y = (a * b + sqrt(a * a * b * b - q * (b * b - z * z * c1))) / q;

	return y * y * y;
}

double
al_f_quantile_upper(double p, double d1, double d2)
{
	double f = gsl_cdf_fdist_Qinv(p, d1, d2);

	return isfinite(f) ? f : f_quantile_paulson(p, d1, d2);
}

double
al_cochran_critical(size_t l, size_t n, double alpha)
{
	double f;

	if (l < 2 || n < 2)
		return 0;
	f = al_f_quantile_upper(alpha / (double)l, (double)(n - 1),
				(double)((l - 1) * (n - 1)));
	return 1.0 / (1.0 + (double)(l - 1) / f);
}

double
al_horwitz_rsd(double mass_fraction)
{
	return 2.0 * pow(mass_fraction, -0.15);
}
