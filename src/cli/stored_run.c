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
	struct stored_input *grown;

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

int
stored_run_begin(stored_run *r)
{
	char earlier[64];

	if (r->path == NULL)
		return 0;
	if ((r->store = store_open(r->path, 1)) == NULL ||
	    store_begin(r->store) != 0)
		return -1;
	r->in_transaction = 1;
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

/* Who runs the program: the login name the environment gives, else
 * the user id, as the store's os_user (the analyst is what --analyst
 * says). */
static const char *
os_user(char *buf, size_t cap)
{
	const char *u = getenv("LOGNAME");

	if (u == NULL || *u == '\0')
		u = getenv("USER");
	if (u && *u)
		return u;
	snprintf(buf, cap, "uid %lu", (unsigned long)getuid());
	return buf;
}

int
stored_run_commit(stored_run *r, run_record *rec, const char *analyst,
		  int argc, char **argv)
{
	const char **names, **hashes;
	char command[4096], user[32];
	size_t len = 0;
	json_t *when = json_object_get(rec->root, "time_utc");
	store_run row;
	int bad;

	if (r->store == NULL)
		return 0;
	names = al_calloc(r->n_inputs + 1, sizeof *names);
	hashes = al_calloc(r->n_inputs + 1, sizeof *hashes);
	if (names == NULL || hashes == NULL) {
		AL_FREE_ALL(names, hashes);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	for (size_t i = 0; i < r->n_inputs; i++) {
		names[i] = r->inputs[i].name;
		hashes[i] = r->inputs[i].sha256;
	}
	command[0] = '\0';
	for (int i = 0; i < argc && len < sizeof command; i++)
		len += (size_t)snprintf(command + len, sizeof command - len,
					"%s%s", i ? " " : PROG " ", argv[i]);
	row = (store_run){
		.run_id = rec->id,
		.started_utc = json_string_value(when),
		.analyst = analyst,
		.os_user = os_user(user, sizeof user),
		.command = command,
		.version = ACIDLOT_VERSION,
		.reason = r->rerun,
		.input_names = names,
		.input_sha256 = hashes,
		.n_inputs = r->n_inputs,
	};
	bad = store_add_run(r->store, &row) != 0 || store_commit(r->store) != 0;
	AL_FREE_ALL(names, hashes);
	if (!bad)
		r->in_transaction = 0;
	return bad ? -1 : 0;
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
