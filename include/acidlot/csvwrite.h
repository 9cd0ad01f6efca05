/* acidlot: writing CSV text fields: RFC 4180 quoting and the guard
 * against formulas (OWASP, CSV injection).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CSVWRITE_H
#define ACIDLOT_CSVWRITE_H

#include <stddef.h>
#include <stdio.h>

/* 1 when byte i of s[0..len) starts a piece that a spreadsheet would run
 * as a formula: the cell's start, or after ',', ';' or tab (where a
 * spreadsheet set to another delimiter would split it), followed by '=',
 * '+', '-', '@', tab or CR, or by 's and then one of those (a piece
 * guarded already, guarded again so that the guard stays reversible). */
int al_csv_formula_at(const char *s, size_t len, size_t i);

/* Writes one CSV text field, quoted as RFC 4180 asks when it holds the
 * delimiter, a quote, CR or LF, with a ' before every piece that starts
 * a formula (al_csv_formula_at). Returns 0, or EOF on a write error. */
int al_csv_put_field(FILE *out, const char *s, char delimiter);

/* Undoes the guard in place: s[0..len) as it was before it was written;
 * returns its new length. */
size_t al_csv_unguard(char *s, size_t len);

#endif
