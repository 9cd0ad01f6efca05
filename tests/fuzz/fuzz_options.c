/* acidlot fuzz target: option values. The input is an argument vector
 * (arguments separated by NUL bytes) given to convert and to recovery,
 * whose whole option parsing and arithmetic run on it, and each
 * argument to the value parsers that every command shares (numbers,
 * units, delimiters). A number accepted is always one the arithmetic
 * can carry.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <getopt.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/number.h"
#include "cli.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* getopt keeps its place in the last vector: start it afresh */
static void
getopt_reset(void)
{
	char *v[] = {"x", NULL};

	optind = 0;
	(void)getopt(1, v, "");
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	char *text, *argv[34];
	int argc = 1;
	static int quiet;

	if (!quiet) {
		/* no command may wait for input (run.sh closes the output
		 * the commands write: -close_fd_mask=3) */
		if (freopen("/dev/null", "r", stdin) == NULL)
			__builtin_trap();
		quiet = 1;
	}
	if (size > 4096 || (text = malloc(size + 1)) == NULL)
		return 0;
	memcpy(text, data, size);
	text[size] = '\0';
	argv[0] = "cmd";
	for (char *p = text; argc < 33 && p <= text + size;
	     p += strlen(p) + 1)
		argv[argc++] = p;
	argv[argc] = NULL;
	for (int i = 1; i < argc; i++) {
		double v;
		al_unit u;
		char d;

		if (cli_number("fuzz", "--x", argv[i], &v) == 0 &&
		    !al_number_computable(v))
			__builtin_trap();
		(void)cli_unit("fuzz", "--unit", argv[i], &u);
		(void)cli_delimiter(argv[i], &d);
	}
	getopt_reset();
	(void)cmd_convert(argc, argv);
	getopt_reset();
	(void)cmd_recovery(argc, argv);
	free(text);
	return 0;
}
