/* acidlot tests: the CSV reader (RFC 4180 quoting, physical line numbers).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include "testutil.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/csvread.h"
#include "acidlot/number.h"
#include "acidlot/table.h"

struct seen {
	size_t rows;
	unsigned long last_line;
	unsigned long lines[16];
	size_t nfields[16];
	char first[16][64];
	char last[16][64];
};

static al_status
collect(void *ud, const al_csv_row *row)
{
	struct seen *s = ud;

	if (s->rows < 16) {
		s->lines[s->rows] = row->line;
		s->nfields[s->rows] = row->nfields;
		snprintf(s->first[s->rows], 64, "%s", row->fields[0]);
		snprintf(s->last[s->rows], 64, "%s",
			 row->fields[row->nfields - 1]);
	}
	s->rows++;
	s->last_line = row->line;
	return AL_OK;
}

static al_status
read_str(const char *text, struct seen *s, al_diags *d)
{
	memset(s, 0, sizeof *s);
	return al_csv_read_mem(NULL, text, strlen(text), "t.csv", collect, s,
			       d);
}

/* LF, CRLF and lone CR each end one line; blank lines are skipped but
 * counted (RFC 4180 s.2 for CRLF; LF and CR as files in the wild). */
static void
line_ends(void **state)
{
	const char *texts[] = {"a,b\n\n1,2\n3,4\n", "a,b\r\n\r\n1,2\r\n3,4\r\n",
			       "a,b\r\r1,2\r3,4\r"};
	struct seen s;
	al_diags d = {0};

	(void)state;
	for (size_t i = 0; i < 3; i++) {
		assert_int_equal(read_str(texts[i], &s, &d), AL_OK);
		assert_int_equal(s.rows, 3);
		assert_int_equal(s.lines[0], 1);
		assert_int_equal(s.lines[1], 3);
		assert_int_equal(s.lines[2], 4);
		assert_string_equal(s.last[2], "4");
	}
	al_diags_clear(&d);
}

/* A quoted field may hold the delimiter, doubled quotes and line breaks
 * (RFC 4180 s.2 rules 6 and 7); the next record's line number counts
 * the breaks. */
static void
quoting(void **state)
{
	struct seen s;
	al_diags d = {0};

	(void)state;
	assert_int_equal(read_str("h1,h2\n\"x,1\",\"say \"\"hi\"\"\"\n"
				  "\"two\nlines\",z\nlast,row",
				  &s, &d),
			 AL_OK);
	assert_int_equal(s.rows, 4);
	assert_string_equal(s.first[1], "x,1");
	assert_string_equal(s.last[1], "say \"hi\"");
	assert_string_equal(s.first[2], "two\nlines");
	assert_int_equal(s.lines[2], 3);
	assert_int_equal(s.lines[3], 5);
	assert_string_equal(s.last[3], "row");
	al_diags_clear(&d);
}

static void
bom(void **state)
{
	struct seen s;
	al_diags d = {0};

	(void)state;
	assert_int_equal(read_str("\xEF\xBB\xBFsample,x\n1,2\n", &s, &d),
			 AL_OK);
	assert_string_equal(s.first[0], "sample");
	al_diags_clear(&d);
}

static void
malformed(void **state)
{
	struct seen s;
	al_diags d = {0};

	(void)state;
	assert_int_equal(read_str("a,b\n1,2\n3,\"open\n4,5\n", &s, &d),
			 AL_ESYNTAX);
	assert_int_equal(d.count, 1);
	assert_int_equal(d.items[0].line, 3);
	assert_non_null(strstr(d.items[0].message, "unterminated"));
	al_diags_clear(&d);

	assert_int_equal(read_str("a,b\n1,2\n3,x\"y\n", &s, &d), AL_ESYNTAX);
	assert_int_equal(d.items[0].line, 3);
	al_diags_clear(&d);

	assert_int_equal(read_str("a,b\n1,\"2\"x\n", &s, &d), AL_ESYNTAX);
	assert_int_equal(d.items[0].line, 2);
	al_diags_clear(&d);

	{
		const char nul[] = "a,b\n1,x\0y\n";

		memset(&s, 0, sizeof s);
		assert_int_equal(al_csv_read_mem(NULL, nul, sizeof nul - 1,
						 "t.csv", collect, &s, &d),
				 AL_ESYNTAX);
		assert_int_equal(d.items[0].line, 2);
		assert_non_null(strstr(d.items[0].message, "NUL"));
		al_diags_clear(&d);
	}
}

static void
long_field(void **state)
{
	static char text[10000];
	struct seen s;
	al_diags d = {0};

	(void)state;
	strcpy(text, "a\n");
	memset(text + 2, 'x', 5000);
	strcpy(text + 5002, "\n");
	assert_int_equal(read_str(text, &s, &d), AL_ESYNTAX);
	assert_non_null(strstr(d.items[0].message, "too long"));
	assert_int_equal(d.items[0].line, 2);
	al_diags_clear(&d);
}

/* The reader takes 64 KiB at a time: a CRLF pair split across two reads
 * is still one line end, and a record split across them is one record. */
static void
chunk_boundary(void **state)
{
	size_t n = 65536 + 100, pos = 0;
	char *text = malloc(n + 1);
	struct seen s;
	al_diags d = {0};
	unsigned long lines = 0;

	(void)state;
	assert_non_null(text);
	pos += (size_t)sprintf(text, "a,b\r\n");
	lines++;
	/* rows of "x,y\r\n" up to just before the boundary */
	while (pos + 5 < 65535) {
		memcpy(text + pos, "x,y\r\n", 5);
		pos += 5;
		lines++;
	}
	/* pad the last row so that its CR is byte 65535, its LF byte 65536 */
	while (pos < 65535 - 2)
		text[pos++] = 'z';
	memcpy(text + pos, ",1\r\nlast,row\r\n", 14);
	pos += 14;
	text[pos] = '\0';
	assert_true(text[65535] == '\r' && text[65536] == '\n');
	assert_int_equal(read_str(text, &s, &d), AL_OK);
	assert_int_equal(s.rows, lines + 2);
	assert_int_equal(d.count, 0);
	/* line numbers stay physical across the boundary */
	assert_int_equal(s.lines[1], 2);
	assert_int_equal(s.last_line, lines + 2);
	free(text);
	al_diags_clear(&d);
}

/* UTF-8 well-formedness by RFC 3629 s.3-4: overlong forms, surrogates
 * and code points above U+10FFFF are ill-formed. */
static void
utf8(void **state)
{
	static const char *const good[] = {"abc", "\xE2\x82\xAC",
					   "\xF0\x9D\x84\x9E", ("S\xC3\xBC" "d"), ""};
	static const char *const bad[] = {"\xC0\xAF", "\xED\xA0\x80",
					  "\xF4\x90\x80\x80", "\xE2\x82",
					  ("L\xF6" "sung"), "\x80", "\xFF"};

	(void)state;
	for (size_t i = 0; i < sizeof good / sizeof good[0]; i++)
		assert_true(al_utf8_valid(good[i], strlen(good[i])));
	for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++)
		assert_false(al_utf8_valid(bad[i], strlen(bad[i])));
}

/* A transcript of what the reader hands over: every record's line,
 * fields and raw bytes, then the status and the messages. */
struct transcript {
	char *text;
	size_t len, cap;
	unsigned long rows, stop_at; /* stop_at: row_fn stops there (0: never) */
	/* the cells of each record, one line each, as row_fn saw them */
	struct cells_log {
		char *text;
		size_t len, cap;
		unsigned long lines;
	} seen;
};

static void
log_put(struct cells_log *g, const char *s, size_t n)
{
	if (g->len + n + 1 > g->cap) {
		g->cap = 2 * (g->len + n + 1);
		g->text = realloc(g->text, g->cap);
		assert_non_null(g->text);
	}
	memcpy(g->text + g->len, s, n);
	g->len += n;
	g->text[g->len] = '\0';
}

/* A record's cells, "|" between them and a NUL after the last (no field
 * holds a NUL; a cell with a line end stays on its line). */
static void
log_cell(struct cells_log *g, const char *s, size_t n, int last)
{
	log_put(g, s, n);
	if (last) {
		g->len++; /* keeps log_put's NUL */
		g->lines++;
	} else
		log_put(g, "|", 1);
}

static void
put(struct transcript *t, const char *s, size_t n)
{
	struct cells_log g = {t->text, t->len, t->cap, 0};

	log_put(&g, s, n);
	t->text = g.text;
	t->len = g.len;
	t->cap = g.cap;
}

static al_status
record_row(void *ud, const al_csv_row *row)
{
	struct transcript *t = ud;
	char head[64];

	snprintf(head, sizeof head, "%lu:%zu:%c:", row->line, row->nfields,
		 row->delimiter);
	put(t, head, strlen(head));
	for (size_t i = 0; i < row->nfields; i++) {
		assert_int_equal(row->fields[i][row->lens[i]], '\0');
		put(t, row->fields[i], row->lens[i]);
		put(t, "|", 1);
	}
	/* what the plain lines' path says of a row holds */
	for (size_t i = 0; row->trimmed && i < row->nfields; i++) {
		size_t n = row->lens[i];

		assert_true(n == 0 || (!strchr(" \t", row->fields[i][0]) &&
				       !strchr(" \t", row->fields[i][n - 1])));
	}
	for (size_t i = 0; row->ascii && i < row->raw_len; i++)
		assert_true((unsigned char)row->raw[i] < 0x80);
	for (size_t i = 0; i < row->nfields; i++)
		log_cell(&t->seen, row->fields[i], row->lens[i],
			 i + 1 == row->nfields);
	if (row->nfields == 0) /* a malformed record */
		log_cell(&t->seen, "\x02", 1, 1);
	put(t, "raw=", 4);
	put(t, row->raw, row->raw_len);
	if (row->syntax_error)
		put(t, row->syntax_error, strlen(row->syntax_error));
	put(t, "\n", 1);
	if (++t->rows == t->stop_at)
		return AL_EINPUT;
	return AL_OK;
}


static void
transcribe(const al_csv_options *opt, const char *data, size_t len,
	   struct transcript *t)
{
	al_diags d = {0};
	al_status st;
	char tail[32];
	FILE *m = fmemopen((void *)data, len ? len : 1, "r");

	assert_non_null(m);
	if (len == 0)
		(void)fgetc(m); /* fmemopen wants a size: start at its end */
	t->len = 0;
	t->rows = 0;
	t->seen.len = 0;
	t->seen.lines = 0;
	put(t, "", 0);
	st = al_csv_read(opt, al_read_stdio, m, "t.csv", record_row, t, &d);
	fclose(m);
	snprintf(tail, sizeof tail, "status %d\n", (int)st);
	put(t, tail, strlen(tail));
	for (size_t i = 0; i < d.count; i++) {
		char line[32];

		snprintf(line, sizeof line, "%lu: ", d.items[i].line);
		put(t, line, strlen(line));
		put(t, d.items[i].message, strlen(d.items[i].message));
		put(t, "\n", 1);
	}
	al_diags_clear(&d);
}

/* Marsaglia's xorshift64 (J. Stat. Softw. 8(14), 2003). */
static uint64_t
xorshift(uint64_t *x)
{
	*x ^= *x << 13;
	*x ^= *x >> 7;
	*x ^= *x << 17;
	return *x;
}

/* A random document: mostly bytes of `plain`, a quarter from
 * `alphabet` (delimiters, blanks, quotes, line ends). */
static void
random_doc(uint64_t *x, char *doc, size_t len, const char *plain,
	   const char *alphabet)
{
	size_t np = strlen(plain), na = strlen(alphabet);

	for (size_t i = 0; i < len; i++) {
		uint64_t r = xorshift(x);

		doc[i] = (r >> 8) % 4 ? plain[(r >> 16) % np]
				      : alphabet[(r >> 24) % na];
		/* now and then a NUL, which no alphabet string can hold */
		if ((r >> 40) % 700 == 0)
			doc[i] = '\0';
	}
}

/* Random documents read two ways in every mode, which must give the
 * same transcript: the reader's own path for plain lines against libcsv's
 * (the reference) for every record. */
static void
compare_readers(uint64_t x, int rounds, const char *plain,
		const char *alphabet)
{
	static const char delims[3] = {',', ';', '\t'};
	struct transcript one = {0}, two = {0};
	int modes = 12, docs = 0;
	size_t cap = 1200000;
	char *doc = malloc(cap);

	assert_non_null(doc);
	for (int round = 0; round < rounds; round++) {
		size_t len;

		xorshift(&x);
		len = round % 500 == 0 ? 70000 + x % 100000 : x % 160;
		random_doc(&x, doc, len, plain, alphabet);
		for (int mode = 0; mode < modes; mode++) {
			al_csv_options opt;

			memset(&opt, 0, sizeof opt);
			opt.delimiter = delims[mode % 3];
			opt.recover = (mode / 3) & 1;
			opt.max_field = mode >= 6 ? 12 : 0;
			transcribe(&opt, doc, len, &one);
			opt.no_fast_path = 1;
			transcribe(&opt, doc, len, &two);
			if (strcmp(one.text, two.text) != 0)
				fail_msg("document %d, mode %d:\n--- fast path\n"
					 "%.3000s--- libcsv\n%.3000s",
					 round, mode, one.text, two.text);
			docs++;
		}
	}
	assert_int_equal(docs, rounds * modes);
	free(doc);
	free(one.text);
	free(two.text);
	free(one.seen.text);
	free(two.seen.text);
}

/* The reader's own path for plain lines gives exactly what libcsv gives
 * for them: random documents over an alphabet of delimiters, blanks,
 * quotes and line ends, in every mode. Some documents pass the 64 KiB
 * read chunk, so lines are split across chunks too. */
static void
fast_path_matches_libcsv(void **state)
{
	(void)state;
	compare_readers(88172645463325252ULL, 6000, "abc123.5",
			"a1.,,;;\t  \n\n\r\"x-\xC3\xA9");
}

/* Issue 18 B12: with --rejects a malformed record is rejected whole and
 * reading goes on at the next physical line: a line over the reader's
 * 64 KiB chunk is one reject, not pieces read as rows; a too-long quoted
 * field spanning lines is one reject and the rows after it keep their
 * physical lines (RFC 4180 s.2 rule 6: a quoted field may hold line
 * breaks); a quote still open at the end is an error naming its line,
 * never a field that swallows the rows after it. */
struct verdicts {
	size_t n;
	unsigned long line[64];
	int bad[64];
};

static al_status
note_row(void *ud, const al_csv_row *row)
{
	struct verdicts *v = ud;

	if (v->n < 64) {
		v->line[v->n] = row->line;
		v->bad[v->n] = row->syntax_error != NULL;
	}
	v->n++;
	return AL_OK;
}

static al_status
recover_read(const char *text, size_t len, struct verdicts *v, al_diags *d)
{
	al_csv_options opt = {0};

	opt.recover = 1;
	memset(v, 0, sizeof *v);
	return al_csv_read_mem(&opt, text, len, "t.csv", note_row, v, d);
}

static void
rejects_keep_place(void **state)
{
	/* what the reader builds a file of: {text, repeat} pieces */
	static const struct {
		const char *pieces[4];
		size_t repeat[4];
		size_t n;
		unsigned long line[6];
		int bad[6];
	} cases[] = {
		/* a 70 kB field, then one of rows' text, LF and CRLF */
		{{"h,k\nP,1\nP,", "x", "\nP,4\n"}, {1, 70000, 1},
		 3, {1, 2, 3, 4}, {0, 0, 1, 0}},
		{{"h,k\r\nP,1\r\nP,", "P,9,", "\r\nP,4\r\n"}, {1, 20000, 1},
		 3, {1, 2, 3, 4}, {0, 0, 1, 0}},
		/* 20,000 fields on one line */
		{{"h,k\nP,1\n", "1,", "2\nP,4\n"}, {1, 20000, 1},
		 3, {1, 2, 3, 4}, {0, 0, 1, 0}},
		/* a too-long quoted field over lines 3-5 */
		{{"h,k\nP,1\nP,\"", "y", "\n\n\",x\nP,6\n"}, {1, 5000, 1},
		 3, {1, 2, 3, 6}, {0, 0, 1, 0}},
		{{"h,k\nP,1\nP,\"", "y", "\r\n\r\n\",x\r\nP,6\r\n"},
		 {1, 70000, 1}, 3, {1, 2, 3, 6}, {0, 0, 1, 0}},
		/* text after a closing quote, the record over lines 2-4 */
		{{"h,k\nP,\"a\n\nb\"c\nP,5\n\nP,7\n"}, {1}, 1,
		 {1, 2, 5, 7}, {0, 1, 0, 0}},
	};
	(void)state;
	for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
		size_t len = 0, at = 0;
		char *text;
		struct verdicts v;
		al_diags d = {0};

		for (size_t i = 0; i < cases[c].n; i++) {
			len += cases[c].repeat[i] * strlen(cases[c].pieces[i]);
		}
		text = malloc(len + 1);
		assert_non_null(text);
		for (size_t i = 0; i < cases[c].n; i++) {
			size_t k = strlen(cases[c].pieces[i]);

			for (size_t j = 0; j < cases[c].repeat[i]; j++, at += k)
				memcpy(text + at, cases[c].pieces[i], k);
		}
		assert_int_equal(recover_read(text, len, &v, &d), AL_OK);
		assert_int_equal(v.n, 4);
		for (size_t i = 0; i < 4; i++) {
			assert_int_equal(v.line[i], cases[c].line[i]);
			assert_int_equal(v.bad[i], cases[c].bad[i]);
		}
		al_diags_clear(&d);
		free(text);
	}
}

/* An unclosed quote: an error at the quote's line in either mode, short
 * (libcsv's end) or long (the field outgrows its cap first). */
static void
unclosed_quote(void **state)
{
	static const char head[] = "h,k\nP,1\nP,\"open\n";
	size_t rows = 3000, len = strlen(head) + rows * 4;
	char *text = malloc(len + 1);
	struct verdicts v;

	(void)state;
	assert_non_null(text);
	memcpy(text, head, strlen(head));
	for (size_t i = 0; i < rows; i++)
		memcpy(text + strlen(head) + 4 * i, "P,2\n", 4);
	for (int recover = 0; recover < 2; recover++) {
		for (size_t n = strlen(head) + 8; n <= len; n = len) {
			al_diags d = {0};
			al_csv_options opt = {0};

			opt.recover = recover;
			memset(&v, 0, sizeof v);
			assert_int_equal(al_csv_read_mem(&opt, text, n, "t.csv",
							 note_row, &v, &d),
					 AL_ESYNTAX);
			assert_int_equal(d.count, 1);
			assert_int_equal(d.items[0].line, 3);
			al_diags_clear(&d);
			if (n == len)
				break;
		}
	}
	free(text);
}

/* Every word of reference/header_words.csv (the bench-sheet words of
 * English, German, French and Spanish) leads a header to the column it
 * stands for, as the error that names the --column to map it. */
extern const unsigned char al_ref_header_words[];
extern const size_t al_ref_header_words_len;

static const char *
header_for(const char *word, const char *means, char *buf, size_t cap,
	   const char **column)
{
	static const struct {
		const char *means, *before, *after, *column;
	} form[] = {
		{"titrant", "", " (mL)", "titrant_ml"},
		{"mass", "", " (g)", "mass_g"},
		{"volume", "", " (mL)", "volume_ml"},
		{"blank", "", " (mL)", "blank_ml"},
		{"mol_l", "NaOH (", ")", "titrant_mol_l"},
		{"pct", "Water (", ")", "water_pct"},
		{"endpoint", "", " pH", "endpoint_ph"},
		{"water", "", " (%)", "water_pct"},
		{"-", "", " mass (g)", "mass_g"},
		{"lot", "", "", "lot"},
		{"sample", "", "", "sample"},
		{"date", "", "", "date"},
		{"product", "", "", "product"},
	};

	for (size_t i = 0; i < sizeof form / sizeof form[0]; i++)
		if (strcmp(means, form[i].means) == 0) {
			snprintf(buf, cap, "%s%s%s", form[i].before, word,
				 form[i].after);
			*column = form[i].column;
			return buf;
		}
	return NULL;
}

static void
header_words_mapped(void **state)
{
	static const char *const names[] = {
		"sample", "titrant_ml", "mass_g", "volume_ml", "blank_ml",
		"titrant_mol_l", "endpoint_ph", "water_pct", "lot", "date",
		"product"};
	char text[4096], header[128], want[160];
	const char *line, *column;
	size_t checked = 0;

	(void)state;
	snprintf(text, sizeof text, "%.*s", (int)al_ref_header_words_len,
		 (const char *)al_ref_header_words);
	line = strchr(text, '\n') + 1; /* past the header line */
	for (; *line; line = strchr(line, '\n') + 1) {
		char word[64], means[64];
		al_diags d = {0};
		int index[11];
		const char *cells[1];
		size_t lens[1];
		al_csv_row row = {0};

		if (sscanf(line, "%63[^,],%63[^,]", word, means) != 2)
			break;
		if (header_for(word, means, header, sizeof header, &column) ==
		    NULL)
			continue;
		cells[0] = header;
		lens[0] = strlen(header);
		row.nfields = 1;
		row.fields = cells;
		row.lens = lens;
		row.line = 1;
		snprintf(want, sizeof want, "looks like %s:", column);
		/* our own word ("lot") is the column itself */
		if (al_header_map(AL_UNKNOWN_WARN, &row, names, 11, NULL, 0,
				  index, "t.csv", &d, "--column") == AL_OK &&
		    strcmp(header, column) == 0) {
			checked++;
			continue;
		}
		if (d.count != 1 || strstr(d.items[0].message, want) == NULL) {
			print_error("'%s': %s\n", header,
				    d.count ? d.items[0].message : "no error");
			fail();
		}
		al_diags_clear(&d);
		checked++;
	}
	assert_true(checked >= 60); /* every row of the table */
}

/* Whole headers as bench sheets write them (common practice), each to
 * its column; the fillers (ID, No., Nr.) leave the word they follow. */
static void
bench_sheet_headers_mapped(void **state)
{
	static const char *const names[] = {"sample", "lot", "titrant_ml",
					    "mass_g"};
	static const struct {
		const char *header, *column;
	} t[] = {
		{"Sample ID", "sample"},       {"Sample No.", "sample"},
		{"Probe Nr.", "sample"},       {"Lot No.", "lot"},
		{"Batch Number", "lot"},       {"Titrant Volume", "titrant_ml"},
		{"Sample Mass (g)", "mass_g"}, {"Prise d'essai (g)", "mass_g"},
	};

	(void)state;
	for (size_t i = 0; i < sizeof t / sizeof t[0]; i++) {
		const char *cells[1] = {t[i].header};
		size_t lens[1] = {strlen(t[i].header)};
		al_csv_row row = {.nfields = 1, .fields = cells, .lens = lens,
				  .line = 1};
		al_diags d = {0};
		int index[4];
		char want[64];

		snprintf(want, sizeof want, "looks like %s:", t[i].column);
		(void)al_header_map(AL_UNKNOWN_WARN, &row, names, 4, NULL, 0,
				    index, "t.csv", &d, "--column");
		if (d.count < 1 || strstr(d.items[0].message, want) == NULL) {
			print_error("'%s': %s\n", t[i].header,
				    d.count ? d.items[0].message : "no error");
			fail();
		}
		al_diags_clear(&d);
	}
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(line_ends), cmocka_unit_test(quoting),
	       cmocka_unit_test(bom), cmocka_unit_test(malformed),
	       cmocka_unit_test(long_field), cmocka_unit_test(utf8),
	       cmocka_unit_test(chunk_boundary),
	       cmocka_unit_test(fast_path_matches_libcsv),
	       cmocka_unit_test(rejects_keep_place),
	       cmocka_unit_test(unclosed_quote),
	       cmocka_unit_test(header_words_mapped),
	       cmocka_unit_test(bench_sheet_headers_mapped))
