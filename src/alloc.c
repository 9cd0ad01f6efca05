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

void
al_free_all(void *const *ptrs, size_t n)
{
	for (size_t i = 0; i < n; i++)
		al_free(ptrs[i]);
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
