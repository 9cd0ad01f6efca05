/* acidlot command line: the recovery command (process recovery and base
 * demand of a lot).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <getopt.h>
#include <math.h>
#include <string.h>

#include "cli.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " recovery --ta V --unit UNIT --acid NAME\n"
	      "           (--start-kg M | --start-l V [--density-g-ml D | --brix B])\n"
	      "           [--recovered-kg R --assay PCT] [--base NAME]\n"
	      "The acid in a starting material from its titratable acidity and\n"
	      "its mass or volume; with --recovered-kg and --assay, the percent\n"
	      "recovery of a process step (recovered acid / acid present x 100);\n"
	      "with --base, the mass of that base that brings the material to\n"
	      "the endpoint (NaOH, KOH, Na2CO3, Ca(OH)2).\n"
	      "\n"
	      "      --ta V             titratable acidity of the starting material\n"
	      "      --unit UNIT        its unit (g/100g g/kg g/100mL g/L meq/100g\n"
	      "                         meq/L)\n"
	      "      --acid NAME        the acid it is expressed as\n"
	      "      --start-kg M       mass of starting material, kg\n"
	      "      --start-l V        or its volume, L\n"
	      "      --density-g-ml D   its density, to go between mass and volume\n"
	      "      --brix B           or the density of a sucrose solution of B\n"
	      "                         Brix (NBS, 0-40 Brix)\n"
	      "      --recovered-kg R   mass of product recovered, kg\n"
	      "      --assay PCT        its assay, % of the acid (w/w)\n"
	      "      --base NAME        a base to neutralise with\n"
	      "      --decimals N       fixed decimals (default 6 significant\n"
	      "                         digits, as convert)\n"
	      "  -h, --help             this help\n"
	      "\n"
	      "Exit status: 0, or 2 on a usage or write error.\n",
	      out);
}

enum {
	OPT_TA = CLI_OPT, OPT_UNIT, OPT_ACID, OPT_START_KG, OPT_START_L,
	OPT_DENSITY, OPT_BRIX, OPT_RECOVERED, OPT_ASSAY, OPT_BASE, OPT_DECIMALS
};

/* What the options say; the amounts are -1 when not given. */
struct rec_args {
	double ta, start, density, recovered, assay;
	double decimals; /* fixed decimals, or -1: 10 significant digits */
	const char *unit, *acid, *base;
	int by_volume;
};

/* What parse_args read must make a question: 0, or -1 after a usage
 * error. */
static int
check_args(int argc, char **argv, const struct rec_args *a)
{
	if (optind < argc)
		return cli_usage_error("recovery", "unexpected argument '%s'",
				       argv[optind]), -1;
	if (a->ta < 0 || a->unit == NULL || a->acid == NULL || a->start < 0)
		return cli_usage_error("recovery",
				       "give --ta, --unit, --acid and --start-kg "
				       "or --start-l"), -1;
	if ((a->recovered < 0) != (a->assay < 0))
		return cli_usage_error("recovery",
				       "--recovered-kg and --assay go together"), -1;
	if (a->recovered < 0 && a->base == NULL)
		return cli_usage_error("recovery",
				       "say what to compute: --recovered-kg with "
				       "--assay, or --base"), -1;
	return 0;
}

/* One option of the command: 1 taken, 0 not one, -1 a usage error. */
static int
one_option(void *ctx, int c, char *text)
{
	struct rec_args *a = ctx;
	const cli_text texts[] = {
		{OPT_UNIT, &a->unit}, {OPT_ACID, &a->acid}, {OPT_BASE, &a->base}};
	const cli_range t[] = {
		{OPT_TA, "--ta", 0, HUGE_VAL, CLI_ABOVE,
		 "--ta: %s is not above 0", &a->ta, NULL},
		{OPT_START_KG, "--start-kg", 0, HUGE_VAL, CLI_ABOVE,
		 "--start-kg: %s is not above 0", &a->start, NULL},
		{OPT_START_L, "--start-l", 0, HUGE_VAL, CLI_ABOVE,
		 "--start-l: %s is not above 0", &a->start, &a->by_volume},
		{OPT_DENSITY, "--density-g-ml", 0, HUGE_VAL, CLI_ABOVE,
		 "--density-g-ml: %s is not above 0", &a->density, NULL},
		{OPT_RECOVERED, "--recovered-kg", 0, HUGE_VAL, CLI_ABOVE,
		 "--recovered-kg: %s is not above 0", &a->recovered, NULL},
		{OPT_DECIMALS, "--decimals", 0, 15, CLI_WHOLE,
		 "--decimals takes a whole number from 0 to 15", &a->decimals,
		 NULL},
		{OPT_ASSAY, "--assay", 0, 110, CLI_ABOVE,
		 "--assay is a percentage above 0, at most 110", &a->assay,
		 NULL},
	};

	if (c == OPT_BRIX)
		return cli_brix_option("recovery", text, &a->density);
	if (c == OPT_START_KG)
		a->by_volume = 0;
	return cli_text_option(texts, sizeof texts / sizeof texts[0], c,
			       text) ||
	       cli_range_option("recovery", t, sizeof t / sizeof t[0], c, text);
}

/* The long options, in the order of the OPT_ values (cli_options). */
static const char *const options[] = {
	"ta",	       "unit", "acid",		"start-kg", "start-l",
	"density-g-ml", "brix", "recovered-kg", "assay",    "base",
	"decimals"};
_Static_assert(sizeof options / sizeof options[0] == OPT_DECIMALS - CLI_OPT + 1,
	       "one name for each OPT_ value");

/* 0, 1 after --help, -1 after a usage error. */
static int
parse_args(int argc, char **argv, struct rec_args *a)
{
	int got;

	memset(a, 0, sizeof *a);
	a->ta = a->start = a->recovered = a->assay = a->decimals = -1;
	got = cli_options("recovery", argc, argv, options,
			  sizeof options / sizeof options[0], usage,
			  one_option, a);
	return got != 0 ? got : check_args(argc, argv, a);
}

/* A figure as the output writes it: --decimals, else 6 significant
 * digits (as convert writes them); never an exponent. */
static const char *
fig(double v, const struct rec_args *o, char buf[128])
{
	if (o->decimals >= 0)
		al_format_number(v, (int)o->decimals, 0, buf, 128);
	else
		al_format_sig(v, 6, buf, 128);
	return buf;
}

/* The recovery (with --recovered-kg and --assay) and the base demand
 * (with --base) of acid_kg of acid, meq_total meq; 1 when more acid was
 * recovered than was present. */
static int
print_outcomes(const struct rec_args *o, const al_base *base, double acid_kg,
	       double meq_total)
{
	double recovered = o->recovered, assay = o->assay;
	int not_pass = 0;
	char a[128], b[128], c[128];

	if (recovered >= 0) {
		double got = recovered * assay / 100;

		printf("acid recovered: %s kg (%s kg at %s %%)\n",
		       fig(got, o, a), fig(recovered, o, b), fig(assay, o, c));
		printf("recovery: %s %%\n", fig(100 * got / acid_kg, o, a));
		if (got > acid_kg) {
			/* more acid out than went in: a wrong input, or a
			 * material balance to look at before any release */
			cli_error("warning: recovery is above 100 %%: more acid "
				  "was recovered than was present; check the "
				  "inputs");
			not_pass = 1;
		}
	}
	if (base) {
		double mol_base = meq_total / 1000 / base->equivalents;

		printf("base demand: %s kg %s (%s mol H+ / %d H+ per %s = "
		       "%s mol x %.3f g/mol)\n",
		       fig(mol_base * base->molar_mass / 1000, o, a), base->name,
		       fig(meq_total / 1000, o, b), base->equivalents,
		       base->formula, fig(mol_base, o, c), base->molar_mass);
	}
	return not_pass;
}

int
cmd_recovery(int argc, char **argv)
{
	char num_a[128], num_b[128];
	int not_pass = 0, rc = EXIT_TROUBLE, done;
	al_unit unit;
	al_catalogue *cat = NULL;
	const al_acid *acid;
	const al_base *base = NULL;
	double meq_per, meq_total, acid_kg, per_unit_amount;
	struct rec_args o;

	if ((done = cli_options_done(parse_args(argc, argv, &o))) >= 0)
		return done;
	if (cli_unit("recovery", "--unit", o.unit, &unit) != 0)
		return EXIT_TROUBLE;
	cat = cli_catalogue();
	if (cat == NULL)
		return EXIT_TROUBLE;
	acid = al_catalogue_find(cat, o.acid);
	if (acid == NULL) {
		cli_usage_error("recovery", "unknown acid '%s'", o.acid);
		cli_list_acids(cat);
		goto out;
	}
	if (o.base && (base = al_catalogue_find_base(cat, o.base)) == NULL) {
		cli_usage_error("recovery",
				"unknown base '%s' (NaOH, KOH, Na2CO3, Ca(OH)2)",
				o.base);
		goto out;
	}
	/* meq per g or per mL of material, then over the whole of it */
	meq_per = o.ta / al_unit_per(unit);
	if (!al_unit_is_meq(unit))
		meq_per /= acid->g_per_meq;
	per_unit_amount = o.start * 1000; /* kg to g, or L to mL */
	if ((al_unit_basis(unit) == AL_BASIS_VOLUME) != o.by_volume) {
		if (!(o.density > 0)) {
			cli_usage_error("recovery",
					"%s is per %s but the material is given "
					"by %s: add --density-g-ml or --brix",
					al_unit_name(unit),
					al_unit_basis(unit) == AL_BASIS_MASS ? "mass"
									     : "volume",
					o.by_volume ? "volume" : "mass");
			goto out;
		}
		/* per g x g/mL = per mL; per mL / (g/mL) = per g */
		meq_per = o.by_volume ? meq_per * o.density : meq_per / o.density;
	}
	meq_total = meq_per * per_unit_amount;
	acid_kg = meq_total * acid->g_per_meq / 1000;
	if (!al_number_computable(acid_kg) || !al_number_computable(meq_total) ||
	    (o.recovered >= 0 && !(acid_kg > 0))) {
		cli_error("recovery: the acid present (%g kg) is out of range",
			  acid_kg);
		goto out;
	}
	printf("acid present: %s kg as %s (%s mol H+ titratable)\n",
	       fig(acid_kg, &o, num_a), acid->name,
	       fig(meq_total / 1000, &o, num_b));
	not_pass = print_outcomes(&o, base, acid_kg, meq_total);
	rc = fflush(stdout) == 0 && !ferror(stdout) ? not_pass : EXIT_TROUBLE;
	if (rc == EXIT_TROUBLE)
		cli_error("standard output: %s", cli_reason(AL_OK));
out:
	al_catalogue_free(cat);
	return rc;
}
