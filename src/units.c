/* acidlot: reporting units for titratable acidity.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/units.h"

#include <ctype.h>
#include <string.h>

struct unit_info {
	const char *name;
	al_basis basis;
	int meq;
	double per;	     /* g or mL of sample */
	const char *aliases; /* other names, lower case, blank-separated */
};

/* ISO 750 writes meq as mmol of H+. */
static const struct unit_info units[AL_UNIT_COUNT] = {
	[AL_UNIT_G_100G] = {"g/100g", AL_BASIS_MASS, 0, 100, "%w/w %m/m"},
	[AL_UNIT_G_KG] = {"g/kg", AL_BASIS_MASS, 0, 1000, "mg/g g/1000g"},
	[AL_UNIT_G_100ML] = {"g/100mL", AL_BASIS_VOLUME, 0, 100, "%w/v %m/v"},
	[AL_UNIT_G_L] = {"g/L", AL_BASIS_VOLUME, 0, 1000, "g/1000ml mg/ml"},
	[AL_UNIT_MEQ_100G] = {"meq/100g", AL_BASIS_MASS, 1, 100,
			      "mmolh+/100g"},
	[AL_UNIT_MEQ_L] = {"meq/L", AL_BASIS_VOLUME, 1, 1000, "mmolh+/l"},
};

/* Whether key is one of a blank-separated list of words. */
static int
in_list(const char *key, const char *list)
{
	size_t len = strlen(key);

	for (const char *w = list; *w; w += strcspn(w, " ")) {
		w += strspn(w, " ");
		if (strncmp(w, key, len) == 0 && (w[len] == ' ' || !w[len]))
			return 1;
	}
	return 0;
}

/* Lower case without blanks. */
static void
squeeze(const char *s, char *out, size_t cap)
{
	size_t n = 0;

	for (; *s && n + 1 < cap; s++)
		if (*s != ' ' && *s != '\t')
			out[n++] = (char)tolower((unsigned char)*s);
	out[n] = '\0';
}

al_status
al_unit_parse(const char *name, al_unit *unit)
{
	char key[32], cand[32];

	if (strlen(name) >= sizeof key)
		return AL_ENOTFOUND;
	squeeze(name, key, sizeof key);
	for (int u = 0; u < AL_UNIT_COUNT; u++) {
		squeeze(units[u].name, cand, sizeof cand);
		if (strcmp(key, cand) == 0 || in_list(key, units[u].aliases)) {
			*unit = (al_unit)u;
			return AL_OK;
		}
	}
	return AL_ENOTFOUND;
}

const char *
al_unit_refusal(const char *name)
{
	char key[32];

	if (strlen(name) >= sizeof key)
		return "is not a unit";
	squeeze(name, key, sizeof key);
	if (strcmp(key, "%") == 0)
		return "could mean g/100g (% w/w) or g/100mL (% w/v): name "
		       "the one meant";
	if (strncmp(key, "mmol/", 5) == 0 || strncmp(key, "mol/", 4) == 0)
		return "is an amount of the acid, not of its protons (for "
		       "citric acid 1 mmol is 3 meq): use meq/100g or meq/L "
		       "(mmol H+), or a mass unit";
	return "is not a unit";
}

const char *
al_unit_name(al_unit unit)
{
	return (unsigned)unit < AL_UNIT_COUNT ? units[unit].name : "?";
}

al_basis
al_unit_basis(al_unit unit)
{
	return units[unit].basis;
}

int
al_unit_is_meq(al_unit unit)
{
	return units[unit].meq;
}

double
al_unit_per(al_unit unit)
{
	return units[unit].per;
}

const char *
al_unit_list(void)
{
	return "g/100g, g/kg, g/100mL, g/L, meq/100g, meq/L";
}

al_status
al_unit_express(double meq_per_sample, al_basis basis, al_unit unit,
		double g_per_meq, double density_g_ml, double *out)
{
	const struct unit_info *u = &units[unit];
	/* TA = meq x E x per / amount (METHODS.md s.1: x100 for g/100 g) */
	double v = u->meq ? meq_per_sample * u->per
			  : meq_per_sample * g_per_meq * u->per;

	if (basis != u->basis) {
		if (!(density_g_ml > 0))
			return AL_EDOMAIN;
		/* per g -> per mL multiplies by g/mL; per mL -> per g divides */
		v = basis == AL_BASIS_MASS ? v * density_g_ml : v / density_g_ml;
	}
	*out = v;
	return AL_OK;
}
