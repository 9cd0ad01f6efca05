/* acidlot command line: a workbook from the program's CSV outputs and
 * record (workbook.h), through libxlsxwriter (Debian's
 * libxlsxwriter-dev).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <csv.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <xlsxwriter.h>

#include "cli.h"
#include "workbook.h"

#define MAX_COLUMNS 64

/* The columns the program computes as numbers, in any of its CSV
 * outputs, and the unit their header carries: "unit" is the row's own
 * unit column (a result's unit varies from product to product). Every
 * other column is text, even when it looks like a number (a lot 0012
 * stays "0012"). */
static const struct column {
	const char *name, *unit;
} numeric[] = {
	{"n", NULL},		  {"mean", "unit"},
	{"sd", "unit"},		  {"rsd_pct", "%"},
	{"ci95_low", "unit"},	  {"ci95_high", "unit"},
	{"spec_min", "unit"},	  {"spec_max", "unit"},
	{"median", "unit"},	  {"grubbs_g", NULL},
	{"dixon_q", NULL},	  {"range", "unit"},
	{"critical_range", "unit"}, {"horrat", NULL},
	{"u", "unit"},		  {"U", "unit"},
	{"k", NULL},		  {"brix", "°Brix"},
	{"brix_corrected", "°Brix"}, {"brix_acid_ratio", NULL},
	{"water_pct", "%"},	  {"line", NULL},
	{"meq", "meq"},		  {"value", "unit"},
	{"standard_uncertainty", "unit"}, {"sensitivity", NULL},
	{"contribution", "result's unit"}, {"share_pct", "%"},
	{"seq", NULL},		  {"centre", "unit"},
	{"lcl", "unit"},	  {"ucl", "unit"},
	{"mr", "unit"},		  {"mr_ucl", "unit"},
	{"ewma", "unit"},	  {"cusum_hi", "unit"},
	{"cusum_lo", "unit"},	  {"sigma_within", "unit"},
	{"sigma_overall", "unit"}, {"cp", NULL},
	{"cpk", NULL},		  {"pp", NULL},
	{"ppk", NULL},		  {"points_signalled", NULL},
};

/* The status column's fills: our own, each a step lighter than the
 * next worse, so that they read in grey too (lightness about 100, 93,
 * 87, 77, 30); fail in white bold on dark red. */
static const struct {
	const char *status;
	unsigned fill, font;
	int bold;
} palette[] = {
	{"conditional-pass", 0xE2EFDA, 0x000000, 0},
	{"retest", 0xFFD966, 0x000000, 0},
	{"conditional-fail", 0xF4B183, 0x000000, 1},
	{"fail", 0xA50021, 0xFFFFFF, 1},
};
#define N_PALETTE (sizeof palette / sizeof palette[0])

struct wbook {
	lxw_workbook *wb;
	lxw_format *head, *status[N_PALETTE];
	const char *name;
};

/* One sheet being filled from CSV. */
struct sheet {
	wbook *w;
	lxw_worksheet *ws;
	lxw_row_t row;
	lxw_col_t col, n_cols;
	const struct column *cols[MAX_COLUMNS];
	int is_status[MAX_COLUMNS], has_unit;
	const char *unit; /* the sheet's one unit, or NULL */
	double width[MAX_COLUMNS];
	lxw_error err;
	int too_big;
};

static const struct column *
column_of(const char *name)
{
	for (size_t i = 0; i < sizeof numeric / sizeof numeric[0]; i++)
		if (strcmp(numeric[i].name, name) == 0)
			return &numeric[i];
	return NULL;
}

static int
fail(wbook *w, lxw_error err)
{
	cli_error("%s: the workbook: %s", w->name, lxw_strerror(err));
	return -1;
}

wbook *
wbook_new(const char *path, const char *name)
{
	/* rows go to temporary files as they are written, not memory */
	lxw_workbook_options opt = {.constant_memory = LXW_TRUE,
				    .use_zip64 = LXW_TRUE};
	wbook *w = al_calloc(1, sizeof *w);

	if (w == NULL) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return NULL;
	}
	w->name = name;
	if ((w->wb = workbook_new_opt(path, &opt)) == NULL ||
	    (w->head = workbook_add_format(w->wb)) == NULL) {
		cli_error("%s: cannot start the workbook", name);
		wbook_close(w);
		return NULL;
	}
	format_set_bold(w->head);
	format_set_bottom(w->head, LXW_BORDER_THIN);
	for (size_t i = 0; i < N_PALETTE; i++) {
		lxw_format *f = workbook_add_format(w->wb);

		if (f == NULL) {
			cli_error("%s: cannot start the workbook", name);
			wbook_close(w);
			return NULL;
		}
		format_set_pattern(f, LXW_PATTERN_SOLID);
		format_set_bg_color(f, palette[i].fill);
		format_set_font_color(f, palette[i].font);
		if (palette[i].bold)
			format_set_bold(f);
		w->status[i] = f;
	}
	return w;
}

/* Does the CSV's header (its first line) have a unit column? */
static int
has_unit_column(const char *csv, size_t len)
{
	const char *end = memchr(csv, '\n', len), *p = csv;

	if (end == NULL)
		end = csv + len;
	while (p < end) {
		const char *comma = memchr(p, ',', (size_t)(end - p));
		const char *stop = comma ? comma : end;

		if (stop - p == 4 && memcmp(p, "unit", 4) == 0)
			return 1;
		p = stop + 1;
	}
	return 0;
}

/* A text cell's format: the status fills, else none. */
static lxw_format *
text_format(const struct sheet *s, const char *text)
{
	if (!s->is_status[s->col])
		return NULL;
	for (size_t i = 0; i < N_PALETTE; i++)
		if (strcmp(palette[i].status, text) == 0)
			return s->w->status[i];
	return NULL;
}

/* A header cell: the name and its unit, "mean (in unit)". */
static void
header_cell(struct sheet *s, const char *name)
{
	const struct column *c = column_of(name);
	char text[128];

	s->cols[s->col] = c;
	s->is_status[s->col] = strcmp(name, "status") == 0;
	if (c && c->unit && strcmp(c->unit, "unit") != 0)
		snprintf(text, sizeof text, "%s (%s)", name, c->unit);
	else if (c && c->unit && s->unit)
		snprintf(text, sizeof text, "%s (%s)", name, s->unit);
	else if (c && c->unit && s->has_unit)
		snprintf(text, sizeof text, "%s (in unit)", name);
	else
		snprintf(text, sizeof text, "%s", name);
	s->width[s->col] = (double)strlen(text) + 2;
	s->err = worksheet_write_string(s->ws, 0, s->col, text, s->w->head);
}

static void
on_field(void *field, size_t len, void *data)
{
	struct sheet *s = data;
	const char *text = field;
	char *end;
	double v;

	if (s->err || s->too_big || s->col >= MAX_COLUMNS) {
		s->col++;
		return;
	}
	if (s->row == 0)
		header_cell(s, text);
	else if (len > 0 && s->cols[s->col] &&
		 (v = strtod(text, &end), *end == '\0') && isfinite(v))
		s->err = worksheet_write_number(s->ws, s->row, s->col, v, NULL);
	else if (len > 0)
		s->err = worksheet_write_string(s->ws, s->row, s->col, text,
						text_format(s, text));
	if (s->row > 0 && (double)len + 2 > s->width[s->col])
		s->width[s->col] = (double)len + 2;
	s->col++;
}

static void
on_row(int end, void *data)
{
	struct sheet *s = data;

	(void)end;
	if (s->row == 0)
		s->n_cols = s->col;
	s->col = 0;
	if (++s->row >= LXW_ROW_MAX)
		s->too_big = 1;
}

int
wbook_csv_sheet(wbook *w, const char *name, const char *csv, size_t len,
		const char *unit)
{
	struct sheet s = {.w = w, .has_unit = has_unit_column(csv, len),
			  .unit = unit};
	struct csv_parser p;
	int bad;

	if ((s.ws = workbook_add_worksheet(w->wb, name)) == NULL)
		return fail(w, LXW_ERROR_MEMORY_MALLOC_FAILED);
	if (csv_init(&p, CSV_APPEND_NULL) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	bad = csv_parse(&p, csv, len, on_field, on_row, &s) != len;
	csv_fini(&p, on_field, on_row, &s);
	csv_free(&p);
	if (s.too_big) {
		cli_error("%s: sheet %s: more rows than a sheet holds (%d); no "
			  "workbook written",
			  w->name, name, LXW_ROW_MAX);
		return -1;
	}
	if (bad)
		return fail(w, LXW_ERROR_MEMORY_MALLOC_FAILED);
	if (s.err)
		return fail(w, s.err);
	for (lxw_col_t c = 0; c < s.n_cols && c < MAX_COLUMNS; c++)
		worksheet_set_column(s.ws, c, c,
				     s.width[c] < 60 ? s.width[c] : 60, NULL);
	worksheet_freeze_panes(s.ws, 1, 0);
	if (s.n_cols > 0)
		worksheet_autofilter(s.ws, 0, 0, s.row > 1 ? s.row - 1 : 0,
				     (lxw_col_t)(s.n_cols - 1));
	return 0;
}

/* One JSON value, flattened under its path, into rows of (field,
 * value). */
static lxw_error
put_json(lxw_worksheet *ws, lxw_row_t *row, const char *path, json_t *v)
{
	char sub[512];
	lxw_error err = LXW_NO_ERROR;

	if (json_is_object(v)) {
		const char *key;
		json_t *member;

		json_object_foreach(v, key, member) {
			snprintf(sub, sizeof sub, "%s.%s", path, key);
			if ((err = put_json(ws, row, sub, member)) != 0)
				return err;
		}
		return err;
	}
	if (json_is_array(v)) {
		size_t i;
		json_t *item;

		json_array_foreach(v, i, item) {
			snprintf(sub, sizeof sub, "%s[%zu]", path, i);
			if ((err = put_json(ws, row, sub, item)) != 0)
				return err;
		}
		return err;
	}
	err = worksheet_write_string(ws, *row, 0, path, NULL);
	if (!err && json_is_string(v))
		err = worksheet_write_string(ws, *row, 1, json_string_value(v),
					     NULL);
	else if (!err && json_is_number(v))
		err = worksheet_write_number(ws, *row, 1, json_number_value(v),
					     NULL);
	else if (!err && json_is_boolean(v))
		err = worksheet_write_string(ws, *row, 1,
					     json_is_true(v) ? "true" : "false",
					     NULL);
	(*row)++;
	return err;
}

int
wbook_json_sheet(wbook *w, const char *name, json_t *root,
		    const char *const *skip, size_t n_skip)
{
	lxw_worksheet *ws = workbook_add_worksheet(w->wb, name);
	lxw_row_t row = 1;
	lxw_error err;
	const char *key;
	json_t *member;

	if (ws == NULL)
		return fail(w, LXW_ERROR_MEMORY_MALLOC_FAILED);
	if ((err = worksheet_write_string(ws, 0, 0, "field", w->head)) != 0 ||
	    (err = worksheet_write_string(ws, 0, 1, "value", w->head)) != 0)
		return fail(w, err);
	json_object_foreach(root, key, member) {
		size_t i = 0;

		while (i < n_skip && strcmp(skip[i], key) != 0)
			i++;
		if (i == n_skip && (err = put_json(ws, &row, key, member)) != 0)
			return fail(w, err);
	}
	worksheet_set_column(ws, 0, 0, 36, NULL);
	worksheet_set_column(ws, 1, 1, 70, NULL);
	worksheet_freeze_panes(ws, 1, 0);
	return 0;
}

int
wbook_close(wbook *w)
{
	lxw_error err;
	int rc = 0;

	if (w == NULL)
		return 0;
	if (w->wb && (err = workbook_close(w->wb)) != LXW_NO_ERROR)
		rc = fail(w, err);
	al_free(w);
	return rc;
}
