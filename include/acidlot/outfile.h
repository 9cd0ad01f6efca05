/* acidlot: output files that appear whole or not at all.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_OUTFILE_H
#define ACIDLOT_OUTFILE_H

#include <stdio.h>

#include "acidlot/status.h"

/* An output being written: to a temporary file in the target's directory,
 * renamed over the target by al_outfile_commit_all, removed by
 * al_outfile_abort. The path "-" writes to standard output. */
typedef struct al_outfile al_outfile;

/* NULL with *status (AL_EIO, AL_ENOMEM) on failure; errno is kept. */
al_outfile *al_outfile_open(const char *path, al_status *status);
FILE *al_outfile_stream(al_outfile *f);
const char *al_outfile_path(const al_outfile *f);
/* Where the bytes are until commit: the temporary file, or the target
 * itself when written in place. */
const char *al_outfile_written_path(const al_outfile *f);
/* 1 when written in place (standard output, a device, a FIFO): such an
 * output is written once and never read back. */
int al_outfile_in_place(const al_outfile *f);
/* Flushes, checks every write and closes, without renaming yet, so that
 * several outputs can all be checked before any appears. AL_EIO on a
 * failure (the caller then aborts). */
al_status al_outfile_prepare(al_outfile *f);
/* Discards everything written; frees f. Accepts NULL. */
void al_outfile_abort(al_outfile *f);

/* Puts n outputs in place, all or none: each is flushed and checked,
 * each file it replaces is kept under a hard link until every rename has
 * succeeded, and a failure at any step puts back what was there (and
 * removes what was not). The outputs are freed and their pointers set to
 * NULL either way; AL_EIO with errno on a failure, and the path of the
 * output that failed in failed (cap bytes). */
al_status al_outfile_commit_all(al_outfile **files[], size_t n,
				char *failed, size_t cap);

/* Removes every temporary file of the outputs still open; only unlink,
 * so a signal handler may call it (async-signal-safe). */
void al_outfile_unlink_all(void);

#endif
