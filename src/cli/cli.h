/* acidlot command line: shared declarations of the sub-commands.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_H
#define ACIDLOT_CLI_H

#include <stdio.h>

#include "acidlot/acidlot.h"

/* Exit status, documented in README.md and --help. */
enum {
	EXIT_ALL_PASS = 0,  /* every result pass or no-spec */
	EXIT_NOT_PASS = 1,  /* at least one fail or retest */
	EXIT_TROUBLE = 2    /* usage, input or I/O error */
};

#define PROG "acidlot"

int cmd_assay(int argc, char **argv);
int cmd_acids(int argc, char **argv);
int cmd_convert(int argc, char **argv);
int cmd_standardize(int argc, char **argv);
int cmd_verify(int argc, char **argv);
int cmd_endpoint(int argc, char **argv);
int cmd_trend(int argc, char **argv);
int cmd_runs(int argc, char **argv);
int cmd_sign(int argc, char **argv);
int cmd_certificate(int argc, char **argv);
int cmd_recovery(int argc, char **argv);
int cmd_template(int argc, char **argv);

/* "acidlot: message" on stderr. */
/* A message line on stderr, "acidlot: " first (errors and warnings
 * alike); control characters from inputs are shown escaped (\r, \x1b),
 * here and in cli_usage_error and cli_print_diags. */
void cli_error(const char *fmt, ...) __attribute__((format(printf, 1, 2)));
/* s as XML text (an SVG's): the five markup characters as entities,
 * control characters as '?'. */
void cli_put_xml(FILE *out, const char *s);
/* Writes s with its control characters escaped, as cli_error does. */
void cli_put_escaped(FILE *out, const char *s);
/* A usage error: the message, then "try 'acidlot CMD --help'"; returns 2. */
int cli_usage_error(const char *cmd, const char *fmt, ...)
	__attribute__((format(printf, 2, 3)));
/* Parses an option's number strictly; 0 on success, else a usage error
 * message and -1. */
int cli_number(const char *cmd, const char *option, const char *text,
	       double *out);
/* An option that takes a number within a range. */
enum {
	CLI_ABOVE = 1, /* more than lo (else lo or more) */
	CLI_BELOW = 2, /* less than hi (else hi or less) */
	CLI_WHOLE = 4  /* a whole number */
};
typedef struct cli_range {
	int id;              /* getopt_long's value for it */
	const char *name;    /* "--blank-ml" */
	double lo, hi;
	unsigned how;        /* CLI_ bits */
	const char *message; /* the usage error outside the range; a "%s"
				in it stands for the value given */
	double *out;
	int *given; /* set to 1 when given; NULL: none */
} cli_range;
/* Option c, if table t has it: parsed, checked and stored (1), a usage
 * error (-1), or not in t (0). */
int cli_range_option(const char *cmd, const cli_range *t, size_t n, int c,
		     const char *text);

/* --column (or option) NAME=HEADER into list[*n] (at most max): NAME
 * must be one of the table's columns (known); 1, or -1 after a usage
 * error. */
int cli_column_option(const char *cmd, const char *option, char *text,
		      int (*known)(const char *), al_column_alias *list,
		      size_t *n, size_t max);

/* A command's column map (column_map.c): its option pairs, then those of
 * a --columns file, which are optional (al_aliases_present passes over
 * them: a lab-wide map may name headers a file lacks). */
typedef struct cli_column_map {
	al_column_alias *all; /* the options' pairs first: the first match
				 wins in al_header_map */
	size_t n;
	al_column_alias *file_items; /* owned; all[] points into them */
	size_t n_file;
} cli_column_map;

/* Reads file (NULL for none: the options alone), each pair naming one
 * of the table's columns (known), and joins it to opts; a column mapped
 * twice or a header mapped to two columns is a usage error. 0, or -1
 * after a message (free the map either way). */
int cli_column_map_load(cli_column_map *m, const char *cmd,
			const char *option, const char *file,
			int (*known)(const char *),
			const al_column_alias *opts, size_t n_opts);
void cli_column_map_free(cli_column_map *m);

/* An option that takes one of n words: the index of the one given, or
 * -1 after a usage error "OPTION takes A, B or C". */
int cli_pick(const char *cmd, const char *option, const char *text,
	     const char *const *names, size_t n);
/* The same for two words (first, second): 0 or 1. */
int cli_choice(const char *cmd, const char *option, const char *text,
	       const char *first, const char *second);

/* --brix: the density of a sucrose solution of that Brix (NBS), into
 * *density; 1, or -1 after a usage error. */
int cli_brix_option(const char *cmd, const char *text, double *density);

/* An option that takes a text, stored as given. */
typedef struct cli_text {
	int id;
	const char **out;
} cli_text;
/* Option c, if table t has it: stored (1), else 0. */
int cli_text_option(const cli_text *t, size_t n, int c, const char *text);

/* A command's handler of option c (getopt_long's value) and its value
 * text: 1 taken, 0 not an option of the command, -1 after a usage
 * error. */
typedef int (*cli_option_fn)(void *ctx, int c, char *text);
/* The exit status after a command's options were read (got: 1 after
 * --help, -1 after a usage error), or -1 to go on (got 0). */
int cli_options_done(int got);

/* Reads argv's options by getopt_long. names are the command's long
 * options, in the order of its OPT_ values from CLI_OPT: "name" takes a
 * value, "name!" takes none, "name=c" is also -c and gives c (such ones
 * come last). --help (-h) prints usage and gives 1; a missing value or an
 * unknown option is a usage error (-1); every other goes to one. 0 when
 * all were taken; optind is then the first operand. */
#define CLI_OPT 256
#define CLI_MAX_OPTIONS 48
int cli_options(const char *cmd, int argc, char **argv,
		const char *const *names, size_t n, void (*usage)(FILE *),
		cli_option_fn one, void *ctx);

/* A CSV text (our own: quoted fields with "" inside) as aligned columns,
 * two blanks apart, no blank at a line's end: the table a person reads
 * at a terminal. */
void cli_aligned(FILE *out, const char *csv, size_t len);
/* What write(ctx, out) writes, in memory: *text (free it) of *len
 * bytes; 0, or -1 (write's, or after a message when memory ran out;
 * *text is then NULL). */
int cli_capture(int (*write)(void *ctx, FILE *out), void *ctx, char **text,
		size_t *len);
/* A command's lines on standard output: write(ctx, out) writes them as
 * CSV into memory; shown as they are, or for a table (table 1) aligned
 * by cli_aligned, only when write returned 0: a failed command prints
 * no partial lines. write's 0 or -1 (said), or -1 after a message when
 * memory runs out. */
int cli_put_table(int table, int (*write)(void *ctx, FILE *out), void *ctx);
/* 1 when a command's table goes to a person: standard output is a
 * terminal (and no file was asked for). */
int cli_is_terminal(void);

/* Parses a unit name for an option ("--unit", or "UNIT" for an operand);
 * 0 on success, else a usage error saying why and -1. */
int cli_unit(const char *cmd, const char *option, const char *text,
	     al_unit *out);
/* Prints diagnostics as "acidlot: file:line: column: message", warnings
 * with "warning: ", and how many more were not kept. */
void cli_print_diags(const al_diags *d);
/* Loads the built-in catalogue, reporting failure. NULL on failure. */
al_catalogue *cli_catalogue(void);
/* Why an operation failed, for a message: "out of memory" when the
 * status or errno says so, else strerror(errno). */
const char *cli_reason(al_status st);
/* Renames every prepared output into place, in order, and sets each
 * pointer to NULL (NULL entries are skipped). 0, or -1 after a message. */
int cli_commit_all(al_outfile **files[], size_t n);

/* Who runs the program (a store's os_user; what --analyst or --name
 * says is the person): the login name the environment gives, else the
 * user id written into buf. */
const char *cli_login(char *buf, size_t cap);
/* A usage error unless --decimal-comma goes with a delimiter other than
 * ','; returns 0 when fine. */
int cli_check_decimal_comma(const char *cmd, const al_csv_options *csv);
/* ',', ';', "tab" or "auto" for --delimiter; 0 on success. */
int cli_delimiter(const char *text, char *out);
/* 1 when both paths name the same existing file. */
int cli_same_file(const char *a, const char *b);
/* The option getopt_long just refused, as the user wrote it: "--name",
 * or "-x" from a cluster such as "-x.csv" (not the argument before). */
const char *cli_bad_option(char **argv);
/* fopen(path, "rb") for an input, refusing a directory (errno EISDIR)
 * rather than failing on its first read. */
FILE *cli_open_input(const char *path);
/* The absolute form of a path whose folder exists (the file itself need
 * not): the folder's real path and the name, into out. 0, or -1. */
int cli_absolute(const char *path, char *out, size_t cap);
/* A file a command reads or writes, for cli_check_files. */
typedef struct cli_file {
	const char *role; /* how the user named it: "input", "--budget" */
	const char *path; /* NULL: not given; "-": standard input/output */
	int output;
} cli_file;
/* Refuses an output that is an input or another output, before anything
 * is read: the same device and inode, or for a file not yet there the
 * same resolved path; '-' is the standard input or output it names. A
 * terminal both read and written is fine. Returns 0, or a usage error
 * (EXIT_TROUBLE) naming both. */
int cli_check_files(const char *cmd, const cli_file *files, size_t n);
/* cli_check_files of the named files and the command's input files
 * (each role "input"); 0, or a usage error (-1, said). */
int cli_check_with_inputs(const char *cmd, const cli_file *named, size_t n,
			  char *const *inputs, int n_inputs);
/* A usage error when two of the n input files are one (by device and
 * inode, however spelt, or '-' twice): its rows would count twice.
 * Returns 0 when they are distinct. */
int cli_distinct_inputs(const char *cmd, char *const *files, int n);
/* Names the known acids on stderr after an unknown name. */
void cli_list_acids(const al_catalogue *cat);

#endif
