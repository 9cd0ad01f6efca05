/* acidlot: the titrant register (standardised lots and their validity).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_REGISTER_H
#define ACIDLOT_REGISTER_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/status.h"

typedef struct al_titrant {
	char *lot;
	char *standard;
	double concentration_mol_l;
	double u_mol_l;      /* standard uncertainty */
	size_t n;
	int has_rsd;
	double rsd_pct;
	long standardised_on; /* day number (al_date_parse) */
	long valid_until;
	int valid;           /* 0: the standardisation failed its checks */
	unsigned long line;  /* in the register file; 0 when new */
} al_titrant;

typedef struct al_register al_register;

/* An empty register. */
al_register *al_register_new(al_status *status);
/* Reads a register CSV (columns titrant_lot, standard,
 * concentration_mol_l, u_mol_l, n, rsd_pct, standardised_on, valid_until,
 * valid). Problems go to diags; NULL with *status on failure. */
al_register *al_register_read(FILE *in, const char *name, al_status *status,
			      al_diags *diags);
void al_register_free(al_register *reg);
/* Its lots in order, *n of them (none in a NULL register). */
const al_titrant *al_register_all(const al_register *reg, size_t *n);
const al_titrant *al_register_find(const al_register *reg, const char *lot);
/* Adds a lot, or replaces the entry of the same lot; strings are copied. */
al_status al_register_put(al_register *reg, const al_titrant *t);
/* Writes the whole register, lots in their order. AL_EIO on failure. */
al_status al_register_write(FILE *out, const al_register *reg);

#endif
