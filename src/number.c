/* acidlot: strict decimal parsing with an exact fast path.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Fast path (Clinger, "How to read floating point numbers accurately",
 * PLDI 1990): when the decimal significand has at most 15 digits it is an
 * exact double (below 2^53), and 10^k for k <= 22 is exact too, so one
 * IEEE multiplication or division gives the correctly rounded result.
 * Everything else goes to strtod_l in the C locale, which glibc rounds
 * correctly. */
#define _GNU_SOURCE
#include "acidlot/number.h"

#include <errno.h>
#include <locale.h>
#include <math.h>
#include <pthread.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static const double exact_pow10[23] = {
	1e0,  1e1,  1e2,  1e3,	1e4,  1e5,  1e6,  1e7,	1e8,  1e9,  1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
};

static int
is_blank(char c)
{
	return c == ' ' || c == '\t';
}

static locale_t loc;

static void
make_c_locale(void)
{
	loc = newlocale(LC_ALL_MASK, "C", (locale_t)0);
}

/* made once, whichever thread asks first (a large file's numbers are
 * parsed in a thread of its own) */
static locale_t
c_locale(void)
{
	static pthread_once_t once = PTHREAD_ONCE_INIT;

	pthread_once(&once, make_c_locale);
	return loc;
}

/* Scans a number with the given decimal point. On success fills the
 * significand (first 19 digits), the count of significant digits and the
 * decimal exponent. Returns the number of bytes consumed, 0 if none. */
struct scan {
	uint64_t mant;
	int digits;  /* significant digits (leading zeros skipped) */
	long exp10;  /* value = mant * 10^exp10 when digits <= 19 */
	int negative;
	int dropped; /* digits beyond 19 were seen */
};

static size_t
scan_number(const char *s, size_t len, char point, struct scan *sc)
{
	size_t i = 0;
	int any_digit = 0;
	long frac_digits = 0;

	memset(sc, 0, sizeof *sc);
	if (i < len && (s[i] == '+' || s[i] == '-')) {
		sc->negative = s[i] == '-';
		i++;
	}
	for (; i < len && s[i] >= '0' && s[i] <= '9'; i++) {
		any_digit = 1;
		if (sc->digits == 0 && s[i] == '0')
			continue;
		if (sc->digits < 19)
			sc->mant = sc->mant * 10 + (uint64_t)(s[i] - '0');
		else {
			sc->exp10++; /* a dropped integer digit */
			if (s[i] != '0')
				sc->dropped = 1;
		}
		sc->digits++;
	}
	if (i < len && s[i] == point) {
		i++;
		for (; i < len && s[i] >= '0' && s[i] <= '9'; i++) {
			any_digit = 1;
			frac_digits++;
			if (sc->digits == 0 && s[i] == '0') {
				sc->exp10--;
				continue;
			}
			if (sc->digits < 19) {
				sc->mant = sc->mant * 10 + (uint64_t)(s[i] - '0');
				sc->exp10--;
			} else if (s[i] != '0')
				sc->dropped = 1;
			sc->digits++;
		}
	}
	if (!any_digit)
		return 0;
	if (i < len && (s[i] == 'e' || s[i] == 'E')) {
		size_t j = i + 1;
		int eneg = 0;
		long e = 0;

		if (j < len && (s[j] == '+' || s[j] == '-')) {
			eneg = s[j] == '-';
			j++;
		}
		if (j < len && s[j] >= '0' && s[j] <= '9') {
			for (; j < len && s[j] >= '0' && s[j] <= '9'; j++)
				if (e < 100000)
					e = e * 10 + (s[j] - '0');
			sc->exp10 += eneg ? -e : e;
			i = j;
		} else
			return 0; /* "1e" or "1e+" is not a number */
	}
	(void)frac_digits;
	return i;
}

static al_numerr
parse_with(const char *s, size_t len, char point, double *out)
{
	struct scan sc;
	size_t used = scan_number(s, len, point, &sc);
	char buf[512];
	char *end;
	double v;

	if (used == 0 || used != len)
		return AL_NUM_SYNTAX;
	if (sc.digits == 0) {
		*out = sc.negative ? -0.0 : 0.0;
		return AL_NUM_OK;
	}
	if (sc.digits <= 15 && sc.exp10 >= -22 && sc.exp10 <= 22) {
		v = (double)sc.mant;
		v = sc.exp10 < 0 ? v / exact_pow10[-sc.exp10]
				 : v * exact_pow10[sc.exp10];
		*out = sc.negative ? -v : v;
		return AL_NUM_OK;
	}
	/* General path: let glibc round the exact decimal. */
	if (len >= sizeof buf)
		return AL_NUM_SYNTAX;
	memcpy(buf, s, len);
	buf[len] = '\0';
	if (point != '.') {
		char *p = memchr(buf, point, len);
		if (p)
			*p = '.';
	}
	errno = 0;
	v = strtod_l(buf, &end, c_locale());
	if (end != buf + len)
		return AL_NUM_SYNTAX;
	if (errno == ERANGE || !isfinite(v) ||
	    (v != 0 && fabs(v) < 2.2250738585072014e-308))
		return AL_NUM_RANGE;
	if (v == 0 && sc.digits > 0)
		return AL_NUM_RANGE; /* a non-zero decimal underflowed to 0 */
	*out = v;
	return AL_NUM_OK;
}

/* The usual cell in one pass: an optional sign, at most 15 digits in
 * all and an optional decimal point, nothing else. The significand is
 * then below 10^15 < 2^53 and the power of ten at most 10^15, so this is
 * the fast path of parse_with, giving the same double (the same
 * significand and exponent: leading zeros add nothing to either).
 * Returns 1 with *out set, or 0 to leave the cell to parse_with. The
 * integer digits and the fraction's are read by two tight loops, with
 * no test of the point inside either (a cell is one of 7 on every row
 * of a large file). */
static int
parse_plain(const char *s, size_t len, char point, double *out)
{
	const unsigned char *p = (const unsigned char *)s, *end = p + len;
	const unsigned char *start;
	int negative = 0;
	uint64_t mant = 0; /* at most 16 digits: below 2^64 */
	size_t digits, frac = 0;
	unsigned d;
	double v;

	if (*p == '-' || *p == '+') {
		negative = *p == '-';
		p++;
	}
	if ((size_t)(end - p) > 16)
		return 0;
	start = p;
	while (p < end && (d = (unsigned)*p - '0') <= 9) {
		mant = mant * 10 + d;
		p++;
	}
	digits = (size_t)(p - start);
	if (p < end) {
		const unsigned char *f;

		if (*p != (unsigned char)point)
			return 0;
		f = ++p;
		while (p < end && (d = (unsigned)*p - '0') <= 9) {
			mant = mant * 10 + d;
			p++;
		}
		if (p != end)
			return 0;
		frac = (size_t)(p - f);
		digits += frac;
	}
	if (digits == 0 || digits > 15)
		return 0;
	v = (double)mant / exact_pow10[frac];
	*out = negative ? -v : v;
	return 1;
}

/* Everything past the one-pass cell, on a trimmed, non-empty cell. */
static al_numerr
parse_rest(const char *s, size_t len, char decimal_point, double *out)
{
	al_numerr err;
	unsigned char c = (unsigned char)s[0];

	/* a letter first (a text cell) can be no number with either point */
	if (((c | 0x20) >= 'a' && (c | 0x20) <= 'z') && c != decimal_point)
		return AL_NUM_SYNTAX;
	err = parse_with(s, len, decimal_point, out);
	if (err == AL_NUM_SYNTAX && decimal_point == '.' &&
	    memchr(s, ',', len) != NULL) {
		double ignored;

		if (parse_with(s, len, ',', &ignored) == AL_NUM_OK)
			return AL_NUM_COMMA;
	}
	return err;
}

al_numerr
al_number_parse(const char *s, size_t len, char decimal_point, double *out)
{
	/* a cell with no blank at either end (the CSV reader trims them)
	 * needs no trimming */
	if (len == 0 || is_blank(s[0]) || is_blank(s[len - 1])) {
		while (len > 0 && is_blank(*s)) {
			s++;
			len--;
		}
		while (len > 0 && is_blank(s[len - 1]))
			len--;
		if (len == 0)
			return AL_NUM_EMPTY;
	}
	if (parse_plain(s, len, decimal_point, out))
		return AL_NUM_OK;
	return parse_rest(s, len, decimal_point, out);
}

int
al_number_computable(double x)
{
	double a = fabs(x);

	return x == 0 || (a >= AL_MAGNITUDE_MIN && a <= AL_MAGNITUDE_MAX);
}

const char *
al_numerr_phrase(al_numerr err)
{
	switch (err) {
	case AL_NUM_OK:
		return "is a number";
	case AL_NUM_EMPTY:
		return "is empty";
	case AL_NUM_SYNTAX:
		return "is not a number";
	case AL_NUM_COMMA:
		return "is not a number (decimal comma? try --decimal-comma)";
	case AL_NUM_RANGE:
		return "is out of range";
	}
	return "is not a number";
}

int
al_u_place(double U, double *step, double *U2)
{
	char two[32];
	int e;

	*step = 0;
	*U2 = U;
	if (!(U > 0) || !isfinite(U))
		return -1;
	/* U to two significant digits, correctly rounded from its binary
	 * value by printf; its decade e from the exponent printf chose
	 * (after any carry, 0.0996 -> 1.0e-01) */
	snprintf(two, sizeof two, "%.1e", U);
	e = atoi(strchr(two, 'e') + 1);
	if (e < 1)
		return 1 - e;
	*step = pow(10, e - 1);
	*U2 = strtod(two, NULL);
	return 0;
}

double
al_round_to_step(double v, double step)
{
	return step > 0 ? round(v / step) * step : v;
}

int
al_round_to_u(double y, double U, char *val, size_t vcap, char *unc,
	      size_t ucap)
{
	double step, U2;
	int decimals;

	if (!isfinite(y) || (decimals = al_u_place(U, &step, &U2)) < 0)
		return -1;
	if (decimals > 0) {
		snprintf(val, vcap, "%.*f", decimals, y);
		snprintf(unc, ucap, "%.*f", decimals, U);
	} else {
		/* tens or more: y to the place of U's second digit */
		snprintf(val, vcap, "%.0f", al_round_to_step(y, step));
		snprintf(unc, ucap, "%.0f", U2);
	}
	/* no "-0.000" for a value that rounds to zero */
	if (val[0] == '-' && strspn(val + 1, "0.") == strlen(val + 1))
		memmove(val, val + 1, strlen(val));
	return decimals;
}

void
al_format_sig(double v, int sig, char *buf, size_t cap)
{
	double a = fabs(v);
	char t[64];
	int e;

	snprintf(t, sizeof t, "%.*e", sig - 1, v);
	e = atoi(strchr(t, 'e') + 1);
	if (e >= sig && a < 1e15 && cap > 20) {
		/* where %g would write e+NN: the same rounded number whole */
		snprintf(buf, cap, "%.0f", strtod(t, NULL));
		return;
	}
	/* plain decimals need 2 + sig - 1 - e bytes and a sign and a NUL */
	if (!(a >= 1e-100) || e >= -4 || !isfinite(v) ||
	    (size_t)(sig - e + 3) > cap) {
		snprintf(buf, cap, "%.*g", sig, v);
		return;
	}
	/* the digits %e rounded to, placed: sig - 1 - e decimals */
	snprintf(buf, cap, "%.*f", sig - 1 - e, v);
	if (strchr(buf, '.')) {
		size_t n = strlen(buf);

		while (n > 0 && buf[n - 1] == '0')
			buf[--n] = '\0';
		if (n > 0 && buf[n - 1] == '.')
			buf[n - 1] = '\0';
	}
}
