/* acidlot: standardising a base against a primary standard, with its
 * measurement uncertainty (Eurachem/CITAC QUAM, 3rd ed. 2012, example A2).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_STANDARDIZE_H
#define ACIDLOT_STANDARDIZE_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/chem.h"
#include "acidlot/csvread.h"
#include "acidlot/status.h"
#include "acidlot/table.h"

/* The uncertainty model's parameters; al_std_params_default fills them. */
typedef struct al_std_params {
	double balance_linearity_g; /* +/- per weighing, rectangular, counted
				       twice (tare and gross); 0.00015 g */
	double burette_tol_ml;      /* +/- calibration tolerance of the
				       burette, triangular; 0.03 mL */
	double temp_range_c;        /* +/- lab temperature about the burette's
				       calibration temperature, a 95 %
				       interval (normal, / 1.96, as QUAM A2);
				       3 */
	double expansion_per_k;     /* volume expansion of water, 2.1e-4 /K */
	double k;                   /* coverage factor, 2 */
	double max_rsd_pct;         /* replicate acceptance, 0.2 % */
	size_t min_n;               /* replicate acceptance, 3 */
	double repeatability_rsd_pct; /* the method's repeatability, RSD %
				       of one titration: the repeatability
				       term is it / sqrt(n) instead of the
				       lot's s / sqrt(n) (QUAM A2); 0: the
				       lot's own */
	long valid_days;            /* register validity, 30 days */
} al_std_params;

void al_std_params_default(al_std_params *p);

/* c = 1000 m P / (M V): mol/L from g, mass fraction, g/mol and mL. */
double al_std_concentration(double mass_g, double purity, double molar_mass,
			    double volume_ml);

/* One input quantity of the model with its standard uncertainty. */
typedef struct al_budget_item {
	const char *name;    /* "mass of standard", ... */
	const char *unit;
	double value;
	double u;            /* standard uncertainty, in unit */
	double sensitivity;  /* dc/dx, mol/L per unit */
	double contribution; /* |dc/dx| u, mol/L */
} al_budget_item;

#define AL_BUDGET_MAX 8

typedef struct al_budget {
	double c;      /* mol/L */
	double u;      /* combined standard uncertainty, mol/L */
	double rel_u;  /* u / c */
	al_budget_item items[AL_BUDGET_MAX];
	size_t n_items;
} al_budget;

/* The QUAM A2 model with its inputs given directly: values and standard
 * uncertainties of mass, purity, molar mass and volume, and a relative
 * repeatability. Product/quotient model: relative uncertainties add in
 * quadrature (GUM 5.1.6). */
typedef struct al_std_inputs {
	double mass_g, u_mass_g;
	double purity, u_purity;
	double molar_mass, u_molar_mass;
	double volume_ml, u_volume_ml; /* burette (or all of the volume) */
	double u_volume_temp_ml;       /* temperature, 0 when folded in above */
	double rep_rel;
} al_std_inputs;

void al_std_uncertainty(const al_std_inputs *in, al_budget *out);

/* One titrant lot after its standardisation titrations. */
typedef struct al_std_lot {
	const char *lot;
	const al_standard *standard;
	size_t n;
	double mean, sd, rsd_pct; /* concentration, mol/L */
	int has_sd;
	al_budget budget;  /* at the mean mass and volume */
	double U;          /* k u */
	int valid;         /* n and RSD acceptable */
	char why[160];     /* when not valid */
	long date;         /* the lot's latest titration date */
	unsigned long first_line;
	const char *file;
} al_std_lot;

typedef struct al_std_run al_std_run;

al_std_run *al_std_new(const al_catalogue *cat, const al_std_params *p,
		       long today, al_status *status);
void al_std_free(al_std_run *run);
/* Reads a standardisation CSV: titrant_lot, standard (default KHP),
 * mass_g, purity (default: the standard's), titrant_ml, blank_ml (0),
 * date (YYYY-MM-DD; default today). Problems go to the diagnostics;
 * AL_EINPUT for a header problem. */
al_status al_std_read(al_std_run *run, FILE *in, const char *name,
		      const al_csv_options *csv);
/* The same from any source (see al_csv_read). */
/* 1 when name is a column of the standardisation file. */
int al_std_is_column(const char *name);
/* Other headers for its columns (--column, --columns); each not optional
 * must name a header of every file read. The aliases must outlive the
 * run. */
void al_std_set_columns(al_std_run *run, const al_column_alias *aliases,
			size_t n);
al_status al_std_read_source(al_std_run *run, al_read_fn read_fn, void *ctx,
			     const char *name, const al_csv_options *csv);
al_status al_std_finish(al_std_run *run);
size_t al_std_lot_count(const al_std_run *run);
const al_std_lot *al_std_lot_at(const al_std_run *run, size_t i);
al_diags *al_std_diags(al_std_run *run);

#endif
