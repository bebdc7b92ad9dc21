/* die.c - die characteristics: Newtonian and power-law formulas, the
 * generalised Newtonian evaluation at the true wall shear rate, and the
 * measured-point die. */
#include "ow_die.h"

#include <math.h>

#include "ow_melt.h"
#include "ow_const.h"

#define MAX_INDEX_ITER 200

/* ---- pure formulas ------------------------------------------------------ */

/* Hagen-Poiseuille, Q = pi R^4 dp/(8 mu L) (BSL 2002, section 2.3). */
double ow_die_newtonian_flow_circle(double r, double len, double mu, double dp)
{
	return OW_PI * r * r * r * r * dp / (8.0 * mu * len);
}

/* Plane Poiseuille, Q = W h^3 dp/(12 mu L), times the rectangular-duct
 * factor F_p(h/W) of Rowell & Finlayson (1922) for a finite width. */
double ow_die_newtonian_flow_slit(double w, double h, double len, double mu,
                                  double dp, int edges)
{
	double q = w * h * h * h * dp / (12.0 * mu * len);

	return edges ? q * ow_melt_shape_fp(fmin(h, w) / fmax(h, w)) : q;
}

/* Annulus, BSL 2002 section 2.4, in terms of kappa = Ri/Ro:
 * Q = (pi dp Ro^4/(8 mu L)) [1 - kappa^4 - (1 - kappa^2)^2 / ln(1/kappa)]. */
double ow_die_newtonian_flow_annulus(double ro, double ri, double len,
                                     double mu, double dp)
{
	double k = ri / ro, k2 = k * k, bracket;

	if (!(k > 0.0))
		return ow_die_newtonian_flow_circle(ro, len, mu, dp);
	bracket = 1.0 - k2 * k2 - (1.0 - k2) * (1.0 - k2) / -log(k);
	return OW_PI * dp * ro * ro * ro * ro / (8.0 * mu * len) * bracket;
}

double ow_die_annulus_factor(double kappa)
{
	double ro = 1.0, ri = kappa;
	double slit = ow_die_newtonian_flow_slit(OW_PI * (ro + ri), ro - ri,
	                                         1.0, 1.0, 1.0, 0);

	return ow_die_newtonian_flow_annulus(ro, ri, 1.0, 1.0, 1.0) / slit;
}

/* Power-law tube, Q = (pi n R^3/(3n+1)) (R dp/(2 m L))^(1/n)
 * (Bird, Armstrong & Hassager 1987, ch. 4). */
double ow_die_powerlaw_flow_circle(double r, double len, double m, double n,
                                   double dp)
{
	return OW_PI * n * r * r * r / (3.0 * n + 1.0) *
	       pow(r * dp / (2.0 * m * len), 1.0 / n);
}

/* Power-law slit, Q = (n W h^2/(2(2n+1))) (h dp/(2 m L))^(1/n). */
double ow_die_powerlaw_flow_slit(double w, double h, double len, double m,
                                 double n, double dp)
{
	return n * w * h * h / (2.0 * (2.0 * n + 1.0)) *
	       pow(h * dp / (2.0 * m * len), 1.0 / n);
}

/* ---- checks ------------------------------------------------------------- */

static int pos(double x)
{
	return x > 0.0 && isfinite(x);
}

enum ow_status ow_die_check(const struct ow_die *die, struct ow_diag *d)
{
	switch (die->type) {
	case OW_DIE_CIRCLE:
		if (!pos(die->diameter_m))
			return ow_diag_set(d, OW_EINPUT,
			                   "die.diameter = %g m: must be > 0",
			                   die->diameter_m);
		break;
	case OW_DIE_SLIT:
		if (!pos(die->width_m) || !pos(die->gap_m))
			return ow_diag_set(d, OW_EINPUT,
			                   "die.width = %g m, die.gap = %g m: "
			                   "both must be > 0",
			                   die->width_m, die->gap_m);
		break;
	case OW_DIE_ANNULUS:
		if (!pos(die->outer_diameter_m) ||
		    !(die->inner_diameter_m >= 0.0) ||
		    !(die->inner_diameter_m < die->outer_diameter_m))
			return ow_diag_set(
			    d, OW_EINPUT,
			    "die.inner_diameter = %g m: must lie "
			    "in 0..outer_diameter (%g m)",
			    die->inner_diameter_m, die->outer_diameter_m);
		break;
	case OW_DIE_MEASURED:
		if (!pos(die->pressure_Pa) || !pos(die->output_kg_s) ||
		    !pos(die->temp_K))
			return ow_diag_set(
			    d, OW_EINPUT,
			    "die: measured pressure %g Pa, "
			    "output %g kg/s and temperature %g K "
			    "must all be > 0",
			    die->pressure_Pa, die->output_kg_s, die->temp_K);
		return OW_OK;
	default:
		return ow_diag_set(d, OW_EINPUT, "die.type: unknown (%d)",
		                   (int)die->type);
	}
	if (!pos(die->length_m))
		return ow_diag_set(d, OW_EINPUT,
		                   "die.length = %g m: must be > 0",
		                   die->length_m);
	return OW_OK;
}

/* ---- generalised Newtonian evaluation ---------------------------------- */

/* Wall state of a tube (slit = 0) or slit (slit = 1) at apparent rate app:
 * true rate gdot = ((3n+1)/(4n)) app or ((2n+1)/(3n)) app (the power-law
 * wall-rate corrections, Bird, Armstrong & Hassager 1987, ch. 4), with n the
 * resin's local index at gdot; fixed-point iteration on n. Wall stress
 * tau_w = eta(gdot) gdot. */
static enum ow_status wall_state(const struct ow_viscosity *v, double temp_K,
                                 double app, int slit, double *gdot,
                                 double *tau_w, struct ow_diag *d)
{
	double n = ow_melt_local_index(v, app, temp_K), g = app, eta;

	for (int it = 0; it < MAX_INDEX_ITER; it++) {
		double nn;

		g = slit ? (2.0 * n + 1.0) / (3.0 * n) * app
		         : (3.0 * n + 1.0) / (4.0 * n) * app;
		nn = ow_melt_local_index(v, g, temp_K);
		if (!isfinite(nn) || !(nn > 0.0))
			return ow_diag_set(d, OW_ECOMPUTE,
			                   "die: viscosity not finite at %g K",
			                   temp_K);
		if (fabs(nn - n) < 1e-10) {
			n = nn;
			break;
		}
		if (it == MAX_INDEX_ITER - 1)
			return ow_diag_set(d, OW_ENOCONV,
			                   "die: wall shear rate and power-law "
			                   "index did not agree at %g 1/s",
			                   g);
		n = nn;
	}
	g = slit ? (2.0 * n + 1.0) / (3.0 * n) * app
	         : (3.0 * n + 1.0) / (4.0 * n) * app;
	eta = ow_viscosity_eval(v, g, temp_K);
	if (!(eta > 0.0) || !isfinite(eta))
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "die: viscosity not finite at %g K", temp_K);
	*gdot = g;
	*tau_w = eta * g;
	return OW_OK;
}

/* Wall stress tau = eta(gdot, T) gdot solved for gdot (monotone for a
 * shear-thinning resin with n > 0): bisection in ln gdot. */
static enum ow_status rate_at_stress(const struct ow_viscosity *v,
                                     double temp_K, double tau, double *gdot,
                                     struct ow_diag *d)
{
	double lo = log(1e-9), hi = log(1e9);

	if (!(ow_viscosity_eval(v, exp(hi), temp_K) * exp(hi) > tau) ||
	    !(ow_viscosity_eval(v, exp(lo), temp_K) * exp(lo) < tau))
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "die: measured wall stress %g Pa outside "
		                   "the resin's flow curve at %g K",
		                   tau, temp_K);
	for (int it = 0; it < 200 && hi - lo > 1e-14; it++) {
		double mid = 0.5 * (lo + hi), g = exp(mid);

		if (ow_viscosity_eval(v, g, temp_K) * g < tau)
			lo = mid;
		else
			hi = mid;
	}
	*gdot = exp(0.5 * (lo + hi));
	return OW_OK;
}

struct die_state {
	double dp_Pa;
	double gdot_1_s;
};

/* Capillary-equivalent die through one measured point (see ow_die.h). */
static enum ow_status measured(const struct ow_die *die,
                               const struct ow_material *m, double q,
                               double temp_K, struct die_state *s,
                               struct ow_diag *d)
{
	const struct ow_viscosity *v = &m->visc;
	double qm = die->output_kg_s / m->melt_density_kg_m3, gm, tau;
	enum ow_status rc;

	if (die->diameter_m > 0.0) {
		double r = 0.5 * die->diameter_m;

		rc = wall_state(v, die->temp_K, 4.0 * qm / (OW_PI * r * r * r),
		                0, &gm, &tau, d);
	} else {
		rc = rate_at_stress(
		    v, die->temp_K,
		    die->pressure_Pa / (4.0 * OW_DIE_MEASURED_LD), &gm, d);
	}
	if (rc != OW_OK)
		return rc;
	s->gdot_1_s = gm * q / qm;
	s->dp_Pa = die->pressure_Pa * (q / qm) *
	           ow_viscosity_eval(v, s->gdot_1_s, temp_K) /
	           ow_viscosity_eval(v, gm, die->temp_K);
	if (!isfinite(s->dp_Pa))
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "die: viscosity not finite at %g K", temp_K);
	return OW_OK;
}

/* Geometric die at volume flow q > 0. */
static enum ow_status geometric(const struct ow_die *die,
                                const struct ow_material *m, double q,
                                double temp_K, struct die_state *s,
                                struct ow_diag *d)
{
	const struct ow_viscosity *v = &m->visc;
	double tau, w, h, r, corr = 1.0;
	enum ow_status rc;

	if (die->type == OW_DIE_CIRCLE) {
		r = 0.5 * die->diameter_m;
		rc = wall_state(v, temp_K, 4.0 * q / (OW_PI * r * r * r), 0,
		                &s->gdot_1_s, &tau, d);
		s->dp_Pa = 2.0 * die->length_m * tau / r;
		return rc;
	}
	if (die->type == OW_DIE_SLIT) {
		w = fmax(die->width_m, die->gap_m);
		h = fmin(die->width_m, die->gap_m);
		q /=
		    ow_melt_shape_fp(h / w); /* finite width, Newtonian-exact */
	} else {
		double ro = 0.5 * die->outer_diameter_m;
		double ri = 0.5 * die->inner_diameter_m;

		w = OW_PI * (ro + ri);
		h = ro - ri;
		corr = ow_die_annulus_factor(ri / ro);
	}
	rc = wall_state(v, temp_K, 6.0 * q / (w * h * h), 1, &s->gdot_1_s, &tau,
	                d);
	s->dp_Pa = 2.0 * die->length_m * tau / h / corr;
	return rc;
}

static enum ow_status evaluate(const struct ow_die *die,
                               const struct ow_material *m, double mdot,
                               double temp_K, struct die_state *s,
                               struct ow_diag *d)
{
	enum ow_status rc;
	double q, sign = mdot < 0.0 ? -1.0 : 1.0;

	if (!die || !m || !s)
		return ow_diag_set(d, OW_EARG, "die: missing argument");
	if ((rc = ow_die_check(die, d)) != OW_OK)
		return rc;
	if (!pos(m->melt_density_kg_m3) || !pos(temp_K) || !isfinite(mdot))
		return ow_diag_set(d, OW_EARG,
		                   "die: melt density %g kg/m3, temperature "
		                   "%g K, flow %g kg/s: out of range",
		                   m->melt_density_kg_m3, temp_K, mdot);
	s->dp_Pa = s->gdot_1_s = 0.0;
	if (mdot == 0.0)
		return OW_OK;
	q = fabs(mdot) / m->melt_density_kg_m3;
	rc = die->type == OW_DIE_MEASURED ? measured(die, m, q, temp_K, s, d)
	                                  : geometric(die, m, q, temp_K, s, d);
	s->dp_Pa *= sign;
	return rc;
}

enum ow_status ow_die_pressure(const struct ow_die *die,
                               const struct ow_material *m, double mdot,
                               double temp_K, double *dp_Pa, struct ow_diag *d)
{
	struct die_state s;
	enum ow_status rc = evaluate(die, m, mdot, temp_K, &s, d);

	if (rc == OW_OK && dp_Pa)
		*dp_Pa = s.dp_Pa;
	return rc;
}

enum ow_status ow_die_wall_shear_rate(const struct ow_die *die,
                                      const struct ow_material *m, double mdot,
                                      double temp_K, double *gdot_1_s,
                                      struct ow_diag *d)
{
	struct die_state s;
	enum ow_status rc = evaluate(die, m, mdot, temp_K, &s, d);

	if (rc == OW_OK && gdot_1_s)
		*gdot_1_s = s.gdot_1_s;
	return rc;
}
