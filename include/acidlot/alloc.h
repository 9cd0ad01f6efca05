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

/* al_free of each of n pointers; AL_FREE_ALL(a, b, ...) frees a
 * struct's buffers in one statement. */
void al_free_all(void *const *ptrs, size_t n);
#define AL_FREE_ALL(...)                                                      \
	al_free_all((void *const[]){__VA_ARGS__},                              \
		    sizeof((void *const[]){__VA_ARGS__}) / sizeof(void *))

/* Maps the memory pages of [base + from, base + to) in one system call
 * ahead of their first use, where the system can (Linux 5.14 and later;
 * elsewhere nothing happens). The bytes do not change: this only saves
 * one page fault per page, which costs about 10 microseconds each on a
 * virtual machine (DEVELOPERS.md, "Speed and memory"). */
void al_prefault(void *base, size_t from, size_t to);

/* The system's page size in bytes (4096 where it cannot be had). */
size_t al_page_bytes(void);

/* Copy of the first len bytes of s, NUL-terminated; NULL on failure. */
char *al_strndup(const char *s, size_t len);
char *al_strdup(const char *s);

/* Fault injection for tests: the n-th allocation from now (1-based) and
 * every one after it fail; 0 switches injection off. al_alloc_count()
 * tells how many allocations were asked for since the last reset. */
void al_alloc_fail_at(unsigned long n);
unsigned long al_alloc_count(void);

#endif
