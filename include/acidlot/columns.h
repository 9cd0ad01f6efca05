/* acidlot: the titration file's columns, by name.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_COLUMNS_H
#define ACIDLOT_COLUMNS_H

/* 1 when name is one of the assay's columns ("titrant_ml", "mass_g",
 * ...: the README's table), which --column and --columns may map. */
int al_assay_is_column(const char *name);

#endif
