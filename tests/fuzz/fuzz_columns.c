/* acidlot fuzz target: the --columns file (name,header pairs) and the
 * check that no column or header is mapped twice.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "fuzz.h"

#include <stdlib.h>
#include <string.h>

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	al_diags d = {0};
	al_column_alias *a = NULL;
	size_t n = 0, i, j;
	FILE *f;

	if ((f = fuzz_stream(data, size)) == NULL)
		return 0;
	if (al_column_aliases_read(f, "fuzz.csv", &a, &n, &d) == AL_OK) {
		for (size_t k = 0; k < n; k++)
			if (a[k].name == NULL || a[k].header == NULL)
				__builtin_trap();
		switch (al_column_aliases_check(a, n, n / 2, &i, &j)) {
		case AL_ALIAS_OK:
			break;
		case AL_ALIAS_NAME_TWICE:
			if (!(i < j && j < n) ||
			    strcmp(a[i].name, a[j].name) != 0)
				__builtin_trap();
			break;
		case AL_ALIAS_HEADER_TWICE:
			if (!(i < j && j < n) ||
			    strcmp(a[i].name, a[j].name) == 0)
				__builtin_trap();
			break;
		}
	}
	fclose(f);
	al_column_aliases_free(a, n);
	al_diags_clear(&d);
	return 0;
}
