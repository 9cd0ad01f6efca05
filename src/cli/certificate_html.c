/* acidlot command line: the certificate of analysis as HTML
 * (certificate_html.h). The items of ISO/IEC 17025:2017 7.8.2.1 are
 * marked in the comments by their letter; the layout and the words
 * are our own.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _XOPEN_SOURCE 700
#include <stdlib.h>
#include <string.h>

#include "certificate_html.h"
#include "cli.h"
#include "record.h"

/* The stylesheet: a sheet on screen; on paper (A4 or Letter: margins
 * that suit both) the certificate id and "Page N of M" in the bottom
 * margin of every page, and for a draft DRAFT in the top margin. */
static const char style[] =
	"body{font:10.5pt/1.45 \"DejaVu Sans\",\"Liberation Sans\",Arial,"
	"sans-serif;color:#111;margin:0;background:#eee}\n"
	"main{max-width:180mm;margin:8mm auto;background:#fff;"
	"padding:12mm 15mm}\n"
	".lab{border-bottom:1.5pt solid #111;padding-bottom:3mm}\n"
	".lab .name{font-size:15pt;font-weight:bold}\n"
	".lab p{margin:0}\n"
	"h1{font-size:17pt;margin:6mm 0 0}\n"
	".issued{margin:0 0 4mm}\n"
	".draft{border:2pt solid #111;padding:2mm 3mm;font-weight:bold;"
	"letter-spacing:.05em}\n"
	"dl{display:grid;grid-template-columns:38mm 1fr;gap:1mm 4mm;"
	"margin:0 0 4mm}\n"
	"dt{font-weight:bold}dd{margin:0}\n"
	"table{width:100%;border-collapse:collapse}\n"
	"th,td{text-align:left;vertical-align:top;padding:1.5mm 2mm;"
	"border-bottom:.5pt solid #888}\n"
	"th{font-size:9pt;border-bottom:1pt solid #111}\n"
	"td.num{text-align:right;white-space:nowrap;"
	"font-variant-numeric:tabular-nums}\n"
	"td .flags{display:block;font-size:8.5pt;color:#444}\n"
	".no{font-weight:bold}\n"
	".notes{font-size:9.5pt}.notes p{margin:1.5mm 0}\n"
	".sign{margin-top:7mm;border-top:.5pt solid #111;padding-top:2mm}\n"
	"@media print{body{background:none}"
	"main{max-width:none;margin:0;padding:0}"
	"tr,.sign{break-inside:avoid}thead{display:table-header-group}}\n";

static void
put(FILE *out, const char *text)
{
	cli_put_xml(out, text);
}

/* The page box: id and page numbers below, DRAFT above a draft. */
static void
page_box(FILE *out, const store_lot *l, int draft)
{
	/* the id is our own (COA-YYYY-NNNNN): nothing to escape in CSS */
	fprintf(out,
		"@page{margin:18mm 15mm 20mm 15mm;"
		"@bottom-left{content:\"Certificate %s\";font:8.5pt sans-serif}"
		"@bottom-right{content:\"Page \" counter(page) \" of \" "
		"counter(pages);font:8.5pt sans-serif}",
		draft ? "DRAFT" : l->certificate_id);
	if (draft)
		fputs("@top-center{content:\"DRAFT: not approved, not a "
		      "certificate\";font:bold 12pt sans-serif}",
		      out);
	fputs("}\n", out);
}

/* a (title), b (the lab), d (the id), j (date of issue). */
static void
head(FILE *out, const cert_lab *lab, const store_lot *l, int draft)
{
	fputs("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n"
	      "<meta charset=\"utf-8\">\n<title>Certificate of analysis ",
	      out);
	put(out, draft ? "DRAFT" : l->certificate_id);
	fputs(", lot ", out);
	put(out, l->lot);
	fprintf(out, "</title>\n<style>\n%s", style);
	page_box(out, l, draft);
	fputs("</style>\n</head>\n<body>\n<main>\n<header class=\"lab\">\n"
	      "<p class=\"name\">",
	      out);
	put(out, lab->name);
	fputs("</p>\n", out);
	for (int i = 0; i < lab->n_address; i++) {
		fputs("<p>", out);
		put(out, lab->address[i]);
		fputs("</p>\n", out);
	}
	if (lab->accreditation[0]) {
		fputs("<p class=\"accreditation\">", out);
		put(out, lab->accreditation);
		fputs("</p>\n", out);
	}
	fputs("</header>\n<h1>Certificate of analysis</h1>\n"
	      "<p class=\"issued\">Certificate <b class=\"certificate-id\">",
	      out);
	put(out, draft ? "DRAFT" : l->certificate_id);
	fprintf(out, "</b>, %s <span class=\"issue-date\">%.10s</span></p>\n",
		draft ? "drafted" : "issued", l->issued_utc);
	if (draft)
		fputs("<p class=\"draft\">DRAFT: not approved, not issued; not "
		      "a certificate of analysis.</p>\n",
		      out);
}

static void
fact(FILE *out, const char *cls, const char *term, const char *text)
{
	fprintf(out, "<dt>%s</dt><dd class=\"%s\">", term, cls);
	put(out, text);
	fputs("</dd>\n", out);
}

/* The first and last titration dates of the results ("" when none). */
static void
date_span(const store_lot *l, char *buf, size_t cap)
{
	const char *first = NULL, *last = NULL;

	for (size_t i = 0; i < l->n; i++) {
		const char *d = l->results[i].date;

		if (!d[0])
			continue;
		if (!first || strcmp(d, first) < 0)
			first = d;
		if (!last || strcmp(d, last) > 0)
			last = d;
	}
	if (!first)
		snprintf(buf, cap, "%.10s (the run's day; the titrations were "
				   "not dated)",
			 l->started_utc);
	else if (strcmp(first, last) == 0)
		snprintf(buf, cap, "%s", first);
	else
		snprintf(buf, cap, "%s to %s", first, last);
}

/* c (where the work was done), e (customer), f (method), g (the item),
 * i (dates of the work). */
static void
item(FILE *out, const cert_lab *lab, const store_lot *l, const char *customer)
{
	char dates[96], samples[1024] = "", what[160];
	size_t len = 0;

	for (size_t i = 0; i < l->n && len < sizeof samples; i++)
		len += (size_t)snprintf(samples + len, sizeof samples - len,
					"%s%s", i ? ", " : "",
					l->results[i].sample);
	date_span(l, dates, sizeof dates);
	snprintf(what, sizeof what,
		 "Titratable acidity, expressed as %s acid",
		 l->n ? l->results[0].acid : "?");
	fputs("<dl>\n", out);
	if (customer)
		fact(out, "customer", "Customer", customer);
	fact(out, "product", "Product", l->product);
	fact(out, "lot", "Lot", l->lot);
	fact(out, "samples", "Samples", samples);
	fact(out, "quantity", "Measured", what);
	fact(out, "method", "Method", lab->method);
	fact(out, "titration-dates", "Titrated", dates);
	fact(out, "location", "Tested at", lab->address[0]);
	fact(out, "run", "Results of run", l->run_id);
	fputs("</dl>\n", out);
}

/* The statement of conformity of a status (7.8.6); *no set where the
 * result does not conform. */
static const char *
conformity(const char *status, int *no)
{
	static const char *const words[][2] = {
		{"pass", "Conforms to the specification"},
		{"fail", "Does not conform to the specification"},
		{"conditional-pass", "Conforms; conditional: the result lies "
				     "within the guard band of a limit"},
		{"conditional-fail", "Does not conform; conditional: the result "
				     "lies within the guard band of a limit"},
		{"retest", "No statement of conformity: the replicates call "
			   "for a retest"},
		{"no-spec", "No statement of conformity: no specification"},
	};

	*no = strcmp(status, "fail") == 0 ||
	      strcmp(status, "conditional-fail") == 0;
	for (size_t i = 0; i < sizeof words / sizeof words[0]; i++)
		if (strcmp(words[i][0], status) == 0)
			return words[i][1];
	return "No statement of conformity";
}

/* The limits as the specification gives them. */
static void
limits(const store_result *r, char *buf, size_t cap)
{
	char lo[40], hi[40];

	al_format_number(r->spec_min, -1, 0, lo, sizeof lo);
	al_format_number(r->spec_max, -1, 0, hi, sizeof hi);
	if (r->has_min && r->has_max)
		snprintf(buf, cap, "%s to %s %s", lo, hi, r->unit);
	else if (r->has_min)
		snprintf(buf, cap, "at least %s %s", lo, r->unit);
	else if (r->has_max)
		snprintf(buf, cap, "at most %s %s", hi, r->unit);
	else
		snprintf(buf, cap, "none");
}

/* One result's row: m (the result, its unit, U and k). */
static void
result_row(FILE *out, const store_result *r)
{
	char val[64], unc[64], k[40], spec[160];
	int no;
	const char *says = conformity(r->status, &no);

	if (!r->has_mean)
		snprintf(val, sizeof val, "no result");
	else if (!r->has_u || al_round_to_u(r->mean, r->U, val, sizeof val,
					    unc, sizeof unc) < 0) {
		al_format_number(r->mean, -1, 0, val, sizeof val);
		snprintf(unc, sizeof unc, "not evaluated");
	}
	al_format_number(r->k, -1, 0, k, sizeof k);
	limits(r, spec, sizeof spec);
	fputs("<tr><td class=\"sample\">", out);
	put(out, r->sample);
	fputs("</td><td class=\"num result\">", out);
	put(out, val);
	fputs(" ", out);
	put(out, r->unit);
	fputs("</td><td class=\"num uncertainty\">", out);
	if (r->has_u && r->has_mean) {
		fputs("&#177; ", out);
		put(out, unc);
		fputs(" ", out);
		put(out, r->unit);
		fprintf(out, " (k = %s)", k);
	} else
		fputs("not evaluated", out);
	fputs("</td><td class=\"limits\">", out);
	put(out, spec);
	fprintf(out, "</td><td class=\"conformity%s\">", no ? " no" : "");
	put(out, says);
	if (r->flags[0]) {
		fputs("<span class=\"flags\">Flags: ", out);
		for (const char *f = r->flags; *f; f++)
			if (*f == ';')
				fputs(", ", out);
			else
				cli_put_xml(out, (char[]){*f, '\0'});
		fputs("</span>", out);
	}
	fputs("</td></tr>\n", out);
}

static void
results(FILE *out, const store_lot *l)
{
	fputs("<table class=\"results\">\n<thead><tr><th>Sample</th>"
	      "<th>Result</th><th>Expanded uncertainty U</th>"
	      "<th>Specification</th><th>Statement of conformity</th>"
	      "</tr></thead>\n<tbody>\n",
	      out);
	for (size_t i = 0; i < l->n; i++)
		result_row(out, &l->results[i]);
	fputs("</tbody>\n</table>\n", out);
}

/* The run's decision rule, from its command line as the store keeps
 * it: --decision guarded[:R] (R 1 when not given), else simple. */
static int
guarded_r(const char *command, double *r)
{
	const char *at = strstr(command, "--decision");

	*r = 1;
	if (at == NULL)
		return 0;
	at += 10;
	at += strspn(at, " =");
	if (strncmp(at, "guarded", 7) != 0)
		return 0;
	if (at[7] == ':')
		*r = strtod(at + 8, NULL);
	return 1;
}

/* The coverage, the decision rule (7.8.6), that the results relate
 * only to the items tested (l), a replaced certificate (7.8.8), the
 * lab's own statements. */
static void
notes(FILE *out, const cert_lab *lab, const store_lot *l)
{
	double r;
	const record_rule *rule = record_rule_of(guarded_r(l->command, &r));

	fputs("<section class=\"notes\">\n<p class=\"coverage\">Each result "
	      "is the mean of its replicate titrations, rounded to the "
	      "decimal place of its expanded uncertainty U, given to two "
	      "significant digits (JCGM 100:2008, GUM 7.2.6). U is the "
	      "combined standard uncertainty multiplied by the coverage "
	      "factor k shown; with k = 2 the interval result &#177; U is "
	      "expected to hold about 95 % of the values that could "
	      "reasonably be attributed to the titratable acidity.</p>\n"
	      "<p class=\"decision-rule\">Decision rule: ",
	      out);
	put(out, rule->name);
	if (strcmp(rule->name, "guarded acceptance") == 0)
		fprintf(out, " with the guard band w = %g U", r);
	fputs(" (", out);
	put(out, rule->reference);
	fputs("): ", out);
	put(out, rule->statement);
	fputs(".</p>\n<p class=\"items-tested\">The results relate only to "
	      "the items tested, as received by the laboratory; the "
	      "laboratory did not take the samples.</p>\n",
	      out);
	if (l->replaces[0]) {
		fputs("<p class=\"replaces\">This certificate replaces "
		      "certificate ",
		      out);
		put(out, l->replaces);
		fprintf(out, ", issued %.10s, which is withdrawn.</p>\n",
			l->replaces_issued);
	}
	for (int i = 0; i < lab->n_statement; i++) {
		fputs("<p class=\"statement\">", out);
		put(out, lab->statement[i]);
		fputs("</p>\n", out);
	}
	fputs("</section>\n", out);
}

/* o: who approved the results, in what role, when. */
static void
signature(FILE *out, const store_lot *l)
{
	fputs("<section class=\"sign\">\n", out);
	if (!l->approved) {
		fputs("<p class=\"approval\">Not approved.</p>\n</section>\n",
		      out);
		return;
	}
	fputs("<p class=\"approval\">Results approved by <b class=\"approver\">",
	      out);
	put(out, l->approver);
	fputs("</b>, <span class=\"role\">", out);
	put(out, l->approver_role);
	fprintf(out, "</span>, on <span class=\"approval-date\">%.10s</span> "
		     "at %.8s UTC.</p>\n<p>Electronic signature, meaning "
		     "&#8220;approved&#8221;, kept as link %lld of the lab's "
		     "results store, chained by SHA-256 to the results it "
		     "approves.</p>\n</section>\n",
		l->approved_utc,
		strlen(l->approved_utc) > 11 ? l->approved_utc + 11 : "",
		l->signature_seq);
}

int
cert_write_html(FILE *out, const cert_lab *lab, const store_lot *l,
		const char *customer, int draft)
{
	head(out, lab, l, draft);
	item(out, lab, l, customer);
	results(out, l);
	notes(out, lab, l);
	signature(out, l);
	fputs("</main>\n</body>\n</html>\n", out);
	return ferror(out) ? -1 : 0;
}
