/* acidlot: writing the QC report, the replicate table and rejected rows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_REPORT_H
#define ACIDLOT_REPORT_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/assay.h"

/* al_report_options.decimals: 17 significant digits, so that each
 * number reads back as the very double (the workbook's source). */
#define AL_DECIMALS_EXACT (-2)

typedef struct al_report_options {
	int decimals;      /* fixed decimals when >= 0; -1: 10 significant
			      digits; AL_DECIMALS_EXACT: 17 */
	int round_u;       /* the figures in a result's unit (mean, sd,
			      interval, median, range, critical range, u)
			      to the decimal place of U to two significant
			      digits, U to two (GUM 7.2.6; al_u_place);
			      decimals then applies to the other figures */
	char delimiter;    /* ',' (default when 0) or ';' */
	int decimal_comma; /* write numbers with ',' (then delimiter ';') */
	int bom;           /* start each file with a UTF-8 byte-order mark */
	int raw_text;      /* do not guard text against formula injection */
	unsigned long guarded; /* out: text cells that were guarded */
	const char *report_id; /* when set, a last column report_id holds
				  "<report_id>-<row number>" */
	int threads; /* 1: the report in one thread; 0: two where there are
			many results (the same bytes either way) */
} al_report_options;

/* Formats a number with '.' (or ',' when decimal_comma) as decimal point,
 * whatever the locale: `decimals` fixed places when >= 0, else up to 10
 * significant digits (%.10g, trailing zeros dropped). */
void al_format_number(double v, int decimals, int decimal_comma, char *buf,
		      size_t cap);

/* Writes a text cell copied from the input. Unless opt->raw_text, every
 * piece of it that starts with '=', '+', '-', '@', tab or CR (the cell's
 * start, and after each ',', ';' or tab, where a spreadsheet set to
 * another delimiter would split it) gets a leading single quote, so that
 * a spreadsheet shows it as text instead of running it as a formula
 * (OWASP, CSV injection); opt->guarded counts the cells. */
int al_csv_put_text(FILE *out, const char *s, size_t len,
		    al_report_options *opt);

/* The report: a header line and one line per result in order of first
 * appearance. Columns: product, lot, sample, acid, unit, n, mean, sd,
 * rsd_pct, ci95_low, ci95_high, spec_min, spec_max, status, flags,
 * median, grubbs_g, dixon_q, range, critical_range, horrat, u, U, k, and
 * report_id when opt->report_id is set.
 * Undefined numbers (sd for n = 1) are empty cells. AL_EIO when writing
 * fails. */
al_status al_report_write(FILE *out, const al_assay *run,
			  al_report_options *opt);

/* The replicate table: header, then al_replicates_row per titration.
 * Columns: file, line, product, lot, sample, replicate, meq, value, unit,
 * flags. */
al_status al_replicates_header(FILE *out, al_report_options *opt);
al_status al_replicates_row(FILE *out, const al_replicate *rep,
			    al_report_options *opt);

/* The uncertainty budget of every result: product, lot, sample,
 * component, value, unit, standard_uncertainty, sensitivity,
 * contribution, share_pct. */
al_status al_budget_write(FILE *out, const al_assay *run,
			  al_report_options *opt);

/* Rejected rows: header, then one row each: file, line, reason, record
 * (the record's bytes as read, in one field). */
al_status al_rejects_header(FILE *out, al_report_options *opt);
al_status al_rejects_row(FILE *out, const char *file, unsigned long line,
			 const char *reason, const char *raw, size_t raw_len,
			 al_report_options *opt);

#endif
