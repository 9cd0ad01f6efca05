/* acidlot: streaming CSV reader over libcsv, with physical line numbers.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * libcsv runs in strict mode (RFC 4180 quoting) with CSV_REPALL_NL, so
 * every unquoted CR or LF reaches the record callback; that is how blank
 * lines are seen and how line numbers stay the physical ones. A CR
 * followed by LF counts as one line end. */
#include "acidlot/csvread.h"

#include <csv.h>
#include <string.h>

#include "acidlot/alloc.h"

#define CHUNK (64 * 1024)

struct reader {
	const al_csv_options *opt;
	size_t max_field;
	const char *name;
	al_csv_row_fn row_fn;
	void *ud;
	al_diags *diags;

	/* the record being assembled */
	char *buf;
	size_t buf_len, buf_cap;
	size_t *offsets, *lens;
	const char **ptrs;
	size_t nfields, fields_cap;

	unsigned long cur_line; /* line on which the next record starts */
	unsigned long extra;    /* line ends inside quoted fields so far */
	int last_term;          /* terminator of the previous record */
	al_status stop;         /* first failure; callbacks do nothing after */
};

const char *
al_trim(const char *s, size_t *len)
{
	size_t n = *len;

	while (n > 0 && (*s == ' ' || *s == '\t')) {
		s++;
		n--;
	}
	while (n > 0 && (s[n - 1] == ' ' || s[n - 1] == '\t'))
		n--;
	*len = n;
	return s;
}

int
al_word_eq(const char *s, size_t len, const char *word)
{
	size_t i;

	for (i = 0; i < len; i++) {
		unsigned char a = (unsigned char)s[i], b = (unsigned char)word[i];

		if (b == '\0')
			return 0;
		if (a >= 'A' && a <= 'Z')
			a = (unsigned char)(a - 'A' + 'a');
		if (b >= 'A' && b <= 'Z')
			b = (unsigned char)(b - 'A' + 'a');
		if (a != b)
			return 0;
	}
	return word[len] == '\0';
}

/* Line ends in data[0..n): each CR, and each LF not right after a CR. */
static unsigned long
count_line_ends(const char *data, size_t n, int *prev_cr)
{
	unsigned long count = 0;

	for (size_t i = 0; i < n; i++) {
		if (data[i] == '\r')
			count++;
		else if (data[i] == '\n' && !*prev_cr)
			count++;
		*prev_cr = data[i] == '\r';
	}
	return count;
}

static void
fail(struct reader *r, al_status st, unsigned long line, const char *msg)
{
	if (r->stop != AL_OK)
		return;
	r->stop = st;
	if (st != AL_ENOMEM && msg != NULL &&
	    al_diags_add(r->diags, AL_SEV_ERROR, r->name, line, NULL, "%s",
			 msg) != AL_OK)
		r->stop = AL_ENOMEM;
}

static void
on_field(void *data, size_t len, void *ud)
{
	struct reader *r = ud;
	int prev_cr = 0;

	if (r->stop != AL_OK)
		return;
	if (len > r->max_field) {
		char msg[96];

		snprintf(msg, sizeof msg, "field too long (over %zu bytes)",
			 r->max_field);
		fail(r, AL_ESYNTAX, r->cur_line + r->extra, msg);
		return;
	}
	if (len > 0 && memchr(data, '\0', len) != NULL) {
		fail(r, AL_ESYNTAX, r->cur_line + r->extra,
		     "field contains a NUL byte");
		return;
	}
	if (r->nfields == r->fields_cap) {
		size_t n = r->fields_cap ? 2 * r->fields_cap : 32;
		size_t *off = al_realloc(r->offsets, n * sizeof *off);
		size_t *lens;
		const char **ptrs;

		if (off == NULL) {
			fail(r, AL_ENOMEM, 0, NULL);
			return;
		}
		r->offsets = off;
		lens = al_realloc(r->lens, n * sizeof *lens);
		if (lens == NULL) {
			fail(r, AL_ENOMEM, 0, NULL);
			return;
		}
		r->lens = lens;
		ptrs = al_realloc(r->ptrs, n * sizeof *ptrs);
		if (ptrs == NULL) {
			fail(r, AL_ENOMEM, 0, NULL);
			return;
		}
		r->ptrs = ptrs;
		r->fields_cap = n;
	}
	if (r->buf_len + len + 1 > r->buf_cap) {
		size_t n = r->buf_cap ? r->buf_cap : 1024;
		char *grown;

		while (n < r->buf_len + len + 1)
			n *= 2;
		grown = al_realloc(r->buf, n);
		if (grown == NULL) {
			fail(r, AL_ENOMEM, 0, NULL);
			return;
		}
		r->buf = grown;
		r->buf_cap = n;
	}
	if (len > 0)
		memcpy(r->buf + r->buf_len, data, len);
	r->buf[r->buf_len + len] = '\0';
	r->offsets[r->nfields] = r->buf_len;
	r->lens[r->nfields] = len;
	r->nfields++;
	r->buf_len += len + 1;
	if (len > 0)
		r->extra += count_line_ends(data, len, &prev_cr);
}

static void
on_record(int c, void *ud)
{
	struct reader *r = ud;
	al_csv_row row;
	al_status st;

	if (r->stop != AL_OK)
		return;
	if (r->nfields == 0) {
		/* A blank line, or the LF of a CRLF pair. */
		if (c == '\n' && r->last_term == '\r')
			r->last_term = 0;
		else if (c != -1) {
			r->cur_line++;
			r->last_term = c;
		}
		return;
	}
	for (size_t i = 0; i < r->nfields; i++)
		r->ptrs[i] = r->buf + r->offsets[i];
	row.nfields = r->nfields;
	row.fields = r->ptrs;
	row.lens = r->lens;
	row.line = r->cur_line;
	st = r->row_fn(r->ud, &row);
	if (st != AL_OK && r->stop == AL_OK)
		r->stop = st;
	r->cur_line += r->extra + 1;
	r->extra = 0;
	r->nfields = 0;
	r->buf_len = 0;
	r->last_term = c;
}

static int
is_blank_char(unsigned char c)
{
	return c == CSV_SPACE || c == CSV_TAB;
}

static void
free_reader(struct reader *r)
{
	al_free(r->buf);
	al_free(r->offsets);
	al_free(r->lens);
	al_free(r->ptrs);
}

al_status
al_csv_read(const al_csv_options *opt, al_read_fn read_fn, void *read_ctx,
	    const char *name, al_csv_row_fn row_fn, void *ud, al_diags *diags)
{
	static const al_csv_options defaults = {0};
	struct csv_parser p;
	struct reader r;
	char *chunk = NULL;
	unsigned long raw_lines = 0;
	int prev_cr = 0, first = 1, failed = 0;
	al_status st = AL_OK;

	if (opt == NULL)
		opt = &defaults;
	memset(&r, 0, sizeof r);
	r.opt = opt;
	r.max_field = opt->max_field ? opt->max_field : AL_CSV_MAX_FIELD;
	r.name = name;
	r.row_fn = row_fn;
	r.ud = ud;
	r.diags = diags;
	r.cur_line = 1;

	if (csv_init(&p, CSV_STRICT | CSV_STRICT_FINI | CSV_REPALL_NL |
				 CSV_APPEND_NULL) != 0)
		return AL_ENOMEM;
	csv_set_realloc_func(&p, al_realloc);
	csv_set_free_func(&p, al_free);
	csv_set_space_func(&p, is_blank_char);
	csv_set_delim(&p, (unsigned char)(opt->delimiter ? opt->delimiter : ','));
	csv_set_blk_size(&p, 4096);

	chunk = al_malloc(CHUNK);
	if (chunk == NULL) {
		csv_free(&p);
		return AL_ENOMEM;
	}
	for (;;) {
		size_t n = read_fn(read_ctx, chunk, CHUNK, &failed);
		size_t skip = 0, done;

		if (failed) {
			fail(&r, AL_EIO, 0, NULL);
			break;
		}
		if (n == 0)
			break;
		if (first) {
			/* Gather at least three bytes to look for a BOM. */
			while (n < 3) {
				size_t more = read_fn(read_ctx, chunk + n,
						      CHUNK - n, &failed);
				if (failed || more == 0)
					break;
				n += more;
			}
			if (failed) {
				fail(&r, AL_EIO, 0, NULL);
				break;
			}
			if (n >= 3 && memcmp(chunk, "\xEF\xBB\xBF", 3) == 0)
				skip = 3;
			first = 0;
		}
		done = csv_parse(&p, chunk + skip, n - skip, on_field,
				 on_record, &r);
		if (r.stop != AL_OK)
			break;
		if (done != n - skip) {
			int err = csv_error(&p);

			if (err == CSV_EPARSE) {
				unsigned long line = raw_lines + 1 +
					count_line_ends(chunk + skip, done,
							&prev_cr);
				fail(&r, AL_ESYNTAX, line,
				     "malformed quoting (a quote inside an "
				     "unquoted field, or text after a "
				     "closing quote)");
			} else
				fail(&r, AL_ENOMEM, 0, NULL);
			break;
		}
		raw_lines += count_line_ends(chunk + skip, n - skip, &prev_cr);
	}
	if (r.stop == AL_OK) {
		unsigned long field_line = r.cur_line + r.extra;

		if (csv_fini(&p, on_field, on_record, &r) != 0 &&
		    r.stop == AL_OK) {
			if (csv_error(&p) == CSV_EPARSE)
				fail(&r, AL_ESYNTAX, field_line,
				     "unterminated quoted field (the quote "
				     "opened here is never closed)");
			else
				fail(&r, AL_ENOMEM, 0, NULL);
		}
	}
	st = r.stop;
	csv_free(&p);
	al_free(chunk);
	free_reader(&r);
	return st;
}

static size_t
read_file(void *ctx, void *buf, size_t cap, int *failed)
{
	FILE *in = ctx;
	size_t n = fread(buf, 1, cap, in);

	if (n < cap && ferror(in))
		*failed = 1;
	return n;
}

al_status
al_csv_read_file(const al_csv_options *opt, FILE *in, const char *name,
		 al_csv_row_fn row_fn, void *ud, al_diags *diags)
{
	return al_csv_read(opt, read_file, in, name, row_fn, ud, diags);
}

struct mem_source {
	const char *data;
	size_t len, pos;
};

static size_t
read_mem(void *ctx, void *buf, size_t cap, int *failed)
{
	struct mem_source *m = ctx;
	size_t n = m->len - m->pos;

	(void)failed;
	if (n > cap)
		n = cap;
	memcpy(buf, m->data + m->pos, n);
	m->pos += n;
	return n;
}

al_status
al_csv_read_mem(const al_csv_options *opt, const char *data, size_t len,
		const char *name, al_csv_row_fn row_fn, void *ud,
		al_diags *diags)
{
	struct mem_source m = {data, len, 0};

	return al_csv_read(opt, read_mem, &m, name, row_fn, ud, diags);
}
