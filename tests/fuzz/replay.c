/* acidlot: replays fuzz inputs through a fuzz target without libFuzzer,
 * so the committed seed corpus runs in every `make check`.
 * usage: replay FILE_OR_DIR...
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static int
run_file(const char *path)
{
	FILE *f = fopen(path, "rb");
	uint8_t *buf;
	long n;

	if (f == NULL || fseek(f, 0, SEEK_END) != 0 || (n = ftell(f)) < 0) {
		perror(path);
		if (f)
			fclose(f);
		return 1;
	}
	rewind(f);
	buf = malloc((size_t)n + 1);
	if (buf == NULL || fread(buf, 1, (size_t)n, f) != (size_t)n) {
		perror(path);
		free(buf);
		fclose(f);
		return 1;
	}
	fclose(f);
	LLVMFuzzerTestOneInput(buf, (size_t)n);
	free(buf);
	return 0;
}

int
main(int argc, char **argv)
{
	int bad = 0;
	unsigned long count = 0;

	for (int i = 1; i < argc; i++) {
		struct stat sb;

		if (stat(argv[i], &sb) != 0) {
			perror(argv[i]);
			return 1;
		}
		if (S_ISDIR(sb.st_mode)) {
			DIR *d = opendir(argv[i]);
			struct dirent *e;

			while (d && (e = readdir(d)) != NULL) {
				char path[4096];

				if (e->d_name[0] == '.')
					continue;
				snprintf(path, sizeof path, "%s/%s", argv[i],
					 e->d_name);
				bad |= run_file(path);
				count++;
			}
			if (d)
				closedir(d);
		} else {
			bad |= run_file(argv[i]);
			count++;
		}
	}
	printf("replayed %lu inputs\n", count);
	if (count == 0)
		return 1;
	return bad;
}
