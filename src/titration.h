/* acidlot: one titration's value (internal): a checked row (rows.h) in
 * a result's unit and basis, with the checks that the value itself
 * needs. Stage 3 of the pipeline (DEVELOPERS.md); the formulas are in
 * ta.c and juice.c.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TITRATION_H
#define ACIDLOT_TITRATION_H

#include "rows.h"

/* The row's value in a result's unit and basis, into r->value (and
 * r->flags, needed, impossible): the density the conversion needs (the
 * row's, else from its Brix), TA (al_ta_value), the anhydrous basis,
 * the range a value can be computed in, more acid than a sample holds,
 * and an endpoint too low for the acid. 0, or -1 after an error in
 * row_diags. */
int al_titration_value(al_rows *rs, al_row *r, al_unit unit, int anhydrous);

#endif
