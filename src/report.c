/* acidlot: CSV report, replicate table and rejected rows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/report.h"

#include <locale.h>
#include <math.h>
#include <stdint.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/csvwrite.h"
#include "lanes.h"

static char
delim_of(const al_report_options *opt)
{
	if (opt == NULL || opt->delimiter == 0)
		return opt && opt->decimal_comma ? ';' : ',';
	return opt->delimiter;
}

/* %.10g without printf, for the values where the digits are certain;
 * returns the length written, or 0 to leave the value to snprintf.
 *
 * For 1e-4 <= |v| < 1e10, %.10g prints the ten significant digits of
 * |v| rounded to nearest, in fixed notation, trailing zeros dropped.
 * P = |v| 10^(9-e), with 10^e <= |v| < 10^(e+1), multiplies by an exact
 * power of ten (k = 9 - e lies in 0..13 and 10^k <= 10^22 is exact), so
 * P is within half an ulp of the exact product: under 2^-53 P < 1.2e-6
 * for P < 1e10. When P's fraction is more than 1e-5 away from one half,
 * rounding P gives the same integer as rounding the exact product,
 * hence the same digits as printf; otherwise, and when P leaves
 * [1e9, 1e10) (a power of ten misjudged, or a carry to eleven digits),
 * snprintf decides. tests/unit/test_number.c compares this byte for byte
 * with snprintf on millions of values. */
static size_t
format_g10(double v, char *buf)
{
	static const double pow10[14] = {1e0, 1e1, 1e2,	 1e3,  1e4,  1e5,  1e6,
					 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13};
	double a = v < 0 ? -v : v, p, f;
	uint64_t d;
	int e, last;
	char digits[32] = {0};
	size_t len;

	if (!(a >= 1e-4 && a < 1e10))
		return 0;
	/* e from the binary exponent: a in [2^b, 2^(b+1)) gives
	 * floor(b log10 2) <= log10 a < that + 2, so e is that or one more;
	 * try the larger first. A misjudged e leaves p outside [1e9, 1e10),
	 * which the range check below hands to snprintf. */
	{
		uint64_t bits;
		int b;

		memcpy(&bits, &a, sizeof bits);
		b = (int)((bits >> 52) & 0x7ff) - 1023;
		/* floor(b log10 2) as floor(b 1233 / 4096), the same for
		 * |b| < 681 (here -14 <= b <= 33), without a libm call */
		e = ((b + 4096) * 1233) / 4096 - 1233 + 1;
		if (e > 9)
			e = 9;
		if (e < -4)
			e = -4;
		p = a * pow10[9 - e];
		if (p < 1e9 && e > -4) {
			e--;
			p = a * pow10[9 - e];
		}
	}
	if (!(p >= 1e9 && p < 1e10 - 1))
		return 0;
	d = (uint64_t)p;
	f = p - (double)d;
	if (f > 0.49999 && f < 0.50001)
		return 0;
	if (f > 0.5)
		d++;
	/* The ten digits, high first, in bytes 0..9 of a 32-byte buffer:
	 * d = 100000000 h + l, and l's eight digits are made in one 64-bit
	 * word, split into halves of four, quarters of two and digits, each
	 * a multiply and shift (exact for the ranges below 10^4 and 100). The
	 * buffer's spare bytes let the copies below be of a fixed 16 bytes,
	 * which the compiler makes single stores. */
	{
		uint32_t h = (uint32_t)(d / 100000000);
		uint64_t l = d % 100000000, w, q;

		w = (l / 10000) | ((l % 10000) << 32);
		q = ((w * 10486) >> 20) & 0x0000007F0000007FULL; /* / 100 */
		w = q | ((w - 100 * q) << 16);
		q = ((w * 103) >> 10) & 0x000F000F000F000FULL; /* / 10 */
		w = q | ((w - 10 * q) << 8);
		/* the last nonzero digit: l's zero digits at its low end are
		 * zero bytes at the top of w (byte 0 is l's first digit) */
		last = w ? 9 - __builtin_clzll(w) / 8 : (h % 10 ? 1 : 0);
		w += 0x3030303030303030ULL;
		digits[0] = (char)('0' + h / 10);
		digits[1] = (char)('0' + h % 10);
		memcpy(digits + 2, &w, 8);
	}
	buf[0] = '-';
	len = v < 0;
	if (e >= 0) {
		/* e + 1 digits, then the point and the rest if any is not 0 */
		memcpy(buf + len, digits, 16);
		len += (size_t)e + 1;
		if (last > e) {
			buf[len] = '.';
			memcpy(buf + len + 1, digits + e + 1, 16);
			len += (size_t)(last - e) + 1;
		}
	} else {
		/* "0.", -e - 1 zeros, the digits up to the last not 0 */
		memcpy(buf + len, "0.000000", 8);
		len += (size_t)(1 - e);
		memcpy(buf + len, digits, 16);
		len += (size_t)last + 1;
	}
	buf[len] = '\0';
	return len;
}

/* format_g10 with a decimal comma when asked: at most 17 bytes and a
 * NUL; the length, or 0 to leave the value to snprintf. */
static size_t
put_g10(double v, int decimal_comma, char *buf)
{
	size_t n = format_g10(v, buf);
	char *p;

	if (n > 0 && decimal_comma && (p = memchr(buf, '.', n)) != NULL)
		*p = ',';
	return n;
}

/* al_format_number with the locale's decimal point given (NULL: looked
 * up), so that threads need not call localeconv. */
static void
format_number(double v, int decimals, int decimal_comma, const char *point,
	      char *buf, size_t cap)
{
	char *p;

	/* fixed decimals only below 1e15, where a double's 15-17 digits
	 * still cover the integer part: beyond, %f would print the binary
	 * value's digits that no input had (and outgrow the buffer) */
	if (!(fabs(v) < 1e15))
		decimals = -1;
	if (decimals == -1 && cap >= 32 && put_g10(v, decimal_comma, buf) > 0)
		return;
	if (decimals >= 0)
		snprintf(buf, cap, "%.*f", decimals, v);
	else
		al_format_sig(v, decimals == AL_DECIMALS_EXACT ? 17 : 10, buf,
			      cap);
	/* printf follows LC_NUMERIC; the report does not */
	if (point == NULL)
		point = localeconv()->decimal_point;
	if (point[0] != '.' || point[1] != '\0') {
		p = strstr(buf, point);
		if (p != NULL) {
			size_t pl = strlen(point);

			*p = '.';
			memmove(p + 1, p + pl, strlen(p + pl) + 1);
		}
	}
	if (decimal_comma && (p = strchr(buf, '.')) != NULL)
		*p = ',';
}

void
al_format_number(double v, int decimals, int decimal_comma, char *buf,
		 size_t cap)
{
	format_number(v, decimals, decimal_comma, NULL, buf, cap);
}

/* Output through one buffer of our own: a report line is dozens of
 * small pieces, and stdio's per-call locking costs more than the bytes.
 * Write errors show in ferror(out), checked once at the end. A sink
 * without a file fills its buffer only, and says so in `full` when a
 * piece did not fit (the report's second thread, below). */
struct sink {
	FILE *out;
	char *buf;
	size_t len, cap;
	int full;
	unsigned long guarded; /* text cells guarded (put_text) */
	const char *point;     /* the locale's decimal point, for printf's
				  numbers */
};

#define SINK_BYTES (1 << 16)

static void
sink_open(struct sink *k, FILE *out, char *buf, size_t cap)
{
	k->out = out;
	k->buf = buf;
	k->len = 0;
	k->cap = cap;
	k->full = 0;
	k->guarded = 0;
	/* a sink without a file is the second thread's: its caller sets
	 * the point (localeconv is not for threads) */
	k->point = out ? localeconv()->decimal_point : NULL;
}

static void
sink_flush(struct sink *k)
{
	if (k->len && k->out)
		fwrite(k->buf, 1, k->len, k->out);
	k->len = 0;
}

/* sink_put and sink_char when the piece does not fit: flush, or for
 * the second thread's sink, say that it is full */
static void
sink_put_slow(struct sink *k, const char *s, size_t n)
{
	if (k->out == NULL) {
		k->full = 1;
		return;
	}
	sink_flush(k);
	if (n >= k->cap) {
		fwrite(s, 1, n, k->out);
		return;
	}
	memcpy(k->buf + k->len, s, n);
	k->len += n;
}

/* The two calls a report line makes some sixty times: inline, so that a
 * delimiter costs a store, not a call (issue 7) */
#define SINK_INLINE static inline __attribute__((always_inline))

SINK_INLINE void
sink_put(struct sink *k, const char *s, size_t n)
{
	if (n > k->cap - k->len) {
		sink_put_slow(k, s, n);
		return;
	}
	memcpy(k->buf + k->len, s, n);
	k->len += n;
}

SINK_INLINE void
sink_char(struct sink *k, char c)
{
	if (k->len == k->cap) {
		sink_put_slow(k, &c, 1);
		return;
	}
	k->buf[k->len++] = c;
}

static void
sink_str(struct sink *k, const char *s)
{
	sink_put(k, s, strlen(s));
}

static void
sink_ulong(struct sink *k, unsigned long v)
{
	char tmp[24];
	size_t i = sizeof tmp;

	do {
		tmp[--i] = (char)('0' + v % 10);
		v /= 10;
	} while (v);
	sink_put(k, tmp + i, sizeof tmp - i);
}

/* Writes s as one CSV field, quoted as RFC 4180 asks; with guard, a '
 * goes before every piece that starts a formula (al_csv_formula_at). The count of
 * guards written. */
static unsigned long
put_quoted(struct sink *k, const char *s, size_t len, char delimiter,
	   int guard)
{
	/* the bytes that make a field quoted: CR, LF, the quote (and the
	 * delimiter, compared on its own) */
	static const unsigned char special[256] = {['\r'] = 1, ['\n'] = 1,
						   ['"'] = 2};
	int quote = 0, quotes = 0, risky = 0;
	unsigned long guards = 0;

	for (size_t i = 0; i < len; i++) {
		unsigned char c = (unsigned char)s[i];

		if (special[c] | (s[i] == delimiter)) {
			quote = 1;
			if (special[c] == 2)
				quotes = 1;
		}
		risky |= guard && al_csv_formula_at(s, len, i);
	}
	if (quote)
		sink_char(k, '"');
	if (!quotes && !risky)
		sink_put(k, s, len);
	else
		for (size_t i = 0; i < len; i++) {
			if (risky && al_csv_formula_at(s, len, i)) {
				sink_char(k, '\'');
				guards++;
			}
			if (s[i] == '"')
				sink_char(k, '"');
			sink_char(k, s[i]);
		}
	if (quote)
		sink_char(k, '"');
	return guards;
}

static void
put_text(struct sink *k, const char *s, size_t len, al_report_options *opt)
{
	k->guarded += put_quoted(k, s, len, delim_of(opt), !opt->raw_text) > 0;
}

int
al_csv_put_text(FILE *out, const char *s, size_t len, al_report_options *opt)
{
	char kb[SINK_BYTES];
	struct sink k;

	sink_open(&k, out, kb, sizeof kb);
	put_text(&k, s, len, opt);
	opt->guarded += k.guarded;
	sink_flush(&k);
	return ferror(out) ? EOF : 0;
}

static void
text(struct sink *k, const char *s, al_report_options *opt)
{
	sink_char(k, delim_of(opt));
	put_text(k, s, strlen(s), opt);
}

static void
field(struct sink *k, const char *s, char d)
{
	sink_char(k, d);
	put_quoted(k, s, strlen(s), d, 0);
}

static void
number(struct sink *k, char d, int defined, double v, int decimals,
       const al_report_options *opt)
{
	char buf[128];
	size_t n;

	sink_char(k, d);
	if (!defined)
		return;
	/* the usual case straight into the sink */
	if (decimals == -1 && k->cap - k->len >= 32 &&
	    (n = put_g10(v, opt->decimal_comma, k->buf + k->len)) > 0) {
		k->len += n;
		return;
	}
	format_number(v, decimals, opt->decimal_comma, k->point, buf,
		      sizeof buf);
	sink_str(k, buf);
}

/* A column whose value repeats from row to row (a specification's
 * limits, the coverage factor): the text of its last value, kept by the
 * caller and written again while the value's bits are the same. */
struct number_memo {
	int valid, decimals;
	uint64_t bits;
	size_t len;
	char text[128];
};

static void
number_memo(struct sink *k, char d, int defined, double v, int decimals,
	    const al_report_options *opt, struct number_memo *m)
{
	uint64_t bits;

	sink_char(k, d);
	if (!defined)
		return;
	memcpy(&bits, &v, sizeof bits);
	if (!m->valid || m->bits != bits || m->decimals != decimals) {
		format_number(v, decimals, opt->decimal_comma, k->point,
			      m->text, sizeof m->text);
		m->len = strlen(m->text);
		m->bits = bits;
		m->decimals = decimals;
		m->valid = 1;
	}
	sink_put(k, m->text, m->len);
}

/* The same for a text column whose value repeats (the acid, the unit,
 * the flags): its quoted text, kept under two keys that tell the value
 * (a name's address, or the flag bits and the endpoint pH's bits). */
struct text_memo {
	int valid;
	uint64_t key[2];
	size_t len;
	char text[1100]; /* flags of up to 511 bytes, every one doubled */
};

/* Writes the delimiter and the memo's text when the keys match;
 * returns 0 when they do not. */
static int
text_memo_hit(struct sink *k, char d, const struct text_memo *m,
	      uint64_t key0, uint64_t key1)
{
	if (!m->valid || m->key[0] != key0 || m->key[1] != key1)
		return 0;
	sink_char(k, d);
	sink_put(k, m->text, m->len);
	return 1;
}

/* field(), from the memo when its keys match, else keeping the quoted
 * text of s in it under the keys. */
static void
field_memo(struct sink *k, const char *s, char d, struct text_memo *m,
	   uint64_t key0, uint64_t key1)
{
	struct sink t;

	if (text_memo_hit(k, d, m, key0, key1))
		return;
	sink_open(&t, NULL, m->text, sizeof m->text);
	put_quoted(&t, s, strlen(s), d, 0);
	m->valid = !t.full;
	m->key[0] = key0;
	m->key[1] = key1;
	m->len = t.len;
	if (!text_memo_hit(k, d, m, key0, key1))
		field(k, s, d);
}

/* A header line from comma-separated names, in the delimiter asked for. */
static void
header(struct sink *k, const char *names, const al_report_options *opt)
{
	if (opt->bom)
		sink_str(k, "\xEF\xBB\xBF");
	for (; *names; names++)
		sink_char(k, *names == ',' ? delim_of(opt) : *names);
	sink_char(k, '\n');
}

static al_status
done(struct sink *k, al_report_options *opt)
{
	opt->guarded += k->guarded;
	sink_flush(k);
	return ferror(k->out) ? AL_EIO : AL_OK;
}

/* The report_id cell: the run's id and the row number, as "%c%s-%04zu"
 * would print them. */
static void
put_report_id(struct sink *k, char d, const char *id, size_t id_len,
	      size_t row)
{
	sink_char(k, d);
	sink_put(k, id, id_len);
	sink_char(k, '-');
	for (size_t w = 1000; w > row && w > 1; w /= 10)
		sink_char(k, '0');
	sink_ulong(k, (unsigned long)row);
}

/* The report's lines for results [begin, end), evaluated by rd (NULL:
 * the run's own, al_assay_result). */
static void
put_results(struct sink *k, const al_assay *run, al_assay_reader *rd,
	    size_t begin, size_t end, const al_report_options *opt)
{
	int dec = opt->decimals;
	char d = delim_of(opt);
	/* put_text only counts in the sink; nothing else changes opt */
	al_report_options *o = (al_report_options *)opt;
	size_t id_len = opt->report_id ? strlen(opt->report_id) : 0;
	struct number_memo memo[3] = {{0}};
	/* acid, unit, flags: in the caller's stack (3 KiB) */
	struct text_memo names[3];
	uint64_t ph_bits;

	names[0].valid = names[1].valid = names[2].valid = 0;

	for (size_t i = begin; i < end; i++) {
		const al_group_result *r = rd ? al_assay_reader_result(rd, i)
					      : al_assay_result(run, i);
		const al_spec *sp = r->spec;
		char flags[512];
		/* the decimals and step of the figures in the result's unit */
		double step = 0, U = r->U;
		int ud = opt->round_u && r->has_u ? al_u_place(r->U, &step, &U)
						  : dec;

		put_text(k, r->product, strlen(r->product), o);
		text(k, r->lot, o);
		text(k, r->sample, o);
		field_memo(k, r->acid->name, d, &names[0],
			   (uintptr_t)r->acid->name, 0);
		field_memo(k, al_unit_name(r->unit), d, &names[1],
			   (uint64_t)r->unit, 0);
		sink_char(k, d);
		sink_ulong(k, (unsigned long)r->stats.n);
		number(k, d, r->stats.n > 0, al_round_to_step(r->stats.mean, step),
		       ud, opt);
		number(k, d, r->stats.has_sd, al_round_to_step(r->stats.sd, step),
		       ud, opt);
		number(k, d, r->stats.has_rsd, r->stats.rsd_pct, dec, opt);
		number(k, d, r->stats.has_sd,
		       al_round_to_step(r->stats.ci_low, step), ud, opt);
		number(k, d, r->stats.has_sd,
		       al_round_to_step(r->stats.ci_high, step), ud, opt);
		number_memo(k, d, sp && sp->has_min, sp ? sp->min : 0, dec, opt,
			    &memo[0]);
		number_memo(k, d, sp && sp->has_max, sp ? sp->max : 0, dec, opt,
			    &memo[1]);
		sink_char(k, d);
		sink_str(k, al_verdict_name(r->verdict));
		memcpy(&ph_bits, &r->endpoint_ph_needed, sizeof ph_bits);
		/* the flags text is made only when the memo lacks it */
		if (!text_memo_hit(k, d, &names[2], r->flags, ph_bits)) {
			al_flags_format(r->flags, r->endpoint_ph_needed, flags,
					sizeof flags);
			field_memo(k, flags, d, &names[2], r->flags, ph_bits);
		}
		number(k, d, r->has_median, al_round_to_step(r->median, step), ud,
		       opt);
		number(k, d, r->has_grubbs, r->grubbs_g, dec, opt);
		number(k, d, r->has_dixon, r->dixon_q, dec, opt);
		number(k, d, r->stats.n > 1, al_round_to_step(r->range, step), ud,
		       opt);
		number(k, d, r->has_critical_range,
		       al_round_to_step(r->critical_range, step), ud, opt);
		number(k, d, r->has_horrat, r->horrat, dec, opt);
		number(k, d, r->has_u, al_round_to_step(r->u, step), ud, opt);
		number(k, d, r->has_u, U, ud, opt);
		number_memo(k, d, r->has_u, r->k, dec, opt, &memo[2]);
		number(k, d, r->has_brix, r->brix, dec, opt);
		number(k, d, r->has_brix_corrected, r->brix_corrected, dec, opt);
		number(k, d, r->has_ratio, r->ratio, dec, opt);
		number(k, d, r->has_water, r->water_pct, dec, opt);
		sink_char(k, d);
		sink_str(k, r->anhydrous ? "anhydrous" : "as-is");
		if (opt->report_id)
			put_report_id(k, d, opt->report_id, id_len, i + 1);
		sink_char(k, '\n');
	}
}

/* A report of many results is written by two threads (lanes.h): the
 * caller formats the even chunks of results, a second thread the odd
 * ones into a buffer that the caller then writes, so the bytes are those
 * of one thread. A chunk that does not fit its buffer (lines of over
 * 1 KiB on average) is formatted again by the caller. */
#define CHUNK_BYTES (1u << 20)

struct report_job {
	struct sink *k; /* the caller's */
	const al_assay *run;
	al_assay_reader *rd; /* the second thread's */
	const al_report_options *opt;
	struct sink slot[2];
};

static void
report_own(void *ctx, size_t begin, size_t end)
{
	struct report_job *j = ctx;

	put_results(j->k, j->run, NULL, begin, end, j->opt);
}

static void
report_make(void *ctx, size_t begin, size_t end, int s)
{
	struct report_job *j = ctx;
	struct sink *k = &j->slot[s];

	k->len = 0;
	k->full = 0;
	k->guarded = 0;
	put_results(k, j->run, j->rd, begin, end, j->opt);
}

static void
report_take(void *ctx, size_t begin, size_t end, int s)
{
	struct report_job *j = ctx;
	struct sink *k = &j->slot[s];

	if (k->full) {
		report_own(ctx, begin, end);
		return;
	}
	sink_put(j->k, k->buf, k->len);
	j->k->guarded += k->guarded;
}

/* Writes results [0, n) through k, two threads at a time; AL_ENOMEM
 * when the second thread's memory cannot be had. */
static al_status
put_results_2(struct sink *k, const al_assay *run, size_t n,
	      const al_report_options *opt)
{
	struct report_job j;
	al_status st = AL_OK;
	char *buf[2];

	j.k = k;
	j.run = run;
	j.opt = opt;
	j.rd = al_assay_reader_new(run);
	buf[0] = al_malloc(CHUNK_BYTES);
	buf[1] = al_malloc(CHUNK_BYTES);
	if (j.rd != NULL && buf[0] != NULL && buf[1] != NULL) {
		for (int s = 0; s < 2; s++) {
			sink_open(&j.slot[s], NULL, buf[s], CHUNK_BYTES);
			/* localeconv is not for threads: the caller's point */
			j.slot[s].point = k->point;
		}
		al_lanes job = {&j, n, report_own, report_make, report_take};

		al_lanes_run(&job);
	} else {
		st = AL_ENOMEM;
	}
	al_free(buf[0]);
	al_free(buf[1]);
	al_assay_reader_free(j.rd);
	return st;
}

/* The report's columns (and report_id last when the run has one). */
#define REPORT_COLUMNS                                                        \
	"product,lot,sample,acid,unit,n,mean,sd,rsd_pct,ci95_low,ci95_high,"   \
	"spec_min,spec_max,status,flags,median,grubbs_g,dixon_q,range,"        \
	"critical_range,horrat,u,U,k,brix,brix_corrected,brix_acid_ratio,"     \
	"water_pct,basis"

/* A table's sink, opened on kb, and its header line. */
static void
table_start(struct sink *k, FILE *out, char *kb, size_t cap,
	    const char *names, al_report_options *opt)
{
	sink_open(k, out, kb, cap);
	header(k, names, opt);
}

al_status
al_report_write(FILE *out, const al_assay *run, al_report_options *opt)
{
	static char kb[SINK_BYTES]; /* off the stack */
	struct sink k;
	size_t n = al_assay_group_count(run);

	table_start(&k, out, kb, sizeof kb,
		    opt->report_id ? REPORT_COLUMNS ",report_id" : REPORT_COLUMNS,
		    opt);
	if (n >= AL_LANES_MIN && opt->threads != 1) {
		if (put_results_2(&k, run, n, opt) != AL_OK) {
			sink_flush(&k);
			return AL_ENOMEM;
		}
	} else {
		put_results(&k, run, NULL, 0, n, opt);
	}
	return done(&k, opt);
}

/* A file that starts with a header line only. */
static al_status
header_only(FILE *out, const char *names, al_report_options *opt)
{
	char kb[SINK_BYTES];
	struct sink k;

	table_start(&k, out, kb, sizeof kb, names, opt);
	return done(&k, opt);
}

al_status
al_replicates_header(FILE *out, al_report_options *opt)
{
	return header_only(out, "file,line,product,lot,sample,replicate,meq,"
				"value,unit,flags,curve,endpoint_mode", opt);
}

al_status
al_replicates_row(FILE *out, const al_replicate *rep, al_report_options *opt)
{
	char flags[256], d = delim_of(opt);
	char kb[SINK_BYTES];
	struct sink k;

	sink_open(&k, out, kb, sizeof kb);
	put_text(&k, rep->file, strlen(rep->file), opt);
	sink_char(&k, d);
	sink_ulong(&k, rep->line);
	text(&k, rep->product, opt);
	text(&k, rep->lot, opt);
	text(&k, rep->sample, opt);
	text(&k, rep->replicate, opt);
	/* meq keeps full digits: it is the raw amount titrated */
	number(&k, d, 1, rep->meq, opt->decimals, opt);
	number(&k, d, 1, rep->value, opt->decimals, opt);
	field(&k, al_unit_name(rep->unit), d);
	al_flags_format(rep->flags, rep->endpoint_ph_needed, flags,
			sizeof flags);
	field(&k, flags, d);
	text(&k, rep->curve ? rep->curve : "", opt);
	text(&k, rep->mode ? rep->mode : "", opt);
	sink_char(&k, '\n');
	return done(&k, opt);
}

al_status
al_rejects_header(FILE *out, al_report_options *opt)
{
	return header_only(out, "file,line,reason,record", opt);
}

al_status
al_rejects_row(FILE *out, const char *file, unsigned long line,
	       const char *reason, const char *raw, size_t raw_len,
	       al_report_options *opt)
{
	char d = delim_of(opt);
	char kb[SINK_BYTES];
	struct sink k;

	sink_open(&k, out, kb, sizeof kb);
	put_text(&k, file, strlen(file), opt);
	sink_char(&k, d);
	sink_ulong(&k, line);
	field(&k, reason, d);
	sink_char(&k, d);
	/* the record as read, in one field; guarded like any text copied
	 * from the input unless raw_text */
	put_text(&k, raw, raw_len, opt);
	sink_char(&k, '\n');
	return done(&k, opt);
}

al_status
al_budget_write(FILE *out, const al_assay *run, al_report_options *opt)
{
	static char kb[SINK_BYTES]; /* off the stack */
	struct sink k;
	char d;

	table_start(&k, out, kb, sizeof kb,
		    "product,lot,sample,component,value,unit,"
		    "standard_uncertainty,sensitivity,contribution,share_pct",
		    opt);
	d = delim_of(opt);
	for (size_t i = 0; i < al_assay_group_count(run); i++) {
		const al_group_result *r = al_assay_result(run, i);

		for (size_t j = 0; r->has_u && j < r->n_budget; j++) {
			const al_gum_term *t = &r->budget[j];

			put_text(&k, r->product, strlen(r->product), opt);
			text(&k, r->lot, opt);
			text(&k, r->sample, opt);
			field(&k, t->name, d);
			number(&k, d, 1, t->value, opt->decimals, opt);
			sink_char(&k, d);
			sink_str(&k, t->unit);
			number(&k, d, 1, t->u, opt->decimals, opt);
			number(&k, d, 1, t->sensitivity, opt->decimals, opt);
			number(&k, d, 1, t->contribution, opt->decimals, opt);
			number(&k, d, 1,
			       r->u > 0 ? 100 * t->contribution * t->contribution /
						  (r->u * r->u)
					: 0,
			       opt->decimals != -1 ? opt->decimals : 3, opt);
			sink_char(&k, '\n');
		}
	}
	return done(&k, opt);
}
