/* acidlot fuzz target: the standardisation input. Every lot computed
 * has a finite concentration in the range the arithmetic allows, and a
 * finite uncertainty.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "fuzz.h"

#include <math.h>

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	al_status st;
	al_std_params p;
	al_std_run *run;
	FILE *f;

	if ((f = fuzz_stream(data, size)) == NULL)
		return 0;
	al_std_params_default(&p);
	run = al_std_new(fuzz_catalogue(), &p, 20789 /* 2026-12-02 */, &st);
	if (run == NULL)
		__builtin_trap();
	st = al_std_read(run, f, "fuzz.csv", NULL);
	fclose(f);
	if (st == AL_OK && al_std_finish(run) == AL_OK)
		for (size_t i = 0; i < al_std_lot_count(run); i++) {
			const al_std_lot *l = al_std_lot_at(run, i);

			if (!al_number_computable(l->mean) || l->mean <= 0 ||
			    !isfinite(l->budget.u) || !isfinite(l->U))
				__builtin_trap();
		}
	al_std_free(run);
	return 0;
}
