/* acidlot command line: trend's points from report CSVs.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_TREND_REPORTS_H
#define ACIDLOT_CLI_TREND_REPORTS_H

#include "store.h"

/* The results of product in the report CSVs files[0..n_files) (acidlot
 * assay's), in file and row order, with a value of quantity: *n points
 * in *out (al_free it; no dates: a report has none). 0, or -1 after a
 * message. */
int trend_reports_read(char *const *files, int n_files, const char *product,
		       const char *quantity, store_point **out, size_t *n);

#endif
