/* acidlot tests: endpoints of titration curves against the exact curve
 * of a weak polyprotic acid titrated with NaOH.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * The model (METHODS.md s.8; the charge balance, no activity
 * corrections): n mmol of an acid with dissociation constants K_1..K_p
 * in V0 mL, titrated with c_b mol/L NaOH; at [H+] = h the volume
 * delivered is V = (n nu(h) - (h - Kw/h) V0) / (c_b + h - Kw/h), nu(h)
 * the mean number of protons removed, sum of i alpha_i. pKa at 25 C from
 * the CRC Handbook of Chemistry and Physics, "Dissociation constants of
 * organic acids in aqueous solution": citric 3.13, 4.76, 6.40; malic
 * 3.40, 5.20; tartaric 2.98, 4.34. Kw = 1e-14. The curves are made here
 * from the equation, not by the code under test. */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/assay.h"
#include "acidlot/curve.h"

#define KW 1e-14
#define V0 100.0 /* mL of sample and water */
#define CB 0.1   /* mol/L NaOH */
#define VE 20.0  /* mL: the equivalence volume the amounts are set for */
#define MAX_READINGS 400

struct acid {
	const char *name;
	int p;
	double pka[3];
};

static const struct acid acids[] = {
	{"citric", 3, {3.13, 4.76, 6.40}},
	{"malic", 2, {3.40, 5.20, 0}},
	{"tartaric", 2, {2.98, 4.34, 0}},
};

/* The mean number of protons removed at pH ph: alpha_i proportional to
 * prod_{j <= i} K_j / h. */
static double
nu(const struct acid *a, double ph)
{
	double term = 1, sum = 1, mean = 0;

	for (int i = 1; i <= a->p; i++) {
		term *= pow(10, ph - a->pka[i - 1]);
		sum += term;
		mean += i * term;
	}
	return mean / sum;
}

/* The model's volume at pH ph (n mmol set so that Ve = VE). */
static double
volume_at(const struct acid *a, double ph)
{
	double n = VE * CB / a->p, h = pow(10, -ph), x = h - KW / h;

	return (n * nu(a, ph) - x * V0) / (CB + x);
}

/* The model's pH at volume v, by bisection (V rises with pH). */
static double
ph_at(const struct acid *a, double v)
{
	double lo = 0, hi = 14;

	for (int k = 0; k < 200; k++) {
		double mid = (lo + hi) / 2;

		if (volume_at(a, mid) < v)
			lo = mid;
		else
			hi = mid;
	}
	return (lo + hi) / 2;
}

/* The model's steepest point: the pH where dV/dpH is least, by golden
 * section over 6 to 11 (one minimum there), and its volume. */
static double
steepest_volume(const struct acid *a)
{
	const double g = (sqrt(5) - 1) / 2, d = 1e-5;
	double lo = 6, hi = 11;

	for (int k = 0; k < 200; k++) {
		double x1 = hi - g * (hi - lo), x2 = lo + g * (hi - lo);
		double s1 = volume_at(a, x1 + d) - volume_at(a, x1 - d);
		double s2 = volume_at(a, x2 + d) - volume_at(a, x2 - d);

		if (s1 < s2)
			hi = x2;
		else
			lo = x1;
	}
	return volume_at(a, (lo + hi) / 2);
}

/* Readings every `far` mL, every `near` mL within 2 mL of VE, up to
 * `end` mL, with Gaussian noise of sd `noise` pH (seeded). */
static size_t
readings(const struct acid *a, double far, double near, double end,
	 double noise, double *ml, double *ph)
{
	gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
	size_t n = 0;

	gsl_rng_set(rng, 20261205);
	/* the volumes: k steps from each region's start, no drift */
	for (int k = 0; k * far < VE - 2 - 1e-9 && n < MAX_READINGS; k++)
		ml[n++] = k * far;
	for (int k = 0; k * near < 4 - 1e-9 && n < MAX_READINGS; k++)
		ml[n++] = VE - 2 + k * near;
	for (int k = 0; VE + 2 + k * far <= end + 1e-9 && n < MAX_READINGS; k++)
		ml[n++] = VE + 2 + k * far;
	while (n > 0 && ml[n - 1] > end + 1e-9)
		n--;
	for (size_t i = 0; i < n; i++)
		ph[i] = ph_at(a, ml[i]) +
			(noise > 0 ? gsl_ran_gaussian(rng, noise) : 0);
	gsl_rng_free(rng);
	return n;
}

static al_curve_endpoint
find(const double *ml, const double *ph, size_t n, al_curve_mode mode)
{
	double work[3 * MAX_READINGS];
	al_curve c = {ml, ph, n, 8.1, V0};
	al_curve_endpoint e;

	al_curve_find(&c, mode, work, &e);
	return e;
}

/* fixed at pH 8.1 within 0.01 mL of the model's volume at 8.1,
 * inflection within 0.05 mL of its steepest point, gran within 0.10 mL
 * of the equivalence volume; the clean curves carry no flag but
 * sparse-near-endpoint where the jump outruns 0.05 mL steps. */
static void
model_endpoints(void **state)
{
	double ml[MAX_READINGS], ph[MAX_READINGS];

	(void)state;
	for (size_t k = 0; k < 3; k++) {
		const struct acid *a = &acids[k];
		size_t n = readings(a, 1, 0.05, VE + 8, 0, ml, ph);
		al_curve_endpoint f = find(ml, ph, n, AL_CURVE_FIXED);
		al_curve_endpoint i = find(ml, ph, n, AL_CURVE_INFLECTION);
		al_curve_endpoint g = find(ml, ph, n, AL_CURVE_GRAN);
		double want_f = volume_at(a, 8.1), want_i = steepest_volume(a);

		print_message("%s: fixed %.4f (model %.4f), inflection %.4f "
			      "(model %.4f), gran %.4f (Ve %.4f)\n",
			      a->name, f.volume_ml, want_f, i.volume_ml, want_i,
			      g.volume_ml, VE);
		assert_true(f.has_volume && i.has_volume && g.has_volume);
		assert_true(fabs(f.volume_ml - want_f) <= 0.01);
		assert_true(fabs(i.volume_ml - want_i) <= 0.05);
		assert_true(fabs(g.volume_ml - VE) <= 0.10);
		assert_true((f.flags & ~(unsigned)AL_CURVE_SPARSE) == 0);
		assert_true((i.flags & ~(unsigned)AL_CURVE_SPARSE) == 0);
		assert_true((g.flags & ~(unsigned)AL_CURVE_SPARSE) == 0);
	}
}

/* With 0.01 pH of Gaussian noise, fixed within 0.03 mL and no noisy
 * flag; with 0.1 pH, the noisy flag. */
static void
noisy_readings(void **state)
{
	double ml[MAX_READINGS], ph[MAX_READINGS];

	(void)state;
	for (size_t k = 0; k < 3; k++) {
		const struct acid *a = &acids[k];
		size_t n = readings(a, 1, 0.05, VE + 8, 0.01, ml, ph);
		al_curve_endpoint f = find(ml, ph, n, AL_CURVE_FIXED);

		assert_true(f.has_volume);
		assert_true(fabs(f.volume_ml - volume_at(a, 8.1)) <= 0.03);
		assert_false(f.flags & AL_CURVE_NOISY);
		n = readings(a, 1, 0.05, VE + 8, 0.1, ml, ph);
		f = find(ml, ph, n, AL_CURVE_FIXED);
		assert_true(f.flags & AL_CURVE_NOISY);
	}
}

/* Each flag from a curve made for it. */
static void
flags_provoked(void **state)
{
	const struct acid *a = &acids[0];
	double ml[MAX_READINGS], ph[MAX_READINGS];
	size_t n;
	al_curve_endpoint e;
	char names[256];

	(void)state;
	/* readings every 1 mL throughout: the 8.1 crossing lies between
	 * readings a whole mL and several pH apart */
	n = readings(a, 1, 1, VE + 8, 0, ml, ph);
	e = find(ml, ph, n, AL_CURVE_FIXED);
	assert_true(e.has_volume && (e.flags & AL_CURVE_SPARSE));
	/* stopped 1 mL short of the end: no volume */
	n = readings(a, 1, 0.05, VE - 1, 0, ml, ph);
	e = find(ml, ph, n, AL_CURVE_FIXED);
	assert_false(e.has_volume);
	assert_true(e.flags & AL_CURVE_NOT_REACHED);
	/* a drop of 0.3 pH in the second half */
	n = readings(a, 1, 0.05, VE + 8, 0, ml, ph);
	ph[n - 3] -= 0.3;
	e = find(ml, ph, n, AL_CURVE_FIXED);
	assert_true(e.has_volume && (e.flags & AL_CURVE_PH_FALLS));
	/* gran without the volume before titration, and on a curve that
	 * ends below pH 10 */
	{
		double work[3 * MAX_READINGS];
		al_curve c = {ml, ph, n, 8.1, NAN};

		ph[n - 3] += 0.3;
		al_curve_find(&c, AL_CURVE_GRAN, work, &e);
		assert_false(e.has_volume);
		assert_true(e.flags & AL_CURVE_GRAN_NO_V0);
	}
	n = readings(a, 1, 0.05, VE + 0.1, 0, ml, ph);
	e = find(ml, ph, n, AL_CURVE_GRAN);
	assert_false(e.has_volume);
	assert_true(e.flags & AL_CURVE_GRAN_FEW);
	/* a sample already past the endpoint pH, and a curve of one
	 * reading, give no volume */
	n = readings(a, 1, 0.05, VE + 8, 0, ml, ph);
	e = find(ml + n - 5, ph + n - 5, 5, AL_CURVE_FIXED);
	assert_false(e.has_volume);
	assert_true(e.flags & AL_CURVE_STARTS_ABOVE);
	e = find(ml, ph, 1, AL_CURVE_FIXED);
	assert_false(e.has_volume);
	assert_true(e.flags & AL_CURVE_FEW_READINGS);
	e = find(ml, ph, 4, AL_CURVE_INFLECTION);
	assert_true(e.flags & AL_CURVE_FEW_READINGS);
	al_curve_flags_format(AL_CURVE_SPARSE | AL_CURVE_NOISY, names,
			      sizeof names);
	assert_string_equal(names, "sparse-near-endpoint;noisy");
}

/* The mean and sd of the first result of an assay of text (the library,
 * as acidlot assay runs it). */
static void
assay_text(const char *text, al_curve_mode mode, double out[2])
{
	al_assay_options opt;
	al_status st;
	al_assay *run;
	FILE *f = fmemopen((void *)text, strlen(text), "r");
	const al_group_result *r;

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.endpoint_mode = mode;
	run = al_assay_new(&opt, &st);
	assert_non_null(run);
	assert_non_null(f);
	st = al_assay_read(run, f, "t.csv", NULL, NULL);
	fclose(f);
	assert_int_equal(st, AL_OK);
	assert_int_equal(al_assay_finish(run), AL_OK);
	r = al_assay_result(run, 0);
	assert_int_equal(r->stats.n, 3);
	out[0] = r->stats.mean;
	out[1] = r->stats.sd;
	al_assay_free(run);
}

/* An assay of three replicate curves equals the assay of the three
 * endpoint volumes of those curves (to 1e-12), in each mode: the
 * curves are read into the same rows a bench sheet gives. */
static void
curves_equal_volumes(void **state)
{
	const struct acid *a = &acids[0];
	char *curves = NULL, *volumes = NULL;
	size_t lc = 0, lv = 0;

	(void)state;
	for (int mode = AL_CURVE_FIXED; mode <= AL_CURVE_GRAN; mode++) {
		FILE *c = open_memstream(&curves, &lc);
		FILE *v = open_memstream(&volumes, &lv);
		double from_curves[2], from_volumes[2];

		fputs("sample,replicate,volume_ml,titrant_mol_l,curve,"
		      "titrant_ml,ph\n", c);
		fputs("sample,replicate,volume_ml,titrant_mol_l,titrant_ml\n", v);
		for (int rep = 1; rep <= 3; rep++) {
			double ml[MAX_READINGS], ph[MAX_READINGS];
			size_t n = readings(a, 1, 0.05, VE + 8, 0.002 * rep, ml, ph);
			al_curve_endpoint e = find(ml, ph, n, (al_curve_mode)mode);

			for (size_t i = 0; i < n; i++)
				fprintf(c, "J1,%d,%.17g,0.1,J1-%d,%.17g,%.17g\n",
					rep, V0, rep, ml[i], ph[i]);
			assert_true(e.has_volume);
			fprintf(v, "J1,%d,%.17g,0.1,%.17g\n", rep, V0,
				e.volume_ml);
		}
		fclose(c);
		fclose(v);
		assay_text(curves, (al_curve_mode)mode, from_curves);
		assay_text(volumes, AL_CURVE_FIXED, from_volumes);
		for (int k = 0; k < 2; k++)
			assert_true(fabs(from_curves[k] - from_volumes[k]) <=
				    1e-12 * fabs(from_volumes[k]));
		free(curves);
		free(volumes);
		curves = volumes = NULL;
	}
}

UNIT_TEST_MAIN(setup, teardown, cmocka_unit_test(model_endpoints),
	       cmocka_unit_test(noisy_readings),
	       cmocka_unit_test(flags_provoked),
	       cmocka_unit_test(curves_equal_volumes))
