/* ow_material.h - a resin: densities, thermal data, melting, friction and the
 * melt viscosity model with its temperature shift. Plain value structs, SI.
 *
 * Viscosity follows time-temperature superposition:
 *   eta(gdot, T) = aT(T) * eta_ref(aT(T) * gdot)
 * with eta_ref one of the models below at reference_temperature and aT from
 * an Arrhenius or WLF shift (Dealy & Wissbrun, Melt Rheology and its Role in
 * Plastics Processing, 1990, ch. 2 and 11). */
#ifndef OW_MATERIAL_H
#define OW_MATERIAL_H

#include "ow_const.h"
#include "ow_status.h"

enum ow_visc_model {
	OW_VISC_POWER_LAW, /* eta = m gdot^(n-1) */
	OW_VISC_CROSS,     /* eta = eta0 / (1 + (eta0 gdot / tau*)^(1-n)) */
	OW_VISC_CARREAU_YASUDA, /* eta = eta0 [1 + (lambda gdot)^a]^((n-1)/a) */
};

enum ow_shift_type {
	OW_SHIFT_ARRHENIUS, /* aT = exp[(E/R)(1/T - 1/Tref)] */
	OW_SHIFT_WLF,       /* log10 aT = -C1 (T - Tref) / (C2 + T - Tref) */
};

struct ow_viscosity {
	enum ow_visc_model model;
	double consistency_Pa_sn;  /* power law m at reference T, Pa s^n */
	double index;              /* n, power-law index (all models), - */
	double zero_shear_Pa_s;    /* eta0 at reference T (cross, C-Y) */
	double critical_stress_Pa; /* tau* (cross) */
	double time_constant_s;    /* lambda (Carreau-Yasuda) */
	double a;                  /* Yasuda transition parameter, - */
	double ref_temp_K;         /* reference temperature of the model */
	enum ow_shift_type shift;
	double activation_J_mol; /* Arrhenius flow activation energy */
	double wlf_c1;           /* WLF C1, - */
	double wlf_c2_K;         /* WLF C2, K */
};

struct ow_material {
	char name[128];
	double solid_density_kg_m3; /* pellet (solid) density */
	double bulk_density_kg_m3;  /* loose pellet bed in the hopper */
	double melt_density_kg_m3;  /* at processing temperature */
	double solid_cp_J_kgK;
	double melt_cp_J_kgK;
	double solid_k_W_mK;
	double melt_k_W_mK;
	double melt_temp_K;     /* melting point (or flow temperature) */
	double fusion_J_kg;     /* heat of fusion of the actual resin */
	double friction_barrel; /* pellet-barrel Coulomb coefficient, - */
	double friction_screw;  /* pellet-screw Coulomb coefficient, - */
	struct ow_viscosity visc;
};

/* Shift factor aT at temp_K (1 at the reference temperature). For WLF below
 * Tref - C2 the form is singular: the result is +inf there. */
double ow_viscosity_shift(const struct ow_viscosity *v, double temp_K);

/* Reference-temperature viscosity in Pa s at shear rate gdot (1/s); gdot is
 * clamped to a tiny positive value so a power law stays finite. */
double ow_viscosity_ref(const struct ow_viscosity *v, double gdot_1_s);

/* Viscosity in Pa s at shear rate gdot (1/s) and temperature temp_K. */
double ow_viscosity_eval(const struct ow_viscosity *v, double gdot_1_s,
                         double temp_K);

/* The same reference viscosity in log space, for solvers that evaluate it
 * many times: ln eta_ref = c0 + k ln(1 + e^(b (ln gdot + s))) (power law:
 * c0 + (n - 1) ln gdot). Fill once with ow_viscosity_log_init; the log
 * form then costs one exp and one log1p and gives the slope too. */
struct ow_visc_log {
	enum ow_visc_model model;
	double c0, k, b, s; /* see above; ln of Pa s for c0 */
	double ln_gmin;     /* ln of the smallest shear rate (the clamp) */
	double curv;        /* bound on |d2 ln eta / d(ln gdot)^2| */
};

void ow_viscosity_log_init(const struct ow_viscosity *v,
                           struct ow_visc_log *lv);

/* ln eta_ref at ln gdot (gdot in 1/s), equal to log(ow_viscosity_ref) to
 * round-off; *slope (may be NULL) gets d ln eta_ref / d ln gdot, the local
 * power-law index minus one (0 below the clamp). */
double ow_viscosity_log_ref(const struct ow_visc_log *lv, double ln_gdot,
                            double *slope);

/* ln aT at temp_K, equal to log(ow_viscosity_shift) to round-off (+inf
 * where WLF is singular). */
double ow_viscosity_log_shift(const struct ow_viscosity *v, double temp_K);

/* Check the model's parameters are in range; names the offending field with
 * the given JSON path prefix (e.g. "viscosity") in d. */
enum ow_status ow_viscosity_validate(const struct ow_viscosity *v,
                                     const char *path, struct ow_diag *d);

/* Physical plausibility of the whole resin (positive densities, bulk below
 * solid density, heat capacities 0.5..5 kJ/(kg K), ...). */
enum ow_status ow_material_validate(const struct ow_material *m,
                                    struct ow_diag *d);

/* Specific enthalpy of the resin relative to solid at ref_K, J/kg: solid cp up
 * to the melting point, heat of fusion, melt cp above it. Used by the energy
 * balance. */
double ow_material_enthalpy(const struct ow_material *m, double temp_K,
                            double ref_K);

#endif
