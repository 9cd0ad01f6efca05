/* acidlot: status phrases and the diagnostic list.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/status.h"

#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include "acidlot/alloc.h"

const char *
al_strerror(al_status status)
{
	switch (status) {
	case AL_OK:
		return "success";
	case AL_ENOMEM:
		return "out of memory";
	case AL_EIO:
		return "input/output error";
	case AL_ESYNTAX:
		return "malformed CSV";
	case AL_EINPUT:
		return "invalid input value";
	case AL_EINVAL:
		return "invalid argument";
	case AL_ENOTFOUND:
		return "not found";
	case AL_EDOMAIN:
		return "outside the valid range";
	}
	return "unknown status";
}

al_status
al_diags_add(al_diags *list, al_severity severity, const char *file,
	     unsigned long line, const char *column, const char *fmt, ...)
{
	char buf[1024];
	va_list ap;
	size_t cap = list->cap ? list->cap : 50;
	unsigned long *counter =
		severity == AL_SEV_ERROR ? &list->errors : &list->warnings;
	al_diag *d;

	(*counter)++;
	if (*counter > cap)
		return AL_OK;
	if (list->count == list->alloc) {
		size_t n = list->alloc ? 2 * list->alloc : 16;
		al_diag *grown = al_realloc(list->items, n * sizeof *grown);

		if (grown == NULL) {
			list->out_of_memory = 1;
			return AL_ENOMEM;
		}
		list->items = grown;
		list->alloc = n;
	}
	va_start(ap, fmt);
	vsnprintf(buf, sizeof buf, fmt, ap);
	va_end(ap);

	d = &list->items[list->count];
	memset(d, 0, sizeof *d);
	d->severity = severity;
	d->line = line;
	d->message = al_strdup(buf);
	d->file = file ? al_strdup(file) : NULL;
	d->column = column ? al_strdup(column) : NULL;
	if (d->message == NULL || (file && d->file == NULL) ||
	    (column && d->column == NULL)) {
		al_free(d->message);
		al_free(d->file);
		al_free(d->column);
		list->out_of_memory = 1;
		return AL_ENOMEM;
	}
	list->count++;
	return AL_OK;
}

void
al_diags_clear(al_diags *list)
{
	for (size_t i = 0; i < list->count; i++) {
		al_free(list->items[i].file);
		al_free(list->items[i].column);
		al_free(list->items[i].message);
	}
	al_free(list->items);
	list->items = NULL;
	list->count = list->alloc = 0;
	list->errors = list->warnings = 0;
	list->out_of_memory = 0;
}
