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

/* A phrase for a parse error, e.g. "is not a number". */
const char *al_numerr_phrase(al_numerr err);

#endif
