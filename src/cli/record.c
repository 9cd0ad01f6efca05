/* acidlot command line: the record of a run and file hashing.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * JSON through jansson (escaping and parsing done right, allocation
 * routable to our allocator); SHA-256 through nettle (small, well kept,
 * no allocation). Both from Debian (libjansson-dev, nettle-dev). */
#define _XOPEN_SOURCE 700
#include "record.h"

#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "acidlot/table.h"
#include "cli.h"

void
hashing_reader_init(hashing_reader *h, FILE *in)
{
	h->in = in;
	h->bytes = 0;
	sha256_init(&h->ctx);
}

static size_t
read_and_hash(hashing_reader *h, void *buf, size_t cap, int *failed)
{
	size_t n = fread(buf, 1, cap, h->in);

	if (n < cap && ferror(h->in))
		*failed = 1;
	sha256_update(&h->ctx, n, buf);
	h->bytes += n;
	return n;
}

size_t
hashing_read(void *ctx, void *buf, size_t cap, int *failed)
{
	return read_and_hash(ctx, buf, cap, failed);
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
sha256_ctx_hex(struct sha256_ctx *ctx, char hex[65])
{
	uint8_t digest[SHA256_DIGEST_SIZE];

	sha256_digest(ctx, SHA256_DIGEST_SIZE, digest);
	to_hex(digest, hex);
}

void
hashing_reader_hex(hashing_reader *h, char hex[65])
{
	sha256_ctx_hex(&h->ctx, hex);
}

int
sha256_file(const char *path, char hex[65], unsigned long long *bytes)
{
	/* never blocks on a FIFO or a device: only a regular file is read */
	int fd = open(path, O_RDONLY | O_NONBLOCK);
	struct stat st;
	FILE *f;
	hashing_reader h;
	char buf[65536];
	int failed = 0;

	if (fd < 0)
		return -1;
	if (fstat(fd, &st) != 0 || !S_ISREG(st.st_mode) ||
	    (f = fdopen(fd, "rb")) == NULL) {
		int saved = S_ISDIR(st.st_mode) ? EISDIR : errno ? errno : EINVAL;

		close(fd);
		errno = saved;
		return -1;
	}
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

/* The last second YYYY-MM-DDTHH:MM:SSZ can write: 9999-12-31T23:59:59Z */
#define LAST_SECOND 253402300799LL

/* The run's time: now, or SOURCE_DATE_EPOCH (reproducible-builds
 * convention) so that tests get the same record and ids every time. 0,
 * or -1 after saying why SOURCE_DATE_EPOCH is refused: a whole number
 * of seconds from 0 to 9999-12-31T23:59:59Z, nothing else. */
static int
run_time(time_t *now)
{
	const char *epoch = getenv("SOURCE_DATE_EPOCH");
	char *end;
	long long v;

	*now = time(NULL);
	if (epoch == NULL)
		return 0;
	errno = 0;
	v = strtoll(epoch, &end, 10);
	if (*epoch < '0' || *epoch > '9' || *end != '\0' || errno != 0 ||
	    v > LAST_SECOND) {
		cli_error("SOURCE_DATE_EPOCH: '%.40s' is not a whole number of "
			  "seconds from 0 to %lld (9999-12-31T23:59:59Z)",
			  epoch, LAST_SECOND);
		return -1;
	}
	*now = (time_t)v;
	return 0;
}

const record_rule *
record_rule_of(int guarded)
{
	static const record_rule rules[2] = {
		{"simple acceptance",
		 "ILAC G8:09/2019 4.2.1; ISO/IEC 17025:2017 7.8.6",
		 "pass when min <= mean <= max (limits inclusive, the unrounded "
		 "mean, measurement uncertainty not subtracted); retest when "
		 "n < min_n, RSD > max_rsd_pct or the range exceeds f(n) sr "
		 "(ISO 5725-6)"},
		{"guarded acceptance",
		 "ILAC G8:09/2019 4.2.2; ISO/IEC 17025:2017 7.8.6",
		 "w = r U: pass inside [min + w, max - w], fail outside "
		 "[min - w, max + w], conditional-pass or conditional-fail in "
		 "between; retest when n < min_n, RSD > max_rsd_pct or the "
		 "range exceeds f(n) sr (ISO 5725-6)"},
	};

	return &rules[guarded != 0];
}

int
record_now(char when[32])
{
	time_t now;
	struct tm tm;

	if (run_time(&now) != 0)
		return -1;
	gmtime_r(&now, &tm);
	strftime(when, 32, "%Y-%m-%dT%H:%M:%SZ", &tm);
	return 0;
}

int
record_start(run_record *r, const char *command, int argc, char **argv,
	     const char *analyst)
{
	time_t now;
	struct tm tm;
	char when[32];
	json_t *args;
	int bad = 0;

	memset(r, 0, sizeof r[0]);
	if (run_time(&now) != 0)
		return -2;
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
		if (json_array_append_new(args, record_text(argv[i])) != 0) {
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
				   analyst ? record_text(analyst) : json_null());
	bad |= json_object_set(r->root, "inputs", r->inputs);
	bad |= json_object_set(r->root, "outputs", r->outputs);
	return bad ? -1 : 0;
}

json_t *
record_text(const char *s)
{
	size_t len = strlen(s), at = 0;
	char *clean;
	json_t *j;

	if (al_utf8_valid(s, len))
		return json_string(s);
	clean = al_malloc(3 * len + 1); /* each byte at worst 3 */
	if (clean == NULL)
		return NULL;
	for (size_t i = 0; i < len;) {
		size_t n = al_utf8_seq(s + i, len - i);

		if (n > 0) {
			memcpy(clean + at, s + i, n);
			at += n;
			i += n;
		} else {
			memcpy(clean + at, "\xEF\xBF\xBD", 3);
			at += 3;
			i++;
		}
	}
	clean[at] = '\0';
	j = json_string(clean);
	al_free(clean);
	return j;
}

/* A file name that is not UTF-8 shows as U+FFFD in the record's text;
 * its bytes are kept too, in hex under key, so that verify finds the
 * file. Returns o, or NULL (o freed) when memory runs out. */
static json_t *
keep_name(json_t *o, const char *key, const char *name)
{
	size_t n = strlen(name);
	char *hex;

	if (o == NULL || al_utf8_valid(name, n))
		return o;
	hex = al_malloc(2 * n + 1);
	if (hex == NULL) {
		json_decref(o);
		return NULL;
	}
	for (size_t i = 0; i < n; i++)
		snprintf(hex + 2 * i, 3, "%02x", (unsigned char)name[i]);
	if (json_object_set_new(o, key, json_string(hex)) != 0) {
		json_decref(o);
		o = NULL;
	}
	al_free(hex);
	return o;
}

/* The bytes of a name kept in hex, into out (cap bytes); NULL when the
 * entry has none or it does not fit. */
const char *
record_name(json_t *f, const char *key, char *out, size_t cap)
{
	const char *hex = json_string_value(json_object_get(f, key));
	size_t n = hex ? strlen(hex) : 0;

	if (hex == NULL || n % 2 || n / 2 >= cap)
		return NULL;
	for (size_t i = 0; i < n / 2; i++) {
		unsigned v;

		if (sscanf(hex + 2 * i, "%2x", &v) != 1 || v == 0)
			return NULL;
		out[i] = (char)v;
	}
	out[n / 2] = '\0';
	return out;
}

/* A file's entry: role, path (and its bytes when they are not text),
 * size and SHA-256; NULL when memory runs out. */
static json_t *
file_entry(const char *role, const char *path, unsigned long long bytes,
	   const char *sha256)
{
	return keep_name(json_pack("{s:s, s:o, s:I, s:s}", "role", role, "path",
				   record_text(path), "bytes",
				   (json_int_t)bytes, "sha256", sha256),
			 "path_hex", path);
}

int
record_input(run_record *r, const char *role, const char *path,
	     unsigned long long bytes, long rows, const char *sha256)
{
	json_t *o = file_entry(role, path, bytes, sha256);

	if (o == NULL)
		return -1;
	if (rows >= 0 && json_object_set_new(o, "rows", json_integer(rows))) {
		json_decref(o);
		return -1;
	}
	return json_array_append_new(r->inputs, o) ? -1 : 0;
}

int
record_output_hashed(run_record *r, const char *role, const char *path,
		     const char *hex, unsigned long long bytes)
{
	json_t *o = file_entry(role, path, bytes, hex);

	return o == NULL || json_array_append_new(r->outputs, o) ? -1 : 0;
}

int
record_output(run_record *r, const char *role, const char *path,
	      const char *written_path)
{
	char hex[65];
	unsigned long long bytes;

	if (sha256_file(written_path, hex, &bytes) != 0)
		return -1;
	return record_output_hashed(r, role, path, hex, bytes);
}

int
record_output_unhashed(run_record *r, const char *role, const char *path)
{
	json_t *o = keep_name(
		json_pack("{s:s, s:o, s:n, s:s}", "role", role, "path",
			  record_text(path), "sha256", "written",
			  "in place (a device, FIFO or standard output), not "
			  "read back"),
		"path_hex", path);

	if (o == NULL)
		return -1;
	return json_array_append_new(r->outputs, o) ? -1 : 0;
}

static void *
hash_files(void *arg)
{
	file_hashes *h = arg;

	for (size_t i = 0; i < h->n; i++)
		if (sha256_file(h->path[i], h->hex[i], &h->bytes[i]) != 0)
			h->failed = 1;
	return NULL;
}

void
file_hashes_start(file_hashes *h)
{
	/* a thread pays for itself on a large run only (1e6 rows with
	 * replicates: 1.20 s with it, 1.33 s without); a small one's
	 * outputs are hashed here and no thread starts */
	h->failed = 0;
	h->threaded = h->large &&
		      pthread_create(&h->th, NULL, hash_files, h) == 0;
	if (!h->threaded)
		hash_files(h);
}

int
file_hashes_finish(file_hashes *h)
{
	if (h->threaded)
		pthread_join(h->th, NULL);
	h->threaded = 0;
	return h->failed ? -1 : 0;
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

/* to (absolute) relative to the folder from (absolute): "../x/y". */
static int
relative(const char *from, const char *to, char *out, size_t cap)
{
	size_t k = 0, n = 0;

	/* k: the end of the longest common folder */
	for (size_t i = 0;; i++) {
		if ((from[i] == '\0' || from[i] == '/') && to[i] == '/')
			k = i;
		if (from[i] == '\0' || from[i] != to[i])
			break;
	}
	out[0] = '\0';
	for (const char *p = from + k; *p && n < cap; p++)
		if (*p == '/' && p[1] != '\0' && p[1] != '/')
			n += (size_t)snprintf(out + n, cap - n, "../");
	if (n >= cap)
		return -1;
	return snprintf(out + n, cap - n, "%s", to + k + 1) < (int)(cap - n)
		       ? 0
		       : -1;
}

/* Gives each named file its path from the record's folder
 * ("from_record"), so that verify finds it from any directory. */
static void
locate(json_t *list, const char *record_dir)
{
	size_t i;
	json_t *f;

	json_array_foreach(list, i, f)
	{
		char raw[PATH_MAX], abs[PATH_MAX + NAME_MAX + 2],
			rel[3 * PATH_MAX];
		const char *path = record_name(f, "path_hex", raw, sizeof raw);

		if (path == NULL)
			path = json_string_value(json_object_get(f, "path"));
		if (path && strcmp(path, "-") != 0 &&
		    cli_absolute(path, abs, sizeof abs) == 0 &&
		    relative(record_dir, abs, rel, sizeof rel) == 0) {
			json_object_set_new(f, "from_record", record_text(rel));
			/* keep_name takes a reference and gives it back */
			if (keep_name(json_incref(f), "from_record_hex", rel))
				json_decref(f);
		}
	}
}

int
record_write(run_record *r, const char *path, al_outfile **file)
{
	char abs[PATH_MAX + NAME_MAX + 2];
	al_status st;
	FILE *out;

	if (cli_absolute(path, abs, sizeof abs) == 0) {
		*strrchr(abs, '/') = '\0';
		locate(r->inputs, abs[0] ? abs : "/");
		locate(r->outputs, abs[0] ? abs : "/");
	}
	*file = al_outfile_open(path, &st);
	if (*file == NULL)
		return -1;
	out = al_outfile_stream(*file);
	if (json_dump_callback(r->root, dump_to, out,
			       JSON_INDENT(2) | JSON_SORT_KEYS) != 0 ||
	    fputc('\n', out) == EOF || ferror(out))
		return -1;
	return al_outfile_prepare(*file) == AL_OK ? 0 : -1;
}

void
record_free(run_record *r)
{
	json_decref(r->inputs);
	json_decref(r->outputs);
	json_decref(r->root);
	r->root = r->inputs = r->outputs = NULL;
}

int
record_hash_input(run_record *rec, const char *role, const char *path, long rows)
{
	char hex[65];
	unsigned long long bytes;

	if (sha256_file(path, hex, &bytes) != 0) {
		cli_error("%s: cannot read it again to hash it", path);
		return -1;
	}
	if (record_input(rec, role, path, bytes, rows, hex) != 0) {
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return 0;
}
