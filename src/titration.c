/* acidlot: one titration's value: a checked row in a result's unit and
 * basis (see titration.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "titration.h"

#include "acidlot/juice.h"
#include "acidlot/number.h"

/* Possible but unusual values: a warning naming the row, and a flag. */
static unsigned
plausibility(al_rows *rs, unsigned long line, const al_titration *t)
{
	unsigned flags = 0;

	if (t->titrant_ml > AL_PLAUSIBLE_TITRANT_ML) {
		AL_RUN_DIAG(rs, AL_SEV_WARNING, line, "titrant_ml",
			 "%g mL is more than a burette holds (over %g mL): "
			 "check the reading",
			 t->titrant_ml, AL_PLAUSIBLE_TITRANT_ML);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->amount > AL_PLAUSIBLE_SAMPLE) {
		AL_RUN_DIAG(rs, AL_SEV_WARNING, line,
			 t->basis == AL_BASIS_MASS ? "mass_g" : "volume_ml",
			 "a sample of %g %s is unusually large (over %g): "
			 "check the unit",
			 t->amount, t->basis == AL_BASIS_MASS ? "g" : "mL",
			 AL_PLAUSIBLE_SAMPLE);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->titrant_mol_l < AL_PLAUSIBLE_CONC_MIN ||
	    t->titrant_mol_l > AL_PLAUSIBLE_CONC_MAX) {
		AL_RUN_DIAG(rs, AL_SEV_WARNING, line, "titrant_mol_l",
			 "%g mol/L is outside the usual %g-%g mol/L: check "
			 "the unit",
			 t->titrant_mol_l, AL_PLAUSIBLE_CONC_MIN,
			 AL_PLAUSIBLE_CONC_MAX);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	if (t->blank_ml > AL_PLAUSIBLE_BLANK_ML) {
		AL_RUN_DIAG(rs, AL_SEV_WARNING, line, "blank_ml",
			 "a blank of %g mL is unusually large (over %g mL)",
			 t->blank_ml, AL_PLAUSIBLE_BLANK_ML);
		flags |= AL_FLAG_IMPLAUSIBLE;
	}
	return flags;
}

/* A result no sample can give: more acid than the sample holds. Per
 * mass, at most all of it: 100 g/100g, with AL_IMPOSSIBLE_ALLOWANCE for
 * the scatter of a pure acid's assay (JECFA 2014 limits citric acid to
 * 99.5-100.5 %; single replicates stray further, common practice). Per
 * volume, no solution holds more acid per mL than its own density, and
 * no food acid or its solution is denser than AL_DENSEST_G_ML. */
#define AL_IMPOSSIBLE_ALLOWANCE 5.0
#define AL_DENSEST_G_ML 2.0 /* sulfuric acid 1.83 g/mL (CRC Handbook;
			       from memory), the densest of the catalogue */

static int
impossible(double value, al_unit unit, const al_acid *acid)
{
	double g = al_unit_is_meq(unit) ? value * acid->g_per_meq : value;
	double per_100 = g * 100 / al_unit_per(unit);

	if (al_unit_basis(unit) == AL_BASIS_MASS)
		return !(per_100 <= 100 + AL_IMPOSSIBLE_ALLOWANCE);
	return !(per_100 <= 100 * AL_DENSEST_G_ML);
}


/* The density the conversion between the sample's basis and the unit's
 * needs: the row's, else the sucrose density of its Brix (NBS); 0, or
 * -1 after an error. */
static int
density_for(al_rows *rs, al_row *r, al_unit unit)
{
	if (al_unit_basis(unit) == r->t.basis)
		return 0;
	if (!r->has_density && r->has_brix) {
		if (al_density_from_brix(r->brix, &r->density) != AL_OK) {
			AL_ROW_ERR(rs, r->line, "brix",
				   "a density from Brix needs 0 to 40 Brix (the "
				   "NBS sucrose table's range); give "
				   "density_g_ml");
			return -1;
		}
		r->has_density = 1;
		r->flags |= AL_FLAG_DENSITY_BRIX;
	}
	if (!r->has_density) {
		AL_ROW_ERR(rs, r->line,
			   r->t.basis == AL_BASIS_MASS ? "mass_g" : "volume_ml",
			   "the result is reported in %s but this sample was "
			   "taken by %s: give density_g_ml or --density-g-ml",
			   al_unit_name(unit),
			   r->t.basis == AL_BASIS_MASS ? "mass" : "volume");
		return -1;
	}
	r->flags |= AL_FLAG_DENSITY;
	return 0;
}

/* On the anhydrous basis: assay = meq E 100 / (m (1 - water/100))
 * (METHODS.md s.6); 0, or -1 after an error. */
static int
to_anhydrous(al_rows *rs, al_row *r, al_unit unit)
{
	if (!r->has_water) {
		AL_ROW_ERR(rs, r->line, "water_pct",
			   "is needed for a result on the anhydrous basis");
		return -1;
	}
	if (al_unit_basis(unit) != AL_BASIS_MASS) {
		AL_ROW_ERR(rs, r->line, NULL,
			   "the anhydrous basis needs a per-mass unit, not %s",
			   al_unit_name(unit));
		return -1;
	}
	al_anhydrous(r->value, r->water, &r->value);
	return 0;
}

/* An endpoint that titrates less than AL_ENDPOINT_SHARE of the protons
 * the factor assumes: flagged, with the pH that would suffice. */
static void
check_endpoint(al_row *r)
{
	const al_acid *acid = r->acid;

	if (!r->has_endpoint || acid->n_pka == 0 ||
	    al_protons_titrated(acid->pka, acid->n_pka, r->endpoint) >=
		    AL_ENDPOINT_SHARE * acid->protons)
		return;
	r->flags |= AL_FLAG_ENDPOINT_LOW;
	if (al_endpoint_ph_needed(acid->pka, acid->n_pka, acid->protons,
				  AL_ENDPOINT_SHARE, &r->needed) != AL_OK)
		r->needed = 14;
}

int
al_titration_value(al_rows *rs, al_row *r, al_unit unit, int anhydrous)
{
	if (density_for(rs, r, unit) != 0)
		return -1;
	if (al_ta_value(&r->t, r->acid->g_per_meq, unit, r->density,
			&r->value) != AL_OK) {
		AL_ROW_ERR(rs, r->line, NULL, "cannot express the result in %s",
			   al_unit_name(unit));
		return -1;
	}
	r->flags |= plausibility(rs, r->line, &r->t);
	if (anhydrous && to_anhydrous(rs, r, unit) != 0)
		return -1;
	if (!al_number_computable(r->value)) {
		AL_ROW_ERR(rs, r->line, NULL,
			   "the result (%g %s) is beyond the range a result "
			   "can be computed in (%g to %g)",
			   r->value, al_unit_name(unit), AL_MAGNITUDE_MIN,
			   AL_MAGNITUDE_MAX);
		return -1;
	}
	if (impossible(r->value, unit, r->acid)) {
		AL_RUN_DIAG(rs, AL_SEV_WARNING, r->line, NULL,
			 "%g %s of %s is more than the sample can hold: check "
			 "the mass, volume and units",
			 r->value, al_unit_name(unit), r->acid->name);
		r->flags |= AL_FLAG_IMPLAUSIBLE;
		r->impossible = 1;
	}
	check_endpoint(r);
	return 0;
}
