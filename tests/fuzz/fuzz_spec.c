/* acidlot fuzz target: the specification reader.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>

#include "acidlot/spec.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static al_catalogue *cat;

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	al_status st;
	al_diags d = {0};
	al_spec_table *t;
	FILE *f;

	if (cat == NULL && (cat = al_catalogue_new(&st, NULL)) == NULL)
		__builtin_trap();
	if (size == 0)
		return 0;
	f = fmemopen((void *)data, size, "r");
	if (f == NULL)
		return 0;
	t = al_spec_table_read(cat, NULL, f, "fuzz.csv", &st, &d);
	for (size_t i = 0; i < al_spec_count(t); i++) {
		const al_spec *s = al_spec_at(t, i);

		if (al_spec_find(t, s->product) == NULL || (!s->has_min && !s->has_max))
			__builtin_trap();
	}
	fclose(f);
	al_spec_table_free(t);
	al_diags_clear(&d);
	return 0;
}
