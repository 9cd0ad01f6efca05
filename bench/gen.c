/* acidlot bench: a deterministic generator of titration CSV.
 * usage: gen ROWS [GROUPS] [SEED] [--interleaved]
 * The same arguments give the same bytes. 3 replicates per sample by
 * default (GROUPS = ROWS / 3, rounded up); --interleaved writes the same
 * rows, replicate round 1 of every sample, then round 2, ..., instead of
 * each sample's rows together.
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

/* splitmix64 finaliser (Steele, Lea, Flood 2014) over the row's key */
static uint64_t
mix(uint64_t seed, uint64_t g, uint64_t rep)
{
	uint64_t z = seed * 0x9E3779B97F4A7C15ULL + g * 0xBF58476D1CE4E5B9ULL +
		     rep * 0x94D049BB133111EBULL + 1;

	z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
	z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
	z ^= z >> 31;
	return z ? z : 1;
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
					      : (rows + 2) / 3;
	if (argc > 3 && argv[3][0] != '-')
		seed = strtoull(argv[3], NULL, 10);
	for (int i = 1; i < argc; i++)
		if (strcmp(argv[i], "--interleaved") == 0)
			interleaved = 1;
	if (groups == 0)
		groups = 1;
	reps = (rows + groups - 1) / groups;
	fputs("product,lot,sample,replicate,mass_g,titrant_ml,titrant_mol_l\n",
	      stdout);
	/* Row r of the adjacent layout is replicate r % reps + 1 of sample
	 * r / reps; the interleaved layout writes the same rows round by
	 * round (every sample's replicate 1, then 2, ...). */
	for (unsigned long long i = 0, r = 0; r < rows; i++) {
		unsigned long long g = interleaved ? i % groups : i / reps;
		unsigned long long rep = interleaved ? i / groups + 1 : i % reps + 1;

		if (g * reps + rep - 1 >= rows)
			continue; /* not in the adjacent layout's rows */
		r++;

		/* each row's values depend only on its sample and replicate,
		 * so adjacent and interleaved files hold the same rows */
		state = mix(seed, g, rep);
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
