/* acidlot: the replicate labels of each result.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * A result's first short labels sit in the result itself, where the
 * usual triplicate finds them with no look elsewhere; the others go to
 * a hash table over (result, label) with linear probing. */
#include "labels.h"

#include <string.h>

#include "acidlot/alloc.h"
#include "hash.h"

struct more_label {
	uint64_t key; /* 0: empty slot */
	uint64_t group;
	al_label_at at;
};

/* The table's key: up to 7 bytes, the bytes and the length; longer, a
 * 56-bit hash (FNV-1a, 64 bit, mixed). Never 0. */
static uint64_t
table_key(const char *s, size_t len)
{
	uint64_t k = 0;

	if (len <= 7) {
		memcpy(&k, s, len);
		return (k & 0x00FFFFFFFFFFFFFFULL) | ((uint64_t)(len + 1) << 56);
	}
	return (al_mix64(al_fnv1a(AL_FNV_OFFSET, s, len)) & 0x00FFFFFFFFFFFFFFULL) | 0xFF00000000000000ULL;
}

/* A slot's key: a one-byte label's byte; 0 for another label. */
static uint8_t
slot_key(const char *s, size_t len)
{
	return len == 1 ? (uint8_t)s[0] : 0;
}

void
al_labels_clear(al_labels *l)
{
	al_free(l->more);
	memset(l, 0, sizeof *l);
}

static size_t
slot_of(const al_labels *l, size_t group, uint64_t key)
{
	return (size_t)al_mix64(key ^ al_mix64(group + 1)) & (l->cap_more - 1);
}

int
al_labels_find(const al_labels *l, const al_label_slots *slots,
	       size_t group, al_label_at first, const char *s, size_t len,
	       al_label_at *at)
{
	uint8_t k = slot_key(s, len);
	uint64_t key;

	for (size_t i = 0; k && i < AL_LABEL_SLOTS && slots->key[i]; i++)
		if (slots->key[i] == k) {
			at->file = first.file;
			at->line = first.line + slots->delta[i];
			return 1;
		}
	if (slots->more == 0)
		return 0;
	key = table_key(s, len);
	for (size_t j = slot_of(l, group, key); l->more[j].key;
	     j = (j + 1) & (l->cap_more - 1))
		if (l->more[j].key == key && l->more[j].group == group) {
			*at = l->more[j].at;
			return 1;
		}
	return 0;
}

/* Doubles the table (from 1024 slots), keeping it at most half full. */
static al_status
grow_more(al_labels *l)
{
	size_t cap = l->cap_more ? 2 * l->cap_more : 1024;
	struct more_label *old = l->more, *t = al_calloc(cap, sizeof *t);
	size_t old_cap = l->cap_more;

	if (t == NULL)
		return AL_ENOMEM;
	l->more = t;
	l->cap_more = cap;
	for (size_t i = 0; i < old_cap; i++) {
		size_t j;

		if (!old[i].key)
			continue;
		for (j = slot_of(l, old[i].group, old[i].key); t[j].key;
		     j = (j + 1) & (cap - 1))
			;
		t[j] = old[i];
	}
	al_free(old);
	return AL_OK;
}

al_status
al_labels_add(al_labels *l, al_label_slots *slots, size_t group,
	      al_label_at first, const char *s, size_t len, al_label_at at)
{
	uint8_t k = slot_key(s, len);
	uint64_t key;
	size_t j;

	if (k && at.file == first.file && at.line >= first.line &&
	    at.line - first.line <= UINT8_MAX)
		for (size_t i = 0; i < AL_LABEL_SLOTS; i++)
			if (!slots->key[i]) {
				slots->key[i] = k;
				slots->delta[i] = (uint8_t)(at.line - first.line);
				return AL_OK;
			}
	if (2 * (l->n_more + 1) > l->cap_more && grow_more(l) != AL_OK)
		return AL_ENOMEM;
	key = table_key(s, len);
	for (j = slot_of(l, group, key); l->more[j].key;
	     j = (j + 1) & (l->cap_more - 1))
		;
	l->more[j].key = key;
	l->more[j].group = group;
	l->more[j].at = at;
	l->n_more++;
	if (slots->more < UINT16_MAX)
		slots->more++;
	return AL_OK;
}
