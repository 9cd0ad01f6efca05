/* acidlot: allocation wrappers with a fault-injection switch for tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _GNU_SOURCE /* mremap */
#include "acidlot/alloc.h"

#include <errno.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>
#include <unistd.h>

/* atomic: a large file is read in a second thread (csvread.c) */
static _Atomic unsigned long alloc_calls;
static _Atomic unsigned long alloc_fail_from; /* 0 = never fail */

/* An injected failure looks like a real one: NULL and errno ENOMEM. */
static int
should_fail(void)
{
	unsigned long n = ++alloc_calls;
	unsigned long from = alloc_fail_from;

	if (from != 0 && n >= from) {
		errno = ENOMEM;
		return 1;
	}
	return 0;
}

void
al_alloc_fail_at(unsigned long n)
{
	alloc_calls = 0;
	alloc_fail_from = n;
}

unsigned long
al_alloc_count(void)
{
	return alloc_calls;
}

void *
al_malloc(size_t size)
{
	if (should_fail())
		return NULL;
	return malloc(size ? size : 1);
}

void *
al_calloc(size_t count, size_t size)
{
	if (should_fail())
		return NULL;
	if (count == 0 || size == 0)
		return calloc(1, 1);
	return calloc(count, size);
}

void *
al_realloc(void *ptr, size_t size)
{
	if (should_fail())
		return NULL;
	return realloc(ptr, size ? size : 1);
}

void
al_free(void *ptr)
{
	free(ptr);
}

void *
al_reserve(void *buf, size_t *cap, size_t need)
{
	size_t n = *cap ? 2 * *cap : 1024;
	void *grown;

	if (need <= *cap)
		return buf;
	if (n < need)
		n = need;
	grown = al_realloc(buf, n);
	if (grown != NULL)
		*cap = n;
	return grown;
}

size_t
al_page_bytes(void)
{
	long ps = sysconf(_SC_PAGESIZE);

	return ps > 0 ? (size_t)ps : 4096;
}

void
al_prefault(void *base, size_t from, size_t to)
{
#ifdef MADV_POPULATE_WRITE
	uintptr_t page = al_page_bytes(), a, b;

	/* whole pages only, inside the range: a page shared with other
	 * data is mapped already or faults as usual */
	a = ((uintptr_t)base + from + page - 1) & ~(page - 1);
	b = ((uintptr_t)base + to) & ~(page - 1);
	if (base != NULL && b > a)
		(void)madvise((void *)a, b - a, MADV_POPULATE_WRITE);
#else
	(void)base;
	(void)from;
	(void)to;
#endif
}

#if defined(MREMAP_MAYMOVE) && defined(MAP_NORESERVE)
/* Address space a region holds at first: enough for 13 M groups, or a
 * 1 GiB key arena, without a move. */
#define REGION_HOLD ((size_t)1 << 30)

/* n rounded up to whole pages; 0 when that overflows */
static size_t
whole_pages(size_t n)
{
	size_t page = al_page_bytes();

	return n > SIZE_MAX - page ? 0 : (n + page - 1) / page * page;
}

int
al_region_grow(al_region *r, size_t need)
{
	size_t want, hold;
	void *p;

	if (need <= r->committed)
		return 0;
	if (should_fail())
		return -1;
	want = r->committed > SIZE_MAX / 2 ? need : 2 * r->committed;
	if (want < need)
		want = need;
	want = whole_pages(want);
	if (want == 0) {
		errno = ENOMEM;
		return -1;
	}
	if (want > r->reserved) {
		/* hold address space ahead, four times what is asked, and
		 * at least REGION_HOLD; what is held but not yet committed
		 * is PROT_NONE and costs no memory */
		hold = want > SIZE_MAX / 4 ? want : 4 * want;
		if (hold < REGION_HOLD)
			hold = REGION_HOLD;
		if (r->base == NULL) {
			p = mmap(NULL, hold, PROT_NONE,
				 MAP_PRIVATE | MAP_ANONYMOUS | MAP_NORESERVE, -1,
				 0);
			if (p == MAP_FAILED) {
				/* short of address space: only what is asked */
				hold = want;
				p = mmap(NULL, hold, PROT_NONE,
					 MAP_PRIVATE | MAP_ANONYMOUS |
						 MAP_NORESERVE,
					 -1, 0);
			}
			if (p == MAP_FAILED) {
				errno = ENOMEM;
				return -1;
			}
			r->base = p;
			r->reserved = hold;
		} else {
			/* past what it holds: move it, as realloc would. Only
			 * the usable part is one mapping to move; the rest of
			 * the new place is made usable below. */
			if (r->reserved > r->committed &&
			    munmap((char *)r->base + r->committed,
				   r->reserved - r->committed) != 0) {
				errno = ENOMEM;
				return -1;
			}
			r->reserved = r->committed;
			p = mremap(r->base, r->committed, hold, MREMAP_MAYMOVE);
			if (p == MAP_FAILED) {
				hold = want;
				p = mremap(r->base, r->committed, hold,
					   MREMAP_MAYMOVE);
			}
			if (p == MAP_FAILED) {
				errno = ENOMEM;
				return -1;
			}
			/* the new part is usable (and zero) at once */
			r->base = p;
			r->reserved = r->committed = hold;
			return 0;
		}
	}
	if (mprotect((char *)r->base + r->committed, want - r->committed,
		     PROT_READ | PROT_WRITE) != 0) {
		errno = ENOMEM;
		return -1;
	}
	r->committed = want;
	return 0;
}

void
al_region_free(al_region *r)
{
	if (r->base != NULL)
		(void)munmap(r->base, r->reserved);
	r->base = NULL;
	r->reserved = r->committed = 0;
}
#else
int
al_region_grow(al_region *r, size_t need)
{
	size_t cap = r->committed;
	void *p;

	if (need <= cap)
		return 0;
	p = al_reserve(r->base, &cap, need);
	if (p == NULL)
		return -1;
	memset((char *)p + r->committed, 0, cap - r->committed);
	r->base = p;
	r->reserved = r->committed = cap;
	return 0;
}

void
al_region_free(al_region *r)
{
	al_free(r->base);
	r->base = NULL;
	r->reserved = r->committed = 0;
}
#endif

char *
al_strndup(const char *s, size_t len)
{
	char *copy = al_malloc(len + 1);

	if (copy == NULL)
		return NULL;
	memcpy(copy, s, len);
	copy[len] = '\0';
	return copy;
}

char *
al_strdup(const char *s)
{
	return al_strndup(s, strlen(s));
}
