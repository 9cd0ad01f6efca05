/* acidlot: strict, locale-independent decimal number parsing.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_NUMBER_H
#define ACIDLOT_NUMBER_H

#include <stddef.h>

typedef enum al_numerr {
	AL_NUM_OK = 0,
	AL_NUM_EMPTY,   /* nothing but blanks */
	AL_NUM_SYNTAX,  /* not a plain decimal number */
	AL_NUM_COMMA,   /* would be a number with a decimal comma */
	AL_NUM_RANGE    /* overflows, or underflows to below DBL_MIN */
} al_numerr;

/* Parses s[0..len) as a finite decimal number: optional sign, digits with
 * one optional decimal point, optional exponent; blanks (space, tab) around
 * it are allowed. No hex, inf, nan, thousands separators or trailing text.
 * decimal_point is '.' or ','. The result is the correctly rounded double
 * (IEEE round-to-nearest), whatever the process locale. */
al_numerr al_number_parse(const char *s, size_t len, char decimal_point,
			  double *out);

/* The magnitudes the arithmetic of a run stays within: a quantity of a
 * titration (an input, the dilution, the meq, the result) is 0 or
 * between 1e-100 and 1e100 in magnitude, so that the sums, squares and
 * relative uncertainties made of it stay finite for any number of rows
 * (IEEE double reaches 1.8e308). Beyond them a row is invalid. */
#define AL_MAGNITUDE_MAX 1e100
#define AL_MAGNITUDE_MIN 1e-100

/* 1 when x is finite and 0 or within AL_MAGNITUDE_MIN..MAX in size. */
int al_number_computable(double x);

/* A phrase for a parse error, e.g. "is not a number". */
const char *al_numerr_phrase(al_numerr err);

/* A result y and its expanded uncertainty U as a laboratory reports
 * them (GUM, JCGM 100:2008, 7.2.6): U to two significant digits,
 * rounded to the nearest, and y rounded to the same decimal place, both
 * written in plain decimals (never an exponent) into val and unc.
 * Returns the number of decimals (0 when U rounds to tens or more), or
 * -1 when U is not a positive finite number (then nothing is written). */
int al_round_to_u(double y, double U, char *val, size_t vcap, char *unc,
		  size_t ucap);
/* The decimal place al_round_to_u rounds to for U: the decimals (>= 1)
 * with *step 0, or 0 decimals with *step the power of ten of U's second
 * significant digit (10, 100, ... when U is 10 or more) and *U2 U to two
 * significant digits (else *U2 is U: its decimals show two); -1 when U
 * is not a positive finite number. */
int al_u_place(double U, double *step, double *U2);
/* v rounded to a multiple of step (v itself when step is 0). */
double al_round_to_step(double v, double step);

/* v with sig significant digits as %g writes them, trailing zeros
 * dropped, but never with an exponent below 1e15: from 1e-100 up to
 * 1e-4 in plain decimals (8.27e-05 -> 0.0000827), and a whole number of
 * more than sig digits written whole, which a spreadsheet and a person
 * read alike. cap of 128 holds any such number. */
void al_format_sig(double v, int sig, char *buf, size_t cap);

#endif
