/* acidlot fuzz target: the titrant register reader. Every lot read is
 * found by its name, and the register written and read again holds the
 * same lots.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "fuzz.h"

#include <stdlib.h>
#include <string.h>

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	const al_titrant *lots;
	size_t n, n_again;
	al_status st;
	al_diags d = {0};
	al_register *reg;
	FILE *f;

	if ((f = fuzz_stream(data, size)) == NULL)
		return 0;
	reg = al_register_read(f, "fuzz.csv", &st, &d);
	fclose(f);
	al_diags_clear(&d);
	if (reg == NULL)
		return 0;
	lots = al_register_all(reg, &n);
	for (size_t i = 0; i < n; i++)
		if (al_register_find(reg, lots[i].lot) != &lots[i])
			__builtin_trap();
	if (st == AL_OK) {
		char *text = NULL;
		size_t len = 0;
		FILE *out = open_memstream(&text, &len);
		al_register *again;

		if (out == NULL)
			__builtin_trap();
		if (al_register_write(out, reg) != AL_OK)
			__builtin_trap();
		fclose(out);
		f = fmemopen(text, len, "r");
		again = al_register_read(f, "again.csv", &st, &d);
		fclose(f);
		if (again == NULL || st != AL_OK ||
		    (al_register_all(again, &n_again), n_again != n))
			__builtin_trap();
		al_register_free(again);
		al_diags_clear(&d);
		free(text);
	}
	al_register_free(reg);
	return 0;
}
