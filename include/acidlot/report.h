/* acidlot: writing the QC report and the replicate table as CSV.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_REPORT_H
#define ACIDLOT_REPORT_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/assay.h"

typedef struct al_report_options {
	int decimals; /* fixed decimals when >= 0; -1: 10 significant digits */
} al_report_options;

/* Formats a number with '.' as decimal point whatever the locale:
 * `decimals` fixed places when >= 0, else up to 10 significant digits
 * (%.10g, trailing zeros dropped). Writes at most cap bytes. */
void al_format_number(double v, int decimals, char *buf, size_t cap);

/* Writes one CSV field, quoted as RFC 4180 asks when it holds a comma,
 * a quote, CR or LF. Returns 0, or EOF on a write error. */
int al_csv_put_field(FILE *out, const char *s);

/* The report: a header line and one line per result in order of first
 * appearance. Columns: product, lot, sample, acid, unit, n, mean, sd,
 * rsd_pct, ci95_low, ci95_high, spec_min, spec_max, status, flags.
 * Undefined numbers (sd for n = 1) are empty cells. AL_EIO when writing
 * fails. */
al_status al_report_write(FILE *out, const al_assay *run,
			  const al_report_options *opt);

/* The replicate table: header, then al_replicates_row per titration.
 * Columns: file, line, product, lot, sample, replicate, meq, value, unit,
 * flags. */
al_status al_replicates_header(FILE *out);
al_status al_replicates_row(FILE *out, const al_replicate *rep,
			    const al_report_options *opt);

#endif
