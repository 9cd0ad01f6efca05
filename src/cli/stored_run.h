/* acidlot command line: a command's run into the results store (--store,
 * --rerun): its inputs noted as they are read, one transaction begun
 * before the first row goes in, and the run row and the commit before
 * the run's other outputs are put in place.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_STORED_RUN_H
#define ACIDLOT_CLI_STORED_RUN_H

#include "record.h"
#include "store.h"

typedef struct stored_run {
	const char *path;  /* --store, NULL: none */
	const char *rerun; /* --rerun REASON */
	store_input *inputs;
	size_t n_inputs;
	store *store; /* open from stored_run_begin */
	int in_transaction;
	/* what the run's row points at, until the commit */
	char command[4096], user[32];
} stored_run;

/* An input file read (its SHA-256 in hex): 0, or -1 when memory runs
 * out. Nothing without --store. */
int stored_run_input(stored_run *r, const char *name, const char *hex);
/* The store opened, the transaction begun and the run started (its id
 * and time from the sealed record): an input stored by an earlier run
 * is refused unless --rerun. 0, or -1 after a message. */
int stored_run_begin(stored_run *r, run_record *rec, const char *analyst,
		     int argc, char **argv);
/* The run's row written and the commit: 0, or -1 after a message. */
int stored_run_commit(stored_run *r);
/* Rolls back what was not committed, closes the store. */
void stored_run_close(stored_run *r);

#endif
