/* acidlot: specification limits per product, and the decision.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_SPEC_H
#define ACIDLOT_SPEC_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/chem.h"
#include "acidlot/csvread.h"
#include "acidlot/table.h"
#include "acidlot/stats.h"
#include "acidlot/units.h"

typedef struct al_spec {
	char *product;
	const al_acid *acid; /* NULL: not named by the specification */
	int has_unit;
	al_unit unit;
	int has_min, has_max;
	double min, max;     /* in unit, as the acid */
	int has_max_rsd;
	double max_rsd_pct;
	size_t min_n;        /* 2 when not given */
	int has_sr;
	double sr;           /* repeatability standard deviation, in unit
				(from sr, or r / 2.8 as ISO 5725-6 defines r) */
	/* juice and food-acid limits: Brix (acid-corrected where it can be),
	 * Brix/acid ratio, water % w/w; has_ flags as for min/max */
	int has_brix_min, has_brix_max, has_ratio_min, has_ratio_max;
	double brix_min, brix_max, ratio_min, ratio_max;
	int has_water_min, has_water_max;
	double water_min, water_max;
	int has_basis;
	int anhydrous;       /* results on the anhydrous basis */
	int has_resolution;
	double resolution_ml; /* burette reading resolution, mL */
	unsigned long line;  /* where it stands in its file */
} al_spec;

/* Opaque table of specifications; al_spec_table_free accepts NULL. */
typedef struct al_spec_table al_spec_table;

/* Reads a specification CSV: columns product (required, unique), acid,
 * unit, min, max (at least one of the two per row), max_rsd_pct, min_n,
 * sr or r (repeatability, in unit).
 * Problems go to diags with file, line and column; the result is then
 * NULL with *status AL_EINPUT (or AL_ESYNTAX, AL_EIO, AL_ENOMEM). */
al_spec_table *al_spec_table_read(const al_catalogue *cat,
				  const al_csv_options *csv, FILE *in,
				  const char *name, al_status *status,
				  al_diags *diags);
/* The same with other headers for its columns (--spec-column), each of
 * which must be a header of the file. */
al_spec_table *al_spec_table_read_as(const al_catalogue *cat,
				     const al_csv_options *csv,
				     const al_column_alias *aliases,
				     size_t n_aliases, FILE *in,
				     const char *name, al_status *status,
				     al_diags *diags);
/* 1 when name is a column of the specification file. */
int al_spec_is_column(const char *name);
void al_spec_table_free(al_spec_table *table);
/* Its specifications in file order, *n of them (none in a NULL table). */
const al_spec *al_spec_all(const al_spec_table *table, size_t *n);
/* The specification of a product (exact, case-sensitive match of the
 * NFC forms: products are read through al_text_identifier), or NULL. */
const al_spec *al_spec_find(const al_spec_table *table, const char *product);
/* A specification whose product matches ignoring case, blanks and
 * punctuation (al_text_loose), for a warning only; NULL when none (or
 * when memory runs out: *oom set). */
const al_spec *al_spec_find_loose(al_spec_table *table, const char *product,
				  int *oom);

typedef enum al_verdict {
	AL_VERDICT_PASS = 0,
	AL_VERDICT_FAIL,
	AL_VERDICT_RETEST,
	AL_VERDICT_NO_SPEC,
	AL_VERDICT_COND_PASS, /* guarded rule: inside the limits, within w */
	AL_VERDICT_COND_FAIL, /* guarded rule: outside the limits, within w */
	AL_VERDICT_COUNT
} al_verdict;

typedef enum al_decision_rule {
	AL_DECISION_SIMPLE = 0, /* ILAC G8:09/2019 4.2.1 */
	AL_DECISION_GUARDED     /* ILAC G8:09/2019 4.2.2, w = r U */
} al_decision_rule;

const char *al_verdict_name(al_verdict v);

/* Why a verdict came out as it did (bits, see al_judge). */
enum {
	AL_WHY_FEW = 1u << 0,       /* n below min_n */
	AL_WHY_RSD = 1u << 1,       /* RSD above max_rsd_pct */
	AL_WHY_BELOW_MIN = 1u << 2, /* mean below the minimum */
	AL_WHY_ABOVE_MAX = 1u << 3, /* mean above the maximum */
	AL_WHY_RANGE = 1u << 4      /* range above the ISO 5725-6 critical range */
};

/* Simple acceptance (ILAC G8:09/2019 s.4.2.1): retest when n < min_n or
 * RSD > max_rsd_pct, else pass when min <= mean <= max, else fail;
 * no-spec without a specification. *why gets the AL_WHY_ bits. The mean
 * is compared at full precision, before any rounding for the report. */
al_verdict al_judge(const al_spec *spec, const al_summary *s, unsigned *why);

/* The same under a stated rule. guard is the guard band w (r U) for the
 * guarded rule, ignored for simple: pass inside [min + w, max - w], fail
 * outside [min - w, max + w], conditional-pass or conditional-fail in
 * between (inside or outside the limits). range_exceeded adds a retest. */
al_verdict al_judge_rule(const al_spec *spec, const al_summary *s,
			 al_decision_rule rule, double guard,
			 int range_exceeded, unsigned *why);

#endif
