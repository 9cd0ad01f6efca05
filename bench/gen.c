/* acidlot bench: a deterministic generator of titration CSV.
 * usage: gen ROWS [GROUPS] [SEED] [--interleaved]
 * The same arguments give the same bytes. 3 replicates per sample by
 * default (GROUPS = ROWS / 3); --interleaved writes replicate round 1 of
 * every sample, then round 2, ... instead of each sample's rows together.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static uint64_t state;

static uint64_t
next(void)
{
	/* xorshift64* (Vigna): fixed, portable, fast */
	state ^= state >> 12;
	state ^= state << 25;
	state ^= state >> 27;
	return state * 2685821657736338717ULL;
}

/* a uniform draw in [lo, hi) with 3 or 4 decimals, written as text */
static int
put_decimal(char *buf, double lo, double hi, int decimals)
{
	double v = lo + (hi - lo) * (double)(next() >> 11) / 9007199254740992.0;

	return sprintf(buf, "%.*f", decimals, v);
}

int
main(int argc, char **argv)
{
	unsigned long long rows, groups, reps, seed = 20261202ULL;
	int interleaved = 0;
	static char out[1 << 16];
	size_t len = 0;

	if (argc < 2) {
		fputs("usage: gen ROWS [GROUPS] [SEED] [--interleaved]\n", stderr);
		return 2;
	}
	rows = strtoull(argv[1], NULL, 10);
	groups = argc > 2 && argv[2][0] != '-' ? strtoull(argv[2], NULL, 10)
					      : rows / 3;
	if (argc > 3 && argv[3][0] != '-')
		seed = strtoull(argv[3], NULL, 10);
	for (int i = 1; i < argc; i++)
		if (strcmp(argv[i], "--interleaved") == 0)
			interleaved = 1;
	if (groups == 0)
		groups = 1;
	reps = (rows + groups - 1) / groups;
	state = seed * 2654435761ULL + 1;
	fputs("product,lot,sample,replicate,mass_g,titrant_ml,titrant_mol_l\n",
	      stdout);
	for (unsigned long long r = 0; r < rows; r++) {
		unsigned long long g = interleaved ? r % groups : r / reps;
		unsigned long long rep = interleaved ? r / groups + 1 : r % reps + 1;

		/* products P1..P5, lots of 100 samples */
		len += (size_t)sprintf(out + len, "P%llu,L%llu,S%llu,%llu,",
				       g % 5 + 1, g / 100, g, rep);
		len += (size_t)put_decimal(out + len, 9.9, 10.1, 4);
		out[len++] = ',';
		len += (size_t)put_decimal(out + len, 13.5, 15.5, 2);
		out[len++] = ',';
		len += (size_t)put_decimal(out + len, 0.0995, 0.1005, 4);
		out[len++] = '\n';
		if (len > sizeof out - 256) {
			fwrite(out, 1, len, stdout);
			len = 0;
		}
	}
	fwrite(out, 1, len, stdout);
	return ferror(stdout) ? 1 : 0;
}
