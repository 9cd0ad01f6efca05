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
		const char *path = json_string_value(json_object_get(f, "path"));
		const char *rel =
			json_string_value(json_object_get(f, "from_record"));
		char where[8192];
		const char *role = json_string_value(json_object_get(f, "role"));
		const char *want = json_string_value(json_object_get(f, "sha256"));
		char hex[65];
		unsigned long long bytes;

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
		/* from the record's own folder, so that verify works from
		 * any directory */
		if (rel != NULL && rel[0] != '/') {
			const char *slash = strrchr(record, '/');

			snprintf(where, sizeof where, "%.*s%s",
				 slash ? (int)(slash - record + 1) : 0, record,
				 rel);
			path = where;
		}
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
		root = json_load_file(argv[i], 0, &err);
		/* jansson reports some failed allocations as syntax errors;
		 * our allocator leaves errno at ENOMEM */
		if (root == NULL &&
		    (json_error_code(&err) == json_error_out_of_memory ||
		     errno == ENOMEM)) {
			cli_error("%s: %s", argv[i], al_strerror(AL_ENOMEM));
			return EXIT_TROUBLE;
		}
		if (root == NULL) {
			cli_error("%s:%d: not a readable record: %s", argv[i],
				  err.line, err.text);
			return EXIT_TROUBLE;
		}
		n = cli_verify_root(root, argv[i], sha256_file);
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
