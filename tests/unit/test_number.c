/* acidlot tests: strict decimal parsing, checked against glibc strtod.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/number.h"
#include "acidlot/report.h"

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

/* Millions of cases; a tenth of that under valgrind, which is 50 times
 * slower (tests/wrap.sh sets ACIDLOT_VALGRIND). */
static long
many(void)
{
	return getenv("ACIDLOT_VALGRIND") ? 300000 : 3000000;
}

static void
same_as_strtod(const char *s)
{
	double v, ref = strtod(s, NULL);

	assert_int_equal(parse(s, &v), AL_NUM_OK);
	if (memcmp(&v, &ref, sizeof v) != 0) {
		print_error("'%s': %.17g vs strtod %.17g\n", s, v, ref);
		fail();
	}
}

/* Strings at the edges of the fast path and of double rounding: 15, 16
 * and 17 digits, powers of ten 22 and 23, halfway cases between
 * neighbouring doubles (1 + 2^-53, 2^53 + 1), the smallest normal and
 * subnormal numbers and the largest double (IEEE 754 binary64; the
 * halfway strings are exact binary expansions). */
static void
edge_cases(void **state)
{
	static const char *const cases[] = {
		"999999999999999", "9999999999999999", "99999999999999999",
		"123456789012345e-22", "123456789012345e22",
		"123456789012345e23", "1e22", "1e23", "1e-22", "1e-23",
		"9007199254740992", "9007199254740993", "9007199254740994",
		"1.00000000000000011102230246251565404236316680908203125",
		"1.000000000000000111022302462515654042363166809082031250001",
		"1.000000000000000111022302462515654042363166809082031249999",
		"2.2250738585072014e-308", "1.7976931348623157e308",
		"0.1", "0.2", "0.3", "0.30000000000000004", "100.0001",
		"14.27", "0.0997", "10.0750", "000000000000000000000000000012.5",
		"0.000000000000000000000000000000000000000001",
		"123456789012345678901234567890", "8.5e-5", "1e0", "0e10",
	};

	(void)state;
	double v;

	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
		same_as_strtod(cases[i]);
	/* below the smallest normal double: refused, not rounded to a
	 * subnormal (no lab quantity is that small) */
	assert_int_equal(parse("2.2250738585072011e-308", &v), AL_NUM_RANGE);
	assert_int_equal(parse("4.9406564584124654e-324", &v), AL_NUM_RANGE);
	assert_int_equal(parse("1.7976931348623159e308", &v), AL_NUM_RANGE);
	/* every power of ten and its neighbours in the last digit */
	for (int e = -30; e <= 30; e++)
		for (int d = 0; d < 3; d++) {
			char s[64];

			snprintf(s, sizeof s, "%s%de%d",
				 d == 0 ? "1" : d == 1 ? "0.99999999999999" : "1.00000000000001",
				 0, e);
			same_as_strtod(s);
		}
}

/* %.10g formatting (al_format_number with no fixed decimals) gives
 * exactly the bytes glibc's printf gives: random values over the whole
 * range, short decimals (ties such as 0.125 and 2.5e-5 are common in
 * lab data), and the neighbours of every power of ten. */
static void
formats_like_printf(void **state)
{
	char got[128], want[64];
	long count = 0;

	(void)state;
	for (long i = 0; i < many(); i++) {
		double v;
		uint64_t r = next();

		switch (r % 4) {
		case 0: { /* any bit pattern of a finite double */
			uint64_t bits = next();

			memcpy(&v, &bits, sizeof v);
			if (!isfinite(v))
				continue;
			break;
		}
		case 1: /* a few decimals at a lab-like scale */
			v = (double)(next() % 100000000) /
			    pow(10, (double)(next() % 14));
			break;
		case 2: /* ten or eleven digits and a tie in the last */
			v = ((double)(next() % 10000000000ULL) + 0.5) /
			    pow(10, (double)(next() % 16));
			break;
		default: { /* next to a power of ten */
			int e = (int)(next() % 20) - 6;
			int steps = (int)(next() % 5) - 2;

			v = pow(10, e);
			for (; steps > 0; steps--)
				v = nextafter(v, HUGE_VAL);
			for (; steps < 0; steps++)
				v = nextafter(v, 0);
			break;
		}
		}
		if (next() % 3 == 0)
			v = -v;
		al_format_number(v, -1, 0, got, sizeof got);
		snprintf(want, sizeof want, "%.10g", v);
		/* printf's form, but where printf writes an exponent (1e-100
		 * <= |v| < 1e-4, 1e10 <= |v| < 1e15) plain digits of the same
		 * value */
		if (strcmp(got, want) != 0 &&
		    (strchr(want, 'e') == NULL || fabs(v) < 1e-100 ||
		     fabs(v) >= 1e15 ||
		     strchr(got, 'e') != NULL ||
		     strtod(got, NULL) != strtod(want, NULL))) {
			print_error("%a: '%s', printf '%s'\n", v, got, want);
			fail();
		}
		count++;
	}
	assert_true(count > many() / 2);
}

/* Every parse must equal glibc's correctly rounded strtod, bit for bit,
 * on the fast path (<= 15 digits) and beyond it. */
static void
matches_strtod(void **state)
{
	char s[64];
	double v, ref;

	(void)state;
	for (long i = 0; i < many(); i++) {
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

/* A result rounded to its uncertainty as GUM 7.2.6 (JCGM 100:2008)
 * says: its own example, y = 10.05762 ohm with u = 27 mohm gives
 * 10.058 ohm, and u = 28.05 kHz is given as 28 kHz (nearest, "common
 * sense"); the rest are rounding edges worked by hand (two significant
 * digits of U, the carry into the next decade, U of tens). */
static void
gum_rounding(void **state)
{
	static const struct {
		double y, u;
		const char *val, *unc;
		int decimals;
	} c[] = {
		{10.05762, 0.027, "10.058", "0.027", 3},     /* GUM 7.2.6 */
		{1000.4, 28.05, "1000", "28", 0},	     /* GUM 7.2.6 */
		{4.9679271, 0.02252998289, "4.968", "0.023", 3}, /* issue 21 */
		{0.9189, 0.0996, "0.92", "0.10", 2},	     /* carry */
		{0.9189, 0.0994, "0.919", "0.099", 3},
		{100.07, 0.545, "100.07", "0.55", 2}, /* 0.545000000000000040 */
		{12345.6, 995, "12300", "1000", 0},	     /* carry, hundreds */
		{-0.0004, 0.021, "0.000", "0.021", 3},	     /* no -0.000 */
	};
	char val[64], unc[64];

	(void)state;
	for (size_t i = 0; i < sizeof c / sizeof c[0]; i++) {
		int d = al_round_to_u(c[i].y, c[i].u, val, sizeof val, unc,
				      sizeof unc);

		assert_int_equal(d, c[i].decimals);
		assert_string_equal(val, c[i].val);
		assert_string_equal(unc, c[i].unc);
	}
	assert_int_equal(al_round_to_u(1, 0, val, sizeof val, unc, sizeof unc),
			 -1);
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(accepted), cmocka_unit_test(refused),
	       cmocka_unit_test(decimal_comma),
	       cmocka_unit_test(matches_strtod), cmocka_unit_test(edge_cases),
	       cmocka_unit_test(formats_like_printf),
	       cmocka_unit_test(gum_rounding))
