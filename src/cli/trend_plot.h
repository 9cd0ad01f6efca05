/* acidlot command line: the SVG picture of a trend chart.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_TREND_PLOT_H
#define ACIDLOT_CLI_TREND_PLOT_H

#include <stdio.h>

/* What the picture shows: a top panel (the chart's statistic, its
 * levels: centre first, then the limits) and, for the individuals
 * chart, a lower one (the moving range). */
typedef struct trend_plot_data {
	const char *title, *top_title, *low_title;
	const char *unit; /* along the vertical axes */
	size_t n;
	const double *top, *low; /* low NULL: one panel; NAN: no point */
	const unsigned *signals; /* per point, 0 for none */
	const char *const *lots, *const *dates;
	const double *top_levels, *low_levels;
	const char *const *top_names, *const *low_names;
	size_t n_top_levels, n_low_levels;
} trend_plot_data;

/* The picture into out: 0, or -1 on a write error. */
int trend_plot_write(FILE *out, const trend_plot_data *d);

#endif
