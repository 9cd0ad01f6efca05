/* acidlot: status codes and diagnostics (file, line, column, message).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_STATUS_H
#define ACIDLOT_STATUS_H

#include <stddef.h>

/* Stable numbers: never renumber, only append. */
typedef enum al_status {
	AL_OK = 0,
	AL_ENOMEM = 1,    /* out of memory */
	AL_EIO = 2,       /* read or write failed */
	AL_ESYNTAX = 3,   /* the CSV itself is malformed */
	AL_EINPUT = 4,    /* a value in the input is missing, not a number or impossible */
	AL_EINVAL = 5,    /* a bad argument from the caller (option, name, unit) */
	AL_ENOTFOUND = 6, /* a named acid, unit or column does not exist */
	AL_EDOMAIN = 7    /* a computation outside its valid range */
} al_status;

/* A short English phrase for a status; never NULL. */
const char *al_strerror(al_status status);

typedef enum al_severity {
	AL_SEV_ERROR = 0,
	AL_SEV_WARNING = 1
} al_severity;

/* One diagnostic. file and column may be NULL, line 0 when not known.
 * All strings are owned by the list that holds the record. */
typedef struct al_diag {
	al_severity severity;
	char *file;
	unsigned long line;
	char *column;
	char *message;
} al_diag;

/* A growing list of diagnostics. It keeps at most `cap` records of each
 * severity and counts the rest, so a file with a million bad rows costs
 * no memory beyond the cap. Zero-initialise, then set cap (0 = 50). */
typedef struct al_diags {
	al_diag *items;
	size_t count, alloc;
	size_t cap;
	unsigned long errors, warnings; /* all raised, kept or not */
	int out_of_memory; /* set when a record could not be stored */
} al_diags;

/* Adds a diagnostic; the strings are copied. Returns AL_ENOMEM when the
 * copy fails (the count is still raised and out_of_memory is set, so a
 * caller may check the list once instead of every call). */
al_status al_diags_add(al_diags *list, al_severity severity, const char *file,
		       unsigned long line, const char *column, const char *fmt,
		       ...) __attribute__((format(printf, 6, 7)));
void al_diags_clear(al_diags *list);

#endif
