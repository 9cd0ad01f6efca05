/* acidlot: replicate screens: Grubbs, Dixon, critical range, Cochran,
 * Horwitz.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_SCREENS_H
#define ACIDLOT_SCREENS_H

#include <stddef.h>

#include "acidlot/status.h"

/* Grubbs' single-outlier statistic G = max |x - mean| / s (ISO 5725-2
 * 7.3.4); *index gets the position of the most distant value. 0 when
 * n < 3 or s = 0. */
double al_grubbs_g(const double *x, size_t n, double mean, double sd,
		   size_t *index);
/* Its two-sided critical value at significance alpha (0.05: straggler,
 * 0.01: outlier): (n-1)/sqrt(n) sqrt(t^2 / (n-2+t^2)), t the upper
 * alpha/(2n) quantile of Student's t with n-2 degrees of freedom. */
double al_grubbs_critical(size_t n, double alpha);

/* Dixon's r10 ratio (gap / range) of the more extreme end, 3 <= n <= 10;
 * *index gets that value's position. 0 when the range is 0. */
double al_dixon_q(const double *x, size_t n, size_t *index);
/* Critical r10 from Rorabacher (1991), reference/dixon_r10.csv, at
 * level 0.90, 0.95 or 0.99; 0 outside 3 <= n <= 10 or another level. */
double al_dixon_critical(size_t n, double level);

/* Critical range factor f(n) of ISO 5725-6 (5.2.2): the 0.95 quantile of
 * the range of n standard normal values (the studentized range with
 * infinite degrees of freedom), computed by integration with GSL. 0 for
 * n < 2. ISO tabulates 2.8, 3.3, 3.6, 3.9, 4.0 for n = 2..6. */
double al_critical_range_factor(size_t n);

/* Cochran's C = s2max / sum s2 over l variances; *index gets the
 * largest. Critical value at alpha for l groups of n replicates,
 * 1 / (1 + (l-1)/F) with F the upper alpha/l quantile of F(n-1,
 * (l-1)(n-1)) (ISO 5725-2 7.2.3). */
double al_cochran_c(const double *variances, size_t l, size_t *index);
double al_cochran_critical(size_t l, size_t n, double alpha);
/* Upper p quantile of Fisher's F(d1, d2): GSL's inverse, or Paulson's
 * approximation where GSL's gives no finite value (large d1 and d2). */
double al_f_quantile_upper(double p, double d1, double d2);

/* Horwitz's predicted reproducibility RSD, % (AOAC): 2 C^-0.15 with C
 * the mass fraction (0.01 for 1 %). */
double al_horwitz_rsd(double mass_fraction);

#endif
