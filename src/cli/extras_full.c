/* acidlot command line: acidlot-full, the program with libpq and
 * libxlsxwriter (extras.h): nothing to hand on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "extras.h"

int
extras_handoff(int argc, char **argv)
{
	(void)argc;
	(void)argv;
	return 0;
}
