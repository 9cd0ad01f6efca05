/* acidlot command line: the trend command (control charts of a
 * product's stored results).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "db.h"
#include "store.h"
#include "trend_plot.h"
#include "trend_reports.h"
#include "workbook.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " trend --store DB --product P [OPTION]...\n"
	      "       " PROG " trend REPORT.csv... --product P [OPTION]...\n"
	      "A control chart of a product's results in the lab's store, one\n"
	      "point per result in date order (then run, then report order),\n"
	      "or in earlier reports (file and row order), with the Nelson\n"
	      "run rules (Nelson 1984) on every point.\n"
	      "\n"
	      "      --store DB         the results store (assay --store)\n"
	      "      --product P        the product\n"
	      "      --quantity Q       mean (default), sd or rsd_pct\n"
	      "      --from DATE, --to DATE   results dated so (YYYY-MM-DD)\n"
	      "      --chart C          imr (default): individuals, centre\n"
	      "                         +/- 3 sigma, and moving range (UCL\n"
	      "                         3.267 MR-bar); ewma; cusum\n"
	      "      --target X --sigma S  centre and sigma of a check standard\n"
	      "                         (else from the baseline: mean, mean\n"
	      "                         moving range / 1.128)\n"
	      "      --baseline N       the first N points set centre and sigma\n"
	      "                         (default all)\n"
	      "      --lambda L         EWMA weight (default 0.2)\n"
	      "      --width W          EWMA limits in sigmas (default 3)\n"
	      "      --cusum-k K        CUSUM reference value, sigmas (0.5)\n"
	      "      --cusum-h H        CUSUM decision interval, sigmas (5)\n"
	      "  -o, --output FILE      the points as CSV (default standard\n"
	      "                         output: a table on a terminal)\n"
	      "      --summary FILE     centre, sigmas, Cp, Cpk, Pp, Ppk (CSV)\n"
	      "      --xlsx FILE        the points and the summary as one\n"
	      "                         workbook, numbers to the last digit\n"
	      "      --plot FILE        the chart as an SVG picture\n"
	      "      --format F         table (aligned columns) or csv; default\n"
	      "                         table on a terminal, csv into a pipe\n"
	      "  -h, --help             this help\n"
	      "\n"
	      "Columns: seq, lot, sample, date, value, centre, lcl, ucl (of the\n"
	      "chart's statistic: the individuals, the EWMA, or 0 and H for\n"
	      "CUSUM), then mr, mr_ucl (imr), ewma (ewma) or cusum_hi,\n"
	      "cusum_lo (cusum), then signals (nelson-1 ... nelson-8,\n"
	      "ewma-high, ewma-low, cusum-high, cusum-low).\n"
	      "\n"
	      "Exit status: 0 no signal; 1 at least one signal; 2 usage,\n"
	      "input or store error, or fewer than 2 points.\n",
	      out);
}

enum { OPT_STORE = CLI_OPT, OPT_PRODUCT, OPT_QUANTITY, OPT_FROM, OPT_TO,
       OPT_CHART, OPT_TARGET, OPT_SIGMA, OPT_BASELINE, OPT_LAMBDA, OPT_WIDTH,
       OPT_CUSUM_K, OPT_CUSUM_H, OPT_SUMMARY, OPT_PLOT, OPT_FORMAT,
       OPT_XLSX };

static const char *const options[] = {
	"store", "product", "quantity", "from", "to", "chart", "target",
	"sigma", "baseline", "lambda", "width", "cusum-k", "cusum-h",
	"summary", "plot", "format", "xlsx", "output=o",
};
_Static_assert(sizeof options / sizeof options[0] ==
		       OPT_XLSX - CLI_OPT + 2,
	       "one name for each OPT_ value, then the one with a letter");

enum { CHART_IMR, CHART_EWMA, CHART_CUSUM };

struct job {
	const char *store, *product, *quantity, *from, *to, *output,
		*summary, *plot, *xlsx;
	int chart, has_sigma;
	int digits; /* significant digits of the numbers written */
	int table; /* -1 until --format or the terminal says */
	int shown_table; /* the points go to a person as a table */
	double baseline;
	al_trend_params p;
	store_point *points;
	size_t n;
	al_trend_limits lim;
	al_trend_point *chart_points;
	unsigned long signalled;
};

static int
one_option(void *ctx, int c, char *text)
{
	static const char *const charts[] = {"imr", "ewma", "cusum"};
	struct job *j = ctx;
	const cli_text t[] = {
		{OPT_STORE, &j->store},	    {OPT_PRODUCT, &j->product},
		{OPT_QUANTITY, &j->quantity}, {OPT_FROM, &j->from},
		{OPT_TO, &j->to},	    {'o', &j->output},
		{OPT_SUMMARY, &j->summary}, {OPT_PLOT, &j->plot},
		{OPT_XLSX, &j->xlsx},
	};
	const cli_range r[] = {
		{OPT_TARGET, "--target", -HUGE_VAL, HUGE_VAL, 0,
		 "--target: %s is not a number", &j->p.target,
		 &j->p.has_target},
		{OPT_SIGMA, "--sigma", 0, HUGE_VAL, CLI_ABOVE,
		 "--sigma must be above 0", &j->p.sigma, &j->has_sigma},
		{OPT_BASELINE, "--baseline", 1, 1e9, CLI_ABOVE | CLI_WHOLE,
		 "--baseline takes a whole number of 2 or more", &j->baseline,
		 NULL},
		{OPT_LAMBDA, "--lambda", 0, 1, CLI_ABOVE,
		 "--lambda takes a weight above 0, at most 1", &j->p.lambda,
		 NULL},
		{OPT_WIDTH, "--width", 0, HUGE_VAL, CLI_ABOVE,
		 "--width must be above 0", &j->p.width, NULL},
		{OPT_CUSUM_K, "--cusum-k", 0, HUGE_VAL, 0,
		 "--cusum-k must be 0 or more", &j->p.cusum_k, NULL},
		{OPT_CUSUM_H, "--cusum-h", 0, HUGE_VAL, CLI_ABOVE,
		 "--cusum-h must be above 0", &j->p.cusum_h, NULL},
	};

	if (c == OPT_FORMAT) {
		int pick = cli_choice("trend", "--format", text, "table", "csv");

		j->table = pick == 0;
		return pick < 0 ? -1 : 1;
	}
	if (c == OPT_CHART) {
		j->chart = cli_pick("trend", "--chart", text, charts, 3);
		return j->chart < 0 ? -1 : 1;
	}
	return cli_text_option(t, sizeof t / sizeof t[0], c, text) ||
	       cli_range_option("trend", r, sizeof r / sizeof r[0], c, text);
}

/* The signals of point i that the chart shows: the run rules and its
 * own. */
static unsigned
shown(const struct job *j, size_t i)
{
	static const unsigned own[] = {
		0, AL_TREND_EWMA_HIGH | AL_TREND_EWMA_LOW,
		AL_TREND_CUSUM_HIGH | AL_TREND_CUSUM_LOW};

	return j->chart_points[i].signals & (0xffu | own[j->chart]);
}

/* The points as CSV into out (the rows of one chart). */
static int
put_points(void *ctx, FILE *out)
{
	struct job *j = ctx;
	int digits = j->digits;
	static const char *const tail[] = {"mr,mr_ucl", "ewma",
					   "cusum_hi,cusum_lo"};
	fprintf(out, "seq,lot,sample,date,value,centre,lcl,ucl,%s,signals\n",
		tail[j->chart]);
	j->signalled = 0;
	for (size_t i = 0; i < j->n; i++) {
		const al_trend_point *q = &j->chart_points[i];
		const al_trend_limits *l = &j->lim;
		unsigned sig = shown(j, i);
		double lo = l->lcl, hi = l->ucl;
		char names[256], v[8][40];

		if (j->chart == CHART_EWMA) {
			lo = q->ewma_lcl;
			hi = q->ewma_ucl;
		} else if (j->chart == CHART_CUSUM) {
			lo = 0;
			hi = j->p.cusum_h * l->sigma;
		}
		al_format_sig(q->value, digits, v[0], sizeof v[0]);
		al_format_sig(l->centre, digits, v[1], sizeof v[1]);
		al_format_sig(lo, digits, v[2], sizeof v[2]);
		al_format_sig(hi, digits, v[3], sizeof v[3]);
		al_format_sig(j->chart == CHART_IMR ? q->mr
			      : j->chart == CHART_EWMA ? q->ewma
						       : q->cusum_hi,
			      digits, v[4], sizeof v[4]);
		al_format_sig(j->chart == CHART_IMR ? l->mr_ucl : q->cusum_lo,
			      digits, v[5], sizeof v[5]);
		al_trend_signals_format(sig, names, sizeof names);
		j->signalled += sig != 0;
		fprintf(out, "%zu,", i + 1);
		al_csv_put_field(out, j->points[i].lot, ',');
		fputc(',', out);
		al_csv_put_field(out, j->points[i].sample, ',');
		fprintf(out, ",%s,%s,%s,%s,%s,", j->points[i].date, v[0], v[1],
			v[2], v[3]);
		if (j->chart == CHART_IMR)
			fprintf(out, "%s,%s,", q->has_mr ? v[4] : "", v[5]);
		else if (j->chart == CHART_EWMA)
			fprintf(out, "%s,", v[4]);
		else
			fprintf(out, "%s,%s,", v[4], v[5]);
		fprintf(out, "%s\n", names);
	}
	return ferror(out) ? -1 : 0;
}

/* A number for the summary, "" when not a number. */
static const char *
num(double v, int has, int digits, char *buf, size_t cap)
{
	if (!has || !isfinite(v))
		return "";
	al_format_sig(v, digits, buf, cap);
	return buf;
}

/* The summary row: capability against the latest result's limits. */
static int
put_summary(void *ctx, FILE *out)
{
	const struct job *j = ctx;
	const store_point *last = &j->points[j->n - 1];
	al_trend_capability c;
	double *x = al_malloc(j->n * sizeof *x);
	char b[9][40];
	int d = j->digits;

	if (x == NULL)
		return -1;
	for (size_t i = 0; i < j->n; i++)
		x[i] = j->points[i].value;
	al_trend_capability_of(x, j->n, j->lim.centre, j->lim.sigma,
			       last->has_min, last->spec_min, last->has_max,
			       last->spec_max, &c);
	al_free(x);
	fputs("product,quantity,n,centre,sigma_within,sigma_overall,spec_min,"
	      "spec_max,cp,cpk,pp,ppk,points_signalled\n",
	      out);
	al_csv_put_field(out, j->product, ',');
	fprintf(out, ",%s,%zu,%s,%s,%s,%s,%s,%s,%s,%s,%s,%lu\n", j->quantity,
		j->n, num(j->lim.centre, 1, d, b[0], 40),
		num(j->lim.sigma, 1, d, b[1], 40),
		num(c.sigma_overall, 1, d, b[2], 40),
		num(last->spec_min, last->has_min, d, b[3], 40),
		num(last->spec_max, last->has_max, d, b[4], 40),
		num(c.cp, c.has_cp, d, b[5], 40),
		num(c.cpk, c.has_cpk, d, b[6], 40),
		num(c.pp, c.has_cp, d, b[7], 40),
		num(c.ppk, c.has_cpk, d, b[8], 40),
		j->signalled);
	return ferror(out) ? -1 : 0;
}

/* The product's points from the store and their chart; -1 after a
 * message. */
static int
load(struct job *j, int argc, char **argv)
{
	store *s;
	double *x;
	al_status st;
	int rc;

	if (j->store) {
		if ((s = store_open(j->store, 0)) == NULL)
			return -1;
		rc = store_points(s, j->product, j->quantity, j->from, j->to,
				  &j->points, &j->n);
		store_close(s);
	} else
		rc = trend_reports_read(argv + optind, argc - optind,
					j->product, j->quantity, &j->points,
					&j->n);
	if (rc != 0)
		return -1;
	if (j->n < 2) {
		cli_error("%s: %zu result%s of product '%s'%s: a chart needs 2 "
			  "or more",
			  j->store ? j->store : argv[optind], j->n,
			  j->n == 1 ? "" : "s", j->product,
			  j->from || j->to ? " in those dates" : "");
		return -1;
	}
	x = al_malloc(j->n * sizeof *x);
	j->chart_points = al_calloc(j->n, sizeof *j->chart_points);
	if (x == NULL || j->chart_points == NULL) {
		al_free(x);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	for (size_t i = 0; i < j->n; i++)
		x[i] = j->points[i].value;
	j->p.baseline = (size_t)j->baseline;
	st = al_trend_chart(x, j->n, &j->p, &j->lim, j->chart_points);
	al_free(x);
	if (st != AL_OK) {
		cli_error("no chart: %s",
			  j->p.baseline > j->n ? "the baseline is longer than "
						 "the points"
						: "sigma is 0 (every baseline "
						  "point the same)");
		return -1;
	}
	return 0;
}

/* The unit of the latest point (results of a product may change unit
 * with its specification; the latest names the axis). */
static const char *
last_unit(const struct job *j)
{
	return j->points[j->n - 1].unit;
}

/* The picture: the chart's statistic above (and the moving range, or
 * C-, below). 0, or -1. */
static int
put_plot(const struct job *j, FILE *out)
{
	static const char *const names[3][3] = {
		{"centre", "UCL", "LCL"}, {"target", "UCL", "LCL"},
		{"", "H", ""}};
	static const char *const mr_names[2] = {"MR-bar", "UCL"};
	const al_trend_limits *l = &j->lim;
	const al_trend_point *last = &j->chart_points[j->n - 1];
	double *top = al_calloc(2 * j->n, sizeof *top), *low = top + j->n;
	unsigned *sig = al_calloc(j->n, sizeof *sig);
	const char **lots = al_calloc(2 * j->n, sizeof *lots),
		   **dates = lots + j->n;
	double levels[3] = {l->centre, l->ucl, l->lcl};
	double low_levels[2] = {l->mr_bar, l->mr_ucl};
	char title[256], unit[32];
	trend_plot_data d;
	int rc;

	if (top == NULL || sig == NULL || lots == NULL) {
		AL_FREE_ALL(top, sig, lots);
		return -1;
	}
	for (size_t i = 0; i < j->n; i++) {
		const al_trend_point *q = &j->chart_points[i];

		top[i] = j->chart == 0 ? q->value
			 : j->chart == 1 ? q->ewma
					 : q->cusum_hi;
		low[i] = j->chart == 0 ? (q->has_mr ? q->mr : NAN) : q->cusum_lo;
		sig[i] = shown(j, i);
		lots[i] = j->points[i].lot;
		dates[i] = j->points[i].date;
	}
	if (j->chart == 1) {
		levels[1] = last->ewma_ucl;
		levels[2] = last->ewma_lcl;
	} else if (j->chart == 2) {
		levels[0] = 0;
		levels[1] = low_levels[1] = j->p.cusum_h * l->sigma;
		low_levels[0] = 0;
	}
	snprintf(title, sizeof title, "%s: %s of each result", j->product,
		 j->quantity);
	snprintf(unit, sizeof unit, "%s", strcmp(j->quantity, "rsd_pct") == 0
						  ? "%"
						  : last_unit(j));
	d = (trend_plot_data){
		.title = title,
		.unit = unit,
		.top_title = j->chart == 0   ? "individuals"
			     : j->chart == 1 ? "EWMA"
					     : "CUSUM, upper (C+)",
		.low_title = j->chart == 0 ? "moving range" : "CUSUM, lower (C-)",
		.n = j->n,
		.top = top,
		.low = j->chart == 1 ? NULL : low,
		.signals = sig,
		.lots = lots,
		.dates = dates,
		.top_levels = levels,
		.low_levels = low_levels,
		.top_names = names[j->chart],
		.low_names = j->chart == 0 ? mr_names : names[2],
		.n_top_levels = j->chart == 2 ? 2 : 3,
		.n_low_levels = 2,
	};
	rc = trend_plot_write(out, &d);
	AL_FREE_ALL(top, sig, lots);
	return rc;
}

/* The points and the summary as one workbook, their numbers to the
 * last digit (17 significant): 0, or -1 after a message. */
static int
put_book(struct job *j, al_outfile *f)
{
	char *text[2] = {NULL, NULL};
	size_t len[2] = {0, 0};
	int keep = j->digits, bad;
	const char *unit = strcmp(j->quantity, "rsd_pct") == 0 ? "%"
			   : *last_unit(j)			     ? last_unit(j)
								     : NULL;
	wbook *w;

	j->digits = 17;
	bad = cli_capture(put_points, j, &text[0], &len[0]) != 0 ||
	      cli_capture(put_summary, j, &text[1], &len[1]) != 0;
	j->digits = keep;
	if (!bad) {
		w = wbook_new(al_outfile_written_path(f), j->xlsx);
		bad = w == NULL ||
		      wbook_csv_sheet(w, "points", text[0], len[0], unit) != 0 ||
		      wbook_csv_sheet(w, "summary", text[1], len[1], unit) != 0;
		bad |= wbook_close(w) != 0;
	}
	free(text[0]);
	free(text[1]);
	return bad || al_outfile_prepare(f) != AL_OK ? -1 : 0;
}

/* The points and the summary into their files (or the points on
 * standard output), whole or not at all. */
static int
write_all(struct job *j)
{
	al_status st;
	al_outfile *o = NULL, *s = NULL, *pic = NULL, *book = NULL;
	al_outfile **all[] = {&o, &s, &pic, &book};
	int bad = 0;

	j->shown_table = j->output == NULL &&
			 (j->table < 0 ? cli_is_terminal() : j->table);
	/* a table is read by a person: 5 significant digits; CSV keeps 10 */
	j->digits = j->shown_table ? 5 : 10;
	if (j->output == NULL)
		bad = cli_put_table(j->shown_table, put_points, j) != 0;
	else if ((o = al_outfile_open(j->output, &st)) == NULL ||
		 put_points(j, al_outfile_stream(o)) != 0 ||
		 al_outfile_prepare(o) != AL_OK)
		bad = 1;
	if (!bad && j->summary &&
	    ((s = al_outfile_open(j->summary, &st)) == NULL ||
	     put_summary(j, al_outfile_stream(s)) != 0 ||
	     al_outfile_prepare(s) != AL_OK))
		bad = 1;
	if (!bad && j->plot &&
	    ((pic = al_outfile_open(j->plot, &st)) == NULL ||
	     put_plot(j, al_outfile_stream(pic)) != 0 ||
	     al_outfile_prepare(pic) != AL_OK))
		bad = 1;
	if (bad)
		cli_error("%s", cli_reason(AL_OK));
	if (!bad && j->xlsx && (book = al_outfile_open(j->xlsx, &st)) == NULL) {
		cli_error("%s: %s", j->xlsx, cli_reason(st));
		bad = 1;
	}
	if (!bad && book && put_book(j, book) != 0)
		bad = 1;
	if (bad || cli_commit_all(all, 4) != 0) {
		al_outfile_abort(o);
		al_outfile_abort(s);
		al_outfile_abort(pic);
		al_outfile_abort(book);
		return -1;
	}
	return 0;
}

/* Refuses an output that is the store, a report read or another
 * output, before anything is read or written. */
static int
outputs_safe(const struct job *j, int argc, char **argv)
{
	const cli_file f[] = {
		{"-o", j->output, 1},
		{"--summary", j->summary, 1},
		{"--plot", j->plot, 1},
		{"--xlsx", j->xlsx, 1},
		{"--store", j->store && !db_is_postgresql(j->store) ? j->store
								   : NULL,
		 0},
	};

	return cli_check_with_inputs("trend", f, sizeof f / sizeof f[0],
				     argv + optind, argc - optind) == 0;
}

int
cmd_trend(int argc, char **argv)
{
	struct job j;
	int done, rc = EXIT_TROUBLE;

	memset(&j, 0, sizeof j);
	j.quantity = "mean";
	j.table = -1;
	al_trend_params_default(&j.p);
	done = cli_options_done(cli_options("trend", argc, argv, options,
					    sizeof options / sizeof options[0],
					    usage, one_option, &j));
	if (done >= 0)
		return done;
	if (j.product == NULL || (j.store == NULL) == (optind >= argc))
		return cli_usage_error("trend", "give --product P and either "
						"--store DB or report CSVs");
	if (j.store == NULL && (j.from || j.to))
		return cli_usage_error("trend", "--from and --to need --store (a "
						"report has no dates)");
	if (j.p.has_target != j.has_sigma)
		return cli_usage_error("trend", "--target and --sigma go together");
	if (outputs_safe(&j, argc, argv) && load(&j, argc, argv) == 0 &&
	    write_all(&j) == 0) {
		rc = j.signalled ? EXIT_NOT_PASS : 0;
		fprintf(stderr, PROG ": %zu points of %s, %lu with a signal\n", j.n,
			j.product, j.signalled);
	}
	al_free(j.points);
	al_free(j.chart_points);
	return rc;
}
