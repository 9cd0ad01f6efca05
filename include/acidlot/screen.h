/* acidlot: a judged run as a person reads it at a terminal.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_SCREEN_H
#define ACIDLOT_SCREEN_H

#include <stdio.h>

#include "acidlot/assay.h"

typedef struct al_screen_options {
	int colour;   /* the status in colour (ANSI), for a terminal */
	int decimals; /* fixed decimals when >= 0; -1: each result rounded
			 to its expanded uncertainty (al_round_to_u) */
} al_screen_options;

/* One aligned line per result of a finished run: product, lot, sample,
 * n, the result with its expanded uncertainty, unit and acid, the
 * limits, the status and, for any status but pass, its reasons in
 * words. AL_EIO when the output fails. */
al_status al_screen_write(FILE *out, const al_assay *run,
			  const al_screen_options *opt);

/* The reasons of a result's status in words ("RSD over its limit; below
 * the minimum"), into buf; empty for a pass. */
void al_screen_reasons(const al_group_result *r, char *buf, size_t cap);

#endif
