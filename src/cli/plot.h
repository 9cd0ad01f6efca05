/* acidlot command line: one SVG picture per titration curve, written
 * into a folder that appears whole when the run succeeds.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_PLOT_H
#define ACIDLOT_CLI_PLOT_H

#include "acidlot/acidlot.h"

typedef struct plot_set {
	char *dir;   /* the folder asked for */
	char *tmp;   /* where the pictures go until plot_commit */
	char **names; /* the file names made, none twice */
	size_t n, cap;
	al_curve_mode mode;
} plot_set;

/* Begins the pictures for dir, which must not exist or be empty; 0, or
 * -1 after a message. */
int plot_begin(plot_set *p, const char *dir, al_curve_mode mode);
/* The picture of one curve (see al_curves_curve_fn). */
al_status plot_curve(plot_set *p, const char *id, const al_curve *c,
		     const double *work, const al_curve_endpoint *e);
/* The folder into place (nothing when plot_begin was not called); 0, or
 * -1 after a message. */
int plot_commit(plot_set *p);
/* Removes what plot_commit did not put into place, and frees p. */
void plot_abort(plot_set *p);

#endif
