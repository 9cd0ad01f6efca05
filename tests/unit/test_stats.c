/* acidlot tests: replicate statistics against certified values.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include "acidlot/stats.h"

/* NIST StRD univariate NumAcc1: 10000001, 10000003, 10000002; certified
 * mean 10000002, s 1 (METHODS.md s.4). */
static void
nist_numacc1(void **state)
{
	const double x[] = {10000001, 10000003, 10000002};
	al_summary s;

	(void)state;
	al_stats_summarise(x, 3, 0.95, &s);
	assert_rel(s.mean, 10000002, 1e-15);
	assert_rel(s.sd, 1, 1e-15);
}

/* NumAcc2/3/4: X.2 then 500 pairs X.1, X.3 for X = 1, 1000000, 10000000;
 * certified mean X.2 and s 0.1 (METHODS.md s.4). The tolerance on s
 * loosens as the leading digits eat the precision of a double, as in
 * GSL's own statistics/test_nist.c. */
static void
nist_numacc234(void **state)
{
	static const struct {
		double base, tol_sd;
	} sets[] = {{1, 1e-13}, {1000000, 1e-9}, {10000000, 1e-8}};
	double x[1001];
	al_summary s;

	(void)state;
	for (size_t k = 0; k < 3; k++) {
		double b = sets[k].base;

		x[0] = b + 0.2;
		for (size_t i = 0; i < 500; i++) {
			x[1 + 2 * i] = b + 0.1;
			x[2 + 2 * i] = b + 0.3;
		}
		al_stats_summarise(x, 1001, 0.95, &s);
		assert_rel(s.mean, b + 0.2, 1e-15);
		assert_rel(s.sd, 0.1, sets[k].tol_sd);
	}
}

/* Michelso: certified mean 299.852400000000, s 0.0790105478190518;
 * Lew: mean -177.435000000000, s 277.332168044316 (NIST StRD). */
static void
nist_real_world(void **state)
{
	size_t n;
	double *x;
	al_summary s;

	(void)state;
	x = load_data("nist_michelso.txt", &n);
	assert_int_equal(n, 100);
	al_stats_summarise(x, n, 0.95, &s);
	assert_rel(s.mean, 299.8524, 1e-14);
	assert_rel(s.sd, 0.0790105478190518, 1e-12);
	free(x);
	x = load_data("nist_lew.txt", &n);
	assert_int_equal(n, 200);
	al_stats_summarise(x, n, 0.95, &s);
	assert_rel(s.mean, -177.435, 1e-14);
	assert_rel(s.sd, 277.332168044316, 1e-14);
	assert_rel(s.rsd_pct, 100 * 277.332168044316 / 177.435, 1e-13);
	free(x);
}

/* Two-sided 95 % Student t, from the published table (METHODS.md s.4),
 * to its three decimals. */
static void
t_table(void **state)
{
	static const struct {
		double df, t;
	} table[] = {{1, 12.706}, {2, 4.303},  {3, 3.182},  {4, 2.776},
		     {5, 2.571},  {9, 2.262},  {10, 2.228}, {30, 2.042},
		     {1e9, 1.960}};

	(void)state;
	for (size_t i = 0; i < sizeof table / sizeof table[0]; i++)
		assert_abs(al_stats_t_quantile(0.975, table[i].df), table[i].t,
			   0.0005);
}

/* The interval is mean +/- t s / sqrt(n): with n = 3 and s = 1 the half
 * width is 4.303 / sqrt 3 (t table, METHODS.md s.4). */
static void
interval(void **state)
{
	const double x[] = {10000001, 10000003, 10000002};
	al_summary s;

	(void)state;
	al_stats_summarise(x, 3, 0.95, &s);
	assert_abs(s.ci_high - s.mean, 4.303 / sqrt(3.0), 0.0005);
	assert_abs(s.mean - s.ci_low, 4.303 / sqrt(3.0), 0.0005);
}

/* n = 1 has no spread: flagged undefined, never 0 or NaN. */
static void
single(void **state)
{
	const double x[] = {4.97};
	al_summary s;

	(void)state;
	al_stats_summarise(x, 1, 0.95, &s);
	assert_int_equal(s.n, 1);
	assert_rel(s.mean, 4.97, 1e-15);
	assert_false(s.has_sd);
	assert_false(s.has_rsd);
	al_stats_summarise(x, 0, 0.95, &s);
	assert_int_equal(s.n, 0);
	assert_false(s.has_sd);
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(nist_numacc1),
	       cmocka_unit_test(nist_numacc234),
	       cmocka_unit_test(nist_real_world), cmocka_unit_test(t_table),
	       cmocka_unit_test(interval), cmocka_unit_test(single))
