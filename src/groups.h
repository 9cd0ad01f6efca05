/* acidlot: replicates grouped into results (internal): each result's
 * key (product, lot, sample), its values or running statistics, and the
 * sums of its inputs for the uncertainty budget. Stage 4 of the
 * pipeline (DEVELOPERS.md); it calls only base modules.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_GROUPS_H
#define ACIDLOT_GROUPS_H

#include <stddef.h>
#include <stdint.h>

#include "acidlot/chem.h"
#include "acidlot/result.h"
#include "labels.h"

/* Running statistics of a result whose values were not all kept (more
 * than AL_VALUES_KEPT): Welford's mean and sum of squared deviations
 * (Welford 1962; Knuth, TAOCP 2, 4.2.2), the two smallest and two
 * largest values and the positions of the extremes. */
typedef struct al_stream {
	double mean, m2, lo, lo2, hi, hi2;
	size_t lo_i, hi_i;
} al_stream;

/* One titration's inputs and result, kept for the lowest and the
 * highest result of a group when an outlier may be left out: an
 * outlier is always one of the two, so its inputs can come off the
 * means. Quantities a row lacks are negative. */
typedef struct al_row_inputs {
	double value;
	double titrant_ml, blank_ml, conc, amount, made_up_ml, aliquot_ml;
	double conc_u, brix, water_pct, density;
} al_row_inputs;

/* The first three values stay inside the group (a triplicate costs no
 * allocation); up to AL_VALUES_KEPT on the heap; past that, running
 * statistics only, so that memory is bounded by the number of groups. */
#define AL_INLINE_VALUES 3

enum {
	AL_G_VOLUME = 1,     /* the sample basis is volume (else mass) */
	AL_G_ANHYDROUS = 2,  /* results on the anhydrous basis */
	AL_G_HEAP = 4,       /* values.heap holds the values */
	AL_G_STREAM = 8,     /* values.stream holds running statistics */
	AL_G_JUDGED = 16,    /* verdict and flags are the evaluation's */
	AL_G_IMPOSSIBLE = 32 /* a row's value is more than a sample can hold */
};

/* One group, kept small: memory per group is what bounds a run of
 * millions of samples (bench/memory.sh: 120 bytes a group in all). */
typedef struct al_group {
	uint32_t key;        /* offset in the arena: product \0 lot \0 sample \0 */
	uint32_t n;          /* values so far */
	uint32_t flags;      /* AL_FLAG_ bits of its rows (and Cochran's) */
	uint32_t first_line; /* where it was first seen (saturates) */
	uint32_t extra;      /* 1 + index in extras; 0: none */
	uint8_t acid;        /* 1 + index in acids; 0: no valid row yet */
	uint8_t unit;
	uint8_t bits;        /* AL_G_ */
	uint8_t verdict;     /* the evaluation's (AL_G_JUDGED) */
	al_label_slots labels; /* its first replicate labels */
	/* sums of the inputs, for the uncertainty budget at their means */
	double sum_titrant, sum_conc, sum_amount;
	union {
		double v[AL_INLINE_VALUES];
		struct {
			double *p;
			uint32_t cap;
		} heap;
		al_stream *stream;
	} values;
} al_group;

/* The sums of the inputs few files have, kept only for the groups that
 * have one of them. */
typedef struct al_group_extra {
	double sum_blank, sum_made_up, sum_aliquot, sum_conc_u;
	double sum_brix, sum_water, sum_density, min_endpoint;
	uint32_t n_conc_u, n_brix, n_water, n_density, n_dates;
	long latest_date; /* of the rows with a date (n_dates) */
} al_group_extra;

/* A result's key as a row gives it: its product, lot and sample. */
typedef struct al_key {
	const char *product, *lot, *sample;
	size_t pl, ll, sl;
} al_key;

/* The groups of a run, in order of creation, file by file. */
typedef struct al_groups {
	al_group *g;
	size_t n, cap_bytes, g_mapped;
	char *arena; /* the keys */
	size_t arena_len, arena_cap, arena_mapped;
	uint64_t *slots; /* the key index: see groups.c */
	size_t n_slots;
	uint32_t last; /* 1 + the group found last */
	al_group_extra *extras;
	size_t n_extras, cap_extras;
	al_row_inputs (*extremes)[2]; /* by group, when kept */
	size_t n_extremes, cap_extremes;
	const al_acid *acids[255]; /* the groups' acids, by al_group.acid */
	size_t n_acids;
	size_t *file_first; /* the first group of each file */
	size_t n_files;
} al_groups;

void al_groups_free(al_groups *gs);
/* A new file begins: its groups follow. */
al_status al_groups_begin_file(al_groups *gs);
/* The file (0-based, in order of al_groups_begin_file) group i was
 * first seen in. */
size_t al_groups_file_of(const al_groups *gs, size_t i);

/* How a key will be found: the group found last (replicates mostly
 * follow each other), or else by its hash, whose slot al_groups_ahead
 * starts fetching (at millions of results a cache miss) while the
 * caller reads the row's other cells. */
typedef struct al_key_look {
	int same;
	uint32_t h32;
} al_key_look;
void al_groups_ahead(const al_groups *gs, const al_key *k, al_key_look *look);

/* The group of a key seen by al_groups_ahead, made when there is none
 * (*created says so; line is where it was first seen). */
al_status al_groups_find(al_groups *gs, const al_key *k,
			 const al_key_look *look, unsigned long line,
			 al_group **out, int *created);
/* A stored key's parts: product (returned), lot at + *pl + 1 and sample
 * after it. */
const char *al_groups_key(const al_groups *gs, const al_group *g, size_t *pl,
			  size_t *ll);
/* The key index is needed only while rows are read. */
void al_groups_drop_index(al_groups *gs);

/* The group's extra sums, made on first need; NULL when memory runs
 * out. */
al_group_extra *al_groups_extra(al_groups *gs, al_group *g);
/* Those of a group that has them, else NULL. */
const al_group_extra *al_groups_extra_of(const al_groups *gs,
					 const al_group *g);
/* Keeps a row as its group's lowest or highest result where it is one
 * (the first on a tie). */
al_status al_groups_note_extremes(al_groups *gs, const al_group *g,
				  const al_row_inputs *row);
/* The two rows of group i kept by al_groups_note_extremes, or NULL. */
const al_row_inputs *al_groups_extremes(const al_groups *gs, size_t i);

/* Adds a value to a group. */
al_status al_group_push(al_group *g, double v);
/* Its values in input order, or NULL when it keeps running statistics. */
const double *al_group_values(const al_group *g);

/* 1 + the index of an acid in the groups' table of acids (255 at most;
 * the catalogue has far fewer); 0 when the table is full. */
uint8_t al_groups_acid_slot(al_groups *gs, const al_acid *acid);
/* A group's acid; NULL before its first valid row. */
const al_acid *al_groups_acid(const al_groups *gs, const al_group *g);

#endif
