/* acidlot fuzz target: the number parser, checked against glibc strtod
 * (differential: every accepted number must equal the correctly rounded
 * conversion bit for bit).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _GNU_SOURCE
#include <locale.h>
#include <stddef.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/number.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static locale_t c_loc;

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	char buf[600];
	double v, ref;
	char point;

	if (size < 1 || size > 500)
		return 0;
	point = data[0] & 1 ? ',' : '.';
	if (al_number_parse((const char *)data + 1, size - 1, point, &v) !=
	    AL_NUM_OK)
		return 0;
	memcpy(buf, data + 1, size - 1);
	buf[size - 1] = '\0';
	for (size_t i = 0; i < size - 1; i++)
		if (buf[i] == ',')
			buf[i] = '.';
	if (c_loc == (locale_t)0)
		c_loc = newlocale(LC_ALL_MASK, "C", (locale_t)0);
	ref = strtod_l(buf, NULL, c_loc);
	if (memcmp(&v, &ref, sizeof v) != 0 && !(v == 0 && ref == 0))
		__builtin_trap();
	return 0;
}
