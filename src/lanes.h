/* acidlot: ordered work in two threads (internal).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_LANES_H
#define ACIDLOT_LANES_H

#include <stddef.h>

/* Chunks 0 .. n_chunks - 1 of some work, done by two threads so that
 * what must happen in order still does: the calling thread does each
 * even chunk with own(ctx, c); a second thread makes each odd chunk with
 * make(ctx, c, slot) into slot 0 or 1 (its two buffers, used in turn),
 * and the calling thread then takes it with take(ctx, c, slot), in
 * chunk order. make may only read what own and take change for other
 * chunks. Where no thread can be had, the caller does every chunk with
 * own. */
typedef struct al_lanes {
	void *ctx;
	size_t n_chunks;
	void (*own)(void *ctx, size_t chunk);
	void (*make)(void *ctx, size_t chunk, int slot);
	void (*take)(void *ctx, size_t chunk, int slot);
} al_lanes;

void al_lanes_run(const al_lanes *job);

#endif
