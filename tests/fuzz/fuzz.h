/* acidlot fuzz targets: what every target shares.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_FUZZ_H
#define ACIDLOT_FUZZ_H

#define _POSIX_C_SOURCE 200809L
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>

#include "acidlot/acidlot.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* The built-in catalogue, made once. */
static inline const al_catalogue *
fuzz_catalogue(void)
{
	static al_catalogue *cat;
	al_status st;

	if (cat == NULL && (cat = al_catalogue_new(&st, NULL)) == NULL)
		__builtin_trap();
	return cat;
}

/* The input as a stream, NULL when empty. */
static inline FILE *
fuzz_stream(const uint8_t *data, size_t size)
{
	return size ? fmemopen((void *)data, size, "r") : NULL;
}

#endif
