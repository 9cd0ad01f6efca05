/* acidlot command line: the assay command.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "assay_cli.h"

/* A replicate into the replicates file and the store, as asked. */
static al_status
take_replicate(void *ud, const al_replicate *rep)
{
	struct job *j = ud;

	if (j->rep_out &&
	    al_replicates_row(j->reps.out, rep, j->reps.ropt) != AL_OK)
		return AL_EIO;
	if (j->stored.store &&
	    store_add_replicate(j->stored.store, rep) != 0)
		return AL_EIO;
	if (j->book && assay_book_replicate(j, rep) != AL_OK)
		return AL_ENOMEM;
	return AL_OK;
}

static al_status
write_reject(void *ud, const char *file, unsigned long line,
	     const char *reason, const char *raw, size_t raw_len)
{
	struct job *j = ud;

	j->rejs.count++;
	if (j->book && assay_book_reject(j, file, line, reason, raw,
					 raw_len) != AL_OK)
		return AL_ENOMEM;
	return al_rejects_row(j->rejs.out, file, line, reason, raw, raw_len,
			      j->rejs.ropt);
}

enum {
	OPT_ACID = CLI_OPT, OPT_UNIT, OPT_BLANK, OPT_TITRANT, OPT_DENSITY,
	OPT_ENDPOINT, OPT_DECIMALS, OPT_REJECTS, OPT_DELIMITER,
	OPT_DECIMAL_COMMA, OPT_COLUMN, OPT_COLUMNS, OPT_SHEET, OPT_BOM,
	OPT_RAW_TEXT, OPT_TITRANTS, OPT_RECORD, OPT_ANALYST, OPT_DECISION,
	OPT_EXCLUDE, OPT_BUDGET, OPT_TITRANT_U, OPT_BURETTE, OPT_BALANCE, OPT_K,
	OPT_BASIS, OPT_RESOLUTION, OPT_WATER_U, OPT_FORMAT, OPT_DATE_FORMAT,
	OPT_SPEC_COLUMN, OPT_SPEC_COLUMNS, OPT_ROUND, OPT_ENDPOINT_MODE,
	OPT_STORE, OPT_RERUN, OPT_XLSX
};

/* The long options, in the order of the OPT_ values (cli_options). */
static const char *const options[] = {
	"acid", "unit", "blank-ml", "titrant-mol-l", "density-g-ml",
	"endpoint-ph", "decimals", "rejects", "delimiter", "decimal-comma!",
	"column", "columns", "sheet-style", "bom!", "raw-text!", "titrants",
	"record", "analyst", "decision", "exclude-outliers!", "budget",
	"titrant-u", "burette-tol-ml", "balance-linearity-g", "k", "basis",
	"resolution-ml", "water-u-pct", "format", "date-format", "spec-column",
	"spec-columns", "round", "endpoint-mode", "store", "rerun", "xlsx", "spec=s", "output=o", "replicates=r",
};
_Static_assert(sizeof options / sizeof options[0] ==
		       OPT_XLSX - CLI_OPT + 4,
	       "one name for each OPT_ value, then the three with a letter");

/* The options with a number, their ranges and where they go. */
static int
number_option(struct args *a, int c)
{
	al_assay_options *o = &a->aopt;
	const cli_range t[] = {
		{OPT_BLANK, "--blank-ml", 0, HUGE_VAL, 0,
		 "--blank-ml must not be negative", &o->blank_ml, &o->has_blank},
		{OPT_TITRANT, "--titrant-mol-l", 0, HUGE_VAL, CLI_ABOVE,
		 "--titrant-mol-l must be above 0", &o->titrant_mol_l,
		 &o->has_titrant},
		{OPT_DENSITY, "--density-g-ml", 0, HUGE_VAL, CLI_ABOVE,
		 "--density-g-ml must be above 0", &o->density_g_ml,
		 &o->has_density},
		{OPT_ENDPOINT, "--endpoint-ph", 0, 14, 0,
		 "--endpoint-ph must be from 0 to 14", &o->endpoint_ph,
		 &o->has_endpoint},
		{OPT_DECIMALS, "--decimals", 0, 15, CLI_WHOLE,
		 "--decimals takes a whole number from 0 to 15, or full",
		 &a->decimals, &a->has_decimals},
		{OPT_TITRANT_U, "--titrant-u", 0, 1, CLI_BELOW,
		 "--titrant-u is a standard uncertainty in mol/L, from 0 to 1",
		 &o->qc.titrant_u, &o->qc.has_titrant_u},
		{OPT_BURETTE, "--burette-tol-ml", 0, 100, CLI_ABOVE | CLI_BELOW,
		 "--burette-tol-ml: %s is not above 0 and below 100",
		 &o->qc.burette_tol_ml, NULL},
		{OPT_BALANCE, "--balance-linearity-g", 0, 100,
		 CLI_ABOVE | CLI_BELOW,
		 "--balance-linearity-g: %s is not above 0 and below 100",
		 &o->qc.balance_linearity_g, NULL},
		{OPT_K, "--k", 0, 100, CLI_ABOVE | CLI_BELOW,
		 "--k: %s is not above 0 and below 100", &o->qc.k, NULL},
		{OPT_RESOLUTION, "--resolution-ml", 0, 1, 0,
		 "--resolution-ml takes 0 to 1 mL", &o->qc.resolution_ml,
		 &o->qc.has_resolution},
		{OPT_WATER_U, "--water-u-pct", 0, 10, 0,
		 "--water-u-pct takes 0 to 10 % w/w", &o->qc.water_u_pct,
		 &o->qc.has_water_u},
	};

	return cli_range_option("assay", t, sizeof t / sizeof t[0], c, optarg);
}

/* The options with a text, kept as given. */
static int
text_option(struct args *a, int c)
{
	const cli_text t[] = {
		{'s', &a->spec},	     {'o', &a->output},
		{'r', &a->replicates},	     {OPT_REJECTS, &a->rejects},
		{OPT_ACID, &a->acid},	     {OPT_UNIT, &a->unit},
		{OPT_COLUMNS, &a->columns_file}, {OPT_TITRANTS, &a->titrants},
		{OPT_RECORD, &a->record},    {OPT_ANALYST, &a->analyst},
		{OPT_BUDGET, &a->budget},
		{OPT_SPEC_COLUMNS, &a->spec_columns_file},
		{OPT_STORE, &a->stored_path},	{OPT_RERUN, &a->rerun},
		{OPT_XLSX, &a->xlsx},
	};

	return cli_text_option(t, sizeof t / sizeof t[0], c, optarg);
}

/* --decision simple | guarded[:R]: 1, or -1 after a usage error. */
static int
decision_option(struct args *a, const char *text)
{
	al_qc_options *qc = &a->aopt.qc;
	double v = 1;

	if (strcmp(text, "simple") == 0) {
		qc->decision = AL_DECISION_SIMPLE;
		return 1;
	}
	if (strncmp(text, "guarded", 7) != 0 ||
	    (text[7] != '\0' && text[7] != ':'))
		return cli_usage_error("assay", "--decision takes simple or "
						"guarded[:R]"),
		       -1;
	if (text[7] == ':' &&
	    (al_number_parse(text + 8, strlen(text + 8), '.', &v) !=
		     AL_NUM_OK ||
	     !(v > 0 && v <= 10)))
		return cli_usage_error("assay", "--decision guarded:R takes R "
						"above 0 and at most 10"),
		       -1;
	qc->decision = AL_DECISION_GUARDED;
	qc->guard_r = v;
	return 1;
}

/* The options that take a word from a list, or no value: 1 when c is
 * one (-1 after a usage error), else 0. */
static int
word_option(struct args *a, int c, const char *text)
{
	int pick;
	al_report_options *r = &a->ropt;

	switch (c) {
	case OPT_SHEET:
		if ((pick = cli_choice("assay", "--sheet-style", text, "plain",
				       "eu")) < 0)
			return -1;
		r->bom = r->decimal_comma = pick;
		r->delimiter = pick ? ';' : ',';
		return 1;
	case OPT_BASIS:
		if ((pick = cli_choice("assay", "--basis", text, "as-is",
				       "anhydrous")) < 0)
			return -1;
		a->aopt.anhydrous = pick;
		return 1;
	case OPT_DELIMITER:
		if (cli_delimiter(text, &a->aopt.csv.delimiter))
			return cli_usage_error("assay",
					       "--delimiter: '%s' is not ',', "
					       "';', tab or auto",
					       text),
			       -1;
		return 1;
	case OPT_DECISION:
		return decision_option(a, text);
	case OPT_DATE_FORMAT:
		if ((pick = cli_pick("assay", "--date-format", text,
				     al_date_order_names, 4)) < 0)
			return -1;
		a->aopt.date_order = (al_date_order)pick;
		return 1;
	case OPT_ENDPOINT_MODE:
		if ((pick = cli_pick("assay", "--endpoint-mode", text,
				     al_curve_mode_names, 3)) < 0)
			return -1;
		a->aopt.endpoint_mode = (al_curve_mode)pick;
		return 1;
	case OPT_ROUND:
		if ((pick = cli_choice("assay", "--round", text, "u", "none")) < 0)
			return -1;
		r->round_u = pick == 0;
		return 1;
	case OPT_FORMAT:
		if ((pick = cli_choice("assay", "--format", text, "table",
				       "csv")) < 0)
			return -1;
		a->format = pick ? FORMAT_CSV : FORMAT_TABLE;
		return 1;
	case OPT_DECIMAL_COMMA:
		a->aopt.csv.decimal_point = ',';
		return 1;
	case OPT_BOM:
		r->bom = 1;
		return 1;
	case OPT_RAW_TEXT:
		r->raw_text = 1;
		return 1;
	case OPT_EXCLUDE:
		a->aopt.qc.exclude_outliers = 1;
		return 1;
	}
	return 0;
}

/* One option of the command: 1 taken, 0 not one, -1 a usage error. */
static int
one_option(void *ctx, int c, char *text)
{
	struct args *a = ctx;
	int got = text_option(a, c);

	/* every digit of every number: 17 significant, each reading back
	 * as the very double the run computed */
	if (c == OPT_DECIMALS && strcmp(text, "full") == 0) {
		a->decimals_full = 1;
		return 1;
	}
	if (got == 0)
		got = number_option(a, c);
	if (got == 0)
		got = word_option(a, c, text);
	if (got == 0 && c == OPT_COLUMN)
		got = cli_column_option("assay", "--column", text,
					al_assay_is_column, a->column_opts,
					&a->n_column_opts, MAX_COLUMN_OPTS);
	if (got == 0 && c == OPT_SPEC_COLUMN)
		got = cli_column_option("assay", "--spec-column", text,
					al_spec_is_column, a->spec_columns,
					&a->n_spec_columns, MAX_COLUMN_OPTS);
	return got;
}

/* 0 to go on, 1 after --help, -1 after a usage error. */
static int
parse_args(int argc, char **argv, struct args *a)
{
	int got = cli_options("assay", argc, argv, options,
			      sizeof options / sizeof options[0], assay_usage,
			      one_option, a);

	if (got != 0)
		return got;
	if (a->has_decimals)
		a->ropt.decimals = (int)a->decimals;
	if (a->decimals_full)
		a->ropt.decimals = AL_DECIMALS_EXACT;
	/* a person at a terminal reads a table; a file or pipe gets CSV */
	if (a->format == FORMAT_AUTO)
		a->format = (a->output == NULL || strcmp(a->output, "-") == 0) &&
				    cli_is_terminal()
			    ? FORMAT_TABLE
			    : FORMAT_CSV;
	if (optind >= argc)
		return cli_usage_error("assay", "no titration file given"), -1;
	if (cli_distinct_inputs("assay", argv + optind, argc - optind))
		return -1;
	return cli_check_decimal_comma("assay", &a->aopt.csv) ? -1 : 0;
}
/* Refuses an output that is an input or another output (the record's
 * default name included), before anything is read. */
static int
outputs_safe(const struct args *a, int argc, char **argv)
{
	char record[4096];
	int file_report = a->output && strcmp(a->output, "-") != 0;
	cli_file f[11];
	size_t n = 0;

	f[n++] = (cli_file){"-o", a->output, 1};
	f[n++] = (cli_file){"--replicates", a->replicates, 1};
	f[n++] = (cli_file){"--rejects", a->rejects, 1};
	f[n++] = (cli_file){"--budget", a->budget, 1};
	f[n++] = (cli_file){"--xlsx", a->xlsx, 1};
	if (a->record || file_report) {
		snprintf(record, sizeof record, "%s.record.json", a->output);
		f[n++] = (cli_file){a->record ? "--record" : "the record",
				    a->record ? a->record : record, 1};
	}
	f[n++] = (cli_file){"--spec", a->spec, 0};
	f[n++] = (cli_file){"--columns", a->columns_file, 0};
	f[n++] = (cli_file){"--spec-columns", a->spec_columns_file, 0};
	f[n++] = (cli_file){"--store", a->stored_path, 1};
	f[n++] = (cli_file){"--titrants", a->titrants, 0};
	return cli_check_with_inputs("assay", f, n, argv + optind,
				     argc - optind) == 0;
}

/* Opens an output and writes its header; NULL after a message. */
static al_outfile *
open_output(const char *path, al_status (*header)(FILE *, al_report_options *),
	    al_report_options *ropt)
{
	al_status st;
	al_outfile *f = al_outfile_open(path, &st);

	if (f == NULL) {
		cli_error("%s: %s", path,
			  cli_reason(st));
		return NULL;
	}
	if (header && header(al_outfile_stream(f), ropt) != AL_OK) {
		cli_error("%s: %s", path, cli_reason(AL_OK));
		al_outfile_abort(f);
		return NULL;
	}
	return f;
}

/* An error message for a status; -1. */
static int
failed(const char *what, al_status st)
{
	if (what)
		cli_error("%s: %s", what, cli_reason(st));
	else
		cli_error("%s", al_strerror(st));
	return -1;
}

/* The specification, the column map and the titrant register, each
 * hashed into the record. */
static int
load_lookups(struct job *j)
{
	struct args *a = &j->a;
	size_t n;

	if (cli_column_map_load(&j->columns, "assay", "--column",
				a->columns_file, al_assay_is_column,
				a->column_opts, a->n_column_opts) != 0 ||
	    (a->columns_file &&
	     record_hash_input(&j->rec, "column map", a->columns_file, -1)))
		return -1;
	a->aopt.aliases = j->columns.all;
	a->aopt.n_aliases = j->columns.n;
	if (a->spec) {
		if (cli_column_map_load(&j->spec_columns, "assay",
					"--spec-column", a->spec_columns_file,
					al_spec_is_column, a->spec_columns,
					a->n_spec_columns) != 0 ||
		    (a->spec_columns_file &&
		     record_hash_input(&j->rec, "specification column map",
				a->spec_columns_file, -1)))
			return -1;
		j->specs = load_spec(a, &j->spec_columns, j->cat,
				     &j->spec_diags);
		if (j->specs == NULL ||
		    (al_spec_all(j->specs, &n),
		     record_hash_input(&j->rec, "specification", a->spec, (long)n)))
			return -1;
		a->aopt.specs = j->specs;
	}
	if (a->titrants) {
		j->titrants = load_titrants(a->titrants);
		if (j->titrants == NULL ||
		    (al_register_all(j->titrants, &n),
		     record_hash_input(&j->rec, "titrant register", a->titrants,
				(long)n)))
			return -1;
		a->aopt.titrants = j->titrants;
	}
	return 0;
}

/* The record begun, the catalogue, the acid and unit asked for and the
 * lookups loaded. */
static int
set_up(struct job *j, int argc, char **argv)
{
	struct args *a = &j->a;

	switch (record_start(&j->rec, "assay", argc, argv, a->analyst)) {
	case 0:
		break;
	case -2: /* the run's time, said */
		return -1;
	default:
		return failed(NULL, AL_ENOMEM);
	}
	a->aopt.today = j->rec.today;
	j->cat = cli_catalogue();
	if (j->cat == NULL)
		return -1;
	a->aopt.catalogue = j->cat;
	if (a->acid) {
		a->aopt.default_acid = al_catalogue_find(j->cat, a->acid);
		if (a->aopt.default_acid == NULL) {
			cli_usage_error("assay", "--acid: unknown acid '%s'",
					a->acid);
			cli_list_acids(j->cat);
			return -1;
		}
	}
	if (a->unit) {
		if (cli_unit("assay", "--unit", a->unit, &a->aopt.unit) != 0)
			return -1;
		a->aopt.has_unit = 1;
	}
	return load_lookups(j);
}

/* The outputs written while rows are read: replicates and rejects. */
static int
open_row_outputs(struct job *j)
{
	struct args *a = &j->a;

	j->reps.ropt = j->rejs.ropt = &a->ropt;
	if (a->replicates) {
		j->rep_out = open_output(a->replicates, al_replicates_header,
					 &a->ropt);
		if (j->rep_out == NULL)
			return -1;
		j->reps.out = al_outfile_stream(j->rep_out);
	}
	if (a->rejects) {
		j->rej_out = open_output(a->rejects, al_rejects_header, &a->ropt);
		if (j->rej_out == NULL)
			return -1;
		j->rejs.out = al_outfile_stream(j->rej_out);
		a->aopt.on_reject = write_reject;
		a->aopt.reject_ud = j;
	}
	return 0;
}

/* One titration file into the run, hashed as it is read (the record
 * says what was used, even for standard input): 0, 1 when it could not
 * be read whole (said), -1 to stop. */
static int
read_one(struct job *j, const char *name)
{
	int is_stdin = strcmp(name, "-") == 0;
	FILE *in = is_stdin ? stdin : cli_open_input(name);
	unsigned long before = al_assay_get_counts(j->run).rows_read, rows;
	hashing_reader h;
	char hex[65];
	al_status st;

	if (in == NULL) {
		cli_error("%s: %s", name, cli_reason(AL_OK));
		return 1;
	}
	hashing_reader_init(&h, in);
	st = al_assay_read_source(j->run, hashing_read, &h,
				  is_stdin ? "<stdin>" : name,
				  j->rep_out || j->stored.path || j->book
					  ? take_replicate
					  : NULL,
				  j);
	if (!is_stdin)
		fclose(in);
	hashing_reader_hex(&h, hex);
	j->in_bytes += h.bytes;
	rows = al_assay_get_counts(j->run).rows_read - before;
	if (record_input(&j->rec, "titrations", name, h.bytes, (long)rows,
			 hex) != 0 ||
	    stored_run_input(&j->stored, name, hex) != 0)
		return failed(NULL, AL_ENOMEM);
	if (st == AL_EIO) {
		cli_error("%s: read or write error", name);
		return 1;
	}
	if (st == AL_ENOMEM) {
		cli_print_diags(al_assay_diags(j->run));
		return failed(NULL, st);
	}
	return st != AL_OK;
}

/* Every titration file read; -1 when any error means no report. */
static int
read_titrations(struct job *j, int argc, char **argv)
{
	al_status st;
	unsigned long e;
	al_assay_counts c;
	int bad = 0, got;

	/* a malformed record is an invalid row in either mode, and the
	 * rows after it are still read: every error is said, and the counts
	 * agree with --rejects' */
	j->a.aopt.csv.recover = 1;
	j->run = al_assay_new(&j->a.aopt, &st);
	if (j->run == NULL)
		return failed(NULL, st);
	for (int i = optind; i < argc; i++) {
		if ((got = read_one(j, argv[i])) < 0)
			return -1;
		bad |= got;
	}
	cli_print_diags(al_assay_diags(j->run));
	e = al_assay_diags(j->run)->errors;
	c = al_assay_get_counts(j->run);
	if (!bad && e == 0)
		return 0;
	if (e == 0) /* an input that could not be read: said above */
		cli_error("no report written");
	else if (c.rows_read > 0)
		cli_error("%lu error%s in the input (%lu of %lu rows); no "
			  "report written",
			  e, e == 1 ? "" : "s", c.rows_bad, c.rows_read);
	else
		cli_error("%lu error%s in the input; no report written", e,
			  e == 1 ? "" : "s");
	return -1;
}

/* A status of the run's finishing, said: the replicates are written
 * there. */
static int
finish_status(const struct job *j, al_status st)
{
	if (st == AL_OK)
		return 0;
	if (st == AL_EIO && j->a.replicates)
		return failed(j->a.replicates, AL_OK);
	return failed(NULL, st);
}

/* The results in the report's form: CSV, or the table a person reads
 * (in colour on a terminal unless NO_COLOR is set: no-color.org). */
static al_status
write_results(struct job *j)
{
	const char *no_colour = getenv("NO_COLOR");
	al_screen_options so = {
		.colour = al_outfile_in_place(j->report) &&
			  isatty(fileno(al_outfile_stream(j->report))) &&
			  (no_colour == NULL || no_colour[0] == '\0'),
		.decimals = j->a.has_decimals ? (int)j->a.decimals : -1,
	};

	if (j->a.format == FORMAT_TABLE)
		return al_screen_write(al_outfile_stream(j->report), j->run, &so);
	return al_report_write(al_outfile_stream(j->report), j->run,
			       &j->a.ropt);
}

/* The report (each result evaluated once, as it is written) and the
 * budget. */
static int
write_report(struct job *j, int argc, char **argv)
{
	struct args *a = &j->a;

	/* the run's id, in every report row, the record and the store */
	if (record_seal(&j->rec) != 0)
		return failed(NULL, AL_ENOMEM);
	/* the store's transaction before the replicates go into it */
	if (stored_run_begin(&j->stored, &j->rec, a->analyst, argc, argv) != 0 ||
	    finish_status(j, al_assay_finish_lazy(j->run)) != 0)
		return -1;
	a->ropt.report_id = j->rec.id;
	j->report = open_output(a->output ? a->output : "-", NULL, &a->ropt);
	if (j->report == NULL)
		return -1;
	if (write_results(j) != AL_OK)
		return failed(j->out_name, AL_OK);
	if (finish_status(j, al_assay_settle(j->run)) != 0)
		return -1;
	if (a->budget == NULL)
		return 0;
	j->budget_out = open_output(a->budget, NULL, &a->ropt);
	if (j->budget_out == NULL)
		return -1;
	if (al_budget_write(al_outfile_stream(j->budget_out), j->run,
			    &a->ropt) != AL_OK ||
	    al_outfile_prepare(j->budget_out) != AL_OK)
		return failed(a->budget, AL_OK);
	return 0;
}

/* Every output checked, then all of them put in place at once: a
 * failure leaves none. */
static int
commit_outputs(struct job *j)
{
	const struct args *a = &j->a;
	int want_record = a->record || (a->output && strcmp(a->output, "-"));
	al_outfile **all[] = {&j->report, &j->rep_out, &j->rej_out,
			      &j->budget_out, &j->rec_out, &j->book_out};

	/* the record's content, which the workbook's run sheet shows too;
	 * the workbook, before the record lists the outputs' hashes */
	if ((want_record || j->book) &&
	    assay_record_fill(&j->rec, j->run,
			      a->aopt.qc.decision == AL_DECISION_GUARDED,
			      a->aopt.qc.guard_r, a->aopt.qc.exclude_outliers) != 0)
		return failed(NULL, AL_ENOMEM);
	if (assay_book_write(j) != 0)
		return -1;
	if (want_record)
		assay_start_hashes(j);
	/* named before the outputs appear */
	j->open_results = assay_unjudged(j->run, j->specs);
	if (j->open_results < 0)
		return failed(NULL, AL_ENOMEM);
	if (al_outfile_prepare(j->report) != AL_OK)
		return failed(j->out_name, AL_OK);
	if (j->rep_out && al_outfile_prepare(j->rep_out) != AL_OK)
		return failed(a->replicates, AL_OK);
	if (j->rej_out && al_outfile_prepare(j->rej_out) != AL_OK)
		return failed(a->rejects, AL_OK);
	if (want_record && assay_write_record(j) != 0)
		return -1;
	/* the store first: if it fails, no output is replaced */
	if (j->stored.store &&
	    (store_add_results(j->stored.store, j->run, j->rec.id) != 0 ||
	     stored_run_commit(&j->stored) != 0))
		return -1;
	return cli_commit_all(all, 6);
}

static void
job_free(struct job *j)
{
	al_outfile *outs[] = {j->rep_out, j->rej_out, j->report, j->rec_out,
			      j->budget_out, j->book_out};

	if (j->hashing) /* an error came first: the thread reads files */
		(void)file_hashes_finish(&j->hashes);
	for (size_t i = 0; i < sizeof outs / sizeof outs[0]; i++)
		al_outfile_abort(outs[i]);
	stored_run_close(&j->stored);
	assay_book_free(j);
	al_assay_free(j->run);
	al_spec_table_free(j->specs);
	al_diags_clear(&j->spec_diags);
	cli_column_map_free(&j->columns);
	cli_column_map_free(&j->spec_columns);
	al_register_free(j->titrants);
	al_catalogue_free(j->cat);
	record_free(&j->rec);
}

int
cmd_assay(int argc, char **argv)
{
	struct job *j = al_calloc(1, sizeof *j);
	int rc = EXIT_TROUBLE;

	if (j == NULL)
		return failed(NULL, AL_ENOMEM), EXIT_TROUBLE;
	j->a.ropt.decimals = -1;
	switch (parse_args(argc, argv, &j->a)) {
	case 1:
		rc = fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
		break;
	case 0:
		j->out_name = j->a.output ? j->a.output : "standard output";
		j->stored.path = j->a.stored_path;
		j->stored.rerun = j->a.rerun;
		if (outputs_safe(&j->a, argc, argv) &&
		    set_up(j, argc, argv) == 0 && open_row_outputs(j) == 0 &&
		    assay_book_open(j) == 0 &&
		    read_titrations(j, argc, argv) == 0 &&
		    write_report(j, argc, argv) == 0 && commit_outputs(j) == 0)
			rc = assay_conclude(j);
		break;
	}
	job_free(j);
	al_free(j);
	return rc;
}
