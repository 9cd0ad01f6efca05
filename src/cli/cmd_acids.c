/* acidlot command line: the acids command (the acid catalogue).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <getopt.h>
#include <string.h>

#include "cli.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " acids [--csv]\n"
	      "The acid catalogue: name, formula, molar mass (g/mol, computed\n"
	      "from the formula and the standard atomic weights), protons\n"
	      "titrated, factor (g per meq), pKa values at 25 C, and source.\n"
	      "\n"
	      "      --csv    write CSV instead of a table\n"
	      "  -h, --help   this help\n"
	      "\n"
	      "Exit status: 0, or 2 on a usage or write error.\n",
	      out);
}

static void
pka_text(const al_acid *a, char *buf, size_t cap)
{
	size_t len = 0;

	buf[0] = '\0';
	for (int k = 0; k < a->n_pka && len < cap; k++) {
		int w = snprintf(buf + len, cap - len, "%s%.2f", k ? " " : "",
				 a->pka[k]);
		if (w < 0)
			break;
		len += (size_t)w;
	}
}

/* A source in short, for the table: its first part (up to ';'),
 * without the notes in brackets on how it was checked, cut to the room
 * a 100-column line leaves; --csv gives it whole. */
static void
short_source(const char *source, char *out, size_t cap)
{
	size_t n = 0, room = 100 - 75; /* the columns before it: 75 */
	int depth = 0;

	for (const char *s = source; *s && *s != ';' && n + 1 < cap; s++) {
		depth += *s == '(';
		if (depth == 0 && !(*s == ' ' && (s[1] == '(' || s[1] == ';' ||
						  s[1] == '\0')))
			out[n++] = *s;
		depth -= *s == ')' && depth > 0;
	}
	out[n] = '\0';
	if (n > room && room > 3)
		snprintf(out + room - 3, cap - (room - 3), "...");
}

int
cmd_acids(int argc, char **argv)
{
	static const struct option options[] = {
		{"csv", no_argument, NULL, 'c'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0},
	};
	int c, csv = 0;
	al_catalogue *cat;
	const al_acid *acids;
	size_t n_acids;

	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "h", options, NULL)) != -1) {
		if (c == 'c')
			csv = 1;
		else if (c == 'h') {
			usage(stdout);
			return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
		} else
			return cli_usage_error("acids", "unknown option '%s'",
					       cli_bad_option(argv));
	}
	if (optind < argc)
		return cli_usage_error("acids", "unexpected argument '%s'",
				       argv[optind]);
	cat = cli_catalogue();
	if (cat == NULL)
		return EXIT_TROUBLE;
	acids = al_catalogue_acids(cat, &n_acids);
	if (csv)
		fputs("name,formula,molar_mass_g_mol,protons,g_per_meq,pka,"
		      "notes,source\n",
		      stdout);
	else
		printf("%-19s %-12s %9s %3s %8s  %-16s %s\n", "name", "formula",
		       "g/mol", "H+", "g/meq", "pKa (25 C)", "source");
	for (size_t i = 0; i < n_acids; i++) {
		const al_acid *a = &acids[i];
		char pka[64], num[32];

		pka_text(a, pka, sizeof pka);
		if (csv) {
			al_csv_put_field(stdout, a->name, ',');
			putchar(',');
			al_csv_put_field(stdout, a->formula, ',');
			al_format_number(a->molar_mass, 3, 0, num, sizeof num);
			printf(",%s,%d,", num, a->protons);
			al_format_number(a->g_per_meq, 6, 0, num, sizeof num);
			printf("%s,%s,", num, pka);
			al_csv_put_field(stdout, a->notes, ',');
			putchar(',');
			al_csv_put_field(stdout, a->source, ',');
			putchar('\n');
		} else {
			char src[128];

			short_source(a->source, src, sizeof src);
			printf("%-19s %-12s %9.3f %3d %8.5f  %-16s %s\n",
			       a->name, a->formula, a->molar_mass, a->protons,
			       a->g_per_meq, pka, src);
		}
	}
	al_catalogue_free(cat);
	if (fflush(stdout) != 0 || ferror(stdout)) {
		cli_error("standard output: %s", cli_reason(AL_OK));
		return EXIT_TROUBLE;
	}
	return 0;
}
