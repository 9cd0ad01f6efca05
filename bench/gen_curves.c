/* acidlot bench: a deterministic generator of titration curves.
 * usage: gen_curves CURVES READINGS
 * Each curve is citric acid (pKa 3.13, 4.76, 6.40, CRC Handbook) in
 * 50 mL, titrated with 0.1 mol/L NaOH, its amount varied from curve to
 * curve; READINGS readings evenly spaced in pH from the start to pH 11.5,
 * each volume from the charge balance (METHODS.md s.8), so the volumes
 * rise and crowd where the curve is steep. The same arguments give the
 * same bytes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

static const double pka[3] = {3.13, 4.76, 6.40};

/* the volume (mL) at pH ph for mmol of acid in v0 mL, 0.1 mol/L base */
static double
volume(double mmol, double v0, double ph)
{
	double h = pow(10, -ph), x = h - 1e-14 / h, term = 1, sum = 1, nu = 0;

	for (int i = 0; i < 3; i++) {
		term *= pow(10, ph - pka[i]);
		sum += term;
		nu += (i + 1) * term;
	}
	return (mmol * nu / sum - x * v0) / (0.1 + x);
}

int
main(int argc, char **argv)
{
	long curves = argc > 1 ? atol(argv[1]) : 0;
	long readings = argc > 2 ? atol(argv[2]) : 0;

	if (curves < 1 || readings < 2) {
		fputs("usage: gen_curves CURVES READINGS\n", stderr);
		return 2;
	}
	puts("product,lot,sample,replicate,volume_ml,titrant_mol_l,curve,"
	     "titrant_ml,ph");
	for (long c = 0; c < curves; c++) {
		double mmol = 0.4 + 0.2 * (double)(c % 97) / 97, lo = 0, hi = 7;
		double v0 = 50;

		/* the starting pH: where the volume is 0 */
		for (int k = 0; k < 60; k++) {
			double mid = (lo + hi) / 2;

			if (volume(mmol, v0, mid) < 0)
				lo = mid;
			else
				hi = mid;
		}
		for (long r = 0; r < readings; r++) {
			double ph = hi + (11.5 - hi) * (double)r / (double)(readings - 1);
			double v = r == 0 ? 0 : volume(mmol, v0, ph);

			printf("BENCH,B%ld,S%ld,%ld,%.1f,0.1,C%ld,%.3f,%.3f\n",
			       c / 3, c / 3, c % 3 + 1, v0, c, v, ph);
		}
	}
	return 0;
}
