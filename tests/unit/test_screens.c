/* acidlot tests: Grubbs, Dixon, critical range, Cochran and Horwitz
 * against their published tables.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <math.h>

#include "acidlot/screens.h"

/* ISO 5725-2:1994 table 5, Grubbs' single-outlier critical values
 * (METHODS.md s.4), to the table's three decimals. */
static void
grubbs_table(void **state)
{
	static const struct {
		size_t n;
		double at5, at1; /* 0: not listed in METHODS.md */
	} iso[] = {{3, 1.155, 1.155}, {4, 1.481, 1.496}, {5, 1.715, 1.764},
		   {6, 1.887, 1.973}, {7, 2.020, 0},	  {8, 2.126, 0},
		   {10, 2.290, 2.482}};

	(void)state;
	for (size_t i = 0; i < sizeof iso / sizeof iso[0]; i++) {
		/* within one unit of the table's last digit: for n = 3 the
		 * table prints the bound (n-1)/sqrt n = 1.1547 rounded up
		 * (the t formula gives 1.1543 at 5 %), and for n = 8 it prints
		 * 2.126 where the formula gives 2.12665 */
		double tol = 0.001;

		assert_abs(al_grubbs_critical(iso[i].n, 0.05), iso[i].at5, tol);
		if (iso[i].at1 > 0)
			assert_abs(al_grubbs_critical(iso[i].n, 0.01),
				   iso[i].at1, tol);
	}
	/* the cached value is the same on a second call */
	assert_true(al_grubbs_critical(5, 0.05) == al_grubbs_critical(5, 0.05));
	assert_true(al_grubbs_critical(2, 0.05) == 0);
}

/* G is the largest standardised deviation: for 1, 2, 3, 10 (mean 4, s
 * sqrt 18 = 4.2426) G = 6 / 4.2426 = 1.4142, below 1.481 at n = 4. */
static void
grubbs_statistic(void **state)
{
	const double x[] = {1, 2, 3, 10};
	size_t at;
	double g = al_grubbs_g(x, 4, 4, sqrt(18.0), &at);

	(void)state;
	assert_abs(g, sqrt(2.0), 1e-12);
	assert_int_equal(at, 3);
}

/* Rorabacher (1991) r10 at 95 % (METHODS.md s.4). */
static void
dixon_table(void **state)
{
	static const double q95[] = {0.970, 0.829, 0.710, 0.625,
				     0.568, 0.526, 0.493, 0.466};

	(void)state;
	for (size_t n = 3; n <= 10; n++)
		assert_abs(al_dixon_critical(n, 0.95), q95[n - 3], 1e-12);
	assert_true(al_dixon_critical(5, 0.99) > al_dixon_critical(5, 0.95));
	assert_true(al_dixon_critical(5, 0.90) < al_dixon_critical(5, 0.95));
	assert_true(al_dixon_critical(11, 0.95) == 0);
	assert_true(al_dixon_critical(2, 0.95) == 0);
}

/* A textbook-style Q test (values as in common analytical-chemistry
 * teaching examples, from memory): 0.189, 0.167, 0.187, 0.183, 0.186 ->
 * Q = (0.183 - 0.167) / (0.189 - 0.167) = 0.727 > 0.710, the low value
 * is rejected at 95 %. */
static void
dixon_statistic(void **state)
{
	const double x[] = {0.189, 0.167, 0.187, 0.183, 0.186};
	size_t at;
	double q = al_dixon_q(x, 5, &at);

	(void)state;
	assert_abs(q, 0.016 / 0.022, 1e-12);
	assert_int_equal(at, 1);
	assert_true(q > al_dixon_critical(5, 0.95));
}

/* ISO 5725-6:1994 5.2.2 critical range factors f(n) = 2.8, 3.3, 3.6, 3.9,
 * 4.0 for n = 2..6 (METHODS.md s.4); for n = 2 exactly 1.96 sqrt 2. */
static void
critical_range(void **state)
{
	static const double iso[] = {2.8, 3.3, 3.6, 3.9, 4.0};

	(void)state;
	for (size_t n = 2; n <= 6; n++)
		assert_abs(al_critical_range_factor(n), iso[n - 2], 0.05);
	assert_abs(al_critical_range_factor(2), 1.959963984540054 * sqrt(2.0),
		   1e-6);
	assert_true(al_critical_range_factor(10) > al_critical_range_factor(6));
	assert_true(al_critical_range_factor(1) == 0);
}

/* Cochran's critical values at 5 % (ISO 5725-2 table 4, METHODS.md s.4). */
static void
cochran_table(void **state)
{
	const double v[] = {0.2, 0.5, 0.1, 0.9};
	size_t at;

	(void)state;
	assert_abs(al_cochran_critical(5, 2, 0.05), 0.841, 0.0005);
	assert_abs(al_cochran_critical(5, 3, 0.05), 0.684, 0.0005);
	assert_abs(al_cochran_critical(10, 2, 0.05), 0.602, 0.0005);
	assert_abs(al_cochran_critical(10, 3, 0.05), 0.445, 0.0005);
	assert_abs(al_cochran_c(v, 4, &at), 0.9 / 1.7, 1e-12);
	assert_int_equal(at, 3);
}

/* Horwitz (AOAC): C = 0.01 -> 3.99 %, C = 1e-6 -> 15.9 % (METHODS.md). */
static void
horwitz(void **state)
{
	(void)state;
	assert_abs(al_horwitz_rsd(0.01), 3.99, 0.005);
	assert_abs(al_horwitz_rsd(1e-6), 15.9, 0.05);
	assert_abs(al_horwitz_rsd(1.0), 2.0, 1e-12);
}

/* F quantiles at many degrees of freedom (Cochran over hundreds of
 * results of thousands of replicates): where GSL's inverse works, the
 * fallback (Paulson, Abramowitz and Stegun 26.6.15) agrees with it to
 * 2e-4; where it does not, the value is finite and GSL's forward tail
 * probability at it is p within 1 %. */
static void
f_quantile_large_df(void **state)
{
	double p = 0.05 / 200;

	(void)state;
	assert_rel(al_f_quantile_upper(p, 315, 199.0 * 315),
		   gsl_cdf_fdist_Qinv(p, 315, 199.0 * 315), 2e-4);
	for (double d1 = 999; d1 <= 99999; d1 *= 10)
		for (int k = 0; k < 2; k++) {
			double d2 = k ? 1e9 : 199 * d1;
			double f = al_f_quantile_upper(p, d1, d2);

			/* GSL's forward tail is the reference: it holds where
			 * its inverse does not */
			assert_true(isfinite(f));
			assert_rel(gsl_cdf_fdist_Q(f, d1, d2), p, 0.01);
		}
	{
		double c = al_cochran_critical(200, 10000, 0.05);

		assert_true(c > 1.0 / 200 && c < 1);
	}
}

/* as the command does: GSL reports, never aborts */
static int
setup(void **state)
{
	(void)state;
	gsl_set_error_handler_off();
	return 0;
}

UNIT_TEST_MAIN(setup, NULL,
	       cmocka_unit_test(grubbs_table),
	       cmocka_unit_test(grubbs_statistic),
	       cmocka_unit_test(dixon_table),
	       cmocka_unit_test(dixon_statistic),
	       cmocka_unit_test(critical_range),
	       cmocka_unit_test(cochran_table), cmocka_unit_test(horwitz),
	       cmocka_unit_test(f_quantile_large_df))
