/* acidlot command line: the assay command.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <string.h>
#include <sys/stat.h>

#include "cli.h"
#include "record.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " assay [OPTION]... FILE...\n"
	      "Titratable acidity of every titration row, replicate statistics\n"
	      "per product + lot + sample, and the verdict against the\n"
	      "specification. FILE '-' reads standard input.\n"
	      "\n"
	      "  -s, --spec FILE         specification limits per product (CSV)\n"
	      "  -o, --output FILE       QC report (CSV); default standard output\n"
	      "  -r, --replicates FILE   one row per titration used (CSV)\n"
	      "      --rejects FILE      keep going past invalid rows: write each\n"
	      "                          to FILE with its line and reason, and\n"
	      "                          judge the rest (default: any invalid row\n"
	      "                          stops the run, no report)\n"
	      "      --acid NAME         acid to express results as when neither\n"
	      "                          the specification nor the row names one\n"
	      "                          (default citric; see '" PROG " acids')\n"
	      "      --unit UNIT         unit when the specification names none:\n"
	      "                          g/100g g/kg g/100mL g/L meq/100g meq/L\n"
	      "                          (default g/100g for samples by mass,\n"
	      "                          g/100mL for samples by volume)\n"
	      "      --blank-ml V        blank, mL, for rows without blank_ml\n"
	      "                          (default 0)\n"
	      "      --titrant-mol-l C   titrant concentration for rows without\n"
	      "                          titrant_mol_l\n"
	      "      --density-g-ml D    sample density for rows without\n"
	      "                          density_g_ml\n"
	      "      --endpoint-ph PH    endpoint pH for rows without endpoint_ph\n"
	      "      --titrants FILE     titrant register (from '" PROG " standardize'):\n"
	      "                          a row's titrant_lot gives its titrant\n"
	      "                          concentration, valid on the row's date\n"
	      "      --record FILE       record of the run (default\n"
	      "                          REPORT.record.json with -o)\n"
	      "      --analyst NAME      who ran it, for the record\n"
	      "\n"
	      "Replicate QC and decision:\n"
	      "      --decision RULE     simple (default: the mean against the\n"
	      "                          limits) or guarded[:R] (guard band\n"
	      "                          w = R x U, R default 1; ILAC G8)\n"
	      "      --exclude-outliers  leave a 1 % Grubbs outlier out of the\n"
	      "                          result (flagged, kept in --replicates);\n"
	      "                          never at n = 3\n"
	      "      --resolution-ml X   burette reading resolution (default\n"
	      "                          0.05; spec column resolution_ml): a\n"
	      "                          replicate within it of another is\n"
	      "                          never an outlier\n"
	      "      --budget FILE       uncertainty budget of every result (CSV)\n"
	      "      --titrant-u U       standard uncertainty of the titrant\n"
	      "                          concentration, mol/L, for rows whose lot\n"
	      "                          is not in --titrants\n"
	      "      --burette-tol-ml X  burette tolerance, +/- mL (default 0.05)\n"
	      "      --balance-linearity-g X  balance linearity, +/- g (default\n"
	      "                          0.00015)\n"
	      "      --k K               coverage factor (default 2)\n"
	      "      --basis B           as-is (default) or anhydrous (needs\n"
	      "                          water_pct) when the specification names\n"
	      "                          no basis\n"
	      "      --water-u-pct U     standard uncertainty of water_pct, %\n"
	      "                          w/w, in an anhydrous result's u\n"
	      "                          (default 0.1)\n"
	      "\n"
	      "Reading:\n"
	      "      --delimiter D       ',' (default), ';', tab, or auto (told\n"
	      "                          from the header; ambiguous is an error)\n"
	      "      --decimal-comma     numbers are written 12,5 (needs a\n"
	      "                          delimiter other than ',')\n"
	      "      --column NAME=HEADER  read the file's column HEADER as our\n"
	      "                          column NAME (repeatable), e.g.\n"
	      "                          --column titrant_ml=\"Vol (mL)\"\n"
	      "      --columns FILE      such pairs from a CSV with the columns\n"
	      "                          name,header\n"
	      "\n"
	      "Writing:\n"
	      "      --decimals N        fixed decimals in the report (default:\n"
	      "                          10 significant digits)\n"
	      "      --sheet-style S     plain (default: UTF-8, ',', '.') or eu\n"
	      "                          (byte-order mark, ';', decimal comma)\n"
	      "      --bom               start each output with a UTF-8 BOM\n"
	      "      --raw-text          copy text cells exactly; by default a\n"
	      "                          cell starting with = + - @ tab or CR\n"
	      "                          gets a leading ' so a spreadsheet does\n"
	      "                          not run it as a formula\n"
	      "  -h, --help              this help\n"
	      "\n"
	      "Exit status: 0 every result pass (or, without --spec, none\n"
	      "judged); 1 at least one fail, retest, conditional or, with\n"
	      "--spec, no-spec or without replicates; 2 usage, input or I/O\n"
	      "error (no report written).\n",
	      out);
}

struct sink {
	FILE *out;
	al_report_options *ropt;
	unsigned long count;
};

static al_status
write_replicate(void *ud, const al_replicate *rep)
{
	struct sink *sink = ud;

	return al_replicates_row(sink->out, rep, sink->ropt);
}

static al_status
write_reject(void *ud, const char *file, unsigned long line,
	     const char *reason, const char *raw, size_t raw_len)
{
	struct sink *sink = ud;

	sink->count++;
	return al_rejects_row(sink->out, file, line, reason, raw, raw_len,
			      sink->ropt);
}

enum {
	OPT_ACID = 256, OPT_UNIT, OPT_BLANK, OPT_TITRANT, OPT_DENSITY,
	OPT_ENDPOINT, OPT_DECIMALS, OPT_REJECTS, OPT_DELIMITER,
	OPT_DECIMAL_COMMA, OPT_COLUMN, OPT_COLUMNS, OPT_SHEET, OPT_BOM,
	OPT_RAW_TEXT, OPT_TITRANTS, OPT_RECORD, OPT_ANALYST, OPT_DECISION,
	OPT_EXCLUDE, OPT_BUDGET, OPT_TITRANT_U, OPT_BURETTE, OPT_BALANCE, OPT_K,
	OPT_BASIS, OPT_RESOLUTION, OPT_WATER_U
};

static const struct option options[] = {
	{"spec", required_argument, NULL, 's'},
	{"output", required_argument, NULL, 'o'},
	{"replicates", required_argument, NULL, 'r'},
	{"rejects", required_argument, NULL, OPT_REJECTS},
	{"acid", required_argument, NULL, OPT_ACID},
	{"unit", required_argument, NULL, OPT_UNIT},
	{"blank-ml", required_argument, NULL, OPT_BLANK},
	{"titrant-mol-l", required_argument, NULL, OPT_TITRANT},
	{"density-g-ml", required_argument, NULL, OPT_DENSITY},
	{"endpoint-ph", required_argument, NULL, OPT_ENDPOINT},
	{"decimals", required_argument, NULL, OPT_DECIMALS},
	{"delimiter", required_argument, NULL, OPT_DELIMITER},
	{"decimal-comma", no_argument, NULL, OPT_DECIMAL_COMMA},
	{"column", required_argument, NULL, OPT_COLUMN},
	{"columns", required_argument, NULL, OPT_COLUMNS},
	{"sheet-style", required_argument, NULL, OPT_SHEET},
	{"bom", no_argument, NULL, OPT_BOM},
	{"raw-text", no_argument, NULL, OPT_RAW_TEXT},
	{"titrants", required_argument, NULL, OPT_TITRANTS},
	{"record", required_argument, NULL, OPT_RECORD},
	{"analyst", required_argument, NULL, OPT_ANALYST},
	{"decision", required_argument, NULL, OPT_DECISION},
	{"exclude-outliers", no_argument, NULL, OPT_EXCLUDE},
	{"budget", required_argument, NULL, OPT_BUDGET},
	{"titrant-u", required_argument, NULL, OPT_TITRANT_U},
	{"burette-tol-ml", required_argument, NULL, OPT_BURETTE},
	{"resolution-ml", required_argument, NULL, OPT_RESOLUTION},
	{"water-u-pct", required_argument, NULL, OPT_WATER_U},
	{"balance-linearity-g", required_argument, NULL, OPT_BALANCE},
	{"k", required_argument, NULL, OPT_K},
	{"basis", required_argument, NULL, OPT_BASIS},
	{"help", no_argument, NULL, 'h'},
	{NULL, 0, NULL, 0},
};

/* The column names a --column mapping may name. */
static const char *const column_names[] = {
	"sample",	 "titrant_ml", "mass_g",    "volume_ml",  "product",
	"lot",		 "replicate",  "blank_ml",  "titrant_mol_l",
	"made_up_ml",	 "aliquot_ml", "acid",	    "density_g_ml",
	"endpoint_ph",	 "titrant_lot", "date",	    "brix",	  "water_pct"};

#define MAX_COLUMN_OPTS 32

struct args {
	const char *spec, *output, *replicates, *rejects, *acid, *unit;
	const char *columns_file, *titrants, *record, *analyst, *budget;
	al_column_alias column_opts[MAX_COLUMN_OPTS];
	size_t n_column_opts;
	al_assay_options aopt;
	al_report_options ropt;
};

static int
known_column(const char *name)
{
	for (size_t i = 0; i < sizeof column_names / sizeof column_names[0]; i++)
		if (strcmp(column_names[i], name) == 0)
			return 1;
	return 0;
}

/* An option's number; bounds checked by the caller. */
static int
opt_number(const char *option, double *v)
{
	return cli_number("assay", option, optarg, v);
}

static int
parse_args(int argc, char **argv, struct args *a)
{
	int c;
	double v;
	char *eq;

	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, ":s:o:r:h", options, NULL)) != -1) {
		switch (c) {
		case 's':
			a->spec = optarg;
			break;
		case 'o':
			a->output = optarg;
			break;
		case 'r':
			a->replicates = optarg;
			break;
		case OPT_REJECTS:
			a->rejects = optarg;
			break;
		case OPT_ACID:
			a->acid = optarg;
			break;
		case OPT_UNIT:
			a->unit = optarg;
			break;
		case OPT_BLANK:
			if (opt_number("--blank-ml", &v))
				return -1;
			if (v < 0)
				return cli_usage_error(
					       "assay",
					       "--blank-ml must not be negative"),
				       -1;
			a->aopt.has_blank = 1;
			a->aopt.blank_ml = v;
			break;
		case OPT_TITRANT:
			if (opt_number("--titrant-mol-l", &v))
				return -1;
			if (!(v > 0))
				return cli_usage_error(
					       "assay",
					       "--titrant-mol-l must be above 0"),
				       -1;
			a->aopt.has_titrant = 1;
			a->aopt.titrant_mol_l = v;
			break;
		case OPT_DENSITY:
			if (opt_number("--density-g-ml", &v))
				return -1;
			if (!(v > 0))
				return cli_usage_error(
					       "assay",
					       "--density-g-ml must be above 0"),
				       -1;
			a->aopt.has_density = 1;
			a->aopt.density_g_ml = v;
			break;
		case OPT_ENDPOINT:
			if (opt_number("--endpoint-ph", &v))
				return -1;
			if (!(v >= 0 && v <= 14))
				return cli_usage_error(
					       "assay",
					       "--endpoint-ph must be from 0 to 14"),
				       -1;
			a->aopt.has_endpoint = 1;
			a->aopt.endpoint_ph = v;
			break;
		case OPT_DECIMALS:
			if (opt_number("--decimals", &v))
				return -1;
			if (!(v >= 0 && v <= 15) || v != floor(v))
				return cli_usage_error("assay",
						       "--decimals takes a whole "
						       "number from 0 to 15"),
				       -1;
			a->ropt.decimals = (int)v;
			break;
		case OPT_DELIMITER:
			if (cli_delimiter(optarg, &a->aopt.csv.delimiter))
				return cli_usage_error(
					       "assay",
					       "--delimiter: '%s' is not ',', ';', "
					       "tab or auto",
					       optarg),
				       -1;
			break;
		case OPT_DECIMAL_COMMA:
			a->aopt.csv.decimal_point = ',';
			break;
		case OPT_COLUMN:
			eq = strchr(optarg, '=');
			if (eq == NULL || eq == optarg || eq[1] == '\0')
				return cli_usage_error(
					       "assay",
					       "--column takes NAME=HEADER, e.g. "
					       "--column titrant_ml=\"Vol (mL)\""),
				       -1;
			*eq = '\0';
			if (!known_column(optarg))
				return cli_usage_error(
					       "assay",
					       "--column: '%s' is not one of our "
					       "columns (see the README)",
					       optarg),
				       -1;
			if (a->n_column_opts == MAX_COLUMN_OPTS)
				return cli_usage_error("assay",
						       "too many --column options"),
				       -1;
			a->column_opts[a->n_column_opts].name = optarg;
			a->column_opts[a->n_column_opts].header = eq + 1;
			a->n_column_opts++;
			break;
		case OPT_COLUMNS:
			a->columns_file = optarg;
			break;
		case OPT_SHEET:
			if (strcmp(optarg, "eu") == 0) {
				a->ropt.bom = 1;
				a->ropt.delimiter = ';';
				a->ropt.decimal_comma = 1;
			} else if (strcmp(optarg, "plain") == 0) {
				a->ropt.bom = 0;
				a->ropt.delimiter = ',';
				a->ropt.decimal_comma = 0;
			} else
				return cli_usage_error(
					       "assay",
					       "--sheet-style takes plain or eu"),
				       -1;
			break;
		case OPT_BOM:
			a->ropt.bom = 1;
			break;
		case OPT_RAW_TEXT:
			a->ropt.raw_text = 1;
			break;
		case OPT_TITRANTS:
			a->titrants = optarg;
			break;
		case OPT_RECORD:
			a->record = optarg;
			break;
		case OPT_ANALYST:
			a->analyst = optarg;
			break;
		case OPT_DECISION:
			if (strcmp(optarg, "simple") == 0)
				a->aopt.qc.decision = AL_DECISION_SIMPLE;
			else if (strncmp(optarg, "guarded", 7) == 0 &&
				 (optarg[7] == '\0' || optarg[7] == ':')) {
				a->aopt.qc.decision = AL_DECISION_GUARDED;
				a->aopt.qc.guard_r = 1;
				if (optarg[7] == ':' &&
				    (al_number_parse(optarg + 8, strlen(optarg + 8),
						     '.', &v) != AL_NUM_OK ||
				     !(v > 0 && v <= 10)))
					return cli_usage_error(
						       "assay",
						       "--decision guarded:R takes R "
						       "above 0 and at most 10"),
					       -1;
				if (optarg[7] == ':')
					a->aopt.qc.guard_r = v;
			} else
				return cli_usage_error("assay",
						       "--decision takes simple or "
						       "guarded[:R]"),
				       -1;
			break;
		case OPT_EXCLUDE:
			a->aopt.qc.exclude_outliers = 1;
			break;
		case OPT_BASIS:
			if (strcmp(optarg, "anhydrous") == 0)
				a->aopt.anhydrous = 1;
			else if (strcmp(optarg, "as-is") == 0)
				a->aopt.anhydrous = 0;
			else
				return cli_usage_error("assay",
						       "--basis takes as-is or "
						       "anhydrous"),
				       -1;
			break;
		case OPT_BUDGET:
			a->budget = optarg;
			break;
		case OPT_TITRANT_U:
			if (opt_number("--titrant-u", &v))
				return -1;
			if (!(v >= 0 && v < 1))
				return cli_usage_error("assay",
						       "--titrant-u is a standard "
						       "uncertainty in mol/L, from "
						       "0 to 1"),
				       -1;
			a->aopt.qc.has_titrant_u = 1;
			a->aopt.qc.titrant_u = v;
			break;
		case OPT_BURETTE:
		case OPT_BALANCE:
		case OPT_K: {
			const char *name = c == OPT_K	      ? "--k"
					   : c == OPT_BURETTE ? "--burette-tol-ml"
							      : "--balance-linearity-g";

			if (opt_number(name, &v))
				return -1;
			if (!(v > 0 && v < 100))
				return cli_usage_error("assay",
						       "%s: %s is not above 0 and "
						       "below 100",
						       name, optarg),
				       -1;
			if (c == OPT_K)
				a->aopt.qc.k = v;
			else if (c == OPT_BURETTE)
				a->aopt.qc.burette_tol_ml = v;
			else
				a->aopt.qc.balance_linearity_g = v;
			break;
		}
		case OPT_RESOLUTION:
			if (opt_number("--resolution-ml", &v))
				return -1;
			if (!(v >= 0 && v <= 1))
				return cli_usage_error("assay",
						       "--resolution-ml takes 0 "
						       "to 1 mL"),
				       -1;
			a->aopt.qc.resolution_ml = v;
			a->aopt.qc.has_resolution = 1;
			break;
		case OPT_WATER_U:
			if (opt_number("--water-u-pct", &v))
				return -1;
			if (!(v >= 0 && v <= 10))
				return cli_usage_error("assay",
						       "--water-u-pct takes 0 "
						       "to 10 %% w/w"),
				       -1;
			a->aopt.qc.water_u_pct = v;
			a->aopt.qc.has_water_u = 1;
			break;
		case 'h':
			usage(stdout);
			return 1;
		case ':':
			return cli_usage_error("assay", "option '%s' needs a value",
					       cli_bad_option(argv)),
			       -1;
		default:
			return cli_usage_error("assay", "unknown option '%s'",
					       cli_bad_option(argv)),
			       -1;
		}
	}
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
	cli_file *f = al_malloc((8 + (size_t)argc) * sizeof *f);
	size_t n = 0;
	char record[4096];
	int file_report = a->output && strcmp(a->output, "-") != 0, ok;

	if (f == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return 0;
	}
	f[n++] = (cli_file){"-o", a->output, 1};
	f[n++] = (cli_file){"--replicates", a->replicates, 1};
	f[n++] = (cli_file){"--rejects", a->rejects, 1};
	f[n++] = (cli_file){"--budget", a->budget, 1};
	if (a->record || file_report) {
		snprintf(record, sizeof record, "%s.record.json", a->output);
		f[n++] = (cli_file){a->record ? "--record" : "the record",
				    a->record ? a->record : record, 1};
	}
	f[n++] = (cli_file){"--spec", a->spec, 0};
	f[n++] = (cli_file){"--columns", a->columns_file, 0};
	f[n++] = (cli_file){"--titrants", a->titrants, 0};
	for (int i = optind; i < argc; i++)
		f[n++] = (cli_file){"input", argv[i], 0};
	ok = cli_check_files("assay", f, n) == 0;
	al_free(f);
	return ok;
}

static void
summary(const al_assay *run, const struct args *a, unsigned long rejected)
{
	al_assay_counts c = al_assay_get_counts(run);

	for (size_t i = 0; i < al_assay_cochran_count(run); i++) {
		const al_cochran *t = al_assay_cochran_at(run, i);
		const al_group_result *r = al_assay_result(run, t->result);

		cli_error("Cochran %s: C = %.4f over %zu results of n = %zu "
			"(critical %.3g at 5 %%, %.3g at 1 %%)%s%s/%s",
			t->product, t->c, t->l, t->n, t->crit5, t->crit1,
			t->c > t->crit1	  ? ": variance outlier "
			: t->c > t->crit5 ? ": variance straggler "
					  : ": largest variance ",
			r->lot, r->sample);
	}
	fprintf(stderr,
		PROG ": %lu result%s: %lu pass, %lu fail, %lu retest, %lu "
		     "no-spec",
		c.groups, c.groups == 1 ? "" : "s",
		c.by_verdict[AL_VERDICT_PASS], c.by_verdict[AL_VERDICT_FAIL],
		c.by_verdict[AL_VERDICT_RETEST],
		c.by_verdict[AL_VERDICT_NO_SPEC]);
	if (a->aopt.qc.decision == AL_DECISION_GUARDED)
		fprintf(stderr, ", %lu conditional-pass, %lu conditional-fail",
			c.by_verdict[AL_VERDICT_COND_PASS],
			c.by_verdict[AL_VERDICT_COND_FAIL]);
	fprintf(stderr, "; %lu rows read = %lu used + %lu rejected",
		c.rows_read, c.rows_used, c.rows_bad);
	if (a->ropt.guarded)
		fprintf(stderr, "; %lu text cell%s guarded against formulas",
			a->ropt.guarded, a->ropt.guarded == 1 ? "" : "s");
	fputc('\n', stderr);
	if (rejected)
		cli_error("%lu row%s rejected: see %s", rejected,
			rejected == 1 ? "" : "s", a->rejects);
}

/* Results that nothing judged (no-spec; with --spec a result whose
 * rows were all rejected is a retest): with --spec, each product without
 * a specification row is named once, with any row it matches ignoring
 * case and punctuation (never matched silently); without --spec, the
 * summary says so. The number of results not judged, or -1 when memory
 * runs out. Only the no-spec results are evaluated again. */
static long
unjudged(const al_assay *run, al_spec_table *specs)
{
	long count = (long)al_assay_get_counts(run).by_verdict[AL_VERDICT_NO_SPEC];
	const char *last = NULL; /* in the run's keys: stays valid */

	for (size_t i = 0; specs && count && i < al_assay_group_count(run);
	     i++) {
		const al_group_result *r;
		const al_spec *near;
		int oom;

		if (al_assay_result_verdict(run, i) != AL_VERDICT_NO_SPEC)
			continue;
		r = al_assay_result(run, i);
		if (last && strcmp(last, r->product) == 0)
			continue;
		last = r->product;
		near = al_spec_find_loose(specs, r->product, &oom);
		if (oom)
			return -1;
		near = al_spec_find_loose(specs, r->product, &oom);
		if (oom)
			return -1;
		if (near)
			cli_error("warning: product '%s' (%s/%s) has no "
				  "specification row; '%s' (line %lu) differs "
				  "only in case, blanks or punctuation: not "
				  "judged",
				  r->product, r->lot, r->sample, near->product,
				  near->line);
		else
			cli_error("warning: product '%s' (%s/%s) has no "
				  "specification row: not judged",
				  r->product, r->lot, r->sample);
	}
	return count;
}

static void
endpoint_warnings(const al_assay *run)
{
	for (size_t i = 0; i < al_assay_group_count(run); i++) {
		const al_group_result *r;
		double got;

		if (!(al_assay_result_flags(run, i) &
		      (AL_FLAG_RANGE | AL_FLAG_ENDPOINT_LOW)))
			continue;
		r = al_assay_result(run, i);

		if (r->flags & AL_FLAG_RANGE)
			cli_error("warning: %s/%s/%s: the range %.4g of %zu "
				"results exceeds the critical range %.4g = "
				"f(%zu) sr (ISO 5725-6): take further results; "
				"if the range of all of them still exceeds its "
				"critical range, report the median",
				r->product, r->lot, r->sample, r->range, r->stats.n,
				r->critical_range, r->stats.n);

		if (!(r->flags & AL_FLAG_ENDPOINT_LOW))
			continue;
		got = al_protons_titrated(r->acid->pka, r->acid->n_pka,
					  r->endpoint_ph);
		cli_error("warning: %s/%s/%s: endpoint pH %.2f titrates "
			"%.3f of the %d protons of %s the factor assumes; "
			"pH %.1f or above would titrate 99 %%",
			r->product, r->lot, r->sample, r->endpoint_ph, got,
			r->acid->protons, r->acid->name,
			ceil(r->endpoint_ph_needed * 10 - 1e-9) / 10);
	}
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

static al_spec_table *
load_spec(const struct args *a, const al_catalogue *cat, al_diags *d)
{
	al_status st;
	al_spec_table *specs;
	al_csv_options csv;
	FILE *in = cli_open_input(a->spec);

	if (in == NULL) {
		cli_error("%s: %s", a->spec, cli_reason(AL_OK));
		return NULL;
	}
	/* the specification is a file of our own: its delimiter is told
	 * from its header, whatever --delimiter says for the titrations */
	csv = a->aopt.csv;
	csv.delimiter = AL_CSV_AUTO;
	csv.recover = 0;
	specs = al_spec_table_read(cat, &csv, in, a->spec, &st, d);
	fclose(in);
	cli_print_diags(d);
	if (specs == NULL) {
		if (st == AL_ENOMEM || st == AL_EIO)
			cli_error("%s: %s", a->spec, al_strerror(st));
		else
			cli_error("%lu error%s in the specification file; no "
				  "report written",
				  d->errors, d->errors == 1 ? "" : "s");
	}
	return specs;
}

/* One column mapped twice, or one header to two columns, in the --column
 * options or the --columns file (an option may override the file's
 * mapping of a column): a usage error, since one would win in silence. */
static int
columns_conflict(const struct args *a, const al_column_alias *all, size_t n)
{
	size_t i, j;

	switch (al_column_aliases_check(all, n, a->n_column_opts, &i, &j)) {
	case AL_ALIAS_NAME_TWICE:
		cli_usage_error("assay", "%s maps '%s' twice (to '%s' and '%s')",
				i < a->n_column_opts ? "--column"
						     : a->columns_file,
				all[i].name, all[i].header, all[j].header);
		return -1;
	case AL_ALIAS_HEADER_TWICE:
		cli_usage_error("assay",
				"header '%s' is mapped to two columns, '%s' and "
				"'%s'",
				all[i].header, all[i].name, all[j].name);
		return -1;
	default:
		return 0;
	}
}

/* Joins the --columns file and the --column options (which win, being
 * later in the list). */
static int
load_columns(struct args *a, al_column_alias **all, size_t *n)
{
	al_column_alias *file_items = NULL;
	size_t n_file = 0;

	*all = NULL;
	*n = 0;
	if (a->columns_file) {
		al_diags d = {0};
		FILE *in = cli_open_input(a->columns_file);
		al_status st;

		if (in == NULL) {
			cli_error("%s: %s", a->columns_file, cli_reason(AL_OK));
			return -1;
		}
		st = al_column_aliases_read(in, a->columns_file, &file_items,
					    &n_file, &d);
		fclose(in);
		cli_print_diags(&d);
		al_diags_clear(&d);
		if (st != AL_OK) {
			cli_error("%s: %s", a->columns_file, al_strerror(st));
			return -1;
		}
		for (size_t i = 0; i < n_file; i++)
			if (!known_column(file_items[i].name)) {
				cli_error("%s: '%s' is not one of our columns",
					  a->columns_file, file_items[i].name);
				al_column_aliases_free(file_items, n_file);
				return -1;
			}
	}
	*all = al_calloc(n_file + a->n_column_opts + 1, sizeof **all);
	if (*all == NULL) {
		al_column_aliases_free(file_items, n_file);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	/* the option pairs first: the first match wins in al_header_map */
	for (size_t i = 0; i < a->n_column_opts; i++)
		(*all)[(*n)++] = a->column_opts[i];
	for (size_t i = 0; i < n_file; i++) {
		(*all)[*n].name = al_strdup(file_items[i].name);
		(*all)[*n].header = al_strdup(file_items[i].header);
		if ((*all)[*n].name == NULL || (*all)[*n].header == NULL) {
			al_free((char *)(*all)[*n].name);
			al_free((char *)(*all)[*n].header);
			break;
		}
		(*n)++;
	}
	al_column_aliases_free(file_items, n_file);
	if (*n != a->n_column_opts + n_file) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return columns_conflict(a, *all, *n);
}

static void
free_columns(const struct args *a, al_column_alias *all, size_t n)
{
	for (size_t i = a->n_column_opts; i < n; i++) {
		al_free((char *)all[i].name);
		al_free((char *)all[i].header);
	}
	al_free(all);
}

static int
hash_input(run_record *rec, const char *role, const char *path, long rows)
{
	char hex[65];
	unsigned long long bytes;

	if (sha256_file(path, hex, &bytes) != 0) {
		cli_error("%s: cannot read it again to hash it", path);
		return -1;
	}
	if (record_input(rec, role, path, bytes, rows, hex) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return 0;
}

static al_register *
load_titrants(const char *path)
{
	al_diags d = {0};
	al_status st;
	al_register *reg;
	FILE *in = cli_open_input(path);

	if (in == NULL) {
		cli_error("%s: %s", path, cli_reason(AL_OK));
		return NULL;
	}
	reg = al_register_read(in, path, &st, &d);
	fclose(in);
	cli_print_diags(&d);
	al_diags_clear(&d);
	if (reg == NULL)
		cli_error("%s: cannot read the titrant register (%s)", path,
			  al_strerror(st));
	return reg;
}

/* Adds to the record what a reviewer needs to re-derive each result:
 * acids, specifications and titrant lots used, the decision rule,
 * counts, and each result with its report_id. */
#define RECORD_RESULTS_MAX 10000

/* The decision rule as the record states it (ILAC G8:09/2019 4.2.1 or
 * 4.2.2); NULL when memory runs out. */
static json_t *
decision_rule(int guarded, double guard_r, int exclude)
{
	return guarded ? json_pack("{s:s, s:s, s:f, s:b, s:s}", "name",
				   "guarded acceptance", "reference",
				   "ILAC G8:09/2019 4.2.2; ISO/IEC 17025:2017 7.8.6",
				   "guard_band_r", guard_r, "outliers_excluded",
				   exclude,
				   "statement",
				   "w = r U: pass inside [min + w, max - w], fail "
				   "outside [min - w, max + w], conditional-pass "
				   "or conditional-fail in between; retest when "
				   "n < min_n, RSD > max_rsd_pct or the range "
				   "exceeds f(n) sr (ISO 5725-6)")
		       : json_pack("{s:s, s:s, s:b, s:s}", "name",
				   "simple acceptance", "reference",
				   "ILAC G8:09/2019 4.2.1; ISO/IEC 17025:2017 7.8.6",
				   "outliers_excluded", exclude, "statement",
				   "pass when min <= mean <= max (limits "
				   "inclusive, the unrounded mean, measurement "
				   "uncertainty not subtracted); retest when n < "
				   "min_n, RSD > max_rsd_pct or the range exceeds "
				   "f(n) sr (ISO 5725-6)");
}

/* Cochran's tests of the run, for the record; NULL when memory runs
 * out. */
static json_t *
cochran_tests(const al_assay *run)
{
	json_t *cochran = json_array();

	for (size_t i = 0; cochran && i < al_assay_cochran_count(run); i++) {
		const al_cochran *ct = al_assay_cochran_at(run, i);

		if (json_array_append_new(
			    cochran,
			    json_pack("{s:s, s:I, s:I, s:f, s:f, s:f}", "product",
				      ct->product, "results", (json_int_t)ct->l,
				      "n", (json_int_t)ct->n, "C", ct->c,
				      "critical_5pct", ct->crit5,
				      "critical_1pct", ct->crit1)) != 0) {
			json_decref(cochran);
			return NULL;
		}
	}
	return cochran;
}

/* Each result in the record for a lab-sized run (the first
 * RECORD_RESULTS_MAX); past that the report itself, hashed in outputs,
 * carries them. 0, or -1 when memory runs out. */
static int
record_results(json_t *results, const run_record *rec, const al_assay *run,
	       size_t n)
{
	int bad = 0;

	for (size_t i = 0; !bad && i < n && i < RECORD_RESULTS_MAX; i++) {
		const al_group_result *r = al_assay_result(run, i);
		char id[64], flags[512];

		snprintf(id, sizeof id, "%s-%04zu", rec->id, i + 1);
		al_flags_format(r->flags, r->endpoint_ph_needed, flags,
				sizeof flags);
		bad |= json_array_append_new(
			results,
			json_pack("{s:s, s:o, s:o, s:o, s:s, s:s, s:I, s:o, s:o, "
				  "s:o, s:s, s:s}",
				  "report_id", id, "product",
				  record_text(r->product), "lot",
				  record_text(r->lot), "sample",
				  record_text(r->sample), "acid",
				  r->acid->name, "unit", al_unit_name(r->unit),
				  "n", (json_int_t)r->stats.n, "mean",
				  r->stats.n ? json_real(r->stats.mean)
					     : json_null(),
				  "u", r->has_u ? json_real(r->u) : json_null(),
				  "U", r->has_u ? json_real(r->U) : json_null(),
				  "status", al_verdict_name(r->verdict), "flags",
				  flags));
	}
	return bad ? -1 : 0;
}

static int
fill_record(run_record *rec, const al_assay *run, int guarded, double guard_r,
	    int exclude)
{
	json_t *acids = json_array(), *specs = json_array();
	json_t *lots = json_array(), *results = json_array(), *rule, *counts;
	al_assay_counts c = al_assay_get_counts(run);
	size_t n = al_assay_group_count(run);
	const al_titrant *t;
	int bad = !acids || !specs || !lots || !results;
	const al_acid *acid;
	const al_spec *sp;

	/* the acids and specifications of the results: few, whatever the
	 * number of results */
	for (size_t i = 0; !bad && (acid = al_assay_acid_used(run, i)); i++)
		bad |= json_array_append_new(
			acids,
			json_pack("{s:s, s:s, s:f, s:i, s:f, s:s}", "name",
				  acid->name, "formula", acid->formula,
				  "molar_mass_g_mol", acid->molar_mass,
				  "protons", acid->protons, "g_per_meq",
				  acid->g_per_meq, "source", acid->source));
	for (size_t i = 0; !bad && (sp = al_assay_spec_used(run, i)); i++)
		bad |= json_array_append_new(
			specs,
			json_pack("{s:o, s:s?, s:s?, s:o, s:o, s:o, s:I, s:I}",
				  "product", record_text(sp->product), "acid",
				  sp->acid ? sp->acid->name : NULL, "unit",
				  sp->has_unit ? al_unit_name(sp->unit) : NULL,
				  "min",
				  sp->has_min ? json_real(sp->min) : json_null(),
				  "max",
				  sp->has_max ? json_real(sp->max) : json_null(),
				  "max_rsd_pct",
				  sp->has_max_rsd ? json_real(sp->max_rsd_pct)
						  : json_null(),
				  "min_n", (json_int_t)sp->min_n, "line",
				  (json_int_t)sp->line));
	bad |= !bad && record_results(results, rec, run, n) != 0;
	for (size_t i = 0; !bad && (t = al_assay_titrant_used(run, i)); i++) {
		char on[11], until[11];

		al_date_format(t->standardised_on, on);
		al_date_format(t->valid_until, until);
		bad |= json_array_append_new(
			lots, json_pack("{s:o, s:s, s:f, s:f, s:s, s:s}",
					"titrant_lot", record_text(t->lot),
					"standard",
					t->standard, "concentration_mol_l",
					t->concentration_mol_l, "u_mol_l",
					t->u_mol_l, "standardised_on", on,
					"valid_until", until));
	}
	rule = decision_rule(guarded, guard_r, exclude);
	counts = json_pack("{s:I, s:I, s:I, s:I, s:I, s:I, s:I, s:I}",
			   "rows_read", (json_int_t)c.rows_read, "rows_used",
			   (json_int_t)c.rows_used, "rows_rejected",
			   (json_int_t)c.rows_bad, "results",
			   (json_int_t)c.groups, "pass",
			   (json_int_t)c.by_verdict[AL_VERDICT_PASS], "fail",
			   (json_int_t)c.by_verdict[AL_VERDICT_FAIL], "retest",
			   (json_int_t)c.by_verdict[AL_VERDICT_RETEST],
			   "no_spec",
			   (json_int_t)c.by_verdict[AL_VERDICT_NO_SPEC]);
	bad |= json_object_set_new(rec->root, "acids", acids) != 0;
	bad |= json_object_set_new(rec->root, "specifications", specs) != 0;
	bad |= json_object_set_new(rec->root, "titrant_lots", lots) != 0;
	bad |= json_object_set_new(rec->root, "results", results) != 0;
	if (n > RECORD_RESULTS_MAX)
		bad |= json_object_set_new(
			       rec->root, "results_note",
			       json_sprintf("the first %d of %zu results; the "
					    "report lists all (see outputs)",
					    RECORD_RESULTS_MAX, n)) != 0;
	bad |= json_object_set_new(rec->root, "cochran", cochran_tests(run)) != 0;
	bad |= rule == NULL ||
	       json_object_set_new(rec->root, "decision_rule", rule) != 0;
	bad |= counts == NULL ||
	       json_object_set_new(rec->root, "counts", counts) != 0;
	return bad ? -1 : 0;
}

int
cmd_assay(int argc, char **argv)
{
	struct args a;
	al_catalogue *cat = NULL;
	al_spec_table *specs = NULL;
	al_assay *run = NULL;
	al_outfile *rep_out = NULL, *rej_out = NULL, *report = NULL;
	al_outfile *rec_out = NULL, *budget_out = NULL;
	al_column_alias *aliases = NULL;
	al_register *titrants = NULL;
	size_t n_aliases = 0;
	run_record rec;
	char record_path[4096];
	struct sink reps, rejs;
	al_diags spec_diags = {0};
	al_status st;
	int rc = EXIT_TROUBLE, bad = 0;
	long open_results;
	const char *out_name;
	/* the outputs the record lists, hashed by a thread (file_hashes) */
	file_hashes hashes;
	const char *out_role[FILE_HASHES_MAX], *out_path[FILE_HASHES_MAX];
	const char *in_place_role[FILE_HASHES_MAX];
	const char *in_place_path[FILE_HASHES_MAX];
	size_t n_in_place = 0;
	int hashing = 0, want_record, file_report;
	unsigned long long in_bytes = 0; /* of the titration files */

	memset(&a, 0, sizeof a);
	memset(&rec, 0, sizeof rec);
	memset(&hashes, 0, sizeof hashes);
	a.ropt.decimals = -1;
	switch (parse_args(argc, argv, &a)) {
	case 1:
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	case -1:
		return EXIT_TROUBLE;
	}
	if (!outputs_safe(&a, argc, argv))
		return EXIT_TROUBLE;
	out_name = a.output ? a.output : "standard output";
	switch (record_start(&rec, "assay", argc, argv, a.analyst)) {
	case 0:
		break;
	case -2: /* the run's time, said */
		goto out;
	default:
		cli_error("%s", al_strerror(AL_ENOMEM));
		goto out;
	}
	a.aopt.today = rec.today;
	cat = cli_catalogue();
	if (cat == NULL)
		goto out;
	a.aopt.catalogue = cat;
	if (a.acid) {
		a.aopt.default_acid = al_catalogue_find(cat, a.acid);
		if (a.aopt.default_acid == NULL) {
			cli_usage_error("assay", "--acid: unknown acid '%s'",
					a.acid);
			cli_list_acids(cat);
			goto out;
		}
	}
	if (a.unit) {
		if (cli_unit("assay", "--unit", a.unit, &a.aopt.unit) != 0)
			goto out;
		a.aopt.has_unit = 1;
	}
	if (load_columns(&a, &aliases, &n_aliases) != 0)
		goto out;
	a.aopt.aliases = aliases;
	a.aopt.n_aliases = n_aliases;
	if (a.columns_file && hash_input(&rec, "column map", a.columns_file, -1))
		goto out;
	if (a.spec) {
		specs = load_spec(&a, cat, &spec_diags);
		if (specs == NULL ||
		    hash_input(&rec, "specification", a.spec,
			       (long)al_spec_count(specs)))
			goto out;
		a.aopt.specs = specs;
	}
	if (a.titrants) {
		titrants = load_titrants(a.titrants);
		if (titrants == NULL ||
		    hash_input(&rec, "titrant register", a.titrants,
			       (long)al_register_count(titrants)))
			goto out;
		a.aopt.titrants = titrants;
	}
	reps.ropt = rejs.ropt = &a.ropt;
	reps.count = rejs.count = 0;
	if (a.replicates) {
		rep_out = open_output(a.replicates, al_replicates_header, &a.ropt);
		if (rep_out == NULL)
			goto out;
		reps.out = al_outfile_stream(rep_out);
	}
	if (a.rejects) {
		rej_out = open_output(a.rejects, al_rejects_header, &a.ropt);
		if (rej_out == NULL)
			goto out;
		rejs.out = al_outfile_stream(rej_out);
		a.aopt.on_reject = write_reject;
		a.aopt.reject_ud = &rejs;
	}
	/* a malformed record is an invalid row in either mode, and the
	 * rows after it are still read: every error is said, and the counts
	 * agree with --rejects' */
	a.aopt.csv.recover = 1;
	run = al_assay_new(&a.aopt, &st);
	if (run == NULL) {
		cli_error("%s", al_strerror(st));
		goto out;
	}
	for (int i = optind; i < argc; i++) {
		const char *name = argv[i];
		int is_stdin = strcmp(name, "-") == 0;
		FILE *in = is_stdin ? stdin : cli_open_input(name);
		unsigned long before = al_assay_get_counts(run).rows_read;
		hashing_reader h;
		char hex[65];

		if (in == NULL) {
			cli_error("%s: %s", name, cli_reason(AL_OK));
			bad = 1;
			continue;
		}
		/* hash the bytes as they are read: the record says what was
		 * used, even for standard input */
		hashing_reader_init(&h, in);
		st = al_assay_read_source(
			run, hashing_read, &h, is_stdin ? "<stdin>" : name,
			rep_out ? write_replicate : NULL, &reps);
		if (!is_stdin)
			fclose(in);
		hashing_reader_hex(&h, hex);
		in_bytes += h.bytes;
		if (record_input(&rec, "titrations", name, h.bytes,
				 (long)(al_assay_get_counts(run).rows_read -
					before),
				 hex) != 0) {
			cli_error("%s", al_strerror(AL_ENOMEM));
			goto out;
		}
		if (st == AL_EIO) {
			cli_error("%s: read or write error", name);
			bad = 1;
		} else if (st == AL_ENOMEM) {
			cli_print_diags(al_assay_diags(run));
			cli_error("%s", al_strerror(st));
			goto out;
		} else if (st != AL_OK)
			bad = 1;
	}
	cli_print_diags(al_assay_diags(run));
	if (bad || al_assay_diags(run)->errors > 0) {
		al_assay_counts c = al_assay_get_counts(run);
		unsigned long e = al_assay_diags(run)->errors;

		if (e == 0) /* an input that could not be read: said above */
			cli_error("no report written");
		else if (c.rows_read > 0)
			cli_error("%lu error%s in the input (%lu of %lu rows); "
				  "no report written",
				  e, e == 1 ? "" : "s", c.rows_bad, c.rows_read);
		else
			cli_error("%lu error%s in the input; no report written",
				  e, e == 1 ? "" : "s");
		goto out;
	}
	/* each result is evaluated once, as the report is written */
	st = al_assay_finish_lazy(run);
	if (st == AL_EIO && a.replicates) /* the replicates are written here */
		cli_error("%s: %s", a.replicates, cli_reason(AL_OK));
	else if (st != AL_OK)
		cli_error("%s", al_strerror(st));
	if (st != AL_OK)
		goto out;
	/* the run's id, in every report row and in the record */
	if (record_seal(&rec) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		goto out;
	}
	a.ropt.report_id = rec.id;
	report = open_output(a.output ? a.output : "-", NULL, &a.ropt);
	if (report == NULL)
		goto out;
	if (al_report_write(al_outfile_stream(report), run, &a.ropt) != AL_OK) {
		cli_error("%s: %s", out_name, cli_reason(AL_OK));
		goto out;
	}
	st = al_assay_settle(run);
	if (st == AL_EIO && a.replicates)
		cli_error("%s: %s", a.replicates, cli_reason(AL_OK));
	else if (st != AL_OK)
		cli_error("%s", al_strerror(st));
	if (st != AL_OK)
		goto out;
	if (a.budget) {
		budget_out = open_output(a.budget, NULL, &a.ropt);
		if (budget_out == NULL)
			goto out;
		if (al_budget_write(al_outfile_stream(budget_out), run, &a.ropt) !=
			    AL_OK ||
		    al_outfile_prepare(budget_out) != AL_OK) {
			cli_error("%s: %s", a.budget, cli_reason(AL_OK));
			goto out;
		}
	}
	file_report = a.output && strcmp(a.output, "-") != 0;
	want_record = a.record || file_report;
	if (want_record) {
		/* the outputs' bytes are all written: a thread hashes them
		 * for the record while their fsyncs run */
		al_outfile *outs[FILE_HASHES_MAX] = {file_report ? report : NULL,
						     rep_out, rej_out,
						     budget_out};
		const char *roles[FILE_HASHES_MAX] = {"report", "replicates",
						      "rejects", "budget"};
		const char *names[FILE_HASHES_MAX] = {a.output, a.replicates,
						      a.rejects, a.budget};

		for (int i = 0; i < FILE_HASHES_MAX; i++) {
			if (outs[i] == NULL)
				continue;
			/* a device, FIFO or standard output is written once
			 * and never read back (reading a FIFO would steal its
			 * bytes): listed unhashed */
			if (al_outfile_in_place(outs[i])) {
				in_place_role[n_in_place] = roles[i];
				in_place_path[n_in_place++] =
					al_outfile_path(outs[i]);
				continue;
			}
			if (outs[i] != budget_out) /* prepared (closed) above */
				fflush(al_outfile_stream(outs[i]));
			out_role[hashes.n] = roles[i];
			out_path[hashes.n] = names[i];
			hashes.path[hashes.n++] = al_outfile_written_path(outs[i]);
		}
		hashes.large = in_bytes >= (1u << 20);
		file_hashes_start(&hashes);
		hashing = 1;
	}
	/* named before the outputs appear, so that a failure leaves none */
	open_results = unjudged(run, specs);
	if (open_results < 0) {
		cli_error("%s", cli_reason(AL_ENOMEM));
		goto out;
	}
	/* every output checked before any of them appears */
	if (al_outfile_prepare(report) != AL_OK) {
		cli_error("%s: %s", out_name, cli_reason(AL_OK));
		goto out;
	}
	if (rep_out && al_outfile_prepare(rep_out) != AL_OK) {
		cli_error("%s: %s", a.replicates, cli_reason(AL_OK));
		goto out;
	}
	if (rej_out && al_outfile_prepare(rej_out) != AL_OK) {
		cli_error("%s: %s", a.rejects, cli_reason(AL_OK));
		goto out;
	}
	if (want_record) {
		const char *path = a.record;
		int hash_bad;

		if (!hashing)
			file_hashes_start(&hashes);
		hash_bad = file_hashes_finish(&hashes) != 0;
		hashing = 0;
		if (path == NULL) {
			snprintf(record_path, sizeof record_path,
				 "%s.record.json", a.output);
			path = record_path;
		}
		for (size_t i = 0; !hash_bad && i < hashes.n; i++)
			hash_bad = record_output_hashed(&rec, out_role[i],
							out_path[i],
							hashes.hex[i],
							hashes.bytes[i]) != 0;
		for (size_t i = 0; !hash_bad && i < n_in_place; i++)
			hash_bad = record_output_unhashed(&rec, in_place_role[i],
							  in_place_path[i]) != 0;
		if (!hash_bad)
			rec_out = al_outfile_open(path, &st);
		if (hash_bad || rec_out == NULL ||
		    fill_record(&rec, run,
				a.aopt.qc.decision == AL_DECISION_GUARDED,
				a.aopt.qc.guard_r, a.aopt.qc.exclude_outliers) != 0 ||
		    record_write(&rec, al_outfile_stream(rec_out), path) != 0 ||
		    al_outfile_prepare(rec_out) != AL_OK) {
			cli_error("%s: cannot write the record of the run: %s",
				  path, cli_reason(AL_OK));
			goto out;
		}
	}
	{
		al_outfile **all[] = {&report, &rep_out, &rej_out, &budget_out,
				      &rec_out};

		if (cli_commit_all(all, 5) != 0)
			goto out;
	}
	endpoint_warnings(run);
	{
		al_assay_counts c = al_assay_get_counts(run);

		summary(run, &a, rejs.count);
		if (specs == NULL)
			cli_error("nothing was judged: no --spec was given");
		/* conditional statements are not a pass (ILAC G8 4.2.2);
		 * a result no specification judged is not released */
		rc = c.by_verdict[AL_VERDICT_FAIL] ||
				     c.by_verdict[AL_VERDICT_RETEST] ||
				     c.by_verdict[AL_VERDICT_COND_PASS] ||
				     c.by_verdict[AL_VERDICT_COND_FAIL] ||
				     (specs && open_results > 0)
			     ? EXIT_NOT_PASS
			     : EXIT_ALL_PASS;
	}
out:
	if (hashing) /* an error came first: the thread reads files */
		(void)file_hashes_finish(&hashes);
	al_outfile_abort(rep_out);
	al_outfile_abort(rej_out);
	al_outfile_abort(report);
	al_outfile_abort(rec_out);
	al_outfile_abort(budget_out);
	al_assay_free(run);
	al_spec_table_free(specs);
	al_diags_clear(&spec_diags);
	free_columns(&a, aliases, n_aliases);
	al_register_free(titrants);
	al_catalogue_free(cat);
	record_free(&rec);
	return rc;
}
