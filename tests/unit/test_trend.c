/* acidlot tests: control charts against published examples.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <math.h>
#include <string.h>

#include "acidlot/trend.h"

/* The defaults with a target and sigma given (a check standard). */
static void
given(al_trend_params *p, double target, double sigma)
{
	al_trend_params_default(p);
	p->has_target = 1;
	p->target = target;
	p->sigma = sigma;
}

/* NIST/SEMATECH e-Handbook of Statistical Methods, 6.3.2.4, "Example of
 * calculation of parameters for an EWMA control chart": 20 values,
 * target 50, s = 2.0539, lambda 0.3; its table of EWMA values (two
 * decimals) and the limits 47.4115 and 52.5884 (values of the table
 * from memory; the limits are also in the text). */
static void
nist_ewma(void **state)
{
	static const double x[20] = {
		52.0, 47.0, 53.0, 49.3, 50.1, 47.0, 51.0, 50.1, 51.2, 50.5,
		49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1};
	static const double ewma[20] = {
		50.60, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26,
		50.33, 50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23,
		51.94, 51.99};
	al_trend_params p;
	al_trend_limits l;
	al_trend_point pt[20];

	(void)state;
	given(&p, 50, 2.0539);
	p.lambda = 0.3;
	assert_int_equal(al_trend_chart(x, 20, &p, &l, pt), AL_OK);
	for (int i = 0; i < 20; i++)
		assert_true(fabs(pt[i].ewma - ewma[i]) <= 0.005 + 1e-9);
	/* the limits tend to the asymptotic ones */
	assert_true(fabs(pt[19].ewma_lcl - 47.4115) < 0.0005);
	assert_true(fabs(pt[19].ewma_ucl - 52.5884) < 0.0005);
	/* the first point's limits are narrower: lambda, not lambda/(2-l) */
	assert_true(fabs(pt[0].ewma_ucl - (50 + 3 * 2.0539 * 0.3)) < 1e-12);
	for (int i = 0; i < 20; i++)
		assert_false(pt[i].signals &
			     (AL_TREND_EWMA_HIGH | AL_TREND_EWMA_LOW));
}

/* Montgomery, Introduction to Statistical Quality Control, example 9.1
 * (table 9.1: 30 observations, mu0 10, sigma 1; data as printed there,
 * also in the IMSL EWMA example that cites Montgomery p. 428), tabular
 * CUSUM with K 0.5 and H 5: C+ and C- of table 9.2 (two decimals, from
 * memory; they follow the recurrence). The CUSUM signals from sample
 * 29 on. */
static void
montgomery_cusum(void **state)
{
	static const double x[30] = {
		9.45,  7.99,  9.29,  11.66, 12.16, 10.18, 8.04,	 11.46,
		9.20,  10.34, 9.03,  11.47, 10.51, 9.40,  10.08, 9.37,
		10.62, 10.31, 8.52,  10.84, 10.90, 9.33,  12.29, 11.50,
		10.60, 11.08, 10.38, 11.62, 11.31, 10.52};
	static const double hi[30] = {
		0,    0,    0,	  1.16, 2.82, 2.50, 0.04, 1.00, 0,    0,
		0,    0.97, 0.98, 0,	0,    0,    0.12, 0,	0,    0.34,
		0.74, 0,    1.79, 2.79, 2.89, 3.47, 3.35, 4.47, 5.28, 5.30};
	static const double lo[30] = {
		0.05, 1.56, 1.77, 0,	0,    0,    1.46, 0,	0.30, 0,
		0.47, 0,    0,	  0.10, 0,    0.13, 0,	  0,	0.98, 0,
		0,    0.17, 0,	  0,	0,    0,    0,	  0,	0,    0};
	al_trend_params p;
	al_trend_limits l;
	al_trend_point pt[30];

	(void)state;
	given(&p, 10, 1);
	assert_int_equal(al_trend_chart(x, 30, &p, &l, pt), AL_OK);
	for (int i = 0; i < 30; i++) {
		assert_true(fabs(pt[i].cusum_hi - hi[i]) <= 0.005 + 1e-9);
		assert_true(fabs(pt[i].cusum_lo - lo[i]) <= 0.005 + 1e-9);
		assert_int_equal((pt[i].signals & AL_TREND_CUSUM_HIGH) != 0,
				 i >= 28);
		assert_false(pt[i].signals & AL_TREND_CUSUM_LOW);
	}
}

/* Each Nelson rule triggered by a sequence made for it (centre 0,
 * sigma 1 given) at its last point, and by no other rule anywhere. */
static void
nelson_rules(void **state)
{
	static const struct {
		unsigned rule;
		size_t n;
		double x[16];
	} t[] = {
		{AL_TREND_NELSON_1, 3, {0.1, -0.1, 3.5}},
		{AL_TREND_NELSON_2, 9, {0.5, 0.6, 0.5, 0.6, 0.5, 0.6, 0.5, 0.6, 0.5}},
		{AL_TREND_NELSON_3, 6, {-0.5, -0.3, -0.1, 0.1, 0.3, 0.5}},
		{AL_TREND_NELSON_4, 14, {0.5, -0.5, 0.5, -0.5, 0.5, -0.5, 0.5,
					 -0.5, 0.5, -0.5, 0.5, -0.5, 0.5, -0.5}},
		{AL_TREND_NELSON_5, 3, {0.1, 2.5, 2.5}},
		{AL_TREND_NELSON_6, 5, {0.1, 1.5, 1.5, 1.5, 1.5}},
		{AL_TREND_NELSON_7, 15, {0.5, 0.5, -0.5, -0.5, 0.5, 0.5, -0.5,
					 -0.5, 0.5, 0.5, -0.5, -0.5, 0.5, 0.5,
					 -0.5}},
		{AL_TREND_NELSON_8, 8, {1.5, 1.5, -1.5, -1.5, 1.5, 1.5, -1.5,
					-1.5}},
	};
	al_trend_params p;
	al_trend_limits l;
	al_trend_point pt[16];

	(void)state;
	given(&p, 0, 1);
	p.cusum_h = 1e9; /* the run rules alone */
	p.width = 1e9;
	for (size_t k = 0; k < sizeof t / sizeof t[0]; k++) {
		assert_int_equal(al_trend_chart(t[k].x, t[k].n, &p, &l, pt),
				 AL_OK);
		for (size_t i = 0; i < t[k].n; i++) {
			unsigned want = i + 1 == t[k].n ? t[k].rule : 0;

			if (pt[i].signals != want) {
				print_error("rule %zu, point %zu: signals %x\n",
					    k + 1, i + 1, pt[i].signals);
				fail();
			}
		}
	}
}

/* I-MR limits and capability by hand from the formulas (METHODS.md
 * s.9): x = 10, 12, 11, 13, 12: mean 11.6, moving ranges 2, 1, 2, 1,
 * MR-bar 1.5, sigma 1.5 / 1.128; overall sd sqrt(1.3); limits 9 and 15. */
static void
imr_and_capability(void **state)
{
	static const double x[5] = {10, 12, 11, 13, 12};
	double s = 1.5 / 1.128, so = sqrt(1.3);
	al_trend_params p;
	al_trend_limits l;
	al_trend_point pt[5];
	al_trend_capability c;

	(void)state;
	al_trend_params_default(&p);
	assert_int_equal(al_trend_chart(x, 5, &p, &l, pt), AL_OK);
	assert_true(fabs(l.centre - 11.6) < 1e-12);
	assert_true(fabs(l.sigma - s) < 1e-12);
	assert_true(fabs(l.ucl - (11.6 + 3 * s)) < 1e-12);
	assert_true(fabs(l.mr_bar - 1.5) < 1e-12);
	assert_true(fabs(l.mr_ucl - 3.267 * 1.5) < 1e-12);
	al_trend_capability_of(x, 5, l.centre, l.sigma, 1, 9, 1, 15, &c);
	assert_true(fabs(c.cp - 6 / (6 * s)) < 1e-12);
	assert_true(fabs(c.cpk - (15 - 11.6 < 11.6 - 9 ? 15 - 11.6 : 2.6) /
				    (3 * s)) < 1e-12);
	assert_true(fabs(c.pp - 6 / (6 * so)) < 1e-12);
	assert_true(fabs(c.ppk - 2.6 / (3 * so)) < 1e-12);
	al_trend_capability_of(x, 5, l.centre, l.sigma, 0, 0, 1, 15, &c);
	assert_false(c.has_cp);
	assert_true(fabs(c.cpk - 3.4 / (3 * s)) < 1e-12);
	/* every baseline point equal: no sigma */
	{
		static const double flat[3] = {1, 1, 1};

		assert_int_equal(al_trend_chart(flat, 3, &p, &l, pt), AL_EINVAL);
	}
}

UNIT_TEST_MAIN(NULL, NULL, cmocka_unit_test(nist_ewma),
	       cmocka_unit_test(montgomery_cusum),
	       cmocka_unit_test(nelson_rules),
	       cmocka_unit_test(imr_and_capability))
