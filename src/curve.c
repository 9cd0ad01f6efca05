/* acidlot: the endpoint of one titration curve.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * fixed: AOAC 942.15 takes the volume at pH 8.1 by interpolation between
 * the readings around it; IFU method 3 (2017) the same at 8.1 (7.0 where
 * a buyer asks), OIV at 7.0 for wine. The first crossing counts. The
 * volume is interpolated linearly in [H+] = 10^-pH between the two
 * readings: before the equivalence point, where pH is well above the
 * last pKa, the base still missing is proportional to [H+] (Henderson-
 * Hasselbalch), so V is a straight line in [H+]. Where the readings are
 * close, as the method asks, this is the straight line in pH to within
 * a burette's resolution; where they are not (flag sparse-near-endpoint)
 * it follows the curve much better: on the exact curve of malic acid
 * with readings 0.05 mL apart it is 0.002 mL off where the straight
 * line in pH is 0.010 mL off (tests/unit/test_curve.c).
 * inflection: the steepest rise dpH/dV. The curve is smoothed by a local
 * quadratic least-squares fit over AL_CURVE_WINDOW readings around each
 * one (Savitzky and Golay, Anal. Chem. 36 (1964) 1627, for readings not
 * evenly spaced); the reading of largest slope and its two neighbours
 * give a parabola in the slope, whose vertex, where the second
 * derivative crosses zero, is the endpoint.
 * gran: past the equivalence point the excess hydroxide gives
 * (V0 + V) 10^(pH - pKw) = c_b (V - Ve) (Gran, Analyst 77 (1952) 661),
 * a straight line in V that is zero at Ve; it is fitted by least squares
 * (gsl_fit_linear) over the readings at the curve's end whose pH is 10
 * or more. It assumes activity coefficients of 1, pKw 14.0 (25 C), and
 * that the acid's anion adds no hydroxide of its own there. */
#include "acidlot/curve.h"
#include "acidlot/text.h"

#include <gsl/gsl_fit.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

/* The fit of the window [lo, hi] about reading i: p[0] the smoothed pH,
 * p[1] the slope, *lev the leverage of reading i (the (0,0) element of
 * the inverse normal matrix, its row being (1, 0, 0) about itself). */
static void
local_fit(const al_curve *c, size_t i, size_t lo, size_t hi, double p[2],
	  double *lev)
{
	double s[5] = {0}, t[3] = {0}, det, m00, m01, m02, m11, m12, m22;

	for (size_t j = lo; j <= hi; j++) {
		double dx = c->ml[j] - c->ml[i], w = 1;

		for (int k = 0; k < 5; k++, w *= dx) {
			s[k] += w;
			if (k < 3)
				t[k] += w * c->ph[j];
		}
	}
	/* cofactors of the symmetric normal matrix [s0 s1 s2; s1 s2 s3;
	 * s2 s3 s4] */
	m00 = s[2] * s[4] - s[3] * s[3];
	m01 = s[2] * s[3] - s[1] * s[4];
	m02 = s[1] * s[3] - s[2] * s[2];
	m11 = s[0] * s[4] - s[2] * s[2];
	m12 = s[1] * s[2] - s[0] * s[3];
	m22 = s[0] * s[2] - s[1] * s[1];
	det = s[0] * m00 + s[1] * m01 + s[2] * m02;
	if (hi - lo >= 2 && det > 1e-9 * s[0] * s[2] * s[4]) {
		p[0] = (m00 * t[0] + m01 * t[1] + m02 * t[2]) / det;
		p[1] = (m01 * t[0] + m11 * t[1] + m12 * t[2]) / det;
		*lev = m00 / det;
	} else if (m22 > 1e-9 * s[0] * s[2]) {
		/* fewer than three volumes apart: a straight line */
		p[0] = (s[2] * t[0] - s[1] * t[1]) / m22;
		p[1] = (s[0] * t[1] - s[1] * t[0]) / m22;
		*lev = s[2] / m22;
	} else {
		p[0] = t[0] / s[0];
		p[1] = 0;
		*lev = 1 / s[0];
	}
}

void
al_curve_smooth(const al_curve *c, double *smooth, double *slope,
		double *leverage)
{
	size_t half = AL_CURVE_WINDOW / 2;

	for (size_t i = 0; i < c->n; i++) {
		size_t lo = i > half ? i - half : 0;
		size_t hi = lo + AL_CURVE_WINDOW - 1;
		double p[2], lev;

		if (hi >= c->n) { /* the last window ends at the last reading */
			hi = c->n - 1;
			lo = hi >= AL_CURVE_WINDOW - 1 ? hi - (AL_CURVE_WINDOW - 1)
						       : 0;
		}
		local_fit(c, i, lo, hi, p, &lev);
		smooth[i] = p[0];
		slope[i] = p[1];
		if (leverage)
			leverage[i] = lev;
	}
}

/* The scatter about the smoothed curve: each residual scaled by
 * sqrt(1 - leverage) so that pure noise of sd s gives s, then a robust
 * scale (1.4826 x the median absolute value), so that the few readings
 * of the jump, which a quadratic cannot follow, do not count as noise.
 * scratch holds the leverages on entry. */
static double
scatter(const al_curve *c, const double *smooth, double *scratch)
{
	size_t used = 0;

	for (size_t i = 0; i < c->n; i++)
		if (scratch[i] < 1 - 1e-9)
			scratch[used++] = fabs(c->ph[i] - smooth[i]) /
					  sqrt(1 - scratch[i]);
	if (used == 0)
		return 0;
	gsl_sort(scratch, 1, used);
	return 1.4826 * gsl_stats_median_from_sorted_data(scratch, 1, used);
}

/* A fall of the pH by more than AL_CURVE_FALL_PH between readings in the
 * curve's second half. */
static int
falls(const al_curve *c)
{
	for (size_t i = c->n / 2 > 0 ? c->n / 2 : 1; i < c->n; i++)
		if (c->ph[i - 1] - c->ph[i] > AL_CURVE_FALL_PH)
			return 1;
	return 0;
}

/* The first reading j >= 1 at or past volume v (the pair j-1, j brackets
 * it); n - 1 when none is. */
static size_t
bracket(const al_curve *c, double v)
{
	size_t j = 1;

	while (j < c->n - 1 && c->ml[j] < v)
		j++;
	return j;
}

/* fixed: the first crossing of the target pH. */
static void
fixed(const al_curve *c, al_curve_endpoint *out)
{
	size_t j = 1;
	double h0, h1;

	if (c->ph[0] >= c->target_ph) {
		out->flags |= AL_CURVE_STARTS_ABOVE;
		return;
	}
	while (j < c->n && c->ph[j] < c->target_ph)
		j++;
	if (j == c->n) {
		out->flags |= AL_CURVE_NOT_REACHED;
		return;
	}
	h0 = pow(10, -c->ph[j - 1]);
	h1 = pow(10, -c->ph[j]);
	out->has_volume = 1;
	out->volume_ml = c->ml[j - 1] + (pow(10, -c->target_ph) - h0) *
						(c->ml[j] - c->ml[j - 1]) /
						(h1 - h0);
}

/* inflection: the vertex of the parabola through the largest slope and
 * its neighbours. */
static void
inflection(const al_curve *c, const double *slope, al_curve_endpoint *out)
{
	size_t top = 0;
	double x0, x2, d1, d2, a, b;

	if (c->n < AL_CURVE_WINDOW) {
		out->flags |= AL_CURVE_FEW_READINGS;
		return;
	}
	for (size_t i = 1; i < c->n; i++)
		if (slope[i] > slope[top])
			top = i;
	/* still rising at the last reading, or not yet past the jump: its
	 * slope is still over half the steepest */
	if (top == c->n - 1 || slope[c->n - 1] > slope[top] / 2) {
		out->flags |= AL_CURVE_NOT_REACHED;
		return;
	}
	out->has_volume = 1;
	out->volume_ml = c->ml[top];
	if (top == 0)
		return;
	/* slope = s1 + a (x - x1) + b (x - x1)^2 through the three points:
	 * the vertex at x1 - a / (2 b) when b < 0 */
	x0 = c->ml[top - 1] - c->ml[top];
	x2 = c->ml[top + 1] - c->ml[top];
	d1 = slope[top - 1] - slope[top];
	d2 = slope[top + 1] - slope[top];
	if (x0 >= 0 || x2 <= 0)
		return; /* equal volumes: the reading itself */
	b = (d2 / x2 - d1 / x0) / (x2 - x0);
	a = d1 / x0 - b * x0;
	if (b < 0) {
		double shift = -a / (2 * b);

		if (shift > x0 && shift < x2)
			out->volume_ml = c->ml[top] + shift;
	}
}

/* gran: the least-squares line through G = (V0 + V) 10^(pH - pKw) of
 * the readings at pH 10 or more at the curve's end, and its zero.
 * scratch: n doubles. */
static void
gran(const al_curve *c, double *scratch, al_curve_endpoint *out)
{
	size_t from = c->n, count;
	double cov00, cov01, cov11, sumsq;

	while (from > 0 && c->ph[from - 1] >= AL_CURVE_GRAN_MIN_PH)
		from--;
	count = c->n - from;
	if (!isfinite(c->v0_ml) || c->v0_ml < 0) {
		out->flags |= AL_CURVE_GRAN_NO_V0;
		return;
	}
	if (count < 3) {
		out->flags |= AL_CURVE_GRAN_FEW;
		return;
	}
	for (size_t j = from; j < c->n; j++)
		scratch[j - from] = (c->v0_ml + c->ml[j]) *
				    pow(10, c->ph[j] - AL_CURVE_PKW);
	gsl_fit_linear(c->ml + from, 1, scratch, 1, count, &out->gran_a,
		       &out->gran_b, &cov00, &cov01, &cov11, &sumsq);
	out->gran_from = from;
	if (!(out->gran_b > 0)) {
		out->flags |= AL_CURVE_GRAN_FEW;
		return;
	}
	out->volume_ml = -out->gran_a / out->gran_b;
	/* an extrapolation outside the curve is no endpoint of it */
	if (!(out->volume_ml >= c->ml[0] && out->volume_ml <= c->ml[c->n - 1])) {
		out->flags |= AL_CURVE_GRAN_OUTSIDE;
		return;
	}
	out->has_volume = 1;
}

void
al_curve_find(const al_curve *c, al_curve_mode mode, double *work,
	      al_curve_endpoint *out)
{
	double *smooth = work, *slope = work + c->n, *scratch = work + 2 * c->n;

	memset(out, 0, sizeof *out);
	if (c->n < 2) {
		out->flags = AL_CURVE_FEW_READINGS;
		return;
	}
	al_curve_smooth(c, smooth, slope, scratch);
	if (scatter(c, smooth, scratch) > AL_CURVE_NOISE_PH)
		out->flags |= AL_CURVE_NOISY;
	if (falls(c))
		out->flags |= AL_CURVE_PH_FALLS;
	if (mode == AL_CURVE_FIXED)
		fixed(c, out);
	else if (mode == AL_CURVE_INFLECTION)
		inflection(c, slope, out);
	else
		gran(c, scratch, out);
	if (out->has_volume) {
		size_t j = bracket(c, out->volume_ml);
		double dv = c->ml[j] - c->ml[j - 1];

		out->ph = mode == AL_CURVE_FIXED ? c->target_ph
			: dv > 0 ? c->ph[j - 1] + (out->volume_ml - c->ml[j - 1]) *
						  (c->ph[j] - c->ph[j - 1]) / dv
				 : c->ph[j];
		/* the pH gap matters where the volume is interpolated
		 * (fixed); at the steepest point of a sharp jump readings
		 * are always far apart in pH, and Gran extrapolates */
		if ((mode == AL_CURVE_FIXED &&
		     fabs(c->ph[j] - c->ph[j - 1]) > AL_CURVE_SPARSE_PH) ||
		    dv > AL_CURVE_SPARSE_ML)
			out->flags |= AL_CURVE_SPARSE;
	}
}

static const char *const flag_names[] = {
	"sparse-near-endpoint", "endpoint-not-reached", "ph-falls", "noisy",
	"starts-above-endpoint", "too-few-readings", "gran-too-few-readings",
	"gran-needs-volume", "gran-outside-readings",
};

unsigned
al_curve_flags_parse(const char *s, size_t len, size_t *bad)
{
	unsigned flags = 0;
	size_t at = 0;

	*bad = len;
	while (at < len) {
		size_t n = 0, k = 0;

		while (at + n < len && s[at + n] != ';')
			n++;
		while (k < sizeof flag_names / sizeof flag_names[0] &&
		       !al_word_eq(s + at, n, flag_names[k]))
			k++;
		if (k < sizeof flag_names / sizeof flag_names[0])
			flags |= 1u << k;
		else if (n > 0 && *bad == len)
			*bad = at;
		at += n + 1;
	}
	return flags;
}

void
al_curve_flags_format(unsigned flags, char *buf, size_t cap)
{
	size_t n = 0;

	buf[0] = '\0';
	for (size_t k = 0; k < sizeof flag_names / sizeof flag_names[0]; k++)
		if (flags & (1u << k) && n < cap)
			n += (size_t)snprintf(buf + n, cap - n, "%s%s",
					      n ? ";" : "", flag_names[k]);
}

const char *const al_curve_mode_names[3] = {"fixed", "inflection", "gran"};
