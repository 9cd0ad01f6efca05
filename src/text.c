/* acidlot: identifiers as text (Unicode NFC through utf8proc).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/text.h"

#include <ctype.h>
#include <string.h>
#include <utf8proc.h>

#include "acidlot/alloc.h"

int
al_text_ascii(const char *s, size_t len)
{
	for (size_t i = 0; i < len; i++)
		if ((unsigned char)s[i] >= 0x80)
			return 0;
	return 1;
}

/* Unicode White_Space (PropList.txt) */
static int
blank(utf8proc_int32_t c)
{
	return (c >= 0x09 && c <= 0x0D) || c == 0x20 || c == 0x85 ||
	       c == 0xA0 || c == 0x1680 || (c >= 0x2000 && c <= 0x200A) ||
	       c == 0x2028 || c == 0x2029 || c == 0x202F || c == 0x205F ||
	       c == 0x3000 || c == 0xFEFF;
}

/* The code points of s in *cps (grown), decomposed and composed as the
 * options say; their count, or -1 (not UTF-8) or -2 (no memory). */
static utf8proc_ssize_t
code_points(const char *s, size_t len, utf8proc_option_t opt,
	    utf8proc_int32_t **cps)
{
	utf8proc_ssize_t n;

	*cps = NULL;
	n = utf8proc_decompose((const utf8proc_uint8_t *)s, (utf8proc_ssize_t)len,
			       NULL, 0, opt);
	if (n < 0)
		return -1;
	*cps = al_malloc(((size_t)n + 1) * sizeof **cps);
	if (*cps == NULL)
		return -2;
	n = utf8proc_decompose((const utf8proc_uint8_t *)s, (utf8proc_ssize_t)len,
			       *cps, n, opt);
	if (n >= 0)
		n = utf8proc_normalize_utf32(*cps, n, opt);
	return n < 0 ? -1 : n;
}

al_status
al_text_identifier(const char *s, size_t len, char **buf, size_t *cap,
		   size_t *out_len)
{
	utf8proc_int32_t *cps = NULL;
	utf8proc_ssize_t n, a = 0, b;
	size_t pos = 0;
	char *out;

	if (al_text_ascii(s, len)) {
		/* ASCII is its own NFC: trim the ASCII blanks */
		while (len > 0 && blank((unsigned char)s[0]))
			s++, len--;
		while (len > 0 && blank((unsigned char)s[len - 1]))
			len--;
		n = -1;
	} else {
		n = code_points(s, len, UTF8PROC_STABLE | UTF8PROC_COMPOSE,
				&cps);
		if (n == -2)
			return AL_ENOMEM;
	}
	if (n < 0) {
		/* ASCII, or not UTF-8: the bytes as they are */
		al_free(cps);
		out = al_reserve(*buf, cap, len + 1);
		if (out == NULL)
			return AL_ENOMEM;
		memcpy(out, s, len);
		out[len] = '\0';
		*buf = out;
		*out_len = len;
		return AL_OK;
	}
	b = n;
	while (a < b && blank(cps[a]))
		a++;
	while (b > a && blank(cps[b - 1]))
		b--;
	out = al_reserve(*buf, cap, 4 * (size_t)(b - a) + 1);
	if (out == NULL) {
		al_free(cps);
		return AL_ENOMEM;
	}
	for (utf8proc_ssize_t i = a; i < b; i++)
		pos += (size_t)utf8proc_encode_char(
			cps[i], (utf8proc_uint8_t *)out + pos);
	out[pos] = '\0';
	al_free(cps);
	*buf = out;
	*out_len = pos;
	return AL_OK;
}

char *
al_text_loose(const char *s)
{
	utf8proc_int32_t *cps = NULL;
	utf8proc_ssize_t n = code_points(
		s, strlen(s),
		UTF8PROC_STABLE | UTF8PROC_COMPOSE | UTF8PROC_COMPAT |
			UTF8PROC_CASEFOLD | UTF8PROC_IGNORE,
		&cps);
	char *out;
	size_t pos = 0;

	if (n == -2)
		return NULL;
	if (n < 0) {
		/* not UTF-8: its ASCII letters and digits, lower case */
		out = al_malloc(strlen(s) + 1);
		if (out == NULL)
			return NULL;
		for (; *s; s++)
			if ((*s >= 'a' && *s <= 'z') || (*s >= '0' && *s <= '9'))
				out[pos++] = *s;
			else if (*s >= 'A' && *s <= 'Z')
				out[pos++] = (char)(*s - 'A' + 'a');
		out[pos] = '\0';
		al_free(cps);
		return out;
	}
	out = al_malloc(4 * (size_t)n + 1);
	if (out == NULL) {
		al_free(cps);
		return NULL;
	}
	for (utf8proc_ssize_t i = 0; i < n; i++) {
		utf8proc_category_t c = utf8proc_category(cps[i]);

		if ((c >= UTF8PROC_CATEGORY_LU && c <= UTF8PROC_CATEGORY_LO) ||
		    (c >= UTF8PROC_CATEGORY_ND && c <= UTF8PROC_CATEGORY_NO))
			pos += (size_t)utf8proc_encode_char(
				cps[i], (utf8proc_uint8_t *)out + pos);
	}
	out[pos] = '\0';
	al_free(cps);
	return out;
}

const char *
al_trim(const char *s, size_t *len)
{
	size_t n = *len;

	while (n > 0 && (*s == ' ' || *s == '\t')) {
		s++;
		n--;
	}
	while (n > 0 && (s[n - 1] == ' ' || s[n - 1] == '\t'))
		n--;
	*len = n;
	return s;
}

int
al_word_eq(const char *s, size_t len, const char *word)
{
	size_t i;

	for (i = 0; i < len; i++) {
		unsigned char a = (unsigned char)s[i], b = (unsigned char)word[i];

		if (b == '\0')
			return 0;
		if (a >= 'A' && a <= 'Z')
			a = (unsigned char)(a - 'A' + 'a');
		if (b >= 'A' && b <= 'Z')
			b = (unsigned char)(b - 'A' + 'a');
		if (a != b)
			return 0;
	}
	return word[len] == '\0';
}

size_t
al_edit_distance(const char *a, size_t la, const char *b, size_t lb)
{
	size_t row[64];

	la = la > 63 ? 63 : la;
	lb = lb > 63 ? 63 : lb;
	for (size_t j = 0; j <= lb; j++)
		row[j] = j;
	for (size_t i = 1; i <= la; i++) {
		size_t diag = row[0];

		row[0] = i;
		for (size_t j = 1; j <= lb; j++) {
			size_t up = row[j];
			size_t cost = tolower((unsigned char)a[i - 1]) !=
				      tolower((unsigned char)b[j - 1]);
			size_t best = diag + cost;

			if (up + 1 < best)
				best = up + 1;
			if (row[j - 1] + 1 < best)
				best = row[j - 1] + 1;
			row[j] = best;
			diag = up;
		}
	}
	return row[lb];
}

const char *
al_closest(const char *word, size_t len, const char *const *cands, size_t n)
{
	const char *best = NULL;
	size_t best_d = len / 3 + 1;

	for (size_t k = 0; k < n; k++) {
		size_t d = al_edit_distance(word, len, cands[k],
					    strlen(cands[k]));

		if (d < best_d) {
			best_d = d;
			best = cands[k];
		}
	}
	return best;
}

size_t
al_utf8_width(const char *s)
{
	size_t n = 0;

	for (; *s; s++)
		n += ((unsigned char)*s & 0xC0) != 0x80;
	return n;
}
