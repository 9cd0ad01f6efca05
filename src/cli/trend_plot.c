/* acidlot command line: the SVG picture of a trend chart (trend --plot).
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Our own plain layout, readable in grey: the chart's statistic as
 * points joined by a line, the centre as a solid line and the limits
 * dashed, each labelled with its value; a point with a signal drawn as
 * a filled square with its lot above it; dates along the axis. For the
 * individuals chart the moving range is drawn below it. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "trend_plot.h"

#define W 900
#define LEFT 70
#define RIGHT 140
#define PANEL 250 /* a panel's height */
#define GAP 70

struct panel {
	int top;
	double lo, hi; /* the values at the panel's bottom and top */
	size_t n;
};

static double
x_of(const struct panel *p, size_t i)
{
	return LEFT + (p->n > 1 ? (double)i / (double)(p->n - 1) : 0.5) *
			      (W - LEFT - RIGHT);
}

static double
y_of(const struct panel *p, double v)
{
	return p->top + PANEL - (v - p->lo) / (p->hi - p->lo) * PANEL;
}

/* A horizontal line at v with its label at the right. */
static void
level(FILE *out, const struct panel *p, double v, const char *name, int dash)
{
	char num[40];

	al_format_sig(v, 5, num, sizeof num);
	fprintf(out, "<line x1='%d' y1='%.1f' x2='%d' y2='%.1f' stroke='#000'%s/>"
		     "<text x='%d' y='%.1f'>%s%s%s</text>\n",
		LEFT, y_of(p, v), W - RIGHT, y_of(p, v),
		dash ? " stroke-dasharray='6 4'" : "", W - RIGHT + 6,
		y_of(p, v) + 4, name, *name ? " " : "", num);
}

/* One panel: its frame, the series y[0..n) joined, its levels, and the
 * points with a signal (sig non-NULL) marked with their lots. */
static void
panel_draw(FILE *out, const struct panel *p, const char *title,
	   const double *y, const unsigned *sig, const trend_plot_data *d,
	   const double *levels, const char *const *names, size_t n_levels)
{
	fprintf(out, "<rect x='%d' y='%d' width='%d' height='%d' fill='none' "
		     "stroke='#000'/>\n<text x='%d' y='%d' font-size='14'>",
		LEFT, p->top, W - LEFT - RIGHT, PANEL, LEFT, p->top - 10);
	cli_put_xml(out, title);
	fprintf(out, "</text>\n<text x='18' y='%d' text-anchor='middle' "
		     "transform='rotate(-90 18 %d)'>",
		p->top + PANEL / 2, p->top + PANEL / 2);
	cli_put_xml(out, d->unit);
	fputs("</text>\n", out);
	for (size_t k = 0; k < n_levels; k++)
		level(out, p, levels[k], names[k], k > 0);
	fputs("<polyline fill='none' stroke='#555' points='", out);
	for (size_t i = 0; i < p->n; i++)
		if (isfinite(y[i]))
			fprintf(out, "%.1f,%.1f ", x_of(p, i), y_of(p, y[i]));
	fputs("'/>\n", out);
	for (size_t i = 0; i < p->n; i++) {
		if (!isfinite(y[i]))
			continue;
		if (sig && sig[i]) {
			/* lots above and below in turn, so neighbours
			 * do not overprint */
			fprintf(out, "<rect x='%.1f' y='%.1f' width='7' height='7' "
				     "fill='#000'/><text x='%.1f' y='%.1f' "
				     "font-size='10' text-anchor='middle'>",
				x_of(p, i) - 3.5, y_of(p, y[i]) - 3.5, x_of(p, i),
				y_of(p, y[i]) + (i % 2 ? 16 : -8));
			cli_put_xml(out, d->lots[i]);
			fputs("</text>\n", out);
		} else
			fprintf(out, "<circle cx='%.1f' cy='%.1f' r='3' fill='#fff' "
				     "stroke='#000'/>\n",
				x_of(p, i), y_of(p, y[i]));
	}
}

/* The range of the series and levels, widened by a tenth. */
static void
span(struct panel *p, const double *y, const double *levels, size_t n_levels)
{
	double lo = HUGE_VAL, hi = -HUGE_VAL, pad;

	for (size_t i = 0; i < p->n; i++)
		if (isfinite(y[i])) {
			lo = fmin(lo, y[i]);
			hi = fmax(hi, y[i]);
		}
	for (size_t k = 0; k < n_levels; k++) {
		lo = fmin(lo, levels[k]);
		hi = fmax(hi, levels[k]);
	}
	pad = hi > lo ? (hi - lo) / 10 : 1;
	p->lo = lo - pad;
	p->hi = hi + pad;
}

/* Dates under the last panel: about ten of them. */
static void
dates(FILE *out, const struct panel *p, const trend_plot_data *d)
{
	size_t step = p->n > 10 ? (p->n + 9) / 10 : 1;

	for (size_t i = 0; i < p->n; i += step) {
		fprintf(out, "<text x='%.1f' y='%d' font-size='10' "
			     "text-anchor='middle'>",
			x_of(p, i), p->top + PANEL + 16);
		cli_put_xml(out, d->dates[i]);
		fputs("</text>\n", out);
	}
}

int
trend_plot_write(FILE *out, const trend_plot_data *d)
{
	struct panel top = {GAP, 0, 1, d->n}, low = {GAP * 2 + PANEL, 0, 1, d->n};
	int two = d->low != NULL;
	int height = GAP + PANEL + 40 + (two ? PANEL + GAP : 0);

	fprintf(out, "<?xml version='1.0' encoding='UTF-8'?>\n<svg "
		     "xmlns='http://www.w3.org/2000/svg' width='%d' height='%d' "
		     "viewBox='0 0 %d %d' font-family='sans-serif' "
		     "font-size='12'>\n<rect width='%d' height='%d' "
		     "fill='#fff'/>\n<text x='%d' y='24' font-size='16'>",
		W, height, W, height, W, height, LEFT);
	cli_put_xml(out, d->title);
	fputs("</text>\n", out);
	span(&top, d->top, d->top_levels, d->n_top_levels);
	panel_draw(out, &top, d->top_title, d->top, d->signals, d,
		   d->top_levels, d->top_names, d->n_top_levels);
	if (two) {
		span(&low, d->low, d->low_levels, d->n_low_levels);
		panel_draw(out, &low, d->low_title, d->low, NULL, d,
			   d->low_levels, d->low_names, d->n_low_levels);
	}
	dates(out, two ? &low : &top, d);
	fputs("</svg>\n", out);
	return ferror(out) ? -1 : 0;
}
