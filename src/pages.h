/* acidlot: first touches of a growing region's pages, in a thread of
 * their own (internal).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_PAGES_H
#define ACIDLOT_PAGES_H

#include <pthread.h>
#include <stddef.h>

#include "acidlot/alloc.h"

/* On this kind of virtual machine the first touch of a page costs some
 * 5 to 13 microseconds (DEVELOPERS.md, "Speed and memory"): at 1e7 rows
 * the assay's groups and keys take 75,000 pages, most of a second, all
 * in the thread that reads the rows, which is the one that limits the
 * reading. A page toucher takes that work to a thread of its own: it
 * maps and touches the pages of each region it is given a little ahead
 * of their owner, who goes on while they are made ready.
 *
 * The owner and the toucher share the work by chunks of
 * AL_PAGES_CHUNK bytes taken in order, under a mutex: the toucher
 * touches only a chunk it has claimed, beyond what the owner uses; the
 * owner writes a chunk only once it is ready (touched, or claimed by
 * the owner itself when the toucher is behind). A region may grow in
 * place (al_region_grow) while the toucher works; before anything that
 * may move it the owner calls al_pages_drop. */
#define AL_PAGES_CHUNK ((size_t)256 << 10)
#define AL_PAGES_AHEAD ((size_t)4 << 20) /* how far ahead it goes */
#define AL_PAGES_REGIONS 2

struct al_pages_region {
	const al_region *r; /* NULL: not served */
	char *base;
	size_t done;  /* chunks ready from the start */
	size_t limit; /* bytes it may touch: committed, and used + AHEAD */
	int busy;     /* the toucher is on chunk `done` */
};

typedef struct al_pages {
	pthread_mutex_t mu;
	pthread_cond_t cv;
	pthread_t thread;
	int running, stop;
	struct al_pages_region reg[AL_PAGES_REGIONS];
} al_pages;

/* Starts the thread; 0, or -1 when none can be had (the owner then
 * touches its pages itself, as without one). */
int al_pages_start(al_pages *p);

/* The owner is about to write region `which`'s bytes [0, used) (r's
 * base and committed size as they are now). Returns how many bytes from
 * the start are ready: the owner may write below that without asking
 * again. Waits only while the toucher finishes a chunk the owner needs. */
size_t al_pages_use(al_pages *p, int which, const al_region *r, size_t used);

/* No more touching of region `which` (it is about to move or be freed):
 * returns once the toucher has left it. */
void al_pages_drop(al_pages *p, int which);

/* Stops and joins the thread, if it runs. */
void al_pages_stop(al_pages *p);

#endif
