/* acidlot: the titrant register.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/register.h"

#include <math.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/csvread.h"
#include "acidlot/date.h"
#include "acidlot/number.h"
#include "acidlot/csvwrite.h"
#include "acidlot/table.h"
#include "acidlot/text.h"
#include "strindex.h"

/* The lots in file order, found by name through a hash index. */
struct al_register {
	al_titrant *items;
	size_t count, cap;
	al_strindex index; /* by lot */
};

/* The index's name of lot i. */
static const char *
lot_of(const void *reg, size_t i)
{
	return ((const al_register *)reg)->items[i].lot;
}

enum { R_LOT, R_STANDARD, R_CONC, R_U, R_N, R_RSD, R_ON, R_UNTIL, R_VALID,
       R_COUNT };
static const char *const reg_cols[R_COUNT] = {
	"titrant_lot", "standard",	  "concentration_mol_l", "u_mol_l",
	"n",	       "rsd_pct",	  "standardised_on",	 "valid_until",
	"valid"};

al_register *
al_register_new(al_status *status)
{
	al_register *reg = al_calloc(1, sizeof *reg);

	*status = reg ? AL_OK : AL_ENOMEM;
	if (reg) {
		reg->index.name = lot_of;
		reg->index.ctx = reg;
	}
	return reg;
}

const al_titrant *
al_register_all(const al_register *reg, size_t *n)
{
	*n = reg ? reg->count : 0;
	return reg ? reg->items : NULL;
}

const al_titrant *
al_register_find(const al_register *reg, const char *lot)
{
	long i = reg ? al_strindex_find(&reg->index, lot) : -1;

	return i >= 0 ? &reg->items[i] : NULL;
}

al_status
al_register_put(al_register *reg, const al_titrant *t)
{
	al_titrant copy = *t, *slot = NULL;
	uint32_t *index_slot;

	copy.lot = al_strdup(t->lot);
	copy.standard = al_strdup(t->standard ? t->standard : "");
	if (copy.lot == NULL || copy.standard == NULL) {
		al_free(copy.lot);
		al_free(copy.standard);
		return AL_ENOMEM;
	}
	if (al_strindex_room(&reg->index, reg->count) != AL_OK) {
		al_free(copy.lot);
		al_free(copy.standard);
		return AL_ENOMEM;
	}
	index_slot = al_strindex_slot(&reg->index, t->lot, strlen(t->lot));
	if (*index_slot)
		slot = &reg->items[*index_slot - 1];
	if (slot) {
		al_free(slot->lot);
		al_free(slot->standard);
		*slot = copy;
		return AL_OK;
	}
	if (reg->count == reg->cap) {
		size_t n = reg->cap ? 2 * reg->cap : 8;
		al_titrant *grown = al_realloc(reg->items, n * sizeof *grown);

		if (grown == NULL) {
			al_free(copy.lot);
			al_free(copy.standard);
			return AL_ENOMEM;
		}
		reg->items = grown;
		reg->cap = n;
	}
	reg->items[reg->count++] = copy;
	*index_slot = (uint32_t)reg->count;
	return AL_OK;
}

struct reader {
	al_register *reg;
	const char *file;
	al_diags *diags;
	int col[R_COUNT];
	int header_done, bad;
	size_t fields;
	char *ident; /* the current row's lot, in NFC */
	size_t ident_cap;
};

static int
date_cell(struct reader *r, const al_csv_row *row, int k, long *days)
{
	size_t len;
	const char *s = al_cell(row, r->col[k], &len);

	if (al_date_parse(s, len, days) == 0)
		return 0;
	al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, reg_cols[k],
		     "'%.*s' is not a calendar date YYYY-MM-DD",
		     (int)(len > 40 ? 40 : len),
		     s);
	return -1;
}

/* The header: every column but rsd_pct is needed. */
static al_status
reg_header(struct reader *r, const al_csv_row *row)
{
	r->header_done = 1;
	if (al_own_header(row, reg_cols, R_COUNT, NULL, 0, r->col, &r->fields,
			  r->file, r->diags, NULL) != AL_OK)
		r->bad = 1;
	for (int k = 0; k < R_COUNT; k++)
		if (r->col[k] < 0 && k != R_RSD) {
			al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
				     NULL, "not a titrant register: no column '%s'",
				     reg_cols[k]);
			r->bad = 1;
		}
	return r->diags->out_of_memory ? AL_ENOMEM : AL_OK;
}

/* A lot's figures, dates and validity into t, each checked (errors to
 * r->diags). */
static void
reg_values(struct reader *r, const al_csv_row *row, al_titrant *t)
{
	size_t len;
	const char *s;
	double n;
	int got;

	if (al_cell_number(row, r->col[R_CONC], "concentration_mol_l", '.',
			   r->file, r->diags, &t->concentration_mol_l) != 1 ||
	    !(t->concentration_mol_l > 0))
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "concentration_mol_l", "needs a concentration above 0");
	if (al_cell_number(row, r->col[R_U], "u_mol_l", '.', r->file, r->diags,
			   &t->u_mol_l) != 1 ||
	    t->u_mol_l < 0)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "u_mol_l", "needs an uncertainty of 0 or more");
	got = al_cell_number(row, r->col[R_N], "n", '.', r->file, r->diags, &n);
	if (got == 0)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, "n",
			     "is empty: the number of titrations is needed");
	else if (got == 1 && n >= 1 && n <= 1000000 && n == floor(n))
		t->n = (size_t)n;
	else if (got == 1)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, "n",
			     "%g is not a whole number from 1 to 1000000", n);
	t->has_rsd = al_cell_number(row, r->col[R_RSD], "rsd_pct", '.', r->file,
				    r->diags, &t->rsd_pct) == 1;
	if (date_cell(r, row, R_ON, &t->standardised_on) == 0 &&
	    date_cell(r, row, R_UNTIL, &t->valid_until) == 0 &&
	    t->valid_until < t->standardised_on)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "valid_until", "is before standardised_on");
	s = al_cell(row, r->col[R_VALID], &len);
	if (al_word_eq(s, len, "yes"))
		t->valid = 1;
	else if (!al_word_eq(s, len, "no"))
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, "valid",
			     "'%.*s' is neither yes nor no", (int)(len > 20 ? 20 : len),
			     s);
}

static al_status
reg_row(void *ud, const al_csv_row *row)
{
	struct reader *r = ud;
	al_titrant t;
	size_t len;
	const char *s;
	unsigned long errs = r->diags->errors;

	if (!r->header_done)
		return reg_header(r, row);
	if (r->bad)
		return AL_OK;
	if (row->nfields != r->fields) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "%zu fields where the header has %zu", row->nfields,
			     r->fields);
		r->bad = 1;
		return AL_OK;
	}
	memset(&t, 0, sizeof t);
	t.line = row->line;
	reg_values(r, row, &t);
	s = al_cell(row, r->col[R_LOT], &len);
	if (al_text_identifier(s, len, &r->ident, &r->ident_cap, &len) != AL_OK)
		return AL_ENOMEM;
	/* the register is written guarded against formulas: as it was */
	len = al_csv_unguard(r->ident, len);
	r->ident[len] = '\0';
	s = r->ident;
	if (len == 0)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "titrant_lot", "is empty");
	else if (len > AL_IDENT_MAX)
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "titrant_lot", "is longer than %d bytes",
			     AL_IDENT_MAX);
	if (r->diags->out_of_memory)
		return AL_ENOMEM;
	if (r->diags->errors != errs) {
		r->bad = 1;
		return AL_OK;
	}
	t.lot = al_strndup(s, len);
	s = al_cell(row, r->col[R_STANDARD], &len);
	t.standard = al_strndup(s, len);
	if (t.standard)
		t.standard[al_csv_unguard(t.standard, strlen(t.standard))] = '\0';
	if (t.lot && t.standard && al_register_find(r->reg, t.lot)) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
			     "titrant_lot", "'%s' is listed twice", t.lot);
		r->bad = 1;
	} else if (t.lot && t.standard &&
		   al_register_put(r->reg, &t) != AL_OK) {
		al_free(t.lot);
		al_free(t.standard);
		return AL_ENOMEM;
	}
	al_free(t.lot);
	al_free(t.standard);
	return t.lot && t.standard ? AL_OK : AL_ENOMEM;
}

al_register *
al_register_read(FILE *in, const char *name, al_status *status,
		 al_diags *diags)
{
	struct reader r = {.file = name, .diags = diags};
	al_status st;

	r.reg = al_register_new(status);
	if (r.reg == NULL)
		return NULL;
	st = al_csv_read_file(NULL, in, name, reg_row, &r, diags);
	al_free(r.ident);
	if (st == AL_OK && (r.bad || diags->out_of_memory))
		st = diags->out_of_memory ? AL_ENOMEM : AL_EINPUT;
	if (st != AL_OK) {
		al_register_free(r.reg);
		*status = st;
		return NULL;
	}
	*status = AL_OK;
	return r.reg;
}

al_status
al_register_write(FILE *out, const al_register *reg)
{
	fputs("titrant_lot,standard,concentration_mol_l,u_mol_l,n,rsd_pct,"
	      "standardised_on,valid_until,valid\n",
	      out);
	for (size_t i = 0; i < reg->count; i++) {
		const al_titrant *t = &reg->items[i];
		char num[128], on[11], until[11];

		al_csv_put_field(out, t->lot, ',');
		putc(',', out);
		al_csv_put_field(out, t->standard, ',');
		/* enough digits that the value read back is the value kept */
		al_format_sig(t->concentration_mol_l, 10, num, sizeof num);
		fprintf(out, ",%s", num);
		al_format_sig(t->u_mol_l, 3, num, sizeof num);
		fprintf(out, ",%s,%zu,", num, t->n);
		if (t->has_rsd) {
			al_format_sig(t->rsd_pct, 4, num, sizeof num);
			fputs(num, out);
		}
		al_date_format(t->standardised_on, on);
		al_date_format(t->valid_until, until);
		fprintf(out, ",%s,%s,%s\n", on, until, t->valid ? "yes" : "no");
	}
	return ferror(out) ? AL_EIO : AL_OK;
}

void
al_register_free(al_register *reg)
{
	if (reg == NULL)
		return;
	for (al_titrant *t = reg->items; t < reg->items + reg->count; t++)
		AL_FREE_ALL(t->lot, t->standard);
	al_strindex_free(&reg->index);
	AL_FREE_ALL(reg->items, reg);
}
