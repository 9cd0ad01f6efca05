/* acidlot: protons titrated at an endpoint pH, from the pKa values.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * For H_nA with dissociation constants pKa_1..pKa_n the fraction of the
 * species that has lost i protons is proportional to
 *   10^(sum_{j<=i} (pH - pKa_j))
 * (Henderson-Hasselbalch applied step by step; ideal solution). The mean
 * number of protons removed is sum_i i alpha_i. Terms are handled in log
 * space so that pH far from every pKa does not overflow. */
#include "acidlot/chem.h"

#include <math.h>

/* ln 10 */
#define LN10 2.302585092994045684017991454684364208

double
al_protons_titrated(const double *pka, int n_pka, double ph)
{
	double logterm[AL_MAX_PKA + 1];
	double top, sum = 0, mean = 0;

	logterm[0] = 0;
	for (int i = 1; i <= n_pka; i++)
		logterm[i] = logterm[i - 1] + (ph - pka[i - 1]) * LN10;
	top = logterm[0];
	for (int i = 1; i <= n_pka; i++)
		if (logterm[i] > top)
			top = logterm[i];
	for (int i = 0; i <= n_pka; i++) {
		double w = exp(logterm[i] - top);

		sum += w;
		mean += i * w;
	}
	return mean / sum;
}

al_status
al_endpoint_ph_needed(const double *pka, int n_pka, int protons,
		      double fraction, double *ph)
{
	double target = fraction * protons, lo = 0, hi = 14;

	if (al_protons_titrated(pka, n_pka, hi) < target)
		return AL_EDOMAIN;
	if (al_protons_titrated(pka, n_pka, lo) >= target) {
		*ph = lo;
		return AL_OK;
	}
	/* The mean is increasing in pH, so bisection converges; 60 halvings
	 * of 14 pH units leave an interval far below 1e-12. */
	for (int k = 0; k < 60; k++) {
		double mid = 0.5 * (lo + hi);

		if (al_protons_titrated(pka, n_pka, mid) >= target)
			hi = mid;
		else
			lo = mid;
	}
	*ph = hi;
	return AL_OK;
}
