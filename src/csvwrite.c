/* acidlot: writing CSV text fields: quoting and the formula guard.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/csvwrite.h"

#include <string.h>

/* A byte that starts a formula in a spreadsheet cell (OWASP, CSV
 * injection), and one that a spreadsheet may split cells at. */
#define FORMULA_START "=+-@\t\r"
#define ANY_DELIMITER ",;\t"

int
al_csv_formula_at(const char *s, size_t len, size_t i)
{
	if (i > 0 && strchr(ANY_DELIMITER, s[i - 1]) == NULL)
		return 0;
	while (i < len && s[i] == '\'')
		i++;
	return i < len && s[i] != '\0' && strchr(FORMULA_START, s[i]) != NULL;
}

size_t
al_csv_unguard(char *s, size_t len)
{
	size_t n = 0;

	for (size_t i = 0; i < len; i++) {
		if (s[i] == '\'' && al_csv_formula_at(s, len, i))
			i++; /* the guard's ' */
		if (i < len)
			s[n++] = s[i];
	}
	return n;
}

int
al_csv_put_field(FILE *out, const char *s, char delimiter)
{
	size_t len = strlen(s);
	int quote = 0;

	if (delimiter == 0)
		delimiter = ',';
	for (size_t i = 0; i < len; i++)
		quote |= s[i] == '\r' || s[i] == '\n' || s[i] == '"' ||
			 s[i] == delimiter;
	if (quote)
		putc('"', out);
	for (size_t i = 0; i < len; i++) {
		if (al_csv_formula_at(s, len, i))
			putc('\'', out);
		if (s[i] == '"')
			putc('"', out);
		putc(s[i], out);
	}
	if (quote)
		putc('"', out);
	return ferror(out) ? EOF : 0;
}
