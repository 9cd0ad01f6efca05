/* acidlot: the hash functions of the lookup tables (internal).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_HASH_H
#define ACIDLOT_HASH_H

#include <stddef.h>
#include <stdint.h>

#define AL_FNV_OFFSET 14695981039346656037ULL

/* FNV-1a, 64 bit (Fowler, Noll, Vo; public domain), continuing from h
 * (AL_FNV_OFFSET to start). */
static inline uint64_t
al_fnv1a(uint64_t h, const char *s, size_t len)
{
	for (size_t i = 0; i < len; i++) {
		h ^= (unsigned char)s[i];
		h *= 1099511628211ULL;
	}
	return h;
}

/* FNV's low bits follow the last bytes closely; serial sample numbers
 * would cluster in linear probing: mix them in (the splitmix64
 * finaliser, Steele, Lea and Flood 2014). */
static inline uint64_t
al_mix64(uint64_t h)
{
	h ^= h >> 30;
	h *= 0xBF58476D1CE4E5B9ULL;
	h ^= h >> 27;
	h *= 0x94D049BB133111EBULL;
	return h ^ (h >> 31);
}

#endif
