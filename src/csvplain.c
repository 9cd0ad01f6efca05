/* acidlot: the CSV reader's path for plain lines: a whole line with no
 * quote, split at its delimiters without libcsv's per-byte callbacks,
 * and the SSE2 scan that finds such a line's end and delimiters 16
 * bytes a step (see csvreader.h; bench/ablate.sh: 1.67 and 1.19 at 1e6
 * rows).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "csvreader.h"

#include "acidlot/csvread.h"

#ifdef __SSE2__
#include <emmintrin.h>
#endif
#include <string.h>

/* Field k of the fast path: b[a..e) trimmed of blanks (unless the
 * caller knows it has none: trim 0) and ended by a NUL; sets *content
 * when something is left. 0 when the field cannot be
 * had here: too many (libcsv's path says why), or no memory (then the
 * reader has failed). */
static inline __attribute__((always_inline)) int
fast_field(struct reader *r, char *b, size_t a, size_t e, size_t k,
	   int trim, int *content)
{
	if (k == AL_CSV_MAX_FIELDS)
		return 0;
	if (k == r->fields_cap && !al_reader_grow_fields(r, k + 1)) {
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
		return 0;
	}
	while (trim && a < e && (b[a] == ' ' || b[a] == '\t'))
		a++;
	while (trim && e > a && (b[e - 1] == ' ' || b[e - 1] == '\t'))
		e--;
	/* a field with something left is what makes the line not blank */
	*content |= e > a;
	b[e] = '\0';
	r->ptrs[k] = b + a;
	r->lens[k] = e - a;
	return 1;
}

/* The fast path for the common record: one whole line, at a record
 * boundary, with no quote and no NUL, shorter than the field cap (so no
 * field can pass it) and not blank. libcsv (strict, our blank function)
 * gives such a line's fields as the pieces between delimiters with
 * blanks (space and tab, unless the delimiter) trimmed from both ends;
 * so does this, without the per-byte callbacks. dmask, when not NULL,
 * holds the line's delimiters as bits (bit i of dmask[i / 16] for byte
 * i; scan_line), found with its end; the line is then known to hold no
 * quote or NUL, and a blank only when blanks is set, and ascii says
 * whether its bytes are all ASCII (passed on in the row). Returns 0
 * when the line must go through libcsv. The test suite checks that
 * both paths give the same records (tests/unit/test_csv.c). */
int
al_reader_plain_line(struct reader *r, const char *line, size_t len, char term,
	    const uint16_t *dmask, int blanks, int ascii)
{
	const char d = r->delimiter;
	size_t k = 0, a = 0;
	int content = 0;
	al_csv_row row;
	al_status st;
	char *b;

	if (r->opt->no_fast_path || len == 0 || len >= r->max_field ||
	    len > AL_CSV_MAX_RECORD)
		return 0;
	if (!al_reader_grow_buf(r, len + 1)) {
		al_reader_fail(r, AL_ENOMEM, 0, NULL);
		return 1;
	}
	/* a quote or a NUL leaves the line to libcsv (nothing is done
	 * until row_fn); else copy it, split it at the delimiter and trim
	 * each field (memchr and memcpy look at many bytes a step) */
	if (dmask == NULL && (memchr(line, '"', len) != NULL ||
			      memchr(line, '\0', len) != NULL))
		return 0;
	b = r->buf;
	memcpy(b, line, len);
	b[len] = d; /* the end closes the last field */
	if (dmask != NULL) {
		/* each delimiter's bit, in turn */
		for (size_t w = 0; w < (len + 15) / 16; w++)
			for (unsigned m = dmask[w]; m != 0; m &= m - 1) {
				size_t i = 16 * w + (size_t)__builtin_ctz(m);

				if (!fast_field(r, b, a, i, k++, blanks,
						&content))
					return r->stop != AL_OK;
				a = i + 1;
			}
		if (!fast_field(r, b, a, len, k++, blanks, &content))
			return r->stop != AL_OK;
	} else {
		for (size_t i = 0; i <= len; i++) {
			a = i;
			while (b[i] != d)
				i++;
			if (!fast_field(r, b, a, i, k++, 1, &content))
				return r->stop != AL_OK;
		}
	}
	if (!content)
		return 0;
	memset(&row, 0, sizeof row);
	row.nfields = k;
	row.fields = r->ptrs;
	row.lens = r->lens;
	row.line = r->cur_line;
	row.delimiter = d;
	row.raw = line;
	row.raw_len = len;
	row.trimmed = 1;
	row.ascii = (unsigned char)ascii;
	st = r->row_fn(r->ud, &row);
	if (st != AL_OK && r->stop == AL_OK)
		r->stop = st;
	r->cur_line++;
	r->last_term = (unsigned char)term;
	return 1;
}


/* The line at s (avail bytes of data, SCAN_PAD more readable): its
 * length to the first CR or LF, its delimiters as bits in dmask, in
 * *blanks whether it holds a space or a tab (a field to trim) and in
 * *ascii whether all its bytes are below 0x80, when it ends within
 * SCAN_PAD bytes and holds no quote and no NUL (1); -1 when it holds a
 * quote or a NUL, which leaves it to libcsv; else 0, to leave it to the
 * byte-by-byte path. 16 bytes a step, by SSE2 compares (every
 * x86-64 has them); elsewhere always 0. */
int
al_scan_line(const char *s, size_t avail, char d, size_t *len,
	  uint16_t dmask[SCAN_BLOCKS], int *blanks, int *ascii)
{
#ifdef __SSE2__
	const __m128i lf = _mm_set1_epi8('\n'), cr = _mm_set1_epi8('\r'),
		      qt = _mm_set1_epi8('"'), nul = _mm_setzero_si128(),
		      dl = _mm_set1_epi8(d), sp = _mm_set1_epi8(' '),
		      tab = _mm_set1_epi8('\t');
	unsigned any_blank = 0, any_high = 0;

	for (size_t w = 0; w < SCAN_BLOCKS && 16 * w < avail; w++) {
		__m128i v = _mm_loadu_si128(
			(const __m128i *)(const void *)(s + 16 * w));
		unsigned end = (unsigned)_mm_movemask_epi8(_mm_or_si128(
			_mm_cmpeq_epi8(v, lf), _mm_cmpeq_epi8(v, cr)));
		unsigned bad = (unsigned)_mm_movemask_epi8(_mm_or_si128(
			_mm_cmpeq_epi8(v, qt), _mm_cmpeq_epi8(v, nul)));
		unsigned before;

		if (avail - 16 * w < 16) {
			/* past the data: no end there, its zeros no NUL */
			unsigned valid = (1u << (avail - 16 * w)) - 1;

			end &= valid;
			bad &= valid;
		}
		before = end ? (1u << __builtin_ctz(end)) - 1 : 0xFFFFu;
		if (bad & before)
			return -1; /* a quote or a NUL: libcsv's */
		dmask[w] = (uint16_t)((unsigned)_mm_movemask_epi8(
					      _mm_cmpeq_epi8(v, dl)) & before);
		any_blank |= (unsigned)_mm_movemask_epi8(_mm_or_si128(
				     _mm_cmpeq_epi8(v, sp),
				     _mm_cmpeq_epi8(v, tab))) & before;
		/* a byte's top bit: not ASCII */
		any_high |= (unsigned)_mm_movemask_epi8(v) & before;
		if (end) {
			*len = 16 * w + (size_t)__builtin_ctz(end);
			*blanks = any_blank != 0;
			*ascii = any_high == 0;
			return 1;
		}
	}
#else
	(void)s;
	(void)avail;
	(void)d;
	(void)len;
	(void)dmask;
	(void)blanks;
	(void)ascii;
#endif
	return 0;
}

