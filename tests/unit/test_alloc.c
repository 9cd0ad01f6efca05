/* acidlot tests: memory regions that grow in place (al_region), and
 * the thread that touches their pages ahead of use (pages.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L /* nanosleep */
#include "testutil.h"

#include <errno.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "acidlot/alloc.h"
#include "pages.h"

/* A mark for byte i of a region: a pattern that a moved, lost or
 * zeroed byte would not keep. */
static unsigned char
mark(size_t i)
{
	return (unsigned char)(i * 2654435761u >> 13);
}

/* Grown in many steps to 64 MiB, as the assay grows its groups: the
 * bytes written stay, the new bytes read as zero, each growth at least
 * doubles and none moves the base (the region holds 1 GiB ahead). */
static void
grows_in_place(void **state)
{
	al_region r = {0};
	size_t used = 0;
	void *base;

	(void)state;
	assert_int_equal(al_region_grow(&r, 1), 0);
	assert_non_null(r.base);
	assert_true(r.committed >= 1);
	base = r.base;
	while (used < ((size_t)64 << 20)) {
		size_t was = r.committed, need = used + 100000;
		unsigned char *p;

		assert_int_equal(al_region_grow(&r, need), 0);
		assert_ptr_equal(r.base, base);
		assert_true(r.committed >= need);
		if (need > was)
			assert_true(r.committed >= 2 * was);
		p = r.base;
		/* the bytes beyond what was written are zero, as far as
		 * the committed end */
		assert_int_equal(p[used], 0);
		assert_int_equal(p[r.committed - 1], 0);
		/* every 4093rd byte, counted from the region's start */
		for (size_t i = (used + 4092) / 4093 * 4093; i < need;
		     i += 4093)
			p[i] = mark(i);
		used = need;
	}
	for (size_t i = 0; i < used; i += 4093)
		assert_int_equal(((unsigned char *)r.base)[i], mark(i));
	/* asking for less than it has changes nothing */
	{
		size_t was = r.committed;

		assert_int_equal(al_region_grow(&r, 10), 0);
		assert_int_equal(r.committed, was);
		assert_ptr_equal(r.base, base);
	}
	al_region_free(&r);
	assert_null(r.base);
	assert_int_equal(r.committed, 0);
	al_region_free(&r); /* twice is harmless */
}

/* Past the address space it holds (1 GiB at first) a region moves, as
 * realloc would, and keeps its bytes; untouched pages cost no memory,
 * so only the few written here are ever mapped. */
static void
moves_past_what_it_holds(void **state)
{
	al_region r = {0};
	size_t big = ((size_t)1 << 30) + 4096;
	unsigned char *p;

	(void)state;
	assert_int_equal(al_region_grow(&r, 8192), 0);
	p = r.base;
	for (size_t i = 0; i < 8192; i++)
		p[i] = mark(i);
	assert_int_equal(al_region_grow(&r, big), 0);
	assert_true(r.committed >= big);
	assert_true(r.reserved >= r.committed);
	p = r.base;
	for (size_t i = 0; i < 8192; i++)
		assert_int_equal(p[i], mark(i));
	assert_int_equal(p[big - 1], 0);
	p[big - 1] = 7;
	assert_int_equal(p[big - 1], 7);
	al_region_free(&r);
}

/* A growth that fails (injected, as alloc_faults.sh does to whole runs)
 * says so and leaves the region as it was. */
static void
failure_leaves_it_whole(void **state)
{
	al_region r = {0};
	al_region before;
	unsigned char *p;

	(void)state;
	assert_int_equal(al_region_grow(&r, 4096), 0);
	p = r.base;
	memset(p, 0x5a, r.committed);
	before = r;
	al_alloc_fail_at(1);
	errno = 0;
	assert_int_equal(al_region_grow(&r, before.committed + 1), -1);
	assert_int_equal(errno, ENOMEM);
	al_alloc_fail_at(0);
	assert_ptr_equal(r.base, before.base);
	assert_int_equal(r.committed, before.committed);
	assert_int_equal(r.reserved, before.reserved);
	for (size_t i = 0; i < r.committed; i++)
		assert_int_equal(p[i], 0x5a);
	/* a growth that is not needed asks for nothing, so cannot fail */
	al_alloc_fail_at(1);
	assert_int_equal(al_region_grow(&r, before.committed), 0);
	al_alloc_fail_at(0);
	al_region_free(&r);
}

static uint64_t rng = 0x9E3779B97F4A7C15ULL;

static uint64_t
next(void)
{
	rng ^= rng << 13;
	rng ^= rng >> 7;
	rng ^= rng << 17;
	return rng;
}

/* The owner's side of the page toucher, as find_group does it: grow,
 * ask before writing past what the toucher allows, write new bytes and
 * rewrite old ones. */
static size_t
owner_step(al_pages *p, al_region *r, size_t used, size_t step,
	   size_t *ask)
{
	size_t end = used + step;
	unsigned char *b;

	if (end > r->committed) {
		if (end > r->reserved)
			al_pages_drop(p, 0);
		assert_int_equal(al_region_grow(r, end), 0);
	}
	if (end > *ask)
		*ask = al_pages_use(p, 0, r, end);
	assert_true(*ask >= end);
	b = r->base;
	for (size_t i = (used + 60) / 61 * 61; i < end; i += 61)
		b[i] = mark(i);
	/* a value added to an older group */
	if (used > 0) {
		size_t i = (size_t)(next() % used) / 61 * 61;

		b[i] = mark(i);
	}
	return end;
}

static void
check_marks(const al_region *r, size_t used)
{
	const unsigned char *b = r->base;

	for (size_t i = 0; i < used; i += 61)
		if (b[i] != mark(i)) {
			print_error("byte %zu: %d, not %d\n", i, b[i], mark(i));
			fail();
		}
}

/* The page toucher (pages.h) beside an owner that grows a region to
 * 48 MiB (6 under valgrind) in steps of up to 100 KB: every byte
 * written stays; the toucher gets ahead of the owner (the owner is let
 * write past what it asked for); a move past the region's hold, with
 * the toucher dropped first, keeps the bytes and the toucher serves the
 * moved region. Under valgrind's race check (make valgrind runs this
 * test under helgrind) the mutex is what orders the two. */
static void
toucher_beside_owner(void **state)
{
	al_pages p;
	al_region r = {0};
	size_t used = 0, ask = 0;
	size_t total = getenv("ACIDLOT_VALGRIND") ? (size_t)6 << 20
						   : (size_t)48 << 20;
	int ahead = 0;

	(void)state;
	memset(&p, 0, sizeof p);
	assert_int_equal(al_pages_start(&p), 0);
	while (used < total)
		used = owner_step(&p, &r, used, 1 + next() % 100000, &ask);
	check_marks(&r, used);
	/* the owner waits: the toucher goes on ahead of it, up to
	 * AL_PAGES_AHEAD, and al_pages_use then lets the owner past what
	 * it asked for (up to 10 s) */
	assert_int_equal(al_region_grow(&r, used + 2 * AL_PAGES_AHEAD), 0);
	for (int i = 0; i < 1000 && !ahead; i++) {
		struct timespec ms = {0, 10000000};

		ahead = al_pages_use(&p, 0, &r, used) > used;
		if (!ahead)
			nanosleep(&ms, NULL);
	}
	assert_true(ahead);
	/* past the 1 GiB the region holds it moves (mremap), the toucher
	 * dropped first; the owner then goes on from where it was, and the
	 * toucher takes up the region in its new place */
	al_pages_drop(&p, 0);
	assert_int_equal(al_region_grow(&r, ((size_t)1 << 30) + 4096), 0);
	check_marks(&r, used);
	for (int i = 0; i < 50; i++)
		used = owner_step(&p, &r, used, 1 + next() % 100000, &ask);
	al_pages_stop(&p);
	check_marks(&r, used);
	al_pages_stop(&p); /* twice is harmless */
	al_region_free(&r);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(grows_in_place),
		cmocka_unit_test(moves_past_what_it_holds),
		cmocka_unit_test(failure_leaves_it_whole),
		cmocka_unit_test(toucher_beside_owner),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
