/* acidlot: atomic weights, formula masses, the acid catalogue and the
 * protons an endpoint titrates.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CHEM_H
#define ACIDLOT_CHEM_H

#include <stddef.h>

#include "acidlot/status.h"

#define AL_MAX_PKA 4

typedef struct al_element {
	char symbol[4];
	char *name;
	double atomic_weight; /* g/mol, conventional or abridged value */
	double u;             /* standard uncertainty, g/mol: the CIAAW interval
				 or stated uncertainty taken as a rectangular
				 distribution (half-width / sqrt 3, as QUAM
				 example A2 treats atomic weights) */
	char *source;
} al_element;

/* A primary standard for standardising a base (KHP...). */
typedef struct al_standard {
	char *name;
	char *aliases;
	char *formula;
	double molar_mass;   /* g/mol from the formula */
	double molar_mass_u; /* standard uncertainty from the atomic weights */
	int protons;
	double purity;       /* mass fraction, default of the catalogue */
	double purity_u;     /* its standard uncertainty */
	char *source;
} al_standard;

typedef struct al_acid {
	char *name;     /* catalogue key, e.g. "citric-monohydrate" */
	char *aliases;  /* '|'-separated other names, may be "" */
	char *formula;  /* e.g. "C6H8O7.H2O" */
	double molar_mass; /* g/mol, computed from formula and atomic weights */
	int protons;       /* titratable protons the factor assumes */
	double pka[AL_MAX_PKA];
	int n_pka;
	double g_per_meq;  /* molar_mass / protons / 1000 */
	char *notes;
	char *source;
} al_acid;

/* A base for neutralising (base demand of a lot). */
typedef struct al_base {
	char *name;
	char *aliases;
	char *formula;
	double molar_mass;  /* g/mol from the formula */
	int equivalents;    /* H+ taken per formula unit */
	char *source;
} al_base;

/* The reference tables built into the binary: atomic weights and acids.
 * Opaque; made by al_catalogue_new, released by al_catalogue_free. */
typedef struct al_catalogue al_catalogue;

/* Parses the built-in tables. On failure returns NULL and sets *status
 * (AL_ENOMEM, or AL_EINPUT when a table is inconsistent, with the detail
 * added to diags when diags is not NULL). */
al_catalogue *al_catalogue_new(al_status *status, al_diags *diags);
void al_catalogue_free(al_catalogue *cat);

/* The acids of the catalogue, *n of them. */
const al_acid *al_catalogue_acids(const al_catalogue *cat, size_t *n);
/* Finds an acid by key or alias, ignoring case, blanks, '_' vs '-' and a
 * trailing " acid". NULL when unknown. */
const al_acid *al_catalogue_find(const al_catalogue *cat, const char *name);
const al_element *al_catalogue_element(const al_catalogue *cat,
				       const char *symbol);
/* A base (NaOH, KOH, Na2CO3, Ca(OH)2) by name or alias; NULL if none. */
const al_base *al_catalogue_find_base(const al_catalogue *cat,
				      const char *name);
/* A primary standard by name or alias (matched like acids); NULL if none. */
const al_standard *al_catalogue_find_standard(const al_catalogue *cat,
					      const char *name);

/* Molar mass of a formula such as "C6H8O7", "C2H2O4.2H2O", "Ca(OH)2",
 * "KHC8H4O4" (hydrate dot may be '.', '*' or U+00B7). Returns AL_EINPUT
 * for a malformed formula and AL_ENOTFOUND for an element not in the
 * table, with a short reason in why (may be NULL). */
al_status al_formula_mass(const al_catalogue *cat, const char *formula,
			  double *molar_mass, const char **why);
/* The same, with the standard uncertainty of the molar mass: each
 * element's count x u combined in quadrature (QUAM example A2, which
 * treats the atomic weights as independent). u may be NULL. */
al_status al_formula_mass_u(const al_catalogue *cat, const char *formula,
			    double *molar_mass, double *u, const char **why);

/* Mean number of protons removed from the fully protonated acid at the
 * given pH: sum over i of i * alpha_i, the species fractions from the
 * pKa values (ideal solution, activity effects ignored). */
double al_protons_titrated(const double *pka, int n_pka, double ph);

/* The endpoint must titrate at least this share of the protons that the
 * factor assumes (the rule of thumb pKa + 2 gives 99 %; METHODS.md s.1). */
#define AL_ENDPOINT_SHARE 0.99

/* The lowest pH (0..14) at which at least `fraction` of `protons` are
 * titrated; returns AL_EDOMAIN when even pH 14 does not reach it. */
al_status al_endpoint_ph_needed(const double *pka, int n_pka, int protons,
				double fraction, double *ph);

#endif
