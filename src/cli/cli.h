/* acidlot command line: shared declarations of the sub-commands.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_H
#define ACIDLOT_CLI_H

#include <stdio.h>

#include "acidlot/acidlot.h"

/* Exit status, documented in README.md and --help. */
enum {
	EXIT_ALL_PASS = 0,  /* every result pass or no-spec */
	EXIT_NOT_PASS = 1,  /* at least one fail or retest */
	EXIT_TROUBLE = 2    /* usage, input or I/O error */
};

#define PROG "acidlot"

int cmd_assay(int argc, char **argv);
int cmd_acids(int argc, char **argv);
int cmd_convert(int argc, char **argv);

/* "acidlot: message" on stderr. */
void cli_error(const char *fmt, ...) __attribute__((format(printf, 1, 2)));
/* A usage error: the message, then "try 'acidlot CMD --help'"; returns 2. */
int cli_usage_error(const char *cmd, const char *fmt, ...)
	__attribute__((format(printf, 2, 3)));
/* Parses an option's number strictly; 0 on success, else a usage error
 * message and -1. */
int cli_number(const char *cmd, const char *option, const char *text,
	       double *out);
/* Prints diagnostics as "acidlot: file:line: column: message", warnings
 * with "warning: ", and how many more were not kept. */
void cli_print_diags(const al_diags *d);
/* Loads the built-in catalogue, reporting failure. NULL on failure. */
al_catalogue *cli_catalogue(void);
/* Names the known acids on stderr after an unknown name. */
void cli_list_acids(const al_catalogue *cat);

#endif
