/* acidlot command line: a command's column map, its --column pairs
 * joined with those of a --columns file.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>

#include "cli.h"

/* One column mapped twice, or one header to two columns: a usage error,
 * since one would win in silence. An option may override the file's
 * mapping of a column (the options come first). */
static int
conflict(const cli_column_map *m, const char *cmd, const char *option,
	 const char *file, size_t n_opts)
{
	size_t i, j;

	switch (al_column_aliases_check(m->all, m->n, n_opts, &i, &j)) {
	case AL_ALIAS_NAME_TWICE:
		cli_usage_error(cmd, "%s maps '%s' twice (to '%s' and '%s')",
				i < n_opts ? option : file, m->all[i].name,
				m->all[i].header, m->all[j].header);
		return -1;
	case AL_ALIAS_HEADER_TWICE:
		cli_usage_error(cmd,
				"header '%s' is mapped to two columns, '%s' and "
				"'%s'",
				m->all[i].header, m->all[i].name,
				m->all[j].name);
		return -1;
	default:
		return 0;
	}
}

/* The pairs of the file, each naming one of our columns; -1 after a
 * message. */
static int
read_file(cli_column_map *m, const char *file, int (*known)(const char *))
{
	al_diags d = {0};
	FILE *in = cli_open_input(file);
	al_status st;

	if (in == NULL) {
		cli_error("%s: %s", file, cli_reason(AL_OK));
		return -1;
	}
	st = al_column_aliases_read(in, file, &m->file_items, &m->n_file, &d);
	fclose(in);
	cli_print_diags(&d);
	al_diags_clear(&d);
	if (st != AL_OK) {
		cli_error("%s: %s", file, al_strerror(st));
		return -1;
	}
	for (size_t i = 0; i < m->n_file; i++)
		if (!known(m->file_items[i].name)) {
			cli_error("%s: '%s' is not one of our columns", file,
				  m->file_items[i].name);
			return -1;
		}
	return 0;
}

int
cli_column_map_load(cli_column_map *m, const char *cmd, const char *option,
		    const char *file, int (*known)(const char *),
		    const al_column_alias *opts, size_t n_opts)
{
	memset(m, 0, sizeof *m);
	if (file && read_file(m, file, known) != 0)
		return -1;
	m->all = al_calloc(n_opts + m->n_file + 1, sizeof *m->all);
	if (m->all == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	/* the options first: the first match wins in al_header_map */
	for (size_t i = 0; i < n_opts; i++)
		m->all[m->n++] = opts[i];
	/* a lab-wide map may name headers a file lacks */
	for (size_t i = 0; i < m->n_file; i++) {
		m->all[m->n] = m->file_items[i];
		m->all[m->n++].optional = 1;
	}
	return conflict(m, cmd, option, file, n_opts);
}

void
cli_column_map_free(cli_column_map *m)
{
	al_free(m->all);
	al_column_aliases_free(m->file_items, m->n_file);
	memset(m, 0, sizeof *m);
}
