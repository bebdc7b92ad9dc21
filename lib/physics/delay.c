/* delay.c - the delay zone ahead of Tadmor melting: conduction into the
 * solid plug from the barrel (Carslaw & Jaeger 1959, sections 2.4 and
 * 2.7), then a melt film growing until it reaches the flight clearance
 * (Kacir & Tadmor, Polym. Eng. Sci. 12 (1972) 387). See ow_delay.h. */
#include "ow_delay.h"

#include "ow_melting.h"
#include "ow_const.h"

#include <math.h>
#include <string.h>

#define SQRT_PI       1.7724538509055160
#define FILM_SUBSTEPS 40   /* implicit substeps of the film per step */
#define FILM_PASSES   3    /* fixed-point passes of a substep */
#define FILM_MIN_M    1e-9 /* floor on the film for its shear rate */
#define ROOT_MAXIT    60
#define BED_MELT_MAX  0.5 /* largest melt share of the plug handed over */

void ow_delay_start(struct ow_delay *z, const struct ow_material *m,
                    double feed_K)
{
	memset(z, 0, sizeof *z);
	z->mat = m;
	z->feed_K = feed_K;
	z->wall_K = feed_K;
	z->film_K = m->melt_temp_K;
}

/* Effusivity sqrt(k rho c) and diffusivity k/(rho c) of the solid. */
static double effusivity(const struct ow_material *m)
{
	return sqrt(m->solid_k_W_mK * m->solid_density_kg_m3 *
	            m->solid_cp_J_kgK);
}

static double diffusivity(const struct ow_material *m)
{
	return m->solid_k_W_mK / (m->solid_density_kg_m3 * m->solid_cp_J_kgK);
}

/* exp(x^2) erfc(x), x >= 0, without overflow: direct below 10, else the
 * asymptotic series (Abramowitz & Stegun 1964, eq. 7.1.23), error < 4e-9
 * relative there. */
static double erfcx(double x)
{
	double r;

	if (x < 10.0)
		return exp(x * x) * erfc(x);
	r = 1.0 / (2.0 * x * x);
	return (1.0 - r * (1.0 - 3.0 * r * (1.0 - 5.0 * r * (1.0 - 7.0 * r)))) /
	       (x * SQRT_PI);
}

/* beta = h sqrt(alpha tau) / k of the surface heat-transfer solution. */
static double beta_of(const struct ow_delay *z, double tau)
{
	return z->wall_h * sqrt(diffusivity(z->mat) * tau) /
	       z->mat->solid_k_W_mK;
}

/* Surface rise per unit step of the wall after tau: 1 for an ideal wall,
 * 1 - exp(beta^2) erfc(beta) through h (Carslaw & Jaeger section 2.7). */
static double step_surface(const struct ow_delay *z, double tau)
{
	if (!(tau > 0.0))
		return 0.0;
	return z->wall_h > 0.0 ? 1.0 - erfcx(beta_of(z, tau)) : 1.0;
}

/* Heat into the solid per unit step after tau, J/(m^2 K): 2 e
 * sqrt(tau/pi) for an ideal wall (section 2.4), (e^2/h) [exp(beta^2)
 * erfc(beta) - 1 + 2 beta/sqrt(pi)] through h (the time integral of the
 * section 2.7 flux h (1 - surface rise)). */
static double step_heat(const struct ow_delay *z, double tau)
{
	double e = effusivity(z->mat), b;

	if (!(tau > 0.0))
		return 0.0;
	if (!(z->wall_h > 0.0))
		return 2.0 * e * sqrt(tau / OW_PI);
	b = beta_of(z, tau);
	return e * e / z->wall_h * (erfcx(b) - 1.0 + 2.0 * b / SQRT_PI);
}

/* The film-phase solid: surface held at T_m since its equivalent age. */
static double film_age(const struct ow_delay *z, double t)
{
	return z->age0_s + (t - z->film_t_s);
}

static double heat_at(const struct ow_delay *z, double t)
{
	double sum = 0.0, tau;
	int k;

	if (z->film) {
		tau = film_age(z, t);
		return tau > 0.0 ? 2.0 * (z->mat->melt_temp_K - z->feed_K) *
		                       effusivity(z->mat) * sqrt(tau / OW_PI)
		                 : 0.0;
	}
	for (k = 0; k < z->n; k++)
		sum += z->step_K[k] * step_heat(z, t - z->at_s[k]);
	return sum;
}

static double surface_at(const struct ow_delay *z, double t)
{
	double ts = z->feed_K;
	int k;

	if (z->film)
		return z->mat->melt_temp_K;
	for (k = 0; k < z->n; k++)
		ts += z->step_K[k] * step_surface(z, t - z->at_s[k]);
	return ts;
}

double ow_delay_solid_heat(const struct ow_delay *z)
{
	return heat_at(z, z->t_s);
}

double ow_delay_surface(const struct ow_delay *z)
{
	return surface_at(z, z->t_s);
}

/* Temperature at depth y after tau per unit step: erfc(eta) for an ideal
 * wall, erfc(eta) - exp(-eta^2) erfcx(eta + beta) through h, eta =
 * y / (2 sqrt(alpha tau)) (Carslaw & Jaeger sections 2.4, 2.7). */
static double step_temp(const struct ow_delay *z, double y, double tau)
{
	double eta;

	if (!(tau > 0.0))
		return 0.0;
	eta = y / (2.0 * sqrt(diffusivity(z->mat) * tau));
	if (!(z->wall_h > 0.0))
		return erfc(eta);
	return erfc(eta) - exp(-eta * eta) * erfcx(eta + beta_of(z, tau));
}

double ow_delay_temp(const struct ow_delay *z, double y)
{
	double t = z->feed_K, tau;
	int k;

	if (z->film) {
		tau = film_age(z, z->t_s);
		if (!(tau > 0.0))
			return z->mat->melt_temp_K;
		return t +
		       (z->mat->melt_temp_K - z->feed_K) *
		           erfc(y / (2.0 * sqrt(diffusivity(z->mat) * tau)));
	}
	for (k = 0; k < z->n; k++)
		t += z->step_K[k] * step_temp(z, y, z->t_s - z->at_s[k]);
	return t;
}

/* The wall steps to wall_K now; past OW_DELAY_STEPS steps a change
 * joins the last step (as if it had come with it). */
static void push_step(struct ow_delay *z, double wall_K)
{
	double dT = wall_K - z->wall_K;

	if (dT == 0.0)
		return;
	if (z->n < OW_DELAY_STEPS) {
		z->at_s[z->n] = z->t_s;
		z->step_K[z->n++] = dT;
	} else {
		z->step_K[z->n - 1] += dT;
	}
	z->wall_K = wall_K;
}

/* The surface reaches T_m: the solid's history becomes a surface held at
 * T_m since the equivalent age with the same heat content,
 * E = 2 (T_m - T_0) e sqrt(age/pi). */
static void form_film(struct ow_delay *z)
{
	double e = effusivity(z->mat);
	double dT = z->mat->melt_temp_K - z->feed_K, E = heat_at(z, z->t_s);

	z->age0_s =
	    dT > 0.0 && e > 0.0 ? OW_PI * pow(E / (2.0 * dT * e), 2) : 0.0;
	z->film = 1;
	z->film_t_s = z->t_s;
	z->film_m = 0.0;
}

/* Flux into the solid under the film at time t: (T_m - T_0) e /
 * sqrt(pi age) (Carslaw & Jaeger section 2.4). */
static double solid_flux(const struct ow_delay *z, double t)
{
	double dT = z->mat->melt_temp_K - z->feed_K, age = film_age(z, t);

	if (!(dT > 0.0))
		return 0.0;
	return dT * effusivity(z->mat) /
	       sqrt(OW_PI * (age > 0.0 ? age : 1e-30));
}

struct film_step {
	double wall, slip, clear, A;
};

/* s times the heat the film gives the solid surface, c = s q_i, for a
 * film s thick with viscosity mu: the Couette film between the bore T_w
 * and the solid at T_m, heating D = mu V_j^2 / s, q_i = k (T_w - T_m)/s +
 * D/2 (Tadmor 1966); through h the bore passes h (T_c - T_w) = k (T_w -
 * T_m)/s - D/2, so c = (h s dT_c + mu V_j^2/2) k/(k + h s) + mu V_j^2/2;
 * an ideal wall gives c = k dT_c + mu V_j^2/2. *tw gets T_w. */
static double film_c(const struct ow_delay *z, const struct film_step *f,
                     double s, double mu, double *tw)
{
	const struct ow_material *m = z->mat;
	double k = m->melt_k_W_mK, dT = f->wall - m->melt_temp_K;
	double half = 0.5 * mu * f->slip * f->slip, h = z->wall_h;

	if (!(h > 0.0)) {
		*tw = f->wall;
		return k * dT + half;
	}
	*tw = m->melt_temp_K + (h * s * dT + half) / (k + h * s);
	return (h * s * dT + half) * k / (k + h * s) + half;
}

/* One implicit (backward Euler) substep h of the film equation
 *   A s ds/dt = c - s q_s,  A = rho_m [lambda + c_m (T_b - T_m)/3]:
 * A s (s - s0) = h (c - s q_s) is a quadratic in s, solvable also for
 * A = 0 (an amorphous resin: the film is where the solid passes T_m). */
static double film_substep(double A, double c, double qs, double s0, double h)
{
	double B = h * qs - A * s0, disc;

	if (A <= 0.0)
		return qs > 0.0 ? fmax(c / qs, 0.0) : INFINITY;
	disc = B * B + 4.0 * A * h * c;
	if (disc < 0.0)
		return 0.0; /* the film freezes back */
	return fmax((-B + sqrt(disc)) / (2.0 * A), 0.0);
}

/* Film over one substep from t: returns the film at t + h (or where it
 * reached the clearance, *frac the share of h used), adds the
 * dissipation and sets the peak. c and the viscosity are taken at the
 * film the substep ends with (a few fixed-point passes). */
static double film_advance(struct ow_delay *z, const struct film_step *f,
                           double h, double *frac, struct ow_delay_out *o)
{
	const struct ow_material *m = z->mat;
	double s0 = z->film_m, s = s0, mu = 0.0, c, tw = f->wall, sm;
	double qs = solid_flux(z, z->t_s + h);
	int pass;

	for (pass = 0; pass < FILM_PASSES; pass++) {
		sm = fmax(pass ? s : s0, FILM_MIN_M);
		mu = ow_viscosity_eval(&m->visc, f->slip / sm,
		                       0.5 * (f->wall + m->melt_temp_K));
		c = film_c(z, f, sm, mu, &tw);
		s = film_substep(f->A, c, qs, s0, h);
	}
	*frac = 1.0;
	if (f->clear > 0.0 && s >= f->clear) { /* s^2 about linear in t */
		double d = s * s - s0 * s0;

		*frac = d > 0.0 ? (f->clear * f->clear - s0 * s0) / d : 0.0;
		*frac = fmin(fmax(*frac, 0.0), 1.0);
		s = f->clear;
	}
	sm = fmax(0.5 * (s0 + s), FILM_MIN_M);
	o->dissip_J_m2 += mu * f->slip * f->slip / sm * h * *frac;
	o->peak_K = ow_melting_film_peak(m->melt_temp_K, tw, mu, f->slip,
	                                 m->melt_k_W_mK);
	return s;
}

/* The film phase over dt, in FILM_SUBSTEPS implicit substeps. */
static void film_phase(struct ow_delay *z, double wall_K, double slip,
                       double clear, double dt, double t_in,
                       struct ow_delay_out *o)
{
	const struct ow_material *m = z->mat;
	double dT = fmax(wall_K - m->melt_temp_K, 0.0), h = dt / FILM_SUBSTEPS;
	double s_in = z->film_m, e_in = heat_at(z, z->t_s), frac;
	struct film_step f = {wall_K, slip, clear, 0.0};
	int i;

	f.A = m->melt_density_kg_m3 *
	      (m->fusion_J_kg + m->melt_cp_J_kgK * dT / 3.0);
	for (i = 0; i < FILM_SUBSTEPS && o->done_s < 0.0; i++) {
		double s = film_advance(z, &f, h, &frac, o);

		z->film_m = s;
		z->t_s += h * frac;
		if (frac < 1.0 || (clear > 0.0 && s >= clear))
			o->done_s = t_in + i * h + frac * h;
	}
	z->film_K = m->melt_temp_K + dT / 3.0;
	o->heat_J_m2 += heat_at(z, z->t_s) - e_in + f.A * (z->film_m - s_in);
}

/* Contact time after t0 (within dt) at which the surface reaches T_m, by
 * bisection; the surface rises through the step (the wall above T_m). */
static double reach_melting(const struct ow_delay *z, double t0, double dt)
{
	double lo = t0, hi = t0 + dt, tm = z->mat->melt_temp_K;
	int it;

	for (it = 0; it < ROOT_MAXIT && hi - lo > 1e-12 * (dt + t0); it++) {
		double mid = 0.5 * (lo + hi);

		if (surface_at(z, mid) >= tm)
			hi = mid;
		else
			lo = mid;
	}
	return hi;
}

/* The plug phase over dt under the wall at wall_K; returns the contact
 * time left over once the surface reached T_m (0: it did not). */
static double plug_phase(struct ow_delay *z, double wall_K, double dt,
                         struct ow_delay_out *o)
{
	double e_in, t0 = z->t_s, t1 = t0 + dt, tm = z->mat->melt_temp_K;

	push_step(z, wall_K);
	e_in = heat_at(z, t0);
	if (wall_K > tm && !(z->wall_h > 0.0))
		t1 = t0; /* an ideal wall melts the surface at once */
	else if (wall_K > tm && surface_at(z, t1) >= tm)
		t1 = reach_melting(z, t0, dt);
	z->t_s = t1;
	o->heat_J_m2 = heat_at(z, t1) - e_in;
	if (t1 < t0 + dt || surface_at(z, t1) >= tm) {
		form_film(z);
		return t0 + dt - t1;
	}
	return 0.0;
}

enum ow_status ow_delay_advance(struct ow_delay *z, double wall_K,
                                double wall_h_W_m2K, double slip_m_s,
                                double clearance_m, double dt_s,
                                struct ow_delay_out *o, struct ow_diag *d)
{
	double left = dt_s;

	memset(o, 0, sizeof *o);
	o->peak_K = NAN;
	o->done_s = -1.0;
	if (!(dt_s > 0.0) || !isfinite(dt_s) || !isfinite(wall_K) ||
	    !(slip_m_s >= 0.0) || !isfinite(slip_m_s) ||
	    !isfinite(clearance_m) || !(wall_h_W_m2K >= 0.0) ||
	    !isfinite(wall_h_W_m2K))
		return ow_diag_set(d, OW_EARG,
		                   "delay zone: step %g s, wall "
		                   "%g K, wall coefficient %g W/(m2 K), slip "
		                   "%g m/s and clearance %g m must be finite, "
		                   "the step > 0",
		                   dt_s, wall_K, wall_h_W_m2K, slip_m_s,
		                   clearance_m);
	z->wall_h = wall_h_W_m2K;
	if (!z->film)
		left = plug_phase(z, wall_K, dt_s, o);
	if (z->film && clearance_m <= 0.0) {
		o->done_s = dt_s - left; /* the flight wipes the first film */
		return OW_OK;
	}
	if (z->film && left > 0.0)
		film_phase(z, wall_K, slip_m_s, clearance_m, left, dt_s - left,
		           o);
	return OW_OK;
}

/* The plug handed over holds heat_J_m2 per unit contact area over a bed
 * depth_m deep: the film melt (mass share f at melt_K) and the solid left
 * (at bed_K) hold exactly that heat, per kg f h_m + (1 - f) c_s (T_s -
 * T_0) = Q, h_m = c_s (T_m - T_0) + lambda + c_m (T_melt - T_m) (the same
 * enthalpy as the energy book's). A solid that would pass T_m melts more
 * of itself into the film melt; past the largest share handed over the
 * film melt is hotter. */
void ow_delay_bed(const struct ow_delay *z, double depth_m, double heat_J_m2,
                  double *melt_frac, double *bed_K, double *melt_K)
{
	const struct ow_material *m = z->mat;
	double msolid = m->solid_density_kg_m3 * depth_m; /* kg/m^2 */
	double cs = m->solid_cp_J_kgK, tm = m->melt_temp_K;
	double f =
	    msolid > 0.0
	        ? fmin(m->melt_density_kg_m3 * z->film_m / msolid, BED_MELT_MAX)
	        : 0.0;
	double tk = z->film ? z->film_K : tm;
	double q = msolid > 0.0 ? heat_J_m2 / msolid : 0.0; /* J/kg */
	double sens = cs * (tm - z->feed_K);
	double hm = sens + m->fusion_J_kg + m->melt_cp_J_kgK * (tk - tm);
	double t = cs > 0.0 ? z->feed_K + (q - f * hm) / ((1.0 - f) * cs) : tm;

	if (t > tm) { /* more melts: f hm + (1 - f) sens = q */
		t = tm;
		f = hm > sens
		        ? fmin(fmax((q - sens) / (hm - sens), f), BED_MELT_MAX)
		        : BED_MELT_MAX;
		if (f * hm + (1.0 - f) * sens < q && f > 0.0 &&
		    m->melt_cp_J_kgK > 0.0) { /* the melt takes the rest */
			hm = (q - (1.0 - f) * sens) / f;
			tk = tm +
			     (hm - sens - m->fusion_J_kg) / m->melt_cp_J_kgK;
		}
	}
	*melt_frac = f;
	*bed_K = t;
	*melt_K = tk;
}
