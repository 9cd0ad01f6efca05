/* acidlot command line: what the assay's record holds besides inputs and
 * outputs: the acids, specifications and titrant lots used, the decision
 * rule, Cochran's tests, the counts and each result.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>

#include "assay_cli.h"

/* Adds to the record what a reviewer needs to re-derive each result:
 * acids, specifications and titrant lots used, the decision rule,
 * counts, and each result with its report_id. */
#define RECORD_RESULTS_MAX 10000

/* The decision rule as the record states it (ILAC G8:09/2019 4.2.1 or
 * 4.2.2); NULL when memory runs out. */
static json_t *
decision_rule(int guarded, double guard_r, int exclude)
{
	const record_rule *r = record_rule_of(guarded);

	return guarded ? json_pack("{s:s, s:s, s:f, s:b, s:s}", "name",
				   r->name, "reference", r->reference,
				   "guard_band_r", guard_r, "outliers_excluded",
				   exclude, "statement", r->statement)
		       : json_pack("{s:s, s:s, s:b, s:s}", "name", r->name,
				   "reference", r->reference,
				   "outliers_excluded", exclude, "statement",
				   r->statement);
}

/* Cochran's tests of the run, for the record; NULL when memory runs
 * out. */
static json_t *
cochran_tests(const al_assay *run)
{
	json_t *cochran = json_array();
	size_t n;
	const al_cochran *tests = al_assay_cochran(run, &n);

	for (size_t i = 0; cochran && i < n; i++) {
		const al_cochran *ct = &tests[i];

		if (json_array_append_new(
			    cochran,
			    json_pack("{s:s, s:I, s:I, s:f, s:f, s:f}", "product",
				      ct->product, "results", (json_int_t)ct->l,
				      "n", (json_int_t)ct->n, "C", ct->c,
				      "critical_5pct", ct->crit5,
				      "critical_1pct", ct->crit1)) != 0) {
			json_decref(cochran);
			return NULL;
		}
	}
	return cochran;
}

/* Each result in the record for a lab-sized run (the first
 * RECORD_RESULTS_MAX); past that the report itself, hashed in outputs,
 * carries them. 0, or -1 when memory runs out. */
static int
record_results(json_t *results, const run_record *rec, const al_assay *run,
	       size_t n)
{
	int bad = 0;

	for (size_t i = 0; !bad && i < n && i < RECORD_RESULTS_MAX; i++) {
		const al_group_result *r = al_assay_result(run, i);
		char id[64], flags[512];

		snprintf(id, sizeof id, "%s-%04zu", rec->id, i + 1);
		al_flags_format(r->flags, r->endpoint_ph_needed, flags,
				sizeof flags);
		bad |= json_array_append_new(
			results,
			json_pack("{s:s, s:o, s:o, s:o, s:s, s:s, s:I, s:o, s:o, "
				  "s:o, s:s, s:s}",
				  "report_id", id, "product",
				  record_text(r->product), "lot",
				  record_text(r->lot), "sample",
				  record_text(r->sample), "acid",
				  r->acid->name, "unit", al_unit_name(r->unit),
				  "n", (json_int_t)r->stats.n, "mean",
				  r->stats.n ? json_real(r->stats.mean)
					     : json_null(),
				  "u", r->has_u ? json_real(r->u) : json_null(),
				  "U", r->has_u ? json_real(r->U) : json_null(),
				  "status", al_verdict_name(r->verdict), "flags",
				  flags));
	}
	return bad ? -1 : 0;
}

int
assay_record_fill(run_record *rec, const al_assay *run, int guarded, double guard_r,
	    int exclude)
{
	json_t *acids = json_array(), *specs = json_array();
	json_t *lots = json_array(), *results = json_array(), *rule, *counts;
	al_assay_counts c = al_assay_get_counts(run);
	size_t n = al_assay_group_count(run);
	const al_titrant *t;
	int bad = !acids || !specs || !lots || !results;
	const al_acid *acid;
	const al_spec *sp;

	/* the acids and specifications of the results: few, whatever the
	 * number of results */
	for (size_t i = 0; !bad && (acid = al_assay_acid_used(run, i)); i++)
		bad |= json_array_append_new(
			acids,
			json_pack("{s:s, s:s, s:f, s:i, s:f, s:s}", "name",
				  acid->name, "formula", acid->formula,
				  "molar_mass_g_mol", acid->molar_mass,
				  "protons", acid->protons, "g_per_meq",
				  acid->g_per_meq, "source", acid->source));
	for (size_t i = 0; !bad && (sp = al_assay_spec_used(run, i)); i++)
		bad |= json_array_append_new(
			specs,
			json_pack("{s:o, s:s?, s:s?, s:o, s:o, s:o, s:I, s:I}",
				  "product", record_text(sp->product), "acid",
				  sp->acid ? sp->acid->name : NULL, "unit",
				  sp->has_unit ? al_unit_name(sp->unit) : NULL,
				  "min",
				  sp->has_min ? json_real(sp->min) : json_null(),
				  "max",
				  sp->has_max ? json_real(sp->max) : json_null(),
				  "max_rsd_pct",
				  sp->has_max_rsd ? json_real(sp->max_rsd_pct)
						  : json_null(),
				  "min_n", (json_int_t)sp->min_n, "line",
				  (json_int_t)sp->line));
	bad |= !bad && record_results(results, rec, run, n) != 0;
	for (size_t i = 0; !bad && (t = al_assay_titrant_used(run, i)); i++) {
		char on[11], until[11];

		al_date_format(t->standardised_on, on);
		al_date_format(t->valid_until, until);
		bad |= json_array_append_new(
			lots, json_pack("{s:o, s:s, s:f, s:f, s:s, s:s}",
					"titrant_lot", record_text(t->lot),
					"standard",
					t->standard, "concentration_mol_l",
					t->concentration_mol_l, "u_mol_l",
					t->u_mol_l, "standardised_on", on,
					"valid_until", until));
	}
	rule = decision_rule(guarded, guard_r, exclude);
	counts = json_pack("{s:I, s:I, s:I, s:I, s:I, s:I, s:I, s:I}",
			   "rows_read", (json_int_t)c.rows_read, "rows_used",
			   (json_int_t)c.rows_used, "rows_rejected",
			   (json_int_t)c.rows_bad, "results",
			   (json_int_t)c.groups, "pass",
			   (json_int_t)c.by_verdict[AL_VERDICT_PASS], "fail",
			   (json_int_t)c.by_verdict[AL_VERDICT_FAIL], "retest",
			   (json_int_t)c.by_verdict[AL_VERDICT_RETEST],
			   "no_spec",
			   (json_int_t)c.by_verdict[AL_VERDICT_NO_SPEC]);
	bad |= json_object_set_new(rec->root, "acids", acids) != 0;
	bad |= json_object_set_new(rec->root, "specifications", specs) != 0;
	bad |= json_object_set_new(rec->root, "titrant_lots", lots) != 0;
	bad |= json_object_set_new(rec->root, "results", results) != 0;
	if (n > RECORD_RESULTS_MAX)
		bad |= json_object_set_new(
			       rec->root, "results_note",
			       json_sprintf("the first %d of %zu results; the "
					    "report lists all (see outputs)",
					    RECORD_RESULTS_MAX, n)) != 0;
	bad |= json_object_set_new(rec->root, "cochran", cochran_tests(run)) != 0;
	bad |= rule == NULL ||
	       json_object_set_new(rec->root, "decision_rule", rule) != 0;
	bad |= counts == NULL ||
	       json_object_set_new(rec->root, "counts", counts) != 0;
	return bad ? -1 : 0;
}


/* The outputs' bytes are all written: a thread hashes them for the
 * record while their fsyncs run. */
void
assay_start_hashes(struct job *j)
{
	const struct args *a = &j->a;
	int file_report = a->output && strcmp(a->output, "-") != 0;
	al_outfile *outs[FILE_HASHES_MAX] = {file_report ? j->report : NULL,
					     j->rep_out, j->rej_out,
					     j->budget_out, j->book_out};
	const char *roles[FILE_HASHES_MAX] = {"report", "replicates",
					      "rejects", "budget", "workbook"};
	const char *names[FILE_HASHES_MAX] = {a->output, a->replicates,
					      a->rejects, a->budget, a->xlsx};
	file_hashes *h = &j->hashes;

	for (int i = 0; i < FILE_HASHES_MAX; i++) {
		if (outs[i] == NULL)
			continue;
		/* a device, FIFO or standard output is written once and
		 * never read back (reading a FIFO would steal its bytes):
		 * listed unhashed */
		if (al_outfile_in_place(outs[i])) {
			j->in_place_role[j->n_in_place] = roles[i];
			j->in_place_path[j->n_in_place++] =
				al_outfile_path(outs[i]);
			continue;
		}
		/* the budget and the workbook: prepared (closed) already */
		if (outs[i] != j->budget_out && outs[i] != j->book_out)
			fflush(al_outfile_stream(outs[i]));
		j->out_role[h->n] = roles[i];
		j->out_path[h->n] = names[i];
		h->path[h->n++] = al_outfile_written_path(outs[i]);
	}
	h->large = j->in_bytes >= (1u << 20);
	file_hashes_start(h);
	j->hashing = 1;
}

/* The record, with the outputs' hashes, written beside them. */
int
assay_write_record(struct job *j)
{
	const struct args *a = &j->a;
	char record_path[4096];
	const char *path = a->record;
	int bad = file_hashes_finish(&j->hashes) != 0;

	j->hashing = 0;
	if (path == NULL) {
		snprintf(record_path, sizeof record_path, "%s.record.json",
			 a->output);
		path = record_path;
	}
	for (size_t i = 0; !bad && i < j->hashes.n; i++)
		bad = record_output_hashed(&j->rec, j->out_role[i],
					   j->out_path[i], j->hashes.hex[i],
					   j->hashes.bytes[i]) != 0;
	for (size_t i = 0; !bad && i < j->n_in_place; i++)
		bad = record_output_unhashed(&j->rec, j->in_place_role[i],
					     j->in_place_path[i]) != 0;
	if (bad || record_write(&j->rec, path, &j->rec_out) != 0) {
		cli_error("%s: cannot write the record of the run: %s", path,
			  cli_reason(AL_OK));
		return -1;
	}
	return 0;
}

