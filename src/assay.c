/* acidlot: the assay run, from titration rows to judged results.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/assay.h"

#include <math.h>
#include <stdint.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "acidlot/date.h"
#include "acidlot/juice.h"
#include "acidlot/number.h"
#include "acidlot/table.h"
#include "acidlot/ta.h"
#include "acidlot/text.h"
#include "evaluate.h"
#include "hash.h"
#include "labels.h"
#include "lanes.h"

/* The endpoint must titrate at least this share of the protons that the
 * factor assumes (the rule of thumb pKa + 2 gives 99 %; METHODS.md s.1). */
#define ENDPOINT_SHARE 0.99

enum {
	C_SAMPLE, C_TITRANT, C_MASS, C_VOLUME, C_PRODUCT, C_LOT, C_REPLICATE,
	C_BLANK, C_CONC, C_MADE_UP, C_ALIQUOT, C_ACID, C_DENSITY, C_ENDPOINT,
	C_TITRANT_LOT, C_DATE, C_BRIX, C_WATER, C_COUNT
};
static const char *const cols[C_COUNT] = {
	"sample",	 "titrant_ml", "mass_g",    "volume_ml",  "product",
	"lot",		 "replicate",  "blank_ml",  "titrant_mol_l",
	"made_up_ml",	 "aliquot_ml", "acid",	    "density_g_ml",
	"endpoint_ph",	 "titrant_lot", "date",	    "brix",	  "water_pct"};

/* Replicate values a group keeps: up to AL_VALUES_KEPT, the first
 * three inside the group itself (the usual triplicate costs no
 * allocation). Past AL_VALUES_KEPT the group keeps running statistics
 * instead, so memory stays bounded by the number of groups
 * (al_eval_stream: Welford's mean and sum of squared deviations, Welford
 * 1962, Knuth TAOCP 2, 4.2.2; the two smallest and two largest values
 * and where the extremes were), the form the evaluation reads. */
#define INLINE_VALUES 3

enum {
	G_VOLUME = 1,    /* the sample basis is volume (else mass) */
	G_ANHYDROUS = 2, /* results on the anhydrous basis */
	G_HEAP = 4,      /* values.heap holds the values */
	G_STREAM = 8,    /* values.stream holds running statistics */
	G_JUDGED = 16,   /* verdict and flags are the evaluation's */
	G_IMPOSSIBLE = 32 /* a row's value is more than a sample can hold */
};

/* One group, kept small: memory per group is what bounds a run of
 * millions of samples (bench/, issue 7: 120 bytes a group in all). */
struct group {
	uint32_t key;        /* offset in the arena: product \0 lot \0 sample \0 */
	uint32_t n;          /* values so far */
	uint32_t flags;      /* AL_FLAG_ bits of its rows (and Cochran's) */
	uint32_t first_line; /* where it was first seen (saturates) */
	uint32_t extra;      /* 1 + index in run->extras; 0: none */
	uint8_t acid;        /* 1 + index in run->acids; 0: no valid row yet */
	uint8_t unit;
	uint8_t bits;        /* G_ */
	uint8_t verdict;     /* the evaluation's (G_JUDGED) */
	al_label_slots labels; /* its first replicate labels */
	/* sums of the inputs, for the uncertainty budget at their means */
	double sum_titrant, sum_conc, sum_amount;
	union {
		double v[INLINE_VALUES];
		struct {
			double *p;
			uint32_t cap;
		} heap;
		al_eval_stream *stream;
	} values;
};

/* The inputs few files have, kept only for the groups that have them. */
/* The rows of a group's lowest and highest result, kept when an outlier
 * may be left out (al_eval_row), by group. */
struct group_extremes {
	al_eval_row row[2];
};

struct group_extra {
	double sum_blank, sum_made_up, sum_aliquot, sum_conc_u;
	double sum_brix, sum_water, sum_density, min_endpoint;
	uint32_t n_conc_u, n_brix, n_water, n_density;
};

/* A row used, kept for the replicate output when one is asked for. */
struct kept_row {
	uint32_t group, pos, file;
	unsigned flags;
	unsigned long line;
	double meq, value, needed;
	size_t replicate; /* offset in run->kept_text */
};

/* The specifications of the products asked for last: one entry for
 * each of SPEC_WAYS classes of names, so that rows of a few products
 * taken in turn each find theirs. */
#define SPEC_WAYS 8

struct spec_entry {
	const al_spec *spec;
	int cached;
	size_t len;
	char product[128];
};

struct spec_cache {
	struct spec_entry e[SPEC_WAYS];
};

/* An evaluator's own state: the result it evaluated last, its scratch
 * and its spec cache; the run has one, and each al_assay_reader one, so
 * that threads can evaluate results of a finished run side by side. */
struct al_assay_reader {
	const al_assay *run;
	al_group_result cur;
	size_t cur_index; /* 1 + the group in cur; 0: none */
	struct spec_cache specs;
	double scratch[AL_VALUES_KEPT];
};

struct al_assay {
	al_assay_options opt;
	al_diags diags;
	al_assay_counts counts;

	/* The keys and the groups, in buffers grown by doubling (their
	 * capacities in bytes) */
	size_t arena_cap, groups_cap;
	char *arena;
	size_t arena_len;
	struct group *groups;
	size_t n_groups;
	size_t groups_mapped, arena_mapped; /* bytes of each mapped ahead */
	uint64_t *slots; /* hash: 32 bits of the key's hash over group
			    index + 1; 0 = empty */
	size_t n_slots;

	char **files;
	size_t n_files;
	size_t *file_groups; /* groups before each file's first one */
	struct group_extra *extras;
	size_t n_extras, cap_extras;
	al_labels *labels; /* replicate labels beyond the groups' slots */
	struct group_extremes *extremes; /* with exclude_outliers */
	size_t n_extremes, cap_extremes;
	const al_acid *acids[255]; /* the acids of groups, by group->acid */
	size_t n_acids;
	uint32_t last_group; /* 1 + the group of the previous row */
	const al_acid **acids_used; /* by the results, in their order */
	size_t n_acids_used;
	const al_spec **specs_used;
	size_t n_specs_used;
	int finished;

	/* al_assay_result's reader, written for every result by the
	 * report's first thread */
	struct al_assay_reader own;
	struct spec_cache specs; /* the reading's */
	char *header_text; /* the file's header cells, trimmed, NUL-separated */
	const al_titrant **lots_used;
	size_t n_lots_used;
	struct kept_row *kept;
	size_t n_kept, cap_kept;
	char *kept_text;
	size_t kept_text_len, kept_text_cap;
	al_cochran *cochran;
	size_t n_cochran;
	char *scratch; /* the current row's text cells, NUL-terminated */
	size_t scratch_cap;
	char *ident[5]; /* or those of a row with non-ASCII bytes, in NFC */
	size_t ident_cap[5];
	char *lot; /* the current row's titrant lot, in NFC */
	size_t lot_cap;

	/* per-file state */
	const char *file;
	int header_done, header_ok;
	size_t header_fields;
	int col[C_COUNT];
	al_replicate_fn on_row;
	void *ud;
	char point;         /* decimal point of numbers */
	al_diags row_diags; /* the current row's errors, before they are
			       reported or the row rejected */
};

al_assay *
al_assay_new(const al_assay_options *opt, al_status *status)
{
	al_assay *run = al_calloc(1, sizeof *run);

	if (run == NULL) {
		*status = AL_ENOMEM;
		return NULL;
	}
	run->opt = *opt;
	if (run->opt.default_acid == NULL)
		run->opt.default_acid =
			al_catalogue_find(opt->catalogue, "citric");
	if (run->opt.confidence == 0)
		run->opt.confidence = 0.95;
	{
		al_qc_options d;

		al_qc_options_default(&d);
		if (run->opt.qc.guard_r == 0)
			run->opt.qc.guard_r = d.guard_r;
		if (run->opt.qc.burette_tol_ml == 0)
			run->opt.qc.burette_tol_ml = d.burette_tol_ml;
		if (run->opt.qc.balance_linearity_g == 0)
			run->opt.qc.balance_linearity_g = d.balance_linearity_g;
		if (run->opt.qc.k == 0)
			run->opt.qc.k = d.k;
		if (!run->opt.qc.has_resolution)
			run->opt.qc.resolution_ml = d.resolution_ml;
		if (!run->opt.qc.has_water_u)
			run->opt.qc.water_u_pct = d.water_u_pct;
	}
	run->point = opt->csv.decimal_point ? opt->csv.decimal_point : '.';
	run->row_diags.cap = 16;
	*status = AL_OK;
	return run;
}

void
al_assay_free(al_assay *run)
{
	if (run == NULL)
		return;
	for (size_t i = 0; i < run->n_groups; i++) {
		struct group *g = &run->groups[i];

		if (g->bits & G_HEAP)
			al_free(g->values.heap.p);
		else if (g->bits & G_STREAM)
			al_free(g->values.stream);
	}
	for (size_t i = 0; i < run->n_files; i++)
		al_free(run->files[i]);
	al_free(run->files);
	al_free(run->groups);
	al_free(run->slots);
	al_free(run->arena);
	al_free(run->file_groups);
	al_free((void *)run->acids_used);
	al_free((void *)run->specs_used);
	al_free(run->extras);
	for (int i = 0; i < 5; i++)
		al_free(run->ident[i]);
	al_free(run->lot);
	al_free(run->extremes);
	al_labels_free(run->labels);
	al_free(run->scratch);
	al_free(run->header_text);
	al_free(run->lots_used);
	al_free(run->kept);
	al_free(run->kept_text);
	al_free(run->cochran);
	al_diags_clear(&run->diags);
	al_diags_clear(&run->row_diags);
	al_free(run);
}

al_diags *
al_assay_diags(al_assay *run)
{
	return &run->diags;
}

al_assay_counts
al_assay_get_counts(const al_assay *run)
{
	return run->counts;
}

size_t
al_assay_group_count(const al_assay *run)
{
	return run->n_groups;
}

static void evaluate(const al_assay *run, struct al_assay_reader *rd,
		     size_t i);

/* Evaluated on demand: a run of millions of results keeps none of them;
 * the one returned is the reader's. */
static const al_group_result *
reader_result(struct al_assay_reader *rd, size_t i)
{
	if (!rd->run->finished || i >= rd->run->n_groups)
		return NULL;
	if (rd->cur_index != i + 1) {
		evaluate(rd->run, rd, i);
		rd->cur_index = i + 1;
	}
	return &rd->cur;
}

const al_group_result *
al_assay_result(const al_assay *run, size_t i)
{
	return reader_result(&((al_assay *)run)->own, i);
}

al_assay_reader *
al_assay_reader_new(const al_assay *run)
{
	al_assay_reader *rd = al_calloc(1, sizeof *rd);

	if (rd != NULL)
		rd->run = run;
	return rd;
}

const al_group_result *
al_assay_reader_result(al_assay_reader *rd, size_t i)
{
	return reader_result(rd, i);
}

void
al_assay_reader_free(al_assay_reader *rd)
{
	al_free(rd);
}

/* The hash of product \0 lot \0 sample, as the arena stores the key. */
static uint64_t
key_hash(const char *p, size_t pl, const char *l, size_t ll, const char *s,
	 size_t sl)
{
	uint64_t h = AL_FNV_OFFSET;

	if (l == p + pl + 1 && s == l + ll + 1) /* as key_is */
		return al_mix64(al_fnv1a(h, p, pl + ll + sl + 2));
	h = al_fnv1a(h, p, pl);
	h = al_fnv1a(h, "", 1);
	h = al_fnv1a(h, l, ll);
	h = al_fnv1a(h, "", 1);
	return al_mix64(al_fnv1a(h, s, sl));
}

/* A key as the arena keeps it: product \0 lot \0 sample \0, written
 * at k (pl + ll + sl + 3 bytes). */
static void
key_put(char *k, const char *p, size_t pl, const char *l, size_t ll,
	const char *s, size_t sl)
{
	memcpy(k, p, pl);
	k[pl] = '\0';
	memcpy(k + pl + 1, l, ll);
	k[pl + 1 + ll] = '\0';
	memcpy(k + pl + ll + 2, s, sl);
	k[pl + ll + 2 + sl] = '\0';
}

/* Whether the key that key_put wrote at k (with avail bytes from k on)
 * is p, l, s. Fields never hold NUL (the reader refuses it), so the
 * parts and their ends compare unambiguously. */
static int
key_is(const char *k, size_t avail, const char *p, size_t pl, const char *l,
       size_t ll, const char *s, size_t sl)
{
	size_t n = pl + ll + sl + 3;

	if (n > avail)
		return 0;
	/* the row's cells often lie as key_put writes them (adjacent
	 * columns of a plain line): one compare */
	if (l == p + pl + 1 && s == l + ll + 1)
		return memcmp(k, p, n) == 0;
	return memcmp(k, p, pl) == 0 && k[pl] == '\0' &&
	       memcmp(k + pl + 1, l, ll) == 0 && k[pl + 1 + ll] == '\0' &&
	       memcmp(k + pl + ll + 2, s, sl) == 0 &&
	       k[pl + ll + 2 + sl] == '\0';
}

static int
group_is(const al_assay *run, const struct group *g, const char *p,
	 size_t pl, const char *l, size_t ll, const char *s, size_t sl)
{
	return key_is(run->arena + g->key, run->arena_len - g->key, p, pl, l,
		      ll, s, sl);
}

/* The lengths of a stored key's product and lot; the key is product \0
 * lot \0 sample \0. */
static const char *
key_parts(const al_assay *run, const struct group *g, size_t *pl, size_t *ll)
{
	const char *k = run->arena + g->key;

	*pl = strlen(k);
	*ll = strlen(k + *pl + 1);
	return k;
}

/* A slot holds the top 32 bits of the key's hash above the group's
 * number + 1: a probe settles without touching a group but for the
 * key's own (a false match has odds of 2^-32 a slot), and the table
 * grows without reading the keys again. The slot's place comes from the
 * same 32 bits. */
#define SLOT_HASH(h) ((uint32_t)((h) >> 32))
#define SLOT_OF(h32, index) ((uint64_t)(h32) << 32 | (uint32_t)((index) + 1))
#define MAX_GROUPS (UINT32_MAX - 1)

static al_status
rehash(al_assay *run)
{
	size_t n = run->n_slots ? 2 * run->n_slots : 1024;
	uint64_t *slots = al_calloc(n, sizeof *slots);

	if (slots == NULL)
		return AL_ENOMEM;
	/* every slot is touched, in no order: map them all at once */
	al_prefault(slots, 0, n * sizeof *slots);
	for (size_t i = 0; i < run->n_slots; i++) {
		uint64_t v = run->slots[i];
		size_t j;

		if (v == 0)
			continue;
		for (j = (v >> 32) & (n - 1); slots[j]; j = (j + 1) & (n - 1))
			;
		slots[j] = v;
	}
	al_free(run->slots);
	run->slots = slots;
	run->n_slots = n;
	return AL_OK;
}

/* How a row's key will be found: the previous row's group (replicates
 * usually follow each other), or else by its hash. */
struct key_look {
	int same;     /* the previous row's group */
	uint32_t h32; /* else SLOT_HASH of the key */
};

/* Looks at a row's key as soon as its cells are known: at millions of
 * samples the key's slot is a cache miss, and fetching it now lets the
 * checks of the row's other cells run while it comes. */
static void
key_ahead(const al_assay *run, const char *p, size_t pl, const char *l,
	  size_t ll, const char *s, size_t sl, struct key_look *k)
{
	k->same = run->last_group &&
		  group_is(run, &run->groups[run->last_group - 1], p, pl, l,
			   ll, s, sl);
	if (k->same)
		return;
	k->h32 = SLOT_HASH(key_hash(p, pl, l, ll, s, sl));
	if (run->n_slots)
		__builtin_prefetch(&run->slots[k->h32 & (run->n_slots - 1)]);
}

/* A buffer filled from the front, [0, used) of cap bytes, its pages
 * mapped a window ahead of use (al_prefault: one call a window instead
 * of a page fault a page); *mapped counts the bytes mapped. A buffer
 * that moved when it grew starts counting again from what it holds. */
#define MAP_AHEAD ((size_t)256 << 10)

static void
map_ahead(void *buf, size_t used, size_t cap, size_t *mapped)
{
	size_t to = used + MAP_AHEAD < cap ? used + MAP_AHEAD : cap;

	if (used > *mapped) {
		al_prefault(buf, *mapped, to);
		*mapped = to;
	}
}

/* A buffer (*base, *cap bytes) grown to at least need bytes, doubling,
 * `used` of them in use: after a move *mapped counts again from what is
 * in use. */
static al_status
grow_buffer(void **base, size_t *cap, size_t need, size_t used,
	    size_t *mapped)
{
	void *p = al_reserve(*base, cap, need);

	if (p == NULL)
		return AL_ENOMEM;
	if (p != *base)
		*mapped = used;
	*base = p;
	return AL_OK;
}

/* Finds the group of a key seen by key_ahead, or creates it; *created
 * tells which. */
static al_status
find_group(al_assay *run, const char *p, size_t pl, const char *l, size_t ll,
	   const char *s, size_t sl, const struct key_look *k,
	   struct group **out, int *created)
{
	uint32_t h32 = k->h32;
	size_t j, need;
	struct group *g;

	*created = 0;
	if (k->same) {
		*out = &run->groups[run->last_group - 1];
		return AL_OK;
	}
	/* linear probing at a load of at most 0.7 */
	if (run->n_slots == 0 || 10 * (run->n_groups + 1) > 7 * run->n_slots) {
		if (rehash(run) != AL_OK)
			return AL_ENOMEM;
	}
	for (j = h32 & (run->n_slots - 1); run->slots[j];
	     j = (j + 1) & (run->n_slots - 1)) {
		uint64_t v = run->slots[j];

		if ((uint32_t)(v >> 32) != h32)
			continue;
		g = &run->groups[(uint32_t)v - 1];
		if (group_is(run, g, p, pl, l, ll, s, sl)) {
			run->last_group = (uint32_t)v;
			*out = g;
			return AL_OK;
		}
	}
	if (run->n_groups >= MAX_GROUPS)
		return AL_ENOMEM;
	need = pl + ll + sl + 3;
	if (run->arena_len + need > UINT32_MAX)
		return AL_ENOMEM; /* 4 GiB of names: beyond any lab's run */
	if (run->arena_len + need > run->arena_cap) {
		void *base = run->arena;

		if (grow_buffer(&base, &run->arena_cap, run->arena_len + need,
				run->arena_len, &run->arena_mapped) != AL_OK)
			return AL_ENOMEM;
		run->arena = base;
	}
	if ((run->n_groups + 1) * sizeof *run->groups > run->groups_cap) {
		void *base = run->groups;

		if (grow_buffer(&base, &run->groups_cap,
				(run->n_groups + 1) * sizeof *run->groups,
				run->n_groups * sizeof *run->groups,
				&run->groups_mapped) != AL_OK)
			return AL_ENOMEM;
		run->groups = base;
	}
	map_ahead(run->arena, run->arena_len + need, run->arena_cap,
		  &run->arena_mapped);
	map_ahead(run->groups, (run->n_groups + 1) * sizeof *run->groups,
		  run->groups_cap, &run->groups_mapped);
	g = &run->groups[run->n_groups];
	memset(g, 0, sizeof *g);
	g->key = (uint32_t)run->arena_len;
	key_put(run->arena + run->arena_len, p, pl, l, ll, s, sl);
	run->arena_len += need;
	run->slots[j] = SLOT_OF(h32, run->n_groups);
	run->n_groups++;
	run->last_group = (uint32_t)run->n_groups;
	*out = g;
	*created = 1;
	return AL_OK;
}

/* The group's extra sums, made on first need; NULL when memory runs out. */
static struct group_extra *
extra_of(al_assay *run, struct group *g)
{
	struct group_extra *x;

	if (g->extra)
		return &run->extras[g->extra - 1];
	if (run->n_extras == UINT32_MAX - 1)
		return NULL;
	if (run->n_extras == run->cap_extras) {
		size_t n = run->cap_extras ? 2 * run->cap_extras : 64;
		struct group_extra *grown =
			al_realloc(run->extras, n * sizeof *grown);

		if (grown == NULL)
			return NULL;
		run->extras = grown;
		run->cap_extras = n;
	}
	x = &run->extras[run->n_extras++];
	memset(x, 0, sizeof *x);
	x->min_endpoint = HUGE_VAL;
	g->extra = (uint32_t)run->n_extras;
	return x;
}

/* Keeps a row as its group's lowest or highest result where it is one
 * (the first on a tie), so that an excluded outlier's inputs can come
 * off the means; only when outliers may be excluded. */
static al_status
note_extremes(al_assay *run, const struct group *g, const al_eval_row *row)
{
	size_t i = (size_t)(g - run->groups);
	struct group_extremes *e;

	if (!run->opt.qc.exclude_outliers)
		return AL_OK;
	if (i >= run->cap_extremes) {
		size_t n = run->cap_extremes ? 2 * run->cap_extremes : 64;
		struct group_extremes *grown;

		while (n <= i)
			n *= 2;
		grown = al_realloc(run->extremes, n * sizeof *grown);
		if (grown == NULL)
			return AL_ENOMEM;
		run->extremes = grown;
		run->cap_extremes = n;
	}
	while (run->n_extremes <= i)
		memset(&run->extremes[run->n_extremes++], 0, sizeof *e);
	e = &run->extremes[i];
	if (g->n == 0 || row->value < e->row[0].value)
		e->row[0] = *row;
	if (g->n == 0 || row->value > e->row[1].value)
		e->row[1] = *row;
	return AL_OK;
}

static const double *
group_values(const struct group *g)
{
	if (g->bits & G_STREAM)
		return NULL;
	return g->bits & G_HEAP ? g->values.heap.p : g->values.v;
}

static void
stream_add(al_eval_stream *st, uint32_t n, double x)
{
	/* n values so far; x is value n (0-based) */
	double d = x - st->mean;

	st->mean += d / (double)(n + 1);
	st->m2 += d * (x - st->mean);
	if (n == 0) {
		st->lo = st->hi = x;
		st->lo2 = HUGE_VAL;
		st->hi2 = -HUGE_VAL;
		st->lo_i = st->hi_i = 0;
		return;
	}
	if (x < st->lo) {
		st->lo2 = st->lo;
		st->lo = x;
		st->lo_i = n;
	} else if (x < st->lo2)
		st->lo2 = x;
	if (x > st->hi) {
		st->hi2 = st->hi;
		st->hi = x;
		st->hi_i = n;
	} else if (x > st->hi2)
		st->hi2 = x;
}

static al_status
push_value(struct group *g, double v)
{
	if (g->bits & G_STREAM) {
		stream_add(g->values.stream, g->n++, v);
		return AL_OK;
	}
	if (g->n == AL_VALUES_KEPT) {
		/* from here on, running statistics of all the values */
		al_eval_stream *st = al_malloc(sizeof *st);
		double *kept = g->values.heap.p;

		if (st == NULL)
			return AL_ENOMEM;
		memset(st, 0, sizeof *st);
		for (uint32_t i = 0; i < g->n; i++)
			stream_add(st, i, kept[i]);
		stream_add(st, g->n, v);
		al_free(kept);
		g->values.stream = st;
		g->bits = (uint8_t)((g->bits & ~G_HEAP) | G_STREAM);
		g->n++;
		return AL_OK;
	}
	if (!(g->bits & G_HEAP) && g->n == INLINE_VALUES) {
		double *p = al_malloc(2 * INLINE_VALUES * sizeof *p);

		if (p == NULL)
			return AL_ENOMEM;
		memcpy(p, g->values.v, sizeof g->values.v);
		g->values.heap.p = p;
		g->values.heap.cap = 2 * INLINE_VALUES;
		g->bits |= G_HEAP;
	} else if ((g->bits & G_HEAP) && g->n == g->values.heap.cap) {
		uint32_t n = 2 * g->values.heap.cap;
		double *grown;

		if (n > AL_VALUES_KEPT)
			n = AL_VALUES_KEPT;
		grown = al_realloc(g->values.heap.p, n * sizeof *grown);
		if (grown == NULL)
			return AL_ENOMEM;
		g->values.heap.p = grown;
		g->values.heap.cap = n;
	}
	if (g->bits & G_HEAP)
		g->values.heap.p[g->n++] = v;
	else
		g->values.v[g->n++] = v;
	return AL_OK;
}

/* 1 + the index of an acid in the run's table of acids (255 at most;
 * the catalogue has far fewer); 0 when the table is full. */
static uint8_t
acid_slot(al_assay *run, const al_acid *acid)
{
	for (size_t i = 0; i < run->n_acids; i++)
		if (run->acids[i] == acid)
			return (uint8_t)(i + 1);
	if (run->n_acids == sizeof run->acids / sizeof run->acids[0])
		return 0;
	run->acids[run->n_acids++] = acid;
	return (uint8_t)run->n_acids;
}

static const al_acid *
group_acid(const al_assay *run, const struct group *g)
{
	return g->acid ? run->acids[g->acid - 1] : NULL;
}

/* The file a group was first seen in: groups are numbered in order of
 * creation, file by file. */
static size_t
group_file_index(const al_assay *run, const struct group *g)
{
	size_t i = (size_t)(g - run->groups), f = run->n_files - 1;

	while (f > 0 && run->file_groups[f] > i)
		f--;
	return f;
}

static const char *
group_file(const al_assay *run, const struct group *g)
{
	return run->files[group_file_index(run, g)];
}

/* Where a group began, for its labels. */
static al_label_at
group_start(const al_assay *run, const struct group *g)
{
	return (al_label_at){(uint32_t)group_file_index(run, g), g->first_line};
}

/* The specification of a product (len bytes, NUL-terminated),
 * remembering the last one asked. */
static const al_spec *
spec_of(const al_assay *run, struct spec_cache *sc, const char *product,
	size_t len)
{
	unsigned h = len ? (unsigned)len + 3u * (unsigned char)product[0] +
				   5u * (unsigned char)product[len - 1]
			 : 0;
	struct spec_entry *c = &sc->e[h % SPEC_WAYS];

	if (c->cached && c->len == len && memcmp(c->product, product, len) == 0)
		return c->spec;
	c->spec = al_spec_find(run->opt.specs, product);
	c->cached = len < sizeof c->product;
	c->len = len;
	if (c->cached)
		memcpy(c->product, product, len + 1);
	return c->spec;
}

/* Adds an error for the current row (reported or rejected at its end). */
#define ROW_ERR(run, line, column, ...)                                       \
	al_diags_add(&(run)->row_diags, AL_SEV_ERROR, (run)->file, (line),     \
		     (column), __VA_ARGS__)
/* A file-level error or a warning: straight to the run's list. */
#define RUN_DIAG(run, sev, line, column, ...)                                 \
	al_diags_add(&(run)->diags, (sev), (run)->file, (line), (column),      \
		     __VA_ARGS__)

/* The required columns: sample, titrant_ml, and mass_g or volume_ml;
 * each one missing is an error listing the file's header and the
 * closest cell. 1 when all are there. */
static int
required_columns(al_assay *run, const al_csv_row *row)
{
	char have[512];
	size_t hl = 0;
	int ok = 1;

	have[0] = '\0';
	for (size_t i = 0; i < row->nfields && hl < sizeof have; i++) {
		int w = snprintf(have + hl, sizeof have - hl, "%s%s",
				 i ? ", " : "", row->fields[i]);
		if (w > 0)
			hl += (size_t)w;
	}
	for (int k = C_SAMPLE; k <= C_TITRANT; k++) {
		const char *near;

		if (run->col[k] >= 0)
			continue;
		near = al_header_closest(row, cols[k]);
		if (near)
			RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
				 "missing required column '%s' (the file has: "
				 "%s); did you mean '%s'? map it with --column "
				 "%s=\"%s\"",
				 cols[k], have, near, cols[k], near);
		else
			RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
				 "missing required column '%s' (the file has: "
				 "%s)",
				 cols[k], have);
		ok = 0;
	}
	if (run->col[C_MASS] < 0 && run->col[C_VOLUME] < 0) {
		const char *near = al_header_closest(row, "mass_g");
		const char *which = "mass_g";

		if (near == NULL) {
			near = al_header_closest(row, "volume_ml");
			which = "volume_ml";
		}
		if (near)
			RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
				 "needs a 'mass_g' or a 'volume_ml' column (the "
				 "file has: %s); did you mean '%s'? map it with "
				 "--column %s=\"%s\"",
				 have, near, which, near);
		else
			RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
				 "needs a 'mass_g' or a 'volume_ml' column (the "
				 "file has: %s)",
				 have);
		ok = 0;
	}
	return ok;
}

static al_status
check_header(al_assay *run, const al_csv_row *row)
{
	int ok = 1;

	run->header_done = 1;
	run->header_fields = row->nfields;
	if (row->nfields == 1 && run->opt.csv.delimiter != AL_CSV_AUTO &&
	    (memchr(row->fields[0], ';', row->lens[0]) ||
	     memchr(row->fields[0], '\t', row->lens[0]))) {
		int semi = memchr(row->fields[0], ';', row->lens[0]) != NULL;

		/* the one message that helps: column errors would only
		 * repeat the whole line */
		RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
			 "the header is one field holding %s: the file is "
			 "delimited by %s; try --delimiter %s (or --delimiter "
			 "auto)",
			 semi ? "';'" : "tabs", semi ? "';'" : "tabs",
			 semi ? "';'" : "tab");
		run->header_ok = 0;
		return run->diags.out_of_memory ? AL_ENOMEM : AL_EINPUT;
	}
	{
		size_t need = 0, pos = 0;

		for (size_t i = 0; i < row->nfields; i++)
			need += row->lens[i] + 1;
		al_free(run->header_text);
		run->header_text = al_malloc(need + 1);
		if (run->header_text == NULL)
			return AL_ENOMEM;
		for (size_t i = 0; i < row->nfields; i++) {
			size_t len = row->lens[i];
			const char *h = al_trim(row->fields[i], &len);

			memcpy(run->header_text + pos, h, len);
			run->header_text[pos + len] = '\0';
			pos += len + 1;
		}
	}
	if (al_header_map(AL_UNKNOWN_WARN, row, cols, C_COUNT, run->opt.aliases,
			  run->opt.n_aliases, run->col, run->file,
			  &run->diags) != AL_OK)
		ok = 0;
	if (!required_columns(run, row))
		ok = 0;
	if ((run->col[C_MADE_UP] < 0) != (run->col[C_ALIQUOT] < 0)) {
		RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
			"'made_up_ml' and 'aliquot_ml' go together: the file "
			"has only '%s'",
			run->col[C_MADE_UP] < 0 ? "aliquot_ml" : "made_up_ml");
		ok = 0;
	}
	if (run->point == ',' && row->delimiter == ',') {
		RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
			 "the file is delimited by ',', which cannot go with "
			 "--decimal-comma");
		ok = 0;
	}
	if (run->col[C_CONC] < 0 && !run->opt.has_titrant &&
	    !(run->opt.titrants && run->col[C_TITRANT_LOT] >= 0)) {
		RUN_DIAG(run, AL_SEV_ERROR, row->line, NULL,
			"no titrant concentration: add a 'titrant_mol_l' "
			"column or give --titrant-mol-l");
		ok = 0;
	}
	run->header_ok = ok;
	return run->diags.out_of_memory ? AL_ENOMEM : (ok ? AL_OK : AL_EINPUT);
}

/* 1 when a row holds the same names as the header, ignoring case. */
static int
repeats_header(const al_assay *run, const al_csv_row *row)
{
	if (run->header_text == NULL)
		return 0;
	for (size_t i = 0, pos = 0; i < row->nfields; i++) {
		size_t len = row->lens[i], hl = strlen(run->header_text + pos);
		const char *cell = al_trim(row->fields[i], &len);
		const char *h = run->header_text + pos;

		if (!al_word_eq(cell, len, h) || (len == 0 && hl == 0))
			return 0;
		pos += hl + 1;
	}
	return 1;
}

static int
row_is_empty(const al_csv_row *row)
{
	for (size_t i = 0; i < row->nfields; i++) {
		size_t len = row->lens[i];

		al_trim(row->fields[i], &len);
		if (len)
			return 0;
	}
	return 1;
}

/* A numeric cell, or the option's default. Returns 1 set, 0 absent,
 * -1 bad (already reported). */
static int
number_or_default(al_assay *run, const al_csv_row *row, int k, int has_def,
		  double def, double *v)
{
	int got = al_cell_number(row, run->col[k], cols[k], run->point,
				 run->file, &run->row_diags, v);

	if (got == 0 && has_def) {
		*v = def;
		return 1;
	}
	return got;
}

static const char *
ta_column(al_ta_field f, al_basis basis)
{
	switch (f) {
	case AL_TF_TITRANT:
		return "titrant_ml";
	case AL_TF_BLANK:
		return "blank_ml";
	case AL_TF_CONC:
		return "titrant_mol_l";
	case AL_TF_MADE_UP:
		return "made_up_ml";
	case AL_TF_ALIQUOT:
		return "aliquot_ml";
	case AL_TF_AMOUNT:
		return basis == AL_BASIS_MASS ? "mass_g" : "volume_ml";
	}
	return NULL;
}

/* The text cells of a row, trimmed, as C strings: product, lot, sample,
 * replicate, acid. A cell that ends where its field does is one already
 * (fields are NUL-terminated); the others are copied into the run's
 * scratch buffer. */
static al_status
text_cells(al_assay *run, const al_csv_row *row, const char *out[5],
	   size_t lens[5])
{
	static const int which[5] = {C_PRODUCT, C_LOT, C_SAMPLE, C_REPLICATE,
				     C_ACID};
	size_t need = 0, pos = 0;

	for (int i = 0; i < 5; i++)
		out[i] = al_cell(row, run->col[which[i]], &lens[i]);
	if (!row->ascii) {
		/* identifiers compare in NFC, trimmed of Unicode blanks */
		for (int i = 0; i < 5; i++) {
			if (al_text_identifier(out[i], lens[i], &run->ident[i],
					       &run->ident_cap[i],
					       &lens[i]) != AL_OK)
				return AL_ENOMEM;
			out[i] = run->ident[i];
		}
		return AL_OK;
	}
	for (int i = 0; i < 5; i++)
		if (out[i][lens[i]] != '\0')
			need += lens[i] + 1;
	if (need == 0)
		return AL_OK;
	{
		char *grown = al_reserve(run->scratch, &run->scratch_cap, need);

		if (grown == NULL)
			return AL_ENOMEM;
		run->scratch = grown;
	}
	for (int i = 0; i < 5; i++) {
		if (out[i][lens[i]] == '\0')
			continue;
		memcpy(run->scratch + pos, out[i], lens[i]);
		run->scratch[pos + lens[i]] = '\0';
		out[i] = run->scratch + pos;
		pos += lens[i] + 1;
	}
	return AL_OK;
}

static al_status row_values(al_assay *run, const al_csv_row *row);

/* Keeps a used row for the replicate output of al_assay_finish. */
static al_status
keep_row(al_assay *run, const struct group *g, unsigned long line,
	 double meq, double value, unsigned flags, double needed,
	 const char *replicate)
{
	size_t len = strlen(replicate) + 1;
	struct kept_row *k;

	if (run->n_kept == run->cap_kept) {
		size_t n = run->cap_kept ? 2 * run->cap_kept : 256;
		struct kept_row *grown = al_realloc(run->kept, n * sizeof *grown);

		if (grown == NULL)
			return AL_ENOMEM;
		run->kept = grown;
		run->cap_kept = n;
	}
	if (run->kept_text_len + len > run->kept_text_cap) {
		size_t n = run->kept_text_cap ? 2 * run->kept_text_cap : 4096;
		char *grown;

		while (n < run->kept_text_len + len)
			n *= 2;
		grown = al_realloc(run->kept_text, n);
		if (grown == NULL)
			return AL_ENOMEM;
		run->kept_text = grown;
		run->kept_text_cap = n;
	}
	memcpy(run->kept_text + run->kept_text_len, replicate, len);
	k = &run->kept[run->n_kept++];
	k->group = (uint32_t)(g - run->groups);
	k->pos = g->n - 1;
	k->file = (uint32_t)(run->n_files - 1);
	k->flags = flags;
	k->line = line;
	k->meq = meq;
	k->value = value;
	k->needed = needed;
	k->replicate = run->kept_text_len;
	run->kept_text_len += len;
	return AL_OK;
}

/* The row's date (a calendar date YYYY-MM-DD, checked whether or not a
 * register uses it), else the day of the run. 0, or -1 after an error. */
static int
row_date(al_assay *run, const al_csv_row *row, unsigned long line,
	 long *date)
{
	size_t dl;
	const char *text = al_cell(row, run->col[C_DATE], &dl);

	*date = run->opt.today;
	if (dl > 0 && al_date_parse(text, dl, date) != 0) {
		ROW_ERR(run, line, "date",
			"'%.*s' is not a calendar date YYYY-MM-DD",
			(int)(dl > 40 ? 40 : dl), text);
		return -1;
	}
	return 0;
}

/* The register entry of a row's titrant lot, checked for validity on the
 * row's date; NULL when the row names no lot (or after an error). */
static const al_titrant *
titrant_of(al_assay *run, const al_csv_row *row, unsigned long line,
	   long date)
{
	size_t ll, dl;
	const char *name = al_cell(row, run->col[C_TITRANT_LOT], &ll);
	char on[11], until[11], when[11], *lot;
	const al_titrant *t;

	if (al_text_identifier(name, ll, &run->lot, &run->lot_cap, &ll) !=
	    AL_OK) {
		run->row_diags.out_of_memory = 1;
		return NULL;
	}
	lot = run->lot;
	if (ll == 0)
		return NULL;
	if (ll > AL_IDENT_MAX) {
		ROW_ERR(run, line, "titrant_lot", "is longer than %d bytes",
			AL_IDENT_MAX);
		return NULL;
	}
	t = al_register_find(run->opt.titrants, lot);
	if (t == NULL) {
		ROW_ERR(run, line, "titrant_lot",
			"titrant lot '%s' is not in the titrant register", lot);
		return NULL;
	}
	al_date_format(t->standardised_on, on);
	al_date_format(t->valid_until, until);
	al_date_format(date, when);
	if (!t->valid) {
		ROW_ERR(run, line, "titrant_lot",
			"titrant lot '%s' failed its standardisation of %s: "
			"standardise it again",
			lot, on);
		return NULL;
	}
	(void)al_cell(row, run->col[C_DATE], &dl);
	if (date > t->valid_until || date < t->standardised_on) {
		ROW_ERR(run, line, "titrant_lot",
			"titrant lot '%s' is valid from %s to %s, not on %s%s",
			lot, on, until, when, dl ? "" : " (today: the row has no date)");
		return NULL;
	}
	for (size_t i = 0; i < run->n_lots_used; i++)
		if (run->lots_used[i] == t)
			return t;
	{
		const al_titrant **grown = al_realloc(
			(void *)run->lots_used,
			(run->n_lots_used + 1) * sizeof *grown);

		if (grown == NULL) {
			run->row_diags.out_of_memory = 1;
			return NULL;
		}
		run->lots_used = grown;
		run->lots_used[run->n_lots_used++] = t;
	}
	return t;
}

static void
init_group(struct group *g, unsigned long line)
{
	/* the acid is set by the first valid row; the spec is the
	 * product's, looked up again when the result is evaluated */
	g->first_line = line > UINT32_MAX ? UINT32_MAX : (uint32_t)line;
}

/* A replicate label that the row's result has already: the same data
 * twice (a file given twice, rows pasted twice), an error naming both
 * rows. 1 when so (or when memory ran out: row_diags says). Checked
 * while the result keeps its values (AL_VALUES_KEPT): past them it keeps
 * running statistics only, and no memory grows with its rows. */
static int
twice(al_assay *run, const struct group *g, unsigned long line,
      const char *label, size_t len)
{
	al_label_at at;

	if (run->labels == NULL && (run->labels = al_labels_new()) == NULL) {
		run->row_diags.out_of_memory = 1;
		return 1;
	}
	if (!al_labels_find(run->labels, &g->labels, (size_t)(g - run->groups),
			    group_start(run, g), label, len, &at))
		return 0;
	ROW_ERR(run, line, "replicate",
		"'%s' is given twice for one result: also at %s:%lu (the same "
		"data twice?)",
		label, run->files[at.file], at.line);
	return 1;
}

/* Possible but unusual values: a warning naming the row, and a flag. */
static unsigned
plausibility(al_assay *run, unsigned long line, const al_titration *t)
{
	unsigned flags = 0;

	if (t->titrant_ml > AL_PLAUSIBLE_TITRANT_ML) {
		RUN_DIAG(run, AL_SEV_WARNING, line, "titrant_ml",
			 "%g mL is more than a burette holds (over %g mL): "
			 "check the reading",
			 t->titrant_ml, AL_PLAUSIBLE_TITRANT_ML);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->amount > AL_PLAUSIBLE_SAMPLE) {
		RUN_DIAG(run, AL_SEV_WARNING, line,
			 t->basis == AL_BASIS_MASS ? "mass_g" : "volume_ml",
			 "a sample of %g %s is unusually large (over %g): "
			 "check the unit",
			 t->amount, t->basis == AL_BASIS_MASS ? "g" : "mL",
			 AL_PLAUSIBLE_SAMPLE);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->titrant_mol_l < AL_PLAUSIBLE_CONC_MIN ||
	    t->titrant_mol_l > AL_PLAUSIBLE_CONC_MAX) {
		RUN_DIAG(run, AL_SEV_WARNING, line, "titrant_mol_l",
			 "%g mol/L is outside the usual %g-%g mol/L: check "
			 "the unit",
			 t->titrant_mol_l, AL_PLAUSIBLE_CONC_MIN,
			 AL_PLAUSIBLE_CONC_MAX);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->blank_ml > AL_PLAUSIBLE_BLANK_ML) {
		RUN_DIAG(run, AL_SEV_WARNING, line, "blank_ml",
			 "a blank of %g mL is unusually large (over %g mL)",
			 t->blank_ml, AL_PLAUSIBLE_BLANK_ML);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	return flags;
}

/* Every quantity of a titration within the range its arithmetic
 * allows (AL_MAGNITUDE_MAX): the inputs, then what is made of them, each
 * named when it leaves the range; 0 when all are in it. */
static int
out_of_range(al_assay *run, unsigned long line, const al_titration *t)
{
	const struct {
		const char *name, *what;
		double v;
	} q[] = {
		{ta_column(AL_TF_TITRANT, t->basis), "the titrant volume",
		 t->titrant_ml},
		{ta_column(AL_TF_BLANK, t->basis), "the blank", t->blank_ml},
		{ta_column(AL_TF_CONC, t->basis), "the titrant concentration",
		 t->titrant_mol_l},
		{ta_column(AL_TF_AMOUNT, t->basis), "the sample amount",
		 t->amount},
		{ta_column(AL_TF_MADE_UP, t->basis), "the made-up volume",
		 t->made_up_ml},
		{ta_column(AL_TF_ALIQUOT, t->basis), "the aliquot",
		 t->aliquot_ml},
		{"made_up_ml/aliquot_ml", "the dilution", al_ta_dilution(t)},
		{"titrant_ml", "the meq titrated", al_ta_meq(t)},
		{ta_column(AL_TF_AMOUNT, t->basis), "the meq per unit of sample",
		 al_ta_meq(t) / t->amount},
	};

	for (size_t i = 0; i < sizeof q / sizeof q[0]; i++)
		if (!al_number_computable(q[i].v)) {
			ROW_ERR(run, line, q[i].name,
				"%s (%g) is beyond the range a result can be "
				"computed in (%g to %g)",
				q[i].what, q[i].v, AL_MAGNITUDE_MIN,
				AL_MAGNITUDE_MAX);
			return 1;
		}
	return 0;
}

/* A result no sample can give: more acid than the sample holds. Per
 * mass, at most all of it: 100 g/100g, with AL_IMPOSSIBLE_ALLOWANCE for
 * the scatter of a pure acid's assay (JECFA 2014 limits citric acid to
 * 99.5-100.5 %; single replicates stray further, common practice). Per
 * volume, no solution holds more acid per mL than its own density, and
 * no food acid or its solution is denser than AL_DENSEST_G_ML. */
#define AL_IMPOSSIBLE_ALLOWANCE 5.0
#define AL_DENSEST_G_ML 2.0 /* sulfuric acid 1.83 g/mL (CRC Handbook;
			       from memory), the densest of the catalogue */

static int
impossible(double value, al_unit unit, const al_acid *acid)
{
	double g = al_unit_is_meq(unit) ? value * acid->g_per_meq : value;
	double per_100 = g * 100 / al_unit_per(unit);

	if (al_unit_basis(unit) == AL_BASIS_MASS)
		return !(per_100 <= 100 + AL_IMPOSSIBLE_ALLOWANCE);
	return !(per_100 <= 100 * AL_DENSEST_G_ML);
}

/* The reasons of the current row, "column: message; ...". */
static void
row_reasons(const al_diags *d, char *buf, size_t cap)
{
	size_t len = 0;

	buf[0] = '\0';
	for (size_t i = 0; i < d->count && len + 1 < cap; i++) {
		const al_diag *g = &d->items[i];
		int w = snprintf(buf + len, cap - len, "%s%s%s%s",
				 i ? "; " : "", g->column ? g->column : "",
				 g->column ? ": " : "", g->message);

		if (w < 0)
			break;
		len += (size_t)w;
	}
	if (len >= cap)
		len = cap - 1;
	if (d->errors > d->count && len + 16 < cap)
		snprintf(buf + len, cap - len, "; and %lu more",
			 d->errors - d->count);
}

/* A row with errors: reported (strict) or rejected (keep-going). */
static al_status
bad_row(al_assay *run, const al_csv_row *row)
{
	al_diags *d = &run->row_diags;
	al_status st = AL_OK;

	run->counts.rows_bad++;
	if (run->opt.on_reject == NULL) {
		for (size_t i = 0; i < d->count; i++)
			al_diags_add(&run->diags, AL_SEV_ERROR, d->items[i].file,
				     d->items[i].line, d->items[i].column, "%s",
				     d->items[i].message);
		/* count the ones the row's list could not keep */
		run->diags.errors += d->errors - d->count;
	} else {
		char reason[1024];
		const char *text[5];
		size_t tl[5];

		row_reasons(d, reason, sizeof reason);
		st = run->opt.on_reject(run->opt.reject_ud, run->file,
					row->line, reason, row->raw,
					row->raw_len);
		/* its result, if it has a sample, is flagged */
		if (st == AL_OK && row->nfields == run->header_fields &&
		    text_cells(run, row, text, tl) == AL_OK && tl[2] > 0) {
			struct group *g;
			struct key_look k;
			int created;

			key_ahead(run, text[0], tl[0], text[1], tl[1], text[2],
				  tl[2], &k);
			st = find_group(run, text[0], tl[0], text[1], tl[1],
					text[2], tl[2], &k, &g, &created);
			if (st == AL_OK && created)
				init_group(g, row->line);
			if (st == AL_OK)
				g->flags |= AL_FLAG_REJECTED;
		}
	}
	if (d->out_of_memory || run->diags.out_of_memory)
		st = AL_ENOMEM;
	al_diags_clear(d);
	return st;
}

static al_status
data_row(al_assay *run, const al_csv_row *row)
{
	al_status st = row_values(run, row);

	if (st != AL_OK)
		return st;
	if (run->row_diags.errors > 0 || run->row_diags.out_of_memory)
		return bad_row(run, row);
	return run->diags.out_of_memory ? AL_ENOMEM : AL_OK;
}

static al_status
row_values(al_assay *run, const al_csv_row *row)
{
	unsigned long line = row->line;
	al_titration t;
	const char *text[5];
	size_t tl[5];
	const char *product, *lot, *sample, *replicate, *acid_name;
	const al_spec *spec = NULL;
	const al_acid *acid = NULL, *row_acid = NULL;
	al_unit unit;
	double mass = 0, volume = 0, density = 0, endpoint = 0, value;
	int got_mass, got_volume, got_density, got_endpoint, got;
	unsigned flags = 0;
	double needed = 0, conc_u = -1, brix = 0, water = 0;
	int got_brix, got_water;
	long date;
	struct group *g;
	struct key_look look;
	int created;
	al_status st;

	if (row->syntax_error) {
		run->counts.rows_read++;
		ROW_ERR(run, line, NULL, "%s", row->syntax_error);
		return AL_OK;
	}
	if (row_is_empty(row))
		return AL_OK; /* a spreadsheet's empty line: like a blank line */
	if (row->nfields != run->header_fields) {
		run->counts.rows_read++;
		ROW_ERR(run, line, NULL, "%zu fields where the header has %zu",
			row->nfields, run->header_fields);
		return AL_OK;
	}
	if (repeats_header(run, row)) {
		/* files joined end to end: say so rather than fail every cell */
		RUN_DIAG(run, AL_SEV_WARNING, line, NULL,
			 "this line repeats the header (files joined?); skipped");
		return AL_OK;
	}
	run->counts.rows_read++;
	memset(&t, 0, sizeof t);
	if (text_cells(run, row, text, tl) != AL_OK)
		return AL_ENOMEM;
	product = text[0];
	lot = text[1];
	sample = text[2];
	replicate = text[3];
	acid_name = text[4];
	key_ahead(run, product, tl[0], lot, tl[1], sample, tl[2], &look);
	{
		static const char *const names[5] = {"product", "lot", "sample",
						     "replicate", "acid"};

		/* a record of ASCII bytes only is UTF-8 throughout */
		for (int i = 0; i < 5 && !row->ascii; i++)
			if (!al_utf8_valid(text[i], tl[i]))
				ROW_ERR(run, line, names[i],
					"is not valid UTF-8 text (save the file "
					"as UTF-8)");
	}

	if (tl[2] == 0)
		ROW_ERR(run, line, "sample", "is empty: every row needs a "
					    "sample identifier");
	{
		static const char *const names[4] = {"product", "lot", "sample",
						     "replicate"};

		/* cut, a long identifier could match another's start */
		for (int i = 0; i < 4; i++)
			if (tl[i] > AL_IDENT_MAX)
				ROW_ERR(run, line, names[i],
					"is longer than %d bytes", AL_IDENT_MAX);
	}
	got = al_cell_number(row, run->col[C_TITRANT], "titrant_ml",
				 run->point, run->file, &run->row_diags, &t.titrant_ml);
	if (got == 0)
		ROW_ERR(run, line, "titrant_ml", "is empty");
	got_mass = al_cell_number(row, run->col[C_MASS], "mass_g",
				 run->point, run->file, &run->row_diags, &mass);
	got_volume = al_cell_number(row, run->col[C_VOLUME], "volume_ml",
				 run->point, run->file, &run->row_diags, &volume);
	if (got_mass == 1 && got_volume == 1)
		ROW_ERR(run, line, NULL, "both mass_g and volume_ml are given: "
					 "a row takes exactly one");
	else if (got_mass == 0 && got_volume == 0)
		ROW_ERR(run, line, NULL, "neither mass_g nor volume_ml is given: "
					 "a row needs exactly one");
	t.basis = got_volume == 1 ? AL_BASIS_VOLUME : AL_BASIS_MASS;
	t.amount = got_volume == 1 ? volume : mass;
	got = number_or_default(run, row, C_BLANK, run->opt.has_blank,
				run->opt.blank_ml, &t.blank_ml);
	if (got == 0)
		t.blank_ml = 0;
	got = number_or_default(run, row, C_CONC, run->opt.has_titrant,
				run->opt.titrant_mol_l, &t.titrant_mol_l);
	if (row_date(run, row, line, &date) != 0)
		got = 1; /* the row is invalid: no lot looked up on no date */
	else if (run->opt.titrants && run->col[C_TITRANT_LOT] >= 0) {
		const al_titrant *reg_lot = titrant_of(run, row, line, date);

		if (reg_lot) {
			if (got == 1 &&
			    fabs(t.titrant_mol_l - reg_lot->concentration_mol_l) >
				    0.001 * reg_lot->concentration_mol_l)
				RUN_DIAG(run, AL_SEV_WARNING, line,
					 "titrant_mol_l",
					 "%g mol/L differs from %g mol/L of "
					 "titrant lot '%s' in the register; the "
					 "register's is used",
					 t.titrant_mol_l,
					 reg_lot->concentration_mol_l, reg_lot->lot);
			t.titrant_mol_l = reg_lot->concentration_mol_l;
			conc_u = reg_lot->u_mol_l;
			got = 1;
		} else if (run->row_diags.errors > 0)
			got = 1; /* reported by titrant_of */
	}
	if (got == 0) {
		ROW_ERR(run, line, "titrant_mol_l",
			"is empty and no --titrant-mol-l was given");
		t.titrant_mol_l = 1; /* keep checking the rest of the row */
	}
	if (run->col[C_MADE_UP] >= 0) {
		int a = al_cell_number(row, run->col[C_MADE_UP], "made_up_ml",
				 run->point, run->file, &run->row_diags,
				       &t.made_up_ml);
		int b = al_cell_number(row, run->col[C_ALIQUOT], "aliquot_ml",
				 run->point, run->file, &run->row_diags,
				       &t.aliquot_ml);
		if ((a == 1) != (b == 1) && a >= 0 && b >= 0)
			ROW_ERR(run, line, a == 1 ? "aliquot_ml" : "made_up_ml",
				"is empty: made_up_ml and aliquot_ml go "
				"together");
	}
	got_density = number_or_default(run, row, C_DENSITY,
					 run->opt.has_density,
					 run->opt.density_g_ml, &density);
	if (got_density == 1 && !(density > 0))
		ROW_ERR(run, line, "density_g_ml", "density must be above 0");
	got_endpoint = number_or_default(run, row, C_ENDPOINT,
					 run->opt.has_endpoint,
					 run->opt.endpoint_ph, &endpoint);
	if (got_endpoint == 1 && !(endpoint >= 0 && endpoint <= 14))
		ROW_ERR(run, line, "endpoint_ph",
			"endpoint pH %g is outside 0 to 14", endpoint);
	got_brix = al_cell_number(row, run->col[C_BRIX], "brix", run->point,
				  run->file, &run->row_diags, &brix);
	if (got_brix == 1 && !(brix >= 0 && brix <= 100))
		ROW_ERR(run, line, "brix", "Brix %g is outside 0 to 100", brix);
	got_water = al_cell_number(row, run->col[C_WATER], "water_pct",
				   run->point, run->file, &run->row_diags,
				   &water);
	if (got_water == 1 && !(water >= 0 && water < 100))
		ROW_ERR(run, line, "water_pct",
			"water %g %% is outside 0 to below 100", water);

	if (run->row_diags.errors == 0) {
		al_ta_problem probs[8];
		size_t np = al_ta_check(&t, probs, 8);

		for (size_t i = 0; i < np && i < 8; i++)
			ROW_ERR(run, line, ta_column(probs[i].field, t.basis),
				"%s", probs[i].message);
		if (np == 0)
			out_of_range(run, line, &t);
	}

	/* The acid: the specification's, else the row's, else the default. */
	spec = spec_of(run, &run->specs, product, tl[0]);
	if (tl[4] > 0) {
		row_acid = al_catalogue_find(run->opt.catalogue, acid_name);
		if (row_acid == NULL)
			ROW_ERR(run, line, "acid",
				"'%s' is not in the acid catalogue (see "
				"'acidlot acids')",
				acid_name);
	}
	if (spec && spec->acid) {
		acid = spec->acid;
		if (row_acid && row_acid != acid)
			flags |= AL_FLAG_ACID_IGNORED;
	} else
		acid = row_acid ? row_acid : run->opt.default_acid;

	if (spec && spec->has_unit)
		unit = spec->unit;
	else if (run->opt.has_unit)
		unit = run->opt.unit;
	else
		unit = t.basis == AL_BASIS_MASS ? AL_UNIT_G_100G
						: AL_UNIT_G_100ML;

	if (run->row_diags.errors != 0 || acid == NULL)
		return AL_OK;

	st = find_group(run, product, tl[0], lot, tl[1], sample, tl[2], &look,
			&g, &created);
	if (st != AL_OK)
		return st;
	if (created)
		init_group(g, line);
	if (g->acid == 0) {
		int anhydrous = spec && spec->has_basis ? spec->anhydrous
							: run->opt.anhydrous;

		g->acid = acid_slot(run, acid);
		if (g->acid == 0) {
			ROW_ERR(run, line, "acid",
				"more than 255 different acids in one run");
			return AL_OK;
		}
		g->unit = (uint8_t)unit;
		g->bits |= (t.basis == AL_BASIS_VOLUME ? G_VOLUME : 0) |
			   (anhydrous ? G_ANHYDROUS : 0);
	} else if (group_acid(run, g) != acid) {
		ROW_ERR(run, line, "acid",
			"'%s' differs from '%s' of the same product, lot and "
			"sample first seen at %s:%lu; one result cannot mix "
			"acids",
			acid->name, group_acid(run, g)->name,
			group_file(run, g), (unsigned long)g->first_line);
		return AL_OK;
	}
	if (tl[3] > 0 && g->n < AL_VALUES_KEPT &&
	    twice(run, g, line, replicate, tl[3]))
		return run->row_diags.out_of_memory ? AL_ENOMEM : AL_OK;
	unit = (al_unit)g->unit;
	if (al_unit_basis(unit) != t.basis && got_density != 1 &&
	    got_brix == 1) {
		/* the sucrose density of its Brix (NBS), when none is given */
		if (al_density_from_brix(brix, &density) == AL_OK) {
			got_density = 1;
			flags |= AL_FLAG_DENSITY_BRIX;
		} else {
			ROW_ERR(run, line, "brix",
				"a density from Brix needs 0 to 40 Brix (the NBS "
				"sucrose table's range); give density_g_ml");
			return AL_OK;
		}
	}
	if (al_unit_basis(unit) != t.basis) {
		if (got_density != 1) {
			ROW_ERR(run, line,
				t.basis == AL_BASIS_MASS ? "mass_g" : "volume_ml",
				"the result is reported in %s but this sample "
				"was taken by %s: give density_g_ml or "
				"--density-g-ml",
				al_unit_name(unit),
				t.basis == AL_BASIS_MASS ? "mass" : "volume");
			return AL_OK;
		}
		flags |= AL_FLAG_DENSITY;
	}
	if (al_ta_value(&t, acid->g_per_meq, unit, density, &value) != AL_OK) {
		ROW_ERR(run, line, NULL, "cannot express the result in %s",
			al_unit_name(unit));
		return AL_OK;
	}
	flags |= plausibility(run, line, &t);
	if (g->bits & G_ANHYDROUS) {
		if (got_water != 1) {
			ROW_ERR(run, line, "water_pct",
				"is needed for a result on the anhydrous basis");
			return AL_OK;
		}
		if (al_unit_basis(unit) != AL_BASIS_MASS) {
			ROW_ERR(run, line, NULL,
				"the anhydrous basis needs a per-mass unit, not "
				"%s",
				al_unit_name(unit));
			return AL_OK;
		}
		/* assay = meq E 100 / (m (1 - water/100)) (METHODS.md s.6) */
		al_anhydrous(value, water, &value);
	}
	if (!al_number_computable(value)) {
		ROW_ERR(run, line, NULL,
			"the result (%g %s) is beyond the range a result can "
			"be computed in (%g to %g)",
			value, al_unit_name(unit), AL_MAGNITUDE_MIN,
			AL_MAGNITUDE_MAX);
		return AL_OK;
	}
	if (impossible(value, unit, acid)) {
		RUN_DIAG(run, AL_SEV_WARNING, line, NULL,
			 "%g %s of %s is more than the sample can hold: "
			 "check the mass, volume and units",
			 value, al_unit_name(unit), acid->name);
		flags |= AL_FLAG_IMPLAUSIBLE;
		g->bits |= G_IMPOSSIBLE;
	}
	if (got_endpoint == 1 && acid->n_pka > 0) {
		double titrated =
			al_protons_titrated(acid->pka, acid->n_pka, endpoint);

		if (titrated < ENDPOINT_SHARE * acid->protons) {
			flags |= AL_FLAG_ENDPOINT_LOW;
			if (al_endpoint_ph_needed(acid->pka, acid->n_pka,
						  acid->protons, ENDPOINT_SHARE,
						  &needed) != AL_OK)
				needed = 14;
		}
	}
	/* the inputs few rows have: a sum of zeros stays zero, so a group
	 * gets its extra sums only when it has one of them */
	if (t.blank_ml != 0 || t.made_up_ml != 0 || t.aliquot_ml != 0 ||
	    conc_u >= 0 || got_brix == 1 || got_water == 1 ||
	    got_density == 1 || (flags & AL_FLAG_ENDPOINT_LOW)) {
		struct group_extra *x = extra_of(run, g);

		if (x == NULL)
			return AL_ENOMEM;
		x->sum_blank += t.blank_ml;
		x->sum_made_up += t.made_up_ml;
		x->sum_aliquot += t.aliquot_ml;
		if (conc_u >= 0) {
			x->sum_conc_u += conc_u;
			x->n_conc_u++;
		}
		if (got_brix == 1) {
			x->sum_brix += brix;
			x->n_brix++;
		}
		if (got_water == 1) {
			x->sum_water += water;
			x->n_water++;
		}
		if (got_density == 1) {
			x->sum_density += density;
			x->n_density++;
		}
		if ((flags & AL_FLAG_ENDPOINT_LOW) && endpoint < x->min_endpoint)
			x->min_endpoint = endpoint;
	}
	{
		al_eval_row er = {
			value,
			t.titrant_ml,
			t.blank_ml,
			t.titrant_mol_l,
			t.amount,
			t.made_up_ml,
			t.aliquot_ml,
			conc_u,
			got_brix == 1 ? brix : -1,
			got_water == 1 ? water : -1,
			got_density == 1 ? density : -1,
		};

		st = note_extremes(run, g, &er);
		if (st == AL_OK && tl[3] > 0 && g->n < AL_VALUES_KEPT)
			st = al_labels_add(
				run->labels, &g->labels,
				(size_t)(g - run->groups), group_start(run, g),
				replicate, tl[3],
				(al_label_at){(uint32_t)(run->n_files - 1), line});
		if (st == AL_OK)
			st = push_value(g, value);
		if (st != AL_OK)
			return st;
	}
	g->flags |= flags;
	g->sum_titrant += t.titrant_ml;
	g->sum_conc += t.titrant_mol_l;
	g->sum_amount += t.amount;
	run->counts.rows_used++;
	if (run->on_row)
		return keep_row(run, g, line, al_ta_meq(&t), value, flags, needed,
				replicate);
	return AL_OK;
}

static al_status
on_csv_row(void *ud, const al_csv_row *row)
{
	al_assay *run = ud;

	if (!run->header_done) {
		al_status st = check_header(run, row);

		/* a file whose header cannot be read is not read further:
		 * its rows would only add noise to the real problem */
		if (st == AL_ENOMEM)
			return st;
		return run->header_ok ? AL_OK : AL_EINPUT;
	}
	if (!run->header_ok)
		return AL_OK;
	return data_row(run, row);
}

al_status
al_assay_read(al_assay *run, FILE *in, const char *name,
	      al_replicate_fn on_row, void *ud)
{
	return al_assay_read_source(run, al_read_stdio, in, name, on_row, ud);
}

al_status
al_assay_read_source(al_assay *run, al_read_fn read_fn, void *ctx,
		     const char *name, al_replicate_fn on_row, void *ud)
{
	char **files;
	al_status st;
	unsigned long rows_before = run->counts.rows_read;

	files = al_realloc(run->files, (run->n_files + 1) * sizeof *files);
	if (files == NULL)
		return AL_ENOMEM;
	run->files = files;
	{
		size_t *fg = al_realloc(run->file_groups,
					(run->n_files + 1) * sizeof *fg);

		if (fg == NULL)
			return AL_ENOMEM;
		run->file_groups = fg;
		fg[run->n_files] = run->n_groups;
	}
	run->files[run->n_files] = al_strdup(name);
	if (run->files[run->n_files] == NULL)
		return AL_ENOMEM;
	run->n_files++;
	run->file = run->files[run->n_files - 1];
	run->header_done = run->header_ok = 0;
	run->on_row = on_row;
	run->ud = ud;
	st = al_csv_read(&run->opt.csv, read_fn, ctx, run->file, on_csv_row,
			 run, &run->diags);
	/* no group is made after the reading */
	if (st == AL_OK && run->diags.out_of_memory)
		st = AL_ENOMEM;
	if (st == AL_OK && !run->header_done) {
		RUN_DIAG(run, AL_SEV_ERROR, 0, NULL,
			 "the file is empty (no header row)");
		st = run->diags.out_of_memory ? AL_ENOMEM : AL_EINPUT;
	} else if (st == AL_OK && !run->header_ok)
		st = AL_EINPUT;
	else if (st == AL_OK && run->counts.rows_read == rows_before) {
		/* a header alone, or blank lines: nothing to judge, and no
		 * report replaced by a bare header */
		RUN_DIAG(run, AL_SEV_ERROR, 0, NULL, "no titrations");
		st = run->diags.out_of_memory ? AL_ENOMEM : AL_EINPUT;
	}
	if (st == AL_OK && run->diags.out_of_memory)
		st = AL_ENOMEM;
	return st;
}


/* Hands the kept rows to on_row in input order, each with the screens'
 * flags of its value. */
static al_status
replay_rows(al_assay *run)
{
	for (size_t i = 0; i < run->n_kept; i++) {
		const struct kept_row *k = &run->kept[i];
		const al_group_result *r = al_assay_result(run, k->group);
		al_replicate rep;
		al_status st;

		memset(&rep, 0, sizeof rep);
		rep.file = run->files[k->file];
		rep.line = k->line;
		rep.product = r->product;
		rep.lot = r->lot;
		rep.sample = r->sample;
		rep.replicate = run->kept_text + k->replicate;
		rep.meq = k->meq;
		rep.value = k->value;
		rep.unit = r->unit;
		rep.acid = r->acid;
		rep.flags = k->flags;
		rep.endpoint_ph_needed = k->needed;
		if (r->has_grubbs && k->pos == r->grubbs_index)
			rep.flags |= r->flags & (AL_FLAG_OUTLIER | AL_FLAG_STRAGGLER);
		if (r->has_dixon && k->pos == r->dixon_index)
			rep.flags |= r->flags & AL_FLAG_DIXON;
		if (r->has_excluded && k->pos == r->excluded_index)
			rep.flags |= AL_FLAG_EXCLUDED;
		st = run->on_row(run->ud, &rep);
		if (st != AL_OK)
			return st;
	}
	return AL_OK;
}

/* The group's reading resolution relative to its results
 * (al_eval_resolution at its mean titrant and blank). */
static double
resolution_of(const al_assay *run, struct al_assay_reader *rd,
	      const struct group *g)
{
	size_t pl, ll;
	const char *k = key_parts(run, g, &pl, &ll);
	const struct group_extra *x = g->extra ? &run->extras[g->extra - 1]
					       : NULL;
	double n = g->n ? (double)g->n : 1;

	return al_eval_resolution(&run->opt, spec_of(run, &rd->specs, k, pl),
				  g->sum_titrant / n,
				  x ? x->sum_blank / n : 0);
}

/* The acid a result is expressed as: its rows', or, when every row of
 * it was rejected, its spec's or the run's default. */
static const al_acid *
result_acid(const al_assay *run, const struct group *g, const al_spec *spec)
{
	if (g->acid != 0)
		return group_acid(run, g);
	return spec && spec->acid ? spec->acid : run->opt.default_acid;
}

/* Evaluates group i into the reader's result: statistics, screens,
 * uncertainty, verdict. Reads the run, but for the verdict and flags
 * that the first evaluation of a result keeps in its group. */
static void
evaluate(const al_assay *run, struct al_assay_reader *rd, size_t i)
{
	al_group_result *r = &rd->cur;
	const struct group *g = &run->groups[i];
	const struct group_extra *x = g->extra ? &run->extras[g->extra - 1]
					       : NULL;
	size_t pl, ll;
	const char *k = key_parts(run, g, &pl, &ll);
	al_eval_inputs in;
	double n = g->n ? (double)g->n : 1;
	const al_spec *spec = spec_of(run, &rd->specs, k, pl);

	memset(r, 0, sizeof *r);
	r->product = k;
	r->lot = k + pl + 1;
	r->sample = k + pl + ll + 2;
	r->spec = spec;
	r->acid = result_acid(run, g, spec);
	if (g->acid == 0) {
		/* every row of it was rejected: name it as its spec or the
		 * defaults would */
		r->unit = spec && spec->has_unit ? spec->unit
			  : run->opt.has_unit	 ? run->opt.unit
						 : AL_UNIT_G_100G;
	} else {
		r->unit = (al_unit)g->unit;
	}
	r->values = group_values(g);
	r->n_values = g->n;
	r->flags = g->flags;
	memset(&in, 0, sizeof in);
	if (g->bits & G_STREAM)
		in.stream = g->values.stream;
	in.titrant_ml = g->sum_titrant / n;
	in.conc = g->sum_conc / n;
	in.amount = g->sum_amount / n;
	in.basis = g->bits & G_VOLUME ? AL_BASIS_VOLUME : AL_BASIS_MASS;
	in.n = g->n;
	if (x) {
		in.blank_ml = x->sum_blank / n;
		in.made_up_ml = x->sum_made_up / n;
		in.aliquot_ml = x->sum_aliquot / n;
		in.all_conc_u = g->n > 0 && x->n_conc_u == g->n;
		in.conc_u = x->n_conc_u ? x->sum_conc_u / x->n_conc_u : 0;
		in.has_brix = x->n_brix > 0;
		in.brix = x->n_brix ? x->sum_brix / x->n_brix : 0;
		in.has_water = x->n_water > 0;
		in.water_pct = x->n_water ? x->sum_water / x->n_water : 0;
		in.density = x->n_density ? x->sum_density / x->n_density : 0;
		in.n_conc_u = x->n_conc_u;
		in.n_brix = x->n_brix;
		in.n_water = x->n_water;
		in.n_density = x->n_density;
	}
	if (i < run->n_extremes)
		in.extremes = run->extremes[i].row;
	r->anhydrous = (g->bits & G_ANHYDROUS) != 0;
	in.impossible = (g->bits & G_IMPOSSIBLE) != 0;
	al_eval_result(&run->opt, &in, rd->scratch, r);
	if (!(g->bits & G_JUDGED)) {
		/* the run keeps each result's verdict and flags from its
		 * first evaluation, in whichever thread: each result is
		 * evaluated by one at a time (al_assay_finish,
		 * al_report_write). Evaluation only adds flags, so keeping
		 * them all changes no later evaluation and lets
		 * al_assay_result_flags answer without one. */
		struct group *w = &run->groups[i];

		w->verdict = (uint8_t)r->verdict;
		w->flags = r->flags;
		w->bits |= G_JUDGED;
	}
	if ((g->flags & AL_FLAG_ENDPOINT_LOW) && x) {
		r->endpoint_ph = x->min_endpoint;
		if (al_endpoint_ph_needed(r->acid->pka, r->acid->n_pka,
					  r->acid->protons, ENDPOINT_SHARE,
					  &r->endpoint_ph_needed) != AL_OK)
			r->endpoint_ph_needed = 14;
	}
}

/* Adds an item to a short list of pointers in order of first
 * appearance; 0, or -1 when memory runs out. */
static int
note_used(const void ***list, size_t *n, const void *item)
{
	const void **grown;

	if (item == NULL || (*n > 0 && (*list)[*n - 1] == item))
		return 0;
	for (size_t i = 0; i < *n; i++)
		if ((*list)[i] == item)
			return 0;
	grown = al_realloc((void *)*list, (*n + 1) * sizeof *grown);
	if (grown == NULL)
		return -1;
	grown[(*n)++] = item;
	*list = grown;
	return 0;
}

/* What Cochran's test takes of a result: its product, n and variance,
 * from its statistics as evaluate gives them, without the rest of an
 * evaluation: al_stats_sd of its values, or al_eval_stats where an
 * outlier may be left out or only running sums are kept. */
struct spread {
	const char *product;
	double var;
	size_t n;
	int has_sd;
};

/* From AL_LANES_MIN results on, a second thread does every other chunk
 * of them (lanes.h), into a slot of AL_LANES_CHUNK when the caller must
 * take them in order. */
struct finish_job {
	al_assay *run;
	al_assay_reader *rd; /* the second thread's */
	al_cochran_acc *acc;
	int oom;
	struct spread *slot[2];
};

static void
spread_of(const al_assay *run, struct al_assay_reader *rd, size_t i,
	  struct spread *x)
{
	const struct group *g = &run->groups[i];
	al_group_result *r = &rd->cur;
	size_t used;

	x->product = run->arena + g->key;
	if (!run->opt.qc.exclude_outliers && !(g->bits & G_STREAM)) {
		/* no value is left out: the statistics of all of them */
		double mean, sd = 0;

		x->has_sd = al_stats_sd(group_values(g), g->n, &mean, &sd);
		x->var = sd * sd;
		x->n = g->n;
		return;
	}
	rd->cur_index = 0; /* cur holds no whole result from here on */
	r->values = group_values(g);
	r->n_values = g->n;
	r->flags = g->flags;
	al_eval_stats(&run->opt, g->bits & G_STREAM ? g->values.stream : NULL,
		      resolution_of(run, rd, g), rd->scratch, r, &used);
	x->has_sd = r->stats.has_sd;
	x->var = r->stats.sd * r->stats.sd;
	x->n = r->stats.n;
}

/* The in-order part, result by result. */
static void
take_spread(struct finish_job *j, size_t i, const struct spread *x)
{
	if (!j->oom && x->has_sd &&
	    al_cochran_acc_add(j->acc, x->product, x->n, x->var, i) != 0)
		j->oom = 1;
}

static void
cochran_own(void *ctx, size_t begin, size_t end)
{
	struct finish_job *j = ctx;

	for (size_t i = begin; i < end; i++) {
		struct spread x;

		spread_of(j->run, &j->run->own, i, &x);
		take_spread(j, i, &x);
	}
}

static void
cochran_make(void *ctx, size_t begin, size_t end, int s)
{
	struct finish_job *j = ctx;

	for (size_t i = begin; i < end; i++)
		spread_of(j->run, j->rd, i, &j->slot[s][i - begin]);
}

static void
cochran_take(void *ctx, size_t begin, size_t end, int s)
{
	struct finish_job *j = ctx;

	for (size_t i = begin; i < end; i++)
		take_spread(j, i, &j->slot[s][i - begin]);
}

/* Every result evaluated once (evaluate keeps its verdict and flags in
 * the group); nothing to take in order. */
static void
judge(const al_assay *run, struct al_assay_reader *rd, size_t begin,
      size_t end)
{
	for (size_t i = begin; i < end; i++)
		if (!(run->groups[i].bits & G_JUDGED))
			reader_result(rd, i);
}

static void
judge_own(void *ctx, size_t begin, size_t end)
{
	struct finish_job *j = ctx;

	judge(j->run, &j->run->own, begin, end);
}

static void
judge_make(void *ctx, size_t begin, size_t end, int s)
{
	struct finish_job *j = ctx;

	(void)s;
	judge(j->run, j->rd, begin, end);
}

static void
judge_take(void *ctx, size_t begin, size_t end, int s)
{
	(void)ctx;
	(void)begin;
	(void)end;
	(void)s;
}

/* Runs own/make/take over the results, in two threads from
 * AL_LANES_MIN results on (with slots of struct spread when slots). */
static int
finish_lanes(struct finish_job *j, int slots,
	     void (*own)(void *, size_t, size_t),
	     void (*make)(void *, size_t, size_t, int),
	     void (*take)(void *, size_t, size_t, int))
{
	al_assay *run = j->run;

	if (run->n_groups >= AL_LANES_MIN && run->opt.threads != 1) {
		j->rd = al_assay_reader_new(run);
		for (int s = 0; slots && s < 2; s++)
			j->slot[s] = al_malloc(AL_LANES_CHUNK *
					       sizeof *j->slot[s]);
		if (j->rd == NULL ||
		    (slots && (j->slot[0] == NULL || j->slot[1] == NULL)))
			j->oom = 1;
	}
	if (!j->oom && j->rd != NULL) {
		al_lanes job = {j, run->n_groups, own, make, take};

		al_lanes_run(&job);
	} else if (!j->oom) {
		own(j, 0, run->n_groups);
	}
	al_free(j->slot[0]);
	al_free(j->slot[1]);
	j->slot[0] = j->slot[1] = NULL;
	al_assay_reader_free(j->rd);
	j->rd = NULL;
	return j->oom ? -1 : 0;
}

/* Cochran's tests, and their flags on the results they single out. */
static al_status
finish_cochran(al_assay *run)
{
	struct finish_job j;

	/* the key index is not needed any more */
	al_free(run->slots);
	run->slots = NULL;
	run->n_slots = 0;
	run->last_group = 0;
	memset(&j, 0, sizeof j);
	j.run = run;
	j.acc = al_cochran_acc_new();
	if (j.acc == NULL)
		return AL_ENOMEM;
	run->finished = 1;
	run->own.run = run;
	run->own.cur_index = 0;
	memset(run->counts.by_verdict, 0, sizeof run->counts.by_verdict);
	run->counts.groups = run->n_groups;
	if (finish_lanes(&j, 1, cochran_own, cochran_make, cochran_take) == 0)
		run->cochran = al_cochran_acc_finish(j.acc, &run->n_cochran,
						     &j.oom);
	al_cochran_acc_free(j.acc);
	if (j.oom)
		return AL_ENOMEM;
	for (size_t i = 0; i < run->n_cochran; i++) {
		const al_cochran *c = &run->cochran[i];

		if (c->c > c->crit1)
			run->groups[c->result].flags |= AL_FLAG_COCHRAN_OUTLIER;
		else if (c->c > c->crit5)
			run->groups[c->result].flags |= AL_FLAG_COCHRAN_STRAGGLER;
	}
	run->own.cur_index = 0;
	return AL_OK;
}

al_status
al_assay_finish_lazy(al_assay *run)
{
	al_status st = finish_cochran(run);

	if (st != AL_OK)
		return st;
	return run->on_row ? replay_rows(run) : AL_OK;
}

al_status
al_assay_settle(al_assay *run)
{
	memset(run->counts.by_verdict, 0, sizeof run->counts.by_verdict);
	run->n_acids_used = run->n_specs_used = 0;
	for (size_t i = 0; i < run->n_groups; i++) {
		const struct group *g = &run->groups[i];
		const al_spec *spec;
		size_t pl, ll;
		const char *k = key_parts(run, g, &pl, &ll);

		if (!(g->bits & G_JUDGED))
			reader_result(&run->own, i);
		run->counts.by_verdict[g->verdict]++;
		spec = spec_of(run, &run->own.specs, k, pl);
		if (note_used((const void ***)&run->acids_used,
			      &run->n_acids_used,
			      result_acid(run, g, spec)) != 0 ||
		    note_used((const void ***)&run->specs_used,
			      &run->n_specs_used, spec) != 0)
			return AL_ENOMEM;
	}
	return AL_OK;
}

al_status
al_assay_finish(al_assay *run)
{
	struct finish_job j;
	al_status st = finish_cochran(run);

	if (st != AL_OK)
		return st;
	memset(&j, 0, sizeof j);
	j.run = run;
	if (finish_lanes(&j, 0, judge_own, judge_make, judge_take) != 0)
		return AL_ENOMEM;
	st = al_assay_settle(run);
	if (st != AL_OK)
		return st;
	return run->on_row ? replay_rows(run) : AL_OK;
}

unsigned
al_assay_result_flags(const al_assay *run, size_t i)
{
	return run->finished && i < run->n_groups ? run->groups[i].flags : 0;
}

al_verdict
al_assay_result_verdict(const al_assay *run, size_t i)
{
	return (al_verdict)run->groups[i].verdict;
}

const al_acid *
al_assay_acid_used(const al_assay *run, size_t i)
{
	return i < run->n_acids_used ? run->acids_used[i] : NULL;
}

const al_spec *
al_assay_spec_used(const al_assay *run, size_t i)
{
	return i < run->n_specs_used ? run->specs_used[i] : NULL;
}

size_t
al_assay_cochran_count(const al_assay *run)
{
	return run->n_cochran;
}

const al_cochran *
al_assay_cochran_at(const al_assay *run, size_t i)
{
	return i < run->n_cochran ? &run->cochran[i] : NULL;
}

const al_titrant *
al_assay_titrant_used(const al_assay *run, size_t i)
{
	return i < run->n_lots_used ? run->lots_used[i] : NULL;
}

void
al_flags_format(unsigned flags, double endpoint_needed, char *buf, size_t cap)
{
	static const struct {
		unsigned bit;
		const char *name;
	} names[] = {
		{AL_FLAG_SINGLE, "single-replicate"},
		{AL_FLAG_FEW, "too-few-replicates"},
		{AL_FLAG_RSD, "rsd-over-limit"},
		{AL_FLAG_BELOW_MIN, "below-min"},
		{AL_FLAG_ABOVE_MAX, "above-max"},
		{AL_FLAG_ENDPOINT_LOW, "endpoint-low"},
		{AL_FLAG_ACID_IGNORED, "row-acid-ignored"},
		{AL_FLAG_DENSITY, "density-converted"},
		{AL_FLAG_IMPLAUSIBLE, "implausible-value"},
		{AL_FLAG_REJECTED, "rows-rejected"},
		{AL_FLAG_OUTLIER, "grubbs-outlier"},
		{AL_FLAG_STRAGGLER, "grubbs-straggler"},
		{AL_FLAG_DIXON, "dixon-outlier"},
		{AL_FLAG_EXCLUDED, "outlier-excluded"},
		{AL_FLAG_RANGE, "range-over-critical"},
		{AL_FLAG_COCHRAN_OUTLIER, "cochran-outlier"},
		{AL_FLAG_COCHRAN_STRAGGLER, "cochran-straggler"},
		{AL_FLAG_NO_TITRANT_U, "u-without-titrant"},
		{AL_FLAG_BRIX_LOW, "brix-below-min"},
		{AL_FLAG_BRIX_HIGH, "brix-above-max"},
		{AL_FLAG_RATIO_LOW, "ratio-below-min"},
		{AL_FLAG_RATIO_HIGH, "ratio-above-max"},
		{AL_FLAG_WATER_LOW, "water-below-min"},
		{AL_FLAG_WATER_HIGH, "water-above-max"},
		{AL_FLAG_NO_BRIX, "no-brix-or-water-values"},
		{AL_FLAG_DENSITY_BRIX, "density-from-brix"},
		{AL_FLAG_BRIX_UNCORRECTED, "brix-not-acid-corrected"},
		{AL_FLAG_MANY, "many-replicates"},
	};
	size_t len = 0;

	if (cap == 0)
		return;
	buf[0] = '\0';
	for (size_t i = 0; i < sizeof names / sizeof names[0]; i++) {
		int w;

		if (!(flags & names[i].bit))
			continue;
		if (names[i].bit == AL_FLAG_ENDPOINT_LOW)
			/* round the pH that suffices up to 0.1 */
			w = snprintf(buf + len, cap - len,
				     "%sendpoint-low(needs pH>=%.1f)",
				     len ? ";" : "",
				     ceil(endpoint_needed * 10 - 1e-9) / 10);
		else {
			/* what snprintf("%s%s", sep, name) would write, cut
			 * to the room left as it cuts */
			size_t sep = len ? 1 : 0;
			size_t nl = strlen(names[i].name) + sep;
			size_t room = cap - len - 1, put = nl < room ? nl : room;

			if (sep && put > 0)
				buf[len] = ';';
			if (put > sep)
				memcpy(buf + len + sep, names[i].name, put - sep);
			buf[len + put] = '\0';
			w = (int)nl;
		}
		if (w < 0 || (size_t)w >= cap - len)
			break;
		len += (size_t)w;
	}
}
