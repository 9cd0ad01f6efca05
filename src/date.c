/* acidlot: calendar dates as day numbers.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * The conversion counts whole 400-year eras of 146097 days, then years
 * of the era starting in March so that the leap day falls last (the
 * usual civil-calendar arithmetic, e.g. in the C++ <chrono> proposals). */
#include "acidlot/date.h"

#include <string.h>


static long
days_from_civil(long y, unsigned m, unsigned d)
{
	long era;
	unsigned yoe, doy, doe;

	y -= m <= 2;
	era = (y >= 0 ? y : y - 399) / 400;
	yoe = (unsigned)(y - era * 400);
	doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
	doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
	return era * 146097 + (long)doe - 719468;
}

static void
civil_from_days(long z, long *y, unsigned *m, unsigned *d)
{
	long era;
	unsigned doe, yoe, doy, mp;

	z += 719468;
	era = (z >= 0 ? z : z - 146096) / 146097;
	doe = (unsigned)(z - era * 146097);
	yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
	doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
	mp = (5 * doy + 2) / 153;
	*d = doy - (153 * mp + 2) / 5 + 1;
	*m = mp < 10 ? mp + 3 : mp - 9;
	*y = (long)yoe + era * 400 + (*m <= 2);
}

static int
digits(const char *s, int n, unsigned *out)
{
	unsigned v = 0;

	for (int i = 0; i < n; i++) {
		if (s[i] < '0' || s[i] > '9')
			return -1;
		v = v * 10 + (unsigned)(s[i] - '0');
	}
	*out = v;
	return 0;
}

/* Days of a checked year, month and day; 0, or -1 when no such day. */
static int
civil_day(unsigned y, unsigned m, unsigned d, long *days)
{
	static const unsigned mdays[12] = {31, 28, 31, 30, 31, 30,
					   31, 31, 30, 31, 30, 31};
	unsigned max;

	if (y < 1900 || m < 1 || m > 12 || d < 1)
		return -1;
	max = mdays[m - 1];
	if (m == 2 && (y % 4 == 0 && (y % 100 != 0 || y % 400 == 0)))
		max = 29;
	if (d > max)
		return -1;
	*days = days_from_civil((long)y, m, d);
	return 0;
}

const char *const al_date_order_names[4] = {"YYYY-MM-DD", "DD.MM.YYYY",
					   "DD/MM/YYYY", "MM/DD/YYYY"};

int
al_date_parse_as(const char *s, size_t len, al_date_order o, long *days)
{
	/* where the year, month and day stand in the order's 10 bytes */
	static const unsigned at[4][3] = {{0, 5, 8}, {6, 3, 0}, {6, 3, 0},
					  {6, 0, 3}};
	const char *f = al_date_order_names[o];
	unsigned y, m, d;

	if (len != 10)
		return -1;
	for (size_t i = 0; i < 10; i++)
		if ((f[i] == '-' || f[i] == '.' || f[i] == '/') && s[i] != f[i])
			return -1;
	if (digits(s + at[o][0], 4, &y) || digits(s + at[o][1], 2, &m) ||
	    digits(s + at[o][2], 2, &d))
		return -1;
	return civil_day(y, m, d, days);
}

int
al_date_parse(const char *s, size_t len, long *days)
{
	return al_date_parse_as(s, len, AL_DATE_ISO, days);
}

long
al_date_add_days(long day, long n)
{
	long last = days_from_civil(9999, 12, 31);

	return day > last - n ? last : day + n;
}

void
al_date_format(long days, char buf[11])
{
	long y;
	unsigned m, d;

	civil_from_days(days, &y, &m, &d);
	if (y < 0 || y > 9999)
		y = 0;
	buf[0] = (char)('0' + y / 1000 % 10);
	buf[1] = (char)('0' + y / 100 % 10);
	buf[2] = (char)('0' + y / 10 % 10);
	buf[3] = (char)('0' + y % 10);
	buf[4] = '-';
	buf[5] = (char)('0' + m / 10 % 10);
	buf[6] = (char)('0' + m % 10);
	buf[7] = '-';
	buf[8] = (char)('0' + d / 10 % 10);
	buf[9] = (char)('0' + d % 10);
	buf[10] = '\0';
}
