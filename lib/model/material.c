/* material.c - viscosity models, temperature shifts, resin plausibility. */
#include "ow_material.h"

#include <math.h>
#include <stddef.h>

#define GDOT_MIN                                                               \
	1e-9 /* 1/s: keeps a power law finite at a wall of zero shear */

double ow_viscosity_shift(const struct ow_viscosity *v, double temp_K)
{
	double dT = temp_K - v->ref_temp_K;

	if (v->shift == OW_SHIFT_WLF) {
		/* Williams, Landel & Ferry, J. Am. Chem. Soc. 77 (1955) 3701 */
		if (v->wlf_c2_K + dT <= 0.0)
			return INFINITY;
		return pow(10.0, -v->wlf_c1 * dT / (v->wlf_c2_K + dT));
	}
	return exp(v->activation_J_mol / OW_GAS_CONSTANT *
	           (1.0 / temp_K - 1.0 / v->ref_temp_K));
}

double ow_viscosity_ref(const struct ow_viscosity *v, double gdot)
{
	double n = v->index;

	if (gdot < GDOT_MIN)
		gdot = GDOT_MIN;
	switch (v->model) {
	case OW_VISC_POWER_LAW:
		return v->consistency_Pa_sn * pow(gdot, n - 1.0);
	case OW_VISC_CROSS:
		return v->zero_shear_Pa_s /
		       (1.0 +
		        pow(v->zero_shear_Pa_s * gdot / v->critical_stress_Pa,
		            1.0 - n));
	case OW_VISC_CARREAU_YASUDA:
		return v->zero_shear_Pa_s *
		       pow(1.0 + pow(v->time_constant_s * gdot, v->a),
		           (n - 1.0) / v->a);
	}
	return NAN;
}

double ow_viscosity_eval(const struct ow_viscosity *v, double gdot,
                         double temp_K)
{
	double aT = ow_viscosity_shift(v, temp_K);

	return aT * ow_viscosity_ref(v, aT * gdot);
}

/* Log-space forms of the models above (Dealy & Wissbrun 1990, ch. 2):
 *   power law        ln eta = ln m + (n - 1) ln gdot
 *   Cross            ln eta = ln eta0 - sp((1 - n)(ln gdot + ln(eta0/tau*)))
 *   Carreau-Yasuda   ln eta = ln eta0 + ((n - 1)/a) sp(a (ln gdot + ln lambda))
 * with the softplus sp(x) = ln(1 + e^x); the parameter logs are taken once
 * here so an evaluation costs one exp and one log1p. */
void ow_viscosity_log_init(const struct ow_viscosity *v, struct ow_visc_log *lv)
{
	double n = v->index;

	lv->model = v->model;
	lv->ln_gmin = log(GDOT_MIN);
	lv->c0 = lv->k = lv->b = lv->s = lv->curv = 0.0;
	switch (v->model) {
	case OW_VISC_POWER_LAW:
		lv->c0 = log(v->consistency_Pa_sn);
		lv->k = n - 1.0; /* the slope */
		break;
	case OW_VISC_CROSS:
		lv->c0 = log(v->zero_shear_Pa_s);
		lv->k = -1.0;
		lv->b = 1.0 - n;
		lv->s = log(v->zero_shear_Pa_s / v->critical_stress_Pa);
		break;
	case OW_VISC_CARREAU_YASUDA:
		lv->c0 = log(v->zero_shear_Pa_s);
		lv->k = (n - 1.0) / v->a;
		lv->b = v->a;
		lv->s = log(v->time_constant_s);
		break;
	}
	/* sp'' = sigma (1 - sigma) <= 1/4 */
	lv->curv = fabs(lv->k) * lv->b * lv->b / 4.0;
}

double ow_viscosity_log_ref(const struct ow_visc_log *lv, double ln_gdot,
                            double *slope)
{
	double x, e, sp, sig, ds = 1.0;

	if (ln_gdot < lv->ln_gmin) { /* as ow_viscosity_ref clamps gdot */
		ln_gdot = lv->ln_gmin;
		ds = 0.0;
	}
	if (lv->model == OW_VISC_POWER_LAW) {
		if (slope)
			*slope = ds * lv->k;
		return lv->c0 + lv->k * ln_gdot;
	}
	x = lv->b * (ln_gdot + lv->s);
	e = exp(-fabs(x)); /* stable softplus and logistic for either sign */
	sp = fmax(x, 0.0) + log1p(e);
	sig = x > 0.0 ? 1.0 / (1.0 + e) : e / (1.0 + e);
	if (slope)
		*slope = ds * lv->k * lv->b * sig;
	return lv->c0 + lv->k * sp;
}

double ow_viscosity_log_shift(const struct ow_viscosity *v, double temp_K)
{
	double dT = temp_K - v->ref_temp_K;

	if (v->shift == OW_SHIFT_WLF) {
		if (v->wlf_c2_K + dT <= 0.0)
			return INFINITY;
		return -v->wlf_c1 * dT / (v->wlf_c2_K + dT) *
		       2.30258509299404568402; /* ln 10 */
	}
	return v->activation_J_mol / OW_GAS_CONSTANT *
	       (1.0 / temp_K - 1.0 / v->ref_temp_K);
}

static int bad(double x, double lo, double hi)
{
	return !isfinite(x) || x < lo || x > hi;
}

enum ow_status ow_viscosity_validate(const struct ow_viscosity *v,
                                     const char *path, struct ow_diag *d)
{
	if (bad(v->index, 0.05, 1.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.index: %g must lie in 0.05..1", path,
		                   v->index);
	if (v->model == OW_VISC_POWER_LAW &&
	    bad(v->consistency_Pa_sn, 1e-3, 1e9))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.consistency: %g Pa s^n must lie in "
		                   "1e-3..1e9",
		                   path, v->consistency_Pa_sn);
	if (v->model != OW_VISC_POWER_LAW && bad(v->zero_shear_Pa_s, 1e-3, 1e9))
		return ow_diag_set(
		    d, OW_EINPUT,
		    "%s.zero_shear: %g Pa s must lie in 1e-3..1e9", path,
		    v->zero_shear_Pa_s);
	if (v->model == OW_VISC_CROSS && bad(v->critical_stress_Pa, 1.0, 1e8))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.critical_stress: %g Pa must lie in "
		                   "1..1e8",
		                   path, v->critical_stress_Pa);
	if (v->model == OW_VISC_CARREAU_YASUDA &&
	    bad(v->time_constant_s, 1e-8, 1e5))
		return ow_diag_set(
		    d, OW_EINPUT,
		    "%s.time_constant: %g s must lie in 1e-8..1e5", path,
		    v->time_constant_s);
	if (v->model == OW_VISC_CARREAU_YASUDA && bad(v->a, 0.05, 10.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.a: %g must lie in 0.05..10", path, v->a);
	if (bad(v->ref_temp_K, 200.0, 800.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.reference_temperature: %g K must lie in "
		                   "200..800 K",
		                   path, v->ref_temp_K);
	if (v->shift == OW_SHIFT_ARRHENIUS &&
	    bad(v->activation_J_mol, 0.0, 5e5))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.shift.activation_energy: %g J/mol must "
		                   "lie in 0..500 kJ/mol",
		                   path, v->activation_J_mol);
	if (v->shift == OW_SHIFT_WLF &&
	    (bad(v->wlf_c1, 0.0, 100.0) || bad(v->wlf_c2_K, 1.0, 1000.0)))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s.shift: c1 = %g must lie in 0..100 and "
		                   "c2 = %g K in 1..1000 K",
		                   path, v->wlf_c1, v->wlf_c2_K);
	return OW_OK;
}

struct range_check {
	const char *key;
	double value, lo, hi;
	const char *unit;
};

enum ow_status ow_material_validate(const struct ow_material *m,
                                    struct ow_diag *d)
{
	/* Wide plausibility bands: every commodity and engineering resin of
	 * Brandrup, Immergut & Grulke, Polymer Handbook, 4th ed. (1999) lies
	 * inside them; values outside are almost certainly unit mistakes. */
	const struct range_check checks[] = {
	    {"solid_density", m->solid_density_kg_m3, 500, 2500, "kg/m3"},
	    {"bulk_density", m->bulk_density_kg_m3, 100, 2000, "kg/m3"},
	    {"melt_density", m->melt_density_kg_m3, 400, 2500, "kg/m3"},
	    {"solid_heat_capacity", m->solid_cp_J_kgK, 500, 5000, "J/(kg K)"},
	    {"melt_heat_capacity", m->melt_cp_J_kgK, 500, 5000, "J/(kg K)"},
	    {"solid_conductivity", m->solid_k_W_mK, 0.02, 2.0, "W/(m K)"},
	    {"melt_conductivity", m->melt_k_W_mK, 0.02, 2.0, "W/(m K)"},
	    {"melting_point", m->melt_temp_K, 250, 700, "K"},
	    {"heat_of_fusion", m->fusion_J_kg, 0, 5e5, "J/kg"},
	    {"friction_barrel", m->friction_barrel, 0.01, 2.0, ""},
	    {"friction_screw", m->friction_screw, 0.0, 2.0, ""},
	};
	size_t i;

	for (i = 0; i < sizeof checks / sizeof checks[0]; i++)
		if (bad(checks[i].value, checks[i].lo, checks[i].hi))
			return ow_diag_set(
			    d, OW_EINPUT, "%s: %g %s must lie in %g..%g %s",
			    checks[i].key, checks[i].value, checks[i].unit,
			    checks[i].lo, checks[i].hi, checks[i].unit);
	if (m->bulk_density_kg_m3 > m->solid_density_kg_m3)
		return ow_diag_set(d, OW_EINPUT,
		                   "bulk_density: %g kg/m3 must not exceed "
		                   "solid_density %g kg/m3",
		                   m->bulk_density_kg_m3,
		                   m->solid_density_kg_m3);
	return ow_viscosity_validate(&m->visc, "viscosity", d);
}

double ow_material_enthalpy(const struct ow_material *m, double temp_K,
                            double ref_K)
{
	double tm = m->melt_temp_K;

	if (temp_K <= tm)
		return m->solid_cp_J_kgK * (temp_K - ref_K);
	return m->solid_cp_J_kgK * (tm - ref_K) + m->fusion_J_kg +
	       m->melt_cp_J_kgK * (temp_K - tm);
}
