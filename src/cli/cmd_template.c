/* acidlot command line: the template command, a blank bench sheet.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <string.h>

#include "cli.h"

/* samples/bench-sheet-template.csv, built in */
extern const unsigned char al_ref_template[];
extern const size_t al_ref_template_len;

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " template\n"
	      "Prints a blank bench sheet: the header of every column the\n"
	      "assay reads and a comment line of their units (a line whose\n"
	      "first cell starts with '# ' is skipped when read). Fill in one\n"
	      "row per titration, delete the columns you do not use, and read\n"
	      "it with '" PROG " assay'.\n"
	      "\n"
	      "Exit status: 0, or 2 on a usage or write error.\n",
	      out);
}

int
cmd_template(int argc, char **argv)
{
	if (argc == 2 && (strcmp(argv[1], "--help") == 0 ||
			  strcmp(argv[1], "-h") == 0)) {
		usage(stdout);
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	}
	if (argc > 1)
		return cli_usage_error("template", "unexpected argument '%s'",
				       argv[1]);
	if (fwrite(al_ref_template, 1, al_ref_template_len, stdout) !=
		    al_ref_template_len ||
	    fflush(stdout) != 0) {
		cli_error("standard output: %s", cli_reason(AL_OK));
		return EXIT_TROUBLE;
	}
	return 0;
}
