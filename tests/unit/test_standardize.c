/* acidlot tests: standardisation of NaOH against KHP, the titrant
 * register and dates.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <string.h>

#include "acidlot/date.h"
#include "acidlot/register.h"
#include "acidlot/standardize.h"

/* Eurachem/CITAC QUAM example A2 (table A2.1, seen): m 0.3888 g (u
 * 0.00013 g), P 1.0 (u 0.00029), M 204.2212 g/mol (u 0.0038), V 18.64 mL
 * (u 0.013 mL), repeatability 0.0005 relative -> c = 0.10214 mol/L,
 * u = 0.00010 mol/L (0.102136 unrounded, METHODS.md s.3). */
static void
quam_a2(void **state)
{
	al_std_inputs in = {0};
	al_budget b;

	(void)state;
	in.mass_g = 0.3888;
	in.u_mass_g = 0.00013;
	in.purity = 1.0;
	in.u_purity = 0.00029;
	in.molar_mass = 204.2212;
	in.u_molar_mass = 0.0038;
	in.volume_ml = 18.64;
	in.u_volume_ml = 0.013;
	in.rep_rel = 0.0005;
	al_std_uncertainty(&in, &b);
	assert_abs(b.c, 0.102136, 0.0000005);
	assert_abs(b.c, 0.10214, 0.000005);
	/* u to QUAM's two significant figures */
	assert_abs(b.u, 0.00010, 0.000005);
	/* the relative combined uncertainty QUAM tabulates: 0.00097 */
	assert_abs(b.rel_u, 0.00097, 0.000005);
	/* the largest contribution is the volume, then repeatability
	 * (QUAM figure A2.3) */
	assert_string_equal(b.items[4].name, "titrant volume: burette");
	for (size_t i = 0; i < b.n_items; i++)
		assert_true(b.items[i].contribution <= b.items[4].contribution);
	assert_true(b.items[0].contribution > b.items[1].contribution);
}

/* KHP C8H5KO4: 204.22 g/mol (METHODS.md s.2) from the formula, and an
 * uncertainty of the same order as QUAM's 0.0038 g/mol from the CIAAW
 * intervals (carbon dominates). */
static void
khp(void **state)
{
	const al_standard *s = al_catalogue_find_standard(cat, "KHP");

	(void)state;
	assert_non_null(s);
	assert_abs(s->molar_mass, 204.22, 0.005);
	assert_true(s->molar_mass_u > 0.001 && s->molar_mass_u < 0.01);
	assert_int_equal(s->protons, 1);
	assert_ptr_equal(al_catalogue_find_standard(cat, "potassium hydrogen "
							 "phthalate"),
			 s);
	assert_non_null(al_catalogue_find_standard(cat, "sulfamic acid"));
	assert_non_null(al_catalogue_find_standard(cat, "benzoic"));
	assert_null(al_catalogue_find_standard(cat, "citric"));
}

static al_std_run *
run_text(const char *text, const al_std_params *p)
{
	al_status st;
	al_std_run *run = al_std_new(cat, p, 20789, &st);
	FILE *f = fmemopen((void *)text, strlen(text), "r");

	assert_non_null(run);
	assert_non_null(f);
	st = al_std_read(run, f, "std.csv", NULL);
	fclose(f);
	assert_int_equal(st, AL_OK);
	assert_int_equal(al_std_finish(run), AL_OK);
	return run;
}

/* Three KHP titrations: each c by the A2 model; the lot's mean, and
 * acceptance by n and RSD. */
static void
lots(void **state)
{
	al_std_params p;
	al_std_run *run;
	const al_std_lot *a, *b;
	double c1, m = 204.222; /* KHP from the conventional weights */

	(void)state;
	al_std_params_default(&p);
	run = run_text("titrant_lot,mass_g,titrant_ml,date\n"
		       "N1,0.4102,20.05,2026-11-30\n"
		       "N1,0.4087,19.98,2026-12-01\n"
		       "N1,0.4120,20.14,2026-12-01\n"
		       "N2,0.4102,20.05,2026-12-01\n"
		       "N2,0.4102,20.45,2026-12-01\n"
		       "N2,0.4102,19.65,2026-12-01\n",
		       &p);
	assert_int_equal(al_std_lot_count(run), 2);
	a = al_std_lot_at(run, 0);
	b = al_std_lot_at(run, 1);
	c1 = 1000 * 0.4102 / (m * 20.05);
	assert_abs(a->mean, (c1 + 1000 * 0.4087 / (m * 19.98) +
			     1000 * 0.4120 / (m * 20.14)) / 3,
		   1e-6);
	assert_true(a->valid);
	assert_true(a->U > 0 && a->U < 0.001);
	assert_abs(a->U, 2 * a->budget.u, 1e-15);
	assert_int_equal(a->date, 20789 - 1); /* the latest row's date */
	assert_false(b->valid); /* RSD about 2 %: above 0.2 % */
	assert_non_null(strstr(b->why, "RSD"));
	al_std_free(run);

	p.min_n = 4;
	run = run_text("titrant_lot,mass_g,titrant_ml\nN1,0.41,20.0\n"
		       "N1,0.41,20.01\nN1,0.41,20.02\n",
		       &p);
	a = al_std_lot_at(run, 0);
	assert_false(a->valid);
	assert_non_null(strstr(a->why, "at least 4"));
	assert_int_equal(a->date, 20789); /* no date: today */
	al_std_free(run);
}

/* Gregorian calendar rules: leap years every 4, not every 100, again
 * every 400; day numbers counted from 1970-01-01. */
static void
dates(void **state)
{
	long d;
	char buf[11];

	(void)state;
	assert_int_equal(al_date_parse("1970-01-01", 10, &d), 0);
	assert_int_equal(d, 0);
	assert_int_equal(al_date_parse("2000-03-01", 10, &d), 0);
	assert_int_equal(d, 11017);
	assert_int_equal(al_date_parse("2026-12-02", 10, &d), 0);
	assert_int_equal(d, 20789);
	al_date_format(d + 30, buf);
	assert_string_equal(buf, "2027-01-01");
	assert_int_equal(al_date_parse("2024-02-29", 10, &d), 0);
	assert_int_equal(al_date_parse("2000-02-29", 10, &d), 0);
	assert_int_equal(al_date_parse("2023-02-29", 10, &d), -1);
	assert_int_equal(al_date_parse("1900-02-29", 10, &d), -1);
	assert_int_equal(al_date_parse("2026-13-01", 10, &d), -1);
	assert_int_equal(al_date_parse("2026-04-31", 10, &d), -1);
	assert_int_equal(al_date_parse("02.12.2026", 10, &d), -1);
	assert_int_equal(al_date_parse("2026-12-2", 9, &d), -1);
	al_date_format(-25567, buf);
	assert_string_equal(buf, "1900-01-01");
}

static void
register_round_trip(void **state)
{
	const char *text =
		"titrant_lot,standard,concentration_mol_l,u_mol_l,n,rsd_pct,"
		"standardised_on,valid_until,valid\n"
		"N1,KHP,0.1002,0.00011,3,0.05,2026-11-30,2026-12-30,yes\n"
		"N2,KHP,0.0998,0.0002,3,2.1,2026-12-01,2026-12-31,no\n";
	FILE *f = fmemopen((void *)text, strlen(text), "r");
	al_diags d = {0};
	al_status st;
	al_register *reg = al_register_read(f, "reg.csv", &st, &d);
	al_titrant t;
	char *out = NULL;
	size_t len = 0;
	FILE *o;

	(void)state;
	fclose(f);
	assert_non_null(reg);
	assert_int_equal(al_register_count(reg), 2);
	assert_true(al_register_find(reg, "N1")->valid);
	assert_false(al_register_find(reg, "N2")->valid);
	assert_rel(al_register_find(reg, "N1")->concentration_mol_l, 0.1002,
		   1e-15);
	memset(&t, 0, sizeof t);
	t.lot = "N2";
	t.standard = "KHP";
	t.concentration_mol_l = 0.10011;
	t.u_mol_l = 0.0001;
	t.n = 3;
	t.valid = 1;
	t.standardised_on = 20789;
	t.valid_until = 20789 + 30;
	assert_int_equal(al_register_put(reg, &t), AL_OK);
	assert_int_equal(al_register_count(reg), 2);
	o = open_memstream(&out, &len);
	assert_int_equal(al_register_write(o, reg), AL_OK);
	fclose(o);
	assert_non_null(strstr(out, "N1,KHP,0.1002,0.00011,3,0.05,2026-11-30,"
				    "2026-12-30,yes\n"));
	assert_non_null(strstr(out, "N2,KHP,0.10011,0.0001,3,,2026-12-02,"
				    "2027-01-01,yes\n"));
	free(out);
	al_register_free(reg);
	al_diags_clear(&d);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(quam_a2), cmocka_unit_test(khp),
		cmocka_unit_test(lots),	   cmocka_unit_test(dates),
		cmocka_unit_test(register_round_trip),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
