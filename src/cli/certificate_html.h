/* acidlot command line: the certificate of analysis as HTML (one
 * self-contained file: inline CSS with a print stylesheet for A4 and
 * Letter, page numbers in the page margins, no scripts, nothing
 * fetched).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CLI_CERTIFICATE_HTML_H
#define ACIDLOT_CLI_CERTIFICATE_HTML_H

#include <stdio.h>

#include "store.h"

#define CERT_LINES 8

/* The lab's own words (LAB.conf). */
typedef struct cert_lab {
	char name[256], accreditation[256], method[512];
	char address[CERT_LINES][256], statement[CERT_LINES][512];
	int n_address, n_statement;
} cert_lab;

/* The certificate of lot l into out (customer NULL: none; draft: DRAFT
 * on every page). 0, or -1 when writing fails. */
int cert_write_html(FILE *out, const cert_lab *lab, const store_lot *l,
		    const char *customer, int draft);

#endif
