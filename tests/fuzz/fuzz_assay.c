/* acidlot fuzz target: a whole assay run, report written into memory.
 * The first byte picks strict or keep-going mode and the delimiter.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <math.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/assay.h"
#include "acidlot/report.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static al_catalogue *cat;
static al_spec_table *specs;
static const char spec_text[] =
	"product,acid,unit,min,max,max_rsd_pct,min_n\n"
	"LEM,citric,g/100g,4.5,6.5,1.0,2\n"
	"APJ,malic,g/L,3,7,1.5,2\n"
	"GRM,tartaric,meq/L,60,120,,1\n";
static const char spec_more[] =
	"product,acid,unit,min,max,min_n,sr,brix_min,ratio_min,water_max,basis\n"
	"OJ,citric,g/100g,0.7,1.1,2,0.01,10,12,,\n"
	"CIT,citric,g/100g,99.5,100.5,1,,,,0.5,anhydrous\n";
static al_spec_table *specs2;

static al_status
reject(void *ud, const char *file, unsigned long line, const char *reason,
       const char *raw, size_t raw_len)
{
	(void)ud;
	(void)file;
	(void)line;
	(void)raw;
	if (reason == NULL || raw_len > AL_CSV_MAX_RECORD)
		__builtin_trap();
	return AL_OK;
}

static al_status
replicate(void *ud, const al_replicate *rep)
{
	(void)ud;
	if (!isfinite(rep->value) || !(rep->value > 0))
		__builtin_trap();
	return AL_OK;
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	static const char delims[4] = {',', ';', '\t', AL_CSV_AUTO};
	al_assay_options opt;
	al_report_options ropt;
	al_status st;
	al_assay *run;
	FILE *in, *out;
	char *buf = NULL;
	size_t len = 0;

	if (cat == NULL) {
		FILE *f = fmemopen((void *)spec_text, sizeof spec_text - 1, "r");
		al_diags d = {0};

		cat = al_catalogue_new(&st, NULL);
		specs = al_spec_table_read(cat, NULL, f, "spec", &st, &d);
		fclose(f);
		al_diags_clear(&d);
		f = fmemopen((void *)spec_more, sizeof spec_more - 1, "r");
		specs2 = al_spec_table_read(cat, NULL, f, "spec2", &st, &d);
		fclose(f);
		al_diags_clear(&d);
		if (cat == NULL || specs == NULL || specs2 == NULL)
			__builtin_trap();
	}
	if (size < 1)
		return 0;
	memset(&opt, 0, sizeof opt);
	opt.catalogue = cat;
	opt.specs = (data[0] & 64) ? specs2 : specs;
	opt.qc.decision = (data[0] & 128) ? AL_DECISION_GUARDED : AL_DECISION_SIMPLE;
	opt.qc.exclude_outliers = (data[0] >> 1) & 1;
	opt.qc.has_titrant_u = 1;
	opt.qc.titrant_u = 0.0001;
	opt.csv.delimiter = delims[data[0] & 3];
	if (data[0] & 4) {
		opt.on_reject = reject;
		opt.csv.recover = 1;
	}
	if ((data[0] & 8) && opt.csv.delimiter != ',')
		opt.csv.decimal_point = ',';
	opt.has_titrant = (data[0] >> 4) & 1;
	opt.titrant_mol_l = 0.1;
	opt.has_endpoint = (data[0] >> 5) & 1;
	opt.endpoint_ph = 7.0;
	run = al_assay_new(&opt, &st);
	if (run == NULL)
		return 0;
	in = fmemopen((void *)(data + 1), size > 1 ? size - 1 : 1, "r");
	if (in != NULL) {
		if (size > 1)
			al_assay_read(run, in, "fuzz.csv", replicate, NULL);
		fclose(in);
	}
	if (al_assay_finish(run) == AL_OK) {
		al_assay_counts c = al_assay_get_counts(run);

		if (opt.on_reject && c.rows_read != c.rows_used + c.rows_bad)
			__builtin_trap();
		out = open_memstream(&buf, &len);
		if (out != NULL) {
			memset(&ropt, 0, sizeof ropt);
			ropt.decimals = -1;
			al_report_write(out, run, &ropt);
			al_budget_write(out, run, &ropt);
			fclose(out);
		}
		free(buf);
	}
	al_assay_free(run);
	return 0;
}
