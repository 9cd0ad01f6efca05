/* acidlot command line: the assay's inputs besides the titrations: the
 * specification, the column map and the titrant register, each read,
 * reported and hashed for the run's record.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>

#include "assay_cli.h"

al_spec_table *
load_spec(const struct args *a, const al_catalogue *cat, al_diags *d)
{
	al_status st;
	al_spec_table *specs;
	al_csv_options csv;
	FILE *in = cli_open_input(a->spec);

	if (in == NULL) {
		cli_error("%s: %s", a->spec, cli_reason(AL_OK));
		return NULL;
	}
	/* the specification is a file of our own: its delimiter is told
	 * from its header, whatever --delimiter says for the titrations */
	csv = a->aopt.csv;
	csv.delimiter = AL_CSV_AUTO;
	csv.recover = 0;
	specs = al_spec_table_read_as(cat, &csv, a->spec_columns,
				      a->n_spec_columns, in, a->spec, &st, d);
	fclose(in);
	cli_print_diags(d);
	if (specs == NULL) {
		if (st == AL_ENOMEM || st == AL_EIO)
			cli_error("%s: %s", a->spec, al_strerror(st));
		else
			cli_error("%lu error%s in the specification file; no "
				  "report written",
				  d->errors, d->errors == 1 ? "" : "s");
	}
	return specs;
}

/* One column mapped twice, or one header to two columns, in the --column
 * options or the --columns file (an option may override the file's
 * mapping of a column): a usage error, since one would win in silence. */
static int
columns_conflict(const struct args *a, const al_column_alias *all, size_t n)
{
	size_t i, j;

	switch (al_column_aliases_check(all, n, a->n_column_opts, &i, &j)) {
	case AL_ALIAS_NAME_TWICE:
		cli_usage_error("assay", "%s maps '%s' twice (to '%s' and '%s')",
				i < a->n_column_opts ? "--column"
						     : a->columns_file,
				all[i].name, all[i].header, all[j].header);
		return -1;
	case AL_ALIAS_HEADER_TWICE:
		cli_usage_error("assay",
				"header '%s' is mapped to two columns, '%s' and "
				"'%s'",
				all[i].header, all[i].name, all[j].name);
		return -1;
	default:
		return 0;
	}
}

/* Joins the --columns file and the --column options (which win, being
 * later in the list). */
int
load_columns(struct args *a, al_column_alias **all, size_t *n)
{
	al_column_alias *file_items = NULL;
	size_t n_file = 0;

	*all = NULL;
	*n = 0;
	if (a->columns_file) {
		al_diags d = {0};
		FILE *in = cli_open_input(a->columns_file);
		al_status st;

		if (in == NULL) {
			cli_error("%s: %s", a->columns_file, cli_reason(AL_OK));
			return -1;
		}
		st = al_column_aliases_read(in, a->columns_file, &file_items,
					    &n_file, &d);
		fclose(in);
		cli_print_diags(&d);
		al_diags_clear(&d);
		if (st != AL_OK) {
			cli_error("%s: %s", a->columns_file, al_strerror(st));
			return -1;
		}
		for (size_t i = 0; i < n_file; i++)
			if (!al_assay_is_column(file_items[i].name)) {
				cli_error("%s: '%s' is not one of our columns",
					  a->columns_file, file_items[i].name);
				al_column_aliases_free(file_items, n_file);
				return -1;
			}
	}
	*all = al_calloc(n_file + a->n_column_opts + 1, sizeof **all);
	if (*all == NULL) {
		al_column_aliases_free(file_items, n_file);
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	/* the option pairs first: the first match wins in al_header_map */
	for (size_t i = 0; i < a->n_column_opts; i++)
		(*all)[(*n)++] = a->column_opts[i];
	for (size_t i = 0; i < n_file; i++) {
		(*all)[*n].name = al_strdup(file_items[i].name);
		(*all)[*n].header = al_strdup(file_items[i].header);
		if ((*all)[*n].name == NULL || (*all)[*n].header == NULL) {
			al_free((char *)(*all)[*n].name);
			al_free((char *)(*all)[*n].header);
			break;
		}
		(*n)++;
	}
	al_column_aliases_free(file_items, n_file);
	if (*n != a->n_column_opts + n_file) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return columns_conflict(a, *all, *n);
}

void
free_columns(const struct args *a, al_column_alias *all, size_t n)
{
	for (size_t i = a->n_column_opts; i < n; i++) {
		al_free((char *)all[i].name);
		al_free((char *)all[i].header);
	}
	al_free(all);
}

int
hash_input(run_record *rec, const char *role, const char *path, long rows)
{
	char hex[65];
	unsigned long long bytes;

	if (sha256_file(path, hex, &bytes) != 0) {
		cli_error("%s: cannot read it again to hash it", path);
		return -1;
	}
	if (record_input(rec, role, path, bytes, rows, hex) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return 0;
}

al_register *
load_titrants(const char *path)
{
	al_diags d = {0};
	al_status st;
	al_register *reg;
	FILE *in = cli_open_input(path);

	if (in == NULL) {
		cli_error("%s: %s", path, cli_reason(AL_OK));
		return NULL;
	}
	reg = al_register_read(in, path, &st, &d);
	fclose(in);
	cli_print_diags(&d);
	al_diags_clear(&d);
	if (reg == NULL)
		cli_error("%s: cannot read the titrant register (%s)", path,
			  al_strerror(st));
	return reg;
}

