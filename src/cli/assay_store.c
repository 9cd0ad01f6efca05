/* acidlot command line: an assay's run into the results store (--store),
 * in one transaction that the run's outputs wait for.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "assay_cli.h"

int
assay_store_input(struct job *j, const char *name, const char *hex)
{
	struct stored_input *grown;

	if (j->a.store == NULL)
		return 0;
	grown = al_realloc(j->inputs, (j->n_inputs + 1) * sizeof *grown);
	if (grown == NULL)
		return -1;
	j->inputs = grown;
	j->inputs[j->n_inputs].name = name;
	memcpy(j->inputs[j->n_inputs++].sha256, hex, 65);
	return 0;
}

int
assay_store_begin(struct job *j)
{
	char earlier[64];

	if (j->a.store == NULL)
		return 0;
	if ((j->store = store_open(j->a.store, 1)) == NULL ||
	    store_begin(j->store) != 0)
		return -1;
	j->in_transaction = 1;
	for (size_t i = 0; i < j->n_inputs; i++)
		switch (store_input_seen(j->store, j->inputs[i].sha256, earlier,
					 sizeof earlier)) {
		case 0:
			break;
		case 1:
			if (j->a.rerun)
				break;
			cli_error("%s: stored already by run %s (the same "
				  "SHA-256); nothing written. To store it "
				  "again, say why: --rerun REASON",
				  j->inputs[i].name, earlier);
			return -1;
		default:
			return -1;
		}
	return 0;
}

al_status
assay_store_replicate(struct job *j, const al_replicate *rep)
{
	return store_add_replicate(j->store, j->rec.id, rep) == 0 ? AL_OK
								   : AL_EIO;
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
assay_store_finish(struct job *j, int argc, char **argv)
{
	const char **names, **hashes;
	char command[4096], user[32];
	size_t len = 0;
	json_t *when = json_object_get(j->rec.root, "time_utc");
	store_run r;
	int bad;

	if (j->store == NULL)
		return 0;
	names = al_calloc(j->n_inputs + 1, sizeof *names);
	hashes = al_calloc(j->n_inputs + 1, sizeof *hashes);
	if (names == NULL || hashes == NULL) {
		AL_FREE_ALL(names, hashes);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	for (size_t i = 0; i < j->n_inputs; i++) {
		names[i] = j->inputs[i].name;
		hashes[i] = j->inputs[i].sha256;
	}
	command[0] = '\0';
	for (int i = 0; i < argc && len < sizeof command; i++)
		len += (size_t)snprintf(command + len, sizeof command - len,
					"%s%s", i ? " " : PROG " ", argv[i]);
	r = (store_run){
		.run_id = j->rec.id,
		.started_utc = json_string_value(when),
		.analyst = j->a.analyst,
		.os_user = os_user(user, sizeof user),
		.command = command,
		.version = ACIDLOT_VERSION,
		.reason = j->a.rerun,
		.input_names = names,
		.input_sha256 = hashes,
		.n_inputs = j->n_inputs,
	};
	bad = store_add_results(j->store, j->rec.id, j->run, j->rec.id) != 0 ||
	      store_add_run(j->store, &r) != 0 || store_commit(j->store) != 0;
	AL_FREE_ALL(names, hashes);
	if (!bad)
		j->in_transaction = 0;
	return bad ? -1 : 0;
}

void
assay_store_close(struct job *j)
{
	/* a failed run leaves the store as it was (a store made on its
	 * first use stays, empty: removing it could race another run
	 * storing into it) */
	if (j->in_transaction)
		store_rollback(j->store);
	store_close(j->store);
	al_free(j->inputs);
}
