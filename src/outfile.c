/* acidlot: atomic output files (temporary file + rename).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _GNU_SOURCE
#include "acidlot/outfile.h"

#include <errno.h>
#include <fcntl.h>
#include <stdlib.h>
#include <string.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include "acidlot/alloc.h"

struct al_outfile {
	FILE *stream;
	char *path;
	char *dest; /* the file replaced: path, or a symbolic link's target */
	char *tmp;  /* NULL when written in place */
	char *old;  /* room for the name of a link to the file replaced */
	int direct; /* a device or pipe, written in place and closed */
	int closed; /* prepared: flushed, checked and closed */
};

/* The temporary files of the outputs open now, for
 * al_outfile_unlink_all: a slot is set once its name is complete and
 * cleared before the name is freed, each a single store. */
#define OPEN_MAX 64
static char *volatile open_tmp[OPEN_MAX];

static void
note_tmp(char *tmp, char *old)
{
	for (int i = 0; i < OPEN_MAX; i++)
		if (open_tmp[i] == old) {
			open_tmp[i] = tmp;
			return;
		}
}

void
al_outfile_unlink_all(void)
{
	for (int i = 0; i < OPEN_MAX; i++) {
		char *t = open_tmp[i];

		if (t != NULL)
			unlink(t);
	}
}

static void release(al_outfile *f);

/* The temporary file beside f->dest, with the mode the output will
 * have: a file replaced keeps its own, a new one gets 0666 less the
 * umask. AL_OK, AL_EIO or AL_ENOMEM. */
static al_status
open_temp(al_outfile *f)
{
	const char *slash = strrchr(f->dest, '/');
	size_t dirlen = slash ? (size_t)(slash - f->dest + 1) : 0;
	struct stat sb;
	mode_t mode;
	int fd, saved;

	if (stat(f->dest, &sb) == 0)
		mode = sb.st_mode & 07777;
	else {
		mode_t mask = umask(0);

		umask(mask);
		mode = 0666 & ~mask;
	}
	f->tmp = al_malloc(dirlen + sizeof ".acidlot-XXXXXX");
	f->old = al_malloc(dirlen + sizeof ".acidlot-old-XXXXXX");
	if (f->tmp == NULL || f->old == NULL)
		return AL_ENOMEM;
	memcpy(f->tmp, f->dest, dirlen);
	memcpy(f->tmp + dirlen, ".acidlot-XXXXXX", sizeof ".acidlot-XXXXXX");
	fd = mkstemp(f->tmp);
	if (fd < 0) {
		al_free(f->tmp);
		f->tmp = NULL;
		return AL_EIO;
	}
	note_tmp(f->tmp, NULL); /* a signal now removes it */
	/* mkstemp makes 0600 */
	if (fchmod(fd, mode) != 0 || (f->stream = fdopen(fd, "w")) == NULL) {
		saved = errno;
		close(fd);
		unlink(f->tmp);
		errno = saved;
		return AL_EIO;
	}
	/* large writes: a report of millions of lines */
	setvbuf(f->stream, NULL, _IOFBF, 1 << 18);
	return AL_OK;
}

al_outfile *
al_outfile_open(const char *path, al_status *status)
{
	al_outfile *f = al_calloc(1, sizeof *f);
	struct stat sb;
	al_status st = AL_ENOMEM;
	int saved;

	if (f == NULL || (f->path = al_strdup(path)) == NULL)
		goto fail;
	st = AL_EIO;
	if (strcmp(path, "-") == 0) {
		f->stream = stdout;
		*status = AL_OK;
		return f;
	}
	/* A device or a FIFO (/dev/null, /dev/stdout, a pipe) cannot
	 * be replaced by a rename: write to it in place. */
	if (stat(path, &sb) == 0 && !S_ISREG(sb.st_mode)) {
		if (S_ISDIR(sb.st_mode)) {
			errno = EISDIR;
			goto fail;
		}
		if ((f->stream = fopen(path, "w")) == NULL)
			goto fail;
		f->direct = 1;
		*status = AL_OK;
		return f;
	}
	/* A symbolic link to a file is written through to it, never
	 * replaced by a file of its own; a dangling one is refused */
	if (lstat(path, &sb) == 0 && S_ISLNK(sb.st_mode)) {
		char *real = realpath(path, NULL);

		if (real == NULL)
			goto fail;
		f->dest = al_strdup(real);
		free(real);
	} else
		f->dest = al_strdup(path);
	st = f->dest == NULL ? AL_ENOMEM : open_temp(f);
	if (st == AL_OK) {
		*status = AL_OK;
		return f;
	}
fail:
	saved = errno;
	if (f != NULL)
		release(f);
	errno = saved;
	*status = st;
	return NULL;
}

FILE *
al_outfile_stream(al_outfile *f)
{
	return f->stream;
}

const char *
al_outfile_path(const al_outfile *f)
{
	return f->path;
}

const char *
al_outfile_written_path(const al_outfile *f)
{
	return f->tmp ? f->tmp : f->path;
}

int
al_outfile_in_place(const al_outfile *f)
{
	return f->tmp == NULL;
}

static void
release(al_outfile *f)
{
	if (f->tmp)
		note_tmp(NULL, f->tmp);
	al_free(f->tmp);
	al_free(f->old);
	al_free(f->dest);
	al_free(f->path);
	al_free(f);
}


/* Flushes, syncs and closes an output not yet closed; 0 or -1. */
static int
settle(al_outfile *f)
{
	int bad;

	if (f->closed) /* prepared: checked already */
		return 0;
	bad = fflush(f->stream) != 0 || ferror(f->stream);
	if (f->tmp == NULL)
		return bad ? -1 : 0;
	if (!bad && fsync(fileno(f->stream)) != 0 && errno != EINVAL)
		bad = 1;
	if (fclose(f->stream) != 0)
		bad = 1;
	f->closed = 1;
	return bad ? -1 : 0;
}

al_status
al_outfile_prepare(al_outfile *f)
{
	return settle(f) == 0 ? AL_OK : AL_EIO;
}

/* A hard link to the file an output will replace, beside it, named in
 * f->old; NULL when none can be made (then the output is put in place
 * without one). */
static char *
keep_old(al_outfile *f)
{
	size_t n = strlen(f->tmp);
	int fd;

	memcpy(f->old, f->tmp, n - 6);
	memcpy(f->old + n - 6, "old-XXXXXX", 11);
	fd = mkstemp(f->old);
	if (fd >= 0) {
		close(fd);
		unlink(f->old);
		if (link(f->dest, f->old) == 0)
			return f->old;
	}
	return NULL;
}

/* Locks the folders of the outputs (flock, exclusive, in the order of
 * their device and inode so that two runs cannot wait on each other):
 * two runs putting the same outputs in place take turns, and each run's
 * outputs land together. fds[i] is -1 where a folder is not locked
 * (another output's, or one that cannot be opened). */
static void
lock_folders(al_outfile **files[], size_t n, int *fds)
{
	struct stat st[n ? n : 1];
	char done[n ? n : 1];

	for (size_t i = 0; i < n; i++) {
		al_outfile *f = *files[i];
		char *slash;

		fds[i] = -1;
		done[i] = 0;
		if (f == NULL || f->tmp == NULL)
			continue;
		slash = strrchr(f->dest, '/');
		if (slash == f->dest)
			fds[i] = open("/", O_RDONLY | O_DIRECTORY);
		else if (slash) {
			*slash = '\0';
			fds[i] = open(f->dest, O_RDONLY | O_DIRECTORY);
			*slash = '/';
		} else
			fds[i] = open(".", O_RDONLY | O_DIRECTORY);
		if (fds[i] >= 0 && fstat(fds[i], &st[i]) != 0) {
			close(fds[i]);
			fds[i] = -1;
		}
		for (size_t j = 0; fds[i] >= 0 && j < i; j++)
			if (fds[j] >= 0 && st[j].st_dev == st[i].st_dev &&
			    st[j].st_ino == st[i].st_ino) {
				close(fds[i]);
				fds[i] = -1;
			}
	}
	/* the lowest not yet locked, then the next */
	for (size_t k = 0; k < n; k++) {
		size_t lo = n;

		for (size_t i = 0; i < n; i++)
			if (fds[i] >= 0 && !done[i] &&
			    (lo == n || st[i].st_dev < st[lo].st_dev ||
			     (st[i].st_dev == st[lo].st_dev &&
			      st[i].st_ino < st[lo].st_ino)))
				lo = i;
		if (lo == n)
			break;
		while (flock(fds[lo], LOCK_EX) != 0 && errno == EINTR)
			;
		done[lo] = 1;
	}
}

static void
unlock_folders(const int *fds, size_t n)
{
	for (size_t i = 0; i < n; i++)
		if (fds[i] >= 0)
			close(fds[i]); /* and its lock */
}

al_status
al_outfile_commit_all(al_outfile **files[], size_t n, char *failed,
		      size_t cap)
{
	int locks[n ? n : 1];
	char *kept[n ? n : 1];
	int existed[n ? n : 1], saved = 0;
	size_t done = 0;
	int bad = 0;

	for (size_t i = 0; i < n; i++) {
		kept[i] = NULL;
		existed[i] = 0;
		locks[i] = -1;
		if (*files[i] != NULL && !bad && settle(*files[i]) != 0) {
			bad = 1;
			saved = errno;
			snprintf(failed, cap, "%s", (*files[i])->path);
		}
	}
	if (!bad)
		lock_folders(files, n, locks);
	for (size_t i = 0; i < n && !bad; i++) {
		al_outfile *f = *files[i];
		struct stat sb;

		if (f == NULL || f->tmp == NULL)
			continue;
		existed[i] = stat(f->dest, &sb) == 0;
		if (existed[i])
			kept[i] = keep_old(f);
	}
	for (; done < n && !bad; done++) {
		al_outfile *f = *files[done];

		if (f != NULL && f->tmp != NULL && rename(f->tmp, f->dest) != 0) {
			bad = 1;
			saved = errno;
			snprintf(failed, cap, "%s", f->path);
			break;
		}
	}
	for (size_t i = 0; i < n; i++) {
		al_outfile *f = *files[i];

		if (f == NULL)
			continue;
		if (bad && f->tmp != NULL && i < done) {
			/* put back what was there */
			if (kept[i] != NULL)
				rename(kept[i], f->dest);
			else if (!existed[i])
				unlink(f->dest);
		} else if (bad && f->tmp != NULL)
			unlink(f->tmp);
		if (kept[i] != NULL)
			unlink(kept[i]);
		if (f->tmp == NULL && f->direct)
			fclose(f->stream);
		if (f->tmp != NULL && !f->closed)
			fclose(f->stream);
		release(f);
		*files[i] = NULL;
	}
	unlock_folders(locks, n);
	if (bad)
		errno = saved;
	return bad ? AL_EIO : AL_OK;
}

void
al_outfile_abort(al_outfile *f)
{
	if (f == NULL)
		return;
	if (f->tmp != NULL) {
		if (!f->closed)
			fclose(f->stream);
		unlink(f->tmp);
	} else if (f->direct)
		fclose(f->stream);
	release(f);
}
