/* acidlot: streaming CSV reader over libcsv, with physical line numbers.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * libcsv runs in strict mode (RFC 4180 quoting) with CSV_REPALL_NL, so
 * every unquoted CR or LF reaches the record callback; that is how blank
 * lines are seen and how line numbers stay the physical ones. A CR
 * followed by LF counts as one line end. */
#include "acidlot/csvread.h"

#include <csv.h>
#include <stdint.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "csvreader.h"

#define CHUNK (64 * 1024)

/* libcsv's allocator hook has no context, so the cap on its field buffer
 * is per thread, set for the duration of one al_csv_read. */
static _Thread_local size_t hook_limit;
static _Thread_local int hook_refused;

static void *
capped_realloc(void *ptr, size_t size)
{
	if (hook_limit != 0 && size > hook_limit) {
		hook_refused = 1;
		return NULL;
	}
	return al_realloc(ptr, size);
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

void
al_reader_fail(struct reader *r, al_status st, unsigned long line, const char *msg)
{
	if (r->stop != AL_OK)
		return;
	r->stop = st;
	if (st != AL_ENOMEM && msg != NULL &&
	    al_diags_add(r->diags, AL_SEV_ERROR, r->name, line, NULL, "%s",
			 msg) != AL_OK)
		r->stop = AL_ENOMEM;
}

/* A malformed record: stops the reader, or in recover mode marks the
 * record so that it reaches the callback as malformed. */
static void
bad_record(struct reader *r, unsigned long line, const char *msg)
{
	if (!r->opt->recover) {
		al_reader_fail(r, AL_ESYNTAX, line, msg);
		return;
	}
	if (r->record_error[0] == '\0')
		snprintf(r->record_error, sizeof r->record_error, "%s", msg);
}

/* Room for need fields (twice the room there was, at least 32); 0 when
 * memory runs out. */
int
al_reader_grow_fields(struct reader *r, size_t need)
{
	size_t n = r->fields_cap ? 2 * r->fields_cap : 32;
	size_t *off, *lens;
	const char **ptrs;

	if (need <= r->fields_cap)
		return 1;
	if (n < need)
		n = need;
	off = al_realloc(r->offsets, n * sizeof *off);
	if (off == NULL)
		return 0;
	r->offsets = off;
	lens = al_realloc(r->lens, n * sizeof *lens);
	if (lens == NULL)
		return 0;
	r->lens = lens;
	ptrs = al_realloc(r->ptrs, n * sizeof *ptrs);
	if (ptrs == NULL)
		return 0;
	r->ptrs = ptrs;
	r->fields_cap = n;
	return 1;
}

/* Room for need bytes in the record buffer; 0 when memory runs out. */
int
al_reader_grow_buf(struct reader *r, size_t need)
{
	char *grown = al_reserve(r->buf, &r->buf_cap, need);

	if (grown == NULL)
		return 0;
	r->buf = grown;
	return 1;
}

static void
on_field(void *data, size_t len, void *ud)
{
	struct reader *r = ud;
	int prev_cr = 0;

	if (r->stop != AL_OK)
		return;
	/* counted for a malformed record too: the next one's line */
	if (len > 0)
		r->extra += count_line_ends(data, len, &prev_cr);
	if (r->record_error[0])
		return;
	if (len > r->max_field) {
		char msg[96];

		snprintf(msg, sizeof msg, "field too long (over %zu bytes)",
			 r->max_field);
		bad_record(r, r->cur_line + r->extra, msg);
		return;
	}
	if (len > 0 && memchr(data, '\0', len) != NULL) {
		bad_record(r, r->cur_line + r->extra,
			   "field contains a NUL byte");
		return;
	}
	if (r->nfields == AL_CSV_MAX_FIELDS) {
		char msg[96];

		snprintf(msg, sizeof msg, "record has more than %d fields",
			 AL_CSV_MAX_FIELDS);
		bad_record(r, r->cur_line, msg);
		return;
	}
	if (!al_reader_grow_fields(r, r->nfields + 1)) {
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
		return;
	}
	if (!al_reader_grow_buf(r, r->buf_len + len + 1)) {
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
		return;
	}
	if (len > 0)
		memcpy(r->buf + r->buf_len, data, len);
	r->buf[r->buf_len + len] = '\0';
	r->offsets[r->nfields] = r->buf_len;
	r->lens[r->nfields] = len;
	r->nfields++;
	r->buf_len += len + 1;
}

/* Hands a malformed record to the callback (recover mode) and forgets
 * the record; the caller moves the line counter on. */
static void
deliver_bad(struct reader *r, const char *msg)
{
	al_csv_row row;
	char why[160];
	al_status st;

	snprintf(why, sizeof why, "%s", msg);
	memset(&row, 0, sizeof row);
	row.line = r->cur_line;
	row.delimiter = r->delimiter;
	row.raw = r->raw ? r->raw : "";
	row.raw_len = r->raw_len;
	while (row.raw_len > 0 && (row.raw[row.raw_len - 1] == '\n' ||
				   row.raw[row.raw_len - 1] == '\r'))
		row.raw_len--;
	row.syntax_error = why;
	st = r->row_fn(r->ud, &row);
	if (st != AL_OK && r->stop == AL_OK)
		r->stop = st;
	r->nfields = 0;
	r->buf_len = 0;
	r->raw_len = 0;
	r->record_error[0] = '\0';
}

static void
on_record(int c, void *ud)
{
	struct reader *r = ud;
	al_csv_row row;
	al_status st;

	if (r->stop != AL_OK)
		return;
	if (r->record_error[0]) {
		deliver_bad(r, r->record_error);
		r->cur_line += r->extra + 1;
		r->extra = 0;
		r->last_term = c;
		return;
	}
	if (r->nfields == 0) {
		/* A blank line, or the LF of a CRLF pair. */
		if (c == '\n' && r->last_term == '\r')
			r->last_term = 0;
		else if (c != -1) {
			r->cur_line++;
			r->last_term = c;
		}
		r->raw_len = 0;
		return;
	}
	for (size_t i = 0; i < r->nfields; i++)
		r->ptrs[i] = r->buf + r->offsets[i];
	memset(&row, 0, sizeof row);
	row.nfields = r->nfields;
	row.fields = r->ptrs;
	row.lens = r->lens;
	row.line = r->cur_line;
	row.delimiter = r->delimiter;
	row.raw_len = r->raw_len;
	while (row.raw_len > 0 && (r->raw[row.raw_len - 1] == '\n' ||
				   r->raw[row.raw_len - 1] == '\r'))
		row.raw_len--;
	row.raw = r->raw ? r->raw : "";
	st = r->row_fn(r->ud, &row);
	if (st != AL_OK && r->stop == AL_OK)
		r->stop = st;
	r->cur_line += r->extra + 1;
	r->extra = 0;
	r->nfields = 0;
	r->buf_len = 0;
	r->raw_len = 0;
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
	al_free(r->raw);
}

/* Keeps the bytes of the record being read. */
static void
keep_raw(struct reader *r, const char *data, size_t n)
{
	if (r->raw_len + n > r->raw_cap) {
		size_t cap = r->raw_cap ? r->raw_cap : 1024;
		char *grown;

		if (r->raw_len + n > AL_CSV_MAX_RECORD) {
			if (!r->opt->recover)
				al_reader_fail(r, AL_ESYNTAX, r->cur_line,
				     "record longer than 1 MiB (an unclosed "
				     "quote?)");
			else if (r->record_error[0] == '\0')
				snprintf(r->record_error,
					 sizeof r->record_error,
					 "record longer than 1 MiB (an "
					 "unclosed quote?)");
			return;
		}
		while (cap < r->raw_len + n)
			cap *= 2;
		grown = al_realloc(r->raw, cap);
		if (grown == NULL) {
			al_reader_fail(r, AL_ENOMEM, 0, NULL);
			return;
		}
		r->raw = grown;
		r->raw_cap = cap;
	}
	memcpy(r->raw + r->raw_len, data, n);
	r->raw_len += n;
}

/* The delimiter of a header line: the one of ',', ';' and tab that occurs
 * outside quotes. 0 when none or more than one does. */
static char
detect_delimiter(const char *data, size_t n, char *found, size_t cap)
{
	int quoted = 0, seen[3] = {0, 0, 0};
	const char cand[3] = {',', ';', '\t'};
	char pick = 0;
	size_t k = 0;

	for (size_t i = 0; i < n; i++) {
		char c = data[i];

		if (c == '"')
			quoted = !quoted;
		else if (!quoted && (c == '\n' || c == '\r'))
			break;
		else if (!quoted)
			for (int j = 0; j < 3; j++)
				if (c == cand[j])
					seen[j] = 1;
	}
	found[0] = '\0';
	for (int j = 0; j < 3; j++)
		if (seen[j]) {
			if (k + 8 < cap)
				k += (size_t)snprintf(found + k, cap - k, "%s%s",
						      k ? " and " : "",
						      j == 2 ? "tab"
						      : j == 1 ? "';'"
							       : "','");
			pick = pick ? -1 : cand[j];
		}
	return pick < 0 ? 0 : pick;
}

static int
parser_setup(struct csv_parser *p, char delimiter)
{
	if (csv_init(p, CSV_STRICT | CSV_STRICT_FINI | CSV_REPALL_NL |
				CSV_APPEND_NULL) != 0)
		return -1;
	csv_set_realloc_func(p, capped_realloc);
	csv_set_free_func(p, al_free);
	csv_set_space_func(p, is_blank_char);
	csv_set_blk_size(p, 4096);
	csv_set_delim(p, (unsigned char)delimiter);
	return 0;
}

/* Recover mode: hands the malformed record to the callback and starts a
 * fresh parser at the next line. */
static void
restart(struct reader *r, struct csv_parser *p, const char *msg,
	unsigned long next_line)
{
	deliver_bad(r, msg);
	r->cur_line = next_line;
	r->extra = 0;
	r->last_term = 0;
	hook_refused = 0;
	csv_free(p);
	if (parser_setup(p, r->delimiter) != 0)
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
}

/* Follows RFC 4180 quoting over s[0..n) from r->quote: a quote opens a
 * quoted field only at a field's start (after blanks), "" inside one is
 * a quote, and the record ends at the first line end outside quotes.
 * Returns the offset just past that line end, or 0 when the record goes
 * on. Where the bytes are malformed it reads on as libcsv would have
 * had to: a quote inside a plain field is text. */
static size_t
quote_scan(struct reader *r, const char *s, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		unsigned char c = (unsigned char)s[i];
		int cr = r->quote_cr;

		r->quote_cr = c == '\r';
		if (r->quote == Q_QUOTED) {
			if (c == '"')
				r->quote = Q_QUOTE_SEEN;
			else if (c == '\r' || (c == '\n' && !cr))
				r->quote_lines++;
			continue;
		}
		if (r->quote == Q_QUOTE_SEEN && c == '"') {
			r->quote = Q_QUOTED;
			continue;
		}
		if (c == '\r' || c == '\n') {
			r->quote = Q_FIELD;
			r->quote_lines = 0;
			return i + 1;
		}
		if (c == (unsigned char)r->delimiter)
			r->quote = Q_FIELD;
		else if (c == '"' && r->quote == Q_FIELD) {
			r->quote = Q_QUOTED;
			r->quote_open = r->cur_line + r->quote_lines;
		} else if (!((r->quote == Q_FIELD || r->quote == Q_QUOTE_SEEN) &&
			     is_blank_char(c)))
			r->quote = Q_PLAIN;
	}
	return 0;
}

/* Recover mode, past a malformed record's error: s[0..n), the rest of
 * a segment, is followed to the record's end; there the record goes to
 * the callback and a fresh parser starts at next_line. term is the
 * segment's last byte, so that the LF of a CRLF is no blank line. */
static void
skip_bad(struct reader *r, struct csv_parser *p, const char *s, size_t n,
	 unsigned long next_line, char term)
{
	if (quote_scan(r, s, n) == 0)
		return;
	r->skipping = 0;
	restart(r, p, r->record_error, next_line);
	r->last_term = term;
}

/* Counts the line end of the segment data[pos..q), which ends in at most
 * one (a CR, or an LF not right after a CR); returns q. */
static size_t
line_end(const char *data, size_t pos, size_t q, unsigned long *phys_line,
	 int *prev_cr)
{
	if (data[q - 1] == '\r')
		(*phys_line)++;
	else if (data[q - 1] == '\n' && !(*prev_cr && q - pos == 1))
		(*phys_line)++;
	*prev_cr = data[q - 1] == '\r';
	return q;
}

/* libcsv stopped short of a segment's end: why, as a malformed
 * record's message. In recover mode 1, with the message in
 * r->record_error for the record to be skipped; else (or when memory ran
 * out) 0 after al_reader_fail(). */
static int
stopped(struct reader *r, struct csv_parser *p, unsigned long phys_line)
{
	char msg[160];
	unsigned long line = phys_line;

	if (r->record_error[0])
		snprintf(msg, sizeof msg, "%s", r->record_error);
	else if (hook_refused && phys_line != r->cur_line && !r->opt->recover)
		snprintf(msg, sizeof msg,
			 "field too long (over %zu bytes) in the record that "
			 "starts here: an unclosed quote?",
			 r->max_field);
	else if (hook_refused)
		snprintf(msg, sizeof msg, "field too long (over %zu bytes)",
			 r->max_field);
	else if (csv_error(p) == CSV_EPARSE)
		snprintf(msg, sizeof msg,
			 "malformed quoting (a quote inside an unquoted field, "
			 "or text after a closing quote)");
	else {
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
		return 0;
	}
	if (hook_refused)
		line = r->cur_line; /* where the record with the field began */
	if (!r->opt->recover) {
		al_reader_fail(r, AL_ESYNTAX, line, msg);
		return 0;
	}
	snprintf(r->record_error, sizeof r->record_error, "%s", msg);
	return 1;
}

/* Feeds one chunk to libcsv a line at a time, so that each record's raw
 * bytes are known and an error's line is exact; plain whole lines take
 * the fast path. */
static int
feed(struct reader *r, struct csv_parser *p, const char *data, size_t n,
     unsigned long *phys_line, int *prev_cr)
{
	size_t pos = 0;

	while (pos < n && r->stop == AL_OK) {
		size_t q = pos, done, len;
		uint16_t dmask[SCAN_BLOCKS];
		int blanks, ascii, scan = 0;
		int start = r->raw_len == 0 && r->nfields == 0 &&
			    !r->record_error[0];

		if (start)
			scan = al_scan_line(data + pos, n - pos, r->delimiter,
					 &len, dmask, &blanks, &ascii);
		if (scan == 1 && len > 0 &&
		    al_reader_plain_line(r, data + pos, len, data[pos + len], dmask,
				blanks, ascii)) {
			if (r->stop != AL_OK)
				break;
			pos = line_end(data, pos, pos + len + 1, phys_line,
				       prev_cr);
			continue;
		}
		/* to the first CR or LF, and past it */
		{
			const char *nl = memchr(data + pos, '\n', n - pos);
			size_t lim = nl ? (size_t)(nl - data) : n;
			const char *cr = memchr(data + pos, '\r', lim - pos);

			q = cr ? (size_t)(cr - data) + 1 : nl ? lim + 1 : n;
		}
		if (start && scan == 0 && q - pos > 1 &&
		    (data[q - 1] == '\n' || data[q - 1] == '\r') &&
		    al_reader_plain_line(r, data + pos, q - pos - 1, data[q - 1], NULL,
				1, 0)) {
			if (r->stop != AL_OK)
				break;
			pos = line_end(data, pos, q, phys_line, prev_cr);
			continue;
		}
		keep_raw(r, data + pos, q - pos);
		if (r->stop != AL_OK)
			break;
		if (r->skipping) {
			size_t from = pos;

			pos = line_end(data, pos, q, phys_line, prev_cr);
			skip_bad(r, p, data + from, q - from, *phys_line,
				 data[q - 1]);
			continue;
		}
		if (r->record_error[0] && r->raw_len >= AL_CSV_MAX_RECORD - CHUNK)
			done = 0; /* a runaway record: give up on it here */
		else
			done = csv_parse(p, data + pos, q - pos, on_field,
					 on_record, r);
		if (r->stop != AL_OK)
			break;
		if (done != q - pos) {
			size_t from = pos + done;

			if (!stopped(r, p, *phys_line))
				break;
			/* the record is rejected whole: its quoting up to the
			 * error, then on to its end */
			quote_scan(r, data + pos, done);
			r->skipping = 1;
			pos = line_end(data, pos, q, phys_line, prev_cr);
			skip_bad(r, p, data + from, q - from, *phys_line,
				 data[q - 1]);
			continue;
		}
		quote_scan(r, data + pos, q - pos);
		pos = line_end(data, pos, q, phys_line, prev_cr);
	}
	return r->stop == AL_OK;
}

/* The file's start, in chunk (*n bytes, more read here to see at least
 * three): a UTF-8 byte-order mark is skipped (*skip), UTF-16 and UTF-32
 * are refused, a spreadsheet's "sep=;" first line names the delimiter
 * (honoured unless another was given; its line still counts, and
 * r->cur_line becomes 2), and AL_CSV_AUTO detects it from the header.
 * 0, or -1 after a failure (r->stop). */
static int
first_chunk(struct reader *r, struct csv_parser *p, al_read_fn read_fn,
	    void *read_ctx, char *chunk, size_t *n, size_t *skip)
{
	const al_csv_options *opt = r->opt;
	int failed = 0;

	while (*n < 3) {
		size_t more = read_fn(read_ctx, chunk + *n, CHUNK - *n, &failed);

		if (failed || more == 0)
			break;
		*n += more;
	}
	if (failed) {
		al_reader_fail(r, AL_EIO, 0, NULL);
		return -1;
	}
	if (*n >= 3 && memcmp(chunk, "\xEF\xBB\xBF", 3) == 0)
		*skip = 3;
	if (*n >= 2 && (memcmp(chunk, "\xFF\xFE", 2) == 0 ||
			memcmp(chunk, "\xFE\xFF", 2) == 0 ||
			(*n >= 4 && memcmp(chunk, "\0\0\xFE\xFF", 4) == 0))) {
		/* FF FE 00 00 is UTF-32 LE, 00 00 FE FF BE */
		int wide = *n >= 4 && (memcmp(chunk + 2, "\0\0", 2) == 0 ||
				       chunk[0] == 0);

		al_reader_fail(r, AL_ESYNTAX, 1,
		     wide ? "the file is UTF-32 text: save or export it as "
			    "UTF-8 CSV"
			  : "the file is UTF-16 text: save or export it as "
			    "UTF-8 CSV");
		return -1;
	}
	if (*n - *skip >= 5 && memcmp(chunk + *skip, "sep=", 4) == 0 &&
	    (*n - *skip == 5 || chunk[*skip + 5] == '\r' ||
	     chunk[*skip + 5] == '\n') &&
	    (opt->delimiter == 0 || opt->delimiter == AL_CSV_AUTO ||
	     opt->delimiter == chunk[*skip + 4])) {
		size_t k = *skip + 5;

		r->delimiter = chunk[*skip + 4];
		if (k < *n && chunk[k] == '\r')
			k++;
		if (k < *n && chunk[k] == '\n')
			k++;
		*skip = k;
		r->cur_line = 2;
	} else if (opt->delimiter == AL_CSV_AUTO) {
		char found[64], msg[160];

		r->delimiter = detect_delimiter(chunk + *skip, *n - *skip, found,
						sizeof found);
		if (r->delimiter == 0) {
			snprintf(msg, sizeof msg,
				 found[0] ? "cannot tell the delimiter: the header "
					    "has %s; give --delimiter"
					  : "cannot tell the delimiter: the header "
					    "has no ',', ';' or tab%s; give "
					    "--delimiter",
				 found);
			al_reader_fail(r, AL_ESYNTAX, 1, msg);
			return -1;
		}
	}
	csv_set_delim(p, (unsigned char)r->delimiter);
	return 0;
}

al_status
al_csv_read(const al_csv_options *opt, al_read_fn read_fn, void *read_ctx,
	    const char *name, al_csv_row_fn row_fn, void *ud, al_diags *diags)
{
	static const al_csv_options defaults = {0};
	struct csv_parser p;
	struct reader r;
	char *chunk = NULL;
	unsigned long phys_line = 1;
	int prev_cr = 0, first = 1, failed = 0;
	size_t blk = 4096;
	al_status st = AL_OK;

	if (opt == NULL)
		opt = &defaults;
	memset(&r, 0, sizeof r);
	r.opt = opt;
	r.max_field = opt->max_field ? opt->max_field : AL_CSV_MAX_FIELD;
	r.delimiter = opt->delimiter ? opt->delimiter : ',';
	r.name = name;
	r.row_fn = row_fn;
	r.ud = ud;
	r.diags = diags;
	r.cur_line = 1;

	if (parser_setup(&p, r.delimiter == AL_CSV_AUTO ? ',' : r.delimiter) != 0)
		return AL_ENOMEM;
	/* room for the longest field allowed and libcsv's NUL, in whole blocks */
	hook_limit = ((r.max_field + 1 + blk - 1) / blk) * blk;
	hook_refused = 0;

	chunk = al_malloc(CHUNK + SCAN_PAD);
	if (chunk == NULL) {
		csv_free(&p);
		return AL_ENOMEM;
	}
	for (;;) {
		size_t n = read_fn(read_ctx, chunk, CHUNK, &failed);
		size_t skip = 0;

		if (failed) {
			al_reader_fail(&r, AL_EIO, 0, NULL);
			break;
		}
		if (n == 0)
			break;
		if (first) {
			first = 0;
			if (first_chunk(&r, &p, read_fn, read_ctx, chunk, &n,
					&skip) != 0)
				break;
			if (r.cur_line == 2) /* a "sep=" line */
				phys_line = 2;
		}
		memset(chunk + n, 0, SCAN_PAD); /* al_scan_line reads past n */
		if (!feed(&r, &p, chunk + skip, n - skip, &phys_line, &prev_cr))
			break;
	}
	/* a quote still open at the end is an error in either mode: the
	 * rows after it would be lost in its field */
	if (r.stop == AL_OK && r.quote == Q_QUOTED)
		al_reader_fail(&r, AL_ESYNTAX, r.quote_open,
		     "unterminated quoted field (the quote opened here is never "
		     "closed)");
	if (r.stop == AL_OK && r.skipping)
		deliver_bad(&r, r.record_error);
	else if (r.stop == AL_OK) {
		if (csv_fini(&p, on_field, on_record, &r) != 0 &&
		    r.stop == AL_OK)
			al_reader_fail(&r, csv_error(&p) == CSV_EPARSE ? AL_ESYNTAX
							     : AL_ENOMEM,
			     r.quote_open,
			     "unterminated quoted field (the quote opened here "
			     "is never closed)");
		else if (r.stop == AL_OK && r.record_error[0])
			deliver_bad(&r, r.record_error);
	}
	st = r.stop;
	hook_limit = 0;
	csv_free(&p);
	al_free(chunk);
	free_reader(&r);
	return st;
}

size_t
al_read_stdio(void *ctx, void *buf, size_t cap, int *failed)
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
	return al_csv_read(opt, al_read_stdio, in, name, row_fn, ud, diags);
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
