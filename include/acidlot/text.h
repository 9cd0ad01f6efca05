/* acidlot: identifiers as text: Unicode NFC, blanks trimmed, and a loose
 * form for "did you mean" matches.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_TEXT_H
#define ACIDLOT_TEXT_H

#include <stddef.h>

#include "acidlot/status.h"

/* The longest identifier (product, lot, sample, replicate, titrant lot)
 * in bytes of UTF-8; a longer one is refused with its line, never cut. */
#define AL_IDENT_MAX 255

/* An identifier as it is compared: s[0..len) in Unicode Normalization
 * Form C (UAX #15; utf8proc), with the blanks around it trimmed (Unicode
 * White_Space: space, tab, no-break space U+00A0, U+202F, the U+2000
 * spaces, U+3000 ..., and U+FEFF). Written NUL-terminated to *buf (grown
 * with al_reserve; *cap its size); *out_len its length. Text that is not
 * valid UTF-8 is copied as it is (the caller reports it). AL_ENOMEM when
 * memory runs out. ASCII text is only trimmed. */
al_status al_text_identifier(const char *s, size_t len, char **buf,
			     size_t *cap, size_t *out_len);

/* The loose form of an identifier, for a warning that names a near
 * match, never for a match: NFKC case-folded, letters and digits only
 * ("lem-ss", "LEM SS" and "Lem_SS" are all "lemss"). A new string from
 * al_malloc, or NULL when memory runs out. */
char *al_text_loose(const char *s);

/* 1 when s[0..len) holds only ASCII bytes. */
int al_text_ascii(const char *s, size_t len);

/* Trims blanks (space, tab) from both ends of s[0..*len): returns the new
 * start and updates *len. */
const char *al_trim(const char *s, size_t *len);

/* Case-insensitive ASCII comparison of s[0..len) with the C string word. */
int al_word_eq(const char *s, size_t len, const char *word);

/* Levenshtein distance of two strings, ASCII letters compared without
 * case (at most 63 bytes of each are compared), for "did you mean". */
size_t al_edit_distance(const char *a, size_t la, const char *b, size_t lb);

/* The candidate closest to word[0..len), within a third of its length
 * in edits (the first on a tie); NULL when none is. */
const char *al_closest(const char *word, size_t len,
		       const char *const *cands, size_t n);

/* The characters a terminal shows for the UTF-8 text s (its lead bytes;
 * every character one column wide). */
size_t al_utf8_width(const char *s);

#endif
