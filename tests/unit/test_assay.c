/* acidlot tests: the assay run through the library interface.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "acidlot/assay.h"
#include "acidlot/report.h"

/* A run of text with the options given, finished (lazily:
 * al_assay_finish_lazy) when the reading went well. */
static al_assay *
run_with(const char *text, const al_assay_options *opt, int lazy,
	 al_status *st)
{
	al_assay *run = al_assay_new(opt, st);
	FILE *f = fmemopen((void *)text, strlen(text), "r");

	assert_non_null(f);
	assert_non_null(run);
	*st = al_assay_read(run, f, "t.csv", NULL, NULL);
	fclose(f);
	if (*st == AL_OK)
		*st = lazy ? al_assay_finish_lazy(run) : al_assay_finish(run);
	return run;
}

/* threads: 1 one thread; 0 two where it pays */
static al_assay *
run_text_threads(const char *text, int threads, al_status *st)
{
	al_assay_options opt;

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.threads = threads == 1;
	return run_with(text, &opt, 0, st);
}

static al_assay *
run_text(const char *text, al_status *st)
{
	return run_text_threads(text, 0, st);
}

/* Each replicate by the AOAC 942.15 formula with citric acid's molar mass
 * from METHODS.md s.2 (192.123 g/mol, 3 protons). */
static double
ta_citric(double v, double blank, double c, double df, double m)
{
	return (v - blank) * c * (192.123 / 3 / 1000) * df * 100 / m;
}

static void
interleaved_equals_adjacent(void **state)
{
	const char *adjacent =
		"lot,sample,mass_g,titrant_ml,titrant_mol_l,blank_ml\n"
		"A,S1,10.012,14.39,0.1002,0.05\nA,S1,10.030,14.35,0.1002,0.05\n"
		"B,S1,9.987,16.40,0.1002,0.05\nB,S1,10.003,16.48,0.1002,0.05\n";
	const char *interleaved =
		"lot,sample,mass_g,titrant_ml,titrant_mol_l,blank_ml\n"
		"A,S1,10.012,14.39,0.1002,0.05\nB,S1,9.987,16.40,0.1002,0.05\n"
		"A,S1,10.030,14.35,0.1002,0.05\nB,S1,10.003,16.48,0.1002,0.05\n";
	al_status st;
	al_assay *a = run_text(adjacent, &st), *b;
	const al_group_result *ra, *rb;
	double want;

	(void)state;
	assert_int_equal(st, AL_OK);
	b = run_text(interleaved, &st);
	assert_int_equal(st, AL_OK);
	assert_int_equal(al_assay_group_count(a), 2);
	assert_int_equal(al_assay_group_count(b), 2);
	for (size_t i = 0; i < 2; i++) {
		ra = al_assay_result(a, i);
		rb = al_assay_result(b, i);
		assert_string_equal(ra->lot, rb->lot);
		assert_true(ra->stats.mean == rb->stats.mean);
		assert_true(ra->stats.sd == rb->stats.sd);
		assert_int_equal(ra->verdict, AL_VERDICT_NO_SPEC);
	}
	ra = al_assay_result(a, 0);
	assert_string_equal(ra->lot, "A");
	want = (ta_citric(14.39, 0.05, 0.1002, 1, 10.012) +
		ta_citric(14.35, 0.05, 0.1002, 1, 10.030)) /
	       2;
	assert_rel(ra->stats.mean, want, 1e-13);
	assert_int_equal(ra->unit, AL_UNIT_G_100G);
	assert_string_equal(ra->acid->name, "citric");
	al_assay_free(a);
	al_assay_free(b);
}

static void
counts_and_errors(void **state)
{
	al_status st;
	al_assay *run = run_text(
		"sample,mass_g,titrant_ml,titrant_mol_l\n"
		"S1,10,8,0.1\n\n,,,\nS1,0,8,0.1\nS1,10,8.1,0.1\n",
		&st);
	al_assay_counts c = al_assay_get_counts(run);
	al_diags *d = al_assay_diags(run);

	(void)state;
	assert_int_equal(st, AL_OK); /* the file was read to its end */
	assert_int_equal(c.rows_read, 3);
	assert_int_equal(c.rows_used, 2);
	assert_int_equal(c.rows_bad, 1);
	assert_int_equal(d->errors, 1);
	assert_int_equal(d->items[0].line, 5);
	assert_string_equal(d->items[0].column, "mass_g");
	al_assay_free(run);
}

/* The endpoint flag: citric acid to pH 7.0 titrates 2.80 of 3 protons,
 * short of 99 % (Henderson-Hasselbalch with pKa 3.13/4.76/6.40). */
static void
endpoint_flag(void **state)
{
	al_status st;
	al_assay *run = run_text(
		"sample,mass_g,titrant_ml,titrant_mol_l,endpoint_ph\n"
		"S1,10,8,0.1,7.0\nS2,10,8,0.1,8.1\n",
		&st);
	const al_group_result *r;

	(void)state;
	assert_int_equal(st, AL_OK);
	r = al_assay_result(run, 0);
	assert_true(r->flags & AL_FLAG_ENDPOINT_LOW);
	assert_true(r->flags & AL_FLAG_SINGLE);
	assert_abs(r->endpoint_ph, 7.0, 0);
	assert_true(r->endpoint_ph_needed > 7.0 && r->endpoint_ph_needed < 8.1);
	r = al_assay_result(run, 1);
	assert_false(r->flags & AL_FLAG_ENDPOINT_LOW);
	al_assay_free(run);
}

/* A run of many results, read, finished and reported in one thread and
 * in two: the same counts, flags and Cochran tests,
 * the same report bytes and the same count of guarded cells. The rows vary so that
 * results differ in n, flags and verdict; some names start with '=' (a
 * guarded cell), and one stretch of results has names long enough that
 * its chunk overflows the second thread's buffer and is done again. The
 * one-thread report is the reference here: the two must agree. */
static char *
report_text(const al_assay *run, int threads, unsigned long *guarded)
{
	al_report_options ro;
	char *buf = NULL;
	size_t len = 0;
	FILE *f = open_memstream(&buf, &len);

	assert_non_null(f);
	memset(&ro, 0, sizeof ro);
	ro.decimals = -1;
	ro.threads = threads;
	ro.report_id = "R1";
	assert_int_equal(al_report_write(f, run, &ro), AL_OK);
	assert_int_equal(fclose(f), 0);
	*guarded = ro.guarded;
	return buf;
}

static void
report_two_threads(void **state)
{
	enum { SAMPLES = 30000 };
	size_t cap = (size_t)SAMPLES * 4 * 160 + 2000 * 1500, len = 0;
	char *text = malloc(cap), *one, *two;
	unsigned long g1, g2;
	char name[1600];
	al_status st;
	al_assay *run, *run1;

	(void)state;
	assert_non_null(text);
	len += (size_t)snprintf(text + len, cap - len,
				"product,lot,sample,mass_g,titrant_ml,"
				"titrant_mol_l\n");
	for (int i = 0; i < SAMPLES; i++) {
		int reps = 1 + i % 4;

		if (i >= 1100 && i < 2100) {
			/* long keys, up to the AL_IDENT_MAX allowed */
			memset(name, 'x', 245);
			snprintf(name + 245, 100, "%d", i);
		} else {
			snprintf(name, sizeof name, "%sS%d", i % 7 ? "" : "=",
				 i);
		}
		for (int r = 0; r < reps; r++)
			len += (size_t)snprintf(
				text + len, cap - len,
				"P%d,L%d,%s,%.3f,%.2f,0.1000\n", i % 3, i / 50,
				name, 10 + 0.01 * ((i * 7 + r * 3) % 11),
				14 + 0.05 * ((i * 5 + r * 13) % 17) +
					(r == 3 && i % 5 == 0 ? 3 : 0));
		assert_true(len < cap);
	}
	/* the whole run in one thread, and in two (finish and report) */
	run1 = run_text_threads(text, 1, &st);
	assert_int_equal(st, AL_OK);
	run = run_text_threads(text, 0, &st);
	assert_int_equal(st, AL_OK);
	assert_int_equal(al_assay_group_count(run), SAMPLES);
	{
		al_assay_counts c1 = al_assay_get_counts(run1),
				c2 = al_assay_get_counts(run);

		assert_memory_equal(c1.by_verdict, c2.by_verdict,
				    sizeof c1.by_verdict);
		assert_true(c1.by_verdict[AL_VERDICT_NO_SPEC] == SAMPLES);
		size_t n1, n2;
		const al_cochran *t1 = al_assay_cochran(run1, &n1),
				 *t2 = al_assay_cochran(run, &n2);

		assert_int_equal(n1, n2);
		assert_true(n2 > 0);
		for (size_t i = 0; i < n2; i++) {
			const al_cochran *a1 = &t1[i], *a2 = &t2[i];

			assert_true(a1->c == a2->c);
			assert_int_equal(a1->result, a2->result);
		}
		for (size_t i = 0; i < SAMPLES; i++)
			assert_int_equal(al_assay_result_flags(run1, i),
					 al_assay_result_flags(run, i));
	}
	one = report_text(run1, 1, &g1);
	two = report_text(run, 0, &g2);
	assert_true(strlen(one) > (size_t)SAMPLES * 100);
	/* not assert_string_equal: it would print megabytes */
	assert_int_equal(strlen(one), strlen(two));
	assert_true(strcmp(one, two) == 0);
	assert_true(g1 > 0);
	assert_int_equal(g1, g2);
	free(one);
	free(two);
	free(text);
	al_assay_free(run);
	al_assay_free(run1);
}

/* al_assay_finish_lazy, the report and al_assay_settle (what the
 * command does, each result evaluated once) against al_assay_finish and
 * the report: the same verdict counts, per-result flags and verdicts,
 * Cochran's tests, acids and specs used and report bytes, in one thread
 * and in two; and al_assay_settle alone evaluates what no report did.
 * Two products have specifications whose limits split the results into
 * pass, fail and retest, a third has none, and one sample of P1 has an
 * outlier (Grubbs at its largest for n = 4), excluded in one of the
 * two passes. */
static al_assay *
run_lazy(const char *text, const al_spec_table *specs, int threads,
	 int lazy, int exclude)
{
	al_assay_options opt;
	al_status st;
	al_assay *run;

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.specs = specs;
	opt.threads = threads;
	al_qc_options_default(&opt.qc);
	opt.qc.exclude_outliers = exclude;
	run = run_with(text, &opt, lazy, &st);
	assert_int_equal(st, AL_OK);
	return run;
}

static void
lazy_equals_finish(void **state)
{
	enum { SAMPLES = 20000 };
	static const char spec_text[] =
		"product,acid,unit,min,max,max_rsd_pct,min_n\n"
		"P0,citric,g/100g,0.95,1.2,1.0,2\n"
		"P1,malic,g/100g,0.9,1.3,3,3\n";
	size_t cap = (size_t)SAMPLES * 4 * 64, len = 0;
	char *text = malloc(cap);
	al_diags d = {0};
	al_status st;
	FILE *sf = fmemopen((void *)spec_text, strlen(spec_text), "r");
	al_spec_table *specs;

	(void)state;
	assert_non_null(text);
	assert_non_null(sf);
	specs = al_spec_table_read(cat, NULL, sf, "s.csv", &st, &d);
	fclose(sf);
	assert_non_null(specs);
	len += (size_t)snprintf(text + len, cap - len,
				"product,lot,sample,mass_g,titrant_ml,"
				"titrant_mol_l\n");
	for (int i = 0; i < SAMPLES; i++)
		for (int r = 0; r < 1 + i % 4; r++)
			len += (size_t)snprintf(
				text + len, cap - len, "P%d,L%d,S%d,%.3f,%.2f,0.1000\n",
				i % 3, i / 50, i, i == 43 ? 10.0 : 10 + 0.01 * (i % 11),
				i == 43 ? (r == 3 ? 23.0 : 14.0)
					: 13 + 0.3 * (i % 11) +
						  0.02 * ((r * 13 + i) % 5));
	assert_true(len < cap);
	for (int exclude = 0; exclude < 2; exclude++)
		for (int threads = 0; threads < 2; threads++) {
			al_assay *full = run_lazy(text, specs, threads, 0, exclude);
			al_assay *lazy = run_lazy(text, specs, threads, 1, exclude);
			al_assay *bare = run_lazy(text, specs, threads, 1, exclude);
			unsigned long g1, g2;
			char *one = report_text(full, threads, &g1);
			char *two = report_text(lazy, threads, &g2);
			al_assay_counts c1, c2, c3;

			assert_int_equal(al_assay_settle(lazy), AL_OK);
			assert_int_equal(al_assay_settle(bare), AL_OK);
			c1 = al_assay_get_counts(full);
			c2 = al_assay_get_counts(lazy);
			c3 = al_assay_get_counts(bare);
			assert_true(c1.by_verdict[AL_VERDICT_PASS] > 0);
			assert_true(c1.by_verdict[AL_VERDICT_FAIL] > 0);
			assert_true(c1.by_verdict[AL_VERDICT_RETEST] > 0);
			assert_true(c1.by_verdict[AL_VERDICT_NO_SPEC] > 0);
			assert_memory_equal(c1.by_verdict, c2.by_verdict,
					    sizeof c1.by_verdict);
			assert_memory_equal(c1.by_verdict, c3.by_verdict,
					    sizeof c1.by_verdict);
			size_t nf, nl;
			const al_cochran *tf = al_assay_cochran(full, &nf),
					 *tl = al_assay_cochran(lazy, &nl);

			assert_true(nf > 0);
			assert_int_equal(nf, nl);
			for (size_t i = 0; i < nf; i++)
				assert_int_equal(tf[i].result, tl[i].result);
			for (size_t i = 0; i < SAMPLES; i++) {
				unsigned f = al_assay_result_flags(full, i);

				assert_int_equal(f, al_assay_result_flags(lazy, i));
				assert_int_equal(f, al_assay_result_flags(bare, i));
				assert_int_equal(al_assay_result(full, i)->verdict,
						 al_assay_result(bare, i)->verdict);
			}
			assert_true(al_assay_result_flags(full, 43) &
				    AL_FLAG_OUTLIER);
			assert_int_equal(!!(al_assay_result_flags(full, 43) &
					    AL_FLAG_EXCLUDED), exclude);
			for (size_t i = 0; i < 4; i++) {
				assert_ptr_equal(al_assay_acid_used(full, i),
						 al_assay_acid_used(lazy, i));
				assert_ptr_equal(al_assay_acid_used(full, i),
						 al_assay_acid_used(bare, i));
				assert_ptr_equal(al_assay_spec_used(full, i),
						 al_assay_spec_used(lazy, i));
				assert_ptr_equal(al_assay_spec_used(full, i),
						 al_assay_spec_used(bare, i));
			}
			assert_non_null(al_assay_acid_used(full, 1));
			assert_non_null(al_assay_spec_used(full, 1));
			assert_int_equal(strlen(one), strlen(two));
			assert_true(strcmp(one, two) == 0);
			assert_int_equal(g1, g2);
			free(one);
			free(two);
			al_assay_free(full);
			al_assay_free(lazy);
			al_assay_free(bare);
		}
	al_spec_table_free(specs);
	al_diags_clear(&d);
	free(text);
}

/* The first result of a text, run with the options given. */
static al_assay *
first_result(const char *text, int exclude, double titrant_u,
	     const al_group_result **r)
{
	al_assay_options opt;
	al_status st;
	al_assay *run;

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.qc.exclude_outliers = exclude;
	opt.qc.has_titrant_u = titrant_u > 0;
	opt.qc.titrant_u = titrant_u;
	run = run_with(text, &opt, 0, &st);
	assert_int_equal(st, AL_OK);
	*r = al_assay_result(run, 0);
	return run;
}

/* Issue 18 A3: with --exclude-outliers every figure of a result (n, mean,
 * SD, RSD, CI, u, U, Brix ratio) is that of the same data with the
 * outlier's row deleted, to 1e-12: the outlier's inputs (titrant, blank,
 * concentration, mass, dilution, Brix) come off the budget's means too.
 * The rows differ in every input so that a mean taken over all rows
 * would show. */
static void
excluded_equals_deleted(void **state)
{
	static const char *const head =
		"sample,mass_g,titrant_ml,blank_ml,titrant_mol_l,made_up_ml,"
		"aliquot_ml,brix\n";
	static const char *const rows =
		"S,10.02,14.31,0.05,0.1002,100,25,11.8\n"
		"S,9.98,14.26,0.04,0.1001,100,25,11.9\n"
		"S,10.05,14.36,0.05,0.1003,100,25,11.7\n"
		"S,10.01,14.30,0.06,0.1002,100,25,11.8\n"
		"S,9.97,14.24,0.05,0.1000,100,25,11.8\n";
	static const char *const outlier =
		"S,12.50,21.90,0.30,0.1010,250,10,13.0\n";
	char all[1024], kept[1024];
	const al_group_result *a, *b;
	al_assay *ra, *rb;
	const char *third = strchr(strchr(rows, '\n') + 1, '\n') + 1;

	snprintf(all, sizeof all, "%s%.*s%s%s", head, (int)(third - rows), rows,
		 outlier, third);
	(void)state;
	snprintf(kept, sizeof kept, "%s%s", head, rows);
	ra = first_result(all, 1, 0.00012, &a);
	rb = first_result(kept, 0, 0.00012, &b);
	assert_true(a->flags & AL_FLAG_EXCLUDED);
	assert_int_equal(a->excluded_index, 2);
	assert_int_equal(a->stats.n, b->stats.n);
	assert_rel(a->stats.mean, b->stats.mean, 1e-12);
	assert_rel(a->stats.sd, b->stats.sd, 1e-12);
	assert_rel(a->stats.rsd_pct, b->stats.rsd_pct, 1e-12);
	assert_rel(a->stats.ci_low, b->stats.ci_low, 1e-12);
	assert_rel(a->stats.ci_high, b->stats.ci_high, 1e-12);
	assert_rel(a->median, b->median, 1e-12);
	assert_rel(a->range, b->range, 1e-12);
	assert_rel(a->u, b->u, 1e-12);
	assert_rel(a->U, b->U, 1e-12);
	assert_rel(a->brix, b->brix, 1e-12);
	assert_rel(a->ratio, b->ratio, 1e-12);
	assert_int_equal(a->verdict, b->verdict);
	al_assay_free(ra);
	al_assay_free(rb);
}

/* Issue 18 A4: replicates read to the burette's resolution tie all the
 * time. 14.35, 14.35, 14.40 mL: the 14.40 is within 0.05 mL of its
 * neighbour, so neither Grubbs (whose G at n = 3 with two equal values
 * is at its maximum, (n-1)/sqrt(n) = 1.1547) nor Dixon (r10 = 1) flags
 * it; at a resolution of 0.02 mL both do, and even then an n = 3 result
 * never leaves a value out. */
static void
ties_are_no_outliers(void **state)
{
	static const char *const text =
		"sample,mass_g,titrant_ml,titrant_mol_l\n"
		"S,1,14.35,0.1\nS,1,14.35,0.1\nS,1,14.40,0.1\n";
	const al_group_result *r;
	al_assay_options opt;
	al_status st;
	al_assay *run;

	(void)state;
	run = first_result(text, 1, 0, &r);
	assert_rel(r->grubbs_g, 2 / sqrt(3.0), 1e-12);
	assert_false(r->flags & (AL_FLAG_OUTLIER | AL_FLAG_STRAGGLER |
				 AL_FLAG_DIXON | AL_FLAG_EXCLUDED));
	assert_int_equal(r->stats.n, 3);
	al_assay_free(run);

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.qc.exclude_outliers = 1;
	opt.qc.has_resolution = 1;
	opt.qc.resolution_ml = 0.02;
	run = run_with(text, &opt, 0, &st);
	assert_int_equal(st, AL_OK);
	r = al_assay_result(run, 0);
	assert_true(r->flags & AL_FLAG_OUTLIER);
	assert_true(r->flags & AL_FLAG_DIXON);
	assert_false(r->flags & AL_FLAG_EXCLUDED);
	assert_int_equal(r->stats.n, 3);
	al_assay_free(run);
}

/* Issue 18 A9: an anhydrous-basis result's u includes the water
 * determination. Rows after the worked example of METHODS.md s.6 (JECFA
 * 2014 / USP citric acid assay: 0.5500 g, water 0.20 %, 8.575 mL of
 * 1.000 N NaOH -> 100.03 % anhydrous). The budget is GUM's product
 * model (GUM 5.1.6), so the water term adds (mean u(w) / (100 - w))^2 to
 * u^2, whatever the other terms are. */
static al_assay *
anhydrous_run(int has_water_u, double water_u, const al_group_result **r)
{
	static const char *const text =
		"sample,mass_g,titrant_ml,titrant_mol_l,water_pct\n"
		"C,0.5500,8.575,1.000,0.20\nC,0.5512,8.590,1.000,0.20\n"
		"C,0.5489,8.560,1.000,0.20\n";
	al_assay_options opt;
	al_status st;
	al_assay *run;

	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.anhydrous = 1;
	opt.qc.has_water_u = has_water_u;
	opt.qc.water_u_pct = water_u;
	run = run_with(text, &opt, 0, &st);
	assert_int_equal(st, AL_OK);
	*r = al_assay_result(run, 0);
	return run;
}

static void
water_in_budget(void **state)
{
	const al_group_result *none, *some, *dflt;
	al_assay *a = anhydrous_run(1, 0, &none);
	al_assay *b = anhydrous_run(1, 0.3, &some);
	al_assay *c = anhydrous_run(0, 0, &dflt);
	double w;

	(void)state;
	/* the first row alone is the worked example: 100.03 % with USP's
	 * 64.03 mg per mL, scaled to METHODS.md's 192.123 / 3 = 64.041 */
	assert_true(fabs(al_assay_result(a, 0)->values[0] -
			 100.03 * (192.123 / 3) / 64.03) < 0.005);
	assert_true(none->anhydrous);
	w = some->stats.mean * 0.3 / (100 - 0.20);
	assert_rel(some->u * some->u - none->u * none->u, w * w, 1e-9);
	/* the documented default, 0.1 % w/w */
	w = dflt->stats.mean * 0.1 / (100 - 0.20);
	assert_rel(dflt->u * dflt->u - none->u * none->u, w * w, 1e-9);
	al_assay_free(a);
	al_assay_free(b);
	al_assay_free(c);
}

UNIT_TEST_MAIN(setup, teardown,
	       cmocka_unit_test(interleaved_equals_adjacent),
	       cmocka_unit_test(counts_and_errors),
	       cmocka_unit_test(endpoint_flag),
	       cmocka_unit_test(report_two_threads),
	       cmocka_unit_test(lazy_equals_finish),
	       cmocka_unit_test(excluded_equals_deleted),
	       cmocka_unit_test(ties_are_no_outliers),
	       cmocka_unit_test(water_in_budget))
