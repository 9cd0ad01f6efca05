/* acidlot command line: the standardize command (titrant register).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "cli.h"
#include "record.h"
#include "stored_run.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " standardize [OPTION]... FILE...\n"
	      "Concentration of each titrant lot from titrations of a primary\n"
	      "standard (c = 1000 m P / (M V)), its uncertainty (Eurachem/CITAC\n"
	      "QUAM example A2) and acceptance; updates the titrant register.\n"
	      "FILE columns (the header names them; --column maps others):\n"
	      "  required  titrant_lot, mass_g, titrant_ml\n"
	      "  optional  standard (default KHP), purity (default the\n"
	      "            standard's), blank_ml, date\n"
	      "\n"
	      "  -o, --register FILE      titrant register to create or update\n"
	      "                           (other lots in it are kept)\n"
	      "      --budget FILE        uncertainty budget per lot (CSV)\n"
	      "      --record FILE        record of the run (default\n"
	      "                           REGISTER.record.json)\n"
	      "      --analyst NAME       who ran it, for the record\n"
	      "      --max-rsd PCT        largest RSD accepted (default 0.2)\n"
	      "      --min-n N            fewest replicates accepted (default 3;\n"
	      "                           1 only with --repeatability-rsd)\n"
	      "      --repeatability-rsd PCT  the method's repeatability, RSD %\n"
	      "                           of one titration: the repeatability\n"
	      "                           term is PCT / sqrt(n) (QUAM A2) instead\n"
	      "                           of the lot's own s / sqrt(n)\n"
	      "      --valid-days D       days a standardisation stays valid\n"
	      "                           (default 30)\n"
	      "      --balance-linearity-g X  balance linearity, +/- g per\n"
	      "                           weighing (default 0.00015)\n"
	      "      --burette-tol-ml X   burette tolerance, +/- mL (default 0.03)\n"
	      "      --temp-range-c X     lab temperature range, +/- K about the\n"
	      "                           burette's calibration, a 95 % interval\n"
	      "                           (default 3)\n"
	      "Uncertainty terms and their distributions: balance linearity,\n"
	      "rectangular, tare and gross; purity, rectangular (catalogue);\n"
	      "molar mass, rectangular per atomic weight; burette tolerance,\n"
	      "triangular; temperature, V x 2.1e-4 /K x range / 1.96, normal;\n"
	      "repeatability, s / sqrt(n) or PCT / sqrt(n), normal.\n"
	      "      --k K                coverage factor (default 2)\n"
	      "      --decimals N        fixed decimals on standard output and\n"
	      "                          in the budget (the register keeps every\n"
	      "                          digit)\n"
	      "      --column NAME=HEADER  read the file's column HEADER as our\n"
	      "                          column NAME (repeatable)\n"
	      "      --columns FILE      such pairs from a CSV name,header\n"
	      "      --store DB          append the lots to the lab's results\n"
	      "                          store (as assay --store)\n"
	      "      --rerun REASON      store a file stored before, saying why\n"
	      "      --format F          table (aligned columns) or csv; default\n"
	      "                          table on a terminal, csv into a pipe\n"
	      "      --delimiter D, --decimal-comma   as for assay\n"
	      "  -h, --help               this help\n"
	      "\n"
	      "Writes one line per lot to standard output. Exit status: 0 every\n"
	      "lot accepted; 1 at least one not accepted (it is written to the\n"
	      "register as not valid); 2 usage, input or I/O error.\n",
	      out);
}

enum {
	OPT_BUDGET = CLI_OPT, OPT_RECORD, OPT_ANALYST, OPT_MAX_RSD, OPT_MIN_N,
	OPT_VALID_DAYS, OPT_BALANCE, OPT_BURETTE, OPT_TEMP, OPT_K,
	OPT_DELIMITER, OPT_DECIMAL_COMMA, OPT_REPEATABILITY, OPT_FORMAT,
	OPT_COLUMN, OPT_DECIMALS, OPT_COLUMNS, OPT_STORE, OPT_RERUN
};

/* The long options, in the order of the OPT_ values (cli_options). */
static const char *const options[] = {
	"budget", "record", "analyst", "max-rsd", "min-n", "valid-days",
	"balance-linearity-g", "burette-tol-ml", "temp-range-c", "k",
	"delimiter", "decimal-comma!", "repeatability-rsd", "format",
	"column", "decimals", "columns", "store", "rerun", "register=o",
};
_Static_assert(sizeof options / sizeof options[0] ==
		       OPT_RERUN - CLI_OPT + 2,
	       "one name for each OPT_ value, then the one with a letter");

#define MAX_COLUMNS 16

struct args {
	const char *reg, *budget, *record, *analyst, *columns_file;
	const char *stored_path, *rerun; /* --store, --rerun */
	al_column_alias columns[MAX_COLUMNS]; /* --column NAME=HEADER */
	size_t n_columns;
	int table; /* the lots as aligned columns (a terminal), not CSV */
	int format_given;
	al_std_params p;
	double min_n, valid_days; /* as given, then into p */
	double decimals; /* of standard output and the budget; -1: digits
			    as each figure carries them */
	int has_min_n, has_valid_days;
	al_csv_options csv;
};

/* The options with a number, their ranges and where they go. */
static int
number_option(struct args *a, int c)
{
	al_std_params *p = &a->p;
	const cli_range t[] = {
		{OPT_MAX_RSD, "--max-rsd", 0, HUGE_VAL, CLI_ABOVE,
		 "--max-rsd must be above 0", &p->max_rsd_pct, NULL},
		{OPT_MIN_N, "--min-n", 0, 1000, CLI_ABOVE | CLI_WHOLE,
		 "--min-n takes a whole number from 1 to 1000", &a->min_n,
		 &a->has_min_n},
		{OPT_REPEATABILITY, "--repeatability-rsd", 0, 10, CLI_ABOVE,
		 "--repeatability-rsd takes a percentage above 0 and up to 10",
		 &p->repeatability_rsd_pct, NULL},
		{OPT_VALID_DAYS, "--valid-days", 0, 3650, CLI_ABOVE | CLI_WHOLE,
		 "--valid-days takes a whole number from 1 to 3650",
		 &a->valid_days, &a->has_valid_days},
		{OPT_BALANCE, "--balance-linearity-g", 0, HUGE_VAL, 0,
		 "--balance-linearity-g must be 0 or more",
		 &p->balance_linearity_g, NULL},
		{OPT_BURETTE, "--burette-tol-ml", 0, HUGE_VAL, 0,
		 "--burette-tol-ml must be 0 or more", &p->burette_tol_ml, NULL},
		{OPT_TEMP, "--temp-range-c", 0, HUGE_VAL, 0,
		 "--temp-range-c must be 0 or more", &p->temp_range_c, NULL},
		{OPT_K, "--k", 0, HUGE_VAL, CLI_ABOVE, "--k must be above 0",
		 &p->k, NULL},
		{OPT_DECIMALS, "--decimals", 0, 15, CLI_WHOLE,
		 "--decimals takes a whole number from 0 to 15", &a->decimals,
		 NULL},
	};

	return cli_range_option("standardize", t, sizeof t / sizeof t[0], c,
				optarg);
}

/* The options with a text, or no value: 1 when c is one (-1 after a
 * usage error), else 0. */
static int
other_option(struct args *a, int c)
{
	const cli_text t[] = {
		{'o', &a->reg},
		{OPT_BUDGET, &a->budget},
		{OPT_RECORD, &a->record},
		{OPT_ANALYST, &a->analyst},
		{OPT_COLUMNS, &a->columns_file},
		{OPT_STORE, &a->stored_path},
		{OPT_RERUN, &a->rerun},
	};

	if (cli_text_option(t, sizeof t / sizeof t[0], c, optarg))
		return 1;
	if (c == OPT_COLUMN)
		return cli_column_option("standardize", "--column", optarg,
					 al_std_is_column,
					 a->columns, &a->n_columns,
					 MAX_COLUMNS);
	if (c == OPT_FORMAT) {
		int pick = cli_choice("standardize", "--format", optarg, "table",
				      "csv");

		a->table = pick == 0;
		a->format_given = 1;
		return pick < 0 ? -1 : 1;
	}
	if (c == OPT_DECIMAL_COMMA) {
		a->csv.decimal_point = ',';
		return 1;
	}
	if (c != OPT_DELIMITER)
		return 0;
	if (cli_delimiter(optarg, &a->csv.delimiter))
		return cli_usage_error("standardize",
				       "--delimiter: '%s' is not ',', ';', "
				       "tab or auto",
				       optarg),
		       -1;
	return 1;
}

/* One option of the command: 1 taken, 0 not one, -1 a usage error. */
static int
one_option(void *ctx, int c, char *text)
{
	int got = number_option(ctx, c);

	(void)text;
	return got != 0 ? got : other_option(ctx, c);
}

/* 0 to go on, 1 after --help, -1 after a usage error. */
static int
parse_args(int argc, char **argv, struct args *a)
{
	int got = cli_options("standardize", argc, argv, options,
			      sizeof options / sizeof options[0],
			      usage, one_option, a);

	if (got != 0)
		return got;
	if (!a->format_given)
		a->table = cli_is_terminal();
	if (a->has_min_n)
		a->p.min_n = (size_t)a->min_n;
	if (a->has_valid_days)
		a->p.valid_days = (long)a->valid_days;
	if (optind >= argc)
		return cli_usage_error("standardize",
				       "no standardisation file given"),
		       -1;
	/* one titration has no spread of its own to go by */
	if (a->p.min_n < 2 && a->p.repeatability_rsd_pct == 0)
		return cli_usage_error("standardize",
				       "--min-n 1 needs --repeatability-rsd (one "
				       "titration has no spread of its own)"),
		       -1;
	if (cli_distinct_inputs("standardize", argv + optind, argc - optind))
		return -1;
	return cli_check_decimal_comma("standardize", &a->csv) ? -1 : 0;
}

/* Lists an output in the record: hashed, or unhashed when written in
 * place (a device or FIFO is never read back). 0 on success. */
static int
listed(run_record *rec, const char *role, const char *path,
       const al_outfile *out)
{
	if (out == NULL)
		return 0;
	if (al_outfile_in_place(out))
		return record_output_unhashed(rec, role, path);
	return record_output(rec, role, path, al_outfile_written_path(out));
}

/* Refuses an output (the register, which is read and replaced, the
 * budget, the record by any name) that is an input or another output,
 * before anything is read. */
static int
outputs_safe(const struct args *a, int argc, char **argv)
{
	char record[4096];
	cli_file f[5] = {
		{"-o", a->reg, 1},
		{"--budget", a->budget, 1},
		{"--columns", a->columns_file, 0},
		{"--store", a->stored_path, 1},
	};
	size_t n = 4;

	if (a->record || a->reg) {
		snprintf(record, sizeof record, "%s.record.json", a->reg);
		f[n++] = (cli_file){a->record ? "--record" : "the record",
				    a->record ? a->record : record, 1};
	}
	return cli_check_with_inputs("standardize", f, n, argv + optind,
				     argc - optind) == 0;
}

static void
number(FILE *out, double v, int sig, int decimals)
{
	char buf[128];

	if (decimals >= 0)
		al_format_number(v, decimals, 0, buf, sizeof buf);
	else
		al_format_sig(v, sig, buf, sizeof buf);
	fprintf(out, ",%s", buf);
}

static void
summary_line(FILE *out, const al_std_lot *l, const al_titrant *t, double k,
	     int dec)
{
	char on[11], until[11];

	al_csv_put_field(out, l->lot, ',');
	fprintf(out, ",%s,%zu", l->standard->name, l->n);
	number(out, l->mean, 10, dec);
	if (l->has_sd) {
		number(out, l->sd, 4, dec);
		number(out, l->rsd_pct, 4, dec);
	} else
		fputs(",,", out);
	number(out, l->budget.u, 3, dec);
	number(out, l->U, 3, dec);
	number(out, k, 3, dec);
	al_date_format(t->standardised_on, on);
	al_date_format(t->valid_until, until);
	fprintf(out, ",%s,%s,%s,", on, until, l->valid ? "accepted" : "rejected");
	al_csv_put_field(out, l->valid ? "" : l->why, ',');
	putc('\n', out);
}

static void
budget_lines(FILE *out, const al_std_lot *l, int dec)
{
	double total = l->budget.u * l->budget.u;

	for (size_t i = 0; i < l->budget.n_items; i++) {
		const al_budget_item *it = &l->budget.items[i];
		/* contributions scaled to the mean of the replicates */
		double contribution = it->contribution * l->mean / l->budget.c;

		al_csv_put_field(out, l->lot, ',');
		putc(',', out);
		al_csv_put_field(out, it->name, ',');
		number(out, it->value, 8, dec);
		fprintf(out, ",%s", it->unit);
		number(out, it->u, 4, dec);
		number(out, it->sensitivity * l->mean / l->budget.c, 6, dec);
		number(out, contribution, 4, dec);
		number(out, total > 0 ? 100 * contribution * contribution / total
				      : 0,
		       3, dec);
		putc('\n', out);
	}
}

static al_register *
load_register(const char *path, al_status *st, int *existed)
{
	al_diags d = {0};
	al_register *reg;
	struct stat sb;
	/* a device or FIFO named as the register is written, not read: it
	 * holds no register to keep (and /dev/zero would never end) */
	int device = stat(path, &sb) == 0 && !S_ISREG(sb.st_mode) &&
		     !S_ISDIR(sb.st_mode);
	FILE *in = device ? NULL : cli_open_input(path);

	*existed = in != NULL;
	if (in == NULL) {
		if (!device && errno != ENOENT) {
			cli_error("%s: %s", path, cli_reason(AL_OK));
			*st = AL_EIO;
			return NULL;
		}
		reg = al_register_new(st);
		if (reg == NULL)
			cli_error("%s", al_strerror(*st));
		return reg;
	}
	reg = al_register_read(in, path, st, &d);
	fclose(in);
	cli_print_diags(&d);
	al_diags_clear(&d);
	if (reg == NULL)
		cli_error("%s: cannot read the titrant register (%s)", path,
			  al_strerror(*st));
	return reg;
}

/* Reads every standardisation file into run, hashing each for the
 * record. 0; 1 when a file could not be read or had errors (said, or in
 * run's diagnostics); -1 when memory ran out (said). */
static int
read_inputs(al_std_run *run, run_record *rec, stored_run *stored, int argc,
	    char **argv, const al_csv_options *csv)
{
	int bad = 0;
	al_status st;

	for (int i = optind; i < argc; i++) {
		FILE *in = strcmp(argv[i], "-") == 0 ? stdin : cli_open_input(argv[i]);
		hashing_reader h;
		char hex[65];

		if (in == NULL) {
			cli_error("%s: %s", argv[i], cli_reason(AL_OK));
			bad = 1;
			continue;
		}
		hashing_reader_init(&h, in);
		st = al_std_read_source(run, hashing_read, &h,
					in == stdin ? "<stdin>" : argv[i], csv);
		if (in != stdin)
			fclose(in);
		if (st == AL_ENOMEM) {
			cli_error("%s", al_strerror(st));
			return -1;
		}
		if (st != AL_OK)
			bad = 1;
		hashing_reader_hex(&h, hex);
		if (record_input(rec, "standardisation", argv[i], h.bytes, -1,
				 hex) != 0 ||
		    stored_run_input(stored, argv[i], hex) != 0) {
			cli_error("%s", al_strerror(AL_ENOMEM));
			return -1;
		}
	}
	return bad;
}

/* One standardisation of the command: what it reads, makes and writes,
 * in the order cmd_standardize goes through them. */
struct job {
	struct args a;
	run_record rec;
	al_catalogue *cat;
	al_std_run *run;
	al_register *reg;
	cli_column_map columns; /* --column, --columns */
	stored_run stored;	/* --store */
	al_outfile *reg_out, *budget_out, *rec_out;
	int any_rejected;
};

/* The record begun, the files read and their lots computed. */
static int
read_lots(struct job *j, int argc, char **argv)
{
	al_diags *d;
	al_status st;
	int bad;

	switch (record_start(&j->rec, "standardize", argc, argv, j->a.analyst)) {
	case 0:
		break;
	case -2: /* the run's time, said */
		return -1;
	default:
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	if ((j->cat = cli_catalogue()) == NULL)
		return -1;
	j->run = al_std_new(j->cat, &j->a.p, j->rec.today, &st);
	if (j->run == NULL) {
		cli_error("%s", al_strerror(st));
		return -1;
	}
	if (cli_column_map_load(&j->columns, "standardize", "--column",
				j->a.columns_file, al_std_is_column,
				j->a.columns, j->a.n_columns) != 0 ||
	    (j->a.columns_file && record_hash_input(&j->rec, "column map",
						     j->a.columns_file, -1)))
		return -1;
	al_std_set_columns(j->run, j->columns.all, j->columns.n);
	bad = read_inputs(j->run, &j->rec, &j->stored, argc, argv, &j->a.csv);
	if (bad < 0) /* out of memory, said */
		return -1;
	d = al_std_diags(j->run);
	cli_print_diags(d);
	if (bad || d->errors > 0) {
		cli_error("%lu error%s in the input; register not changed",
			  d->errors, d->errors == 1 ? "" : "s");
		return -1;
	}
	if (al_std_finish(j->run) != AL_OK) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return 0;
}

/* The register the lots go into: the one named by -o as it is (hashed
 * into the record), or a new one. */
static int
open_register(struct job *j)
{
	const char *path = j->a.reg;
	char hex[65];
	unsigned long long bytes;
	al_status st;
	int existed;

	if (path == NULL) {
		j->reg = al_register_new(&st);
		if (j->reg == NULL)
			cli_error("%s", al_strerror(st));
		return j->reg ? 0 : -1;
	}
	j->reg = load_register(path, &st, &existed);
	if (j->reg == NULL)
		return -1;
	if (existed && (sha256_file(path, hex, &bytes) != 0 ||
			record_input(&j->rec, "previous register", path, bytes,
				     -1, hex) != 0)) {
		cli_error("%s: cannot hash it", path);
		return -1;
	}
	return 0;
}

/* The lots as CSV into out, and into the register. */
static int
lots_csv(void *ctx, FILE *out)
{
	struct job *j = ctx;

	fputs("titrant_lot,standard,n,concentration_mol_l,sd_mol_l,rsd_pct,"
	      "u_mol_l,U_mol_l,k,standardised_on,valid_until,status,reason\n",
	      out);
	for (size_t i = 0; i < al_std_lot_count(j->run); i++) {
		const al_std_lot *l = al_std_lot_at(j->run, i);
		al_titrant t;

		memset(&t, 0, sizeof t);
		t.lot = (char *)l->lot;
		t.standard = l->standard->name;
		t.concentration_mol_l = l->mean;
		t.u_mol_l = l->budget.u;
		t.n = l->n;
		t.has_rsd = l->has_sd;
		t.rsd_pct = l->rsd_pct;
		t.standardised_on = l->date;
		t.valid_until = al_date_add_days(l->date, j->a.p.valid_days);
		t.valid = l->valid;
		if (!l->valid)
			j->any_rejected = 1;
		if (al_register_put(j->reg, &t) != AL_OK) {
			cli_error("%s", al_strerror(AL_ENOMEM));
			return -1;
		}
		summary_line(out, l, &t, j->a.p.k, j->a.decimals);
	}
	return 0;
}

/* The budget and the register written, not yet in place. */
static int
write_outputs(struct job *j)
{
	const struct args *a = &j->a;
	al_status st;

	if (a->budget) {
		j->budget_out = al_outfile_open(a->budget, &st);
		if (j->budget_out == NULL)
			return cli_error("%s: %s", a->budget, cli_reason(AL_OK)),
			       -1;
		fputs("titrant_lot,component,value,unit,standard_uncertainty,"
		      "sensitivity,contribution_mol_l,share_pct\n",
		      al_outfile_stream(j->budget_out));
		for (size_t i = 0; i < al_std_lot_count(j->run); i++)
			budget_lines(al_outfile_stream(j->budget_out),
				     al_std_lot_at(j->run, i), j->a.decimals);
		if (al_outfile_prepare(j->budget_out) != AL_OK)
			return cli_error("%s: %s", a->budget, cli_reason(AL_OK)),
			       -1;
	}
	if (a->reg) {
		j->reg_out = al_outfile_open(a->reg, &st);
		if (j->reg_out == NULL ||
		    al_register_write(al_outfile_stream(j->reg_out), j->reg) !=
			    AL_OK ||
		    al_outfile_prepare(j->reg_out) != AL_OK)
			return cli_error("%s: %s", a->reg, cli_reason(AL_OK)), -1;
	}
	if (fflush(stdout) != 0 || ferror(stdout))
		return cli_error("standard output: %s", cli_reason(AL_OK)), -1;
	return 0;
}

/* The uncertainty model and the lots, into the record; 0, or -1 when
 * memory runs out. */
static int
fill_record(struct job *j)
{
	const al_std_params *p = &j->a.p;
	json_t *lots = json_array(), *params;
	int bad;

	params = json_pack("{s:f, s:f, s:f, s:f, s:f, s:f, s:I, s:I, s:f}",
			   "balance_linearity_g", p->balance_linearity_g,
			   "burette_tol_ml", p->burette_tol_ml, "temp_range_c",
			   p->temp_range_c, "expansion_per_k",
			   p->expansion_per_k, "k", p->k, "max_rsd_pct",
			   p->max_rsd_pct, "min_n", (json_int_t)p->min_n,
			   "valid_days", (json_int_t)p->valid_days,
			   "repeatability_rsd_pct", p->repeatability_rsd_pct);
	for (size_t i = 0; lots && i < al_std_lot_count(j->run); i++) {
		const al_std_lot *l = al_std_lot_at(j->run, i);

		if (json_array_append_new(
			    lots,
			    json_pack("{s:o, s:s, s:f, s:f, s:f, s:I, s:b}",
				      "titrant_lot", record_text(l->lot),
				      "standard", l->standard->name,
				      "concentration_mol_l", l->mean,
				      "u_mol_l", l->budget.u, "U_mol_l", l->U,
				      "n", (json_int_t)l->n, "accepted",
				      l->valid)) != 0) {
			json_decref(lots);
			lots = NULL;
		}
	}
	/* the _new calls take lots and params even when they fail */
	bad = json_object_set_new(j->rec.root, "titrant_lots", lots) != 0;
	bad |= json_object_set_new(j->rec.root, "uncertainty_model", params) !=
	       0;
	return bad ? -1 : 0;
}

/* The record, beside the register (or where --record says). */
static int
write_record(struct job *j)
{
	const struct args *a = &j->a;
	char record_path[4096];
	const char *path = a->record;

	if (a->record == NULL && a->reg == NULL)
		return 0;
	if (path == NULL) {
		snprintf(record_path, sizeof record_path, "%s.record.json",
			 a->reg);
		path = record_path;
	}
	if (fill_record(j) != 0 ||
	    listed(&j->rec, "budget", a->budget, j->budget_out) ||
	    listed(&j->rec, "register", a->reg, j->reg_out) ||
	    record_seal(&j->rec) != 0 ||
	    record_write(&j->rec, path, &j->rec_out) != 0) {
		cli_error("%s: cannot write the record: %s", path,
			  cli_reason(AL_OK));
		return -1;
	}
	return 0;
}

/* The lots into the store (--store), committed before the register and
 * the budget are put in place: 0, or -1 after a message. */
static int
store_lots(struct job *j, int argc, char **argv)
{
	if (j->stored.path == NULL)
		return 0;
	/* the run's id, as the record has it (sealed there when written) */
	if (j->rec.id[0] == '\0' && record_seal(&j->rec) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	if (stored_run_begin(&j->stored, &j->rec, j->a.analyst, argc, argv) != 0)
		return -1;
	for (size_t i = 0; i < al_std_lot_count(j->run); i++) {
		const al_std_lot *l = al_std_lot_at(j->run, i);

		if (store_add_titrant(j->stored.store, (long)i, l,
				      j->a.p.k,
				      al_date_add_days(l->date,
						       j->a.p.valid_days)) != 0)
			return -1;
	}
	return stored_run_commit(&j->stored);
}

int
cmd_standardize(int argc, char **argv)
{
	struct job j;
	al_outfile **all[] = {&j.budget_out, &j.reg_out, &j.rec_out};
	int rc = EXIT_TROUBLE, n, done;

	memset(&j, 0, sizeof j);
	j.a.decimals = -1;
	al_std_params_default(&j.a.p);
	if ((done = cli_options_done(parse_args(argc, argv, &j.a))) >= 0)
		return done;
	j.stored.path = j.a.stored_path;
	j.stored.rerun = j.a.rerun;
	if (outputs_safe(&j.a, argc, argv) && read_lots(&j, argc, argv) == 0 &&
	    open_register(&j) == 0 && cli_put_table(j.a.table, lots_csv, &j) == 0 &&
	    write_outputs(&j) == 0 && write_record(&j) == 0 &&
	    store_lots(&j, argc, argv) == 0 && cli_commit_all(all, 3) == 0) {
		n = (int)al_std_lot_count(j.run);
		rc = j.any_rejected ? EXIT_NOT_PASS : EXIT_ALL_PASS;
		fprintf(stderr, PROG ": %d titrant lot%s standardised%s\n", n,
			n == 1 ? "" : "s",
			j.any_rejected ? "; some not accepted (see status)" : "");
	}
	for (size_t i = 0; i < 3; i++)
		al_outfile_abort(*all[i]);
	stored_run_close(&j.stored);
	al_register_free(j.reg);
	al_std_free(j.run);
	cli_column_map_free(&j.columns);
	al_catalogue_free(j.cat);
	record_free(&j.rec);
	return rc;
}
