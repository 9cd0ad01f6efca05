/* acidlot: control charts of a series of results (METHODS.md s.9):
 * individuals and moving range, EWMA, tabular CUSUM, the Nelson run
 * rules, and capability.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TREND_H
#define ACIDLOT_TREND_H

#include <stddef.h>

#include "acidlot/status.h"

/* Constants for individuals (subgroups of 2 for the moving range):
 * d2 = 1.128, D4 = 3.267 (ASTM E2587; ISO 7870-2). */
#define AL_TREND_D2 1.128
#define AL_TREND_D4 3.267

/* What a point signals. */
enum {
	AL_TREND_NELSON_1 = 1u << 0, /* beyond 3 sigma */
	AL_TREND_NELSON_2 = 1u << 1, /* 9 in a row on one side */
	AL_TREND_NELSON_3 = 1u << 2, /* 6 in a row rising or falling */
	AL_TREND_NELSON_4 = 1u << 3, /* 14 in a row alternating */
	AL_TREND_NELSON_5 = 1u << 4, /* 2 of 3 beyond 2 sigma, one side */
	AL_TREND_NELSON_6 = 1u << 5, /* 4 of 5 beyond 1 sigma, one side */
	AL_TREND_NELSON_7 = 1u << 6, /* 15 in a row within 1 sigma */
	AL_TREND_NELSON_8 = 1u << 7, /* 8 in a row beyond 1 sigma */
	AL_TREND_EWMA_HIGH = 1u << 8,
	AL_TREND_EWMA_LOW = 1u << 9,
	AL_TREND_CUSUM_HIGH = 1u << 10,
	AL_TREND_CUSUM_LOW = 1u << 11
};

typedef struct al_trend_params {
	int has_target;	  /* --target X --sigma S (a check standard) */
	double target, sigma;
	size_t baseline;  /* points that set centre and sigma; 0: all */
	double lambda;	  /* EWMA weight (default 0.2) */
	double width;	  /* EWMA limits in sigmas (default 3) */
	double cusum_k;	  /* CUSUM reference value in sigmas (0.5) */
	double cusum_h;	  /* CUSUM decision interval in sigmas (5) */
} al_trend_params;

/* The defaults above into p (no target). */
void al_trend_params_default(al_trend_params *p);

typedef struct al_trend_limits {
	double centre, sigma;	/* mean and MR-bar / d2 of the baseline, or
				   the target and sigma given */
	double lcl, ucl;	/* centre -/+ 3 sigma */
	double mr_bar, mr_ucl;	/* of the baseline's moving ranges; D4 MR-bar */
} al_trend_limits;

typedef struct al_trend_point {
	double value;
	int has_mr;
	double mr;		/* |x_i - x_(i-1)| from the second point on */
	double ewma, ewma_lcl, ewma_ucl; /* exact, time-varying limits */
	double cusum_hi, cusum_lo;
	unsigned signals;	/* AL_TREND_ bits */
} al_trend_point;

/* The chart of x[0..n) (n >= 2): the limits, and each point with its
 * EWMA, CUSUM and signals. AL_EINVAL when n < 2, the baseline is longer
 * than n, or sigma comes out 0 (every baseline point equal). */
al_status al_trend_chart(const double *x, size_t n, const al_trend_params *p,
			 al_trend_limits *lim, al_trend_point *out);

/* Capability against the limits present: Cp = (USL - LSL) / (6 s_w),
 * Cpk = min(USL - centre, centre - LSL) / (3 s_w); Pp, Ppk the same with
 * the overall sample SD of x[0..n). has_ says which could be computed
 * (Cp and Pp need both limits; Cpk and Ppk one). */
typedef struct al_trend_capability {
	double sigma_overall, cp, cpk, pp, ppk;
	int has_cp, has_cpk;
} al_trend_capability;
void al_trend_capability_of(const double *x, size_t n, double centre,
			    double sigma_within, int has_lsl, double lsl,
			    int has_usl, double usl, al_trend_capability *c);

/* The signals as ';'-separated names: nelson-1 ... nelson-8,
 * ewma-high, ewma-low, cusum-high, cusum-low ("" when none). */
void al_trend_signals_format(unsigned signals, char *buf, size_t cap);

#endif
