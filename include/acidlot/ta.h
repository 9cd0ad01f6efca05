/* acidlot: titratable acidity of one titration.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TA_H
#define ACIDLOT_TA_H

#include <stddef.h>

#include "acidlot/units.h"

/* One titration of one sample portion. */
/* Plausibility limits: beyond them a value is possible but unusual, and
 * draws a warning (common practice for bench titrations with a 50 mL
 * burette and 0.1 M or 1 M NaOH). */
#define AL_PLAUSIBLE_TITRANT_ML 100.0
#define AL_PLAUSIBLE_SAMPLE 1000.0 /* g or mL */
#define AL_PLAUSIBLE_CONC_MIN 0.001
#define AL_PLAUSIBLE_CONC_MAX 2.0
#define AL_PLAUSIBLE_BLANK_ML 5.0

typedef struct al_titration {
	double titrant_ml;    /* titrant delivered to the endpoint, mL */
	double blank_ml;      /* blank titration, mL */
	double titrant_mol_l; /* titrant concentration, mol/L */
	double made_up_ml;    /* sample made up to this volume, mL; 0 = not */
	double aliquot_ml;    /* volume of it titrated, mL; 0 = all */
	al_basis basis;       /* sample taken by mass or by volume */
	double amount;        /* g (mass basis) or mL (volume basis) */
} al_titration;

/* The input a problem is about, so that a caller can name its column. */
typedef enum al_ta_field {
	AL_TF_TITRANT,
	AL_TF_BLANK,
	AL_TF_CONC,
	AL_TF_MADE_UP,
	AL_TF_ALIQUOT,
	AL_TF_AMOUNT
} al_ta_field;

typedef struct al_ta_problem {
	al_ta_field field;
	char message[96];
} al_ta_problem;

/* Checks a titration for impossible values: amount <= 0, titrant < 0,
 * blank < 0, titrant not above the blank, concentration <= 0, a made-up
 * volume or aliquot <= 0, an aliquot larger than the made-up volume.
 * Writes up to max problems and returns how many there are in all. */
size_t al_ta_check(const al_titration *t, al_ta_problem *problems, size_t max);

/* Dilution factor made_up / aliquot (1 when the whole sample is titrated). */
double al_ta_dilution(const al_titration *t);

/* Milliequivalents of acid in the sample portion:
 * (titrant_ml - blank_ml) x titrant_mol_l x DF (METHODS.md s.1). */
double al_ta_meq(const al_titration *t);

/* Titratable acidity in `unit` expressed as an acid of factor g_per_meq:
 *   TA = (V - V_blank) x c x E x DF x per / amount
 * with a density (g/mL, <= 0 for none) when the unit's basis differs from
 * the sample's. AL_EDOMAIN when that density is missing. */
al_status al_ta_value(const al_titration *t, double g_per_meq, al_unit unit,
		      double density_g_ml, double *value);

#endif
