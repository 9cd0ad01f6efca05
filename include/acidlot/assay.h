/* acidlot: the assay run: titration rows in, one result per lot sample.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Data path: CSV rows -> per-row titratable acidity -> replicate groups
 * (product + lot + sample) -> statistics -> decision against the spec.
 * Rows stream through; memory grows with the number of groups. */
#ifndef ACIDLOT_ASSAY_H
#define ACIDLOT_ASSAY_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/csvread.h"
#include "acidlot/result.h"

typedef struct al_assay al_assay;

/* A new run; options are copied (the catalogue and specs they point to
 * must outlive the run). NULL with *status set on failure. */
al_assay *al_assay_new(const al_assay_options *opt, al_status *status);
void al_assay_free(al_assay *run);

/* Reads one titration file. Every row is used or reported: problems go
 * to the run's diagnostics with file, line and column. When on_row is not
 * NULL the rows used are kept and handed to it by al_assay_finish, in
 * input order, with the screens' flags of each row. Returns AL_OK when the file could be read
 * to its end even if rows were bad (see al_assay_counts), else AL_ESYNTAX,
 * AL_EINPUT (a header problem), AL_EIO, AL_ENOMEM or what on_row
 * returned. */
al_status al_assay_read(al_assay *run, FILE *in, const char *name,
			al_replicate_fn on_row, void *ud);

/* The same from any source (see al_csv_read), e.g. one that hashes what
 * it reads. */
al_status al_assay_read_source(al_assay *run, al_read_fn read_fn, void *ctx,
			       const char *name, al_replicate_fn on_row,
			       void *ud);

/* Computes statistics, screens, uncertainty and verdicts for every group
 * (the counts and Cochran's tests), then hands the kept rows to on_row;
 * call once, after the last read. */
al_status al_assay_finish(al_assay *run);

/* For a caller that evaluates every result next anyway (al_report_write):
 * al_assay_finish without the verdicts, which the run keeps from each
 * result's first evaluation instead, so that each is evaluated once.
 * Results, Cochran's tests and the kept rows are as after
 * al_assay_finish; the verdict counts, the flags of
 * al_assay_result_flags and the acids and specs used are complete after
 * al_assay_settle, which evaluates any result not yet evaluated. */
al_status al_assay_finish_lazy(al_assay *run);
al_status al_assay_settle(al_assay *run);

size_t al_assay_group_count(const al_assay *run);
/* i-th result in order of first appearance, after finish; NULL past the
 * end. Results are evaluated when asked for, so that a run keeps none of
 * them: the one returned belongs to the run and stays valid until the
 * next call (copy it to keep it). */
const al_group_result *al_assay_result(const al_assay *run, size_t i);
/* A reader evaluates results of a finished run as al_assay_result does,
 * into a result of its own (valid until its next call): threads may each
 * use one at the same time, while nothing else changes the run. */
typedef struct al_assay_reader al_assay_reader;
al_assay_reader *al_assay_reader_new(const al_assay *run); /* NULL: no memory */
const al_group_result *al_assay_reader_result(al_assay_reader *rd, size_t i);
void al_assay_reader_free(al_assay_reader *rd);
al_assay_counts al_assay_get_counts(const al_assay *run);
al_diags *al_assay_diags(al_assay *run);
/* Cochran's tests of the run (one per product with two or more results
 * of the same n); valid after finish. */
const al_cochran *al_assay_cochran(const al_assay *run, size_t *n);

/* The flags of the i-th result (as in al_assay_result), without
 * evaluating it; 0 past the end. */
/* Result i's verdict, without evaluating it again (after finishing). */
al_verdict al_assay_result_verdict(const al_assay *run, size_t i);
unsigned al_assay_result_flags(const al_assay *run, size_t i);

/* The acids and the specifications of the results, each once, in the
 * order of the results; NULL past the end. Valid after finish. */
const al_acid *al_assay_acid_used(const al_assay *run, size_t i);
const al_spec *al_assay_spec_used(const al_assay *run, size_t i);

/* The titrant lots rows took their concentration from, in order of first
 * use; NULL past the end. */
const al_titrant *al_assay_titrant_used(const al_assay *run, size_t i);

/* Writes the names of the flags set in `flags` as "a;b;c" into buf. */
/* The words for the flags that explain a status ("below the minimum;
 * replicates' RSD over its limit"), appended to buf[0..len) with "; "
 * between; returns the new length. */
size_t al_flags_words(unsigned flags, char *buf, size_t cap, size_t len);
void al_flags_format(unsigned flags, double endpoint_needed, char *buf,
		     size_t cap);

#endif
