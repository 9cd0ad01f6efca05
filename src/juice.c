/* acidlot: acid-corrected Brix, density from Brix, anhydrous basis.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "acidlot/juice.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <pthread.h>
#include <string.h>

#include "acidlot/number.h"

/* Kimball's table, read once from the embedded
 * reference/brix_acid_correction.csv (acid_pct, correction, source). */
extern const unsigned char al_ref_brix_acid_correction[];
extern const size_t al_ref_brix_acid_correction_len;

#define TABLE_MAX 32
static double acid_pct[TABLE_MAX + 1], corr[TABLE_MAX + 1];
static int table_n;

static void
load_table(void)
{
	const char *p = (const char *)al_ref_brix_acid_correction;
	const char *end = p + al_ref_brix_acid_correction_len;

	/* the table starts from no acid, no correction */
	table_n = 1;
	acid_pct[0] = corr[0] = 0;
	p = memchr(p, '\n', (size_t)(end - p));
	while (p && ++p < end && table_n <= TABLE_MAX) {
		const char *eol = memchr(p, '\n', (size_t)(end - p));
		const char *c1, *c2;

		if (eol == NULL)
			eol = end;
		c1 = memchr(p, ',', (size_t)(eol - p));
		c2 = c1 ? memchr(c1 + 1, ',', (size_t)(eol - c1 - 1)) : NULL;
		if (c1 && c2 &&
		    al_number_parse(p, (size_t)(c1 - p), '.', &acid_pct[table_n]) ==
			    AL_NUM_OK &&
		    al_number_parse(c1 + 1, (size_t)(c2 - c1 - 1), '.',
				    &corr[table_n]) == AL_NUM_OK)
			table_n++;
		p = eol;
	}
}

al_status
al_brix_acid_correction(double citric_pct, double *correction)
{
	static pthread_once_t once = PTHREAD_ONCE_INIT;

	/* once, whichever thread asks first (the results may be
	 * evaluated in two) */
	pthread_once(&once, load_table);
	if (!(citric_pct >= 0) || citric_pct > acid_pct[table_n - 1])
		return AL_EDOMAIN;
	for (int i = 1; i < table_n; i++)
		if (citric_pct <= acid_pct[i]) {
			double f = (citric_pct - acid_pct[i - 1]) /
				   (acid_pct[i] - acid_pct[i - 1]);

			*correction = corr[i - 1] + f * (corr[i] - corr[i - 1]);
			return AL_OK;
		}
	return AL_EDOMAIN;
}

/* NBS (Circular 440 style) apparent specific gravity of sucrose
 * solutions at 20/20 C: Brix = ((182.4601 S - 775.6821) S + 1262.7794) S
 * - 669.5622 (METHODS.md s.5, seen). */
#define SG_MIN 1.00000
#define SG_MAX 1.17874

double
al_brix_from_sg(double sg)
{
	return ((182.4601 * sg - 775.6821) * sg + 1262.7794) * sg - 669.5622;
}

static double
brix_residual(double sg, void *params)
{
	return al_brix_from_sg(sg) - *(const double *)params;
}

al_status
al_sg_from_brix(double brix, double *sg)
{
	gsl_root_fsolver *s;
	gsl_function f;
	double lo = SG_MIN - 0.001, hi = SG_MAX + 0.001, root = 0;
	int status, iter = 0;

	/* no extrapolation beyond the polynomial's range */
	if (!(brix >= 0 && brix <= 40))
		return AL_EDOMAIN;
	f.function = brix_residual;
	f.params = &brix;
	s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
	if (s == NULL)
		return AL_ENOMEM;
	if (gsl_root_fsolver_set(s, &f, lo, hi) != GSL_SUCCESS) {
		gsl_root_fsolver_free(s);
		return AL_EDOMAIN;
	}
	do {
		status = gsl_root_fsolver_iterate(s);
		root = gsl_root_fsolver_root(s);
		lo = gsl_root_fsolver_x_lower(s);
		hi = gsl_root_fsolver_x_upper(s);
		if (status == GSL_SUCCESS)
			status = gsl_root_test_interval(lo, hi, 0, 1e-13);
	} while (status == GSL_CONTINUE && ++iter < 200);
	gsl_root_fsolver_free(s);
	if (status != GSL_SUCCESS)
		return AL_EDOMAIN;
	*sg = root;
	return AL_OK;
}

al_status
al_density_from_brix(double brix, double *density_g_ml)
{
	double sg;
	al_status st = al_sg_from_brix(brix, &sg);

	if (st == AL_OK)
		*density_g_ml = sg * AL_WATER_20C_G_ML;
	return st;
}

al_status
al_anhydrous(double as_is, double water_pct, double *anhydrous)
{
	if (!(water_pct >= 0 && water_pct < 100))
		return AL_EDOMAIN;
	*anhydrous = as_is / (1 - water_pct / 100);
	return AL_OK;
}
