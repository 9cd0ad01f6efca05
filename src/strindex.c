/* acidlot: a hash index over names kept elsewhere.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "strindex.h"

#include <string.h>

#include "acidlot/alloc.h"
#include "hash.h"

uint32_t *
al_strindex_slot(const al_strindex *x, const char *s, size_t len)
{
	size_t mask = x->n_slots - 1;
	size_t i = al_mix64(al_fnv1a(AL_FNV_OFFSET, s, len)) & mask;

	for (;; i = (i + 1) & mask) {
		const char *p;

		if (x->slots[i] == 0)
			return &x->slots[i];
		p = x->name(x->ctx, x->slots[i] - 1);
		if (strncmp(p, s, len) == 0 && p[len] == '\0')
			return &x->slots[i];
	}
}

long
al_strindex_find(const al_strindex *x, const char *s)
{
	uint32_t slot;

	if (x->n_slots == 0)
		return -1;
	slot = *al_strindex_slot(x, s, strlen(s));
	return slot ? (long)slot - 1 : -1;
}

al_status
al_strindex_room(al_strindex *x, size_t count)
{
	size_t n = x->n_slots ? x->n_slots : 32;
	uint32_t *old = x->slots;

	if (2 * (count + 1) <= x->n_slots)
		return AL_OK;
	while (2 * (count + 1) > n)
		n *= 2;
	x->slots = al_calloc(n, sizeof *x->slots);
	if (x->slots == NULL) {
		x->slots = old;
		return AL_ENOMEM;
	}
	x->n_slots = n;
	for (size_t i = 0; i < count; i++) {
		const char *p = x->name(x->ctx, i);

		*al_strindex_slot(x, p, strlen(p)) = (uint32_t)(i + 1);
	}
	al_free(old);
	return AL_OK;
}

void
al_strindex_free(al_strindex *x)
{
	al_free(x->slots);
	x->slots = NULL;
	x->n_slots = 0;
}
