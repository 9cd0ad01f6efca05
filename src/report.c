/* acidlot: CSV report, replicate table and rejected rows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/report.h"

#include <locale.h>
#include <stdint.h>
#include <string.h>

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
 * snprintf decides. tests/unit/test_report.c compares this byte for byte
 * with snprintf on millions of values. */
static size_t
format_g10(double v, char *buf)
{
	static const double pow10[14] = {1e0, 1e1, 1e2,	 1e3,  1e4,  1e5,  1e6,
					 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13};
	double a = v < 0 ? -v : v, p, f;
	uint64_t d;
	int e = 9;
	char digits[10];
	size_t len = 0;

	if (!(a >= 1e-4 && a < 1e10))
		return 0;
	while (e > -4 && (e >= 0 ? a < pow10[e] : a * pow10[-e] < 1.0))
		e--;
	/* e: the largest in -4..9 with 10^e <= a, give or take a rounding
	 * of the comparison, which the range check on p catches */
	p = a * pow10[9 - e];
	if (!(p >= 1e9 && p < 1e10 - 1))
		return 0;
	d = (uint64_t)p;
	f = p - (double)d;
	if (f > 0.49999 && f < 0.50001)
		return 0;
	if (f > 0.5)
		d++;
	for (int i = 9; i >= 0; i--) {
		digits[i] = (char)('0' + d % 10);
		d /= 10;
	}
	if (v < 0)
		buf[len++] = '-';
	{
		int last = 9;

		while (last > 0 && digits[last] == '0')
			last--;
		if (e >= 0) {
			for (int i = 0; i <= e; i++)
				buf[len++] = digits[i];
			if (last > e) {
				buf[len++] = '.';
				for (int i = e + 1; i <= last; i++)
					buf[len++] = digits[i];
			}
		} else {
			buf[len++] = '0';
			buf[len++] = '.';
			for (int i = 0; i < -e - 1; i++)
				buf[len++] = '0';
			for (int i = 0; i <= last; i++)
				buf[len++] = digits[i];
		}
	}
	buf[len] = '\0';
	return len;
}

void
al_format_number(double v, int decimals, int decimal_comma, char *buf,
		 size_t cap)
{
	const char *point;
	char *p;

	if (decimals < 0 && cap >= 32 && format_g10(v, buf) > 0) {
		if (decimal_comma && (p = strchr(buf, '.')) != NULL)
			*p = ',';
		return;
	}
	if (decimals >= 0)
		snprintf(buf, cap, "%.*f", decimals, v);
	else
		snprintf(buf, cap, "%.10g", v);
	/* printf follows LC_NUMERIC; the report does not */
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

static int
put_quoted(FILE *out, const char *s, size_t len, char delimiter, int prefix)
{
	int quote = 0;

	for (size_t i = 0; i < len; i++)
		if (s[i] == delimiter || s[i] == '"' || s[i] == '\r' ||
		    s[i] == '\n')
			quote = 1;
	if (quote && putc('"', out) == EOF)
		return EOF;
	if (prefix && putc('\'', out) == EOF)
		return EOF;
	for (size_t i = 0; i < len; i++) {
		if (s[i] == '"' && putc('"', out) == EOF)
			return EOF;
		if (putc(s[i], out) == EOF)
			return EOF;
	}
	return quote && putc('"', out) == EOF ? EOF : 0;
}

int
al_csv_put_field(FILE *out, const char *s, char delimiter)
{
	return put_quoted(out, s, strlen(s), delimiter ? delimiter : ',', 0);
}

int
al_csv_put_text(FILE *out, const char *s, size_t len, al_report_options *opt)
{
	int guard = len > 0 && !opt->raw_text && strchr("=+-@\t\r", s[0]);

	if (guard)
		opt->guarded++;
	return put_quoted(out, s, len, delim_of(opt), guard);
}

static void
text(FILE *out, const char *s, al_report_options *opt)
{
	putc(delim_of(opt), out);
	al_csv_put_text(out, s, strlen(s), opt);
}

static void
number(FILE *out, int defined, double v, int decimals,
       const al_report_options *opt)
{
	char buf[64];

	putc(delim_of(opt), out);
	if (!defined)
		return;
	al_format_number(v, decimals, opt->decimal_comma, buf, sizeof buf);
	fputs(buf, out);
}

/* A header line from comma-separated names, in the delimiter asked for. */
static void
header(FILE *out, const char *names, const al_report_options *opt)
{
	if (opt->bom)
		fputs("\xEF\xBB\xBF", out);
	for (; *names; names++)
		putc(*names == ',' ? delim_of(opt) : *names, out);
	putc('\n', out);
}

al_status
al_report_write(FILE *out, const al_assay *run, al_report_options *opt)
{
	size_t n = al_assay_group_count(run);
	int dec = opt->decimals;
	char d = delim_of(opt);

	header(out,
	       opt->report_id ? "product,lot,sample,acid,unit,n,mean,sd,rsd_pct,"
				"ci95_low,ci95_high,spec_min,spec_max,status,"
				"flags,median,grubbs_g,dixon_q,range,"
				"critical_range,horrat,u,U,k,brix,brix_corrected,"
				"brix_acid_ratio,water_pct,basis,report_id"
			      : "product,lot,sample,acid,unit,n,mean,sd,rsd_pct,"
				"ci95_low,ci95_high,spec_min,spec_max,status,"
				"flags,median,grubbs_g,dixon_q,range,"
				"critical_range,horrat,u,U,k,brix,brix_corrected,"
				"brix_acid_ratio,water_pct,basis",
	       opt);
	for (size_t i = 0; i < n; i++) {
		const al_group_result *r = al_assay_result(run, i);
		const al_spec *sp = r->spec;
		char flags[512];

		al_csv_put_text(out, r->product, strlen(r->product), opt);
		text(out, r->lot, opt);
		text(out, r->sample, opt);
		putc(d, out);
		al_csv_put_field(out, r->acid->name, d);
		putc(d, out);
		al_csv_put_field(out, al_unit_name(r->unit), d);
		fprintf(out, "%c%zu", d, r->stats.n);
		number(out, r->stats.n > 0, r->stats.mean, dec, opt);
		number(out, r->stats.has_sd, r->stats.sd, dec, opt);
		number(out, r->stats.has_rsd, r->stats.rsd_pct, dec, opt);
		number(out, r->stats.has_sd, r->stats.ci_low, dec, opt);
		number(out, r->stats.has_sd, r->stats.ci_high, dec, opt);
		number(out, sp && sp->has_min, sp ? sp->min : 0, dec, opt);
		number(out, sp && sp->has_max, sp ? sp->max : 0, dec, opt);
		fprintf(out, "%c%s%c", d, al_verdict_name(r->verdict), d);
		al_flags_format(r->flags, r->endpoint_ph_needed, flags,
				sizeof flags);
		al_csv_put_field(out, flags, d);
		number(out, r->has_median, r->median, dec, opt);
		/* screens are ratios: never rounded to the report's decimals */
		number(out, r->has_grubbs, r->grubbs_g, -1, opt);
		number(out, r->has_dixon, r->dixon_q, -1, opt);
		number(out, r->stats.n > 1, r->range, dec, opt);
		number(out, r->has_critical_range, r->critical_range, dec, opt);
		number(out, r->has_horrat, r->horrat, -1, opt);
		number(out, r->has_u, r->u, -1, opt);
		number(out, r->has_u, r->U, -1, opt);
		number(out, r->has_u, r->k, -1, opt);
		number(out, r->has_brix, r->brix, -1, opt);
		number(out, r->has_brix_corrected, r->brix_corrected, -1, opt);
		number(out, r->has_ratio, r->ratio, dec < 0 ? -1 : 2, opt);
		number(out, r->has_water, r->water_pct, -1, opt);
		fprintf(out, "%c%s", d, r->anhydrous ? "anhydrous" : "as-is");
		if (opt->report_id)
			fprintf(out, "%c%s-%04zu", d, opt->report_id, i + 1);
		putc('\n', out);
	}
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_replicates_header(FILE *out, al_report_options *opt)
{
	header(out, "file,line,product,lot,sample,replicate,meq,value,unit,flags",
	       opt);
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_replicates_row(FILE *out, const al_replicate *rep, al_report_options *opt)
{
	char flags[256], d = delim_of(opt);

	al_csv_put_text(out, rep->file, strlen(rep->file), opt);
	fprintf(out, "%c%lu", d, rep->line);
	text(out, rep->product, opt);
	text(out, rep->lot, opt);
	text(out, rep->sample, opt);
	text(out, rep->replicate, opt);
	/* meq keeps full digits: it is the raw amount titrated */
	number(out, 1, rep->meq, -1, opt);
	number(out, 1, rep->value, opt->decimals, opt);
	fprintf(out, "%c%s%c", d, al_unit_name(rep->unit), d);
	al_flags_format(rep->flags, rep->endpoint_ph_needed, flags,
			sizeof flags);
	al_csv_put_field(out, flags, d);
	putc('\n', out);
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_rejects_header(FILE *out, al_report_options *opt)
{
	header(out, "file,line,reason,record", opt);
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_rejects_row(FILE *out, const char *file, unsigned long line,
	       const char *reason, const char *raw, size_t raw_len,
	       al_report_options *opt)
{
	char d = delim_of(opt);

	al_csv_put_text(out, file, strlen(file), opt);
	fprintf(out, "%c%lu%c", d, line, d);
	al_csv_put_field(out, reason, d);
	putc(d, out);
	/* the record as read, in one field; guarded like any text copied
	 * from the input unless raw_text */
	al_csv_put_text(out, raw, raw_len, opt);
	putc('\n', out);
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_budget_write(FILE *out, const al_assay *run, al_report_options *opt)
{
	char d = delim_of(opt);

	header(out,
	       "product,lot,sample,component,value,unit,standard_uncertainty,"
	       "sensitivity,contribution,share_pct",
	       opt);
	for (size_t i = 0; i < al_assay_group_count(run); i++) {
		const al_group_result *r = al_assay_result(run, i);

		for (size_t j = 0; r->has_u && j < r->n_budget; j++) {
			const al_gum_term *t = &r->budget[j];

			al_csv_put_text(out, r->product, strlen(r->product), opt);
			text(out, r->lot, opt);
			text(out, r->sample, opt);
			putc(d, out);
			al_csv_put_field(out, t->name, d);
			number(out, 1, t->value, -1, opt);
			fprintf(out, "%c%s", d, t->unit);
			number(out, 1, t->u, -1, opt);
			number(out, 1, t->sensitivity, -1, opt);
			number(out, 1, t->contribution, -1, opt);
			number(out, 1,
			       r->u > 0 ? 100 * t->contribution * t->contribution /
						  (r->u * r->u)
					: 0,
			       3, opt);
			putc('\n', out);
		}
	}
	return ferror(out) ? AL_EIO : AL_OK;
}
