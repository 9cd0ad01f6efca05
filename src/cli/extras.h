/* acidlot command line: the parts built on libraries Debian gives only
 * as shared objects: libpq (a PostgreSQL store, db_pg.c) and
 * libxlsxwriter (a workbook, workbook.c). Their libraries take about
 * 20 ms to load and start, ten times a small assay, so they live in a
 * second program, acidlot-full; acidlot (linked statically, without
 * them: extras_none.c) hands it a run that needs them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_EXTRAS_H
#define ACIDLOT_CLI_EXTRAS_H

/* A run that needs acidlot-full (--store postgresql://..., --xlsx)
 * handed to it, when this program is not it: returns 0 when there is
 * nothing to hand (or this is acidlot-full), -1 after a message when
 * it cannot. */
int extras_handoff(int argc, char **argv);

#endif
