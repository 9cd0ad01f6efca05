/* acidlot tests: atomic weights, formula masses, acid factors, endpoints.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <string.h>

#include "acidlot/chem.h"

static const al_acid *
acid(const char *name)
{
	const al_acid *a = al_catalogue_find(cat, name);

	assert_non_null(a);
	return a;
}

/* Molar masses from the formula and the conventional atomic weights,
 * against the table in ../shared/METHODS.md s.2 (three decimals). */
static void
molar_masses(void **state)
{
	static const struct {
		const char *name;
		double m;
	} want[] = {
		{"citric", 192.123},	     {"citric-monohydrate", 210.138},
		{"malic", 134.087},	     {"tartaric", 150.086},
		{"lactic", 90.078},	     {"acetic", 60.052},
		{"oxalic", 90.034},	     {"oxalic-dihydrate", 126.064},
		{"sulfuric", 98.072},	     {"phosphoric", 97.994},
		{"succinic", 118.088},	     {"fumaric", 116.072},
		{"ascorbic", 176.124},
	};

	(void)state;
	for (size_t i = 0; i < sizeof want / sizeof want[0]; i++)
		assert_abs(acid(want[i].name)->molar_mass, want[i].m, 0.0005);
	{
		size_t n;

		(void)al_catalogue_acids(cat, &n);
		assert_true(n >= 13);
	}
}

/* Factors (g per meq) against AOAC 942.15's list, to its published three
 * decimals (seen; citric anhydrous 0.064 from memory, METHODS.md s.2). */
static void
aoac_factors(void **state)
{
	static const struct {
		const char *name;
		double e;
	} aoac[] = {
		{"malic", 0.067},    {"oxalic", 0.045},
		{"citric-monohydrate", 0.070},
		{"tartaric", 0.075}, {"sulfuric", 0.049},
		{"acetic", 0.060},   {"lactic", 0.090},
		{"citric", 0.064},
	};

	(void)state;
	for (size_t i = 0; i < sizeof aoac / sizeof aoac[0]; i++)
		assert_abs(acid(aoac[i].name)->g_per_meq, aoac[i].e, 0.0005);
	/* the unrounded column of METHODS.md s.2 */
	assert_abs(acid("citric")->g_per_meq, 0.06404, 0.000005);
	assert_abs(acid("ascorbic")->g_per_meq, 0.17612, 0.000005);
}

/* KHP C8H5KO4 is 204.22 g/mol (METHODS.md s.2, 204.222 with the current
 * weights); calcium hydroxide 74.09 (handbook value, from memory). */
static void
formulas(void **state)
{
	double m;
	const char *why;

	(void)state;
	assert_int_equal(al_formula_mass(cat, "C8H5KO4", &m, &why), AL_OK);
	assert_abs(m, 204.222, 0.0005);
	assert_int_equal(al_formula_mass(cat, "KHC8H4O4", &m, &why), AL_OK);
	assert_abs(m, 204.222, 0.0005);
	assert_int_equal(al_formula_mass(cat, "Ca(OH)2", &m, &why), AL_OK);
	assert_abs(m, 74.092, 0.0005);
	assert_int_equal(al_formula_mass(cat, "C2H2O4\xC2\xB7" "2H2O", &m, &why),
			 AL_OK);
	assert_abs(m, 126.064, 0.0005);
	assert_int_equal(al_formula_mass(cat, "Xy2", &m, &why), AL_ENOTFOUND);
	assert_int_equal(al_formula_mass(cat, "C6H8O7)", &m, &why), AL_EINPUT);
	assert_int_equal(al_formula_mass(cat, "(C6", &m, &why), AL_EINPUT);
	assert_int_equal(al_formula_mass(cat, "", &m, &why), AL_EINPUT);
	assert_int_equal(al_formula_mass(cat, "H0", &m, &why), AL_EINPUT);
	assert_int_equal(al_formula_mass(cat, "c6", &m, &why), AL_EINPUT);
}

static void
names(void **state)
{
	(void)state;
	assert_ptr_equal(al_catalogue_find(cat, "Citric Acid"), acid("citric"));
	assert_ptr_equal(al_catalogue_find(cat, "citric_monohydrate"),
			 acid("citric-monohydrate"));
	assert_ptr_equal(al_catalogue_find(cat, " TARTARIC "), acid("tartaric"));
	assert_ptr_equal(al_catalogue_find(cat, "sulphuric"), acid("sulfuric"));
	assert_null(al_catalogue_find(cat, "vinegar"));
	assert_null(al_catalogue_find(cat, ""));
}

/* Henderson-Hasselbalch: a monoprotic acid at pH = pKa + 2 is 100/101 =
 * 99.0 % titrated (common practice, METHODS.md s.1). */
static void
protons_monoprotic(void **state)
{
	const al_acid *a = acid("acetic");

	(void)state;
	assert_rel(al_protons_titrated(a->pka, a->n_pka, a->pka[0] + 2),
		   100.0 / 101.0, 1e-12);
	assert_rel(al_protons_titrated(a->pka, a->n_pka, a->pka[0]), 0.5,
		   1e-12);
}

/* Citric acid at pH 8.1 titrates more than 2.98 of its 3 protons;
 * phosphoric at pH 8.2 about 1.9 (METHODS.md s.1; issue 2). */
static void
protons_polyprotic(void **state)
{
	const al_acid *c = acid("citric"), *p = acid("phosphoric");
	double v;

	(void)state;
	v = al_protons_titrated(c->pka, c->n_pka, 8.1);
	assert_true(v > 2.98 && v < 3.0);
	v = al_protons_titrated(p->pka, p->n_pka, 8.2);
	assert_abs(v, 1.9, 0.05);
	/* far from every pKa, no overflow: all or nothing */
	assert_abs(al_protons_titrated(c->pka, c->n_pka, 14), 3, 1e-6);
	assert_abs(al_protons_titrated(c->pka, c->n_pka, 0), 0, 1e-2);
}

/* The pH that suffices: for a monoprotic acid 99 % is reached at exactly
 * pKa + log10(99) (Henderson-Hasselbalch). */
static void
endpoint_needed(void **state)
{
	const al_acid *a = acid("lactic"), *c = acid("citric");
	double ph;

	(void)state;
	assert_int_equal(al_endpoint_ph_needed(a->pka, a->n_pka, 1, 0.99, &ph),
			 AL_OK);
	assert_abs(ph, a->pka[0] + log10(99.0), 1e-9);
	assert_int_equal(al_endpoint_ph_needed(c->pka, c->n_pka, 3, 0.99, &ph),
			 AL_OK);
	assert_true(ph > 7.0 && ph < 8.1);
	assert_abs(al_protons_titrated(c->pka, c->n_pka, ph), 2.97, 1e-9);
	/* no pH up to 14 titrates 3 protons of a diprotic acid */
	assert_int_equal(al_endpoint_ph_needed(a->pka, a->n_pka, 3, 0.99, &ph),
			 AL_EDOMAIN);
}

UNIT_TEST_MAIN(setup, teardown,
	       cmocka_unit_test(molar_masses), cmocka_unit_test(aoac_factors),
	       cmocka_unit_test(formulas), cmocka_unit_test(names),
	       cmocka_unit_test(protons_monoprotic),
	       cmocka_unit_test(protons_polyprotic),
	       cmocka_unit_test(endpoint_needed))
