/* acidlot command line: assay --xlsx, the run as one workbook (issue
 * 24): sheets report, replicates, rejects (when any), budget (with
 * --budget) and run (the record). Each sheet is the CSV output written
 * once more with 17 significant digits, so that every number in the
 * workbook is the run's very double; the workbook is one of the run's
 * outputs, all or none.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "assay_cli.h"
#include "workbook.h"

struct assay_book {
	al_report_options ropt; /* 17 digits, plain text, ',' */
	/* the replicates and rejects, as they are read */
	FILE *reps, *rejs;
	char *reps_text, *rejs_text;
	size_t reps_len, rejs_len;
};

int
assay_book_open(struct job *j)
{
	struct assay_book *b;
	al_status st;

	if (j->a.xlsx == NULL)
		return 0;
	if ((j->book = b = al_calloc(1, sizeof *b)) == NULL)
		goto no_memory;
	b->ropt.decimals = AL_DECIMALS_EXACT;
	b->ropt.raw_text = 1; /* a text cell is never a formula */
	b->ropt.threads = 1;
	if ((b->reps = open_memstream(&b->reps_text, &b->reps_len)) == NULL ||
	    al_replicates_header(b->reps, &b->ropt) != AL_OK ||
	    (b->rejs = open_memstream(&b->rejs_text, &b->rejs_len)) == NULL ||
	    al_rejects_header(b->rejs, &b->ropt) != AL_OK)
		goto no_memory;
	j->book_out = al_outfile_open(j->a.xlsx, &st);
	if (j->book_out == NULL) {
		cli_error("%s: %s", j->a.xlsx, cli_reason(st));
		return -1;
	}
	if (al_outfile_in_place(j->book_out)) {
		cli_error("%s: a workbook is written to a file, not a device or "
			  "standard output", j->a.xlsx);
		return -1;
	}
	return 0;
no_memory:
	cli_error("%s", al_strerror(AL_ENOMEM));
	return -1;
}

al_status
assay_book_replicate(struct job *j, const al_replicate *rep)
{
	return al_replicates_row(j->book->reps, rep, &j->book->ropt);
}

al_status
assay_book_reject(struct job *j, const char *file, unsigned long line,
		  const char *reason, const char *raw, size_t raw_len)
{
	return al_rejects_row(j->book->rejs, file, line, reason, raw, raw_len,
			      &j->book->ropt);
}

/* The report and the budget as the workbook takes them. */
static int
report_17(void *ctx, FILE *out)
{
	struct job *j = ctx;

	return al_report_write(out, j->run, &j->book->ropt) == AL_OK ? 0 : -1;
}

static int
budget_17(void *ctx, FILE *out)
{
	struct job *j = ctx;

	return al_budget_write(out, j->run, &j->book->ropt) == AL_OK ? 0 : -1;
}

/* A sheet from what write puts into a stream: 0, or -1 after a
 * message. */
static int
sheet_from(wbook *w, const char *sheet, struct job *j,
	   int (*write)(void *ctx, FILE *out))
{
	char *text = NULL;
	size_t len = 0;
	int bad = cli_capture(write, j, &text, &len);

	if (bad)
		cli_error("%s", al_strerror(AL_ENOMEM));
	else
		bad = wbook_csv_sheet(w, sheet, text, len, NULL);
	free(text);
	return bad;
}

/* The record's fields for the run sheet: all but the results (the
 * report sheet) and the outputs (not yet known). */
static const char *const not_in_run_sheet[] = {"results", "outputs"};

int
assay_book_write(struct job *j)
{
	struct assay_book *b = j->book;
	wbook *w;
	int bad;

	if (b == NULL)
		return 0;
	b->ropt.report_id = j->rec.id;
	bad = fclose(b->reps) != 0;
	bad |= fclose(b->rejs) != 0;
	b->reps = b->rejs = NULL;
	if (bad) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	w = wbook_new(al_outfile_written_path(j->book_out), j->a.xlsx);
	if (w == NULL)
		return -1;
	bad = sheet_from(w, "report", j, report_17) != 0 ||
	      wbook_csv_sheet(w, "replicates", b->reps_text, b->reps_len,
			      NULL) != 0 ||
	      (j->rejs.count > 0 &&
	       wbook_csv_sheet(w, "rejects", b->rejs_text, b->rejs_len,
			       NULL) != 0) ||
	      (j->a.budget && sheet_from(w, "budget", j, budget_17) != 0) ||
	      wbook_json_sheet(w, "run", j->rec.root, not_in_run_sheet, 2) != 0;
	if (wbook_close(w) != 0 || bad)
		return -1;
	if (al_outfile_prepare(j->book_out) != AL_OK) {
		cli_error("%s: %s", j->a.xlsx, cli_reason(AL_OK));
		return -1;
	}
	return 0;
}

void
assay_book_free(struct job *j)
{
	if (j->book == NULL)
		return;
	if (j->book->reps)
		fclose(j->book->reps);
	if (j->book->rejs)
		fclose(j->book->rejs);
	free(j->book->reps_text);
	free(j->book->rejs_text);
	al_free(j->book);
	j->book = NULL;
}
