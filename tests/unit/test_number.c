/* acidlot tests: strict decimal parsing, checked against glibc strtod.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <stdint.h>
#include <string.h>

#include "acidlot/number.h"

static al_numerr
parse(const char *s, double *v)
{
	return al_number_parse(s, strlen(s), '.', v);
}

static void
accepted(void **state)
{
	static const struct {
		const char *s;
		double v;
	} ok[] = {
		{"12.5", 12.5},	 {" 12.5 ", 12.5}, {"+0.5", 0.5},
		{"-3", -3},	 {".25", 0.25},	   {"5.", 5},
		{"1e3", 1000},	 {"2.5E-2", 0.025}, {"0", 0},
		{"007.10", 7.1}, {"\t8.1", 8.1},   {"1E+2", 100},
	};
	double v;

	(void)state;
	for (size_t i = 0; i < sizeof ok / sizeof ok[0]; i++) {
		assert_int_equal(parse(ok[i].s, &v), AL_NUM_OK);
		assert_true(v == ok[i].v);
	}
}

static void
refused(void **state)
{
	static const struct {
		const char *s;
		al_numerr e;
	} bad[] = {
		{"", AL_NUM_EMPTY},	      {"   ", AL_NUM_EMPTY},
		{"12,5", AL_NUM_COMMA},	      {"1,234.5", AL_NUM_SYNTAX},
		{"0x10", AL_NUM_SYNTAX},      {"inf", AL_NUM_SYNTAX},
		{"nan", AL_NUM_SYNTAX},	      {"1e", AL_NUM_SYNTAX},
		{"1e+", AL_NUM_SYNTAX},	      {".", AL_NUM_SYNTAX},
		{"-", AL_NUM_SYNTAX},	      {"12.5 mL", AL_NUM_SYNTAX},
		{"1 2", AL_NUM_SYNTAX},	      {"--1", AL_NUM_SYNTAX},
		{"1e400", AL_NUM_RANGE},      {"1e-400", AL_NUM_RANGE},
		{"1.2.3", AL_NUM_SYNTAX},     {"12.5%", AL_NUM_SYNTAX},
	};
	double v;

	(void)state;
	for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++)
		assert_int_equal(parse(bad[i].s, &v), bad[i].e);
}

static void
decimal_comma(void **state)
{
	double v;

	(void)state;
	assert_int_equal(al_number_parse("12,5", 4, ',', &v), AL_NUM_OK);
	assert_true(v == 12.5);
	assert_int_equal(al_number_parse("12.5", 4, ',', &v), AL_NUM_SYNTAX);
}

/* xorshift64*: a fixed, portable stream of test strings */
static uint64_t rng = 88172645463325252ULL;

static uint64_t
next(void)
{
	rng ^= rng >> 12;
	rng ^= rng << 25;
	rng ^= rng >> 27;
	return rng * 2685821657736338717ULL;
}

/* Every parse must equal glibc's correctly rounded strtod, bit for bit,
 * on the fast path (<= 15 digits) and beyond it. */
static void
matches_strtod(void **state)
{
	char s[64];
	double v, ref;

	(void)state;
	for (int i = 0; i < 300000; i++) {
		int digits = 1 + (int)(next() % 20);
		int point = (int)(next() % (uint64_t)(digits + 1));
		int exp = (int)(next() % 61) - 30;
		size_t n = 0;

		if (next() % 4 == 0)
			s[n++] = '-';
		for (int d = 0; d < digits; d++) {
			if (d == point && d > 0)
				s[n++] = '.';
			s[n++] = (char)('0' + next() % 10);
		}
		if (next() % 3 == 0)
			n += (size_t)snprintf(s + n, sizeof s - n, "e%d", exp);
		s[n] = '\0';
		assert_int_equal(parse(s, &v), AL_NUM_OK);
		ref = strtod(s, NULL);
		if (memcmp(&v, &ref, sizeof v) != 0) {
			print_error("'%s': %.17g vs strtod %.17g\n", s, v, ref);
			fail();
		}
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(accepted),
		cmocka_unit_test(refused),
		cmocka_unit_test(decimal_comma),
		cmocka_unit_test(matches_strtod),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
