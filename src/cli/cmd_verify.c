/* acidlot command line: the verify command (re-hash a run's files).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <getopt.h>
#include <string.h>

#include "cli.h"
#include "record.h"

static void
usage(FILE *out)
{
	fputs("Usage: " PROG " verify RECORD.json...\n"
	      "Re-hashes every input and output a run's record lists and says\n"
	      "whether any changed since (SHA-256). Paths are taken as the run\n"
	      "gave them, from the current directory.\n"
	      "\n"
	      "Exit status: 0 nothing changed; 1 a file changed or is missing;\n"
	      "2 usage error or a record that cannot be read.\n",
	      out);
}

/* Checks one list of files; returns how many changed or are missing, -1
 * when the record is malformed. */
/* One file's line: what, its role, its name (escaped), a note. */
static void
line(const char *what, const char *role, const char *path, const char *note)
{
	printf("%s %s ", what, role ? role : "");
	cli_put_escaped(stdout, path);
	printf("%s\n", note);
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
	const char *path;
	unsigned long rows, contradictions;
};

static void
contradiction(struct cross *x, unsigned long at, const char *what)
{
	line("CONTRADICTS", "report", x->path, "");
	printf("         line %lu: %s\n", at, what);
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
cross_check(json_t *root, const char *record)
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
check_files(json_t *list, const char *record, cli_hash_fn hash)
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
			line("skipped ", role, path,
			     " (written in place to a device or pipe: not "
			     "hashed)");
			continue;
		}
		if (want == NULL)
			return -1;
		if (strcmp(path, "-") == 0) {
			line("skipped ", role, path,
			     " (standard input cannot be read again)");
			continue;
		}
		path = located(path, rel, record, where, sizeof where);
		if (hash(path, hex, &bytes) != 0) {
			line(errno == ENOENT ? "MISSING " : "NOT A FILE", role,
			     path, "");
			changed++;
		} else if (strcmp(hex, want) != 0) {
			line("CHANGED ", role, path, " (SHA-256 differs from the record)");
			changed++;
		} else
			line("ok      ", role, path, "");
	}
	return changed;
}

int
cli_verify_root(json_t *root, const char *record, cli_hash_fn hash)
{
	int a = check_files(json_object_get(root, "inputs"), record, hash);
	int b = a < 0 ? -1
		      : check_files(json_object_get(root, "outputs"), record,
				    hash);

	return a < 0 || b < 0 ? -1 : a + b;
}

int
cmd_verify(int argc, char **argv)
{
	static const struct option options[] = {
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0},
	};
	int c, changed = 0;

	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "h", options, NULL)) != -1) {
		if (c == 'h') {
			usage(stdout);
			return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
		}
		return cli_usage_error("verify", "unknown option '%s'",
				       cli_bad_option(argv));
	}
	if (optind >= argc)
		return cli_usage_error("verify", "no record given");
	for (int i = optind; i < argc; i++) {
		json_error_t err;
		json_t *root;
		int n;

		/* jansson does not fill every byte of err on every path */
		memset(&err, 0, sizeof err);
		errno = 0;
		{
			FILE *in = cli_open_input(argv[i]);

			if (in == NULL) {
				cli_error("%s: %s", argv[i], cli_reason(AL_OK));
				return EXIT_TROUBLE;
			}
			root = json_loadf(in, 0, &err);
			fclose(in);
		}
		/* jansson reports some failed allocations as syntax errors;
		 * our allocator leaves errno at ENOMEM */
		if (root == NULL &&
		    (json_error_code(&err) == json_error_out_of_memory ||
		     errno == ENOMEM)) {
			cli_error("%s: %s", argv[i], al_strerror(AL_ENOMEM));
			return EXIT_TROUBLE;
		}
		if (root == NULL && err.line < 1) /* no line: not read at all */
			cli_error("%s: %s", argv[i],
				  errno ? cli_reason(AL_OK) : err.text);
		else if (root == NULL)
			cli_error("%s:%d: not a readable record: %s", argv[i],
				  err.line, err.text);
		if (root == NULL)
			return EXIT_TROUBLE;
		n = cli_verify_root(root, argv[i], sha256_file);
		if (n >= 0)
			n += cross_check(root, argv[i]);
		json_decref(root);
		if (n < 0) {
			cli_error("%s: not an acidlot record (no inputs and "
				  "outputs with path and sha256)",
				  argv[i]);
			return EXIT_TROUBLE;
		}
		changed += n;
	}
	if (fflush(stdout) != 0 || ferror(stdout)) {
		cli_error("standard output: %s", cli_reason(AL_OK));
		return EXIT_TROUBLE;
	}
	fprintf(stderr, PROG ": %s\n",
		changed ? "something changed since the run" : "nothing changed");
	return changed ? EXIT_NOT_PASS : 0;
}
