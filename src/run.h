/* acidlot: the state of one assay run (internal), shared by its two
 * halves: assay.c reads rows into groups; results.c evaluates the
 * groups into results and runs the checks across them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_RUN_H
#define ACIDLOT_RUN_H

#include "acidlot/result.h"
#include "groups.h"
#include "acidlot/curves.h"
#include "rows.h"

/* A row used, kept for the replicate output when one is asked for. */
struct kept_row {
	uint32_t group, pos, file;
	unsigned flags;
	unsigned long line;
	double meq, value, needed;
	size_t replicate; /* offset in run->kept_text */
};

/* An evaluator's own state: the result it evaluated last and its
 * scratch; the run has one, and each al_assay_reader one, so that
 * threads can evaluate results of a finished run side by side. */
struct al_assay_reader {
	const struct al_assay *run;
	al_group_result cur;
	size_t cur_index; /* 1 + the group in cur; 0: none */
	double scratch[AL_VALUES_KEPT];
};

struct al_assay {
	al_assay_options opt;
	al_diags diags;
	al_assay_counts counts;
	al_rows rows;     /* the reading of rows (rows.h) */
	al_groups groups; /* the results they make (groups.h) */
	char **files;
	size_t n_files;
	al_labels labels; /* replicate labels beyond the groups' slots */
	al_curves *curves; /* the file being read is one of curves: its
			      readings become one row per curve, under our
			      column names (the aliases applied) */
	size_t n_aliases;  /* the options' while a curve file is read */
	al_replicate_fn on_row;
	void *ud;
	struct kept_row *kept;
	size_t n_kept, cap_kept;
	char *kept_text;
	size_t kept_text_len, kept_text_cap;

	/* after the reading (results.c) */
	int finished;
	struct al_assay_reader own; /* al_assay_result's */
	const al_acid **acids_used; /* by the results, in their order */
	size_t n_acids_used;
	const al_spec **specs_used;
	size_t n_specs_used;
	al_cochran *cochran;
	size_t n_cochran;
};

/* Hands the kept rows to on_row in input order, each with the screens'
 * flags of its value (assay.c). */
al_status al_run_replay(struct al_assay *run);

#endif
