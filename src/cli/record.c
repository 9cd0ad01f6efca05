/* acidlot command line: the record of a run and file hashing.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * JSON through jansson (escaping and parsing done right, allocation
 * routable to our allocator); SHA-256 through nettle (small, well kept,
 * no allocation). Both from Debian (libjansson-dev, nettle-dev). */
#define _POSIX_C_SOURCE 200809L
#include "record.h"

#include <errno.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "cli.h"

void
hashing_reader_init(hashing_reader *h, FILE *in)
{
	h->in = in;
	h->bytes = 0;
	sha256_init(&h->ctx);
}

size_t
hashing_read(void *ctx, void *buf, size_t cap, int *failed)
{
	hashing_reader *h = ctx;
	size_t n = fread(buf, 1, cap, h->in);

	if (n < cap && ferror(h->in))
		*failed = 1;
	sha256_update(&h->ctx, n, buf);
	h->bytes += n;
	return n;
}

static void
to_hex(const uint8_t *digest, char hex[65])
{
	static const char digits[] = "0123456789abcdef";

	for (int i = 0; i < SHA256_DIGEST_SIZE; i++) {
		hex[2 * i] = digits[digest[i] >> 4];
		hex[2 * i + 1] = digits[digest[i] & 15];
	}
	hex[64] = '\0';
}

void
hashing_reader_hex(hashing_reader *h, char hex[65])
{
	uint8_t digest[SHA256_DIGEST_SIZE];

	sha256_digest(&h->ctx, SHA256_DIGEST_SIZE, digest);
	to_hex(digest, hex);
}

int
sha256_file(const char *path, char hex[65], unsigned long long *bytes)
{
	FILE *f = fopen(path, "rb");
	hashing_reader h;
	char buf[65536];
	int failed = 0;

	if (f == NULL)
		return -1;
	hashing_reader_init(&h, f);
	while (hashing_read(&h, buf, sizeof buf, &failed) > 0 && !failed)
		;
	fclose(f);
	if (failed)
		return -1;
	hashing_reader_hex(&h, hex);
	if (bytes)
		*bytes = h.bytes;
	return 0;
}

static void *
json_alloc(size_t n)
{
	return al_malloc(n);
}

void
record_use_library_alloc(void)
{
	json_set_alloc_funcs(json_alloc, al_free);
}

/* The run's time: now, or SOURCE_DATE_EPOCH (reproducible-builds
 * convention) so that tests get the same record and ids every time. */
static time_t
run_time(void)
{
	const char *epoch = getenv("SOURCE_DATE_EPOCH");

	if (epoch && *epoch) {
		char *end;
		long long v = strtoll(epoch, &end, 10);

		if (*end == '\0' && v >= 0)
			return (time_t)v;
	}
	return time(NULL);
}

int
record_start(run_record *r, const char *command, int argc, char **argv,
	     const char *analyst)
{
	time_t now = run_time();
	struct tm tm;
	char when[32];
	json_t *args;
	int bad = 0;

	memset(r, 0, sizeof r[0]);
	gmtime_r(&now, &tm);
	strftime(when, sizeof when, "%Y-%m-%dT%H:%M:%SZ", &tm);
	r->today = (long)(now / 86400);
	r->root = json_object();
	args = json_array();
	r->inputs = json_array();
	r->outputs = json_array();
	if (!r->root || !args || !r->inputs || !r->outputs) {
		json_decref(args);
		json_decref(r->inputs);
		json_decref(r->outputs);
		json_decref(r->root);
		r->root = r->inputs = r->outputs = NULL;
		return -1;
	}
	if (json_array_append_new(args, json_string(PROG)) != 0) {
		json_decref(args);
		return -1;
	}
	for (int i = 0; i < argc; i++)
		if (json_array_append_new(args, json_string(argv[i])) != 0) {
			json_decref(args);
			return -1;
		}
	/* every _new call takes its value even when it fails: no || here,
	 * so that nothing is left unowned */
	bad |= json_object_set_new(r->root, "program", json_string(PROG));
	bad |= json_object_set_new(r->root, "version",
				   json_string(ACIDLOT_VERSION));
	bad |= json_object_set_new(r->root, "command", json_string(command));
	bad |= json_object_set_new(r->root, "argv", args);
	bad |= json_object_set_new(r->root, "time_utc", json_string(when));
	bad |= json_object_set_new(r->root, "analyst",
				   analyst ? json_string(analyst) : json_null());
	bad |= json_object_set(r->root, "inputs", r->inputs);
	bad |= json_object_set(r->root, "outputs", r->outputs);
	return bad ? -1 : 0;
}

int
record_input(run_record *r, const char *role, const char *path,
	     unsigned long long bytes, long rows, const char *sha256)
{
	json_t *o = json_pack("{s:s, s:s, s:I, s:s}", "role", role, "path", path,
			      "bytes", (json_int_t)bytes, "sha256", sha256);

	if (o == NULL)
		return -1;
	if (rows >= 0 && json_object_set_new(o, "rows", json_integer(rows))) {
		json_decref(o);
		return -1;
	}
	return json_array_append_new(r->inputs, o) ? -1 : 0;
}

int
record_output(run_record *r, const char *role, const char *path,
	      const char *written_path)
{
	char hex[65];
	unsigned long long bytes;
	json_t *o;

	if (sha256_file(written_path, hex, &bytes) != 0)
		return -1;
	o = json_pack("{s:s, s:s, s:I, s:s}", "role", role, "path", path,
		      "bytes", (json_int_t)bytes, "sha256", hex);
	if (o == NULL)
		return -1;
	return json_array_append_new(r->outputs, o) ? -1 : 0;
}

int
record_seal(run_record *r)
{
	char *text = json_dumps(r->root, JSON_COMPACT | JSON_SORT_KEYS);
	struct sha256_ctx ctx;
	uint8_t digest[SHA256_DIGEST_SIZE];
	char hex[65];

	if (text == NULL)
		return -1;
	sha256_init(&ctx);
	sha256_update(&ctx, strlen(text), (const uint8_t *)text);
	al_free(text);
	sha256_digest(&ctx, SHA256_DIGEST_SIZE, digest);
	to_hex(digest, hex);
	/* "R" and 12 hex digits: short enough to quote on the phone */
	snprintf(r->id, sizeof r->id, "R%.12s", hex);
	return json_object_set_new(r->root, "report_id", json_string(r->id))
		       ? -1
		       : 0;
}

static int
dump_to(const char *buffer, size_t size, void *data)
{
	return fwrite(buffer, 1, size, data) == size ? 0 : -1;
}

int
record_write(run_record *r, FILE *out)
{
	if (json_dump_callback(r->root, dump_to, out,
			       JSON_INDENT(2) | JSON_SORT_KEYS) != 0 ||
	    fputc('\n', out) == EOF)
		return -1;
	return ferror(out) ? -1 : 0;
}

void
record_free(run_record *r)
{
	json_decref(r->inputs);
	json_decref(r->outputs);
	json_decref(r->root);
	r->root = r->inputs = r->outputs = NULL;
}
