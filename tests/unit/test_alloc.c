/* acidlot tests: buffers grown by doubling (al_reserve).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "testutil.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "acidlot/alloc.h"

/* A mark for byte i of a buffer: a pattern that a moved, lost or zeroed
 * byte would not keep. */
static unsigned char
mark(size_t i)
{
	return (unsigned char)(i * 131 + 7);
}

/* Growing keeps every byte, at least doubles the capacity (so n bytes
 * cost O(log n) growths) and asks for nothing when there is room. */
static void
keeps_its_bytes(void **state)
{
	unsigned char *p = NULL;
	size_t cap = 0, used = 0, growths = 0;

	(void)state;
	while (used < ((size_t)8 << 20)) {
		size_t need = used + 4096 + used / 3, was = cap;

		p = al_reserve(p, &cap, need);
		assert_non_null(p);
		assert_true(cap >= need);
		if (cap != was) {
			assert_true(cap >= 2 * was);
			growths++;
		}
		for (size_t i = 0; i < used; i++)
			if (p[i] != mark(i))
				fail_msg("byte %zu lost at %zu bytes", i, used);
		for (size_t i = used; i < need; i++)
			p[i] = mark(i);
		used = need;
	}
	assert_true(growths < 20);
	assert_ptr_equal(al_reserve(p, &cap, cap), p);
	al_free(p);
}

/* A growth that fails returns NULL and leaves the buffer, its bytes and
 * its capacity as they were. */
static void
failure_leaves_it_whole(void **state)
{
	size_t cap = 0;
	unsigned char *p = al_reserve(NULL, &cap, 5000), *q;
	size_t before;

	(void)state;
	assert_non_null(p);
	memset(p, 0x5a, cap);
	before = cap;
	al_alloc_fail_at(1);
	q = al_reserve(p, &cap, 2 * before + 1);
	al_alloc_fail_at(0);
	assert_null(q);
	assert_int_equal(cap, before);
	for (size_t i = 0; i < cap; i++)
		assert_int_equal(p[i], 0x5a);
	al_free(p);
}

UNIT_TEST_MAIN(NULL, NULL,
	       cmocka_unit_test(keeps_its_bytes),
	       cmocka_unit_test(failure_leaves_it_whole))
