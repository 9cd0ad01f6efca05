/* acidlot: a judged run as a person reads it (see screen.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/screen.h"

#include <string.h>

#include "acidlot/number.h"
#include "acidlot/report.h"
#include "acidlot/text.h"

void
al_screen_reasons(const al_group_result *r, char *buf, size_t cap)
{
	size_t len = 0;

	buf[0] = '\0';
	if (r->verdict == AL_VERDICT_PASS)
		return;
	if (r->verdict == AL_VERDICT_NO_SPEC)
		len += (size_t)snprintf(buf, cap, "no specification%s%s",
					r->product[0] ? " for " : "",
					r->product);
	if (r->verdict == AL_VERDICT_COND_PASS ||
	    r->verdict == AL_VERDICT_COND_FAIL)
		len += (size_t)snprintf(buf, cap,
					"within the guard band of a limit");
	al_flags_words(r->flags, buf, cap, len < cap ? len : cap - 1);
}

/* The result and its expanded uncertainty: "4.968 ± 0.023", or the
 * mean alone when it has no uncertainty. */
static void
result_text(const al_group_result *r, int decimals, char *buf, size_t cap)
{
	char val[64], unc[64];

	if (r->stats.n == 0) {
		snprintf(buf, cap, "-");
		return;
	}
	if (decimals < 0 && r->has_u &&
	    al_round_to_u(r->stats.mean, r->U, val, sizeof val, unc,
			  sizeof unc) >= 0) {
		snprintf(buf, cap, "%s \u00b1 %s", val, unc);
		return;
	}
	al_format_number(r->stats.mean, decimals, 0, val, sizeof val);
	if (r->has_u) {
		al_format_number(r->U, decimals, 0, unc, sizeof unc);
		snprintf(buf, cap, "%s \u00b1 %s", val, unc);
	} else
		snprintf(buf, cap, "%s", val);
}

/* The decimals a formatted number shows. */
static size_t
decimals_of(const char *s)
{
	const char *dot = strchr(s, '.');

	return dot ? strlen(dot + 1) : 0;
}

/* s padded with zeros to show d decimals ("2" -> "2.0" beside "1.6"). */
static void
pad_decimals(char *s, size_t cap, size_t d)
{
	size_t have = decimals_of(s), len = strlen(s);

	if (have >= d || len + 1 + d - have >= cap)
		return;
	if (have == 0)
		s[len++] = '.';
	while (have++ < d)
		s[len++] = '0';
	s[len] = '\0';
}

/* The specification's limits: "0.7 to 1.0", ">= 0.7", "<= 1.0", "-";
 * both limits to the same decimals, as a specification writes them
 * (its file may say 2.0, which reads back as 2). */
static void
limits_text(const al_spec *sp, char *buf, size_t cap)
{
	char lo[64], hi[64];
	size_t d;

	if (sp == NULL || (!sp->has_min && !sp->has_max)) {
		snprintf(buf, cap, "-");
		return;
	}
	al_format_number(sp->min, -1, 0, lo, sizeof lo);
	al_format_number(sp->max, -1, 0, hi, sizeof hi);
	d = decimals_of(lo) > decimals_of(hi) ? decimals_of(lo) : decimals_of(hi);
	pad_decimals(lo, sizeof lo, d);
	pad_decimals(hi, sizeof hi, d);
	if (sp->has_min && sp->has_max)
		snprintf(buf, cap, "%s to %s", lo, hi);
	else
		snprintf(buf, cap, "%s %s", sp->has_min ? ">=" : "<=",
			 sp->has_min ? lo : hi);
}

enum { F_PRODUCT, F_LOT, F_SAMPLE, F_N, F_RESULT, F_UNIT, F_LIMITS,
       F_STATUS, F_REASONS, F_COUNT };

/* The fields of result i's line. */
static void
line_fields(const al_assay *run, size_t i, const al_screen_options *opt,
	    char f[F_COUNT][512])
{
	const al_group_result *r = al_assay_result(run, i);

	snprintf(f[F_PRODUCT], 512, "%s", r->product);
	snprintf(f[F_LOT], 512, "%s", r->lot);
	snprintf(f[F_SAMPLE], 512, "%s", r->sample);
	snprintf(f[F_N], 512, "%zu", r->stats.n);
	result_text(r, opt->decimals, f[F_RESULT], 512);
	snprintf(f[F_UNIT], 512, "%s %s", al_unit_name(r->unit),
		 r->acid ? r->acid->name : "");
	limits_text(r->spec, f[F_LIMITS], 512);
	snprintf(f[F_STATUS], 512, "%s", al_verdict_name(r->verdict));
	al_screen_reasons(r, f[F_REASONS], 512);
}

static const char *
colour_of(const char *status)
{
	if (strcmp(status, "pass") == 0)
		return "\033[32m";
	if (strcmp(status, "fail") == 0 || strcmp(status, "conditional-fail") == 0)
		return "\033[31m";
	if (strcmp(status, "no-spec") == 0)
		return "";
	return "\033[33m";
}

/* One line: the fields padded to their columns' widths, with no blank
 * at its end. */
static void
put_line(FILE *out, char f[F_COUNT][512], const size_t *width, int colour)
{
	int last = F_COUNT - 1;

	while (last > 0 && f[last][0] == '\0')
		last--;
	for (int k = 0; k <= last; k++) {
		const char *c = k == F_STATUS && colour ? colour_of(f[k]) : "";
		size_t pad = k < last ? width[k] - al_utf8_width(f[k]) + 2 : 0;

		fprintf(out, "%s%s%s%*s", c, f[k], *c ? "\033[0m" : "",
			(int)pad, "");
	}
	fputc('\n', out);
}

al_status
al_screen_write(FILE *out, const al_assay *run, const al_screen_options *opt)
{
	char f[F_COUNT][512];
	char head[F_COUNT][512] = {"product", "lot",    "sample",
					  "n",	     "result", "unit",
					  "limits",  "status", "reasons"};
	size_t width[F_COUNT], n = al_assay_group_count(run);

	for (int k = 0; k < F_COUNT; k++)
		width[k] = al_utf8_width(head[k]);
	for (size_t i = 0; i < n; i++) {
		line_fields(run, i, opt, f);
		for (int k = 0; k < F_COUNT; k++)
			if (al_utf8_width(f[k]) > width[k])
				width[k] = al_utf8_width(f[k]);
	}
	put_line(out, head, width, 0);
	for (size_t i = 0; i < n; i++) {
		line_fields(run, i, opt, f);
		put_line(out, f, width, opt->colour);
	}
	return fflush(out) == 0 && !ferror(out) ? AL_OK : AL_EIO;
}
