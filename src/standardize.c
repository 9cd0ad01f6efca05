/* acidlot: standardisation of a base against a primary standard.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Model and uncertainty sources as Eurachem/CITAC QUAM (3rd ed. 2012)
 * example A2: c = 1000 m P / (M V) with the balance (linearity, counted
 * for the tare and the gross weighing), the purity of the standard, its
 * molar mass (from the atomic weights), the burette (calibration
 * tolerance, triangular) and the temperature (volume expansion of water
 * over a +/- range taken as a 95 % interval, normal, as QUAM A2 does),
 * and the repeatability: the replicates' own, or the method's. */
#include "acidlot/standardize.h"

#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/date.h"
#include "acidlot/gum.h"
#include "acidlot/number.h"
#include "acidlot/ta.h"
#include "acidlot/table.h"
#include "acidlot/text.h"

/* The bounds of a titration of a primary standard: a burette reads to
 * 0.01 mL at best, an analytical balance to 0.1 mg, and NaOH dissolves
 * to about 19 mol/L (common practice). */
#define STD_VOLUME_MIN_ML 0.01
#define STD_MASS_MIN_G 0.0001
#define STD_CONC_MAX 20.0

void
al_std_params_default(al_std_params *p)
{
	/* QUAM 2012 A2 (seen through its published re-computation):
	 * balance linearity +/-0.15 mg, burette +/-0.03 mL triangular,
	 * 2.1e-4 /K volume expansion of water, +/-3 K lab temperature as a
	 * 95 % interval (u = V 2.1e-4 3 / 1.96 = 0.006 mL at 18.64 mL). */
	memset(p, 0, sizeof *p); /* every field, the ones added later too */
	p->balance_linearity_g = 0.00015;
	p->burette_tol_ml = 0.03;
	p->temp_range_c = 3;
	p->expansion_per_k = 2.1e-4;
	p->k = 2;
	/* Replicates of a standardisation usually agree within 0.1-0.2 %;
	 * QUAM A2's repeatability is 0.05 % (common practice). */
	p->max_rsd_pct = 0.2;
	p->min_n = 3;
	p->valid_days = 30;
}

double
al_std_concentration(double mass_g, double purity, double molar_mass,
		     double volume_ml)
{
	return 1000.0 * mass_g * purity / (molar_mass * volume_ml);
}

void
al_std_uncertainty(const al_std_inputs *in, al_budget *b)
{
	al_gum_term t[6] = {
		{"repeatability", "", 1.0, in->rep_rel, 1, 0, 0},
		{"mass of standard", "g", in->mass_g, in->u_mass_g, 1, 0, 0},
		{"purity of standard", "", in->purity, in->u_purity, 1, 0, 0},
		{"molar mass of standard", "g/mol", in->molar_mass,
		 in->u_molar_mass, -1, 0, 0},
		{"titrant volume: burette", "mL", in->volume_ml, in->u_volume_ml,
		 -1, 0, 0},
		{"titrant volume: temperature", "mL", in->volume_ml,
		 in->u_volume_temp_ml, -1, 0, 0},
	};
	size_t n = in->u_volume_temp_ml > 0 ? 6 : 5;

	memset(b, 0, sizeof *b);
	b->c = al_std_concentration(in->mass_g, in->purity, in->molar_mass,
				    in->volume_ml);
	b->u = al_gum_product(b->c, t, n);
	b->rel_u = b->u / b->c;
	for (size_t i = 0; i < n; i++) {
		al_budget_item *it = &b->items[b->n_items++];

		it->name = t[i].name;
		it->unit = t[i].unit;
		it->value = t[i].value;
		it->u = t[i].u;
		it->sensitivity = t[i].sensitivity;
		it->contribution = t[i].contribution;
	}
}

struct row {
	double c, mass, purity, volume; /* volume net of the blank */
	long date;
};

struct lot {
	char *name;
	const al_standard *standard;
	struct row *rows;
	size_t n, cap;
	unsigned long first_line;
	char *file;
};

struct al_std_run {
	const al_catalogue *cat;
	al_std_params p;
	const al_column_alias *aliases; /* --column: other headers */
	size_t n_aliases;
	long today;
	al_diags diags;
	struct lot *lots;
	size_t n_lots, cap_lots;
	al_std_lot *results;
	char **files;
	size_t n_files;
	/* per file */
	const char *file;
	int header_done, header_ok;
	unsigned long rows; /* records after the header */
	size_t header_fields;
	int col[7];
	char point;
	char *ident; /* the current row's lot, in NFC */
	size_t ident_cap;
};

enum { S_LOT, S_STANDARD, S_MASS, S_PURITY, S_TITRANT, S_BLANK, S_DATE };
static const char *const std_cols[7] = {"titrant_lot", "standard",
					"mass_g",      "purity",
					"titrant_ml",  "blank_ml",
					"date"};

al_std_run *
al_std_new(const al_catalogue *cat, const al_std_params *p, long today,
	   al_status *status)
{
	al_std_run *run = al_calloc(1, sizeof *run);

	if (run == NULL) {
		*status = AL_ENOMEM;
		return NULL;
	}
	run->cat = cat;
	run->p = *p;
	run->today = today;
	*status = AL_OK;
	return run;
}

al_diags *
al_std_diags(al_std_run *run)
{
	return &run->diags;
}

size_t
al_std_lot_count(const al_std_run *run)
{
	return run->n_lots;
}

const al_std_lot *
al_std_lot_at(const al_std_run *run, size_t i)
{
	return run->results && i < run->n_lots ? &run->results[i] : NULL;
}

#define ERR(run, line, column, ...)                                           \
	al_diags_add(&(run)->diags, AL_SEV_ERROR, (run)->file, (line),         \
		     (column), __VA_ARGS__)
#define WARN(run, line, column, ...)                                          \
	al_diags_add(&(run)->diags, AL_SEV_WARNING, (run)->file, (line),      \
		     (column), __VA_ARGS__)

static al_status
std_header(al_std_run *run, const al_csv_row *row)
{
	run->header_done = 1;
	run->header_fields = row->nfields;
	run->header_ok = al_header_map(AL_UNKNOWN_WARN, row, std_cols, 7,
				       run->aliases, run->n_aliases, run->col,
				       run->file, &run->diags, "--column") == AL_OK;
	if (al_aliases_present(row, run->aliases, run->n_aliases, "--column",
			       run->file, &run->diags) != AL_OK)
		run->header_ok = 0;
	for (int k = S_LOT; k <= S_TITRANT; k++) {
		if (k == S_STANDARD || k == S_PURITY || run->col[k] >= 0 ||
		    run->col[k] == AL_COLUMN_NAMED)
			continue;
		ERR(run, row->line, NULL, "missing required column '%s'",
		    std_cols[k]);
		run->header_ok = 0;
	}
	return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
}

static struct lot *
find_lot(al_std_run *run, const char *name, size_t len)
{
	for (size_t i = 0; i < run->n_lots; i++)
		if (strlen(run->lots[i].name) == len &&
		    memcmp(run->lots[i].name, name, len) == 0)
			return &run->lots[i];
	return NULL;
}

/* A row's mass, titrant, blank, purity (the standard's by default) and
 * date (the run's day by default) into *r and *titrant, each checked. */
static void
std_cells(al_std_run *run, const al_csv_row *row, const al_standard *standard,
	  struct row *r, double *titrant)
{
	unsigned long errs = run->diags.errors, line = row->line;
	const char *date_text;
	double blank = 0;
	size_t dl;
	int got;

	got = al_cell_number(row, run->col[S_MASS], "mass_g", run->point,
			     run->file, &run->diags, &r->mass);
	if (got == 0)
		ERR(run, line, "mass_g", "is empty");
	else if (got == 1 && !(r->mass > 0))
		ERR(run, line, "mass_g", "mass of standard must be above 0");
	got = al_cell_number(row, run->col[S_TITRANT], "titrant_ml",
			     run->point, run->file, &run->diags, titrant);
	if (got == 0)
		ERR(run, line, "titrant_ml", "is empty");
	got = al_cell_number(row, run->col[S_BLANK], "blank_ml", run->point,
			     run->file, &run->diags, &blank);
	if (got == 1 && blank < 0)
		ERR(run, line, "blank_ml", "blank volume must not be negative");
	if (!(*titrant > blank) && run->diags.errors == errs)
		ERR(run, line, "titrant_ml",
		    "titrant volume is not above the blank");
	r->volume = *titrant - blank;
	got = al_cell_number(row, run->col[S_PURITY], "purity", run->point,
			     run->file, &run->diags, &r->purity);
	if (got == 0 && standard)
		r->purity = standard->purity;
	else if (got == 1 && !(r->purity > 0.9 && r->purity <= 1.0001))
		ERR(run, line, "purity",
		    "purity %g is not a mass fraction near 1 (write 0.9995, "
		    "not 99.95)",
		    r->purity);
	date_text = al_cell(row, run->col[S_DATE], &dl);
	r->date = run->today;
	if (dl > 0 && al_date_parse(date_text, dl, &r->date) != 0)
		ERR(run, line, "date", "'%.*s' is not a calendar date YYYY-MM-DD",
		    (int)(dl > 40 ? 40 : dl), date_text);
}

/* Files a checked titration under its lot (made on its first row), one
 * lot, one standard. */
static al_status
file_row(al_std_run *run, const char *lot_name, size_t ll,
	 const al_standard *standard, unsigned long line, const struct row *rp)
{
	struct lot *lot;
	struct row r = *rp;

	lot = find_lot(run, lot_name, ll);
	if (lot == NULL) {
		struct lot *grown;

		if (run->n_lots == run->cap_lots) {
			size_t n = run->cap_lots ? 2 * run->cap_lots : 8;

			grown = al_realloc(run->lots, n * sizeof *grown);
			if (grown == NULL)
				return AL_ENOMEM;
			run->lots = grown;
			run->cap_lots = n;
		}
		lot = &run->lots[run->n_lots];
		memset(lot, 0, sizeof *lot);
		lot->name = al_strndup(lot_name, ll);
		if (lot->name == NULL)
			return AL_ENOMEM;
		run->n_lots++;
		lot->standard = standard;
		lot->first_line = line;
		lot->file = run->files[run->n_files - 1];
	} else if (lot->standard != standard) {
		ERR(run, line, "standard",
		    "lot '%s' was standardised against %s at line %lu: one "
		    "lot, one standard",
		    lot->name, lot->standard->name, lot->first_line);
		return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
	}
	{
		size_t bytes = lot->cap * sizeof *lot->rows;
		struct row *grown = al_reserve(lot->rows, &bytes,
					       (lot->n + 1) * sizeof *grown);

		if (grown == NULL)
			return AL_ENOMEM;
		lot->rows = grown;
		lot->cap = bytes / sizeof *grown;
	}
	lot->rows[lot->n++] = r;
	return AL_OK;
}

static al_status
std_row(void *ud, const al_csv_row *row)
{
	al_std_run *run = ud;
	unsigned long errs = run->diags.errors, line = row->line;
	const char *lot_name, *std_name;
	size_t ll, sl;
	const al_standard *standard;
	struct row r;
	double titrant = 0;

	if (!run->header_done)
		return std_header(run, row);
	if (!run->header_ok)
		return AL_OK;
	run->rows++;
	if (row->syntax_error) {
		ERR(run, line, NULL, "%s", row->syntax_error);
		return AL_OK;
	}
	if (row->nfields != run->header_fields) {
		ERR(run, line, NULL, "%zu fields where the header has %zu",
		    row->nfields, run->header_fields);
		return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
	}
	memset(&r, 0, sizeof r);
	lot_name = al_cell(row, run->col[S_LOT], &ll);
	if (al_text_identifier(lot_name, ll, &run->ident, &run->ident_cap,
			       &ll) != AL_OK)
		return AL_ENOMEM;
	lot_name = run->ident;
	if (ll == 0)
		ERR(run, line, "titrant_lot", "is empty");
	else if (ll > AL_IDENT_MAX)
		ERR(run, line, "titrant_lot", "is longer than %d bytes",
		    AL_IDENT_MAX);
	std_name = al_cell(row, run->col[S_STANDARD], &sl);
	{
		char buf[64];

		snprintf(buf, sizeof buf, "%.*s", (int)sl, std_name);
		standard = al_catalogue_find_standard(run->cat,
						      sl ? buf : "KHP");
		if (standard == NULL)
			ERR(run, line, "standard",
			    "'%s' is not a known primary standard (KHP, "
			    "sulfamic, benzoic)",
			    buf);
	}
	std_cells(run, row, standard, &r, &titrant);
	if (run->diags.out_of_memory)
		return AL_ENOMEM;
	if (run->diags.errors != errs)
		return AL_OK;
	r.c = al_std_concentration(r.mass, r.purity, standard->molar_mass,
				   r.volume);
	if (!al_number_computable(r.mass) || !al_number_computable(titrant) ||
	    !al_number_computable(r.volume) || !al_number_computable(r.c) ||
	    r.c == 0) {
		ERR(run, line, !al_number_computable(r.mass) ? "mass_g"
							     : "titrant_ml",
		    "the concentration (%g g / %g mL) is beyond the range it "
		    "can be computed in (%g to %g)",
		    r.mass, r.volume, AL_MAGNITUDE_MIN, AL_MAGNITUDE_MAX);
		return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
	}
	/* what no titration of a primary standard can be: a net volume
	 * below a burette's smallest reading, a mass below a balance's, a
	 * titrant stronger than NaOH dissolves (about 19 mol/L; common
	 * practice). Their uncertainty would not be a number either. */
	if (r.volume < STD_VOLUME_MIN_ML || r.mass < STD_MASS_MIN_G ||
	    r.c > STD_CONC_MAX) {
		ERR(run, line, r.volume < STD_VOLUME_MIN_ML ? "titrant_ml" : "mass_g",
		    "%g g over %g mL is no titration of a primary standard "
		    "(at least %g mL and %g g, at most %g mol/L)",
		    r.mass, r.volume, STD_VOLUME_MIN_ML, STD_MASS_MIN_G,
		    STD_CONC_MAX);
		return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
	}
	if (r.c < AL_PLAUSIBLE_CONC_MIN || r.c > AL_PLAUSIBLE_CONC_MAX)
		WARN(run, line, "mass_g",
		     "%g mol/L is outside the usual %g-%g mol/L of a "
		     "titrant: check the mass (g) and the volume (mL)",
		     r.c, AL_PLAUSIBLE_CONC_MIN, AL_PLAUSIBLE_CONC_MAX);
	return file_row(run, lot_name, ll, standard, line, &r);
}

al_status
al_std_read(al_std_run *run, FILE *in, const char *name,
	    const al_csv_options *csv)
{
	return al_std_read_source(run, al_read_stdio, in, name, csv);
}

int
al_std_is_column(const char *name)
{
	return al_name_index(std_cols, 7, name) >= 0;
}

void
al_std_set_columns(al_std_run *run, const al_column_alias *aliases, size_t n)
{
	run->aliases = aliases;
	run->n_aliases = n;
}

al_status
al_std_read_source(al_std_run *run, al_read_fn read_fn, void *ctx,
		   const char *name, const al_csv_options *csv)
{
	char **files = al_realloc(run->files, (run->n_files + 1) * sizeof *files);
	al_status st;

	if (files == NULL)
		return AL_ENOMEM;
	run->files = files;
	run->files[run->n_files] = al_strdup(name);
	if (run->files[run->n_files] == NULL)
		return AL_ENOMEM;
	run->file = run->files[run->n_files++];
	run->header_done = run->header_ok = 0;
	run->rows = 0;
	run->point = csv && csv->decimal_point ? csv->decimal_point : '.';
	st = al_csv_read(csv, read_fn, ctx, run->file, std_row, run,
			 &run->diags);
	if (st == AL_OK && !run->header_done) {
		ERR(run, 0, NULL, "the file is empty (no header row)");
		st = AL_EINPUT;
	} else if (st == AL_OK && !run->header_ok)
		st = AL_EINPUT;
	else if (st == AL_OK && run->rows == 0) {
		/* a header alone: no register replaced by nothing */
		ERR(run, 0, NULL, "no titrations");
		st = AL_EINPUT;
	}
	if (run->diags.out_of_memory)
		st = AL_ENOMEM;
	return st;
}

al_status
al_std_finish(al_std_run *run)
{
	run->results = al_calloc(run->n_lots ? run->n_lots : 1,
				 sizeof *run->results);
	if (run->results == NULL)
		return AL_ENOMEM;
	for (size_t i = 0; i < run->n_lots; i++) {
		const struct lot *lot = &run->lots[i];
		al_std_lot *res = &run->results[i];
		double c[lot->n > 0 ? lot->n : 1];
		double m = 0, v = 0, purity = 0, u_vcal, u_vtemp;
		al_std_inputs in;

		res->lot = lot->name;
		res->standard = lot->standard;
		res->n = lot->n;
		res->first_line = lot->first_line;
		res->file = lot->file;
		res->date = lot->rows[0].date;
		for (size_t j = 0; j < lot->n; j++) {
			c[j] = lot->rows[j].c;
			m += lot->rows[j].mass / (double)lot->n;
			v += lot->rows[j].volume / (double)lot->n;
			purity += lot->rows[j].purity / (double)lot->n;
			if (lot->rows[j].date > res->date)
				res->date = lot->rows[j].date;
		}
		res->mean = gsl_stats_mean(c, 1, lot->n);
		if (lot->n >= 2) {
			res->has_sd = 1;
			res->sd = gsl_stats_sd_m(c, 1, lot->n, res->mean);
			res->rsd_pct = 100 * res->sd / res->mean;
		}
		/* the budget of a typical titration (mean mass and volume),
		 * and the repeatability of the mean, s / sqrt(n) */
		in.mass_g = m;
		in.u_mass_g =
			sqrt(2.0) * al_gum_rectangular(run->p.balance_linearity_g);
		in.purity = purity;
		in.u_purity = lot->standard->purity_u;
		in.molar_mass = lot->standard->molar_mass;
		in.u_molar_mass = lot->standard->molar_mass_u;
		in.volume_ml = v;
		u_vcal = al_gum_triangular(run->p.burette_tol_ml);
		/* QUAM A2: the +/- range is a 95 % interval of a normal */
		u_vtemp = v * run->p.expansion_per_k * run->p.temp_range_c /
			  1.96;
		in.u_volume_ml = u_vcal;
		in.u_volume_temp_ml = u_vtemp;
		if (run->p.repeatability_rsd_pct > 0)
			in.rep_rel = run->p.repeatability_rsd_pct / 100 /
				     sqrt((double)lot->n);
		else
			in.rep_rel = res->has_sd ? res->sd /
							   sqrt((double)lot->n) /
							   res->mean
						 : 0;
		al_std_uncertainty(&in, &res->budget);
		/* the budget's c is that of the mean inputs; report the mean
		 * of the replicates, with the budget's relative uncertainty */
		res->budget.u = res->budget.rel_u * res->mean;
		res->U = run->p.k * res->budget.u;
		res->valid = 1;
		if (lot->n < run->p.min_n) {
			res->valid = 0;
			snprintf(res->why, sizeof res->why,
				 "%zu replicate%s, at least %zu needed", lot->n,
				 lot->n == 1 ? "" : "s", run->p.min_n);
		} else if (res->has_sd && res->rsd_pct > run->p.max_rsd_pct) {
			res->valid = 0;
			snprintf(res->why, sizeof res->why,
				 "RSD %.3f %% above the %.3g %% accepted",
				 res->rsd_pct, run->p.max_rsd_pct);
		}
	}
	return AL_OK;
}

void
al_std_free(al_std_run *run)
{
	if (run == NULL)
		return;
	al_free_all((void *const *)run->files, run->n_files);
	al_diags_clear(&run->diags);
	for (size_t i = 0; i < run->n_lots; i++)
		AL_FREE_ALL(run->lots[i].name, run->lots[i].rows);
	AL_FREE_ALL(run->files, run->ident, run->lots, run->results, run);
}
