/* acidlot command line: the assay command's parts (cmd_assay.c runs them).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_ASSAY_H
#define ACIDLOT_CLI_ASSAY_H

#include "cli.h"
#include "record.h"
#include "stored_run.h"

#define MAX_COLUMN_OPTS 32

enum { FORMAT_AUTO, FORMAT_CSV, FORMAT_TABLE };

/* The command's options. */
struct args {
	const char *spec, *output, *replicates, *rejects, *acid, *unit;
	const char *stored_path, *rerun; /* --store PATH, --rerun REASON */
	const char *columns_file, *spec_columns_file, *titrants, *record, *analyst, *budget;
	const char *xlsx; /* --xlsx WORKBOOK */
	al_column_alias column_opts[MAX_COLUMN_OPTS];
	size_t n_column_opts;
	al_column_alias spec_columns[MAX_COLUMN_OPTS]; /* --spec-column */
	size_t n_spec_columns;
	double decimals;
	int has_decimals, decimals_full; /* --decimals N, --decimals full */
	int format; /* FORMAT_: table or CSV; 0 until the options are read */
	al_assay_options aopt;
	al_report_options ropt;
};

/* Where rows go while they are read: replicates or rejects. */
struct sink {
	FILE *out;
	al_report_options *ropt;
	unsigned long count;
};

/* One assay of the command: what it reads, makes and writes, in the
 * order cmd_assay goes through them. */
struct job {
	struct args a;
	al_catalogue *cat;
	al_spec_table *specs;
	al_register *titrants;
	cli_column_map columns, spec_columns; /* --column(s), --spec-column(s) */
	al_diags spec_diags;
	run_record rec;
	al_assay *run;
	struct sink reps, rejs;
	al_outfile *report, *rep_out, *rej_out, *budget_out, *rec_out, *book_out;
	struct assay_book *book; /* --xlsx (assay_workbook.c) */
	const char *out_name; /* the report's, for messages */
	unsigned long long in_bytes; /* of the titration files */
	long open_results;	     /* results no specification judged */
	/* the outputs the record lists: hashed by a thread (file_hashes),
	 * or listed unhashed when written in place */
	file_hashes hashes;
	int hashing; /* started, not yet finished */
	const char *out_role[FILE_HASHES_MAX], *out_path[FILE_HASHES_MAX];
	const char *in_place_role[FILE_HASHES_MAX];
	const char *in_place_path[FILE_HASHES_MAX];
	size_t n_in_place;
	stored_run stored; /* --store */
};

/* assay_help.c: the command's --help. */
void assay_usage(FILE *out);

/* assay_inputs.c: each NULL or -1 after a message. */
al_spec_table *load_spec(const struct args *a, const cli_column_map *map,
			 const al_catalogue *cat, al_diags *d);
al_register *load_titrants(const char *path);
/* assay_record.c: the run's acids, specifications, lots, decision rule,
 * Cochran's tests, counts and results, into the record; 0, or -1 when
 * memory runs out. */
int assay_record_fill(run_record *rec, const al_assay *run, int guarded,
		      double guard_r, int exclude);

/* assay_record.c: the outputs' hashes begun in a thread, then the
 * record with them written beside the outputs (0, or -1 after a
 * message). */
void assay_start_hashes(struct job *j);
int assay_write_record(struct job *j);

/* assay_workbook.c: --xlsx. The replicates kept as they are read, then
 * the workbook written (before the record, which lists it); each 0, or
 * -1 after a message. */
int assay_book_open(struct job *j);
al_status assay_book_replicate(struct job *j, const al_replicate *rep);
al_status assay_book_reject(struct job *j, const char *file,
			    unsigned long line, const char *reason,
			    const char *raw, size_t raw_len);
int assay_book_write(struct job *j);
void assay_book_free(struct job *j);

/* assay_summary.c: the results no specification judged (each product
 * named once), or -1 when memory runs out; then the warnings and the
 * summary on stderr and the exit status. */
long assay_unjudged(const al_assay *run, al_spec_table *specs);
int assay_conclude(const struct job *j);

#endif
