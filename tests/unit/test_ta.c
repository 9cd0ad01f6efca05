/* acidlot tests: the titratable-acidity formula and its units.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include "acidlot/ta.h"
#include "acidlot/units.h"

static al_titration
titration(double titrant, double blank, double c, double amount,
	  al_basis basis)
{
	al_titration t = {0};

	t.titrant_ml = titrant;
	t.blank_ml = blank;
	t.titrant_mol_l = c;
	t.amount = amount;
	t.basis = basis;
	return t;
}

/* USP citric acid assay, worked in METHODS.md s.6: 0.5500 g, 8.575 mL of
 * 1.000 N NaOH, each mL = 64.03 mg -> 99.83 % as is, and 100.03 % on the
 * anhydrous basis with 0.20 % water. */
static void
usp_citric_worked(void **state)
{
	al_titration t = titration(8.575, 0, 1.000, 0.5500, AL_BASIS_MASS);
	double v;

	(void)state;
	assert_int_equal(al_ta_value(&t, 0.06403, AL_UNIT_G_100G, 0, &v), AL_OK);
	assert_abs(v, 99.83, 0.005);
	assert_abs(v / (1 - 0.20 / 100), 100.03, 0.005);
	assert_rel(al_ta_meq(&t), 8.575, 1e-15);
}

/* OIV-MA-AS313-01: total acidity in meq/L x 0.075 = g/L as tartaric,
 * x 0.049 = g/L as sulfuric (METHODS.md s.1). Our factors come from the
 * molar masses, so they agree to OIV's three decimals. */
static void
oiv_factors(void **state)
{
	double tart, sulf;

	(void)state;
	/* 100 meq/L = 0.1 meq per mL of wine */
	assert_int_equal(al_unit_express(0.1, AL_BASIS_VOLUME, AL_UNIT_G_L,
					 150.086 / 2000, 0, &tart),
			 AL_OK);
	assert_int_equal(al_unit_express(0.1, AL_BASIS_VOLUME, AL_UNIT_G_L,
					 98.072 / 2000, 0, &sulf),
			 AL_OK);
	assert_abs(tart / 100, 0.075, 0.0005);
	assert_abs(sulf / 100, 0.049, 0.0005);
}

/* The same meq in every unit: g/kg = 10 x g/100g, g/L = 10 x g/100mL,
 * meq/L = 1000 x meq per mL (definitions of the units). */
static void
unit_relations(void **state)
{
	double a, b;

	(void)state;
	al_unit_express(0.7766, AL_BASIS_MASS, AL_UNIT_G_100G, 0.064041, 0, &a);
	al_unit_express(0.7766, AL_BASIS_MASS, AL_UNIT_G_KG, 0.064041, 0, &b);
	assert_rel(b, 10 * a, 1e-15);
	al_unit_express(0.7766, AL_BASIS_MASS, AL_UNIT_MEQ_100G, 0.064041, 0,
			&a);
	assert_rel(a, 77.66, 1e-15);
	al_unit_express(0.05, AL_BASIS_VOLUME, AL_UNIT_MEQ_L, 0.07, 0, &a);
	assert_rel(a, 50, 1e-15);
	/* a unit on the other basis needs a density */
	assert_int_equal(al_unit_express(0.05, AL_BASIS_VOLUME, AL_UNIT_G_100G,
					 0.07, 0, &a),
			 AL_EDOMAIN);
}

/* Common practice (METHODS.md s.5): single-strength lemon juice at about
 * 48 g/L citric acid and 1.03 g/mL is about 4.7 % w/w. */
static void
lemon_density(void **state)
{
	double meq_per_ml = 48.0 / 1000 / 0.064041, pct;

	(void)state;
	assert_int_equal(al_unit_express(meq_per_ml, AL_BASIS_VOLUME,
					 AL_UNIT_G_100G, 0.064041, 1.03, &pct),
			 AL_OK);
	assert_abs(pct, 4.7, 0.05);
}

/* Dilution: 10 g made up to 100 mL, 25 mL titrated is DF 4 (METHODS.md
 * s.1). */
static void
dilution(void **state)
{
	al_titration t = titration(19.41, 0.05, 0.1002, 10.012, AL_BASIS_MASS);
	double v;

	(void)state;
	t.made_up_ml = 100;
	t.aliquot_ml = 25;
	assert_rel(al_ta_dilution(&t), 4, 1e-15);
	assert_int_equal(al_ta_value(&t, 192.123 / 3000, AL_UNIT_G_100G, 0, &v),
			 AL_OK);
	/* (19.41 - 0.05) x 0.1002 x 4 x 0.064041 x 100 / 10.012 */
	assert_rel(v, (19.41 - 0.05) * 0.1002 * 4 * (192.123 / 3000) * 100 /
			      10.012,
		   1e-14);
}

static void
impossible(void **state)
{
	al_ta_problem p[8];
	al_titration t;

	(void)state;
	t = titration(10, 0, 0.1, 5, AL_BASIS_MASS);
	assert_int_equal(al_ta_check(&t, p, 8), 0);
	t.amount = 0;
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_AMOUNT);
	t = titration(-1, 0, 0.1, 5, AL_BASIS_MASS);
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_TITRANT);
	t = titration(0.2, 0.2, 0.1, 5, AL_BASIS_MASS);
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_string_equal(p[0].message,
			    "titrant volume is not above the blank");
	t = titration(10, 0, 0, 5, AL_BASIS_MASS);
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_CONC);
	t = titration(10, 0, 0.1, 5, AL_BASIS_MASS);
	t.made_up_ml = 25;
	t.aliquot_ml = 50;
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_ALIQUOT);
	t.made_up_ml = 0;
	t.aliquot_ml = 10;
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_MADE_UP);
	t = titration(10, -0.1, 0.1, 5, AL_BASIS_MASS);
	assert_int_equal(al_ta_check(&t, p, 8), 1);
	assert_int_equal(p[0].field, AL_TF_BLANK);
}

static void
unit_names(void **state)
{
	al_unit u;

	(void)state;
	assert_int_equal(al_unit_parse("G/100 g", &u), AL_OK);
	assert_int_equal(u, AL_UNIT_G_100G);
	assert_int_equal(al_unit_parse("% w/v", &u), AL_OK);
	assert_int_equal(u, AL_UNIT_G_100ML);
	assert_int_equal(al_unit_parse("meq/l", &u), AL_OK);
	assert_int_equal(u, AL_UNIT_MEQ_L);
	assert_int_equal(al_unit_parse("ppm", &u), AL_ENOTFOUND);
	for (int i = 0; i < AL_UNIT_COUNT; i++) {
		assert_int_equal(al_unit_parse(al_unit_name((al_unit)i), &u),
				 AL_OK);
		assert_int_equal(u, i);
	}
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(usp_citric_worked),
	       cmocka_unit_test(oiv_factors),
	       cmocka_unit_test(unit_relations),
	       cmocka_unit_test(lemon_density), cmocka_unit_test(dilution),
	       cmocka_unit_test(impossible), cmocka_unit_test(unit_names))
