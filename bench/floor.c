/* acidlot bench: the floor: libcsv parsing alone, callbacks that only
 * count fields and rows, 64 KiB reads.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <csv.h>
#include <stdio.h>

static unsigned long long fields, rows;

static void
on_field(void *s, size_t len, void *ud)
{
	(void)s;
	(void)len;
	(void)ud;
	fields++;
}

static void
on_row(int c, void *ud)
{
	(void)c;
	(void)ud;
	rows++;
}

int
main(int argc, char **argv)
{
	static char buf[1 << 16];
	struct csv_parser p;
	FILE *in = argc > 1 ? fopen(argv[1], "rb") : stdin;
	size_t n;

	if (in == NULL || csv_init(&p, CSV_STRICT) != 0)
		return 2;
	csv_set_blk_size(&p, 4096);
	while ((n = fread(buf, 1, sizeof buf, in)) > 0)
		if (csv_parse(&p, buf, n, on_field, on_row, NULL) != n)
			return 1;
	csv_fini(&p, on_field, on_row, NULL);
	csv_free(&p);
	printf("%llu rows, %llu fields\n", rows, fields);
	return 0;
}
