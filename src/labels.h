/* acidlot: the replicate labels of each result, so that one label twice
 * in a result (the same data twice) is found (internal).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_LABELS_H
#define ACIDLOT_LABELS_H

#include <stddef.h>
#include <stdint.h>

#include "acidlot/status.h"

#define AL_LABEL_SLOTS 3

/* A result's first labels, kept in the result itself in 8 bytes (the
 * memory a result may take is bounded: bench/memory.sh): the usual
 * triplicate, labelled 1, 2, 3 or A, B, C on nearby lines, needs
 * nothing more. A slot holds a one-byte label given in the same file
 * within 255 lines of the line where the result began; other labels go
 * to the run's table. Zeroed when the result is made. */
typedef struct al_label_slots {
	uint8_t key[AL_LABEL_SLOTS];   /* the label's byte; 0: free */
	uint8_t delta[AL_LABEL_SLOTS]; /* its line - the result's first */
	uint16_t more;                 /* labels of it in the table */
} al_label_slots;

/* Where a row was: a file index and a line. */
typedef struct al_label_at {
	uint32_t file;
	unsigned long line;
} al_label_at;

/* The run's table of the labels that are not in a result's slots;
 * zeroed, it is empty. */
typedef struct al_labels {
	struct more_label *more;
	size_t n_more, cap_more; /* cap a power of two, or 0 */
} al_labels;

void al_labels_clear(al_labels *l);

/* 1 and *at when the result (index group, its slots, begun at first)
 * has the label s[0..len) already; else 0. Labels compare byte for
 * byte: up to 7 bytes exactly, longer ones by a 56-bit hash (two
 * labels of one result share one with odds below n^2 / 2^57). */
int al_labels_find(const al_labels *l, const al_label_slots *slots,
		   size_t group, al_label_at first, const char *s, size_t len,
		   al_label_at *at);
/* Notes the label for the result; AL_OK or AL_ENOMEM. */
al_status al_labels_add(al_labels *l, al_label_slots *slots, size_t group,
			al_label_at first, const char *s, size_t len,
			al_label_at at);

#endif
