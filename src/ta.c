/* acidlot: the titratable-acidity formula.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * TA = (V_t - V_blank) [mL] x c [mol/L] x E [g/meq] x DF x 100 / m [g]
 * gives g/100 g (AOAC 942.15; IFU method No. 3). mL x mol/L = mmol = meq
 * of a monoprotic base. */
#include "acidlot/ta.h"

#include <stdio.h>

static size_t
add(al_ta_problem *p, size_t n, size_t max, al_ta_field field,
    const char *msg)
{
	if (n < max) {
		p[n].field = field;
		snprintf(p[n].message, sizeof p[n].message, "%s", msg);
	}
	return n + 1;
}

size_t
al_ta_check(const al_titration *t, al_ta_problem *p, size_t max)
{
	size_t n = 0;
	int dilution = t->made_up_ml != 0 || t->aliquot_ml != 0;

	if (!(t->amount > 0))
		n = add(p, n, max, AL_TF_AMOUNT,
			t->basis == AL_BASIS_MASS
				? "sample mass must be above 0"
				: "sample volume must be above 0");
	if (t->titrant_ml < 0)
		n = add(p, n, max, AL_TF_TITRANT,
			"titrant volume must not be negative");
	if (t->blank_ml < 0)
		n = add(p, n, max, AL_TF_BLANK,
			"blank volume must not be negative");
	if (t->titrant_ml >= 0 && t->blank_ml >= 0 &&
	    !(t->titrant_ml > t->blank_ml))
		n = add(p, n, max, AL_TF_TITRANT,
			"titrant volume is not above the blank");
	if (!(t->titrant_mol_l > 0))
		n = add(p, n, max, AL_TF_CONC,
			"titrant concentration must be above 0");
	if (dilution) {
		if (!(t->made_up_ml > 0))
			n = add(p, n, max, AL_TF_MADE_UP,
				"made-up volume must be above 0");
		if (!(t->aliquot_ml > 0))
			n = add(p, n, max, AL_TF_ALIQUOT,
				"aliquot volume must be above 0");
		if (t->made_up_ml > 0 && t->aliquot_ml > t->made_up_ml)
			n = add(p, n, max, AL_TF_ALIQUOT,
				"aliquot is larger than the made-up volume");
	}
	return n;
}

double
al_ta_dilution(const al_titration *t)
{
	if (t->made_up_ml == 0 && t->aliquot_ml == 0)
		return 1.0;
	return t->made_up_ml / t->aliquot_ml;
}

double
al_ta_meq(const al_titration *t)
{
	return (t->titrant_ml - t->blank_ml) * t->titrant_mol_l *
	       al_ta_dilution(t);
}

al_status
al_ta_value(const al_titration *t, double g_per_meq, al_unit unit,
	    double density_g_ml, double *value)
{
	return al_unit_express(al_ta_meq(t) / t->amount, t->basis, unit,
			       g_per_meq, density_g_ml, value);
}
