/* acidlot command line: the endpoint command (titration curves into
 * endpoint volumes).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "plot.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " endpoint FILE... [-o OUT.csv] [--mode M]\n"
	      "                       [--endpoint-ph PH] [--plots DIR]\n"
	      "Finds the endpoint of each titration curve: FILE has one row\n"
	      "per pH reading, a curve's readings together and in the order\n"
	      "taken. Writes one row per curve, which 'acidlot assay' reads\n"
	      "as it is.\n"
	      "\n"
	      "  -o, --output FILE    the rows per curve (default standard\n"
	      "                       output: a table on a terminal)\n"
	      "      --mode M         fixed (default): the volume at the\n"
	      "                       endpoint pH, between the readings around\n"
	      "                       it (AOAC 942.15); inflection: the steepest\n"
	      "                       rise of the smoothed curve; gran: the\n"
	      "                       zero of the Gran line past the endpoint\n"
	      "      --endpoint-ph PH  for curves without endpoint_ph (default\n"
	      "                       8.1; OIV wine and IFU on request: 7.0)\n"
	      "      --plots DIR      one SVG picture per curve into DIR\n"
	      "      --decimals N     fixed decimals of the volume and pH\n"
	      "                       written (default: every digit, the\n"
	      "                       shortest text that reads back exactly)\n"
	      "      --column NAME=HEADER  read the file's column HEADER as our\n"
	      "                       column NAME (repeatable); the rows\n"
	      "                       written name it NAME\n"
	      "      --columns FILE   such pairs from a CSV name,header\n"
	      "      --delimiter D, --decimal-comma   as for assay; the rows\n"
	      "                       written keep the file's delimiter and\n"
	      "                       decimal sign\n"
	      "  -h, --help           this help\n"
	      "\n"
	      "Input columns:\n"
	      "  required  curve (one titration's id), titrant_ml (cumulative\n"
	      "            mL), ph\n"
	      "  optional  endpoint_ph; for gran volume_ml, or mass_g with\n"
	      "            density_g_ml, and start_ml (water added); any other\n"
	      "            column (product, lot, sample, titrant_mol_l...) is\n"
	      "            carried and must be the same on each reading\n"
	      "Columns written: the carried ones, curve, titrant_ml (the\n"
	      "endpoint), endpoint_ph, mode, readings, curve_flags\n"
	      "(sparse-near-endpoint, endpoint-not-reached, ph-falls, noisy,\n"
	      "starts-above-endpoint, too-few-readings, gran-too-few-readings,\n"
	      "gran-needs-volume, gran-outside-readings).\n"
	      "\n"
	      "Exit status: 0 every curve has an endpoint and no flag; 1 a\n"
	      "curve is flagged or has no endpoint; 2 usage, input or I/O\n"
	      "error (nothing written).\n",
	      out);
}

enum { OPT_MODE = CLI_OPT, OPT_ENDPOINT, OPT_PLOTS, OPT_DELIMITER,
       OPT_DECIMAL_COMMA, OPT_COLUMN, OPT_COLUMNS, OPT_DECIMALS };

static const char *const options[] = {
	"mode", "endpoint-ph", "plots", "delimiter", "decimal-comma!",
	"column", "columns", "decimals", "output=o",
};
_Static_assert(sizeof options / sizeof options[0] ==
		       OPT_DECIMALS - CLI_OPT + 2,
	       "one name for each OPT_ value, then the one with a letter");

#define MAX_COLUMNS 32

struct job {
	const char *output, *plots, *columns_file;
	al_column_alias column_opts[MAX_COLUMNS]; /* --column NAME=HEADER */
	size_t n_column_opts;
	cli_column_map columns;
	al_curves_options copt;
	double decimals;
	al_csv_options csv;
	int table, format_given;
	int argc;
	char **argv;
	FILE *out;
	const char *name; /* of the file being read */
	char *header;	/* the first file's header as written */
	int at_header; /* the next row handed on is a header */
	al_diags diags;
	unsigned long curves, flagged, no_volume;
	plot_set plots_made;
};

/* A column --column may name: the curve reader's or the assay's. */
static int
known_column(const char *name)
{
	return al_curves_is_column(name) || al_assay_is_column(name);
}

static int
one_option(void *ctx, int c, char *text)
{
	struct job *j = ctx;
	const cli_text t[] = {{'o', &j->output},
			      {OPT_PLOTS, &j->plots},
			      {OPT_COLUMNS, &j->columns_file}};
	const cli_range r[] = {
		{OPT_ENDPOINT, "--endpoint-ph", 0, 14, 0,
		 "--endpoint-ph takes a pH from 0 to 14", &j->copt.endpoint_ph,
		 &j->copt.has_endpoint_ph},
		{OPT_DECIMALS, "--decimals", 0, 15, CLI_WHOLE,
		 "--decimals takes a whole number from 0 to 15", &j->decimals,
		 NULL},
	};

	if (c == OPT_MODE) {
		int pick = cli_pick("endpoint", "--mode", text,
				    al_curve_mode_names, 3);

		j->copt.mode = (al_curve_mode)(pick < 0 ? 0 : pick);
		return pick < 0 ? -1 : 1;
	}
	if (c == OPT_DECIMAL_COMMA) {
		j->csv.decimal_point = ',';
		return 1;
	}
	if (c == OPT_DELIMITER) {
		if (cli_delimiter(text, &j->csv.delimiter) == 0)
			return 1;
		return cli_usage_error("endpoint",
				       "--delimiter: '%s' is not ',', ';', tab "
				       "or auto",
				       text),
		       -1;
	}
	if (c == OPT_COLUMN)
		return cli_column_option("endpoint", "--column", text,
					 known_column, j->column_opts,
					 &j->n_column_opts, MAX_COLUMNS);
	return cli_text_option(t, 3, c, text) ||
	       cli_range_option("endpoint", r, 2, c, text);
}

/* One row handed on by the reader: the header (once for every file: each
 * file's must be the first's) or a curve's row, as CSV. */
static al_status
put_row(void *ud, const al_csv_row *row)
{
	struct job *j = ud;
	char delim = row->delimiter ? row->delimiter : ',';
	char *text = NULL;
	size_t len = 0;
	FILE *m = j->out;

	if (j->at_header && (m = open_memstream(&text, &len)) == NULL)
		return AL_ENOMEM;
	for (size_t k = 0; k < row->nfields; k++) {
		char cell[AL_CSV_MAX_FIELD + 1];

		snprintf(cell, sizeof cell, "%.*s", (int)row->lens[k],
			 row->fields[k]);
		if (k > 0)
			fputc(delim, m);
		al_csv_put_field(m, cell, delim);
	}
	fputc('\n', m);
	if (!j->at_header)
		return ferror(m) ? AL_EIO : AL_OK;
	j->at_header = 0;
	if (fclose(m) != 0)
		return free(text), AL_ENOMEM;
	if (j->header == NULL) {
		j->header = text;
		return fputs(text, j->out) < 0 ? AL_EIO : AL_OK;
	}
	if (strcmp(text, j->header) != 0)
		al_diags_add(&j->diags, AL_SEV_ERROR, j->name, row->line, NULL,
			     "the columns differ from the first file's: one "
			     "output has one header");
	free(text);
	return AL_OK;
}

static al_status
curves_row(void *ud, const al_csv_row *row)
{
	return al_curves_row(ud, row);
}

/* Each file's curves, their rows into out; -1 after a message. */
static int
read_files(void *ctx, FILE *out)
{
	struct job *j = ctx;

	j->out = out;
	for (int i = optind; i < j->argc; i++) {
		const char *name = j->argv[i];
		FILE *in = strcmp(name, "-") == 0 ? stdin : cli_open_input(name);
		al_curves *c;
		al_status st;
		unsigned long n, f, v;

		if (in == NULL) {
			cli_error("%s: %s", name, cli_reason(AL_OK));
			return -1;
		}
		j->copt.decimal_point = j->csv.decimal_point;
		j->name = name;
		c = al_curves_new(&j->copt, in == stdin ? "<stdin>" : name,
				  &j->diags);
		j->at_header = 1;
		st = c ? al_csv_read_file(&j->csv, in, in == stdin ? "<stdin>"
								   : name,
					  curves_row, c,
					  &j->diags)
		       : AL_ENOMEM;
		if (st == AL_OK && c)
			st = al_curves_finish(c);
		if (c) {
			al_curves_counts(c, &n, &f, &v);
			j->curves += n;
			j->flagged += f;
			j->no_volume += v;
		}
		al_curves_free(c);
		if (in != stdin)
			fclose(in);
		if (st == AL_ENOMEM || st == AL_EIO) {
			cli_error("%s: %s", name, al_strerror(st));
			return -1;
		}
	}
	cli_print_diags(&j->diags);
	if (j->diags.errors > 0) {
		cli_error("%lu error%s in the input; nothing written",
			  j->diags.errors, j->diags.errors == 1 ? "" : "s");
		return -1;
	}
	return 0;
}

/* No output is an input: 1 when safe, else 0 after a message. */
static int
files_safe(const struct job *j)
{
	const cli_file f[] = {{"-o", j->output, 1}};

	return cli_check_with_inputs("endpoint", f, 1, j->argv + optind,
				     j->argc - optind) == 0 &&
	       cli_distinct_inputs("endpoint", j->argv + optind,
				   j->argc - optind) == 0;
}

/* A curve's picture, when --plots asks. */
static al_status
on_curve(void *ud, const char *id, const al_curve *curve, const double *work,
	 const al_curve_endpoint *e)
{
	struct job *j = ud;

	return plot_curve(&j->plots_made, id, curve, work, e);
}

/* The rows into -o's file, whole or not at all. */
static int
to_file(struct job *j)
{
	al_status st;
	al_outfile *f = al_outfile_open(j->output, &st);
	al_outfile **all[] = {&f};

	if (f == NULL) {
		cli_error("%s: %s", j->output, cli_reason(st));
		return -1;
	}
	if (read_files(j, al_outfile_stream(f)) != 0 ||
	    plot_commit(&j->plots_made) != 0 || cli_commit_all(all, 1) != 0) {
		al_outfile_abort(f);
		return -1;
	}
	return 0;
}

/* The curves read and their rows written (with pictures when asked):
 * 0, or -1 after a message. */
static int
run(struct job *j)
{
	j->copt.aliases = j->columns.all;
	j->copt.n_aliases = j->columns.n;
	if (j->plots)
		j->copt.on_curve = on_curve;
	if (j->output)
		return to_file(j);
	return cli_put_table(cli_is_terminal(), read_files, j) == 0 &&
			       plot_commit(&j->plots_made) == 0
		       ? 0
		       : -1;
}

int
cmd_endpoint(int argc, char **argv)
{
	struct job j;
	int done, rc = EXIT_TROUBLE;

	memset(&j, 0, sizeof j);
	j.argc = argc;
	j.argv = argv;
	j.copt.on_row = put_row;
	j.decimals = -1;
	j.copt.ud = &j;
	done = cli_options_done(cli_options("endpoint", argc, argv, options,
					    sizeof options / sizeof options[0],
					    usage, one_option, &j));
	if (done >= 0)
		return done;
	if (optind >= argc)
		return cli_usage_error("endpoint", "no curve file given");
	j.copt.decimals = (int)j.decimals;
	if (cli_check_decimal_comma("endpoint", &j.csv) != 0)
		return EXIT_TROUBLE;
	if (files_safe(&j) &&
	    cli_column_map_load(&j.columns, "endpoint", "--column",
				j.columns_file, known_column, j.column_opts,
				j.n_column_opts) == 0 &&
	    (j.plots == NULL ||
	     plot_begin(&j.plots_made, j.plots, j.copt.mode) == 0) &&
	    run(&j) == 0) {
		rc = j.flagged || j.no_volume ? EXIT_NOT_PASS : 0;
		fprintf(stderr,
			PROG ": %lu curve%s: %lu with an endpoint, %lu "
			     "flagged\n",
			j.curves, j.curves == 1 ? "" : "s",
			j.curves - j.no_volume, j.flagged);
	}
	plot_abort(&j.plots_made);
	cli_column_map_free(&j.columns);
	free(j.header);
	al_diags_clear(&j.diags);
	return rc;
}
