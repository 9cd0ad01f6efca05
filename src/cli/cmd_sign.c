/* acidlot command line: sign (a signature on a stored run) and runs
 * (the stored runs, with their results' statuses and signatures, for
 * the reviewer to pick from). Issue 24; 21 CFR 11.50 and 11.70: the
 * printed name, the time, the meaning, linked to the record.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <getopt.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "store.h"

static const char *const meanings[] = {"reviewed", "approved", "rejected"};

static void
sign_usage(FILE *out)
{
	fputs("Usage: " PROG " sign --store DB --run RUN_ID --name NAME --role ROLE\n"
	      "            --meaning reviewed|approved|rejected --reason TEXT\n"
	      "A signature on a stored run, appended to the store's chain:\n"
	      "the name, role, meaning and reason given, the time (UTC), the\n"
	      "login that signed and the run's chain hash. '" PROG " runs'\n"
	      "lists the runs; '" PROG " verify --store' checks every\n"
	      "signature, and names the one a later change to its run breaks.\n"
	      "\n"
	      "      --store DB             the results store (assay --store)\n"
	      "      --run RUN_ID           the run signed (R and 12 hex digits)\n"
	      "      --name NAME            the signer's printed name\n"
	      "      --role ROLE            the signer's role, e.g. QC reviewer\n"
	      "      --meaning M            reviewed, approved or rejected\n"
	      "      --reason TEXT          why, in the signer's words\n"
	      "      --allow-self-approval  let the run's analyst approve it\n"
	      "                             (stored with the signature)\n"
	      "  -h, --help                 this help\n"
	      "\n"
	      "Refused (exit 2, nothing written): a run not in the store, or\n"
	      "no longer matching its hash; the same name signing the same\n"
	      "meaning twice; an approval by the run's analyst without\n"
	      "--allow-self-approval.\n"
	      "\n"
	      "Exit status: 0 signed; 2 usage, store error or a refusal.\n",
	      out);
}

enum { S_STORE = CLI_OPT, S_RUN, S_NAME, S_ROLE, S_MEANING, S_REASON,
       S_SELF };

struct sign_job {
	store_signature g;
	const char *store;
};

static int
sign_option(void *ctx, int c, char *text)
{
	struct sign_job *j = ctx;
	const cli_text t[] = {
		{S_STORE, &j->store},  {S_RUN, &j->g.run_id},
		{S_NAME, &j->g.name},  {S_ROLE, &j->g.role},
		{S_REASON, &j->g.reason},
	};
	int pick;

	if (c == S_SELF) {
		j->g.allow_self = 1;
		return 1;
	}
	if (c == S_MEANING) {
		pick = cli_pick("sign", "--meaning", text, meanings, 3);
		j->g.meaning = pick < 0 ? NULL : meanings[pick];
		return pick < 0 ? -1 : 1;
	}
	return cli_text_option(t, sizeof t / sizeof t[0], c, text);
}

/* Is s missing, or nothing but blanks? */
static int
blank(const char *s)
{
	return s == NULL || s[strspn(s, " \t\r\n")] == '\0';
}

int
cmd_sign(int argc, char **argv)
{
	static const char *const options[] = {
		"store", "run", "name", "role", "meaning", "reason",
		"allow-self-approval!"};
	struct sign_job j = {{0}, NULL};
	char when[32], user[32];
	store *s;
	int done, rc;

	done = cli_options_done(cli_options("sign", argc, argv, options, 7,
					    sign_usage, sign_option, &j));
	if (done >= 0)
		return done;
	if (optind < argc || !j.store || !j.g.run_id || !j.g.meaning ||
	    blank(j.g.name) || blank(j.g.role) || blank(j.g.reason))
		return cli_usage_error("sign", "give --store, --run, --name, "
					       "--role, --meaning and --reason "
					       "(none blank), and nothing else");
	j.g.os_user = cli_login(user, sizeof user);
	if ((s = store_open(j.store, 0)) == NULL)
		return EXIT_TROUBLE;
	rc = store_sign(s, &j.g, when);
	store_close(s);
	if (rc != 0)
		return EXIT_TROUBLE;
	printf("run %s: %s by %s (%s) at %s%s\n", j.g.run_id, j.g.meaning,
	       j.g.name, j.g.role, when,
	       j.g.allow_self ? " (self-approval allowed)" : "");
	return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
}

static void
runs_usage(FILE *out)
{
	fputs("Usage: " PROG " runs --store DB [--lot LOT] [--product P] [--format F]\n"
	      "The runs in the results store, oldest first: number, run id,\n"
	      "time, analyst, command, the statuses of its results (or its\n"
	      "titrant lots) and its signatures. The run id is what\n"
	      "'" PROG " sign --run' takes.\n"
	      "\n"
	      "      --store DB     the results store (assay --store)\n"
	      "      --lot LOT      only runs with a result of this lot\n"
	      "      --product P    only runs with a result of this product\n"
	      "      --format F     table (aligned columns) or csv; default\n"
	      "                     table on a terminal, csv into a pipe\n"
	      "  -h, --help         this help\n"
	      "\n"
	      "Exit status: 0 listed (none is not an error); 2 usage or store\n"
	      "error.\n",
	      out);
}

enum { R_STORE = CLI_OPT, R_LOT, R_PRODUCT, R_FORMAT };

struct runs_job {
	const char *store, *lot, *product;
	int table;
	store_run_info *runs;
	size_t n;
};

static int
runs_option(void *ctx, int c, char *text)
{
	struct runs_job *j = ctx;
	const cli_text t[] = {
		{R_STORE, &j->store},
		{R_LOT, &j->lot},
		{R_PRODUCT, &j->product},
	};
	int pick;

	if (c == R_FORMAT) {
		pick = cli_choice("runs", "--format", text, "table", "csv");
		j->table = pick == 0;
		return pick < 0 ? -1 : 1;
	}
	return cli_text_option(t, sizeof t / sizeof t[0], c, text);
}

static int
put_runs(void *ctx, FILE *out)
{
	const struct runs_job *j = ctx;

	fputs("seq,run_id,started_utc,analyst,command,results,signatures\n",
	      out);
	for (size_t i = 0; i < j->n; i++) {
		const store_run_info *r = &j->runs[i];

		fprintf(out, "%lld,%s,%s,", r->seq, r->run_id, r->started_utc);
		al_csv_put_field(out, r->analyst, ',');
		fprintf(out, ",%s,", r->command);
		al_csv_put_field(out, r->statuses[0] ? r->statuses : r->titrants,
				 ',');
		fputc(',', out);
		al_csv_put_field(out, r->signatures, ',');
		fputc('\n', out);
	}
	return ferror(out) ? -1 : 0;
}

int
cmd_runs(int argc, char **argv)
{
	static const char *const options[] = {"store", "lot", "product",
					      "format"};
	struct runs_job j = {NULL, NULL, NULL, -1, NULL, 0};
	store *s;
	int done, rc;

	done = cli_options_done(cli_options("runs", argc, argv, options, 4,
					    runs_usage, runs_option, &j));
	if (done >= 0)
		return done;
	if (optind < argc || j.store == NULL)
		return cli_usage_error("runs", "give --store DB (and nothing "
					       "else but --lot, --product, "
					       "--format)");
	if ((s = store_open(j.store, 0)) == NULL)
		return EXIT_TROUBLE;
	rc = store_list_runs(s, j.lot, j.product, &j.runs, &j.n);
	store_close(s);
	if (rc == 0)
		rc = cli_put_table(j.table < 0 ? cli_is_terminal() : j.table,
				   put_runs, &j);
	al_free(j.runs);
	if (rc != 0)
		return EXIT_TROUBLE;
	fprintf(stderr, PROG ": %zu run%s\n", j.n, j.n == 1 ? "" : "s");
	return 0;
}
