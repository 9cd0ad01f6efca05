/* acidlot tests: Brix correction, density from Brix, anhydrous basis.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include "acidlot/juice.h"
#include "acidlot/ta.h"

/* Kimball, Citrus Processing (1991), appendix (METHODS.md s.5): every
 * listed point is reproduced exactly, and between points the table is
 * interpolated. */
static void
kimball_table(void **state)
{
	static const double pts[][2] = {
		{0.2, 0.04}, {1, 0.20},	 {2, 0.39},  {3, 0.58},	 {4, 0.78},
		{5, 0.97},   {6, 1.15},	 {8, 1.54},  {10, 1.91}, {12, 2.27},
		{16, 3.00},  {20, 3.70}, {30, 5.46}, {38, 6.88},
	};
	double c;

	(void)state;
	for (size_t i = 0; i < sizeof pts / sizeof pts[0]; i++) {
		assert_int_equal(al_brix_acid_correction(pts[i][0], &c), AL_OK);
		assert_abs(c, pts[i][1], 1e-12);
	}
	assert_int_equal(al_brix_acid_correction(7, &c), AL_OK);
	assert_abs(c, (1.15 + 1.54) / 2, 1e-12);
	assert_int_equal(al_brix_acid_correction(0, &c), AL_OK);
	assert_abs(c, 0, 1e-12);
	assert_int_equal(al_brix_acid_correction(39, &c), AL_EDOMAIN);
	assert_int_equal(al_brix_acid_correction(-1, &c), AL_EDOMAIN);
}

/* The NBS sucrose polynomial inverted (METHODS.md s.5): 5, 10, 12, 15,
 * 20 and 40 Brix -> 1.01968, 1.04003, 1.04837, 1.06111, 1.08297,
 * 1.17874; no extrapolation beyond 0-40 Brix. */
static void
sucrose_sg(void **state)
{
	static const double pts[][2] = {{5, 1.01968},  {10, 1.04003},
					{12, 1.04837}, {15, 1.06111},
					{20, 1.08297}, {40, 1.17874}};
	double sg, d;

	(void)state;
	for (size_t i = 0; i < sizeof pts / sizeof pts[0]; i++) {
		assert_int_equal(al_sg_from_brix(pts[i][0], &sg), AL_OK);
		/* the polynomial fits the NBS table to about 1e-5 in S */
		assert_abs(sg, pts[i][1], 0.00001);
		assert_abs(al_brix_from_sg(sg), pts[i][0], 1e-9);
	}
	assert_int_equal(al_sg_from_brix(0, &sg), AL_OK);
	assert_abs(sg, 1.0, 0.00005);
	assert_int_equal(al_sg_from_brix(41, &sg), AL_EDOMAIN);
	assert_int_equal(al_sg_from_brix(-0.5, &sg), AL_EDOMAIN);
	assert_int_equal(al_density_from_brix(12, &d), AL_OK);
	assert_abs(d, 1.04837 * 0.99820, 0.00001);
}

/* USP worked assay (METHODS.md s.6): 0.5500 g, water 0.20 %, 8.575 mL of
 * 1.000 mol/L NaOH, 64.03 mg per mL -> 100.03 % on the anhydrous basis. */
static void
usp_anhydrous(void **state)
{
	al_titration t = {0};
	double v, a;

	(void)state;
	t.titrant_ml = 8.575;
	t.titrant_mol_l = 1.000;
	t.amount = 0.5500;
	t.basis = AL_BASIS_MASS;
	assert_int_equal(al_ta_value(&t, 0.06403, AL_UNIT_G_100G, 0, &v), AL_OK);
	assert_int_equal(al_anhydrous(v, 0.20, &a), AL_OK);
	assert_abs(a, 100.03, 0.005);
	assert_int_equal(al_anhydrous(v, 100, &a), AL_EDOMAIN);
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(kimball_table), cmocka_unit_test(sucrose_sg),
	       cmocka_unit_test(usp_anhydrous))
