/* acidlot command line: the verify command (re-hash a run's files).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <errno.h>
#include <getopt.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "record.h"
#include "store.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " verify [--format F] RECORD.json...\n"
	      "       " PROG " verify --store DB\n"
	      "Re-hashes every input and output a run's record lists and says\n"
	      "whether any changed since (SHA-256), and checks the report's\n"
	      "rows against the record's results. A file's path is taken from\n"
	      "the record's folder, else as the run gave it.\n"
	      "\n"
	      "  --format F   table (aligned columns) or csv; default table on\n"
	      "               a terminal, csv into a file or pipe\n"
	      "  --store DB   recompute the results store's hash chain:\n"
	      "               \"N runs, M results, chain intact\", or the\n"
	      "               first run whose data or hash no longer match\n"
	      "  -h, --help   this help\n"
	      "\n"
	      "One line per file: record, check (ok, changed, missing,\n"
	      "not-a-file, skipped, contradicts), role, file, note.\n"
	      "\n"
	      "Exit status: 0 nothing changed; 1 a file changed or is missing,\n"
	      "or the report contradicts the record; 2 usage error or a\n"
	      "record that cannot be read.\n",
	      out);
}

/* One file's line, as CSV: the record, the check, the file's role, its
 * name (escaped: no control character reaches a terminal) and a note.
 * Nothing when out is NULL. */
static void
line(FILE *out, const char *record, const char *check, const char *role,
     const char *path, const char *note)
{
	char *name = NULL;
	size_t len = 0;
	FILE *m;

	if (out == NULL)
		return;
	m = open_memstream(&name, &len);
	if (m != NULL) {
		cli_put_escaped(m, path);
		if (fclose(m) != 0) {
			free(name);
			name = NULL;
		}
	}
	al_csv_put_field(out, record, ',');
	fprintf(out, ",%s,", check);
	al_csv_put_field(out, role ? role : "", ',');
	fputc(',', out);
	/* no memory for the escaped name: a placeholder, never raw bytes */
	al_csv_put_field(out, name ? name : "(name not shown: no memory)",
			 ',');
	fputc(',', out);
	al_csv_put_field(out, note, ',');
	fputc('\n', out);
	free(name);
}

/* A file's path from the record's own folder (from_record), so that
 * verify works from any directory; else the path as the run named it. */
static const char *
located(const char *path, const char *rel, const char *record, char *where,
	size_t cap)
{
	const char *slash = strrchr(record, '/');

	if (rel == NULL || rel[0] == '/')
		return path;
	snprintf(where, cap, "%.*s%s", slash ? (int)(slash - record + 1) : 0,
		 record, rel);
	return where;
}

/* The report's rows against the record's results: each report_id the
 * record lists, with its status and n, and no other. */
struct cross {
	json_t *by_id;         /* report_id -> result */
	int col[3];            /* report_id, status, n */
	int header;
	FILE *out;
	const char *record, *path;
	unsigned long rows, contradictions;
};

static void
contradiction(struct cross *x, unsigned long at, const char *what)
{
	char note[256];

	snprintf(note, sizeof note, "line %lu: %s", at, what);
	line(x->out, x->record, "contradicts", "report", x->path, note);
	x->contradictions++;
}

static al_status
cross_row(void *ud, const al_csv_row *row)
{
	static const char *const names[3] = {"report_id", "status", "n"};
	struct cross *x = ud;
	char id[64], status[32], n[32], what[160];
	const char *s;
	size_t len;
	json_t *r;

	if (!x->header) {
		x->header = 1;
		for (int k = 0; k < 3; k++) {
			x->col[k] = -1;
			for (size_t i = 0; i < row->nfields; i++)
				if (al_word_eq(row->fields[i], row->lens[i],
					       names[k]))
					x->col[k] = (int)i;
		}
		return AL_OK;
	}
	if (x->col[0] < 0 || x->col[1] < 0 || x->col[2] < 0)
		return AL_OK;
	x->rows++;
	s = al_cell(row, x->col[0], &len);
	snprintf(id, sizeof id, "%.*s", (int)len, s);
	s = al_cell(row, x->col[1], &len);
	snprintf(status, sizeof status, "%.*s", (int)len, s);
	s = al_cell(row, x->col[2], &len);
	snprintf(n, sizeof n, "%.*s", (int)len, s);
	r = json_object_get(x->by_id, id);
	if (r == NULL) {
		snprintf(what, sizeof what, "%.40s is not among the record's "
					    "results", id);
		contradiction(x, row->line, what);
	} else if (strcmp(status, json_string_value(json_object_get(r, "status"))
				  ? json_string_value(json_object_get(r, "status"))
				  : "") != 0 ||
		   strtoll(n, NULL, 10) !=
			   json_integer_value(json_object_get(r, "n"))) {
		snprintf(what, sizeof what,
			 "%.40s: status %.20s, n %.20s; the record says %.20s, "
			 "n %lld",
			 id, status, n,
			 json_string_value(json_object_get(r, "status")),
			 (long long)json_integer_value(json_object_get(r, "n")));
		contradiction(x, row->line, what);
	}
	return AL_OK;
}

/* Reads the report named in the record and checks it against the
 * record's results; the count of contradictions, 0 when there is no
 * report file to read or no results to check it against. */
static int
cross_check(FILE *out, json_t *root, const char *record)
{
	json_t *results = json_object_get(root, "results"), *f, *r;
	struct cross x;
	size_t i;
	char where[8192];
	const char *path = NULL;
	al_csv_options opt = {0};
	al_diags d = {0};
	FILE *in;

	if (!json_is_array(results))
		return 0;
	json_array_foreach(json_object_get(root, "outputs"), i, f)
		if (json_is_string(json_object_get(f, "sha256")) &&
		    strcmp(json_string_value(json_object_get(f, "role"))
				   ? json_string_value(json_object_get(f, "role"))
				   : "",
			   "report") == 0)
			path = located(
				json_string_value(json_object_get(f, "path")),
				json_string_value(json_object_get(f, "from_record")),
				record, where, sizeof where);
	if (path == NULL || (in = fopen(path, "rb")) == NULL)
		return 0; /* said by the hashes already */
	memset(&x, 0, sizeof x);
	x.out = out;
	x.record = record;
	x.path = path;
	x.by_id = json_object();
	json_array_foreach(results, i, r)
		if (json_is_string(json_object_get(r, "report_id")))
			json_object_set(x.by_id,
					json_string_value(json_object_get(r, "report_id")),
					r);
	opt.delimiter = AL_CSV_AUTO;
	opt.recover = 1;
	(void)al_csv_read_file(&opt, in, path, cross_row, &x, &d);
	fclose(in);
	al_diags_clear(&d);
	if (x.col[0] >= 0 && x.rows != json_array_size(results)) {
		char what[96];

		snprintf(what, sizeof what, "%lu result rows; the record lists %zu",
			 x.rows, json_array_size(results));
		contradiction(&x, 1, what);
	}
	json_decref(x.by_id);
	return (int)x.contradictions;
}

static int
check_files(FILE *out, json_t *list, const char *record, cli_hash_fn hash)
{
	size_t i;
	json_t *f;
	int changed = 0;

	if (!json_is_array(list) || json_array_size(list) == 0)
		return -1; /* a record proves something of some files */
	json_array_foreach(list, i, f)
	{
		char raw[4096], raw_rel[4096], where[8192];
		const char *path = record_name(f, "path_hex", raw, sizeof raw);
		const char *rel =
			record_name(f, "from_record_hex", raw_rel, sizeof raw_rel);
		const char *role = json_string_value(json_object_get(f, "role"));
		const char *want = json_string_value(json_object_get(f, "sha256"));
		char hex[65];
		unsigned long long bytes;

		if (path == NULL)
			path = json_string_value(json_object_get(f, "path"));
		if (rel == NULL)
			rel = json_string_value(json_object_get(f, "from_record"));
		if (path == NULL)
			return -1;
		if (want == NULL && json_is_null(json_object_get(f, "sha256"))) {
			line(out, record, "skipped", role, path,
			     "written in place to a device or pipe: not "
			     "hashed");
			continue;
		}
		if (want == NULL)
			return -1;
		if (strcmp(path, "-") == 0) {
			line(out, record, "skipped", role, path,
			     "standard input cannot be read again");
			continue;
		}
		path = located(path, rel, record, where, sizeof where);
		if (hash(path, hex, &bytes) != 0) {
			line(out, record,
			     errno == ENOENT ? "missing" : "not-a-file", role,
			     path, "");
			changed++;
		} else if (strcmp(hex, want) != 0) {
			line(out, record, "changed", role, path,
			     "SHA-256 differs from the record");
			changed++;
		} else
			line(out, record, "ok", role, path, "");
	}
	return changed;
}

int
cli_verify_root(FILE *out, json_t *root, const char *record, cli_hash_fn hash)
{
	int a = check_files(out, json_object_get(root, "inputs"), record, hash);
	int b = a < 0 ? -1
		      : check_files(out, json_object_get(root, "outputs"),
				    record, hash);

	return a < 0 || b < 0 ? -1 : a + b;
}

/* One record read and checked, its lines into out: the count of files
 * changed or missing and of contradictions, or -1 after a message. */
static int
verify_one(FILE *out, const char *path)
{
	json_error_t err;
	json_t *root;
	FILE *in = cli_open_input(path);
	int n;

	if (in == NULL) {
		cli_error("%s: %s", path, cli_reason(AL_OK));
		return -1;
	}
	/* jansson does not fill every byte of err on every path */
	memset(&err, 0, sizeof err);
	errno = 0;
	root = json_loadf(in, 0, &err);
	fclose(in);
	/* jansson reports some failed allocations as syntax errors; our
	 * allocator leaves errno at ENOMEM */
	if (root == NULL && (json_error_code(&err) == json_error_out_of_memory ||
			     errno == ENOMEM))
		cli_error("%s: %s", path, al_strerror(AL_ENOMEM));
	else if (root == NULL && err.line < 1) /* no line: not read at all */
		cli_error("%s: %s", path, errno ? cli_reason(AL_OK) : err.text);
	else if (root == NULL)
		cli_error("%s:%d: not a readable record: %s", path, err.line,
			  err.text);
	if (root == NULL)
		return -1;
	n = cli_verify_root(out, root, path, sha256_file);
	if (n >= 0)
		n += cross_check(out, root, path);
	json_decref(root);
	if (n < 0)
		cli_error("%s: not an acidlot record (no inputs and outputs "
			  "with path and sha256)",
			  path);
	return n;
}

struct verify_run {
	int argc;
	char **argv;
	int changed;
	int table;	   /* -1 until --format or the terminal says */
	const char *store; /* --store DB */
};

/* Every record's lines into out under one header; -1 at the first that
 * cannot be read. */
static int
verify_all(void *ctx, FILE *out)
{
	struct verify_run *v = ctx;

	fputs("record,check,role,file,note\n", out);
	for (int i = optind; i < v->argc; i++) {
		int n = verify_one(out, v->argv[i]);

		if (n < 0)
			return -1;
		v->changed += n;
	}
	return 0;
}

static int
one_option(void *ctx, int c, char *text)
{
	struct verify_run *v = ctx;
	int pick;

	if (c == CLI_OPT + 1) {
		v->store = text;
		return 1;
	}
	pick = cli_choice("verify", "--format", text, "table", "csv");
	v->table = pick == 0;
	return pick < 0 ? -1 : 1;
}

/* The store's hash chain recomputed: 0 intact, 1 broken, 2 when it
 * cannot be read (each said). */
static int
verify_store(const char *path)
{
	store *s = store_open(path, 0);
	unsigned long runs = 0, results = 0;
	char bad[512], why[512]; /* each cap: sizeof why */
	int rc;

	if (s == NULL)
		return EXIT_TROUBLE;
	rc = store_verify(s, &runs, &results, bad, why, sizeof why);
	store_close(s);
	if (rc < 0)
		return EXIT_TROUBLE;
	if (rc > 0 && strcmp(bad, "the store") == 0)
		printf("%s (the %lu runs' chain itself holds)\n", why, runs);
	else if (rc > 0)
		printf("%s: %s (the %lu run%s before it check%s out)\n",
		       bad, why, runs, runs == 1 ? "" : "s",
		       runs == 1 ? "s" : "");
	if (rc > 0) {
		fprintf(stderr, PROG ": %s: the chain is broken\n", path);
		return EXIT_NOT_PASS;
	}
	printf("%lu run%s, %lu result%s, chain intact\n", runs,
	       runs == 1 ? "" : "s", results, results == 1 ? "" : "s");
	return 0;
}

int
cmd_verify(int argc, char **argv)
{
	static const char *const options[] = {"format", "store"};
	struct verify_run v = {argc, argv, 0, -1, NULL};
	int done, rc = 0;

	done = cli_options_done(cli_options("verify", argc, argv, options, 2,
					    usage, one_option, &v));
	if (done >= 0)
		return done;
	if (optind >= argc && v.store == NULL)
		return cli_usage_error("verify", "no record or --store given");
	if (v.store && (rc = verify_store(v.store)) != 0)
		return rc;
	if (optind >= argc)
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	if (v.table < 0)
		v.table = cli_is_terminal();
	if (cli_put_table(v.table, verify_all, &v) != 0)
		return EXIT_TROUBLE;
	if (fflush(stdout) != 0 || ferror(stdout)) {
		cli_error("standard output: %s", cli_reason(AL_OK));
		return EXIT_TROUBLE;
	}
	fprintf(stderr, PROG ": %s\n",
		v.changed ? "something changed since the run"
			  : "nothing changed");
	return v.changed ? EXIT_NOT_PASS : 0;
}
