/* acidlot: specification table and the simple-acceptance decision.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/spec.h"

#include <stdint.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/table.h"
#include "acidlot/text.h"
#include "strindex.h"

/* The specs in file order, found by product through a hash index, so
 * that a table of 200,000 products is read and searched in linear time. loose holds
 * each product's al_text_loose form, made on the first loose search. */
struct al_spec_table {
	al_spec *specs;
	size_t count, alloc;
	al_strindex index; /* by product */
	char **loose;
};

/* The index's name of spec i. */
static const char *
product_of(const void *table, size_t i)
{
	return ((const al_spec_table *)table)->specs[i].product;
}

enum { C_PRODUCT, C_ACID, C_UNIT, C_MIN, C_MAX, C_MAX_RSD, C_MIN_N, C_SR,
       C_R, C_BRIX_MIN, C_BRIX_MAX, C_RATIO_MIN, C_RATIO_MAX, C_WATER_MIN,
       C_WATER_MAX, C_BASIS, C_RESOLUTION, C_COUNT };
static const char *const spec_cols[C_COUNT] = {
	"product",   "acid",	  "unit",      "min",	    "max",
	"max_rsd_pct", "min_n",	  "sr",	       "r",	    "brix_min",
	"brix_max",  "ratio_min", "ratio_max", "water_min", "water_max",
	"basis",     "resolution_ml"};

struct spec_reader {
	const al_catalogue *cat;
	al_spec_table *table;
	const char *file;
	al_diags *diags;
	int header_done;
	size_t header_fields;
	int col[C_COUNT];
	int bad;
	char point;
	char *ident; /* the current row's product, in NFC */
	size_t ident_cap;
	const al_column_alias *aliases; /* other headers (--spec-column) */
	size_t n_aliases;
};

static void
err(struct spec_reader *r, unsigned long line, const char *col,
    const char *msg, const char *text, size_t len)
{
	al_diags_add(r->diags, AL_SEV_ERROR, r->file, line, col, "'%.*s' %s",
		     (int)(len > 60 ? 60 : len), text, msg);
	r->bad = 1;
}

static al_status
spec_header(struct spec_reader *r, const al_csv_row *row)
{
	r->header_done = 1;
	if (al_own_header(row, spec_cols, C_COUNT, r->aliases, r->n_aliases,
			  r->col, &r->header_fields, r->file,
			  r->diags, "--spec-column") != AL_OK)
		r->bad = 1;
	/* the specification's delimiter is told from its header: a
	 * comma-delimited one has '.' decimals, whatever the titration
	 * files use */
	if (row->delimiter == ',')
		r->point = '.';
	if (r->col[C_PRODUCT] < 0) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "missing required column 'product'");
		r->bad = 1;
	}
	if (r->col[C_MIN] < 0 && r->col[C_MAX] < 0) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "needs a 'min' or a 'max' column");
		r->bad = 1;
	}
	return r->diags->out_of_memory ? AL_ENOMEM : AL_OK;
}

/* The row's product, in NFC into r->ident: given, not too long, UTF-8
 * and not specified before. */
static al_status
spec_product(struct spec_reader *r, const al_csv_row *row)
{
	size_t len;
	const char *text = al_cell(row, r->col[C_PRODUCT], &len);
	uint32_t dup;

	if (al_text_identifier(text, len, &r->ident, &r->ident_cap, &len) !=
		    AL_OK ||
	    al_strindex_room(&r->table->index, r->table->count) != AL_OK)
		return AL_ENOMEM;
	text = r->ident;
	if (len == 0)
		err(r, row->line, "product",
		    "is empty: a product code is required", text, len);
	else if (len > AL_IDENT_MAX)
		err(r, row->line, "product", "is longer than 255 bytes", text,
		    40);
	else if (!al_utf8_valid(text, len))
		err(r, row->line, "product",
		    "is not valid UTF-8 text (save the file as UTF-8)", text,
		    len);
	else if ((dup = *al_strindex_slot(&r->table->index, text, len)) != 0) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "product", "'%.*s' already specified at line %lu",
			     (int)len, text, r->table->specs[dup - 1].line);
		r->bad = 1;
	}
	return AL_OK;
}

/* The acid and the unit, where given. */
static void
spec_acid_unit(struct spec_reader *r, const al_csv_row *row, al_spec *s)
{
	size_t len;
	const char *text = al_cell(row, r->col[C_ACID], &len);
	char name[128], why[256];

	if (len > 0) {
		snprintf(name, sizeof name, "%.*s", (int)len, text);
		s->acid = al_catalogue_find(r->cat, name);
		if (s->acid == NULL)
			err(r, row->line, "acid",
			    "is not in the acid catalogue (see 'acidlot acids')",
			    text, len);
	}
	text = al_cell(row, r->col[C_UNIT], &len);
	if (len == 0)
		return;
	snprintf(name, 64, "%.*s", (int)len, text);
	if (al_unit_parse(name, &s->unit) == AL_OK) {
		s->has_unit = 1;
		return;
	}
	snprintf(why, sizeof why, "%s (units: %s)", al_unit_refusal(name),
		 al_unit_list());
	err(r, row->line, "unit", why, text, len);
}

/* A number cell k: 1 set, 0 empty, -1 bad (reported, the row bad). */
static int
spec_number(struct spec_reader *r, const al_csv_row *row, int k, double *v)
{
	int got = al_cell_number(row, r->col[k], spec_cols[k], r->point,
				 r->file, r->diags, v);

	if (got < 0)
		r->bad = 1;
	return got;
}

/* A bad value of cell k, named with its text. */
static void
spec_bad_cell(struct spec_reader *r, const al_csv_row *row, int k,
	      const char *msg)
{
	size_t len;
	const char *text = al_cell(row, r->col[k], &len);

	err(r, row->line, spec_cols[k], msg, text, len);
}

/* The replicates' limits: RSD, n, repeatability, reading resolution. */
static void
spec_precision(struct spec_reader *r, const al_csv_row *row, al_spec *s)
{
	double v, sr = 0, rl = 0;
	int got = spec_number(r, row, C_MAX_RSD, &s->max_rsd_pct), got_sr,
	    got_r;

	s->has_max_rsd = got == 1;
	if (got == 1 && !(s->max_rsd_pct > 0))
		spec_bad_cell(r, row, C_MAX_RSD, "must be above 0");
	got = spec_number(r, row, C_MIN_N, &v);
	if (got == 1 && (v < 1 || v > 1000 || v != (double)(size_t)v))
		spec_bad_cell(r, row, C_MIN_N,
			      "must be a whole number from 1 to 1000");
	else if (got == 1)
		s->min_n = (size_t)v;
	got_sr = spec_number(r, row, C_SR, &sr);
	got_r = spec_number(r, row, C_R, &rl);
	if (got_sr < 0 || got_r < 0)
		;
	else if (got_sr == 1 && got_r == 1) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, "r",
			     "give sr or r, not both");
		r->bad = 1;
	} else if ((got_sr == 1 && !(sr > 0)) || (got_r == 1 && !(rl > 0))) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     got_sr == 1 ? "sr" : "r", "must be above 0");
		r->bad = 1;
	} else if (got_sr == 1 || got_r == 1) {
		s->has_sr = 1;
		/* ISO 5725-6 3.7: r = 2.8 sr (1.96 sqrt 2 rounded) */
		s->sr = got_sr == 1 ? sr : rl / 2.8;
	}
	got = spec_number(r, row, C_RESOLUTION, &s->resolution_ml);
	if (got == 1 && !(s->resolution_ml >= 0 && s->resolution_ml <= 1)) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "resolution_ml", "must be from 0 to 1 mL");
		r->bad = 1;
	} else if (got >= 0)
		s->has_resolution = got == 1;
}

/* The juice's limits (Brix, ratio, water: each min at most its max)
 * and the basis. */
static void
spec_juice(struct spec_reader *r, const al_csv_row *row, al_spec *s)
{
	static const int cols[6] = {C_BRIX_MIN,	 C_BRIX_MAX,  C_RATIO_MIN,
				    C_RATIO_MAX, C_WATER_MIN, C_WATER_MAX};
	int *has[6] = {&s->has_brix_min,  &s->has_brix_max,
		       &s->has_ratio_min, &s->has_ratio_max,
		       &s->has_water_min, &s->has_water_max};
	double *val[6] = {&s->brix_min,	 &s->brix_max,	&s->ratio_min,
			  &s->ratio_max, &s->water_min, &s->water_max};
	size_t len;
	const char *text;

	for (int k = 0; k < 6; k++)
		*has[k] = spec_number(r, row, cols[k], val[k]) == 1;
	for (int k = 0; k < 6; k += 2)
		if (*has[k] && *has[k + 1] && *val[k] > *val[k + 1]) {
			al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
				     spec_cols[cols[k]], "%g is above %s %g",
				     *val[k], spec_cols[cols[k + 1]],
				     *val[k + 1]);
			r->bad = 1;
		}
	text = al_cell(row, r->col[C_BASIS], &len);
	if (len == 0)
		return;
	s->has_basis = 1;
	if (al_word_eq(text, len, "anhydrous"))
		s->anhydrous = 1;
	else if (!al_word_eq(text, len, "as-is") &&
		 !al_word_eq(text, len, "as is"))
		err(r, row->line, "basis",
		    "is not a basis (use as-is or anhydrous)", text, len);
}

/* A good row's specification, added to the table. */
static al_status
spec_add(struct spec_reader *r, al_spec *s)
{
	void *grown = al_reserve(r->table->specs, &r->table->alloc,
				 (r->table->count + 1) * sizeof *s);

	if (grown == NULL)
		return AL_ENOMEM;
	r->table->specs = grown;
	s->product = al_strndup(r->ident, strlen(r->ident));
	if (s->product == NULL)
		return AL_ENOMEM;
	*al_strindex_slot(&r->table->index, s->product, strlen(s->product)) =
		(uint32_t)(r->table->count + 1);
	r->table->specs[r->table->count++] = *s;
	return AL_OK;
}

static al_status
spec_row(void *ud, const al_csv_row *row)
{
	struct spec_reader *r = ud;
	al_spec s;
	int got, limit_bad;

	if (!r->header_done)
		return spec_header(r, row);
	if (r->bad && r->col[C_PRODUCT] < 0)
		return AL_OK;
	if (row->nfields != r->header_fields) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "%zu fields where the header has %zu",
			     row->nfields, r->header_fields);
		r->bad = 1;
		return r->diags->out_of_memory ? AL_ENOMEM : AL_OK;
	}
	memset(&s, 0, sizeof s);
	s.line = row->line;
	s.min_n = 2;
	if (spec_product(r, row) != AL_OK)
		return AL_ENOMEM;
	spec_acid_unit(r, row, &s);
	got = spec_number(r, row, C_MIN, &s.min);
	s.has_min = got == 1;
	limit_bad = got < 0;
	got = spec_number(r, row, C_MAX, &s.max);
	s.has_max = got == 1;
	limit_bad |= got < 0;
	spec_precision(r, row, &s);
	spec_juice(r, row, &s);
	if (!s.has_min && !s.has_max && !limit_bad) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "needs a min or a max (or both)");
		r->bad = 1;
	}
	if (s.has_min && s.has_max && s.min > s.max) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, "min",
			     "min %g is above max %g", s.min, s.max);
		r->bad = 1;
	}
	if (r->diags->out_of_memory)
		return AL_ENOMEM;
	if (r->bad)
		return AL_OK; /* keep reading to list every problem */
	return spec_add(r, &s);
}

al_spec_table *
al_spec_table_read(const al_catalogue *cat, const al_csv_options *csv,
		   FILE *in, const char *name, al_status *status,
		   al_diags *diags)
{
	return al_spec_table_read_as(cat, csv, NULL, 0, in, name, status,
				     diags);
}

int
al_spec_is_column(const char *name)
{
	return al_name_index(spec_cols, C_COUNT, name) >= 0;
}

al_spec_table *
al_spec_table_read_as(const al_catalogue *cat, const al_csv_options *csv,
		      const al_column_alias *aliases, size_t n_aliases,
		      FILE *in, const char *name, al_status *status,
		      al_diags *diags)
{
	struct spec_reader r = {
		.cat = cat,
		.file = name,
		.diags = diags,
		.point = csv && csv->decimal_point ? csv->decimal_point : '.',
		.aliases = aliases,
		.n_aliases = n_aliases,
	};
	al_status st;

	r.table = al_calloc(1, sizeof *r.table);
	if (r.table == NULL) {
		*status = AL_ENOMEM;
		return NULL;
	}
	r.table->index.name = product_of;
	r.table->index.ctx = r.table;
	st = al_csv_read_file(csv, in, name, spec_row, &r, diags);
	if (st == AL_OK && !r.header_done) {
		al_diags_add(diags, AL_SEV_ERROR, name, 0, NULL,
			     "the specification file is empty");
		st = AL_EINPUT;
	}
	if (st == AL_OK && r.bad)
		st = AL_EINPUT;
	if (st == AL_OK && diags->out_of_memory)
		st = AL_ENOMEM;
	al_free(r.ident);
	if (st != AL_OK) {
		al_spec_table_free(r.table);
		*status = st;
		return NULL;
	}
	*status = AL_OK;
	return r.table;
}

void
al_spec_table_free(al_spec_table *table)
{
	if (table == NULL)
		return;
	for (size_t i = 0; i < table->count; i++)
		AL_FREE_ALL(table->specs[i].product,
			    table->loose ? table->loose[i] : NULL);
	al_strindex_free(&table->index);
	AL_FREE_ALL(table->loose, table->specs, table);
}

const al_spec *
al_spec_find(const al_spec_table *table, const char *product)
{
	long i = table ? al_strindex_find(&table->index, product) : -1;

	return i >= 0 ? &table->specs[i] : NULL;
}

const al_spec *
al_spec_find_loose(al_spec_table *table, const char *product, int *oom)
{
	char *key;
	const al_spec *found = NULL;

	*oom = 0;
	if (table == NULL || table->count == 0)
		return NULL;
	if (table->loose == NULL) {
		table->loose = al_calloc(table->count, sizeof *table->loose);
		for (size_t i = 0; table->loose && i < table->count; i++)
			if ((table->loose[i] =
				     al_text_loose(table->specs[i].product)) ==
			    NULL) {
				for (size_t j = 0; j < i; j++)
					al_free(table->loose[j]);
				al_free(table->loose);
				table->loose = NULL;
			}
		if (table->loose == NULL) {
			*oom = 1;
			return NULL;
		}
	}
	key = al_text_loose(product);
	if (key == NULL) {
		*oom = 1;
		return NULL;
	}
	for (size_t i = 0; i < table->count && !found; i++)
		if (strcmp(table->loose[i], key) == 0)
			found = &table->specs[i];
	al_free(key);
	return found;
}

const char *
al_verdict_name(al_verdict v)
{
	static const char *const names[AL_VERDICT_COUNT] = {
		"pass",	   "fail",	       "retest",
		"no-spec", "conditional-pass", "conditional-fail"};

	return (unsigned)v < AL_VERDICT_COUNT ? names[v] : "?";
}

al_verdict
al_judge(const al_spec *spec, const al_summary *s, unsigned *why)
{
	*why = 0;
	if (spec == NULL)
		return AL_VERDICT_NO_SPEC;
	if (s->n == 0) {
		*why = AL_WHY_FEW; /* every row rejected: nothing to judge */
		return AL_VERDICT_RETEST;
	}
	if (s->n < spec->min_n)
		*why |= AL_WHY_FEW;
	if (spec->has_max_rsd && s->has_rsd && s->rsd_pct > spec->max_rsd_pct)
		*why |= AL_WHY_RSD;
	if (spec->has_min && s->mean < spec->min)
		*why |= AL_WHY_BELOW_MIN;
	if (spec->has_max && s->mean > spec->max)
		*why |= AL_WHY_ABOVE_MAX;
	if (*why & (AL_WHY_FEW | AL_WHY_RSD))
		return AL_VERDICT_RETEST;
	if (*why & (AL_WHY_BELOW_MIN | AL_WHY_ABOVE_MAX))
		return AL_VERDICT_FAIL;
	return AL_VERDICT_PASS;
}

al_verdict
al_judge_rule(const al_spec *spec, const al_summary *s, al_decision_rule rule,
	      double guard, int range_exceeded, unsigned *why)
{
	al_verdict v = al_judge(spec, s, why);
	double w = rule == AL_DECISION_GUARDED && guard > 0 ? guard : 0;
	int inside;

	if (spec == NULL)
		return v;
	if (range_exceeded && s->n > 0) {
		*why |= AL_WHY_RANGE;
		return AL_VERDICT_RETEST;
	}
	if (v == AL_VERDICT_RETEST || w == 0)
		return v;
	inside = v == AL_VERDICT_PASS;
	if ((!spec->has_min || s->mean >= spec->min + w) &&
	    (!spec->has_max || s->mean <= spec->max - w))
		return AL_VERDICT_PASS;
	if ((spec->has_min && s->mean < spec->min - w) ||
	    (spec->has_max && s->mean > spec->max + w))
		return AL_VERDICT_FAIL;
	return inside ? AL_VERDICT_COND_PASS : AL_VERDICT_COND_FAIL;
}

const al_spec *
al_spec_all(const al_spec_table *table, size_t *n)
{
	*n = table ? table->count : 0;
	return table ? table->specs : NULL;
}
