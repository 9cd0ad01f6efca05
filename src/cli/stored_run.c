/* acidlot command line: a command's run into the results store.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "stored_run.h"

int
stored_run_input(stored_run *r, const char *name, const char *hex)
{
	store_input *grown;

	if (r->path == NULL)
		return 0;
	grown = al_realloc(r->inputs, (r->n_inputs + 1) * sizeof *grown);
	if (grown == NULL)
		return -1;
	r->inputs = grown;
	r->inputs[r->n_inputs].name = name;
	memcpy(r->inputs[r->n_inputs++].sha256, hex, 65);
	return 0;
}

/* Refuses an input an earlier run stored, unless --rerun: 0, or -1
 * after a message. */
static int
check_inputs(stored_run *r)
{
	char earlier[64];

	for (size_t i = 0; i < r->n_inputs; i++)
		switch (store_input_seen(r->store, r->inputs[i].sha256, earlier,
					 sizeof earlier)) {
		case 0:
			break;
		case 1:
			if (r->rerun)
				break;
			cli_error("%s: stored already by run %s (the same "
				  "SHA-256); nothing written. To store it "
				  "again, say why: --rerun REASON",
				  r->inputs[i].name, earlier);
			return -1;
		default:
			return -1;
		}
	return 0;
}

int
stored_run_begin(stored_run *r, run_record *rec, const char *analyst,
		 int argc, char **argv)
{
	json_t *when = json_object_get(rec->root, "time_utc");
	size_t len = 0;
	store_run row;

	if (r->path == NULL)
		return 0;
	for (int i = 0; i < argc && len < sizeof r->command; i++)
		len += (size_t)snprintf(r->command + len, sizeof r->command - len,
					"%s%s", i ? " " : PROG " ", argv[i]);
	row = (store_run){
		.run_id = rec->id,
		.started_utc = json_string_value(when),
		.analyst = analyst,
		.os_user = cli_login(r->user, sizeof r->user),
		.command = r->command,
		.version = ACIDLOT_VERSION,
		.reason = r->rerun,
		.inputs = r->inputs,
		.n_inputs = r->n_inputs,
	};
	if ((r->store = store_open(r->path, 1)) == NULL ||
	    store_begin(r->store) != 0)
		return -1;
	r->in_transaction = 1;
	return check_inputs(r) != 0 || store_start_run(r->store, &row) != 0
		       ? -1
		       : 0;
}

int
stored_run_commit(stored_run *r)
{
	if (r->store == NULL)
		return 0;
	/* rolled back by the store when it fails */
	r->in_transaction = 0;
	return store_commit(r->store);
}

void
stored_run_close(stored_run *r)
{
	/* a failed run leaves the store as it was (a store made on its
	 * first use stays, empty: removing it could race another run
	 * storing into it) */
	if (r->in_transaction)
		store_rollback(r->store);
	store_close(r->store);
	al_free(r->inputs);
	r->store = NULL;
	r->inputs = NULL;
}
