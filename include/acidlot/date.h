/* acidlot: calendar dates as day numbers (ISO 8601 YYYY-MM-DD).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_DATE_H
#define ACIDLOT_DATE_H

#include <stddef.h>

/* Days since 1970-01-01 of a proleptic Gregorian date, from "YYYY-MM-DD"
 * (years 1900-9999; the day must exist). Returns 0 and sets *days, or -1. */
int al_date_parse(const char *s, size_t len, long *days);
/* day + n days, never past 9999-12-31 (the last date YYYY-MM-DD can
 * write: a validity that would end later ends there, never wraps). */
long al_date_add_days(long day, long n);
/* Writes "YYYY-MM-DD" (11 bytes with the NUL) for a day number. */
void al_date_format(long days, char buf[11]);

#endif
