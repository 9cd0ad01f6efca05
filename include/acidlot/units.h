/* acidlot: the units a titratable acidity is reported in.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_UNITS_H
#define ACIDLOT_UNITS_H

#include "acidlot/status.h"

typedef enum al_basis {
	AL_BASIS_MASS = 0,   /* per gram of sample */
	AL_BASIS_VOLUME = 1  /* per millilitre of sample */
} al_basis;

typedef enum al_unit {
	AL_UNIT_G_100G = 0,  /* g acid per 100 g sample, % w/w */
	AL_UNIT_G_KG,        /* g acid per kg sample */
	AL_UNIT_G_100ML,     /* g acid per 100 mL sample, % w/v */
	AL_UNIT_G_L,         /* g acid per litre sample */
	AL_UNIT_MEQ_100G,    /* mmol H+ per 100 g (ISO 750 style) */
	AL_UNIT_MEQ_L,       /* mmol H+ per litre (OIV, EN 12147 style) */
	AL_UNIT_COUNT
} al_unit;

/* Parses a unit name ("g/100g", "g/L", "meq/L", "%w/w"...; case and
 * blanks ignored). AL_ENOTFOUND when unknown. */
al_status al_unit_parse(const char *name, al_unit *unit);
/* Why al_unit_parse refused a name, as a phrase to follow it: "'%'"
 * alone and amount-of-acid units (mmol/L) are refused with the units
 * they could mean, never equated with meq. */
const char *al_unit_refusal(const char *name);
const char *al_unit_name(al_unit unit);
al_basis al_unit_basis(al_unit unit);
int al_unit_is_meq(al_unit unit);
/* Amount of sample the unit refers to, in g or mL (100 or 1000). */
double al_unit_per(al_unit unit);
/* The unit names, comma-separated, for messages. */
const char *al_unit_list(void);

/* Converts an amount of acid per gram or millilitre of sample into a unit.
 *   meq_per_sample   meq of titratable acid per g (mass basis) or per mL
 *   basis            what the sample was measured in
 *   g_per_meq        the acid's factor (ignored for meq units)
 *   density_g_ml     sample density, used only when basis and unit differ;
 *                    <= 0 means unknown
 * Returns AL_EDOMAIN when the conversion needs a density and none is known. */
al_status al_unit_express(double meq_per_sample, al_basis basis, al_unit unit,
			  double g_per_meq, double density_g_ml, double *out);

#endif
