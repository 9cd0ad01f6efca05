/* acidlot fuzz target: dates. A date that parses is a calendar date:
 * written again it is the same text, and the day after it parses to the
 * next day number unless it is 9999-12-31.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "acidlot/date.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	long day, next, again;
	char text[11], after[11];

	if (al_date_parse((const char *)data, size, &day) != 0)
		return 0;
	al_date_format(day, text);
	if (size != 10 || memcmp(text, data, 10) != 0)
		__builtin_trap();
	next = al_date_add_days(day, 1);
	al_date_format(next, after);
	if (al_date_parse(after, 10, &again) != 0 || again != next)
		__builtin_trap();
	if (next != day + 1 && strcmp(text, "9999-12-31") != 0)
		__builtin_trap();
	if (al_date_add_days(day, 1000000) < day)
		__builtin_trap();
	return 0;
}
