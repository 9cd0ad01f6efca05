/* acidlot: the endpoint of one titration curve, from its (volume, pH)
 * readings: at a fixed pH, at the steepest rise, or by a Gran plot.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_CURVE_H
#define ACIDLOT_CURVE_H

#include <stddef.h>

typedef enum {
	AL_CURVE_FIXED,      /* the volume at the endpoint pH, interpolated
				between the readings around it (AOAC 942.15) */
	AL_CURVE_INFLECTION, /* the volume of steepest rise */
	AL_CURVE_GRAN        /* the zero of the Gran line past the endpoint */
} al_curve_mode;

/* What a curve shows; the endpoint is still given where it can be
 * computed. */
enum {
	AL_CURVE_SPARSE = 1u << 0,      /* sparse-near-endpoint: the readings
					   around the endpoint more than
					   0.5 mL apart, or (fixed) more
					   than 0.2 pH */
	AL_CURVE_NOT_REACHED = 1u << 1, /* endpoint-not-reached: no volume */
	AL_CURVE_PH_FALLS = 1u << 2,    /* ph-falls: a drop of over 0.1 pH
					   in the second half */
	AL_CURVE_NOISY = 1u << 3,       /* noisy: scatter about the smoothed
					   curve over 0.05 pH */
	AL_CURVE_STARTS_ABOVE = 1u << 4, /* starts-above-endpoint: no volume */
	AL_CURVE_FEW_READINGS = 1u << 5, /* too-few-readings: no volume */
	AL_CURVE_GRAN_FEW = 1u << 6,    /* gran-too-few-readings: fewer than 3
					   readings at pH 10 or more at the
					   curve's end; no volume */
	AL_CURVE_GRAN_NO_V0 = 1u << 7,  /* gran-needs-volume: the volume
					   before titration is unknown */
	AL_CURVE_GRAN_OUTSIDE = 1u << 8, /* gran-outside-readings: the line
					    meets zero outside the curve's
					    volumes; no volume */
};

/* The thresholds the flags use (the curve issue's own figures). */
#define AL_CURVE_SPARSE_PH 0.2
#define AL_CURVE_SPARSE_ML 0.5
#define AL_CURVE_FALL_PH 0.1
#define AL_CURVE_NOISE_PH 0.05
/* Readings in the local quadratic fit that smooths the curve. */
#define AL_CURVE_WINDOW 5
/* Gran's region: readings at or above this pH, where the excess of
 * hydroxide outweighs the hydrolysis of the acid's anion (common
 * practice). */
#define AL_CURVE_GRAN_MIN_PH 10.0
/* pKw at 25 C (Kw = 1.0e-14; CRC Handbook gives 13.995). */
#define AL_CURVE_PKW 14.0

/* One titration: n readings of cumulative volume (mL, not decreasing)
 * and pH, in the order taken. */
typedef struct al_curve {
	const double *ml, *ph;
	size_t n;
	double target_ph; /* the fixed mode's endpoint pH */
	double v0_ml;     /* the volume before titration (Gran), or NaN */
} al_curve;

typedef struct al_curve_endpoint {
	int has_volume;
	double volume_ml; /* the endpoint */
	double ph;        /* the pH there, between the readings */
	unsigned flags;   /* AL_CURVE_ */
	/* gran: the line G = a + b V over readings [gran_from, n) */
	double gran_a, gran_b;
	size_t gran_from;
} al_curve_endpoint;

/* The endpoint of c by mode. work holds 3 c->n doubles: on return, the
 * smoothed pH at each reading in work[0..n) and its slope dpH/dV in
 * work[n..2n) (for pictures). */
void al_curve_find(const al_curve *c, al_curve_mode mode, double *work,
		   al_curve_endpoint *out);

/* The local quadratic least-squares fit (AL_CURVE_WINDOW readings
 * around each one) of c: smoothed pH, slope, and each reading's
 * leverage in its own fit (NULL to skip). */
void al_curve_smooth(const al_curve *c, double *smooth, double *slope,
		     double *leverage);

/* The flags named in s[0..len), ';'-separated (as al_curve_flags_format
 * writes them); *bad the offset of the first name that is none, or len. */
unsigned al_curve_flags_parse(const char *s, size_t len, size_t *bad);
/* The flags as ';'-separated names ("" when none). */
void al_curve_flags_format(unsigned flags, char *buf, size_t cap);
/* Each mode's name, in the enum's order. */
extern const char *const al_curve_mode_names[3];

#endif
