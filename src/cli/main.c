/* acidlot command line: dispatch to the sub-commands.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <gsl/gsl_errno.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "extras.h"
#include "record.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " COMMAND [OPTION]... [ARG]...\n"
	      "Titratable acidity QC: titration CSV in, judged QC report out.\n"
	      "\n"
	      "Commands:\n"
	      "  assay FILE...   compute titratable acidity per lot sample,\n"
	      "                  replicate statistics and the verdict against\n"
	      "                  specification limits; writes a CSV report\n"
	      "  acids           list the acid catalogue (formula, molar mass,\n"
	      "                  protons, g/meq, pKa, source)\n"
	      "  convert V UNIT  convert a titratable acidity between acids\n"
	      "                  and units\n"
	      "  standardize FILE...  titrant concentration from primary-standard\n"
	      "                  titrations, with its uncertainty; updates the\n"
	      "                  titrant register\n"
	      "  verify RECORD.json   check that a run's inputs and outputs are\n"
	      "                  unchanged\n"
	      "  recovery        acid present in a batch, percent recovery of a\n"
	      "                  process step, base needed to neutralise it\n"
	      "  template        a blank bench sheet (CSV) with every column\n"
	      "                  the assay reads and a line of units\n"
	      "  endpoint FILE...  endpoint volumes from titration curves\n"
	      "                  (pH readings), with SVG pictures\n"
	      "  trend           a control chart of a product's stored results\n"
	      "  runs            the runs in the results store, with their\n"
	      "                  statuses and signatures\n"
	      "  sign            a reviewer's or approver's signature on a\n"
	      "                  stored run\n"
	      "  certificate     a certificate of analysis of a lot, from its\n"
	      "                  approved results (HTML)\n"
	      "\n"
	      "  " PROG " COMMAND --help   options of one command\n"
	      "  " PROG " --version        version\n"
	      "\n"
	      "Exit status (each command's --help gives its own): 0 all\n"
	      "well (assay: every result pass); 1 something needs a look\n"
	      "(assay: a fail, retest, conditional-pass, conditional-fail\n"
	      "or, with --spec, no-spec result; standardize: a lot not\n"
	      "accepted; verify: a file changed); 2 usage, input or I/O\n"
	      "error, nothing written.\n",
	      out);
}

static int dispatch(int argc, char **argv);

/* A signal that ends the run removes the outputs' temporary files
 * first, then ends it as the signal would (exit 128 + signal). */
static void
on_signal(int sig)
{
	al_outfile_unlink_all();
	signal(sig, SIG_DFL);
	raise(sig);
}

static void
catch_signals(void)
{
	static const int sigs[] = {SIGINT, SIGTERM, SIGHUP, SIGPIPE};
	struct sigaction sa;

	memset(&sa, 0, sizeof sa);
	sa.sa_handler = on_signal;
	sigemptyset(&sa.sa_mask);
	for (size_t i = 0; i < sizeof sigs / sizeof sigs[0]; i++)
		sigaction(sigs[i], &sa, NULL);
	/* past a file size limit, a write fails with EFBIG instead: the
	 * run says so, removes its files and exits 2 */
	signal(SIGXFSZ, SIG_IGN);
}

/* Test hooks (DEVELOPERS.md): ACIDLOT_FAIL_ALLOC_AT=N makes the N-th
 * allocation and every later one fail; ACIDLOT_COUNT_ALLOC=1 prints how
 * many allocations the run made. */
int
main(int argc, char **argv)
{
	const char *fail_at = getenv("ACIDLOT_FAIL_ALLOC_AT");
	int rc;

	catch_signals();
	record_use_library_alloc();
	if (fail_at && *fail_at)
		al_alloc_fail_at(strtoul(fail_at, NULL, 10));
	else
		al_alloc_fail_at(0);
	rc = extras_handoff(argc, argv) != 0 ? EXIT_TROUBLE
					    : dispatch(argc, argv);
	if (getenv("ACIDLOT_COUNT_ALLOC"))
		fprintf(stderr, PROG ": %lu allocations\n", al_alloc_count());
	return rc;
}

static int
dispatch(int argc, char **argv)
{
	static const struct {
		const char *name, *other; /* other: a second spelling */
		int (*run)(int argc, char **argv);
	} commands[] = {
		{"assay", NULL, cmd_assay},
		{"acids", NULL, cmd_acids},
		{"convert", NULL, cmd_convert},
		{"standardize", "standardise", cmd_standardize},
		{"verify", NULL, cmd_verify},
		{"recovery", NULL, cmd_recovery},
		{"template", NULL, cmd_template},
		{"endpoint", NULL, cmd_endpoint},
		{"trend", NULL, cmd_trend},
		{"runs", NULL, cmd_runs},
		{"sign", NULL, cmd_sign},
		{"certificate", NULL, cmd_certificate},
	};
	const char *names[sizeof commands / sizeof commands[0]], *near;
	const char *cmd;

	/* GSL's default handler aborts; every precondition is checked in
	 * the library instead (STYLE.md). */
	gsl_set_error_handler_off();

	if (argc < 2) {
		usage(stderr);
		return EXIT_TROUBLE;
	}
	cmd = argv[1];
	if (strcmp(cmd, "--help") == 0 || strcmp(cmd, "-h") == 0 ||
	    strcmp(cmd, "help") == 0) {
		usage(stdout);
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	}
	if (strcmp(cmd, "--version") == 0) {
		printf(PROG " %s\n", ACIDLOT_VERSION);
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	}
	for (size_t i = 0; i < sizeof commands / sizeof commands[0]; i++)
		if (strcmp(cmd, commands[i].name) == 0 ||
		    (commands[i].other && strcmp(cmd, commands[i].other) == 0))
			return commands[i].run(argc - 1, argv + 1);
	for (size_t i = 0; i < sizeof commands / sizeof commands[0]; i++)
		names[i] = commands[i].name;
	near = al_closest(cmd, strlen(cmd), names,
			  sizeof commands / sizeof commands[0]);
	if (near)
		return cli_usage_error(NULL,
				       "unknown command '%s'; did you mean "
				       "'%s'?",
				       cmd, near);
	return cli_usage_error(NULL, "unknown command '%s'", cmd);
}
