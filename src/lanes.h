/* acidlot: ordered work in two threads (internal).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_LANES_H
#define ACIDLOT_LANES_H

#include <stddef.h>

/* Items go in chunks of AL_LANES_CHUNK; fewer than AL_LANES_MIN items
 * are not worth a second thread (its buffers and start). */
#define AL_LANES_CHUNK 1024
#define AL_LANES_MIN (8 * AL_LANES_CHUNK)

/* Items 0 .. n - 1 of some work, done by two threads so that what must
 * happen in order still does. The chunks [begin, end) take turns: the
 * calling thread does an even one with own(ctx, begin, end); a second
 * thread makes an odd one with make(ctx, begin, end, slot) into slot 0
 * or 1 (its two buffers, used in turn), and the calling thread then
 * takes it with take(ctx, begin, end, slot), in chunk order. make may
 * only read what own and take change for other chunks. Where no thread
 * can be had, the caller does every chunk with own. */
typedef struct al_lanes {
	void *ctx;
	size_t n;
	void (*own)(void *ctx, size_t begin, size_t end);
	void (*make)(void *ctx, size_t begin, size_t end, int slot);
	void (*take)(void *ctx, size_t begin, size_t end, int slot);
} al_lanes;

void al_lanes_run(const al_lanes *job);

#endif
