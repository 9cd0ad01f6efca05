/* acidlot tests: specification reading and the simple-acceptance verdict.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#define ACIDLOT_TEST_CATALOGUE
#include "testutil.h"

#include <string.h>

#include "acidlot/spec.h"

static al_spec_table *
read_spec(const char *text, al_status *st, al_diags *d)
{
	FILE *f = fmemopen((void *)text, strlen(text), "r");
	al_spec_table *t;

	assert_non_null(f);
	t = al_spec_table_read(cat, NULL, f, "s.csv", st, d);
	fclose(f);
	return t;
}

static al_summary
summary(size_t n, double mean, double rsd)
{
	al_summary s;

	memset(&s, 0, sizeof s);
	s.n = n;
	s.mean = mean;
	s.has_sd = s.has_rsd = n > 1;
	s.rsd_pct = rsd;
	return s;
}

/* Simple acceptance (ILAC G8:09/2019 4.2.1): limits inclusive; the rules
 * of issue 2: retest before pass/fail, no-spec without a specification. */
static void
verdicts(void **state)
{
	size_t n;
	al_status st;
	al_diags d = {0};
	al_spec_table *t = read_spec(
		"product,acid,unit,min,max,max_rsd_pct,min_n\n"
		"OJ,citric,g/100g,0.70,1.10,1.5,3\n"
		"LOW,malic,g/L,3.0,,,\n",
		&st, &d);
	const al_spec *oj, *low;
	al_summary s;
	unsigned why;

	(void)state;
	assert_non_null(t);
	assert_non_null(al_spec_all(t, &n));
	assert_int_equal(n, 2);
	oj = al_spec_find(t, "OJ");
	low = al_spec_find(t, "LOW");
	assert_non_null(oj);
	assert_null(al_spec_find(t, "oj"));
	assert_ptr_equal(oj->acid, al_catalogue_find(cat, "citric"));
	assert_int_equal(low->min_n, 2);
	assert_false(low->has_max);

	s = summary(3, 0.70, 0.5);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_PASS);
	s = summary(3, 1.10, 0.5);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_PASS);
	s = summary(3, 0.6999999, 0.5);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_FAIL);
	assert_int_equal(why, AL_WHY_BELOW_MIN);
	s = summary(3, 1.2, 0.5);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_FAIL);
	assert_int_equal(why, AL_WHY_ABOVE_MAX);
	s = summary(2, 0.9, 0.5);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_RETEST);
	assert_int_equal(why, AL_WHY_FEW);
	s = summary(3, 1.2, 1.6);
	assert_int_equal(al_judge(oj, &s, &why), AL_VERDICT_RETEST);
	assert_true(why & AL_WHY_RSD);
	s = summary(2, 1e6, 0.1);
	assert_int_equal(al_judge(low, &s, &why), AL_VERDICT_PASS);
	assert_int_equal(al_judge(NULL, &s, &why), AL_VERDICT_NO_SPEC);
	assert_string_equal(al_verdict_name(AL_VERDICT_NO_SPEC), "no-spec");
	al_spec_table_free(t);
	al_diags_clear(&d);
}

static void
bad_tables(void **state)
{
	static const char *const bad[] = {
		"acid,min\ncitric,1\n",			 /* no product column */
		"product,acid\nOJ,citric\n",		 /* no min or max column */
		"product,min,max\nOJ,2,1\n",		 /* min above max */
		"product,min\nOJ,1\nOJ,2\n",		 /* duplicate product */
		"product,min,max_rsd_pct\nOJ,1,0\n",	 /* rsd limit 0 */
		"product,min,min_n\nOJ,1,2.5\n",	 /* fractional min_n */
		"",					 /* empty file */
		"product,min\nOJ,1,9\n",		 /* field count */
	};
	al_status st;

	(void)state;
	for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
		al_diags d = {0};

		assert_null(read_spec(bad[i], &st, &d));
		assert_int_equal(st, AL_EINPUT);
		assert_true(d.errors >= 1);
		al_diags_clear(&d);
	}
}

UNIT_TEST_MAIN(setup, teardown,
	       cmocka_unit_test(verdicts), cmocka_unit_test(bad_tables))
