/* acidlot command line: certificate, a certificate of analysis of a lot
 * from its latest approved run in the results store (issue 24): one
 * self-contained HTML file (inline CSS, a print stylesheet, no scripts,
 * nothing fetched) carrying the items of ISO/IEC 17025:2017 7.8.2.1,
 * the statement of conformity of 7.8.6 and, when it replaces one, the
 * reference of 7.8.8; kept in the store's chain.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <getopt.h>
#include <nettle/sha2.h>
#include <stdlib.h>
#include <string.h>

#include "certificate_html.h"
#include "cli.h"
#include "db.h"
#include "record.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " certificate --store DB --lot LOT [--product P]\n"
	      "            --lab LAB.conf [--customer TEXT] [--draft] -o CERT.html\n"
	      "A certificate of analysis of a lot, from its latest approved run\n"
	      "in the results store ('" PROG " sign --meaning approved'): one\n"
	      "HTML file to print or keep (A4 or Letter), with the lab, a\n"
	      "certificate id kept in the store's chain, the page number and\n"
	      "count on every page, the method, the item, the dates, each\n"
	      "result rounded to its expanded uncertainty (GUM 7.2.6) with U\n"
	      "and k, the limits, the decision rule and a statement of\n"
	      "conformity, and the approving signature.\n"
	      "\n"
	      "      --store DB       the results store (assay --store)\n"
	      "      --lot LOT        the lot certified\n"
	      "      --product P      its product, when the lot has several\n"
	      "      --lab FILE       the lab: 'key = value' lines lab_name,\n"
	      "                       lab_address (one a line, repeatable),\n"
	      "                       accreditation, method, statement\n"
	      "                       (samples/lab.conf)\n"
	      "      --customer TEXT  the customer, printed when given\n"
	      "      --draft          from the lot's latest run, approved or\n"
	      "                       not: DRAFT on every page, not kept\n"
	      "  -o, --output FILE    the certificate (HTML)\n"
	      "  -h, --help           this help\n"
	      "\n"
	      "Issued again for a lot, it names the certificate it replaces.\n"
	      "A lot with no approved run is refused (naming the run to sign)\n"
	      "unless --draft.\n"
	      "\n"
	      "Exit status: 0 written; 2 usage, input or store error, or a\n"
	      "refusal (nothing written).\n",
	      out);
}

enum { OPT_STORE = CLI_OPT, OPT_LOT, OPT_PRODUCT, OPT_LAB, OPT_CUSTOMER,
       OPT_DRAFT };

struct job {
	const char *store, *lot, *product, *lab_path, *customer, *output;
	int draft;
	cert_lab lab;
	store_lot l;
};

static int
one_option(void *ctx, int c, char *text)
{
	struct job *j = ctx;
	const cli_text t[] = {
		{OPT_STORE, &j->store},	      {OPT_LOT, &j->lot},
		{OPT_PRODUCT, &j->product},   {OPT_LAB, &j->lab_path},
		{OPT_CUSTOMER, &j->customer}, {'o', &j->output},
	};

	if (c == OPT_DRAFT) {
		j->draft = 1;
		return 1;
	}
	return cli_text_option(t, sizeof t / sizeof t[0], c, text);
}

/* One "key = value" line into the lab: 0, or -1 after a message. */
static int
lab_line(cert_lab *lab, const char *path, int line, char *key,
	 char *value)
{
	static const char *const keys[] = {"lab_name", "lab_address",
					   "accreditation", "method",
					   "statement"};
	int k = al_name_index(keys, 5, key);

	if (k < 0) {
		cli_error("%s:%d: '%s' is not a key of a lab file (lab_name, "
			  "lab_address, accreditation, method, statement)",
			  path, line, key);
		return -1;
	}
	if ((k == 1 && lab->n_address == CERT_LINES) ||
	    (k == 4 && lab->n_statement == CERT_LINES)) {
		cli_error("%s:%d: at most %d %s lines", path, line, CERT_LINES,
			  key);
		return -1;
	}
	if (k == 0)
		snprintf(lab->name, sizeof lab->name, "%s", value);
	else if (k == 1)
		snprintf(lab->address[lab->n_address++], 256, "%s", value);
	else if (k == 2)
		snprintf(lab->accreditation, sizeof lab->accreditation, "%s",
			 value);
	else if (k == 3)
		snprintf(lab->method, sizeof lab->method, "%s", value);
	else
		snprintf(lab->statement[lab->n_statement++], 512, "%s", value);
	return 0;
}

/* s without blanks at either end (in place). */
static char *
trimmed(char *s)
{
	size_t n;

	while (*s == ' ' || *s == '\t')
		s++;
	n = strlen(s);
	while (n > 0 && strchr(" \t\r\n", s[n - 1]))
		s[--n] = '\0';
	return s;
}

/* LAB.conf read: blank lines and lines starting with # skipped;
 * lab_name, one lab_address and method required. */
static int
read_lab(cert_lab *lab, const char *path)
{
	FILE *in = cli_open_input(path);
	char buf[1024];
	int line = 0, bad = 0;

	if (in == NULL) {
		cli_error("%s: %s", path, cli_reason(AL_OK));
		return -1;
	}
	while (!bad && fgets(buf, sizeof buf, in)) {
		char *s = trimmed(buf), *eq;

		line++;
		if (*s == '\0' || *s == '#')
			continue;
		if ((eq = strchr(s, '=')) == NULL) {
			cli_error("%s:%d: not a 'key = value' line", path, line);
			bad = 1;
			break;
		}
		*eq = '\0';
		bad = lab_line(lab, path, line, trimmed(s), trimmed(eq + 1)) != 0;
	}
	fclose(in);
	if (!bad && (!lab->name[0] || !lab->n_address || !lab->method[0])) {
		cli_error("%s: needs lab_name, lab_address and method", path);
		bad = 1;
	}
	return bad ? -1 : 0;
}

static int
write_html(void *ctx, FILE *out)
{
	const struct job *j = ctx;

	return cert_write_html(out, &j->lab, &j->l, j->customer, j->draft);
}

/* The HTML made in memory, its SHA-256 taken, then written to its
 * output (not yet in place). */
static int
make(struct job *j, al_outfile *f, char hex[65])
{
	char *text = NULL;
	size_t len = 0;
	struct sha256_ctx h;
	int bad = cli_capture(write_html, j, &text, &len) != 0;

	if (!bad) {
		sha256_init(&h);
		sha256_update(&h, len, (const uint8_t *)text);
		sha256_ctx_hex(&h, hex);
		bad = fwrite(text, 1, len, al_outfile_stream(f)) != len ||
		      al_outfile_prepare(f) != AL_OK;
	}
	free(text);
	if (bad)
		cli_error("%s: %s", j->output, cli_reason(AL_OK));
	return bad ? -1 : 0;
}

/* The certificate written and (unless a draft) kept in the store, then
 * put in place: 0, or -1 after a message. */
static int
issue(struct job *j, store *s)
{
	al_outfile *f = NULL, **all[] = {&f};
	char hex[65];
	al_status st;

	int bad;

	if (store_certificate_begin(s, &j->l, j->draft) != 0)
		return -1;
	if ((f = al_outfile_open(j->output, &st)) == NULL)
		cli_error("%s: %s", j->output, cli_reason(st));
	bad = f == NULL || make(j, f, hex) != 0;
	/* the certificate kept in the store before its file appears; a
	 * draft is not kept */
	if (bad || j->draft)
		store_rollback(s);
	else
		bad = store_certificate_commit(s, &j->l, j->customer, hex) != 0;
	if (bad) {
		al_outfile_abort(f);
		return -1;
	}
	return cli_commit_all(all, 1);
}

int
cmd_certificate(int argc, char **argv)
{
	static const char *const options[] = {"store",	  "lot",     "product",
					      "lab",	  "customer", "draft!",
					      "output=o"};
	struct job *j = al_calloc(1, sizeof *j);
	store *s;
	int done, rc = EXIT_TROUBLE;

	if (j == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return EXIT_TROUBLE;
	}
	done = cli_options_done(cli_options("certificate", argc, argv, options,
					    7, usage, one_option, j));
	if (done >= 0) {
		al_free(j);
		return done;
	}
	if (optind < argc || !j->store || !j->lot || !j->lab_path || !j->output)
		rc = cli_usage_error("certificate", "give --store, --lot, --lab "
						    "and -o (and nothing else "
						    "but --product, --customer, "
						    "--draft)");
	else if (cli_check_files("certificate",
				 (const cli_file[]){{"-o", j->output, 1},
						    {"--lab", j->lab_path, 0},
						    {"--store", j->store, 0}},
				 db_is_postgresql(j->store) ? 2 : 3) == 0 &&
		 read_lab(&j->lab, j->lab_path) == 0 &&
		 (s = store_open(j->store, 0)) != NULL) {
		snprintf(j->l.lot, sizeof j->l.lot, "%s", j->lot);
		snprintf(j->l.product, sizeof j->l.product, "%s",
			 j->product ? j->product : "");
		if (issue(j, s) == 0) {
			rc = 0;
			fprintf(stderr, PROG ": %s: %s of lot %s (%s), from run "
					"%s%s%s\n",
				j->output, j->draft ? "a draft" : j->l.certificate_id,
				j->l.lot, j->l.product, j->l.run_id,
				j->l.replaces[0] && !j->draft ? "; it replaces " : "",
				j->draft ? "" : j->l.replaces);
		}
		store_close(s);
	}
	al_free(j->l.results);
	al_free(j);
	return rc;
}
