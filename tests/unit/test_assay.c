/* acidlot tests: the assay run through the library interface.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "acidlot/assay.h"
#include "acidlot/report.h"

/* threads: 1 one thread; 0 two where it pays; 2 that and the reading
 * piped (al_assay_read_piped) */
static al_assay *
run_text_threads(const char *text, int threads, al_status *st)
{
	al_assay_options opt;
	al_assay *run;
	FILE *f = fmemopen((void *)text, strlen(text), "r");

	assert_non_null(f);
	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.threads = threads == 1;
	run = al_assay_new(&opt, st);
	assert_non_null(run);
	*st = threads == 2 ? al_assay_read_piped(run, al_read_stdio, f, "t.csv",
						 NULL, NULL)
			   : al_assay_read(run, f, "t.csv", NULL, NULL);
	fclose(f);
	if (*st == AL_OK)
		*st = al_assay_finish(run);
	return run;
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
 * in two (the reading piped): the same counts, flags and Cochran tests,
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
			memset(name, 'x', 1500);
			snprintf(name + 1500, 100, "%d", i);
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
	run = run_text_threads(text, 2, &st);
	assert_int_equal(st, AL_OK);
	assert_int_equal(al_assay_group_count(run), SAMPLES);
	{
		al_assay_counts c1 = al_assay_get_counts(run1),
				c2 = al_assay_get_counts(run);

		assert_memory_equal(c1.by_verdict, c2.by_verdict,
				    sizeof c1.by_verdict);
		assert_true(c1.by_verdict[AL_VERDICT_NO_SPEC] == SAMPLES);
		assert_int_equal(al_assay_cochran_count(run1),
				 al_assay_cochran_count(run));
		assert_true(al_assay_cochran_count(run) > 0);
		for (size_t i = 0; i < al_assay_cochran_count(run); i++) {
			const al_cochran *a1 = al_assay_cochran_at(run1, i),
					 *a2 = al_assay_cochran_at(run, i);

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

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(interleaved_equals_adjacent),
		cmocka_unit_test(counts_and_errors),
		cmocka_unit_test(endpoint_flag),
		cmocka_unit_test(report_two_threads),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
