/* melting.c - contiguous solids melting after Tadmor, Polym. Eng. Sci. 6
 * (1966) 185, and Tadmor & Klein, Engineering Principles of Plasticating
 * Extrusion (1970), ch. 9: the melt film, the solid-bed march and the closed
 * forms for constant depth and a linear taper. */
#include "ow_melting.h"

#include <math.h>
#include <stddef.h>
#include <string.h>

#define FILM_TOL   1e-12 /* on ln(delta): the film iteration's stop rule */
#define FILM_MAXIT 60
#define BED_MIN_M  1e-12 /* floor on X for the film's shear rate only */
#define PLUG_TOL   1e-12 /* relative overshoot of W counted as plugging */
#define ROOT_MAXIT 80

double ow_melting_bed_speed(const struct ow_material *m, double g_kg_s,
                            double depth_m, double width_m)
{
	double v;

	if (!m)
		return 0.0;
	v = g_kg_s / (m->solid_density_kg_m3 * depth_m * width_m);
	return isfinite(v) && v > 0.0 ? v : 0.0;
}

static int positive(double x)
{
	return isfinite(x) && x > 0.0;
}

static enum ow_status check_resin(const struct ow_material *m,
                                  struct ow_diag *d)
{
	if (!positive(m->solid_density_kg_m3) ||
	    !positive(m->melt_density_kg_m3))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: solid_density %g "
		                   "and melt_density %g kg/m3 must be > 0",
		                   m->solid_density_kg_m3,
		                   m->melt_density_kg_m3);
	if (!positive(m->melt_k_W_mK))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: melt_conductivity "
		                   "%g W/(m K) must be > 0",
		                   m->melt_k_W_mK);
	if (!(isfinite(m->solid_cp_J_kgK) && m->solid_cp_J_kgK >= 0.0 &&
	      isfinite(m->fusion_J_kg) && m->fusion_J_kg >= 0.0 &&
	      isfinite(m->melt_temp_K)))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: solid_heat_capacity"
		                   " %g J/(kg K), heat_of_fusion %g J/kg and "
		                   "melting_point %g K must be finite and "
		                   ">= 0",
		                   m->solid_cp_J_kgK, m->fusion_J_kg,
		                   m->melt_temp_K);
	return OW_OK;
}

enum ow_status ow_melting_validate(const struct ow_melting_in *in,
                                   struct ow_diag *d)
{
	const struct ow_material *m = in->mat;
	enum ow_status st;

	if (!m)
		return ow_diag_set(d, OW_EARG, "melting: resin must be given");
	st = check_resin(m, d);
	if (st != OW_OK)
		return st;
	if (!positive(in->barrel_speed_m_s) || !positive(in->bed_speed_m_s))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: barrel speed %g and"
		                   " bed speed %g m/s must be > 0",
		                   in->barrel_speed_m_s, in->bed_speed_m_s);
	if (!(in->helix_rad > 0.0 && in->helix_rad < 1.5707963267948966))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: helix angle %g rad "
		                   "must lie in 0..pi/2",
		                   in->helix_rad);
	if (!(in->solid_temp_K <= m->melt_temp_K) ||
	    !(m->solid_cp_J_kgK * (m->melt_temp_K - in->solid_temp_K) +
	          m->fusion_J_kg >
	      0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: solid bed at %g K "
		                   "must not be above the melting point %g K "
		                   "and must need heat to melt",
		                   in->solid_temp_K, m->melt_temp_K);
	if (!(isfinite(in->film_visc_Pa_s) && in->film_visc_Pa_s >= 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "melting: fixed film "
		                   "viscosity %g Pa s must be >= 0 (0: use the "
		                   "resin's model)",
		                   in->film_visc_Pa_s);
	return OW_OK;
}

/* Quantities fixed by *in alone: shared by every film of one step. */
struct film_base {
	const struct ow_melting_in *in;
	double vj, vbx; /* barrel speed relative to the bed; cross-channel */
	double heat;    /* C_s (T_m - T_s) + lambda, J/kg */
	double ln_vj;   /* log path only: ln V_j */
	double ln_den;  /* log path only: ln(V_bx rho_m heat) */
};

/* Quantities of one film evaluation that do not depend on mu. */
struct film_ctx {
	const struct ow_melting_in *in;
	double vj, vbx; /* barrel speed relative to the bed; cross-channel */
	double dt;      /* T_b - T_m */
	double tf;      /* film mean temperature (T_b + T_m)/2 */
	double heat;    /* C_s (T_m - T_s) + lambda, J/kg */
	double x;       /* bed width for the shear rate (floored) */
	/* log path only (in->visc_log set) */
	double ln_at; /* ln aT at tf: one shift per film, not per pass */
	double ln_gv; /* ln(aT V_j): ln of the shifted rate is ln_gv - u */
	double cond;  /* 2 k (T_b - T_m) */
	double ln_c;  /* ln(X / (V_bx rho_m heat)) */
};

static double slip_speed(const struct ow_melting_in *in)
{
	double vb = in->barrel_speed_m_s, vs = in->bed_speed_m_s;

	return sqrt(vb * vb + vs * vs - 2.0 * vb * vs * cos(in->helix_rad));
}

static void film_base_init(const struct ow_melting_in *in, struct film_base *b)
{
	const struct ow_material *m = in->mat;

	b->in = in;
	b->vj = slip_speed(in);
	b->vbx = in->barrel_speed_m_s * sin(in->helix_rad);
	b->heat = m->solid_cp_J_kgK * (m->melt_temp_K - in->solid_temp_K) +
	          m->fusion_J_kg;
	b->ln_vj = b->ln_den = 0.0;
	if (in->visc_log && in->film_visc_Pa_s <= 0.0) {
		b->ln_vj = log(b->vj);
		b->ln_den = log(b->vbx * m->melt_density_kg_m3 * b->heat);
	}
}

/* delta^2 = [2 k (T_b - T_m) + mu V_j^2] X / (V_bx rho_m [C_s (T_m - T_s)
 * + lambda]) (Tadmor & Klein 1970, ch. 9); returns ln(delta) for the
 * viscosity evaluated at delta = exp(u). */
static double film_map(const struct film_ctx *c, double u, double *mu)
{
	const struct ow_material *m = c->in->mat;
	double gdot = c->vj / exp(u);

	*mu = ow_viscosity_eval(&m->visc, gdot, c->tf);
	return 0.5 * log((2.0 * m->melt_k_W_mK * c->dt + *mu * c->vj * c->vj) *
	                 c->x / (c->vbx * m->melt_density_kg_m3 * c->heat));
}

/* The same map in log space: ln mu = ln aT + ln eta_ref(ln aT + ln V_j - u)
 * (time-temperature superposition, Dealy & Wissbrun 1990, ch. 2), so one
 * pass costs one exp and one log1p inside the model, the exp of ln mu and
 * one log. *dg gets the map's slope d(film_map)/du = (mu V_j^2 / (2 s))
 * (-d ln eta / d ln gdot), s = 2 k dT + mu V_j^2, for Newton's method. */
static double film_map_log(const struct film_ctx *c, double u, double *mu,
                           double *dg)
{
	double slope, q, s;

	*mu = exp(c->ln_at +
	          ow_viscosity_log_ref(c->in->visc_log, c->ln_gv - u, &slope));
	q = *mu * c->vj * c->vj;
	s = c->cond + q;
	*dg = -0.5 * slope * q / s;
	return 0.5 * (log(s) + c->ln_c);
}

static enum ow_status film_noconv(const struct film_ctx *c, double mu,
                                  struct ow_diag *d)
{
	return ow_diag_set(d, OW_ENOCONV,
	                   "melting: film thickness and "
	                   "viscosity did not converge (T_b = %g K, X = %g m, "
	                   "mu = %g Pa s)",
	                   c->tf * 2.0 - c->in->mat->melt_temp_K, c->x, mu);
}

/* Film viscosity from the resin's model at gdot = V_j/delta and the film
 * mean temperature, consistent with delta: an engineering choice, not part
 * of Tadmor's Newtonian film. u = ln(delta) is a fixed point of film_map,
 * whose slope lies in [0, (1-n)/2], so the secant method on
 * F(u) = film_map(u) - u converges fast and safely. */
static enum ow_status film_visc(const struct film_ctx *c, double *mu,
                                struct ow_diag *d)
{
	double u0 = log(1e-4), u1, f0, f1, u2;
	int it;

	u1 = film_map(c, u0, mu);
	f0 = u1 - u0;
	for (it = 0; it < FILM_MAXIT; it++) {
		f1 = film_map(c, u1, mu) - u1;
		if (!isfinite(f1) || !positive(*mu))
			break;
		if (fabs(f1) < FILM_TOL)
			return OW_OK;
		u2 = (f1 != f0) ? u1 - f1 * (u1 - u0) / (f1 - f0) : u1 + f1;
		if (!isfinite(u2) || fabs(u2 - u1) > fabs(f1) * 4.0)
			u2 = u1 + f1; /* fall back to the plain fixed point */
		u0 = u1, f0 = f1, u1 = u2;
	}
	return film_noconv(c, *mu, d);
}

/* The same fixed point by Newton's method on F(u) = film_map(u) - u with
 * the exact slope F' = dg - 1 (Press et al., Numerical Recipes, 3rd ed.
 * 2007, section 9.4); |F'| >= (1+n)/2 keeps the steps tame. *u holds the
 * start (a neighbouring film's ln delta) and gets the converged value; the
 * stop rule is film_visc's, so both paths give the same film to round-off. */
static enum ow_status film_visc_log(const struct film_ctx *c, double *u,
                                    double *mu, struct ow_diag *d)
{
	double f, dg;
	int it;

	for (it = 0; it < FILM_MAXIT; it++) {
		f = film_map_log(c, *u, mu, &dg) - *u;
		if (!isfinite(f) || !positive(*mu))
			break;
		if (fabs(f) < FILM_TOL)
			return OW_OK;
		/* a slope beyond the model's range: plain fixed point */
		*u += 1.0 - dg > 0.25 ? f / (1.0 - dg) : f;
	}
	return film_noconv(c, *mu, d);
}

/* Phi = V_bx rho_m delta_hat / 2 with delta = delta_hat sqrt(X), i.e.
 * Phi^2 = V_bx rho_m [k (T_b - T_m) + mu V_j^2/2] / (2 [C_s (T_m - T_s)
 * + lambda]) (Tadmor 1966; Tadmor & Klein 1970, ch. 9). Film terms use
 * X/delta = sqrt(X)/delta_hat, finite as X -> 0. */
static void film_fill(const struct film_ctx *c, double mu, double x,
                      struct ow_melting_film *f)
{
	const struct ow_material *m = c->in->mat;
	double k = m->melt_k_W_mK, vj2 = c->vj * c->vj;
	double dhat = sqrt((2.0 * k * c->dt + mu * vj2) /
	                   (c->vbx * m->melt_density_kg_m3 * c->heat));
	double xd = sqrt(x) / dhat, vb = c->in->barrel_speed_m_s;

	f->visc_Pa_s = mu;
	f->film_m = dhat * sqrt(x);
	f->phi = c->vbx * m->melt_density_kg_m3 * dhat / 2.0;
	f->melt_rate_kg_sm = f->phi * sqrt(x);
	f->peak_temp_K = ow_melting_film_peak(
	    m->melt_temp_K, m->melt_temp_K + c->dt, mu, c->vj, k);
	f->barrel_heat_W_m = xd * (k * c->dt - mu * vj2 / 2.0);
	f->dissipation_W_m = xd * mu * vj2;
	f->drive_power_W_m =
	    xd * mu * vb * (vb - c->in->bed_speed_m_s * cos(c->in->helix_rad));
	f->bed_heat_W_m = xd * (k * c->dt + mu * vj2 / 2.0);
}

/* Start of the log-path iteration when no neighbouring film is known: the
 * plain path's first guess, delta = 0.1 mm. */
#define FILM_U0 (-9.210340371976184) /* ln 1e-4 */

/* ow_melting_film without the validation, for inputs already checked; *u
 * (log path only, may be NULL) is the start of the iteration and gets the
 * converged ln delta. */
static enum ow_status film_at(const struct film_base *fb, double barrel_temp_K,
                              double bed_width_m, double *u,
                              struct ow_melting_film *f, struct ow_diag *d)
{
	const struct ow_melting_in *in = fb->in;
	const struct ow_material *m = in->mat;
	struct film_ctx c;
	double mu = in->film_visc_Pa_s, u0 = u ? *u : FILM_U0;
	enum ow_status st;

	memset(f, 0, sizeof *f);
	memset(&c, 0, sizeof c);
	c.in = in;
	c.vj = fb->vj;
	c.vbx = fb->vbx;
	c.dt = barrel_temp_K - m->melt_temp_K;
	c.tf = 0.5 * (barrel_temp_K + m->melt_temp_K);
	c.heat = fb->heat;
	c.x = bed_width_m > BED_MIN_M ? bed_width_m : BED_MIN_M;
	f->slip_speed_m_s = c.vj;
	f->peak_temp_K = m->melt_temp_K;
	if (!isfinite(barrel_temp_K) || !(bed_width_m >= 0.0))
		return ow_diag_set(d, OW_EARG,
		                   "melting: barrel temperature "
		                   "%g K and bed width %g m must be finite and "
		                   "the width >= 0",
		                   barrel_temp_K, bed_width_m);
	if (c.dt <= 0.0)
		return OW_OK; /* no conduction-fed film: the bed does not melt
		               */
	if (mu <= 0.0 && in->visc_log) {
		c.ln_at = ow_viscosity_log_shift(&m->visc, c.tf);
		c.ln_gv = c.ln_at + fb->ln_vj;
		c.cond = 2.0 * m->melt_k_W_mK * c.dt;
		c.ln_c = log(c.x) - fb->ln_den;
		if (!isfinite(u0))
			u0 = FILM_U0;
		st = film_visc_log(&c, &u0, &mu, d);
		if (st != OW_OK)
			return st;
		if (u)
			*u = u0;
	} else if (mu <= 0.0) {
		st = film_visc(&c, &mu, d);
		if (st != OW_OK)
			return st;
	}
	film_fill(&c, mu, bed_width_m, f);
	return OW_OK;
}

enum ow_status ow_melting_film(const struct ow_melting_in *in,
                               double barrel_temp_K, double bed_width_m,
                               struct ow_melting_film *f, struct ow_diag *d)
{
	struct film_base fb;
	enum ow_status st = ow_melting_validate(in, d);

	if (st != OW_OK)
		return st;
	film_base_init(in, &fb);
	return film_at(&fb, barrel_temp_K, bed_width_m, NULL, f, d);
}

/* Peak of T(xi) = T_m + dT xi + B xi (1 - xi), B = mu V^2/(2k) (Bird,
 * Stewart & Lightfoot 2002, section 10.4, walls at unequal temperatures):
 * dT/dxi = 0 at xi* = (1 + dT/B)/2; inside the film the peak is
 * T_m + (B + dT)^2/(4B), otherwise the hotter wall. */
double ow_melting_film_peak(double bed_temp_K, double barrel_temp_K,
                            double visc_Pa_s, double speed_m_s, double k_W_mK)
{
	double dt = barrel_temp_K - bed_temp_K;
	double b = visc_Pa_s * speed_m_s * speed_m_s / (2.0 * k_W_mK);

	if (b > 0.0 && fabs(dt) < b)
		return bed_temp_K + (b + dt) * (b + dt) / (4.0 * b);
	return dt > 0.0 ? barrel_temp_K : bed_temp_K;
}

/* One step's geometry, linear in t (0..dz) between stations a and b. */
struct step_ctx {
	const struct ow_melting_in *in;
	const struct ow_melting_station *a, *b;
	double dz;
	double flux; /* rho_s V_sz, kg/(m^2 s) */
	struct ow_diag *d;
	enum ow_status st; /* first failure inside a right-hand side */
	struct film_base fb;
	double u; /* ln delta of the last film: the next one's start */
};

static double lerp(double ya, double yb, double t, double dz)
{
	return ya + (yb - ya) * t / dz;
}

/* Bed mass balance d(rho_s V_sz H X)/dz = -Phi sqrt(X) (Tadmor & Klein 1970,
 * ch. 9) written for s = sqrt(X), which stays smooth as the bed vanishes:
 *   ds/dz = -Phi / (2 H rho_s V_sz) - (dH/dz) s / (2 H).
 * Phi may depend on X through the film viscosity; X = s^2. */
static double bed_rhs(struct step_ctx *c, double t, double s,
                      struct ow_melting_film *f)
{
	struct ow_melting_film tmp;
	double h = lerp(c->a->depth_m, c->b->depth_m, t, c->dz);
	double dh = (c->b->depth_m - c->a->depth_m) / c->dz;
	double tb = lerp(c->a->barrel_temp_K, c->b->barrel_temp_K, t, c->dz);
	enum ow_status st;

	if (!f)
		f = &tmp;
	st = film_at(&c->fb, tb, s * s, &c->u, f, c->d);
	if (st != OW_OK && c->st == OW_OK)
		c->st = st;
	return -f->phi / (2.0 * h * c->flux) - dh * s / (2.0 * h);
}

/* Classical fourth-order Runge-Kutta (Press et al., Numerical Recipes,
 * 3rd ed. 2007, section 17.1) from t = 0 over h, with k1 given. */
static double rk4(struct step_ctx *c, double s0, double k1, double h)
{
	double k2 = bed_rhs(c, 0.5 * h, s0 + 0.5 * h * k1, NULL);
	double k3 = bed_rhs(c, 0.5 * h, s0 + 0.5 * h * k2, NULL);
	double k4 = bed_rhs(c, h, s0 + h * k3, NULL);

	return s0 + h * (k1 + 2.0 * k2 + 2.0 * k3 + k4) / 6.0;
}

/* Where the bed vanishes: the h in (0, dz] with rk4(s0, h) = 0, by the
 * Illinois variant of regula falsi (Dowell & Jarratt, BIT 11 (1971) 168);
 * s0 > 0 >= rk4(s0, dz) brackets it. */
static double vanish_at(struct step_ctx *c, double s0, double k1, double s1)
{
	double lo = 0.0, flo = s0, hi = c->dz, fhi = s1, h = hi, fh;
	int it, side = 0;

	for (it = 0; it < ROOT_MAXIT && hi - lo > 1e-13 * c->dz; it++) {
		h = (lo * fhi - hi * flo) / (fhi - flo);
		fh = rk4(c, s0, k1, h);
		if (fh > 0.0) {
			lo = h, flo = fh;
			if (side == 1)
				fhi *= 0.5;
			side = 1;
		} else {
			hi = h, fhi = fh;
			if (side == -1)
				flo *= 0.5;
			side = -1;
		}
		if (fh == 0.0)
			break;
	}
	return h;
}

static void add_film(struct ow_melting_step_out *o,
                     const struct ow_melting_film *f, double w)
{
	o->barrel_heat_W += w * f->barrel_heat_W_m;
	o->dissipation_W += w * f->dissipation_W_m;
	o->drive_power_W += w * f->drive_power_W_m;
	o->bed_heat_W += w * f->bed_heat_W_m;
}

/* Simpson's rule for the film terms over [0, te]; the midpoint bed from the
 * cubic Hermite interpolant through (0, s0, k1) and (te, se, fe). */
static void integrate_film(struct step_ctx *c, double s0, double k1,
                           const struct ow_melting_film *f0, double te,
                           double se, double fe, struct ow_melting_step_out *o)
{
	struct ow_melting_film fm;
	double sm = 0.5 * (s0 + se) + te * (k1 - fe) / 8.0;
	double wm = lerp(c->a->width_m, c->b->width_m, 0.5 * te, c->dz);

	if (sm * sm > wm)
		sm = sqrt(wm);
	bed_rhs(c, 0.5 * te, sm, &fm);
	add_film(o, f0, te / 6.0);
	add_film(o, &fm, 4.0 * te / 6.0);
	add_film(o, &o->film, te / 6.0);
}

static enum ow_status step_args(const struct ow_melting_station *a,
                                const struct ow_melting_station *b, double dz,
                                double x, struct ow_diag *d)
{
	if (!positive(dz) || !(isfinite(x) && x >= 0.0))
		return ow_diag_set(d, OW_EARG,
		                   "melting: step %g m must be > 0"
		                   " and bed width %g m >= 0",
		                   dz, x);
	if (!positive(a->depth_m) || !positive(b->depth_m) ||
	    !positive(a->width_m) || !positive(b->width_m))
		return ow_diag_set(d, OW_EARG,
		                   "melting: channel depth "
		                   "%g..%g m and width %g..%g m must be > 0",
		                   a->depth_m, b->depth_m, a->width_m,
		                   b->width_m);
	return OW_OK;
}

enum ow_status ow_melting_step(const struct ow_melting_in *in,
                               const struct ow_melting_station *a,
                               const struct ow_melting_station *b, double dz_m,
                               double bed_width_m,
                               struct ow_melting_step_out *o, struct ow_diag *d)
{
	struct step_ctx c = {in, a, b, dz_m, 0.0, d, OW_OK, {0}, FILM_U0};
	struct ow_melting_film f0;
	double s0, k1, se, fe, te = dz_m, x0 = bed_width_m, xe;
	enum ow_status st = ow_melting_validate(in, d);

	if (st == OW_OK)
		st = step_args(a, b, dz_m, bed_width_m, d);
	if (st != OW_OK)
		return st;
	memset(o, 0, sizeof *o);
	o->melted_at_m = -1.0;
	c.flux = in->mat->solid_density_kg_m3 * in->bed_speed_m_s;
	film_base_init(in, &c.fb);
	if (x0 > a->width_m * (1.0 + PLUG_TOL))
		o->plugged = 1;
	if (x0 > a->width_m)
		x0 = a->width_m;
	s0 = sqrt(x0);
	k1 = bed_rhs(&c, 0.0, s0, &f0);
	se = s0 > 0.0 ? rk4(&c, s0, k1, dz_m) : 0.0;
	if (s0 > 0.0 && se <= 0.0) {
		te = vanish_at(&c, s0, k1, se);
		o->melted_at_m = te;
		se = 0.0;
	} else if (s0 == 0.0) {
		o->melted_at_m = 0.0;
		te = 0.0;
	}
	xe = se * se;
	if (xe > b->width_m * (1.0 + PLUG_TOL))
		o->plugged = 1;
	if (xe > b->width_m) {
		xe = b->width_m;
		se = sqrt(xe);
	}
	fe = bed_rhs(&c, te, se, &o->film);
	if (c.st != OW_OK)
		return c.st;
	if (te > 0.0)
		integrate_film(&c, s0, k1, &f0, te, se, fe, o);
	o->bed_width_m = xe;
	o->sbr = xe / b->width_m;
	o->solid_flow_kg_s = c.flux * b->depth_m * xe;
	o->melted_kg_s = c.flux * (a->depth_m * x0 -
	                           lerp(a->depth_m, b->depth_m, te, dz_m) * xe);
	return c.st;
}

/* Closed forms, Tadmor & Klein (1970) ch. 9, for constant Phi and V_sz. */
double ow_melting_psi_const(double phi, double rho_s_kg_m3,
                            double bed_speed_m_s, double depth_m,
                            double width_m)
{
	return phi / (rho_s_kg_m3 * bed_speed_m_s * depth_m * sqrt(width_m));
}

/* Constant depth: sqrt(X/W) falls linearly, by psi_c / 2 per metre. */
double ow_melting_sbr_const(double psi_c_1_m, double sbr0, double z_m)
{
	double u = sqrt(sbr0) - 0.5 * psi_c_1_m * z_m;

	return u > 0.0 ? u * u : 0.0;
}

double ow_melting_length_const(double psi_c_1_m, double sbr0)
{
	return psi_c_1_m > 0.0 ? 2.0 * sqrt(sbr0) / psi_c_1_m : INFINITY;
}

double ow_melting_psi_taper(double phi, double rho_s_kg_m3,
                            double bed_speed_m_s, double width_m)
{
	return phi / (rho_s_kg_m3 * bed_speed_m_s * sqrt(width_m));
}

/* Linear taper H = H1 - A z: with u = sqrt(X/W), du/dH = (psi_t/A - u)/(2H),
 * so u - psi_t/A scales as sqrt(H1/H). */
double ow_melting_sbr_taper(double psi_t, double taper, double sbr0,
                            double h1_m, double z_m)
{
	double r, u;

	if (taper == 0.0)
		return ow_melting_sbr_const(psi_t / h1_m, sbr0, z_m);
	r = psi_t / taper;
	u = r - (r - sqrt(sbr0)) * sqrt(h1_m / (h1_m - taper * z_m));
	return u > 0.0 ? u * u : 0.0;
}

double ow_melting_length_taper(double psi_t, double taper, double sbr0,
                               double h1_m)
{
	double q = taper * sqrt(sbr0) / psi_t; /* A u / psi_t */

	if (taper == 0.0)
		return ow_melting_length_const(psi_t / h1_m, sbr0);
	if (!(psi_t > 0.0) || q >= 1.0)
		return INFINITY; /* the bed never vanishes in the taper */
	return h1_m * sqrt(sbr0) / psi_t * (2.0 - q);
}

int ow_melting_taper_plugs(double psi_t, double taper)
{
	return psi_t <= taper;
}
