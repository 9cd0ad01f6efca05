/* acidlot command line: messages and option helpers.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <errno.h>
#include <getopt.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <stdarg.h>
#include <math.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <unistd.h>

#include "cli.h"

void
cli_put_xml(FILE *out, const char *s)
{
	static const char markup[] = "&<>'\"";
	static const char *const entity[] = {"&amp;", "&lt;", "&gt;", "&apos;",
					     "&quot;"};

	for (; *s; s++) {
		unsigned char c = (unsigned char)*s;
		const char *m = strchr(markup, c);

		if (c && m)
			fputs(entity[m - markup], out);
		else
			fputc(c < 0x20 || c == 0x7f ? '?' : c, out);
	}
}

/* Writes s to stderr with every control character shown escaped (\r,
 * \n, \t, \x1b; C1 controls as their UTF-8 bytes \xc2\x9b), so that no
 * byte from an input can move the cursor or forge a line. */
void
cli_put_escaped(FILE *out, const char *s)
{
	for (const unsigned char *p = (const unsigned char *)s; *p; p++) {
		if (*p == '\r')
			fputs("\\r", out);
		else if (*p == '\n')
			fputs("\\n", out);
		else if (*p == '\t')
			fputs("\\t", out);
		else if (*p < 0x20 || *p == 0x7f)
			fprintf(out, "\\x%02x", *p);
		else if (*p == 0xc2 && p[1] >= 0x80 && p[1] <= 0x9f) {
			fprintf(out, "\\xc2\\x%02x", p[1]);
			p++;
		} else
			fputc(*p, out);
	}
}

/* The formatted message, escaped. */
static void
vput_escaped(const char *fmt, va_list ap)
{
	char small[512], *text = small;
	va_list again;
	int n;

	va_copy(again, ap);
	n = vsnprintf(small, sizeof small, fmt, ap);
	if (n >= (int)sizeof small && (text = malloc((size_t)n + 1)) != NULL)
		vsnprintf(text, (size_t)n + 1, fmt, again);
	va_end(again);
	cli_put_escaped(stderr, text ? text : small);
	if (text != small)
		free(text);
}

void
cli_error(const char *fmt, ...)
{
	va_list ap;

	fputs(PROG ": ", stderr);
	va_start(ap, fmt);
	vput_escaped(fmt, ap);
	va_end(ap);
	fputc('\n', stderr);
}

int
cli_usage_error(const char *cmd, const char *fmt, ...)
{
	va_list ap;

	fputs(PROG ": ", stderr);
	va_start(ap, fmt);
	vput_escaped(fmt, ap);
	va_end(ap);
	if (cmd)
		fprintf(stderr, "\ntry '" PROG " %s --help'\n", cmd);
	else
		fputs("\ntry '" PROG " --help'\n", stderr);
	return EXIT_TROUBLE;
}

int
cli_number(const char *cmd, const char *option, const char *text,
	   double *out)
{
	al_numerr err = al_number_parse(text, strlen(text), '.', out);

	if (err == AL_NUM_OK && al_number_computable(*out))
		return 0;
	if (err == AL_NUM_OK || err == AL_NUM_RANGE) {
		cli_usage_error(cmd, "%s: %s is out of range (0, or %g to %g "
				     "in size)",
				option, text, AL_MAGNITUDE_MIN, AL_MAGNITUDE_MAX);
		return -1;
	}
	if (err == AL_NUM_COMMA) /* options and operands take a point */
		cli_usage_error(cmd, "%s: '%s' is not a number: write it with "
				     "a decimal point",
				option, text);
	else
		cli_usage_error(cmd, "%s: '%s' %s", option, text,
				al_numerr_phrase(err));
	return -1;
}

/* getopt_long's table and short options from cli_options' names. */
static void
option_table(const char *const *names, size_t n, struct option *opts,
	     char (*name)[32], char *shorts)
{
	size_t k = 0, len;

	shorts[k++] = ':';
	for (size_t i = 0; i < n; i++) {
		const char *end = names[i] + strcspn(names[i], "!=");

		len = (size_t)(end - names[i]);
		memcpy(name[i], names[i], len);
		name[i][len] = '\0';
		opts[i] = (struct option){name[i],
					  *end == '!' ? no_argument
						      : required_argument,
					  NULL, (int)(CLI_OPT + i)};
		if (*end == '=') {
			opts[i].val = (unsigned char)end[1];
			shorts[k++] = end[1];
			shorts[k++] = ':';
		}
	}
	opts[n] = (struct option){"help", no_argument, NULL, 'h'};
	opts[n + 1] = (struct option){NULL, 0, NULL, 0};
	shorts[k++] = 'h';
	shorts[k] = '\0';
}

int
cli_options_done(int got)
{
	if (got == 1)
		return fflush(stdout) == 0 ? 0 : EXIT_TROUBLE;
	return got < 0 ? EXIT_TROUBLE : -1;
}

/* An unknown option, with the closest of the command's long options
 * when one is close ("--specs": did you mean --spec?). */
static void
unknown_option(const char *cmd, const char *bad, char (*name)[32], size_t n)
{
	const char *names[CLI_MAX_OPTIONS + 1], *near;
	size_t len;

	for (size_t i = 0; i < n; i++)
		names[i] = name[i];
	names[n] = "help";
	/* "--name=value" is compared by its name */
	len = strcspn(bad + 2, "=");
	near = strncmp(bad, "--", 2) == 0 ? al_closest(bad + 2, len, names,
						       n + 1)
					  : NULL;
	if (near)
		cli_usage_error(cmd, "unknown option '%s'; did you mean '--%s'?",
				bad, near);
	else
		cli_usage_error(cmd, "unknown option '%s'", bad);
}

int
cli_options(const char *cmd, int argc, char **argv,
	    const char *const *names, size_t n, void (*usage)(FILE *),
	    cli_option_fn one, void *ctx)
{
	struct option opts[CLI_MAX_OPTIONS + 2];
	char name[CLI_MAX_OPTIONS][32], shorts[2 * CLI_MAX_OPTIONS + 3];
	int c, got;

	option_table(names, n, opts, name, shorts);
	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, shorts, opts, NULL)) != -1) {
		if (c == 'h') {
			usage(stdout);
			return 1;
		}
		if (c == ':')
			return cli_usage_error(cmd, "option '%s' needs a value",
					       cli_bad_option(argv)),
			       -1;
		got = c == '?' ? 0 : one(ctx, c, optarg);
		if (got < 0)
			return -1;
		if (got == 0)
			return unknown_option(cmd, cli_bad_option(argv), name, n),
			       -1;
	}
	return 0;
}

int
cli_range_option(const char *cmd, const cli_range *t, size_t n, int c,
		 const char *text)
{
	const char *at;
	double v;

	while (n > 0 && t->id != c)
		t++, n--;
	if (n == 0)
		return 0;
	if (cli_number(cmd, t->name, text, &v))
		return -1;
	if ((t->how & CLI_ABOVE ? !(v > t->lo) : !(v >= t->lo)) ||
	    (t->how & CLI_BELOW ? !(v < t->hi) : !(v <= t->hi)) ||
	    ((t->how & CLI_WHOLE) && v != floor(v))) {
		at = strstr(t->message, "%s");
		if (at == NULL)
			cli_usage_error(cmd, "%s", t->message);
		else
			cli_usage_error(cmd, "%.*s%s%s", (int)(at - t->message),
					t->message, text, at + 2);
		return -1;
	}
	*t->out = v;
	if (t->given)
		*t->given = 1;
	return 1;
}

int
cli_pick(const char *cmd, const char *option, const char *text,
	 const char *const *names, size_t n)
{
	char list[256];
	size_t len = 0;
	int k = al_name_index(names, n, text);

	if (k >= 0)
		return k;
	list[0] = '\0';
	for (size_t i = 0; i < n && len < sizeof list; i++)
		len += (size_t)snprintf(list + len, sizeof list - len, "%s%s",
					i == 0 ? "" : i + 1 < n ? ", " : " or ",
					names[i]);
	return cli_usage_error(cmd, "%s takes %s", option, list), -1;
}

int
cli_choice(const char *cmd, const char *option, const char *text,
	   const char *first, const char *second)
{
	const char *const names[2] = {first, second};

	return cli_pick(cmd, option, text, names, 2);
}

int
cli_column_option(const char *cmd, const char *option, char *text,
		  int (*known)(const char *), al_column_alias *list, size_t *n,
		  size_t max)
{
	char *eq = strchr(text, '=');

	if (eq == NULL || eq == text || eq[1] == '\0')
		return cli_usage_error(cmd,
				       "%s takes NAME=HEADER, e.g. "
				       "--column titrant_ml=\"Vol (mL)\"",
				       option),
		       -1;
	*eq = '\0';
	if (!known(text))
		return cli_usage_error(cmd,
				       "%s: '%s' is not one of our "
				       "columns (see '" PROG " %s --help')",
				       option, text, cmd),
		       -1;
	if (*n == max)
		return cli_usage_error(cmd, "too many %s options", option), -1;
	list[(*n)++] = (al_column_alias){.name = text, .header = eq + 1};
	return 1;
}

int
cli_brix_option(const char *cmd, const char *text, double *density)
{
	double brix;

	if (cli_number(cmd, "--brix", text, &brix))
		return -1;
	if (al_density_from_brix(brix, density) != AL_OK)
		return cli_usage_error(cmd, "--brix: a density from Brix needs "
					    "0 to 40 Brix"),
		       -1;
	return 1;
}

int
cli_text_option(const cli_text *t, size_t n, int c, const char *text)
{
	for (size_t i = 0; i < n; i++)
		if (t[i].id == c) {
			*t[i].out = text;
			return 1;
		}
	return 0;
}

int
cli_unit(const char *cmd, const char *option, const char *text, al_unit *out)
{
	if (al_unit_parse(text, out) == AL_OK)
		return 0;
	cli_usage_error(cmd, "%s: '%s' %s (units: %s)", option, text,
			al_unit_refusal(text), al_unit_list());
	return -1;
}

void
cli_print_diags(const al_diags *d)
{
	size_t cap = d->cap ? d->cap : 50;

	for (size_t i = 0; i < d->count; i++) {
		const al_diag *g = &d->items[i];

		char where[32] = "";

		if (g->file && g->line)
			snprintf(where, sizeof where, ":%lu", g->line);
		cli_error("%s%s%s%s%s%s%s", g->file ? g->file : "", where,
			g->file ? ": " : "",
			g->severity == AL_SEV_WARNING ? "warning: " : "",
			g->column ? g->column : "", g->column ? ": " : "",
			g->message);
	}
	if (d->errors > cap)
		fprintf(stderr, PROG ": ... and %lu more errors\n",
			d->errors - cap);
	if (d->warnings > cap)
		fprintf(stderr, PROG ": ... and %lu more warnings\n",
			d->warnings - cap);
}

al_catalogue *
cli_catalogue(void)
{
	al_diags d = {0};
	al_status st;
	al_catalogue *cat = al_catalogue_new(&st, &d);

	if (cat == NULL) {
		cli_print_diags(&d);
		cli_error("cannot load the built-in acid catalogue: %s",
			  al_strerror(st));
	}
	al_diags_clear(&d);
	return cat;
}

void
cli_list_acids(const al_catalogue *cat)
{
	size_t n;
	const al_acid *acids = al_catalogue_acids(cat, &n);

	fputs(PROG ": known acids:", stderr);
	for (size_t i = 0; i < n; i++)
		fprintf(stderr, " %s", acids[i].name);
	fputc('\n', stderr);
}

int
cli_delimiter(const char *text, char *out)
{
	if (strcmp(text, ",") == 0 || strcmp(text, "comma") == 0)
		*out = ',';
	else if (strcmp(text, ";") == 0 || strcmp(text, "semicolon") == 0)
		*out = ';';
	else if (strcmp(text, "tab") == 0 || strcmp(text, "\t") == 0 ||
		 strcmp(text, "\\t") == 0)
		*out = '\t';
	else if (strcmp(text, "auto") == 0)
		*out = AL_CSV_AUTO;
	else
		return -1;
	return 0;
}

int
cli_same_file(const char *a, const char *b)
{
	struct stat sa, sb;

	return stat(a, &sa) == 0 && stat(b, &sb) == 0 &&
	       sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino;
}

const char *
cli_bad_option(char **argv)
{
	static char short_opt[3];
	const char *prev = optind > 0 ? argv[optind - 1] : "";

	if (strncmp(prev, "--", 2) == 0 || !(optopt > ' ' && optopt < 127))
		return prev;
	short_opt[0] = '-';
	short_opt[1] = (char)optopt;
	return short_opt;
}

FILE *
cli_open_input(const char *path)
{
	FILE *f = fopen(path, "rb");
	struct stat st;

	if (f != NULL && fstat(fileno(f), &st) == 0 && S_ISDIR(st.st_mode)) {
		fclose(f);
		errno = EISDIR;
		return NULL;
	}
	return f;
}

/* What a path names: a device and inode, or where it would be made. */
struct identity {
	int exists, is_char;
	dev_t dev;
	ino_t ino;
	char where[PATH_MAX + NAME_MAX + 2];
};

int
cli_absolute(const char *path, char *out, size_t cap)
{
	const char *slash = strrchr(path, '/');
	char dir[PATH_MAX], real[PATH_MAX];

	snprintf(dir, sizeof dir, "%.*s",
		 slash ? (int)(slash - path) + (slash == path) : 1,
		 slash ? path : ".");
	if (realpath(dir, real) == NULL)
		return -1;
	return snprintf(out, cap, "%s/%s", strcmp(real, "/") ? real : "",
			slash ? slash + 1 : path) < (int)cap
		       ? 0
		       : -1;
}

static void
identify(const cli_file *f, struct identity *id)
{
	struct stat st;

	memset(id, 0, sizeof *id);
	if (strcmp(f->path, "-") == 0 ? fstat(f->output ? 1 : 0, &st) == 0
				       : stat(f->path, &st) == 0) {
		id->exists = 1;
		id->is_char = S_ISCHR(st.st_mode);
		id->dev = st.st_dev;
		id->ino = st.st_ino;
		return;
	}
	/* not there yet: its folder's real path and its name */
	if (cli_absolute(f->path, id->where, sizeof id->where) != 0)
		snprintf(id->where, sizeof id->where, "%s", f->path);
}

static int
same_identity(const struct identity *a, const struct identity *b)
{
	if (a->exists != b->exists)
		return 0;
	return a->exists ? a->dev == b->dev && a->ino == b->ino
			 : strcmp(a->where, b->where) == 0;
}

int
cli_check_files(const char *cmd, const cli_file *files, size_t n)
{
	for (size_t i = 0; i < n; i++)
		for (size_t j = i + 1; j < n; j++) {
			struct identity a, b;

			if (files[i].path == NULL || files[j].path == NULL ||
			    !(files[i].output || files[j].output))
				continue;
			identify(&files[i], &a);
			identify(&files[j], &b);
			if (!same_identity(&a, &b))
				continue;
			/* a terminal both read and written */
			if (a.is_char && !(files[i].output && files[j].output))
				continue;
			return cli_usage_error(
				cmd, "%s '%s' and %s '%s' are the same file: "
				     "one would replace the other",
				files[i].role, files[i].path, files[j].role,
				files[j].path);
		}
	return 0;
}

int
cli_check_with_inputs(const char *cmd, const cli_file *named, size_t n,
		      char *const *inputs, int n_inputs)
{
	cli_file *f = al_malloc((n + (size_t)n_inputs) * sizeof *f);
	int rc;

	if (f == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	memcpy(f, named, n * sizeof *f);
	for (int i = 0; i < n_inputs; i++)
		f[n + (size_t)i] = (cli_file){"input", inputs[i], 0};
	rc = cli_check_files(cmd, f, n + (size_t)n_inputs);
	al_free(f);
	return rc;
}

int
cli_distinct_inputs(const char *cmd, char *const *files, int n)
{
	for (int i = 0; i < n; i++)
		for (int j = i + 1; j < n; j++) {
			int both_stdin = strcmp(files[i], "-") == 0 &&
					 strcmp(files[j], "-") == 0;

			if (both_stdin || cli_same_file(files[i], files[j]))
				return cli_usage_error(
					cmd,
					"'%s' and '%s' are the same file: its "
					"rows would count twice",
					files[i], files[j]);
		}
	return 0;
}

const char *
cli_reason(al_status st)
{
	if (st == AL_ENOMEM || errno == ENOMEM)
		return al_strerror(AL_ENOMEM);
	return strerror(errno);
}

const char *
cli_login(char *buf, size_t cap)
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
cli_commit_all(al_outfile **files[], size_t n)
{
	char failed[4096] = "";
	al_status st = al_outfile_commit_all(files, n, failed, sizeof failed);

	if (st != AL_OK) {
		cli_error("%s: %s; no output replaced", failed, cli_reason(st));
		return -1;
	}
	return 0;
}

int
cli_check_decimal_comma(const char *cmd, const al_csv_options *csv)
{
	if (csv->decimal_point == ',' &&
	    (csv->delimiter == 0 || csv->delimiter == ','))
		return cli_usage_error(cmd,
				       "--decimal-comma needs a delimiter other "
				       "than ',': add --delimiter ';' (or tab, "
				       "or auto)");
	return 0;
}

/* The next field of a CSV line at *p (unquoted into out); 0 at the
 * line's end. */
static int
next_field(const char **p, const char *end, char *out, size_t cap)
{
	const char *s = *p;
	size_t n = 0;
	int quoted = s < end && *s == '"';

	if (s >= end || *s == '\n')
		return 0;
	s += quoted;
	while (s < end && (quoted || (*s != ',' && *s != '\n'))) {
		if (quoted && *s == '"') {
			if (s + 1 < end && s[1] == '"')
				s++;
			else {
				quoted = 0;
				s++;
				continue;
			}
		}
		if (n + 1 < cap)
			out[n++] = *s;
		s++;
	}
	out[n] = '\0';
	*p = s < end && *s == ',' ? s + 1 : s;
	return 1;
}

void
cli_aligned(FILE *out, const char *csv, size_t len)
{
	size_t width[32] = {0};
	const char *end = csv + len;
	char f[256];

	for (int pass = 0; pass < 2; pass++)
		for (const char *p = csv; p < end;) {
			size_t k = 0, nf = 0;
			const char *q = p;

			/* the fields of this line that are not empty at its end */
			while (next_field(&q, end, f, sizeof f))
				if (f[0])
					nf = ++k;
				else
					k++;
			for (k = 0; next_field(&p, end, f, sizeof f); k++) {
				size_t w = al_utf8_width(f);

				if (k < 32 && pass == 0 && w > width[k])
					width[k] = w;
				if (pass == 1 && k < nf)
					fprintf(out, "%s%*s", f,
						k + 1 < nf ? (int)(width[k < 32 ? k : 31] - w + 2)
							   : 0,
						"");
			}
			if (pass == 1)
				fputc('\n', out);
			p += p < end && *p == '\n';
		}
}

int
cli_capture(int (*write)(void *ctx, FILE *out), void *ctx, char **text,
	    size_t *len)
{
	FILE *out = open_memstream(text, len);
	int rc;

	if (out == NULL)
		return cli_error("%s", al_strerror(AL_ENOMEM)), -1;
	rc = write(ctx, out);
	if (fclose(out) != 0 && rc == 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		rc = -1;
	}
	if (rc != 0) {
		free(*text);
		*text = NULL;
	}
	return rc;
}

int
cli_put_table(int table, int (*write)(void *ctx, FILE *out), void *ctx)
{
	char *text = NULL;
	size_t len = 0;
	int rc = cli_capture(write, ctx, &text, &len);

	if (rc == 0 && table)
		cli_aligned(stdout, text, len);
	else if (rc == 0)
		fwrite(text, 1, len, stdout);
	free(text);
	return rc;
}

int
cli_is_terminal(void)
{
	return isatty(STDOUT_FILENO);
}
