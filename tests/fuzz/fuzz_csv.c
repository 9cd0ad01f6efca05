/* acidlot fuzz target: the CSV reader, strict and recover mode.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "acidlot/csvread.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

struct count {
	size_t rows, fields, bytes;
};

static al_status
row(void *ud, const al_csv_row *r)
{
	struct count *c = ud;

	c->rows++;
	c->fields += r->nfields;
	for (size_t i = 0; i < r->nfields; i++) {
		/* every field is NUL-terminated at its length */
		if (r->fields[i][r->lens[i]] != '\0')
			__builtin_trap();
		c->bytes += r->lens[i];
	}
	if (r->raw_len > AL_CSV_MAX_RECORD)
		__builtin_trap();
	return AL_OK;
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	static const char delims[4] = {',', ';', '\t', AL_CSV_AUTO};
	al_csv_options opt;
	al_diags d = {0};
	struct count c = {0, 0, 0};

	if (size < 1)
		return 0;
	memset(&opt, 0, sizeof opt);
	opt.delimiter = delims[data[0] & 3];
	opt.recover = (data[0] >> 2) & 1;
	opt.max_field = (data[0] & 8) ? 64 : 0;
	al_csv_read_mem(&opt, (const char *)data + 1, size - 1, "fuzz.csv", row,
			&c, &d);
	al_diags_clear(&d);
	return 0;
}
