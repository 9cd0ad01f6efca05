/* acidlot tests: standardisation of NaOH against KHP, the titrant
 * register and dates.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <string.h>

#include "acidlot/date.h"
#include "acidlot/gum.h"
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

/* QUAM 2012 (3rd ed.) A2 with its detailed inputs (A2.4; as re-computed
 * by the GTC documentation, seen): balance linearity 0.15 mg rectangular
 * in the tare and the gross weighing, purity +/-0.0005 rectangular,
 * atomic weights C 12.0107(8), H 1.00794(7), O 15.9994(3), K 39.0983(1)
 * rectangular, burette +/-0.03 mL triangular, temperature u 0.006 mL,
 * repeatability 0.0005 -> c = 0.102136159706, u = 0.000100500722. */
static void
quam_a2_2012(void **state)
{
	al_std_inputs in = {0};
	al_budget b;
	double s3 = sqrt(3.0);

	(void)state;
	in.mass_g = 0.3888;
	in.u_mass_g = sqrt(2.0) * al_gum_rectangular(0.15e-3);
	in.purity = 1.0;
	in.u_purity = al_gum_rectangular(0.0005);
	in.molar_mass = 8 * 12.0107 + 5 * 1.00794 + 4 * 15.9994 + 39.0983;
	in.u_molar_mass = sqrt(pow(8 * 0.0008 / s3, 2) + pow(5 * 0.00007 / s3, 2) +
			       pow(4 * 0.0003 / s3, 2) + pow(0.0001 / s3, 2));
	in.volume_ml = 18.64;
	in.u_volume_ml = al_gum_triangular(0.03);
	in.u_volume_temp_ml = 0.006;
	in.rep_rel = 0.0005;
	al_std_uncertainty(&in, &b);
	assert_rel(in.molar_mass, 204.2212, 1e-12);
	assert_rel(b.c, 0.102136159706, 1e-11);
	assert_rel(b.u, 0.000100500722124, 1e-9);
	/* the budget as published: V_T cal 6.71088e-5, R 5.10681e-5,
	 * V_T temp 3.28764e-5, P 2.94842e-5 mol/L */
	assert_rel(b.items[4].contribution, 6.71088e-5, 1e-5);
	assert_rel(b.items[0].contribution, 5.10681e-5, 1e-5);
	assert_rel(b.items[5].contribution, 3.28764e-5, 1e-5);
	assert_rel(b.items[2].contribution, 2.94842e-5, 1e-5);
}

/* QUAM 2012 A3, HCl against the NaOH of A2 (as re-computed by the GTC
 * documentation, seen): c = 1000 m P V_T2 / (V_T1 M V_HCl) = 0.10139
 * mol/L, u = 0.0001843 mol/L, with each volume's calibration (0.03 mL
 * burette, 0.02 mL pipette, triangular) and temperature (+/-4 K x 2.1e-4
 * /K, rectangular; 15 mL for V_T2 and V_HCl, 19 mL for V_T1) and
 * repeatability 0.001. */
static void
quam_a3_2012(void **state)
{
	double s3 = sqrt(3.0), c, u;
	double m_u = sqrt(2.0) * al_gum_rectangular(0.15e-3);
	double vt2_u = hypot(al_gum_triangular(0.03), al_gum_rectangular(15 * 2.1e-4 * 4));
	double vt1_u = hypot(al_gum_triangular(0.03), al_gum_rectangular(19 * 2.1e-4 * 4));
	double vhcl_u = hypot(al_gum_triangular(0.02), al_gum_rectangular(15 * 2.1e-4 * 4));
	double m_khp = 8 * 12.0107 + 5 * 1.00794 + 4 * 15.9994 + 39.0983;
	double u_m_khp = sqrt(pow(8 * 0.0008 / s3, 2) + pow(5 * 0.00007 / s3, 2) +
			      pow(4 * 0.0003 / s3, 2) + pow(0.0001 / s3, 2));
	al_gum_term t[7] = {
		{"repeatability", "", 1.0, 0.001, 1, 0, 0},
		{"m", "g", 0.3888, m_u, 1, 0, 0},
		{"P", "", 1.0, al_gum_rectangular(0.0005), 1, 0, 0},
		{"V_T2", "mL", 14.89, vt2_u, 1, 0, 0},
		{"V_T1", "mL", 18.64, vt1_u, -1, 0, 0},
		{"M", "g/mol", m_khp, u_m_khp, -1, 0, 0},
		{"V_HCl", "mL", 15, vhcl_u, -1, 0, 0},
	};

	(void)state;
	c = 1000 * 0.3888 * 1.0 * 14.89 / (18.64 * m_khp * 15);
	u = al_gum_product(c, t, 7);
	assert_abs(c, 0.10139, 0.000005);
	assert_rel(u, 0.0001843, 1e-3);
	/* its budget: repeatability 0.000101387, V_T2 9.69953e-5 */
	assert_rel(t[0].contribution, 0.000101387, 1e-5);
	assert_rel(t[3].contribution, 9.69953e-5, 1e-5);
	assert_rel(t[4].contribution, 8.33653e-5, 1e-5);
	assert_rel(t[6].contribution, 7.39151e-5, 1e-5);
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
	size_t n;
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
	(void)al_register_all(reg, &n);
	assert_int_equal(n, 2);
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
	(void)al_register_all(reg, &n);
	assert_int_equal(n, 2);
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

UNIT_TEST_MAIN(setup, teardown,
	       cmocka_unit_test(quam_a2), cmocka_unit_test(quam_a2_2012),
	       cmocka_unit_test(quam_a3_2012), cmocka_unit_test(khp),
	       cmocka_unit_test(lots), cmocka_unit_test(dates),
	       cmocka_unit_test(register_round_trip))
