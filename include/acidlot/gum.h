/* acidlot: uncertainty of a product/quotient model (GUM).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_GUM_H
#define ACIDLOT_GUM_H

#include <stddef.h>

/* One input of y = k x1^p1 x2^p2 ... with p = +1 or -1. */
typedef struct al_gum_term {
	const char *name;
	const char *unit;
	double value;
	double u;            /* standard uncertainty, in unit */
	int power;           /* +1 multiplies, -1 divides */
	double sensitivity;  /* out: dy/dx = p y / x */
	double contribution; /* out: |dy/dx| u */
} al_gum_term;

/* For the model value y, fills each term's sensitivity and contribution
 * and returns the combined standard uncertainty u(y): relative
 * uncertainties add in quadrature (GUM 5.1.6, first order, uncorrelated
 * inputs). Terms with value 0 count as absent. */
double al_gum_product(double y, al_gum_term *terms, size_t n);

/* Standard uncertainties from a tolerance +/-a (GUM 4.3.7, 4.3.9):
 * rectangular a/sqrt 3, triangular a/sqrt 6. */
double al_gum_rectangular(double a);
double al_gum_triangular(double a);

#endif
