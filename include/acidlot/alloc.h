/* acidlot: the one place every allocation of the library goes through.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_ALLOC_H
#define ACIDLOT_ALLOC_H

#include <stddef.h>

/* Like malloc/realloc/free; al_malloc(0) returns a unique pointer. They
 * return NULL on failure and never abort. */
void *al_malloc(size_t size);
void *al_calloc(size_t count, size_t size);
void *al_realloc(void *ptr, size_t size);
void al_free(void *ptr);

/* buf (of *cap bytes) made to hold at least need: itself when it does,
 * else grown to twice as much or to need (at least 1 KiB), *cap set.
 * NULL when memory runs out; buf and *cap are then as they were. */
void *al_reserve(void *buf, size_t *cap, size_t need);

/* Maps the memory pages of [base + from, base + to) in one system call
 * ahead of their first use, where the system can (Linux 5.14 and later;
 * elsewhere nothing happens). The bytes do not change: this only saves
 * one page fault per page, which costs about 10 microseconds each on a
 * virtual machine (DEVELOPERS.md, "Speed and memory"). */
void al_prefault(void *base, size_t from, size_t to);

/* The system's page size in bytes (4096 where it cannot be had). */
size_t al_page_bytes(void);

/* Memory that grows in place: base stays where it is while the region
 * grows, so that the pages in use are never moved. On this kind of
 * virtual machine a page costs about 10 microseconds the first time it
 * is touched at an address, and again (about half as much) after
 * realloc has moved it with mremap; a table that doubles ten times
 * pays for its pages again and again (DEVELOPERS.md, "Speed and
 * memory"). The region holds address space ahead (1 GiB, or four times
 * what is asked) and makes it usable as it grows; untouched address
 * space costs no memory. Where address space is short (a ulimit -v),
 * or past what it holds, it moves like realloc. A region starts zeroed
 * (al_region r = {0}); its bytes [0, committed) are usable, and read as
 * zeros until written. */
typedef struct al_region {
	void *base;
	size_t reserved;  /* bytes of address space held */
	size_t committed; /* bytes usable */
} al_region;

/* Makes at least need bytes usable at r->base (keeping the bytes there),
 * twice as many as before or need, whichever is more: 0, or -1 when
 * memory runs out (errno ENOMEM; base, committed and the bytes are as
 * they were). Counts as one allocation for fault injection, when it has
 * to grow. al_region_free unmaps it and zeroes r. */
int al_region_grow(al_region *r, size_t need);
void al_region_free(al_region *r);

/* Copy of the first len bytes of s, NUL-terminated; NULL on failure. */
char *al_strndup(const char *s, size_t len);
char *al_strdup(const char *s);

/* Fault injection for tests: the n-th allocation from now (1-based) and
 * every one after it fail; 0 switches injection off. al_alloc_count()
 * tells how many allocations were asked for since the last reset. */
void al_alloc_fail_at(unsigned long n);
unsigned long al_alloc_count(void);

#endif
