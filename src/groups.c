/* acidlot: replicates grouped into results (see groups.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "groups.h"

#include <math.h>
#include <string.h>

#include "acidlot/alloc.h"
#include "hash.h"

void
al_groups_free(al_groups *gs)
{
	for (size_t i = 0; i < gs->n; i++) {
		al_group *g = &gs->g[i];

		if (g->bits & AL_G_HEAP)
			al_free(g->values.heap.p);
		else if (g->bits & AL_G_STREAM)
			al_free(g->values.stream);
	}
	AL_FREE_ALL(gs->g, gs->arena, gs->slots, gs->extras, gs->extremes,
		    gs->file_first);
	memset(gs, 0, sizeof *gs);
}

al_status
al_groups_begin_file(al_groups *gs)
{
	size_t *grown = al_realloc(gs->file_first,
				   (gs->n_files + 1) * sizeof *grown);

	if (grown == NULL)
		return AL_ENOMEM;
	gs->file_first = grown;
	grown[gs->n_files++] = gs->n;
	return AL_OK;
}

size_t
al_groups_file_of(const al_groups *gs, size_t i)
{
	size_t f = gs->n_files - 1;

	while (f > 0 && gs->file_first[f] > i)
		f--;
	return f;
}

/* The hash of product \0 lot \0 sample, as the arena stores the key. */
static uint64_t
key_hash(const al_key *k)
{
	uint64_t h = AL_FNV_OFFSET;

	h = al_fnv1a(h, k->product, k->pl);
	h = al_fnv1a(h, "", 1);
	h = al_fnv1a(h, k->lot, k->ll);
	h = al_fnv1a(h, "", 1);
	return al_mix64(al_fnv1a(h, k->sample, k->sl));
}

/* Whether group g's key is k. Fields never hold NUL (the reader refuses
 * it), so the parts and their ends compare unambiguously. */
static int
key_is(const al_groups *gs, const al_group *g, const al_key *k)
{
	const char *s = gs->arena + g->key;

	if (k->pl + k->ll + k->sl + 3 > gs->arena_len - g->key)
		return 0;
	if (memcmp(s, k->product, k->pl) != 0 || s[k->pl] != '\0')
		return 0;
	s += k->pl + 1;
	if (memcmp(s, k->lot, k->ll) != 0 || s[k->ll] != '\0')
		return 0;
	s += k->ll + 1;
	return memcmp(s, k->sample, k->sl) == 0 && s[k->sl] == '\0';
}

const char *
al_groups_key(const al_groups *gs, const al_group *g, size_t *pl, size_t *ll)
{
	const char *k = gs->arena + g->key;

	*pl = strlen(k);
	*ll = strlen(k + *pl + 1);
	return k;
}

/* The key index: open addressing with linear probing at a load of at
 * most 0.7. A slot holds the top 32 bits of the key's hash above the
 * group's number + 1 (0: empty): a probe settles without touching a
 * group but for the key's own (a false match has odds of 2^-32 a slot),
 * and the table grows without reading the keys again. */
#define SLOT_HASH(h) ((uint32_t)((h) >> 32))
#define SLOT_OF(h32, index) ((uint64_t)(h32) << 32 | (uint32_t)((index) + 1))
#define MAX_GROUPS (UINT32_MAX - 1)

static al_status
rehash(al_groups *gs)
{
	size_t n = gs->n_slots ? 2 * gs->n_slots : 1024;
	uint64_t *slots = al_calloc(n, sizeof *slots);

	if (slots == NULL)
		return AL_ENOMEM;
	/* every slot is touched, in no order: map them all at once */
	al_prefault(slots, 0, n * sizeof *slots);
	for (size_t i = 0; i < gs->n_slots; i++) {
		uint64_t v = gs->slots[i];
		size_t j;

		if (v == 0)
			continue;
		for (j = (v >> 32) & (n - 1); slots[j]; j = (j + 1) & (n - 1))
			;
		slots[j] = v;
	}
	al_free(gs->slots);
	gs->slots = slots;
	gs->n_slots = n;
	return AL_OK;
}

/* A buffer filled from the front, [0, used) of cap bytes, its pages
 * mapped a window ahead of use (al_prefault: one call a window instead
 * of a page fault a page; bench/ablate.sh: 1.22 at 1e6 rows); *mapped
 * counts the bytes mapped. A buffer that moved when it grew starts
 * counting again from what it holds. */
#define MAP_AHEAD ((size_t)256 << 10)

static void *
grow_mapped(void *buf, size_t *cap, size_t need, size_t used,
	    size_t *mapped)
{
	void *p = al_reserve(buf, cap, need);

	if (p == NULL)
		return NULL;
	if (p != buf)
		*mapped = used;
	if (need > *mapped) {
		size_t to = need + MAP_AHEAD < *cap ? need + MAP_AHEAD : *cap;

		al_prefault(p, *mapped, to);
		*mapped = to;
	}
	return p;
}

/* A new group for key k, whose free slot is j. */
static al_status
add_group(al_groups *gs, const al_key *k, uint32_t h32, size_t j,
	  unsigned long line, al_group **out)
{
	size_t need = k->pl + k->ll + k->sl + 3;
	char *key;
	al_group *g;
	void *p;

	if (gs->n >= MAX_GROUPS || gs->arena_len + need > UINT32_MAX)
		return AL_ENOMEM; /* 4 G groups or 4 GiB of names */
	p = grow_mapped(gs->arena, &gs->arena_cap, gs->arena_len + need,
			gs->arena_len, &gs->arena_mapped);
	if (p == NULL)
		return AL_ENOMEM;
	gs->arena = p;
	p = grow_mapped(gs->g, &gs->cap_bytes, (gs->n + 1) * sizeof *gs->g,
			gs->n * sizeof *gs->g, &gs->g_mapped);
	if (p == NULL)
		return AL_ENOMEM;
	gs->g = p;
	g = &gs->g[gs->n];
	memset(g, 0, sizeof *g);
	g->key = (uint32_t)gs->arena_len;
	g->first_line = line > UINT32_MAX ? UINT32_MAX : (uint32_t)line;
	key = gs->arena + gs->arena_len;
	memcpy(key, k->product, k->pl);
	key[k->pl] = '\0';
	memcpy(key + k->pl + 1, k->lot, k->ll);
	key[k->pl + 1 + k->ll] = '\0';
	memcpy(key + k->pl + k->ll + 2, k->sample, k->sl);
	key[need - 1] = '\0';
	gs->arena_len += need;
	gs->slots[j] = SLOT_OF(h32, gs->n);
	gs->n++;
	*out = g;
	return AL_OK;
}

void
al_groups_ahead(const al_groups *gs, const al_key *k, al_key_look *look)
{
	look->same = gs->last && key_is(gs, &gs->g[gs->last - 1], k);
	if (look->same)
		return;
	look->h32 = SLOT_HASH(key_hash(k));
	if (gs->n_slots)
		__builtin_prefetch(&gs->slots[look->h32 & (gs->n_slots - 1)]);
}

al_status
al_groups_find(al_groups *gs, const al_key *k, const al_key_look *look,
	       unsigned long line, al_group **out, int *created)
{
	uint32_t h32 = look->h32;
	size_t j;

	*created = 0;
	if (look->same) {
		*out = &gs->g[gs->last - 1];
		return AL_OK;
	}
	if (gs->n_slots == 0 || 10 * (gs->n + 1) > 7 * gs->n_slots) {
		if (rehash(gs) != AL_OK)
			return AL_ENOMEM;
	}
	for (j = h32 & (gs->n_slots - 1); gs->slots[j];
	     j = (j + 1) & (gs->n_slots - 1)) {
		uint64_t v = gs->slots[j];

		if ((uint32_t)(v >> 32) == h32 &&
		    key_is(gs, &gs->g[(uint32_t)v - 1], k)) {
			gs->last = (uint32_t)v;
			*out = &gs->g[(uint32_t)v - 1];
			return AL_OK;
		}
	}
	if (add_group(gs, k, h32, j, line, out) != AL_OK)
		return AL_ENOMEM;
	gs->last = (uint32_t)gs->n;
	*created = 1;
	return AL_OK;
}

void
al_groups_drop_index(al_groups *gs)
{
	al_free(gs->slots);
	gs->slots = NULL;
	gs->n_slots = gs->last = 0;
}

al_group_extra *
al_groups_extra(al_groups *gs, al_group *g)
{
	al_group_extra *x;

	if (g->extra)
		return &gs->extras[g->extra - 1];
	if (gs->n_extras == UINT32_MAX - 1)
		return NULL;
	if (gs->n_extras == gs->cap_extras) {
		size_t n = gs->cap_extras ? 2 * gs->cap_extras : 64;
		al_group_extra *grown = al_realloc(gs->extras, n * sizeof *grown);

		if (grown == NULL)
			return NULL;
		gs->extras = grown;
		gs->cap_extras = n;
	}
	x = &gs->extras[gs->n_extras++];
	memset(x, 0, sizeof *x);
	x->min_endpoint = HUGE_VAL;
	g->extra = (uint32_t)gs->n_extras;
	return x;
}

const al_group_extra *
al_groups_extra_of(const al_groups *gs, const al_group *g)
{
	return g->extra ? &gs->extras[g->extra - 1] : NULL;
}

al_status
al_groups_note_extremes(al_groups *gs, const al_group *g,
			const al_row_inputs *row)
{
	size_t i = (size_t)(g - gs->g);
	al_row_inputs *e;

	if (i >= gs->cap_extremes) {
		size_t n = gs->cap_extremes ? 2 * gs->cap_extremes : 64;
		void *grown;

		while (n <= i)
			n *= 2;
		grown = al_realloc(gs->extremes, n * sizeof *gs->extremes);
		if (grown == NULL)
			return AL_ENOMEM;
		gs->extremes = grown;
		gs->cap_extremes = n;
	}
	while (gs->n_extremes <= i)
		memset(gs->extremes[gs->n_extremes++], 0,
		       sizeof *gs->extremes);
	e = gs->extremes[i];
	if (g->n == 0 || row->value < e[0].value)
		e[0] = *row;
	if (g->n == 0 || row->value > e[1].value)
		e[1] = *row;
	return AL_OK;
}

const al_row_inputs *
al_groups_extremes(const al_groups *gs, size_t i)
{
	return i < gs->n_extremes ? gs->extremes[i] : NULL;
}

const double *
al_group_values(const al_group *g)
{
	if (g->bits & AL_G_STREAM)
		return NULL;
	return g->bits & AL_G_HEAP ? g->values.heap.p : g->values.v;
}

/* Welford's update: n values so far; x is value n (0-based). */
static void
stream_add(al_stream *st, uint32_t n, double x)
{
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

/* From AL_VALUES_KEPT values on: running statistics of all of them. */
static al_status
to_stream(al_group *g, double v)
{
	al_stream *st = al_malloc(sizeof *st);
	double *kept = g->values.heap.p;

	if (st == NULL)
		return AL_ENOMEM;
	memset(st, 0, sizeof *st);
	for (uint32_t i = 0; i < g->n; i++)
		stream_add(st, i, kept[i]);
	stream_add(st, g->n, v);
	al_free(kept);
	g->values.stream = st;
	g->bits = (uint8_t)((g->bits & ~AL_G_HEAP) | AL_G_STREAM);
	g->n++;
	return AL_OK;
}

al_status
al_group_push(al_group *g, double v)
{
	if (g->bits & AL_G_STREAM) {
		stream_add(g->values.stream, g->n++, v);
		return AL_OK;
	}
	if (g->n == AL_VALUES_KEPT)
		return to_stream(g, v);
	if (!(g->bits & AL_G_HEAP) && g->n == AL_INLINE_VALUES) {
		double *p = al_malloc(2 * AL_INLINE_VALUES * sizeof *p);

		if (p == NULL)
			return AL_ENOMEM;
		memcpy(p, g->values.v, sizeof g->values.v);
		g->values.heap.p = p;
		g->values.heap.cap = 2 * AL_INLINE_VALUES;
		g->bits |= AL_G_HEAP;
	} else if ((g->bits & AL_G_HEAP) && g->n == g->values.heap.cap) {
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
	if (g->bits & AL_G_HEAP)
		g->values.heap.p[g->n++] = v;
	else
		g->values.v[g->n++] = v;
	return AL_OK;
}

uint8_t
al_groups_acid_slot(al_groups *gs, const al_acid *acid)
{
	for (size_t i = 0; i < gs->n_acids; i++)
		if (gs->acids[i] == acid)
			return (uint8_t)(i + 1);
	if (gs->n_acids == sizeof gs->acids / sizeof gs->acids[0])
		return 0;
	gs->acids[gs->n_acids++] = acid;
	return (uint8_t)gs->n_acids;
}

const al_acid *
al_groups_acid(const al_groups *gs, const al_group *g)
{
	return g->acid ? gs->acids[g->acid - 1] : NULL;
}
