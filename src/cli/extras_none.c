/* acidlot command line: acidlot itself, without libpq and libxlsxwriter
 * (extras.h): it starts in a few milliseconds, linked statically, and
 * hands a run that needs them, before it begins, to acidlot-full in its
 * own folder.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <limits.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "db_backend.h"
#include "extras.h"
#include "workbook.h"

/* Does argv ask for a PostgreSQL store or a workbook? */
static int
wants_extras(int argc, char **argv)
{
	for (int i = 1; i < argc && strcmp(argv[i], "--") != 0; i++) {
		if (strcmp(argv[i], "--store") == 0 && i + 1 < argc &&
		    db_is_postgresql(argv[i + 1]))
			return 1;
		if (strncmp(argv[i], "--store=", 8) == 0 &&
		    db_is_postgresql(argv[i] + 8))
			return 1;
		if (strcmp(argv[i], "--xlsx") == 0 ||
		    strncmp(argv[i], "--xlsx=", 7) == 0)
			return 1;
	}
	return 0;
}

int
extras_handoff(int argc, char **argv)
{
	char path[PATH_MAX];
	ssize_t n;
	char *slash;

	if (!wants_extras(argc, argv))
		return 0;
	n = readlink("/proc/self/exe", path, sizeof path - 16);
	if (n > 0) {
		path[n] = '\0';
		if ((slash = strrchr(path, '/')) != NULL) {
			strcpy(slash + 1, "acidlot-full");
			execv(path, argv); /* returns only when it fails */
		}
	}
	cli_error("a PostgreSQL store or a workbook needs acidlot-full (this "
		  "program built with libpq and libxlsxwriter) in the same "
		  "folder: cmake -DACIDLOT_FULL=ON");
	return -1;
}

db *
db_pg_open(const char *target, int create)
{
	(void)create;
	cli_error("%s: this program has no PostgreSQL backend; run "
		  "acidlot-full", target);
	return NULL;
}

/* No workbook here: wbook_new says so, and the others are never
 * reached. */
wbook *
wbook_new(const char *path, const char *name)
{
	(void)path;
	cli_error("%s: this program writes no workbook; run acidlot-full",
		  name);
	return NULL;
}

int
wbook_csv_sheet(wbook *w, const char *sheet, const char *csv, size_t len,
		const char *unit)
{
	(void)w, (void)sheet, (void)csv, (void)len, (void)unit;
	return -1;
}

int
wbook_json_sheet(wbook *w, const char *sheet, json_t *root,
		 const char *const *skip, size_t n_skip)
{
	(void)w, (void)sheet, (void)root, (void)skip, (void)n_skip;
	return -1;
}

int
wbook_close(wbook *w)
{
	(void)w;
	return 0;
}
