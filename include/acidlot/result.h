/* acidlot: the options of an assay run and what it yields: a result's
 * figures, flags and verdict, a replicate, Cochran's test, the counts.
 * The run (assay.h) and the evaluation of one result (evaluate.h) both
 * use these; neither needs the other for them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_RESULT_H
#define ACIDLOT_RESULT_H

#include <stddef.h>
#include <stdio.h>

#include "acidlot/chem.h"
#include "acidlot/csvread.h"
#include "acidlot/curve.h"
#include "acidlot/date.h"
#include "acidlot/gum.h"
#include "acidlot/register.h"
#include "acidlot/spec.h"
#include "acidlot/stats.h"
#include "acidlot/table.h"
#include "acidlot/units.h"

/* Replicate QC: screens, uncertainty and the decision rule. Zero fields
 * take the defaults of al_qc_options_default. */
typedef struct al_qc_options {
	al_decision_rule decision; /* simple (default) or guarded */
	double guard_r;            /* guard band w = guard_r U; 1 */
	int exclude_outliers;      /* leave 1 % Grubbs outliers out of the
				      mean (flagged, never lost) */
	double burette_tol_ml;     /* +/- mL, triangular; 0.05 (class A
				      50 mL burette, ISO 385) */
	double balance_linearity_g;/* +/- g per weighing, rectangular,
				      tare and gross; 0.00015 (QUAM A2) */
	int has_titrant_u;
	double titrant_u;          /* standard uncertainty of the titrant
				      concentration, mol/L, for rows whose
				      lot is not in a register */
	double k;                  /* coverage factor; 2 */
	int has_resolution;
	double resolution_ml;      /* the burette's reading resolution, mL;
				      0.05 unless has_resolution. A
				      replicate within it of its nearest
				      neighbour is no outlier */
	int has_water_u;
	double water_u_pct;        /* standard uncertainty of the water
				      determination, % w/w, in an anhydrous
				      result's budget; 0.1 unless
				      has_water_u */
} al_qc_options;

void al_qc_options_default(al_qc_options *q);

typedef struct al_assay_options {
	const al_catalogue *catalogue; /* required */
	const al_spec_table *specs;    /* may be NULL */
	const al_acid *default_acid;   /* when neither spec nor row names one;
					  NULL means citric */
	int has_unit;                  /* unit for groups whose spec names none */
	al_unit unit;                  /* (else the sample's own basis:
					  g/100g by mass, g/100mL by volume) */
	int has_blank;
	double blank_ml;               /* when a row has no blank_ml */
	int has_titrant;
	double titrant_mol_l;          /* when a row has no titrant_mol_l */
	int has_density;
	double density_g_ml;           /* when a row has no density_g_ml */
	int has_endpoint;
	double endpoint_ph;            /* when a row has no endpoint_ph */
	al_curve_mode endpoint_mode;   /* a curve file's endpoints (fixed
					  when 0) */
	double confidence;             /* of the interval; 0.95 when 0 */
	al_csv_options csv;            /* delimiter, decimal point */
	const al_column_alias *aliases;/* other headers for our columns */
	size_t n_aliases;
	/* Keep going past invalid rows: each goes to on_reject instead of
	 * being an error, and its result is computed from the valid rows and
	 * flagged. NULL: strict, every invalid row is an error. */
	al_status (*on_reject)(void *ud, const char *file, unsigned long line,
			       const char *reason, const char *raw,
			       size_t raw_len);
	void *reject_ud;
	/* Titrant register: a row's titrant_lot takes its concentration
	 * from here; the lot must be valid on the row's date (or on
	 * `today` when the row has none). NULL: not used. */
	const al_register *titrants;
	long today; /* day number (al_date_parse) */
	al_date_order date_order; /* how the date column is written */
	al_qc_options qc;
	int anhydrous; /* results on the anhydrous basis (needs water_pct)
			  for groups whose specification names no basis */
	int threads;   /* 1: al_assay_finish in one thread; 0: two where
			  there are many results (the same results) */
} al_assay_options;

/* Flags on a titration row and on a group (a group carries the union of
 * its rows' flags plus its own). */
enum {
	AL_FLAG_SINGLE = 1u << 0,       /* n = 1: no spread can be computed */
	AL_FLAG_FEW = 1u << 1,          /* n below the spec's min_n */
	AL_FLAG_RSD = 1u << 2,          /* RSD above the spec's max_rsd_pct */
	AL_FLAG_BELOW_MIN = 1u << 3,    /* mean below the spec's min */
	AL_FLAG_ABOVE_MAX = 1u << 4,    /* mean above the spec's max */
	AL_FLAG_ENDPOINT_LOW = 1u << 5, /* endpoint pH titrates < 99 % of the
					   protons the factor assumes */
	AL_FLAG_ACID_IGNORED = 1u << 6, /* a row named another acid than the
					   specification; the spec's is used */
	AL_FLAG_DENSITY = 1u << 7,      /* converted mass <-> volume basis */
	AL_FLAG_IMPLAUSIBLE = 1u << 8,  /* a value outside the usual range */
	AL_FLAG_REJECTED = 1u << 9,     /* rows of this result were rejected */
	AL_FLAG_STRAGGLER = 1u << 10,   /* Grubbs at 5 % (ISO 5725-2) */
	AL_FLAG_OUTLIER = 1u << 11,     /* Grubbs at 1 % */
	AL_FLAG_DIXON = 1u << 12,       /* Dixon r10 at 95 % */
	AL_FLAG_RANGE = 1u << 13,       /* range above f(n) sr (ISO 5725-6) */
	AL_FLAG_COCHRAN_STRAGGLER = 1u << 14, /* Cochran at 5 % */
	AL_FLAG_COCHRAN_OUTLIER = 1u << 15,   /* Cochran at 1 % */
	AL_FLAG_EXCLUDED = 1u << 16,    /* a Grubbs outlier left out of the mean */
	AL_FLAG_NO_TITRANT_U = 1u << 17, /* u without the titrant's uncertainty */
	AL_FLAG_BRIX_LOW = 1u << 18,     /* Brix below brix_min */
	AL_FLAG_BRIX_HIGH = 1u << 19,    /* Brix above brix_max */
	AL_FLAG_RATIO_LOW = 1u << 20,    /* Brix/acid ratio below ratio_min */
	AL_FLAG_RATIO_HIGH = 1u << 21,   /* Brix/acid ratio above ratio_max */
	AL_FLAG_WATER_LOW = 1u << 22,    /* water below water_min */
	AL_FLAG_WATER_HIGH = 1u << 23,   /* water above water_max */
	AL_FLAG_NO_BRIX = 1u << 24,      /* Brix or water limits, no values */
	AL_FLAG_DENSITY_BRIX = 1u << 25, /* density from Brix (NBS sucrose) */
	AL_FLAG_BRIX_UNCORRECTED = 1u << 26, /* acid correction not applicable */
	AL_FLAG_MANY = 1u << 27,         /* more than AL_VALUES_KEPT values:
					    running statistics, no median */
	/* from the curve of a titration (acidlot endpoint) */
	AL_FLAG_CURVE_SPARSE = 1u << 28, /* readings far apart at the end */
	AL_FLAG_CURVE_FALLS = 1u << 29,  /* the pH fell: retest */
	AL_FLAG_CURVE_NOISY = 1u << 30   /* a noisy curve: retest */
};

/* A result keeps its replicate values up to this many; past it, mean,
 * SD, Grubbs and range come from running sums (Welford) and there is no
 * median and no Dixon test. No lab titrates a sample 64 times: a result
 * that large is usually a sample identifier reused. */
#define AL_VALUES_KEPT 64

/* One titration that went into a result, as handed to the row callback.
 * Strings are valid only during the call. */
typedef struct al_replicate {
	const char *file;
	unsigned long line;
	const char *product, *lot, *sample, *replicate;
	const char *curve, *mode; /* the curve and mode that gave the volume
				     (acidlot endpoint); "" for others */
	double meq;     /* milliequivalents titrated in the portion */
	double value;   /* titratable acidity in unit, as acid */
	al_unit unit;
	const al_acid *acid;
	unsigned flags; /* AL_FLAG_ bits of this row */
	double endpoint_ph_needed; /* when AL_FLAG_ENDPOINT_LOW */
} al_replicate;

typedef al_status (*al_replicate_fn)(void *ud, const al_replicate *rep);

/* One result: a product + lot + sample and its replicates. */
typedef struct al_group_result {
	const char *product, *lot, *sample;
	const al_acid *acid;
	al_unit unit;
	const al_spec *spec;  /* NULL: no specification for the product */
	al_summary stats;
	al_verdict verdict;
	unsigned flags;       /* AL_FLAG_ bits */
	double endpoint_ph;   /* lowest endpoint pH among its rows, if flagged */
	double endpoint_ph_needed;
	const double *values; /* the replicate values, in input order; NULL
				 with AL_FLAG_MANY */
	size_t n_values;      /* all of them (stats.n leaves out an excluded
				 outlier) */
	int has_median;
	double median;
	int has_grubbs, has_dixon;
	double grubbs_g, dixon_q;
	size_t grubbs_index, dixon_index; /* in values */
	double range;
	int has_critical_range;
	double critical_range; /* f(n) sr */
	int has_horrat;
	double horrat;         /* RSD / Horwitz predicted RSD */
	int has_u;
	double u, U, k;        /* standard and expanded uncertainty, in unit */
	al_gum_term budget[8];
	size_t n_budget;
	int has_excluded;
	size_t excluded_index;
	int has_brix, has_brix_corrected, has_ratio, has_water;
	double brix;           /* mean refractometric Brix */
	double brix_corrected; /* + Kimball's citric acid correction */
	double ratio;          /* Brix (corrected when it can be) / TA % w/w */
	double water_pct;      /* mean water, % w/w */
	int anhydrous;         /* the result is on the anhydrous basis */
	int has_date;
	long date;             /* its latest titration date (a day number) */
} al_group_result;

/* Cochran's test over the results of one product with the same n. */
typedef struct al_cochran {
	const char *product;
	size_t l, n;          /* results, replicates each */
	double c, crit5, crit1;
	size_t result;        /* index of the result with the largest variance */
} al_cochran;



typedef struct al_assay_counts {
	unsigned long rows_read; /* data rows, blank lines not counted */
	unsigned long rows_used;
	unsigned long rows_bad;  /* rows with at least one error (rejected
				    ones in keep-going mode) */
	unsigned long groups;
	unsigned long by_verdict[AL_VERDICT_COUNT];
} al_assay_counts;

#endif
