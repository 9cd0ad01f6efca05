/* acidlot command line: messages and option helpers.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <string.h>

#include "cli.h"

void
cli_error(const char *fmt, ...)
{
	va_list ap;

	fputs(PROG ": ", stderr);
	va_start(ap, fmt);
	vfprintf(stderr, fmt, ap);
	va_end(ap);
	fputc('\n', stderr);
}

int
cli_usage_error(const char *cmd, const char *fmt, ...)
{
	va_list ap;

	fputs(PROG ": ", stderr);
	va_start(ap, fmt);
	vfprintf(stderr, fmt, ap);
	va_end(ap);
	if (cmd)
		fprintf(stderr, "\ntry '" PROG " %s --help'\n", cmd);
	else
		fputs("\ntry '" PROG " --help'\n", stderr);
	return EXIT_TROUBLE;
}

int
cli_number(const char *cmd, const char *option, const char *text,
	   double *out)
{
	al_numerr err = al_number_parse(text, strlen(text), '.', out);

	if (err == AL_NUM_OK)
		return 0;
	cli_usage_error(cmd, "%s: '%s' %s", option, text,
			al_numerr_phrase(err));
	return -1;
}

void
cli_print_diags(const al_diags *d)
{
	size_t cap = d->cap ? d->cap : 50;

	for (size_t i = 0; i < d->count; i++) {
		const al_diag *g = &d->items[i];

		fputs(PROG ": ", stderr);
		if (g->file) {
			fputs(g->file, stderr);
			if (g->line)
				fprintf(stderr, ":%lu", g->line);
			fputs(": ", stderr);
		}
		if (g->severity == AL_SEV_WARNING)
			fputs("warning: ", stderr);
		if (g->column)
			fprintf(stderr, "%s: ", g->column);
		fprintf(stderr, "%s\n", g->message);
	}
	if (d->errors > cap)
		fprintf(stderr, PROG ": ... and %lu more errors\n",
			d->errors - cap);
	if (d->warnings > cap)
		fprintf(stderr, PROG ": ... and %lu more warnings\n",
			d->warnings - cap);
}

al_catalogue *
cli_catalogue(void)
{
	al_diags d = {0};
	al_status st;
	al_catalogue *cat = al_catalogue_new(&st, &d);

	if (cat == NULL) {
		cli_print_diags(&d);
		cli_error("cannot load the built-in acid catalogue: %s",
			  al_strerror(st));
	}
	al_diags_clear(&d);
	return cat;
}

void
cli_list_acids(const al_catalogue *cat)
{
	fputs(PROG ": known acids:", stderr);
	for (size_t i = 0; i < al_catalogue_acid_count(cat); i++)
		fprintf(stderr, " %s", al_catalogue_acid(cat, i)->name);
	fputc('\n', stderr);
}
