/* acidlot: the assay run's reading: titration rows into groups of
 * replicates (results.c evaluates them).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/assay.h"

#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/curves.h"
#include "run.h"
#include "titration.h"

/* The options' defaults where a caller left them zero. */
static void
fill_defaults(al_assay_options *o)
{
	al_qc_options d;

	if (o->default_acid == NULL)
		o->default_acid = al_catalogue_find(o->catalogue, "citric");
	if (o->confidence == 0)
		o->confidence = 0.95;
	al_qc_options_default(&d);
	if (o->qc.guard_r == 0)
		o->qc.guard_r = d.guard_r;
	if (o->qc.burette_tol_ml == 0)
		o->qc.burette_tol_ml = d.burette_tol_ml;
	if (o->qc.balance_linearity_g == 0)
		o->qc.balance_linearity_g = d.balance_linearity_g;
	if (o->qc.k == 0)
		o->qc.k = d.k;
	if (!o->qc.has_resolution)
		o->qc.resolution_ml = d.resolution_ml;
	if (!o->qc.has_water_u)
		o->qc.water_u_pct = d.water_u_pct;
}

al_assay *
al_assay_new(const al_assay_options *opt, al_status *status)
{
	al_assay *run = al_calloc(1, sizeof *run);

	if (run == NULL) {
		*status = AL_ENOMEM;
		return NULL;
	}
	run->opt = *opt;
	fill_defaults(&run->opt);
	al_rows_init(&run->rows, &run->opt, &run->diags);
	*status = AL_OK;
	return run;
}

void
al_assay_free(al_assay *run)
{
	if (run == NULL)
		return;
	al_groups_free(&run->groups);
	al_rows_free(&run->rows);
	al_labels_clear(&run->labels);
	al_diags_clear(&run->diags);
	al_free_all((void *const *)run->files, run->n_files);
	AL_FREE_ALL(run->files, run->kept, run->kept_text,
		    (void *)run->acids_used, (void *)run->specs_used,
		    run->cochran, run);
}

al_diags *
al_assay_diags(al_assay *run)
{
	return &run->diags;
}

al_assay_counts
al_assay_get_counts(const al_assay *run)
{
	return run->counts;
}

size_t
al_assay_group_count(const al_assay *run)
{
	return run->groups.n;
}

const al_titrant *
al_assay_titrant_used(const al_assay *run, size_t i)
{
	return i < run->rows.n_lots_used ? run->rows.lots_used[i] : NULL;
}

static size_t
group_index(const al_assay *run, const al_group *g)
{
	return (size_t)(g - run->groups.g);
}

/* Where a group began, for its labels. */
static al_label_at
group_start(const al_assay *run, const al_group *g)
{
	return (al_label_at){
		(uint32_t)al_groups_file_of(&run->groups, group_index(run, g)),
		g->first_line};
}

/* A replicate label that the row's result has already: the same data
 * twice (a file given twice, rows pasted twice), an error naming both
 * rows; 1 when so. Checked
 * while the result keeps its values (AL_VALUES_KEPT): past them it keeps
 * running statistics only, and no memory grows with its rows. */
static int
twice(al_assay *run, const al_group *g, const al_row *r)
{
	al_label_at at;

	if (!al_labels_find(&run->labels, &g->labels, group_index(run, g),
			    group_start(run, g), r->text[AL_T_REPLICATE],
			    r->len[AL_T_REPLICATE], &at))
		return 0;
	AL_ROW_ERR(&run->rows, r->line, "replicate",
		   "'%s' is given twice for one result: also at %s:%lu (the "
		   "same data twice?)",
		   r->text[AL_T_REPLICATE], run->files[at.file], at.line);
	return 1;
}

/* Keeps a used row for the replicate output of al_assay_finish. */
static al_status
keep_row(al_assay *run, const al_group *g, const al_row *r)
{
	/* the replicate, then the curve and the mode, each ending in NUL */
	size_t len = r->len[AL_T_REPLICATE] + r->curve_len + r->mode_len + 3;
	struct kept_row *k;
	void *p;

	p = al_reserve(run->kept, &run->cap_kept,
		       (run->n_kept + 1) * sizeof *run->kept);
	if (p == NULL)
		return AL_ENOMEM;
	run->kept = p;
	p = al_reserve(run->kept_text, &run->kept_text_cap,
		       run->kept_text_len + len);
	if (p == NULL)
		return AL_ENOMEM;
	run->kept_text = p;
	p = run->kept_text + run->kept_text_len;
	memcpy(p, r->text[AL_T_REPLICATE], r->len[AL_T_REPLICATE] + 1);
	p = (char *)p + r->len[AL_T_REPLICATE] + 1;
	memcpy(p, r->curve, r->curve_len);
	((char *)p)[r->curve_len] = '\0';
	p = (char *)p + r->curve_len + 1;
	memcpy(p, r->mode, r->mode_len);
	((char *)p)[r->mode_len] = '\0';
	k = &run->kept[run->n_kept++];
	k->group = (uint32_t)group_index(run, g);
	k->pos = g->n - 1;
	k->file = (uint32_t)(run->n_files - 1);
	k->flags = r->flags;
	k->line = r->line;
	k->meq = al_ta_meq(&r->t);
	k->value = r->value;
	k->needed = r->needed;
	k->replicate = run->kept_text_len;
	run->kept_text_len += len;
	return AL_OK;
}

/* The reasons of the current row, "column: message; ...". */
static void
row_reasons(const al_diags *d, char *buf, size_t cap)
{
	size_t len = 0;

	buf[0] = '\0';
	for (size_t i = 0; i < d->count && len + 1 < cap; i++) {
		const al_diag *g = &d->items[i];
		int w = snprintf(buf + len, cap - len, "%s%s%s%s",
				 i ? "; " : "", g->column ? g->column : "",
				 g->column ? ": " : "", g->message);

		if (w < 0)
			break;
		len += (size_t)w;
	}
	if (len >= cap)
		len = cap - 1;
	if (d->errors > d->count && len + 16 < cap)
		snprintf(buf + len, cap - len, "; and %lu more",
			 d->errors - d->count);
}

/* A rejected row's result, if it has a sample, is flagged. */
static al_status
flag_rejected(al_assay *run, const al_csv_row *row)
{
	al_key k;
	al_key_look look;
	const char *text[5];
	size_t tl[5];
	al_group *g;
	int created;

	if (row->nfields != run->rows.header_fields)
		return AL_OK;
	if (al_rows_text(&run->rows, row, text, tl) != AL_OK)
		return AL_ENOMEM;
	if (tl[AL_T_SAMPLE] == 0)
		return AL_OK;
	k = (al_key){text[AL_T_PRODUCT], text[AL_T_LOT], text[AL_T_SAMPLE],
		     tl[AL_T_PRODUCT],	 tl[AL_T_LOT],	 tl[AL_T_SAMPLE]};
	al_groups_ahead(&run->groups, &k, &look);
	if (al_groups_find(&run->groups, &k, &look, row->line, &g,
			   &created) != AL_OK)
		return AL_ENOMEM;
	g->flags |= AL_FLAG_REJECTED;
	return AL_OK;
}

/* A row with errors: reported (strict) or rejected (keep-going). */
static al_status
bad_row(al_assay *run, const al_csv_row *row)
{
	al_diags *d = &run->rows.row_diags;
	al_status st = AL_OK;

	run->counts.rows_bad++;
	if (run->opt.on_reject == NULL) {
		for (size_t i = 0; i < d->count; i++)
			al_diags_add(&run->diags, AL_SEV_ERROR, d->items[i].file,
				     d->items[i].line, d->items[i].column, "%s",
				     d->items[i].message);
		/* count the ones the row's list could not keep */
		run->diags.errors += d->errors - d->count;
	} else {
		char reason[1024];

		row_reasons(d, reason, sizeof reason);
		st = run->opt.on_reject(run->opt.reject_ud, run->rows.file,
					row->line, reason, row->raw,
					row->raw_len);
		if (st == AL_OK)
			st = flag_rejected(run, row);
	}
	if (d->out_of_memory || run->diags.out_of_memory)
		st = AL_ENOMEM;
	al_diags_clear(d);
	return st;
}

/* The row's group: the one of its key, made on its first valid row with
 * the row's acid, unit and basis; NULL after an error (row_diags). */
static al_group *
join_group(al_assay *run, const al_row *r, const al_key *k,
	   const al_key_look *look, al_status *st)
{
	al_group *g;
	const al_acid *had;
	int created;

	*st = al_groups_find(&run->groups, k, look, r->line, &g, &created);
	if (*st != AL_OK)
		return NULL;
	had = al_groups_acid(&run->groups, g);
	if (had == NULL) {
		g->acid = al_groups_acid_slot(&run->groups, r->acid);
		if (g->acid == 0) {
			AL_ROW_ERR(&run->rows, r->line, "acid",
				   "more than 255 different acids in one run");
			return NULL;
		}
		g->unit = (uint8_t)r->unit;
		g->bits |= (r->t.basis == AL_BASIS_VOLUME ? AL_G_VOLUME : 0) |
			   (r->anhydrous ? AL_G_ANHYDROUS : 0);
	} else if (had != r->acid) {
		AL_ROW_ERR(&run->rows, r->line, "acid",
			   "'%s' differs from '%s' of the same product, lot and "
			   "sample first seen at %s:%lu; one result cannot mix "
			   "acids",
			   r->acid->name, had->name,
			   run->files[al_groups_file_of(&run->groups,
							group_index(run, g))],
			   (unsigned long)g->first_line);
		return NULL;
	}
	if (r->len[AL_T_REPLICATE] > 0 && g->n < AL_VALUES_KEPT &&
	    twice(run, g, r))
		return NULL;
	return g;
}

/* The sums of the inputs few rows have: a sum of zeros stays zero, so a
 * group gets its extra sums only when it has one of them. */
static al_status
add_extras(al_assay *run, al_group *g, const al_row *r)
{
	al_group_extra *x;

	if (r->t.blank_ml == 0 && r->t.made_up_ml == 0 &&
	    r->t.aliquot_ml == 0 && r->conc_u < 0 && !r->has_brix &&
	    !r->has_water && !r->has_density && !r->has_date &&
	    !(r->flags & AL_FLAG_ENDPOINT_LOW))
		return AL_OK;
	x = al_groups_extra(&run->groups, g);
	if (x == NULL)
		return AL_ENOMEM;
	x->sum_blank += r->t.blank_ml;
	x->sum_made_up += r->t.made_up_ml;
	x->sum_aliquot += r->t.aliquot_ml;
	if (r->conc_u >= 0) {
		x->sum_conc_u += r->conc_u;
		x->n_conc_u++;
	}
	if (r->has_brix) {
		x->sum_brix += r->brix;
		x->n_brix++;
	}
	if (r->has_water) {
		x->sum_water += r->water;
		x->n_water++;
	}
	if (r->has_density) {
		x->sum_density += r->density;
		x->n_density++;
	}
	if ((r->flags & AL_FLAG_ENDPOINT_LOW) && r->endpoint < x->min_endpoint)
		x->min_endpoint = r->endpoint;
	if (r->has_date && (x->n_dates++ == 0 || r->date > x->latest_date))
		x->latest_date = r->date;
	return AL_OK;
}

/* A valid row's value and inputs, added to its group. */
static al_status
add_row(al_assay *run, al_group *g, const al_row *r)
{
	al_row_inputs in = {
		r->value,	    r->t.titrant_ml,  r->t.blank_ml,
		r->t.titrant_mol_l, r->t.amount,      r->t.made_up_ml,
		r->t.aliquot_ml,    r->conc_u,	      r->has_brix ? r->brix : -1,
		r->has_water ? r->water : -1,
		r->has_density ? r->density : -1,
	};
	al_status st = add_extras(run, g, r);

	if (st == AL_OK && run->opt.qc.exclude_outliers)
		st = al_groups_note_extremes(&run->groups, g, &in);
	if (st == AL_OK && r->len[AL_T_REPLICATE] > 0 && g->n < AL_VALUES_KEPT)
		st = al_labels_add(
			&run->labels, &g->labels, group_index(run, g),
			group_start(run, g), r->text[AL_T_REPLICATE],
			r->len[AL_T_REPLICATE],
			(al_label_at){(uint32_t)(run->n_files - 1), r->line});
	if (st == AL_OK)
		st = al_group_push(g, r->value);
	if (st != AL_OK)
		return st;
	if (r->impossible)
		g->bits |= AL_G_IMPOSSIBLE;
	g->flags |= r->flags;
	g->sum_titrant += r->t.titrant_ml;
	g->sum_conc += r->t.titrant_mol_l;
	g->sum_amount += r->t.amount;
	run->counts.rows_used++;
	return run->on_row ? keep_row(run, g, r) : AL_OK;
}

/* One record after the header: skipped, used or reported. */
static al_status
data_row(al_assay *run, const al_csv_row *row)
{
	al_rows *rs = &run->rows;
	al_row_kind kind = al_rows_kind(rs, row);
	al_status st = AL_OK;
	al_group *g = NULL;
	al_key_look look;
	al_key k;
	al_row r;

	if (kind == AL_ROW_SKIP)
		return AL_OK;
	run->counts.rows_read++;
	if (kind == AL_ROW_DATA) {
		st = al_rows_names(rs, row, &r);
		if (st == AL_OK) {
			k = (al_key){r.text[AL_T_PRODUCT], r.text[AL_T_LOT],
				     r.text[AL_T_SAMPLE],  r.len[AL_T_PRODUCT],
				     r.len[AL_T_LOT],	   r.len[AL_T_SAMPLE]};
			al_groups_ahead(&run->groups, &k, &look);
			st = al_rows_values(rs, row, &r);
		}
		if (st == AL_OK && rs->row_diags.errors == 0 && r.acid != NULL)
			g = join_group(run, &r, &k, &look, &st);
		if (g != NULL &&
		    al_titration_value(rs, &r, (al_unit)g->unit,
				       (g->bits & AL_G_ANHYDROUS) != 0) == 0)
			st = add_row(run, g, &r);
		if (st != AL_OK)
			return st;
	}
	if (rs->row_diags.errors > 0 || rs->row_diags.out_of_memory)
		return bad_row(run, row);
	return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
}

/* A row of the table of titrations (a file's, or one curve's). */
static al_status
table_row(void *ud, const al_csv_row *row)
{
	al_assay *run = ud;

	if (!row->syntax_error && al_rows_comment(row))
		return AL_OK;
	if (!run->rows.header_done) {
		al_status st = al_rows_header(&run->rows, row);

		/* a file whose header cannot be read is not read further:
		 * its rows would only add noise to the real problem */
		if (st == AL_ENOMEM)
			return st;
		return run->rows.header_ok ? AL_OK : AL_EINPUT;
	}
	if (!run->rows.header_ok)
		return AL_OK;
	return data_row(run, row);
}

/* A file's header that names curve and ph: its readings are read into
 * one row per curve, as acidlot endpoint writes them (curves.c). */
static al_status
begin_curves(al_assay *run, const al_csv_row *header)
{
	al_curves_options o = {
		.mode = run->opt.endpoint_mode,
		.has_endpoint_ph = run->opt.has_endpoint,
		.endpoint_ph = run->opt.endpoint_ph,
		.decimal_point = run->opt.csv.decimal_point,
		.decimals = -1,
		.aliases = run->opt.aliases,
		.n_aliases = run->opt.n_aliases,
		.on_row = table_row,
		.ud = run,
	};

	run->curves = al_curves_new(&o, run->rows.file, &run->diags);
	/* the rows made carry our names: no alias applies to them */
	run->n_aliases = run->opt.n_aliases;
	run->opt.n_aliases = 0;
	return run->curves ? al_curves_row(run->curves, header) : AL_ENOMEM;
}

static al_status
on_csv_row(void *ud, const al_csv_row *row)
{
	al_assay *run = ud;

	if (run->curves)
		return al_curves_row(run->curves, row);
	if (!run->rows.header_done && !row->syntax_error &&
	    !al_rows_comment(row) &&
	    al_curves_is_header(row, run->opt.aliases, run->opt.n_aliases))
		return begin_curves(run, row);
	return table_row(ud, row);
}

al_status
al_assay_read(al_assay *run, FILE *in, const char *name,
	      al_replicate_fn on_row, void *ud)
{
	return al_assay_read_source(run, al_read_stdio, in, name, on_row, ud);
}

/* After a file's reading: the file's own errors. */
static al_status
file_status(al_assay *run, al_status st, unsigned long rows_before)
{
	if (st == AL_OK && run->diags.out_of_memory)
		st = AL_ENOMEM;
	if (st == AL_OK && !run->rows.header_done) {
		al_diags_add(&run->diags, AL_SEV_ERROR, run->rows.file, 0, NULL,
			     "the file is empty (no header row)");
		st = AL_EINPUT;
	} else if (st == AL_OK && !run->rows.header_ok)
		st = AL_EINPUT;
	else if (st == AL_OK && run->counts.rows_read == rows_before) {
		/* a header alone, or blank lines: nothing to judge, and no
		 * report replaced by a bare header */
		al_diags_add(&run->diags, AL_SEV_ERROR, run->rows.file, 0, NULL,
			     "no titrations");
		st = AL_EINPUT;
	}
	if (run->diags.out_of_memory)
		st = AL_ENOMEM;
	return st;
}

al_status
al_assay_read_source(al_assay *run, al_read_fn read_fn, void *ctx,
		     const char *name, al_replicate_fn on_row, void *ud)
{
	char **files;
	unsigned long rows_before = run->counts.rows_read;
	al_status st;

	files = al_realloc(run->files, (run->n_files + 1) * sizeof *files);
	if (files == NULL)
		return AL_ENOMEM;
	run->files = files;
	if (al_groups_begin_file(&run->groups) != AL_OK)
		return AL_ENOMEM;
	run->files[run->n_files] = al_strdup(name);
	if (run->files[run->n_files] == NULL)
		return AL_ENOMEM;
	run->n_files++;
	al_rows_begin_file(&run->rows, run->files[run->n_files - 1]);
	run->on_row = on_row;
	run->ud = ud;
	st = al_csv_read(&run->opt.csv, read_fn, ctx, run->rows.file,
			 on_csv_row, run, &run->diags);
	if (run->curves) {
		if (st == AL_OK)
			st = al_curves_finish(run->curves);
		al_curves_free(run->curves);
		run->curves = NULL;
		run->opt.n_aliases = run->n_aliases;
	}
	return file_status(run, st, rows_before);
}

al_status
al_run_replay(al_assay *run)
{
	for (size_t i = 0; i < run->n_kept; i++) {
		const struct kept_row *k = &run->kept[i];
		const al_group_result *r = al_assay_result(run, k->group);
		al_replicate rep;
		al_status st;

		const char *replicate = run->kept_text + k->replicate;
		const char *curve = replicate + strlen(replicate) + 1;

		rep = (al_replicate){
			.file = run->files[k->file],
			.line = k->line,
			.product = r->product,
			.lot = r->lot,
			.sample = r->sample,
			.replicate = replicate,
			.curve = curve,
			.mode = curve + strlen(curve) + 1,
			.meq = k->meq,
			.value = k->value,
			.unit = r->unit,
			.acid = r->acid,
			.flags = k->flags,
			.endpoint_ph_needed = k->needed,
		};
		if (r->has_grubbs && k->pos == r->grubbs_index)
			rep.flags |= r->flags & (AL_FLAG_OUTLIER | AL_FLAG_STRAGGLER);
		if (r->has_dixon && k->pos == r->dixon_index)
			rep.flags |= r->flags & AL_FLAG_DIXON;
		if (r->has_excluded && k->pos == r->excluded_index)
			rep.flags |= AL_FLAG_EXCLUDED;
		st = run->on_row(run->ud, &rep);
		if (st != AL_OK)
			return st;
	}
	return AL_OK;
}
