/* acidlot: header mapping and cell conversion shared by every CSV table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/table.h"

#include <ctype.h>
#include <stdio.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/number.h"

static int
strncasecmp_ascii(const char *a, const char *b, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		int x = tolower((unsigned char)a[i]), y = tolower((unsigned char)b[i]);

		if (x != y)
			return x - y;
		if (x == 0)
			return 0;
	}
	return 0;
}

/* The column name a header cell stands for: names[k], directly or
 * through an alias; -1 when unknown. */
static int
header_column(const char *h, size_t len, const char *const *names,
	      size_t n_names, const al_column_alias *aliases, size_t n_aliases)
{
	for (size_t a = 0; a < n_aliases; a++) {
		size_t al = strlen(aliases[a].header);
		const char *ah = al_trim(aliases[a].header, &al);

		if (al == len && al > 0 &&
		    strncasecmp_ascii(h, ah, len) == 0)
			for (size_t k = 0; k < n_names; k++)
				if (strcmp(names[k], aliases[a].name) == 0)
					return (int)k;
	}
	for (size_t k = 0; k < n_names; k++)
		if (al_word_eq(h, len, names[k]))
			return (int)k;
	return -1;
}

/* reference/header_words.csv, built in: words of bench sheets in
 * English, German, French and Spanish, and what each stands for. */
extern const unsigned char al_ref_header_words[];
extern const size_t al_ref_header_words_len;

/* What a lower-case word of a header stands for in our column names
 * ("einwaage" -> "mass"; "-" for a word dropped beside others), or the
 * word itself. */
static const char *
word_means(const char *word, char *buf, size_t cap)
{
	const char *p = (const char *)al_ref_header_words,
		   *end = p + al_ref_header_words_len;
	size_t wl = strlen(word);

	while (p < end) {
		const char *nl = memchr(p, '\n', (size_t)(end - p));
		const char *line_end = nl ? nl : end;

		if ((size_t)(line_end - p) > wl && memcmp(p, word, wl) == 0 &&
		    p[wl] == ',') {
			const char *m = p + wl + 1;
			size_t ml = strcspn(m, ",\n");

			snprintf(buf, cap, "%.*s", (int)ml, m);
			return buf;
		}
		p = line_end + 1;
	}
	return word;
}

/* A header's common form: lower case, words joined by '_' through
 * header_words.csv (a word said again is said once), a unit in brackets
 * appended the same way, e.g. "Blank (mL)" -> "blank_ml", "NaOH
 * (mol/L)" -> "titrant_mol_l", "Einwaage (g)" -> "mass_g". Words that
 * stand for "-" ("sample" in "Sample Mass") are left out, and so is
 * "volume" beside the titrant ("Titrant Volume"); when nothing else is
 * left, the first word stays as written ("Sample ID" -> "sample"). */
static void
common_form(const char *h, size_t len, char *out, size_t cap)
{
	char words[8][32], first[32] = "";
	size_t nw = 0, n = 0, i = 0, kept = 0;
	int titrant = 0;

	while (i < len && nw < 8) {
		char word[32], means[32];
		size_t w = 0;

		while (i < len && !isalnum((unsigned char)h[i]) && h[i] != '%' &&
		       h[i] != '/')
			i++;
		while (i < len && w + 1 < sizeof word &&
		       (isalnum((unsigned char)h[i]) || h[i] == '%' ||
			h[i] == '/'))
			word[w++] = (char)tolower((unsigned char)h[i++]);
		word[w] = '\0';
		if (w == 0)
			break;
		if (nw == 0)
			snprintf(first, sizeof first, "%s", word);
		snprintf(words[nw], sizeof words[nw], "%s",
			 word_means(word, means, sizeof means));
		nw++;
	}
	for (size_t k = 0; k < nw; k++)
		titrant |= strcmp(words[k], "titrant") == 0;
	for (size_t k = 0; k < nw; k++)
		kept += strcmp(words[k], "-") != 0 &&
			!(titrant && strcmp(words[k], "volume") == 0);
	out[0] = '\0';
	if (kept == 0 && nw > 0) {
		snprintf(out, cap, "%s", first);
		return;
	}
	for (size_t k = 0, last = nw; k < nw && n + 1 < cap; k++) {
		int drop = strcmp(words[k], "-") == 0 ||
			   (titrant && strcmp(words[k], "volume") == 0);

		if ((drop && kept > 0) ||
		    (last < nw && strcmp(words[k], words[last]) == 0))
			continue;
		n += (size_t)snprintf(out + n, cap - n, "%s%s", n ? "_" : "",
				      words[k]);
		last = k;
	}
}

/* The known column a header names in a common form, or -1: its common
 * form is the name, or the name without its unit ("Blank" ->
 * blank_ml), or the name with "titrant_" before it. */
static int
known_quantity(const char *h, size_t len, const char *const *names,
	       size_t n_names)
{
	char form[128];

	common_form(h, len, form, sizeof form);
	if (form[0] == '\0')
		return -1;
	for (size_t k = 0; k < n_names; k++) {
		const char *unit = strrchr(names[k], '_');
		size_t base = unit ? (size_t)(unit - names[k]) : strlen(names[k]);

		if (strcmp(form, names[k]) == 0 ||
		    (strlen(form) == base && strncmp(form, names[k], base) == 0))
			return (int)k;
	}
	return -1;
}

/* The same header, as header_column matches them. */
static int
same_header(const char *a, const char *b)
{
	size_t al = strlen(a), bl = strlen(b);

	a = al_trim(a, &al);
	b = al_trim(b, &bl);
	return al == bl && strncasecmp_ascii(a, b, al) == 0;
}

/* Alias k (of the rest) whose name one of the first n_first has. */
static int
overridden(const al_column_alias *aliases, size_t n_first, size_t k)
{
	for (size_t i = 0; k >= n_first && i < n_first; i++)
		if (strcmp(aliases[i].name, aliases[k].name) == 0)
			return 1;
	return 0;
}

al_alias_conflict
al_column_aliases_check(const al_column_alias *aliases, size_t n,
			size_t n_first, size_t *i, size_t *j)
{
	for (*i = 0; *i < n; (*i)++)
		for (*j = *i + 1; *j < n; (*j)++) {
			int same_name = strcmp(aliases[*i].name,
					       aliases[*j].name) == 0;

			if (same_name && !(*i < n_first && *j >= n_first))
				return AL_ALIAS_NAME_TWICE;
			if (!same_name && !overridden(aliases, n_first, *i) &&
			    !overridden(aliases, n_first, *j) &&
			    same_header(aliases[*i].header, aliases[*j].header))
				return AL_ALIAS_HEADER_TWICE;
		}
	return AL_ALIAS_OK;
}

al_status
al_header_map(al_unknown_columns mode, const al_csv_row *header,
	      const char *const *names,
	      size_t n_names, const al_column_alias *aliases,
	      size_t n_aliases, int *index, const char *file, al_diags *diags,
	      const char *option)
{
	char unknown[512], all[1024];
	size_t ulen = 0, n_unknown = 0, alen = 0, n_named = 0;
	al_status st = AL_OK;

	unknown[0] = all[0] = '\0';
	for (size_t k = 0; k < n_names; k++)
		index[k] = -1;
	for (size_t i = 0; i < header->nfields; i++) {
		size_t len = header->lens[i];
		const char *h = al_trim(header->fields[i], &len);
		int k = header_column(h, len, names, n_names, aliases,
				      n_aliases);

		if (k >= 0) {
			if (index[k] >= 0) {
				al_diags_add(diags, AL_SEV_ERROR, file,
					     header->line, names[k],
					     "column given twice (fields %d "
					     "and %zu)",
					     index[k] + 1, i + 1);
				st = AL_EINPUT;
			} else
				index[k] = (int)i;
		} else if ((k = known_quantity(h, len, names, n_names)) >= 0) {
			if (option)
				al_diags_add(diags, AL_SEV_ERROR, file,
					     header->line, NULL,
					     "column '%.*s' looks like %s: map "
					     "it with %s %s=\"%.*s\"",
					     (int)len, h, names[k], option,
					     names[k], (int)len, h);
			else
				al_diags_add(diags, AL_SEV_ERROR, file,
					     header->line, NULL,
					     "column '%.*s' looks like %s: name "
					     "it '%s'",
					     (int)len, h, names[k], names[k]);
			st = AL_EINPUT;
			if (index[k] == -1)
				index[k] = AL_COLUMN_NAMED;
			if (alen < sizeof all)
				alen += (size_t)snprintf(all + alen,
							 sizeof all - alen,
							 " %s %s=\"%.*s\"",
							 option ? option : "",
							 names[k], (int)len, h);
			n_named++;
		} else if (mode == AL_UNKNOWN_ERROR) {
			const char *near = al_closest(h, len, names, n_names);

			al_diags_add(diags, AL_SEV_ERROR, file, header->line,
				     NULL, "unknown column '%.*s'%s%s%s",
				     (int)len, h, near ? " (did you mean '" : "",
				     near ? near : "", near ? "'?)" : "");
			st = AL_EINPUT;
		} else {
			int w = snprintf(unknown + ulen, sizeof unknown - ulen,
					 "%s'%.*s'", n_unknown ? ", " : "",
					 (int)len, h);
			if (w > 0 && (size_t)w < sizeof unknown - ulen)
				ulen += (size_t)w;
			n_unknown++;
		}
	}
	if (n_named > 1 && option && alen < sizeof all)
		al_diags_add(diags, AL_SEV_WARNING, file, header->line, NULL,
			     "to map them all, add:%s", all);
	if (n_unknown > 0)
		al_diags_add(diags, AL_SEV_WARNING, file, header->line, NULL,
			     "ignoring %zu unknown column%s: %s", n_unknown,
			     n_unknown == 1 ? "" : "s", unknown);
	return st;
}

size_t
al_utf8_seq(const char *str, size_t len)
{
	const unsigned char *s = (const unsigned char *)str;
	unsigned c = len ? s[0] : 0, cp, min;
	size_t n;

	if (len == 0)
		return 0;
	if (c < 0x80)
		return 1;
	if (c >= 0xC2 && c <= 0xDF) {
		n = 1;
		cp = c & 0x1F;
		min = 0x80;
	} else if (c >= 0xE0 && c <= 0xEF) {
		n = 2;
		cp = c & 0x0F;
		min = 0x800;
	} else if (c >= 0xF0 && c <= 0xF4) {
		n = 3;
		cp = c & 0x07;
		min = 0x10000;
	} else
		return 0;
	if (n >= len) /* the continuation bytes run past the end */
		return 0;
	for (size_t k = 1; k <= n; k++) {
		if ((s[k] & 0xC0) != 0x80)
			return 0;
		cp = (cp << 6) | (s[k] & 0x3F);
	}
	if (cp < min || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF))
		return 0;
	return n + 1;
}

int
al_utf8_valid(const char *str, size_t len)
{
	size_t i = 0;

	while (i < len) {
		size_t n = (unsigned char)str[i] < 0x80
				   ? 1
				   : al_utf8_seq(str + i, len - i);

		if (n == 0)
			return 0;
		i += n;
	}
	return 1;
}

const char *
al_cell(const al_csv_row *row, int col, size_t *len)
{
	if (col < 0 || (size_t)col >= row->nfields) {
		*len = 0;
		return "";
	}
	*len = row->lens[col];
	return row->trimmed ? row->fields[col] : al_trim(row->fields[col], len);
}

int
al_cell_number_at(const al_csv_row *row, int col, const char *column,
		  char decimal_point, const char *file, al_diags *diags,
		  double *value)
{
	size_t len;
	const char *s;
	al_numerr err;

	if (col < 0 || (size_t)col >= row->nfields)
		return 0;
	/* al_number_parse trims the cell and tells an empty one */
	err = al_number_parse(row->fields[col], row->lens[col], decimal_point,
			      value);
	if (err == AL_NUM_EMPTY)
		return 0;
	if (err == AL_NUM_OK)
		return 1;
	s = al_cell(row, col, &len);
	al_diags_add(diags, AL_SEV_ERROR, file, row->line, column,
		     "'%.*s' %s", (int)(len > 60 ? 60 : len), s,
		     al_numerr_phrase(err));
	return -1;
}

/* Lower case, without blanks and underscores, for a loose comparison. */
static size_t
loose(const char *s, size_t len, char *out, size_t cap)
{
	size_t n = 0;

	for (size_t i = 0; i < len && n + 1 < cap; i++)
		if (s[i] != ' ' && s[i] != '_' && s[i] != '\t')
			out[n++] = (char)tolower((unsigned char)s[i]);
	out[n] = '\0';
	return n;
}

al_status
al_own_header(const al_csv_row *header, const char *const *names,
	      size_t n_names, const al_column_alias *aliases, size_t n_aliases,
	      int *index, size_t *fields, const char *file, al_diags *diags,
	      const char *option)
{
	al_status st = al_header_map(AL_UNKNOWN_ERROR, header, names, n_names,
				     aliases, n_aliases, index, file, diags,
				     option);

	*fields = header->nfields;
	if (n_aliases > 0 &&
	    al_aliases_present(header, aliases, n_aliases, option, file,
			       diags) != AL_OK)
		st = AL_EINPUT;
	return st;
}

int
al_name_index(const char *const *names, size_t n, const char *name)
{
	for (size_t k = 0; k < n; k++)
		if (strcmp(names[k], name) == 0)
			return (int)k;
	return -1;
}

/* 1 when the header has a cell named name (blanks around either and
 * ASCII case aside). */
static int
header_has(const al_csv_row *header, const char *name)
{
	for (size_t i = 0; i < header->nfields; i++)
		if (same_header(header->fields[i], name))
			return 1;
	return 0;
}

al_status
al_aliases_present(const al_csv_row *header, const al_column_alias *aliases,
		   size_t n, const char *option, const char *file,
		   al_diags *diags)
{
	al_status st = AL_OK;

	for (size_t i = 0; i < n; i++)
		if (!aliases[i].optional &&
		    !header_has(header, aliases[i].header)) {
			al_diags_add(diags, AL_SEV_ERROR, file, header->line,
				     NULL, "%s %s=\"%s\": the file has no "
				     "column '%s'",
				     option, aliases[i].name,
				     aliases[i].header, aliases[i].header);
			st = AL_EINPUT;
		}
	return st;
}

const char *
al_header_closest(const al_csv_row *header, const char *name)
{
	char want[64], cand[64];
	size_t lw = loose(name, strlen(name), want, sizeof want);
	size_t best = (size_t)-1;
	const char *pick = NULL;

	for (size_t i = 0; i < header->nfields; i++) {
		size_t lc = loose(header->fields[i], header->lens[i], cand,
				  sizeof cand);
		size_t d;

		if (lc == 0)
			continue;
		d = al_edit_distance(want, lw, cand, lc);
		/* a prefix such as "titrant" for "titrant_ml" counts as close */
		if (lc >= 4 && (strncmp(want, cand, lc) == 0 ||
				strncmp(cand, want, lw) == 0))
			d = d < 2 ? d : 2;
		if (d < best) {
			best = d;
			pick = header->fields[i];
		}
	}
	return best <= (lw > 6 ? 3 : 2) ? pick : NULL;
}

struct alias_reader {
	const char *file;
	al_diags *diags;
	int col[2];
	int header_done, bad;
	al_column_alias *items;
	size_t n;
};

static al_status
alias_row(void *ud, const al_csv_row *row)
{
	static const char *const names[2] = {"name", "header"};
	struct alias_reader *r = ud;
	size_t ln, lh;
	const char *name, *hdr;
	al_column_alias *grown;

	if (!r->header_done) {
		r->header_done = 1;
		if (al_header_map(AL_UNKNOWN_WARN, row, names, 2, NULL, 0, r->col, r->file,
				  r->diags, NULL) != AL_OK ||
		    r->col[0] < 0 || r->col[1] < 0) {
			al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line,
				     NULL, "a column map needs the columns "
					   "'name' and 'header'");
			r->bad = 1;
		}
		return r->diags->out_of_memory ? AL_ENOMEM : AL_OK;
	}
	if (r->bad)
		return AL_OK;
	name = al_cell(row, r->col[0], &ln);
	hdr = al_cell(row, r->col[1], &lh);
	if (ln == 0 || lh == 0) {
		al_diags_add(r->diags, AL_SEV_ERROR, r->file, row->line, NULL,
			     "a mapping needs both a name and a header");
		r->bad = 1;
		return r->diags->out_of_memory ? AL_ENOMEM : AL_OK;
	}
	grown = al_realloc(r->items, (r->n + 1) * sizeof *grown);
	if (grown == NULL)
		return AL_ENOMEM;
	r->items = grown;
	r->items[r->n].name = al_strndup(name, ln);
	r->items[r->n].header = al_strndup(hdr, lh);
	r->n++;
	if (!r->items[r->n - 1].name || !r->items[r->n - 1].header)
		return AL_ENOMEM;
	return AL_OK;
}

al_status
al_column_aliases_read(FILE *in, const char *file, al_column_alias **aliases,
		       size_t *n, al_diags *diags)
{
	struct alias_reader r;
	al_status st;

	memset(&r, 0, sizeof r);
	r.file = file;
	r.diags = diags;
	st = al_csv_read_file(NULL, in, file, alias_row, &r, diags);
	if (st == AL_OK && !r.header_done)
		al_diags_add(diags, AL_SEV_ERROR, file, 0, NULL,
			     "the column map is empty");
	if (st == AL_OK && (r.bad || !r.header_done))
		st = AL_EINPUT;
	if (st != AL_OK) {
		al_column_aliases_free(r.items, r.n);
		return st;
	}
	*aliases = r.items;
	*n = r.n;
	return AL_OK;
}

void
al_column_aliases_free(al_column_alias *aliases, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		al_free((char *)aliases[i].name);
		al_free((char *)aliases[i].header);
	}
	al_free(aliases);
}
