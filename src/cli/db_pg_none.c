/* acidlot command line: the program without libpq. It starts in a few
 * milliseconds (linked statically; libpq's libraries alone take about
 * 20 ms to load and start here), so a run with a PostgreSQL store is
 * handed, before it begins, to acidlot-pg beside it: the same program
 * with the PostgreSQL backend (db_pg.c).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <limits.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "db_backend.h"

/* Does argv give --store a PostgreSQL URI? */
static int
wants_postgresql(int argc, char **argv)
{
	for (int i = 1; i < argc && strcmp(argv[i], "--") != 0; i++) {
		if (strcmp(argv[i], "--store") == 0 && i + 1 < argc &&
		    db_is_postgresql(argv[i + 1]))
			return 1;
		if (strncmp(argv[i], "--store=", 8) == 0 &&
		    db_is_postgresql(argv[i] + 8))
			return 1;
	}
	return 0;
}

int
db_pg_handoff(int argc, char **argv)
{
	char path[PATH_MAX];
	ssize_t n;
	char *slash;

	if (!wants_postgresql(argc, argv))
		return 0;
	n = readlink("/proc/self/exe", path, sizeof path - 16);
	if (n > 0) {
		path[n] = '\0';
		if ((slash = strrchr(path, '/')) != NULL) {
			strcpy(slash + 1, "acidlot-pg");
			execv(path, argv); /* returns only when it fails */
		}
	}
	cli_error("a PostgreSQL store needs acidlot-pg, this program built "
		  "with libpq, in the same folder (cmake -DACIDLOT_POSTGRESQL=ON)");
	return -1;
}

db *
db_pg_open(const char *target, int create)
{
	(void)create;
	cli_error("%s: this program has no PostgreSQL backend; run acidlot-pg",
		  target);
	return NULL;
}
