/* acidlot: a file of titration curves into one row per curve.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * A curve's readings come together, in the order taken: the curve id
 * changes only when the next titration begins, so one curve is held at
 * a time. Every column but curve, titrant_ml, ph and endpoint_ph is
 * carried to the curve's row and must read the same on each of its
 * readings. */
#include "acidlot/curves.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/table.h"
#include "acidlot/text.h"
#include "strindex.h"

/* The columns the reader looks at: the first five are its own, the
 * others (and every column it does not know) are carried. */
enum { K_CURVE, K_ML, K_PH, K_ENDPOINT, K_START, K_VOLUME, K_MASS,
       K_DENSITY, K_COUNT };
static const char *const own[K_COUNT] = {
	"curve", "titrant_ml", "ph", "endpoint_ph", "start_ml", "volume_ml",
	"mass_g", "density_g_ml"};
/* The columns a curve's row adds after the carried ones. */
static const char *const added[] = {"curve", "titrant_ml", "endpoint_ph",
				    "mode", "readings", "curve_flags"};
#define N_ADDED (sizeof added / sizeof added[0])

struct al_curves {
	al_curves_options opt;
	char point;
	const char *file;
	al_diags *diags;
	int header_done;
	size_t width;	 /* the header's fields */
	int col[K_COUNT];
	int *carried;	 /* the carried columns' indexes */
	size_t n_carried;
	char **names;	 /* their headers */
	/* the curve being read */
	char *id;
	unsigned long first_line;
	char **cells; /* its carried cells, from its first reading */
	int differs;  /* a differing row reported already */
	double target_ph, v0_ml;
	double *ml, *ph, *work;
	size_t n, cap;
	/* the ids met, each with its first line: a curve met again after
	 * another began is an error */
	char **ids;
	unsigned long *id_lines;
	size_t n_ids, ids_cap;
	int skipping; /* the curve being read was met before: its readings
			 pass unread (said once) */
	al_strindex index;
	unsigned long curves, flagged, no_volume;
	char delimiter;
	int bad_header;
	/* the row handed on: the carried cells, then the added ones */
	const char **out_fields;
	size_t *out_lens;
	char *raw;
	size_t raw_cap;
};

/* The column header cell i stands for: an alias's (--column), else the
 * cell itself, trimmed, into *len. */
static const char *
stands_for(const al_csv_row *header, size_t i, const al_column_alias *aliases,
	   size_t n_aliases, size_t *len)
{
	const char *s = al_cell(header, (int)i, len);

	for (size_t a = 0; a < n_aliases; a++)
		if (al_word_eq(s, *len, aliases[a].header)) {
			*len = strlen(aliases[a].name);
			return aliases[a].name;
		}
	return s;
}

int
al_curves_is_column(const char *name)
{
	return al_name_index(own, K_COUNT, name) >= 0;
}

int
al_curves_is_header(const al_csv_row *header, const al_column_alias *aliases,
		    size_t n_aliases)
{
	int has[2] = {0, 0};

	for (size_t i = 0; i < header->nfields; i++) {
		size_t len;
		const char *s = stands_for(header, i, aliases, n_aliases, &len);

		has[0] |= al_word_eq(s, len, "curve");
		has[1] |= al_word_eq(s, len, "ph");
	}
	return has[0] && has[1];
}

static const char *
id_name(const void *ctx, size_t i)
{
	return ((const al_curves *)ctx)->ids[i];
}

al_curves *
al_curves_new(const al_curves_options *opt, const char *file,
	      al_diags *diags)
{
	al_curves *c = al_calloc(1, sizeof *c);

	if (c == NULL)
		return NULL;
	c->opt = *opt;
	c->point = opt->decimal_point ? opt->decimal_point : '.';
	c->file = file;
	c->diags = diags;
	c->index.name = id_name;
	c->index.ctx = c;
	return c;
}

static void
free_cells(al_curves *c)
{
	for (size_t k = 0; c->cells && k < c->n_carried; k++)
		al_free(c->cells[k]);
	al_free(c->cells);
	c->cells = NULL;
	al_free(c->id);
	c->id = NULL;
}

void
al_curves_free(al_curves *c)
{
	if (c == NULL)
		return;
	free_cells(c);
	for (size_t k = 0; k < c->n_carried; k++)
		al_free(c->names[k]);
	for (size_t k = 0; k < c->n_ids; k++)
		al_free(c->ids[k]);
	al_free(c->names);
	al_free(c->carried);
	al_free(c->ids);
	al_free(c->id_lines);
	al_strindex_free(&c->index);
	al_free(c->ml);
	al_free(c->ph);
	al_free(c->work);
	al_free(c->out_fields);
	al_free(c->out_lens);
	al_free(c->raw);
	al_free(c);
}

void
al_curves_counts(const al_curves *c, unsigned long *curves,
		 unsigned long *flagged, unsigned long *no_volume)
{
	*curves = c->curves;
	*flagged = c->flagged;
	*no_volume = c->no_volume;
}

void
al_curves_number(double v, int decimals, char decimal_point, char *buf,
		 size_t cap)
{
	if (decimals >= 0)
		snprintf(buf, cap, "%.*f", decimals, v);
	for (int sig = 15; decimals < 0 && sig <= 17; sig++) {
		al_format_sig(v, sig, buf, cap);
		if (strtod(buf, NULL) == v)
			break;
	}
	if (decimal_point == ',')
		for (char *p = buf; *p; p++)
			if (*p == '.')
				*p = ',';
}

/* A text cell copied (trimmed), or NULL when memory runs out. */
static char *
cell_copy(const al_csv_row *row, int col)
{
	size_t len;
	const char *s = al_cell(row, col, &len);

	return al_strndup(s, len);
}

static al_status hand_on(al_curves *c, const al_csv_row *like,
			 unsigned long line, const char *const *cells,
			 const char *const *more);

/* The header: our columns found, the others carried; then the header of
 * the rows made. */
static al_status
header(al_curves *c, const al_csv_row *row)
{
	c->width = row->nfields;
	c->delimiter = row->delimiter ? row->delimiter : ',';
	for (int k = 0; k < K_COUNT; k++)
		c->col[k] = -1;
	c->carried = al_calloc(row->nfields + 1, sizeof *c->carried);
	c->names = al_calloc(row->nfields + 1, sizeof *c->names);
	c->out_fields = al_calloc(row->nfields + N_ADDED, sizeof *c->out_fields);
	c->out_lens = al_calloc(row->nfields + N_ADDED, sizeof *c->out_lens);
	if (!c->carried || !c->names || !c->out_fields || !c->out_lens)
		return AL_ENOMEM;
	for (size_t i = 0; i < row->nfields; i++) {
		size_t len;
		const char *s = stands_for(row, i, c->opt.aliases,
					   c->opt.n_aliases, &len);
		int k = 0;

		while (k < K_COUNT && !al_word_eq(s, len, own[k]))
			k++;
		if (k < K_COUNT && c->col[k] < 0)
			c->col[k] = (int)i;
		if (k <= K_START) /* not carried */
			continue;
		c->carried[c->n_carried] = (int)i;
		/* a header an alias maps is handed on as our column's name:
		 * the rows made need no alias */
		if ((c->names[c->n_carried++] = al_strndup(s, len)) == NULL)
			return AL_ENOMEM;
	}
	for (int k = K_CURVE; k <= K_PH; k++)
		if (c->col[k] < 0) {
			al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line,
				     NULL,
				     "missing required column '%s' (%s); map "
				     "the file's own with --column %s=HEADER",
				     own[k],
				     k == K_CURVE ? "one titration's id"
				     : k == K_ML  ? "the cumulative volume"
						  : "the pH reading",
				     own[k]);
			c->bad_header = 1;
		}
	c->header_done = 1;
	return hand_on(c, row, row->line, (const char *const *)c->names,
		       added);
}

/* The row handed on: cells (n_carried) then more (N_ADDED), with a raw
 * record of them joined by the file's delimiter (quoted where needed),
 * for a reject's "record as read". */
static al_status
hand_on(al_curves *c, const al_csv_row *like, unsigned long line,
	const char *const *cells, const char *const *more)
{
	al_csv_row out = *like;
	size_t n = 0, need = 1;

	for (size_t k = 0; k < c->n_carried + N_ADDED; k++) {
		const char *s = k < c->n_carried ? cells[k] : more[k - c->n_carried];

		c->out_fields[k] = s;
		c->out_lens[k] = strlen(s);
		need += 2 * c->out_lens[k] + 3;
	}
	if (need > c->raw_cap) {
		char *grown = al_realloc(c->raw, need);

		if (grown == NULL)
			return AL_ENOMEM;
		c->raw = grown;
		c->raw_cap = need;
	}
	for (size_t k = 0; k < c->n_carried + N_ADDED; k++) {
		const char *s = c->out_fields[k];
		int quote = strchr(s, c->delimiter) || strchr(s, '"');

		if (k > 0)
			c->raw[n++] = c->delimiter;
		if (quote)
			c->raw[n++] = '"';
		for (; *s; s++) {
			if (*s == '"')
				c->raw[n++] = '"';
			c->raw[n++] = *s;
		}
		if (quote)
			c->raw[n++] = '"';
	}
	c->raw[n] = '\0';
	out.fields = c->out_fields;
	out.lens = c->out_lens;
	out.nfields = c->n_carried + N_ADDED;
	out.line = line;
	out.raw = c->raw;
	out.raw_len = n;
	out.trimmed = out.ascii = 0;
	return c->opt.on_row(c->opt.ud, &out);
}

/* The curve read so far: its endpoint found and its row handed on. */
static al_status
finish_curve(al_curves *c)
{
	al_curve curve = {c->ml, c->ph, c->n, c->target_ph, c->v0_ml};
	al_curve_endpoint e;
	char volume[64] = "", ph[64] = "", readings[32], flags[256];
	const char *more[N_ADDED];
	al_status st = AL_OK;

	if (c->id == NULL || c->skipping) {
		free_cells(c);
		c->skipping = 0;
		c->n = 0;
		return AL_OK;
	}
	al_curve_find(&curve, c->opt.mode, c->work, &e);
	if (e.has_volume) {
		al_curves_number(e.volume_ml, c->opt.decimals, c->point, volume,
				 sizeof volume);
		al_curves_number(e.ph, c->opt.decimals, c->point, ph, sizeof ph);
	} else
		c->no_volume++;
	c->curves++;
	c->flagged += e.flags != 0;
	snprintf(readings, sizeof readings, "%zu", c->n);
	al_curve_flags_format(e.flags, flags, sizeof flags);
	more[0] = c->id;
	more[1] = volume;
	more[2] = ph;
	more[3] = al_curve_mode_names[c->opt.mode];
	more[4] = readings;
	more[5] = flags;
	if (c->opt.on_curve)
		st = c->opt.on_curve(c->opt.ud, c->id, &curve, c->work, &e);
	if (st == AL_OK)
		st = hand_on(c, &(al_csv_row){.delimiter = c->delimiter},
			     c->first_line, (const char *const *)c->cells, more);
	free_cells(c);
	c->n = 0;
	return st;
}

/* A number of the curve's first row that sets the whole curve: 1 and
 * *v, 0 when empty, -1 after an error. */
static int
curve_number(al_curves *c, const al_csv_row *row, int k, double *v)
{
	return al_cell_number(row, c->col[k], own[k], c->point, c->file,
			      c->diags, v);
}

/* A new curve begins at row: its id (met before only if it is the one
 * being read), its carried cells, its endpoint pH and starting volume. */
static al_status
begin_curve(al_curves *c, const al_csv_row *row, const char *id, size_t len)
{
	uint32_t *slot;
	double vol = NAN, mass = NAN, density = NAN, start = 0;

	if (al_strindex_room(&c->index, c->n_ids) != AL_OK)
		return AL_ENOMEM;
	slot = al_strindex_slot(&c->index, id, len);
	if (*slot) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line, "curve",
			     "curve '%.*s' began at line %lu and another came "
			     "between: a curve's readings must come together",
			     (int)(len > 60 ? 60 : len), id,
			     c->id_lines[*slot - 1]);
		c->skipping = 1;
		return (c->id = al_strndup(id, len)) ? AL_OK : AL_ENOMEM;
	}
	if (c->n_ids == c->ids_cap) {
		size_t cap = 2 * c->ids_cap + 16;
		char **ids = al_realloc(c->ids, cap * sizeof *ids);
		unsigned long *lines;

		if (ids == NULL)
			return AL_ENOMEM;
		c->ids = ids;
		lines = al_realloc(c->id_lines, cap * sizeof *lines);
		if (lines == NULL)
			return AL_ENOMEM;
		c->id_lines = lines;
		c->ids_cap = cap;
	}
	if ((c->ids[c->n_ids] = al_strndup(id, len)) == NULL)
		return AL_ENOMEM;
	c->id_lines[c->n_ids++] = row->line;
	*slot = (uint32_t)c->n_ids;
	if ((c->id = al_strndup(id, len)) == NULL ||
	    (c->cells = al_calloc(c->n_carried + 1, sizeof *c->cells)) == NULL)
		return AL_ENOMEM;
	for (size_t k = 0; k < c->n_carried; k++)
		if ((c->cells[k] = cell_copy(row, c->carried[k])) == NULL)
			return AL_ENOMEM;
	c->first_line = row->line;
	c->differs = 0;
	c->target_ph = c->opt.has_endpoint_ph ? c->opt.endpoint_ph
					       : AL_CURVES_DEFAULT_PH;
	if (curve_number(c, row, K_ENDPOINT, &c->target_ph) < 0 ||
	    curve_number(c, row, K_VOLUME, &vol) < 0 ||
	    curve_number(c, row, K_MASS, &mass) < 0 ||
	    curve_number(c, row, K_DENSITY, &density) < 0 ||
	    curve_number(c, row, K_START, &start) < 0)
		return AL_OK;
	/* Gran's V0: the sample's volume (or mass / density) and any water
	 * added before the titration */
	c->v0_ml = isfinite(vol) ? vol + start
		 : isfinite(mass) && isfinite(density) && density > 0
			 ? mass / density + start
			 : NAN;
	return AL_OK;
}

/* A reading's carried cells against its curve's first row: the first
 * row that differs is an error. */
static void
same_carried(al_curves *c, const al_csv_row *row)
{
	for (size_t k = 0; k < c->n_carried && !c->differs; k++) {
		size_t len;
		const char *s = al_cell(row, c->carried[k], &len);

		if (strlen(c->cells[k]) == len && memcmp(s, c->cells[k], len) == 0)
			continue;
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line,
			     c->names[k],
			     "'%.*s' here, '%.60s' on the curve's first reading "
			     "(line %lu): a curve's other columns must be the "
			     "same on every reading",
			     (int)(len > 60 ? 60 : len), s, c->cells[k],
			     c->first_line);
		c->differs = 1;
	}
}

/* *a resized to n doubles: 1, or 0 when memory runs out (*a kept). */
static int
resize(double **a, size_t n)
{
	double *p = al_realloc(*a, n * sizeof *p);

	if (p != NULL)
		*a = p;
	return p != NULL;
}

/* A reading into the curve's arrays. */
static al_status
add_reading(al_curves *c, const al_csv_row *row)
{
	double ml, ph;
	int got_ml = al_cell_number(row, c->col[K_ML], own[K_ML], c->point,
				    c->file, c->diags, &ml);
	int got_ph = al_cell_number(row, c->col[K_PH], own[K_PH], c->point,
				    c->file, c->diags, &ph);

	if (got_ml == 0 || got_ph == 0) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line,
			     got_ml == 0 ? "titrant_ml" : "ph",
			     "empty: every reading needs a volume and a pH");
		return AL_OK;
	}
	if (got_ml < 0 || got_ph < 0)
		return AL_OK;
	if (ph < 0 || ph > 14 || ml < 0) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line,
			     ml < 0 ? "titrant_ml" : "ph",
			     ml < 0 ? "a volume below 0" : "a pH outside 0 to 14");
		return AL_OK;
	}
	if (c->n > 0 && ml < c->ml[c->n - 1]) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line,
			     "titrant_ml",
			     "the volume falls within a curve (from the line "
			     "before): readings in the order taken, volumes "
			     "cumulative");
		return AL_OK;
	}
	if (c->n == c->cap) {
		size_t cap = c->cap ? 2 * c->cap : 64;

		if (!resize(&c->ml, cap) || !resize(&c->ph, cap) ||
		    !resize(&c->work, 3 * cap))
			return AL_ENOMEM;
		c->cap = cap;
	}
	c->ml[c->n] = ml;
	c->ph[c->n++] = ph;
	return AL_OK;
}

al_status
al_curves_row(al_curves *c, const al_csv_row *row)
{
	size_t len;
	const char *id;
	al_status st;

	if (row->syntax_error) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line, NULL,
			     "%s", row->syntax_error);
		return AL_OK;
	}
	if (!c->header_done)
		return header(c, row);
	id = al_cell(row, c->col[K_CURVE], &len);
	/* a comment line ("# ..." in its first cell), or a blank one */
	if ((row->nfields > 0 && row->lens[0] >= 2 &&
	     memcmp(row->fields[0], "# ", 2) == 0) ||
	    (row->nfields == 1 && row->lens[0] == 0) || c->bad_header)
		return AL_OK;
	if (len == 0) {
		al_diags_add(c->diags, AL_SEV_ERROR, c->file, row->line, "curve",
			     "empty: each reading names its curve");
		return AL_OK;
	}
	if (c->id == NULL || strlen(c->id) != len ||
	    memcmp(c->id, id, len) != 0) {
		if ((st = finish_curve(c)) != AL_OK ||
		    (st = begin_curve(c, row, id, len)) != AL_OK)
			return st;
	} else if (!c->skipping)
		same_carried(c, row);
	return c->skipping ? AL_OK : add_reading(c, row);
}

al_status
al_curves_finish(al_curves *c)
{
	return finish_curve(c);
}
