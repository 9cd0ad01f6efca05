/* acidlot command line: the assay's inputs besides the titrations: the
 * specification, the column map and the titrant register, each read,
 * reported and hashed for the run's record.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>

#include "assay_cli.h"

al_spec_table *
load_spec(const struct args *a, const cli_column_map *map,
	  const al_catalogue *cat, al_diags *d)
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
	specs = al_spec_table_read_as(cat, &csv, map->all, map->n, in,
				      a->spec, &st, d);
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

