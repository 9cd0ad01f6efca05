/* acidlot: a hash index over names kept elsewhere (internal), for the
 * specification's products and the register's titrant lots.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_STRINDEX_H
#define ACIDLOT_STRINDEX_H

#include <stddef.h>
#include <stdint.h>

#include "acidlot/status.h"

/* Open addressing with linear probing over FNV-1a: a slot holds 1 + the
 * entry's index, 0 when empty; at most half full, so a lookup costs a
 * probe or two and a table of 200,000 names builds in linear time. The
 * names live in the caller's entries: name(ctx, i) is entry i's. */
typedef struct al_strindex {
	uint32_t *slots;
	size_t n_slots; /* a power of two, or 0 */
	const char *(*name)(const void *ctx, size_t i);
	const void *ctx;
} al_strindex;

/* The slot of s[0..len): its entry's, or the empty one where it would
 * go. The index must have room (al_strindex_room). */
uint32_t *al_strindex_slot(const al_strindex *x, const char *s, size_t len);
/* The entry of s (NUL-terminated), or -1. */
long al_strindex_find(const al_strindex *x, const char *s);
/* Room for count + 1 entries (the first count already in it, put again
 * when it grows); AL_OK or AL_ENOMEM. */
al_status al_strindex_room(al_strindex *x, size_t count);
void al_strindex_free(al_strindex *x);

#endif
