/* acidlot tests: shared helpers for the cmocka unit tests.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * cmocka 1.1.5's assert_float_equal casts to float, so doubles are
 * compared here with a relative (or absolute) tolerance of our own. */
#ifndef ACIDLOT_TESTUTIL_H
#define ACIDLOT_TESTUTIL_H

#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>

#include <cmocka.h>

#define assert_rel(actual, expected, tol)                                     \
	assert_rel_impl((actual), (expected), (tol), #actual, __FILE__,        \
			__LINE__)
#define assert_abs(actual, expected, tol)                                     \
	assert_abs_impl((actual), (expected), (tol), #actual, __FILE__,        \
			__LINE__)

static inline void
assert_rel_impl(double a, double e, double tol, const char *what,
		const char *file, int line)
{
	double scale = fabs(e) > 0 ? fabs(e) : 1.0;

	if (!(fabs(a - e) <= tol * scale)) {
		print_error("%s = %.17g, expected %.17g (relative tolerance "
			    "%g)\n",
			    what, a, e, tol);
		_fail(file, line);
	}
}

static inline void
assert_abs_impl(double a, double e, double tol, const char *what,
		const char *file, int line)
{
	if (!(fabs(a - e) <= tol)) {
		print_error("%s = %.17g, expected %.17g (absolute tolerance "
			    "%g)\n",
			    what, a, e, tol);
		_fail(file, line);
	}
}

/* Reads numbers, one a line, '#' lines skipped, from tests/data/NAME.
 * Returns a malloc'd array and its length in *n. */
static inline double *
load_data(const char *name, size_t *n)
{
	char path[1024], line[256];
	FILE *f;
	double *v = NULL;
	size_t cap = 0;

	snprintf(path, sizeof path, "%s/%s", ACIDLOT_TEST_DATA, name);
	f = fopen(path, "r");
	assert_non_null(f);
	*n = 0;
	while (fgets(line, sizeof line, f)) {
		if (line[0] == '#' || line[0] == '\n')
			continue;
		if (*n == cap) {
			cap = cap ? 2 * cap : 64;
			v = realloc(v, cap * sizeof *v);
			assert_non_null(v);
		}
		v[(*n)++] = strtod(line, NULL);
	}
	fclose(f);
	return v;
}

#ifdef ACIDLOT_TEST_CATALOGUE
/* A group fixture: the built-in catalogue in `cat`. */
#include "acidlot/chem.h"

static al_catalogue *cat;

static int
setup(void **state)
{
	al_status st;

	(void)state;
	cat = al_catalogue_new(&st, NULL);
	return cat == NULL;
}

static int
teardown(void **state)
{
	(void)state;
	al_catalogue_free(cat);
	return 0;
}
#endif

/* A test program's main: its cmocka tests, run as one group (setup and
 * teardown may be NULL). */
#define UNIT_TEST_MAIN(setup, teardown, ...)                                  \
	int main(void)                                                         \
	{                                                                      \
		const struct CMUnitTest tests[] = {__VA_ARGS__};               \
		return cmocka_run_group_tests(tests, setup, teardown);         \
	}

#endif
