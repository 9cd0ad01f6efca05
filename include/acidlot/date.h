/* acidlot: calendar dates as day numbers (ISO 8601 YYYY-MM-DD).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_DATE_H
#define ACIDLOT_DATE_H

#include <stddef.h>

/* Days since 1970-01-01 of a proleptic Gregorian date, from "YYYY-MM-DD"
 * (years 1900-9999; the day must exist). Returns 0 and sets *days, or -1. */
int al_date_parse(const char *s, size_t len, long *days);
/* How the dates of a file are written; never guessed: a file says
 * which it uses (--date-format). */
typedef enum al_date_order {
	AL_DATE_ISO = 0, /* YYYY-MM-DD (ISO 8601) */
	AL_DATE_DMY_DOT, /* DD.MM.YYYY */
	AL_DATE_DMY_SLASH, /* DD/MM/YYYY */
	AL_DATE_MDY_SLASH  /* MM/DD/YYYY */
} al_date_order;

/* Each order's name, e.g. "DD.MM.YYYY", in the enum's order. */
extern const char *const al_date_order_names[4];

/* al_date_parse of a date written in order o. */
int al_date_parse_as(const char *s, size_t len, al_date_order o, long *days);

/* day + n days, never past 9999-12-31 (the last date YYYY-MM-DD can
 * write: a validity that would end later ends there, never wraps). */
long al_date_add_days(long day, long n);
/* Writes "YYYY-MM-DD" (11 bytes with the NUL) for a day number. */
void al_date_format(long days, char buf[11]);

#endif
