/* acidlot: juice specifics: acid-corrected Brix, Brix/acid ratio, density
 * from Brix, and the anhydrous basis of food-acid assays.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_JUICE_H
#define ACIDLOT_JUICE_H

#include "acidlot/status.h"

/* Correction to add to refractometric Brix for a citric acid content in
 * % w/w, interpolated linearly in Kimball's table (Citrus Processing,
 * 1991; reference/brix_acid_correction.csv), from 0 at 0 %. AL_EDOMAIN
 * beyond the table (38 %). */
al_status al_brix_acid_correction(double citric_pct, double *correction);

/* Brix of a sucrose solution from its apparent specific gravity 20/20 C
 * (NBS polynomial, valid 1.00000 <= S <= 1.17874, 0-40 Brix). */
double al_brix_from_sg(double sg);
/* Its inverse by a GSL root finder; AL_EDOMAIN outside 0-40 Brix. */
al_status al_sg_from_brix(double brix, double *sg);
/* Density in g/mL: S x 0.99820 g/mL, the density of water at 20 C. */
al_status al_density_from_brix(double brix, double *density_g_ml);

/* The density of water at 20 C used above, g/mL (from memory). */
#define AL_WATER_20C_G_ML 0.99820

/* Assay on the anhydrous basis: as-is % / (1 - water % / 100). AL_EDOMAIN
 * unless 0 <= water < 100. */
al_status al_anhydrous(double as_is, double water_pct, double *anhydrous);

#endif
