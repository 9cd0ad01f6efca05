/* acidlot command line: the assay command.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <string.h>

#include "cli.h"

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
	      "      --decimals N        fixed decimals in the report (default:\n"
	      "                          10 significant digits)\n"
	      "  -h, --help              this help\n"
	      "\n"
	      "Exit status: 0 every result pass or no-spec; 1 at least one\n"
	      "fail or retest; 2 usage, input or I/O error (no report written).\n",
	      out);
}

struct rep_sink {
	FILE *out;
	al_report_options ropt;
};

static al_status
write_replicate(void *ud, const al_replicate *rep)
{
	struct rep_sink *sink = ud;

	return al_replicates_row(sink->out, rep, &sink->ropt);
}

enum {
	OPT_ACID = 256, OPT_UNIT, OPT_BLANK, OPT_TITRANT, OPT_DENSITY,
	OPT_ENDPOINT, OPT_DECIMALS
};

static const struct option options[] = {
	{"spec", required_argument, NULL, 's'},
	{"output", required_argument, NULL, 'o'},
	{"replicates", required_argument, NULL, 'r'},
	{"acid", required_argument, NULL, OPT_ACID},
	{"unit", required_argument, NULL, OPT_UNIT},
	{"blank-ml", required_argument, NULL, OPT_BLANK},
	{"titrant-mol-l", required_argument, NULL, OPT_TITRANT},
	{"density-g-ml", required_argument, NULL, OPT_DENSITY},
	{"endpoint-ph", required_argument, NULL, OPT_ENDPOINT},
	{"decimals", required_argument, NULL, OPT_DECIMALS},
	{"help", no_argument, NULL, 'h'},
	{NULL, 0, NULL, 0},
};

struct args {
	const char *spec, *output, *replicates, *acid, *unit;
	al_assay_options aopt;
	al_report_options ropt;
};

static int
parse_args(int argc, char **argv, struct args *a)
{
	int c;
	double v;

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
		case OPT_ACID:
			a->acid = optarg;
			break;
		case OPT_UNIT:
			a->unit = optarg;
			break;
		case OPT_BLANK:
			if (cli_number("assay", "--blank-ml", optarg, &v))
				return -1;
			if (v < 0)
				return cli_usage_error("assay",
						       "--blank-ml must not be "
						       "negative"),
				       -1;
			a->aopt.has_blank = 1;
			a->aopt.blank_ml = v;
			break;
		case OPT_TITRANT:
			if (cli_number("assay", "--titrant-mol-l", optarg, &v))
				return -1;
			if (!(v > 0))
				return cli_usage_error("assay",
						       "--titrant-mol-l must be "
						       "above 0"),
				       -1;
			a->aopt.has_titrant = 1;
			a->aopt.titrant_mol_l = v;
			break;
		case OPT_DENSITY:
			if (cli_number("assay", "--density-g-ml", optarg, &v))
				return -1;
			if (!(v > 0))
				return cli_usage_error("assay",
						       "--density-g-ml must be "
						       "above 0"),
				       -1;
			a->aopt.has_density = 1;
			a->aopt.density_g_ml = v;
			break;
		case OPT_ENDPOINT:
			if (cli_number("assay", "--endpoint-ph", optarg, &v))
				return -1;
			if (!(v >= 0 && v <= 14))
				return cli_usage_error("assay",
						       "--endpoint-ph must be "
						       "from 0 to 14"),
				       -1;
			a->aopt.has_endpoint = 1;
			a->aopt.endpoint_ph = v;
			break;
		case OPT_DECIMALS:
			if (cli_number("assay", "--decimals", optarg, &v))
				return -1;
			if (!(v >= 0 && v <= 15) || v != floor(v))
				return cli_usage_error("assay",
						       "--decimals takes a whole "
						       "number from 0 to 15"),
				       -1;
			a->ropt.decimals = (int)v;
			break;
		case 'h':
			usage(stdout);
			return 1;
		case ':':
			return cli_usage_error("assay", "option '%s' needs a value",
					       argv[optind - 1]),
			       -1;
		default:
			return cli_usage_error("assay", "unknown option '%s'",
					       argv[optind - 1]),
			       -1;
		}
	}
	if (optind >= argc)
		return cli_usage_error("assay", "no titration file given"), -1;
	return 0;
}

static void
summary(const al_assay *run)
{
	al_assay_counts c = al_assay_get_counts(run);

	fprintf(stderr,
		PROG ": %lu result%s: %lu pass, %lu fail, %lu retest, %lu "
		     "no-spec; %lu rows read = %lu used + %lu rejected\n",
		c.groups, c.groups == 1 ? "" : "s",
		c.by_verdict[AL_VERDICT_PASS], c.by_verdict[AL_VERDICT_FAIL],
		c.by_verdict[AL_VERDICT_RETEST],
		c.by_verdict[AL_VERDICT_NO_SPEC], c.rows_read, c.rows_used,
		c.rows_bad);
}

static void
endpoint_warnings(const al_assay *run)
{
	for (size_t i = 0; i < al_assay_group_count(run); i++) {
		const al_group_result *r = al_assay_result(run, i);
		double got;

		if (!(r->flags & AL_FLAG_ENDPOINT_LOW))
			continue;
		got = al_protons_titrated(r->acid->pka, r->acid->n_pka,
					  r->endpoint_ph);
		fprintf(stderr,
			PROG ": warning: %s/%s/%s: endpoint pH %.2f titrates "
			     "%.3f of the %d protons of %s the factor assumes; "
			     "pH %.1f or above would titrate 99 %%\n",
			r->product, r->lot, r->sample, r->endpoint_ph, got,
			r->acid->protons, r->acid->name,
			ceil(r->endpoint_ph_needed * 10 - 1e-9) / 10);
	}
}

int
cmd_assay(int argc, char **argv)
{
	struct args a;
	al_catalogue *cat = NULL;
	al_spec_table *specs = NULL;
	al_assay *run = NULL;
	al_outfile *rep_out = NULL, *report = NULL;
	struct rep_sink sink;
	al_diags spec_diags = {0};
	al_status st;
	int rc = EXIT_TROUBLE, bad = 0;

	memset(&a, 0, sizeof a);
	a.ropt.decimals = -1;
	switch (parse_args(argc, argv, &a)) {
	case 1:
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	case -1:
		return EXIT_TROUBLE;
	}
	cat = cli_catalogue();
	if (cat == NULL)
		return EXIT_TROUBLE;
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
		if (al_unit_parse(a.unit, &a.aopt.unit) != AL_OK) {
			cli_usage_error("assay", "--unit: unknown unit '%s' (use %s)",
					a.unit, al_unit_list());
			goto out;
		}
		a.aopt.has_unit = 1;
	}
	if (a.spec) {
		FILE *in = fopen(a.spec, "rb");

		if (in == NULL) {
			cli_error("%s: %s", a.spec, strerror(errno));
			goto out;
		}
		specs = al_spec_table_read(cat, &a.aopt.csv, in, a.spec, &st,
					   &spec_diags);
		fclose(in);
		cli_print_diags(&spec_diags);
		if (specs == NULL) {
			if (st == AL_ENOMEM || st == AL_EIO)
				cli_error("%s: %s", a.spec, al_strerror(st));
			else
				cli_error("%lu error%s in the specification "
					  "file; no report written",
					  spec_diags.errors,
					  spec_diags.errors == 1 ? "" : "s");
			goto out;
		}
		a.aopt.specs = specs;
	}
	run = al_assay_new(&a.aopt, &st);
	if (run == NULL) {
		cli_error("%s", al_strerror(st));
		goto out;
	}
	sink.ropt = a.ropt;
	if (a.replicates) {
		rep_out = al_outfile_open(a.replicates, &st);
		if (rep_out == NULL) {
			cli_error("%s: %s", a.replicates,
				  st == AL_EIO ? strerror(errno)
					       : al_strerror(st));
			goto out;
		}
		sink.out = al_outfile_stream(rep_out);
		if (al_replicates_header(sink.out) != AL_OK) {
			cli_error("%s: write error", a.replicates);
			goto out;
		}
	}
	for (int i = optind; i < argc; i++) {
		const char *name = argv[i];
		int is_stdin = strcmp(name, "-") == 0;
		FILE *in = is_stdin ? stdin : fopen(name, "rb");

		if (in == NULL) {
			cli_error("%s: %s", name, strerror(errno));
			bad = 1;
			continue;
		}
		st = al_assay_read(run, in, is_stdin ? "<stdin>" : name,
				   rep_out ? write_replicate : NULL, &sink);
		if (!is_stdin)
			fclose(in);
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

		cli_error("%lu error%s in the input (%lu of %lu rows); no "
			  "report written",
			  al_assay_diags(run)->errors,
			  al_assay_diags(run)->errors == 1 ? "" : "s",
			  c.rows_bad, c.rows_read);
		goto out;
	}
	st = al_assay_finish(run);
	if (st != AL_OK) {
		cli_error("%s", al_strerror(st));
		goto out;
	}
	report = al_outfile_open(a.output ? a.output : "-", &st);
	if (report == NULL) {
		cli_error("%s: %s", a.output,
			  st == AL_EIO ? strerror(errno) : al_strerror(st));
		goto out;
	}
	if (al_report_write(al_outfile_stream(report), run, &a.ropt) != AL_OK) {
		cli_error("%s: write error", a.output ? a.output : "stdout");
		goto out;
	}
	if (rep_out) {
		st = al_outfile_commit(rep_out);
		rep_out = NULL;
		if (st != AL_OK) {
			cli_error("%s: %s", a.replicates, strerror(errno));
			goto out;
		}
	}
	st = al_outfile_commit(report);
	report = NULL;
	if (st != AL_OK) {
		cli_error("%s: %s", a.output ? a.output : "stdout",
			  strerror(errno));
		goto out;
	}
	endpoint_warnings(run);
	summary(run);
	{
		al_assay_counts c = al_assay_get_counts(run);

		rc = c.by_verdict[AL_VERDICT_FAIL] ||
				     c.by_verdict[AL_VERDICT_RETEST]
			     ? EXIT_NOT_PASS
			     : EXIT_ALL_PASS;
	}
out:
	al_outfile_abort(rep_out);
	al_outfile_abort(report);
	al_assay_free(run);
	al_spec_table_free(specs);
	al_diags_clear(&spec_diags);
	al_catalogue_free(cat);
	return rc;
}
