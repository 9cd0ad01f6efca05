/* acidlot: titration rows: header, cells, value (see rows.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "rows.h"

#include <math.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/columns.h"
#include "acidlot/date.h"
#include "acidlot/juice.h"
#include "acidlot/number.h"
#include "acidlot/table.h"
#include "acidlot/text.h"

static const char *const cols[AL_C_COUNT] = {
	"sample",	 "titrant_ml", "mass_g",    "volume_ml",  "product",
	"lot",		 "replicate",  "blank_ml",  "titrant_mol_l",
	"made_up_ml",	 "aliquot_ml", "acid",	    "density_g_ml",
	"endpoint_ph",	 "titrant_lot", "date",	    "brix",	  "water_pct",
	"curve",	 "mode",	"readings", "curve_flags",
	/* a curve file's (curves.c), named here for the messages that map
	 * a header: such a file's readings never reach these rows */
	"ph",		 "start_ml"};

/* The required columns: sample, titrant_ml, and mass_g or volume_ml;
 * each one missing is an error listing the file's header and the
 * closest cell. 1 when all are there. */
static int
required_columns(al_rows *rs, const al_csv_row *row)
{
	char have[512];
	size_t hl = 0;
	int ok = 1;

	have[0] = '\0';
	for (size_t i = 0; i < row->nfields && hl < sizeof have; i++) {
		int w = snprintf(have + hl, sizeof have - hl, "%s%s",
				 i ? ", " : "", row->fields[i]);
		if (w > 0)
			hl += (size_t)w;
	}
	for (int k = AL_C_SAMPLE; k <= AL_C_TITRANT; k++) {
		const char *near;

		if (rs->col[k] >= 0 || rs->col[k] == AL_COLUMN_NAMED)
			continue; /* there, or named already with its --column */
		near = al_header_closest(row, cols[k]);
		if (near)
			AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
				 "missing required column '%s' (the file has: "
				 "%s); did you mean '%s'? map it with --column "
				 "%s=\"%s\"",
				 cols[k], have, near, cols[k], near);
		else
			AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
				 "missing required column '%s' (the file has: "
				 "%s)",
				 cols[k], have);
		ok = 0;
	}
	if (rs->col[AL_C_MASS] == -1 && rs->col[AL_C_VOLUME] == -1) {
		const char *near = al_header_closest(row, "mass_g");
		const char *which = "mass_g";

		if (near == NULL) {
			near = al_header_closest(row, "volume_ml");
			which = "volume_ml";
		}
		if (near)
			AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
				 "needs a 'mass_g' or a 'volume_ml' column (the "
				 "file has: %s); did you mean '%s'? map it with "
				 "--column %s=\"%s\"",
				 have, near, which, near);
		else
			AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
				 "needs a 'mass_g' or a 'volume_ml' column (the "
				 "file has: %s)",
				 have);
		ok = 0;
	}
	return ok;
}

al_status
al_rows_header(al_rows *rs, const al_csv_row *row)
{
	int ok = 1;

	rs->header_done = 1;
	rs->header_fields = row->nfields;
	if (row->nfields == 1 && rs->opt->csv.delimiter != AL_CSV_AUTO &&
	    (memchr(row->fields[0], ';', row->lens[0]) ||
	     memchr(row->fields[0], '\t', row->lens[0]))) {
		int semi = memchr(row->fields[0], ';', row->lens[0]) != NULL;

		/* the one message that helps: column errors would only
		 * repeat the whole line */
		AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
			 "the header is one field holding %s: the file is "
			 "delimited by %s; try --delimiter %s (or --delimiter "
			 "auto)",
			 semi ? "';'" : "tabs", semi ? "';'" : "tabs",
			 semi ? "';'" : "tab");
		rs->header_ok = 0;
		return rs->diags->out_of_memory ? AL_ENOMEM : AL_EINPUT;
	}
	{
		size_t need = 0, pos = 0;

		for (size_t i = 0; i < row->nfields; i++)
			need += row->lens[i] + 1;
		al_free(rs->header_text);
		rs->header_text = al_malloc(need + 1);
		if (rs->header_text == NULL)
			return AL_ENOMEM;
		for (size_t i = 0; i < row->nfields; i++) {
			size_t len = row->lens[i];
			const char *h = al_trim(row->fields[i], &len);

			memcpy(rs->header_text + pos, h, len);
			rs->header_text[pos + len] = '\0';
			pos += len + 1;
		}
	}
	if (al_header_map(AL_UNKNOWN_WARN, row, cols, AL_C_COUNT, rs->opt->aliases,
			  rs->opt->n_aliases, rs->col, rs->file,
			  rs->diags, "--column") != AL_OK)
		ok = 0;
	if (al_aliases_present(row, rs->opt->aliases, rs->opt->n_aliases,
			       "--column", rs->file, rs->diags) != AL_OK)
		ok = 0;
	if (!required_columns(rs, row))
		ok = 0;
	/* pH readings without a curve column: not a curve file, and the
	 * readings would be lost in silence */
	if (rs->col[AL_C_PH] >= 0 || rs->col[AL_C_START] >= 0)
		AL_RUN_DIAG(rs, AL_SEV_WARNING, row->line, NULL,
			    "ignoring column '%s': pH readings are read from "
			    "a curve file, with a curve column (see '"
			    "acidlot endpoint --help'); a titration's endpoint "
			    "pH is endpoint_ph",
			    rs->col[AL_C_PH] >= 0 ? "ph" : "start_ml");
	if ((rs->col[AL_C_MADE_UP] < 0) != (rs->col[AL_C_ALIQUOT] < 0)) {
		AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
			"'made_up_ml' and 'aliquot_ml' go together: the file "
			"has only '%s'",
			rs->col[AL_C_MADE_UP] < 0 ? "aliquot_ml" : "made_up_ml");
		ok = 0;
	}
	if (rs->point == ',' && row->delimiter == ',') {
		AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
			 "the file is delimited by ',', which cannot go with "
			 "--decimal-comma");
		ok = 0;
	}
	if (rs->col[AL_C_CONC] == -1 && !rs->opt->has_titrant &&
	    !(rs->opt->titrants && rs->col[AL_C_TITRANT_LOT] >= 0)) {
		AL_RUN_DIAG(rs, AL_SEV_ERROR, row->line, NULL,
			"no titrant concentration: add a 'titrant_mol_l' "
			"column or give --titrant-mol-l");
		ok = 0;
	}
	rs->header_ok = ok;
	return rs->diags->out_of_memory ? AL_ENOMEM : (ok ? AL_OK : AL_EINPUT);
}

/* 1 when a row holds the same names as the header, ignoring case. */
static int
repeats_header(const al_rows *rs, const al_csv_row *row)
{
	if (rs->header_text == NULL)
		return 0;
	for (size_t i = 0, pos = 0; i < row->nfields; i++) {
		size_t len = row->lens[i], hl = strlen(rs->header_text + pos);
		const char *cell = al_trim(row->fields[i], &len);
		const char *h = rs->header_text + pos;

		if (!al_word_eq(cell, len, h) || (len == 0 && hl == 0))
			return 0;
		pos += hl + 1;
	}
	return 1;
}

static int
row_is_empty(const al_csv_row *row)
{
	for (size_t i = 0; i < row->nfields; i++) {
		size_t len = row->lens[i];

		al_trim(row->fields[i], &len);
		if (len)
			return 0;
	}
	return 1;
}

/* A numeric cell, or the option's default. Returns 1 set, 0 absent,
 * -1 bad (already reported). */
static int
number_or_default(al_rows *rs, const al_csv_row *row, int k, int has_def,
		  double def, double *v)
{
	int got = al_cell_number(row, rs->col[k], cols[k], rs->point,
				 rs->file, &rs->row_diags, v);

	if (got == 0 && has_def) {
		*v = def;
		return 1;
	}
	return got;
}

static const char *
ta_column(al_ta_field f, al_basis basis)
{
	switch (f) {
	case AL_TF_TITRANT:
		return "titrant_ml";
	case AL_TF_BLANK:
		return "blank_ml";
	case AL_TF_CONC:
		return "titrant_mol_l";
	case AL_TF_MADE_UP:
		return "made_up_ml";
	case AL_TF_ALIQUOT:
		return "aliquot_ml";
	case AL_TF_AMOUNT:
		return basis == AL_BASIS_MASS ? "mass_g" : "volume_ml";
	}
	return NULL;
}

/* The text cells of a row, trimmed, as C strings: product, lot, sample,
 * replicate, acid. A cell that ends where its field does is one already
 * (fields are NUL-terminated); the others are copied into the
 * scratch buffer. */
al_status
al_rows_text(al_rows *rs, const al_csv_row *row, const char *out[5],
	   size_t lens[5])
{
	static const int which[5] = {AL_C_PRODUCT, AL_C_LOT, AL_C_SAMPLE, AL_C_REPLICATE,
				     AL_C_ACID};
	size_t need = 0, pos = 0;

	for (int i = 0; i < 5; i++)
		out[i] = al_cell(row, rs->col[which[i]], &lens[i]);
	if (!row->ascii) {
		/* identifiers compare in NFC, trimmed of Unicode blanks */
		for (int i = 0; i < 5; i++) {
			if (al_text_identifier(out[i], lens[i], &rs->ident[i],
					       &rs->ident_cap[i],
					       &lens[i]) != AL_OK)
				return AL_ENOMEM;
			out[i] = rs->ident[i];
		}
		return AL_OK;
	}
	for (int i = 0; i < 5; i++)
		if (out[i][lens[i]] != '\0')
			need += lens[i] + 1;
	if (need == 0)
		return AL_OK;
	{
		char *grown = al_reserve(rs->scratch, &rs->scratch_cap, need);

		if (grown == NULL)
			return AL_ENOMEM;
		rs->scratch = grown;
	}
	for (int i = 0; i < 5; i++) {
		if (out[i][lens[i]] == '\0')
			continue;
		memcpy(rs->scratch + pos, out[i], lens[i]);
		rs->scratch[pos + lens[i]] = '\0';
		out[i] = rs->scratch + pos;
		pos += lens[i] + 1;
	}
	return AL_OK;
}

/* The row's date (a calendar date YYYY-MM-DD, checked whether or not a
 * register uses it), else the day of the run. 0, or -1 after an error. */
static int
row_date(al_rows *rs, const al_csv_row *row, unsigned long line,
	 long *date)
{
	size_t dl;
	const char *text = al_cell(row, rs->col[AL_C_DATE], &dl);

	*date = rs->opt->today;
	if (dl > 0 && al_date_parse_as(text, dl, rs->opt->date_order, date) !=
			      0) {
		AL_ROW_ERR(rs, line, "date",
			"'%.*s' is not a calendar date %s%s",
			(int)(dl > 40 ? 40 : dl), text,
			al_date_order_names[rs->opt->date_order],
			rs->opt->date_order == AL_DATE_ISO
				? " (another order: --date-format)"
				: "");
		return -1;
	}
	return 0;
}

/* 1 when the row has a date cell that is not empty. */
static int
row_has_date(const al_rows *rs, const al_csv_row *row)
{
	size_t dl;

	(void)al_cell(row, rs->col[AL_C_DATE], &dl);
	return dl > 0;
}

/* The register entry of a row's titrant lot, checked for validity on the
 * row's date; NULL when the row names no lot (or after an error). */
static const al_titrant *
titrant_of(al_rows *rs, const al_csv_row *row, unsigned long line,
	   long date)
{
	size_t ll, dl;
	const char *name = al_cell(row, rs->col[AL_C_TITRANT_LOT], &ll);
	char on[11], until[11], when[11], *lot;
	const al_titrant *t;

	if (al_text_identifier(name, ll, &rs->lot, &rs->lot_cap, &ll) !=
	    AL_OK) {
		rs->row_diags.out_of_memory = 1;
		return NULL;
	}
	lot = rs->lot;
	if (ll == 0)
		return NULL;
	if (ll > AL_IDENT_MAX) {
		AL_ROW_ERR(rs, line, "titrant_lot", "is longer than %d bytes",
			AL_IDENT_MAX);
		return NULL;
	}
	t = al_register_find(rs->opt->titrants, lot);
	if (t == NULL) {
		AL_ROW_ERR(rs, line, "titrant_lot",
			"titrant lot '%s' is not in the titrant register", lot);
		return NULL;
	}
	al_date_format(t->standardised_on, on);
	al_date_format(t->valid_until, until);
	al_date_format(date, when);
	if (!t->valid) {
		AL_ROW_ERR(rs, line, "titrant_lot",
			"titrant lot '%s' failed its standardisation of %s: "
			"standardise it again",
			lot, on);
		return NULL;
	}
	(void)al_cell(row, rs->col[AL_C_DATE], &dl);
	if (date > t->valid_until || date < t->standardised_on) {
		AL_ROW_ERR(rs, line, "titrant_lot",
			"titrant lot '%s' is valid from %s to %s, not on %s%s",
			lot, on, until, when, dl ? "" : " (today: the row has no date)");
		return NULL;
	}
	for (size_t i = 0; i < rs->n_lots_used; i++)
		if (rs->lots_used[i] == t)
			return t;
	{
		const al_titrant **grown = al_realloc(
			(void *)rs->lots_used,
			(rs->n_lots_used + 1) * sizeof *grown);

		if (grown == NULL) {
			rs->row_diags.out_of_memory = 1;
			return NULL;
		}
		rs->lots_used = grown;
		rs->lots_used[rs->n_lots_used++] = t;
	}
	return t;
}

/* Every quantity of a titration within the range its arithmetic
 * allows (AL_MAGNITUDE_MAX): the inputs, then what is made of them, each
 * named when it leaves the range; 0 when all are in it. */
static int
out_of_range(al_rows *rs, unsigned long line, const al_titration *t)
{
	const struct {
		const char *name, *what;
		double v;
	} q[] = {
		{ta_column(AL_TF_TITRANT, t->basis), "the titrant volume",
		 t->titrant_ml},
		{ta_column(AL_TF_BLANK, t->basis), "the blank", t->blank_ml},
		{ta_column(AL_TF_CONC, t->basis), "the titrant concentration",
		 t->titrant_mol_l},
		{ta_column(AL_TF_AMOUNT, t->basis), "the sample amount",
		 t->amount},
		{ta_column(AL_TF_MADE_UP, t->basis), "the made-up volume",
		 t->made_up_ml},
		{ta_column(AL_TF_ALIQUOT, t->basis), "the aliquot",
		 t->aliquot_ml},
		{"made_up_ml/aliquot_ml", "the dilution", al_ta_dilution(t)},
		{"titrant_ml", "the meq titrated", al_ta_meq(t)},
		{ta_column(AL_TF_AMOUNT, t->basis), "the meq per unit of sample",
		 al_ta_meq(t) / t->amount},
	};

	for (size_t i = 0; i < sizeof q / sizeof q[0]; i++)
		if (!al_number_computable(q[i].v)) {
			AL_ROW_ERR(rs, line, q[i].name,
				"%s (%g) is beyond the range a result can be "
				"computed in (%g to %g)",
				q[i].what, q[i].v, AL_MAGNITUDE_MIN,
				AL_MAGNITUDE_MAX);
			return 1;
		}
	return 0;
}


int
al_assay_is_column(const char *name)
{
	return al_name_index(cols, AL_C_COUNT, name) >= 0;
}

void
al_rows_init(al_rows *rs, const al_assay_options *opt, al_diags *diags)
{
	memset(rs, 0, sizeof *rs);
	rs->opt = opt;
	rs->diags = diags;
	rs->point = opt->csv.decimal_point ? opt->csv.decimal_point : '.';
	rs->row_diags.cap = 16;
}

void
al_rows_free(al_rows *rs)
{
	al_free_all((void *const *)rs->ident, 5);
	AL_FREE_ALL(rs->lot, rs->scratch, rs->header_text, rs->last_product,
		    (void *)rs->lots_used);
	al_diags_clear(&rs->row_diags);
}

void
al_rows_begin_file(al_rows *rs, const char *file)
{
	rs->file = file;
	rs->header_done = rs->header_ok = 0;
}

int
al_rows_comment(const al_csv_row *row)
{
	size_t len = row->nfields ? row->lens[0] : 0;
	const char *c = len ? al_trim(row->fields[0], &len) : "";

	return len > 0 && c[0] == '#' && (len == 1 || c[1] == ' ');
}

al_row_kind
al_rows_kind(al_rows *rs, const al_csv_row *row)
{
	if (row->syntax_error) {
		AL_ROW_ERR(rs, row->line, NULL, "%s", row->syntax_error);
		return AL_ROW_BAD;
	}
	if (row_is_empty(row))
		return AL_ROW_SKIP; /* a spreadsheet's empty line */
	if (row->nfields != rs->header_fields) {
		AL_ROW_ERR(rs, row->line, NULL,
			   "%zu fields where the header has %zu", row->nfields,
			   rs->header_fields);
		return AL_ROW_BAD;
	}
	if (repeats_header(rs, row)) {
		/* files joined end to end: say so rather than fail every cell */
		AL_RUN_DIAG(rs, AL_SEV_WARNING, row->line, NULL,
			 "this line repeats the header (files joined?); skipped");
		return AL_ROW_SKIP;
	}
	return AL_ROW_DATA;
}

/* The identifiers: valid UTF-8, a sample, none too long. */
static void
check_text(al_rows *rs, const al_csv_row *row, const al_row *r)
{
	static const char *const names[5] = {"product", "lot", "sample",
					     "replicate", "acid"};

	/* a record of ASCII bytes only is UTF-8 throughout */
	for (int i = 0; i < 5 && !row->ascii; i++)
		if (!al_utf8_valid(r->text[i], r->len[i]))
			AL_ROW_ERR(rs, r->line, names[i],
				   "is not valid UTF-8 text (save the file as "
				   "UTF-8)");
	if (r->len[AL_T_SAMPLE] == 0)
		AL_ROW_ERR(rs, r->line, "sample",
			   "is empty: every row needs a sample identifier");
	/* cut, a long identifier could match another's start */
	for (int i = AL_T_PRODUCT; i <= AL_T_REPLICATE; i++)
		if (r->len[i] > AL_IDENT_MAX)
			AL_ROW_ERR(rs, r->line, names[i],
				   "is longer than %d bytes", AL_IDENT_MAX);
}

/* The titrant volume and the sample's mass or volume. */
static void
read_amounts(al_rows *rs, const al_csv_row *row, al_row *r)
{
	double mass = 0, volume = 0;
	int got_mass, got_volume;

	if (number_or_default(rs, row, AL_C_TITRANT, 0, 0,
			      &r->t.titrant_ml) == 0)
		AL_ROW_ERR(rs, r->line, "titrant_ml", "is empty");
	got_mass = number_or_default(rs, row, AL_C_MASS, 0, 0, &mass);
	got_volume = number_or_default(rs, row, AL_C_VOLUME, 0, 0, &volume);
	if (got_mass == 1 && got_volume == 1)
		AL_ROW_ERR(rs, r->line, NULL,
			   "both mass_g and volume_ml are given: a row takes "
			   "exactly one");
	else if (got_mass == 0 && got_volume == 0)
		AL_ROW_ERR(rs, r->line, NULL,
			   "neither mass_g nor volume_ml is given: a row needs "
			   "exactly one");
	r->t.basis = got_volume == 1 ? AL_BASIS_VOLUME : AL_BASIS_MASS;
	r->t.amount = got_volume == 1 ? volume : mass;
}

/* The blank and the titrant's concentration: the row's or the
 * option's, or the register's for the row's titrant lot on its date. */
static void
read_titrant(al_rows *rs, const al_csv_row *row, al_row *r)
{
	const al_assay_options *o = rs->opt;
	const al_titrant *reg;
	long date;
	int got, dated;

	if (number_or_default(rs, row, AL_C_BLANK, o->has_blank, o->blank_ml,
			      &r->t.blank_ml) == 0)
		r->t.blank_ml = 0;
	got = number_or_default(rs, row, AL_C_CONC, o->has_titrant,
				o->titrant_mol_l, &r->t.titrant_mol_l);
	dated = row_date(rs, row, r->line, &date) == 0;
	r->has_date = dated && row_has_date(rs, row);
	r->date = date;
	if (!dated)
		got = 1; /* the row is invalid: no lot looked up on no date */
	else if (o->titrants && rs->col[AL_C_TITRANT_LOT] >= 0) {
		reg = titrant_of(rs, row, r->line, date);
		if (reg) {
			if (got == 1 &&
			    fabs(r->t.titrant_mol_l - reg->concentration_mol_l) >
				    0.001 * reg->concentration_mol_l)
				AL_RUN_DIAG(rs, AL_SEV_WARNING, r->line,
					 "titrant_mol_l",
					 "%g mol/L differs from %g mol/L of "
					 "titrant lot '%s' in the register; the "
					 "register's is used",
					 r->t.titrant_mol_l,
					 reg->concentration_mol_l, reg->lot);
			r->t.titrant_mol_l = reg->concentration_mol_l;
			r->conc_u = reg->u_mol_l;
			got = 1;
		} else if (rs->row_diags.errors > 0)
			got = 1; /* reported by titrant_of */
	}
	if (got == 0) {
		AL_ROW_ERR(rs, r->line, "titrant_mol_l",
			   "is empty and no --titrant-mol-l was given");
		r->t.titrant_mol_l = 1; /* keep checking the rest of the row */
	}
}

/* The curve that gave the volume (a row of acidlot endpoint): its id,
 * mode and the flags of its curve that reach the result. */
static void
read_curve(al_rows *rs, const al_csv_row *row, al_row *r)
{
	size_t len, bad;
	const char *s = al_cell(row, rs->col[AL_C_CURVE_FLAGS], &len);
	unsigned curve = al_curve_flags_parse(s, len, &bad);

	r->curve = al_cell(row, rs->col[AL_C_CURVE], &r->curve_len);
	r->mode = al_cell(row, rs->col[AL_C_MODE], &r->mode_len);
	if (bad < len) {
		size_t n = 0;

		while (bad + n < len && s[bad + n] != ';')
			n++;
		AL_ROW_ERR(rs, r->line, "curve_flags",
			   "'%.*s' is not a curve flag", (int)n, s + bad);
	}
	/* those that reach the result; the others come with no volume,
	 * and the row is rejected for that */
	r->flags |= (curve & AL_CURVE_SPARSE ? AL_FLAG_CURVE_SPARSE : 0) |
		    (curve & AL_CURVE_PH_FALLS ? AL_FLAG_CURVE_FALLS : 0) |
		    (curve & AL_CURVE_NOISY ? AL_FLAG_CURVE_NOISY : 0);
}

/* The dilution, density, endpoint, Brix and water, where given. */
static void
read_extras(al_rows *rs, const al_csv_row *row, al_row *r)
{
	const al_assay_options *o = rs->opt;
	int got;

	if (rs->col[AL_C_MADE_UP] >= 0) {
		int a = number_or_default(rs, row, AL_C_MADE_UP, 0, 0,
					  &r->t.made_up_ml);
		int b = number_or_default(rs, row, AL_C_ALIQUOT, 0, 0,
					  &r->t.aliquot_ml);

		if ((a == 1) != (b == 1) && a >= 0 && b >= 0)
			AL_ROW_ERR(rs, r->line,
				   a == 1 ? "aliquot_ml" : "made_up_ml",
				   "is empty: made_up_ml and aliquot_ml go "
				   "together");
	}
	got = number_or_default(rs, row, AL_C_DENSITY, o->has_density,
				o->density_g_ml, &r->density);
	r->has_density = got == 1;
	if (got == 1 && !(r->density > 0))
		AL_ROW_ERR(rs, r->line, "density_g_ml",
			   "density must be above 0");
	got = number_or_default(rs, row, AL_C_ENDPOINT, o->has_endpoint,
				o->endpoint_ph, &r->endpoint);
	r->has_endpoint = got == 1;
	if (got == 1 && !(r->endpoint >= 0 && r->endpoint <= 14))
		AL_ROW_ERR(rs, r->line, "endpoint_ph",
			   "endpoint pH %g is outside 0 to 14", r->endpoint);
	got = number_or_default(rs, row, AL_C_BRIX, 0, 0, &r->brix);
	r->has_brix = got == 1;
	if (got == 1 && !(r->brix >= 0 && r->brix <= 100))
		AL_ROW_ERR(rs, r->line, "brix", "Brix %g is outside 0 to 100",
			   r->brix);
	got = number_or_default(rs, row, AL_C_WATER, 0, 0, &r->water);
	r->has_water = got == 1;
	if (got == 1 && !(r->water >= 0 && r->water < 100))
		AL_ROW_ERR(rs, r->line, "water_pct",
			   "water %g %% is outside 0 to below 100", r->water);
}

/* The specification of a product, remembering the last one asked: the
 * rows of a product mostly follow each other. One of the small savings
 * that together keep the 1e6-row assay within 1.2 x the time of the
 * build before issue 20 (DEVELOPERS.md, "Speed"). */
static const al_spec *
spec_of(al_rows *rs, const char *product, size_t len)
{
	char *copy;

	if (rs->last_product && rs->last_len == len &&
	    memcmp(rs->last_product, product, len) == 0)
		return rs->last_spec;
	rs->last_spec = al_spec_find(rs->opt->specs, product);
	copy = al_reserve(rs->last_product, &rs->last_cap, len + 1);
	if (copy == NULL) { /* not remembered: asked again next time */
		al_free(rs->last_product);
		rs->last_product = NULL;
		rs->last_cap = 0;
		return rs->last_spec;
	}
	memcpy(copy, product, len + 1);
	rs->last_product = copy;
	rs->last_len = len;
	return rs->last_spec;
}

/* The acid: the specification's, else the row's, else the default; the
 * unit and basis likewise. */
static void
choose_acid(al_rows *rs, al_row *r)
{
	const al_assay_options *o = rs->opt;
	const al_acid *row_acid = NULL;
	const al_spec *spec = spec_of(rs, r->text[AL_T_PRODUCT],
				      r->len[AL_T_PRODUCT]);

	r->spec = spec;
	if (r->len[AL_T_ACID] > 0) {
		row_acid = al_catalogue_find(o->catalogue, r->text[AL_T_ACID]);
		if (row_acid == NULL)
			AL_ROW_ERR(rs, r->line, "acid",
				   "'%s' is not in the acid catalogue (see "
				   "'acidlot acids')",
				   r->text[AL_T_ACID]);
	}
	if (spec && spec->acid) {
		r->acid = spec->acid;
		if (row_acid && row_acid != r->acid)
			r->flags |= AL_FLAG_ACID_IGNORED;
	} else
		r->acid = row_acid ? row_acid : o->default_acid;
	if (spec && spec->has_unit)
		r->unit = spec->unit;
	else if (o->has_unit)
		r->unit = o->unit;
	else
		r->unit = r->t.basis == AL_BASIS_MASS ? AL_UNIT_G_100G
						      : AL_UNIT_G_100ML;
	r->anhydrous = spec && spec->has_basis ? spec->anhydrous : o->anhydrous;
}

al_status
al_rows_names(al_rows *rs, const al_csv_row *row, al_row *r)
{
	memset(r, 0, sizeof *r);
	r->line = row->line;
	r->conc_u = -1;
	if (al_rows_text(rs, row, r->text, r->len) != AL_OK)
		return AL_ENOMEM;
	check_text(rs, row, r);
	return rs->row_diags.out_of_memory ? AL_ENOMEM : AL_OK;
}

al_status
al_rows_values(al_rows *rs, const al_csv_row *row, al_row *r)
{
	read_amounts(rs, row, r);
	read_titrant(rs, row, r);
	read_extras(rs, row, r);
	read_curve(rs, row, r);
	if (rs->row_diags.errors == 0) {
		al_ta_problem probs[8];
		size_t np = al_ta_check(&r->t, probs, 8);

		for (size_t i = 0; i < np && i < 8; i++)
			AL_ROW_ERR(rs, r->line,
				   ta_column(probs[i].field, r->t.basis), "%s",
				   probs[i].message);
		if (np == 0)
			out_of_range(rs, r->line, &r->t);
	}
	choose_acid(rs, r);
	return rs->row_diags.out_of_memory ? AL_ENOMEM : AL_OK;
}

