/* acidlot: CSV report and replicate table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/report.h"

#include <locale.h>
#include <string.h>

void
al_format_number(double v, int decimals, char *buf, size_t cap)
{
	const char *point;

	if (decimals >= 0)
		snprintf(buf, cap, "%.*f", decimals, v);
	else
		snprintf(buf, cap, "%.10g", v);
	/* printf follows LC_NUMERIC; the report always uses '.' */
	point = localeconv()->decimal_point;
	if (point[0] != '.' || point[1] != '\0') {
		char *p = strstr(buf, point);

		if (p != NULL) {
			size_t pl = strlen(point);

			*p = '.';
			memmove(p + 1, p + pl, strlen(p + pl) + 1);
		}
	}
}

int
al_csv_put_field(FILE *out, const char *s)
{
	if (strpbrk(s, ",\"\r\n") == NULL)
		return fputs(s, out) < 0 ? EOF : 0;
	if (putc('"', out) == EOF)
		return EOF;
	for (; *s; s++) {
		if (*s == '"' && putc('"', out) == EOF)
			return EOF;
		if (putc(*s, out) == EOF)
			return EOF;
	}
	return putc('"', out) == EOF ? EOF : 0;
}

static void
put_number(FILE *out, int defined, double v, int decimals)
{
	char buf[64];

	putc(',', out);
	if (!defined)
		return;
	al_format_number(v, decimals, buf, sizeof buf);
	fputs(buf, out);
}

al_status
al_report_write(FILE *out, const al_assay *run, const al_report_options *opt)
{
	int dec = opt ? opt->decimals : -1;
	size_t n = al_assay_group_count(run);

	fputs("product,lot,sample,acid,unit,n,mean,sd,rsd_pct,ci95_low,"
	      "ci95_high,spec_min,spec_max,status,flags\n",
	      out);
	for (size_t i = 0; i < n; i++) {
		const al_group_result *r = al_assay_result(run, i);
		const al_spec *sp = r->spec;
		char flags[512];

		al_csv_put_field(out, r->product);
		putc(',', out);
		al_csv_put_field(out, r->lot);
		putc(',', out);
		al_csv_put_field(out, r->sample);
		putc(',', out);
		al_csv_put_field(out, r->acid->name);
		putc(',', out);
		al_csv_put_field(out, al_unit_name(r->unit));
		fprintf(out, ",%zu", r->stats.n);
		put_number(out, r->stats.n > 0, r->stats.mean, dec);
		put_number(out, r->stats.has_sd, r->stats.sd, dec);
		put_number(out, r->stats.has_rsd, r->stats.rsd_pct, dec);
		put_number(out, r->stats.has_sd, r->stats.ci_low, dec);
		put_number(out, r->stats.has_sd, r->stats.ci_high, dec);
		put_number(out, sp && sp->has_min, sp ? sp->min : 0, dec);
		put_number(out, sp && sp->has_max, sp ? sp->max : 0, dec);
		putc(',', out);
		fputs(al_verdict_name(r->verdict), out);
		putc(',', out);
		al_flags_format(r->flags, r->endpoint_ph_needed, flags,
				sizeof flags);
		al_csv_put_field(out, flags);
		putc('\n', out);
	}
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_replicates_header(FILE *out)
{
	fputs("file,line,product,lot,sample,replicate,meq,value,unit,flags\n",
	      out);
	return ferror(out) ? AL_EIO : AL_OK;
}

al_status
al_replicates_row(FILE *out, const al_replicate *rep,
		  const al_report_options *opt)
{
	int dec = opt ? opt->decimals : -1;
	char flags[256];

	al_csv_put_field(out, rep->file);
	fprintf(out, ",%lu,", rep->line);
	al_csv_put_field(out, rep->product);
	putc(',', out);
	al_csv_put_field(out, rep->lot);
	putc(',', out);
	al_csv_put_field(out, rep->sample);
	putc(',', out);
	al_csv_put_field(out, rep->replicate);
	/* meq keeps full digits: it is the raw amount titrated */
	put_number(out, 1, rep->meq, -1);
	put_number(out, 1, rep->value, dec);
	putc(',', out);
	fputs(al_unit_name(rep->unit), out);
	putc(',', out);
	al_flags_format(rep->flags, rep->endpoint_ph_needed, flags,
			sizeof flags);
	al_csv_put_field(out, flags);
	putc('\n', out);
	return ferror(out) ? AL_EIO : AL_OK;
}
