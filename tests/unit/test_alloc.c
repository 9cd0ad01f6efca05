/* acidlot tests: memory regions that grow in place (al_region).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <errno.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/alloc.h"

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

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(grows_in_place),
		cmocka_unit_test(moves_past_what_it_holds),
		cmocka_unit_test(failure_leaves_it_whole),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
