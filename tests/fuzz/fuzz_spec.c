/* acidlot fuzz target: the specification reader.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "fuzz.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	const al_spec *all;
	size_t n;
	al_status st;
	al_diags d = {0};
	al_spec_table *t;
	FILE *f;

	if ((f = fuzz_stream(data, size)) == NULL)
		return 0;
	t = al_spec_table_read(fuzz_catalogue(), NULL, f, "fuzz.csv", &st, &d);
	all = al_spec_all(t, &n);
	for (size_t i = 0; i < n; i++) {
		const al_spec *s = &all[i];

		if (al_spec_find(t, s->product) == NULL || (!s->has_min && !s->has_max))
			__builtin_trap();
	}
	fclose(f);
	al_spec_table_free(t);
	al_diags_clear(&d);
	return 0;
}
