/* acidlot: the names of a result's flags, as the report writes them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/assay.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* Each flag's name in the report and, for the flags that explain a
 * status, the words a person reads ("" for the others). */
static const struct {
	unsigned bit;
	const char *name, *words;
} names[] = {
	{AL_FLAG_SINGLE, "single-replicate", "a single replicate"},
	{AL_FLAG_FEW, "too-few-replicates", "fewer replicates than specified"},
	{AL_FLAG_RSD, "rsd-over-limit", "replicates' RSD over its limit"},
	{AL_FLAG_BELOW_MIN, "below-min", "below the minimum"},
	{AL_FLAG_ABOVE_MAX, "above-max", "above the maximum"},
	{AL_FLAG_ENDPOINT_LOW, "endpoint-low", "an endpoint pH too low for the acid"},
	{AL_FLAG_ACID_IGNORED, "row-acid-ignored", ""},
	{AL_FLAG_DENSITY, "density-converted", ""},
	{AL_FLAG_IMPLAUSIBLE, "implausible-value", "an implausible value"},
	{AL_FLAG_REJECTED, "rows-rejected", "rows of it rejected"},
	{AL_FLAG_OUTLIER, "grubbs-outlier", "a Grubbs outlier"},
	{AL_FLAG_STRAGGLER, "grubbs-straggler", ""},
	{AL_FLAG_DIXON, "dixon-outlier", "a Dixon outlier"},
	{AL_FLAG_EXCLUDED, "outlier-excluded", ""},
	{AL_FLAG_RANGE, "range-over-critical", "range over the critical range"},
	{AL_FLAG_COCHRAN_OUTLIER, "cochran-outlier", "a variance outlier (Cochran)"},
	{AL_FLAG_COCHRAN_STRAGGLER, "cochran-straggler", ""},
	{AL_FLAG_NO_TITRANT_U, "u-without-titrant", ""},
	{AL_FLAG_BRIX_LOW, "brix-below-min", "Brix below its minimum"},
	{AL_FLAG_BRIX_HIGH, "brix-above-max", "Brix above its maximum"},
	{AL_FLAG_RATIO_LOW, "ratio-below-min", "Brix/acid ratio below its minimum"},
	{AL_FLAG_RATIO_HIGH, "ratio-above-max", "Brix/acid ratio above its maximum"},
	{AL_FLAG_WATER_LOW, "water-below-min", "water below its minimum"},
	{AL_FLAG_WATER_HIGH, "water-above-max", "water above its maximum"},
	{AL_FLAG_NO_BRIX, "no-brix-or-water-values", "no Brix or water value"},
	{AL_FLAG_DENSITY_BRIX, "density-from-brix", ""},
	{AL_FLAG_BRIX_UNCORRECTED, "brix-not-acid-corrected", ""},
	{AL_FLAG_MANY, "many-replicates", ""},
	{AL_FLAG_CURVE_SPARSE, "sparse-near-endpoint", ""},
	{AL_FLAG_CURVE_FALLS, "ph-falls", "the pH fell during a titration"},
	{AL_FLAG_CURVE_NOISY, "noisy", "a noisy pH curve"},
};

size_t
al_flags_words(unsigned flags, char *buf, size_t cap, size_t len)
{
	for (size_t i = 0; i < sizeof names / sizeof names[0]; i++)
		if ((flags & names[i].bit) && names[i].words[0] && len + 1 < cap)
			len += (size_t)snprintf(buf + len, cap - len, "%s%s",
						len ? "; " : "",
						names[i].words);
	return len < cap ? len : cap - 1;
}

void
al_flags_format(unsigned flags, double endpoint_needed, char *buf, size_t cap)
{
	size_t len = 0;

	if (cap == 0)
		return;
	buf[0] = '\0';
	for (size_t i = 0; i < sizeof names / sizeof names[0]; i++) {
		int w;

		if (!(flags & names[i].bit))
			continue;
		if (names[i].bit == AL_FLAG_ENDPOINT_LOW)
			/* round the pH that suffices up to 0.1 */
			w = snprintf(buf + len, cap - len,
				     "%sendpoint-low(needs pH>=%.1f)",
				     len ? ";" : "",
				     ceil(endpoint_needed * 10 - 1e-9) / 10);
		else {
			/* what snprintf("%s%s", sep, name) would write, cut
			 * to the room left as it cuts */
			size_t sep = len ? 1 : 0;
			size_t nl = strlen(names[i].name) + sep;
			size_t room = cap - len - 1, put = nl < room ? nl : room;

			if (sep && put > 0)
				buf[len] = ';';
			if (put > sep)
				memcpy(buf + len + sep, names[i].name, put - sep);
			buf[len + put] = '\0';
			w = (int)nl;
		}
		if (w < 0 || (size_t)w >= cap - len)
			break;
		len += (size_t)w;
	}
}
