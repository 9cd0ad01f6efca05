/* acidlot command line: the convert command.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <getopt.h>
#include <math.h>
#include <string.h>

#include "cli.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " convert VALUE UNIT --acid NAME [--to-acid NAME]\n"
	      "                       [--to-unit UNIT] [--density-g-ml D]\n"
	      "Re-expresses a titratable acidity as another acid or in another\n"
	      "unit. The amount of acid in meq is kept: value / factor of the\n"
	      "first acid x factor of the second (OIV: meq/L x 0.075 = g/L\n"
	      "tartaric, x 0.049 = g/L sulfuric).\n"
	      "\n"
	      "      --acid NAME        acid VALUE is expressed as (needed\n"
	      "                         unless UNIT is meq/100g or meq/L)\n"
	      "      --to-acid NAME     acid to express it as (default --acid)\n"
	      "      --to-unit UNIT     unit to write (default UNIT)\n"
	      "      --density-g-ml D   sample density, to go between a per-mass\n"
	      "                         and a per-volume unit\n"
	      "      --brix B           or the density of a sucrose solution of\n"
	      "                         B Brix (NBS table, 0-40 Brix)\n"
	      "      --decimals N       fixed decimals (default 6 significant\n"
	      "                         digits)\n"
	      "  -h, --help             this help\n"
	      "Units: g/100g g/kg g/100mL g/L meq/100g meq/L\n"
	      "\n"
	      "Exit status: 0, or 2 on a usage or write error.\n",
	      out);
}

enum { OPT_ACID = CLI_OPT, OPT_TO_ACID, OPT_TO_UNIT, OPT_DENSITY, OPT_DECIMALS,
       OPT_BRIX };

static const al_acid *
acid_arg(const al_catalogue *cat, const char *option, const char *name)
{
	const al_acid *a = al_catalogue_find(cat, name);

	if (a == NULL) {
		cli_usage_error("convert", "%s: unknown acid '%s'", option, name);
		cli_list_acids(cat);
	}
	return a;
}

/* What the options say. */
struct conv_args {
	const char *acid, *to_acid, *to_unit;
	double density, decimals; /* 0: none; -1: the default form */
};

/* The long options, in the order of the OPT_ values (cli_options). */
static const char *const options[] = {"acid",	      "to-acid",  "to-unit",
				      "density-g-ml", "decimals", "brix"};
_Static_assert(sizeof options / sizeof options[0] == OPT_BRIX - CLI_OPT + 1,
	       "one name for each OPT_ value");

/* One option of the command: 1 taken, 0 not one, -1 a usage error. */
static int
one_option(void *ctx, int c, char *text)
{
	struct conv_args *a = ctx;
	const cli_range numbers[] = {
		{OPT_DENSITY, "--density-g-ml", 0, HUGE_VAL, CLI_ABOVE,
		 "--density-g-ml must be above 0", &a->density, NULL},
		{OPT_DECIMALS, "--decimals", 0, 15, CLI_WHOLE,
		 "--decimals takes a whole number from 0 to 15", &a->decimals,
		 NULL},
	};

	switch (c) {
	case OPT_ACID:
		a->acid = text;
		return 1;
	case OPT_TO_ACID:
		a->to_acid = text;
		return 1;
	case OPT_TO_UNIT:
		a->to_unit = text;
		return 1;
	case OPT_BRIX:
		return cli_brix_option("convert", text, &a->density);
	}
	return cli_range_option("convert", numbers, 2, c, text);
}

/* 0, 1 after --help, -1 after a usage error. */
static int
parse_args(int argc, char **argv, struct conv_args *a)
{
	memset(a, 0, sizeof *a);
	a->decimals = -1;
	return cli_options("convert", argc, argv, options,
			   sizeof options / sizeof options[0], usage,
			   one_option, a);
}

int
cmd_convert(int argc, char **argv)
{
	const al_acid *acid = NULL, *to_acid = NULL;
	double value, meq_per, out;
	al_unit unit, to_unit;
	al_catalogue *cat = NULL;
	char num[64];
	int rc = EXIT_TROUBLE, done;
	struct conv_args o;

	if ((done = cli_options_done(parse_args(argc, argv, &o))) >= 0)
		return done;
	if (argc - optind != 2)
		return cli_usage_error("convert",
				       "give a VALUE and its UNIT, e.g. '7.5 g/L'");
	if (cli_number("convert", "VALUE", argv[optind], &value))
		return EXIT_TROUBLE;
	if (!(value >= 0))
		return cli_usage_error("convert", "VALUE must not be negative");
	if (cli_unit("convert", "UNIT", argv[optind + 1], &unit) != 0)
		return EXIT_TROUBLE;
	to_unit = unit;
	if (o.to_unit &&
	    cli_unit("convert", "--to-unit", o.to_unit, &to_unit) != 0)
		return EXIT_TROUBLE;
	cat = cli_catalogue();
	if (cat == NULL)
		return EXIT_TROUBLE;
	if (o.acid && (acid = acid_arg(cat, "--acid", o.acid)) == NULL)
		goto out;
	if (o.to_acid &&
	    (to_acid = acid_arg(cat, "--to-acid", o.to_acid)) == NULL)
		goto out;
	if (to_acid == NULL)
		to_acid = acid;
	if (!al_unit_is_meq(unit) && acid == NULL) {
		cli_usage_error("convert", "%s is a mass of acid: say which acid "
					   "with --acid",
				al_unit_name(unit));
		goto out;
	}
	if (!al_unit_is_meq(to_unit) && to_acid == NULL) {
		cli_usage_error("convert", "%s is a mass of acid: say which acid "
					   "with --to-acid",
				al_unit_name(to_unit));
		goto out;
	}
	/* back to meq per g or per mL of sample */
	meq_per = value / al_unit_per(unit);
	if (!al_unit_is_meq(unit))
		meq_per /= acid->g_per_meq;
	if (al_unit_express(meq_per, al_unit_basis(unit), to_unit,
			    to_acid ? to_acid->g_per_meq : 0, o.density,
			    &out) != AL_OK) {
		cli_usage_error("convert",
				"%s is per %s and %s per %s: give the sample's "
				"--density-g-ml or --brix",
				al_unit_name(unit),
				al_unit_basis(unit) == AL_BASIS_MASS ? "mass"
								     : "volume",
				al_unit_name(to_unit),
				al_unit_basis(to_unit) == AL_BASIS_MASS
					? "mass"
					: "volume");
		goto out;
	}
	if (!al_number_computable(out)) {
		cli_error("convert: the result (%g) is out of range", out);
		goto out;
	}
	/* --decimals, else 6 significant digits (as recovery); never an
	 * exponent */
	if (o.decimals >= 0)
		al_format_number(out, (int)o.decimals, 0, num, sizeof num);
	else
		al_format_sig(out, 6, num, sizeof num);
	if (al_unit_is_meq(to_unit))
		printf("%s %s\n", num, al_unit_name(to_unit));
	else
		printf("%s %s %s\n", num, al_unit_name(to_unit), to_acid->name);
	rc = fflush(stdout) == 0 && !ferror(stdout) ? 0 : EXIT_TROUBLE;
	if (rc)
		cli_error("standard output: %s", cli_reason(AL_OK));
out:
	al_catalogue_free(cat);
	return rc;
}
