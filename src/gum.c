/* acidlot: GUM propagation for a product/quotient model.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/gum.h"

#include <math.h>

double
al_gum_product(double y, al_gum_term *terms, size_t n)
{
	double var = 0;

	for (size_t i = 0; i < n; i++) {
		al_gum_term *t = &terms[i];

		if (t->value == 0) {
			t->sensitivity = t->contribution = 0;
			continue;
		}
		t->sensitivity = t->power * y / t->value;
		t->contribution = fabs(t->sensitivity) * t->u;
		var += t->contribution * t->contribution;
	}
	return sqrt(var);
}

double
al_gum_rectangular(double a)
{
	return a / sqrt(3.0);
}

double
al_gum_triangular(double a)
{
	return a / sqrt(6.0);
}
