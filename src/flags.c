/* acidlot: the names of a result's flags, as the report writes them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/assay.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

void
al_flags_format(unsigned flags, double endpoint_needed, char *buf, size_t cap)
{
	static const struct {
		unsigned bit;
		const char *name;
	} names[] = {
		{AL_FLAG_SINGLE, "single-replicate"},
		{AL_FLAG_FEW, "too-few-replicates"},
		{AL_FLAG_RSD, "rsd-over-limit"},
		{AL_FLAG_BELOW_MIN, "below-min"},
		{AL_FLAG_ABOVE_MAX, "above-max"},
		{AL_FLAG_ENDPOINT_LOW, "endpoint-low"},
		{AL_FLAG_ACID_IGNORED, "row-acid-ignored"},
		{AL_FLAG_DENSITY, "density-converted"},
		{AL_FLAG_IMPLAUSIBLE, "implausible-value"},
		{AL_FLAG_REJECTED, "rows-rejected"},
		{AL_FLAG_OUTLIER, "grubbs-outlier"},
		{AL_FLAG_STRAGGLER, "grubbs-straggler"},
		{AL_FLAG_DIXON, "dixon-outlier"},
		{AL_FLAG_EXCLUDED, "outlier-excluded"},
		{AL_FLAG_RANGE, "range-over-critical"},
		{AL_FLAG_COCHRAN_OUTLIER, "cochran-outlier"},
		{AL_FLAG_COCHRAN_STRAGGLER, "cochran-straggler"},
		{AL_FLAG_NO_TITRANT_U, "u-without-titrant"},
		{AL_FLAG_BRIX_LOW, "brix-below-min"},
		{AL_FLAG_BRIX_HIGH, "brix-above-max"},
		{AL_FLAG_RATIO_LOW, "ratio-below-min"},
		{AL_FLAG_RATIO_HIGH, "ratio-above-max"},
		{AL_FLAG_WATER_LOW, "water-below-min"},
		{AL_FLAG_WATER_HIGH, "water-above-max"},
		{AL_FLAG_NO_BRIX, "no-brix-or-water-values"},
		{AL_FLAG_DENSITY_BRIX, "density-from-brix"},
		{AL_FLAG_BRIX_UNCORRECTED, "brix-not-acid-corrected"},
		{AL_FLAG_MANY, "many-replicates"},
	};
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
