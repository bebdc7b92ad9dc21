/* solids.c - plug-flow solids conveying: Darnell & Mol, SPE J. 12 (1956) 20,
 * in the form of Tadmor & Klein, Engineering Principles of Plasticating
 * Extrusion (1970), ch. 8. Forces on the flights are taken at the mean
 * diameter D_mean = D_b - H; the root at D_s = D_b - 2H. */
#include "ow_solids.h"
#include "ow_const.h"

#include <math.h>
#include <stddef.h>

static enum ow_status check_in(const struct ow_solids_in *in, struct ow_diag *d)
{
	const struct ow_material *m = in->mat;
	double db;

	if (!in->screw || !m)
		return ow_diag_set(d, OW_EARG,
		                   "solids: screw and resin "
		                   "must be given");
	db = in->screw->diameter_m;
	if (!(isfinite(in->depth_m) && in->depth_m > 0.0 &&
	      2.0 * in->depth_m < db))
		return ow_diag_set(d, OW_EINPUT,
		                   "feed depth: %g mm must lie "
		                   "between 0 and the bore radius %g mm",
		                   in->depth_m * 1e3, db * 0.5e3);
	if (!(isfinite(in->rev_s) && in->rev_s > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "screw speed: %g rpm must be "
		                   "> 0",
		                   in->rev_s * 60.0);
	if (!(isfinite(m->bulk_density_kg_m3) && m->bulk_density_kg_m3 > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "bulk_density: %g kg/m3 must "
		                   "be > 0",
		                   m->bulk_density_kg_m3);
	if (!(isfinite(m->friction_barrel) && m->friction_barrel > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "friction_barrel: %g must be "
		                   "> 0",
		                   m->friction_barrel);
	if (!(isfinite(m->friction_screw) && m->friction_screw >= 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "friction_screw: %g must be "
		                   ">= 0",
		                   m->friction_screw);
	return OW_OK;
}

/* Tadmor & Klein (1970) ch. 8, the Darnell-Mol angle equation
 * cos(theta) = K sin(theta) + M with
 *   K  = (D_mean/D_b) (sin phi_m + f_s cos phi_m) / (cos phi_m - f_s sin phi_m)
 *   M1 = 2 (H/W_b)(f_s/f_b) sin phi_b (K + (D_mean/D_b) cot phi_m)
 *      + (W_s/W_b)(f_s/f_b) sin phi_b (K + (D_s/D_b) cot phi_s)
 *   M  = M1 + (W_m/W_b)(H/(f_b z_b)) sin phi_m (K + (D_mean/D_b) cot phi_m)
 *        ln(P2/P1)
 * The first M1 term is the pushing and trailing flights, the second the
 * screw root, the last the pressure rise along the plug. */
static void coefficients(const struct ow_solids_in *in, struct ow_solids *s)
{
	const struct ow_screw *sc = in->screw;
	double h = in->depth_m, db = sc->diameter_m;
	double dm = db - h, ds = db - 2.0 * h;
	double pb = ow_screw_helix(sc, db), pm = ow_screw_helix(sc, dm);
	double ps = ow_screw_helix(sc, ds);
	double wb = ow_screw_width(sc, db), wm = ow_screw_width(sc, dm);
	double ws = ow_screw_width(sc, ds);
	double fb = in->mat->friction_barrel, fs = in->mat->friction_screw;
	double k =
	    dm / db * (sin(pm) + fs * cos(pm)) / (cos(pm) - fs * sin(pm));
	double flight = k + dm / db / tan(pm);

	s->k = k;
	s->m1 = 2.0 * h / wb * fs / fb * sin(pb) * flight +
	        ws / wb * fs / fb * sin(pb) * (k + ds / db / tan(ps));
	s->mp_m = wm / wb * h / fb * sin(pm) * flight;
	s->area_m2 = OW_PI * h * (db - h) -
	             sc->flights * sc->flight_width_m * h / sin(pm);
	s->barrel_speed_m_s = OW_PI * db * in->rev_s;
	s->helix_rad = pb;
	s->width_m = wb;
	s->bulk_density_kg_m3 = in->mat->bulk_density_kg_m3;
	s->friction_barrel = fb;
}

enum ow_status ow_solids_prepare(const struct ow_solids_in *in,
                                 struct ow_solids *s, struct ow_diag *d)
{
	enum ow_status st = check_in(in, d);
	double dm, pm, ds;

	if (st != OW_OK)
		return st;
	dm = in->screw->diameter_m - in->depth_m;
	ds = dm - in->depth_m;
	pm = ow_screw_helix(in->screw, dm);
	if (cos(pm) - in->mat->friction_screw * sin(pm) <= 0.0)
		return ow_diag_set(d, OW_EINPUT,
		                   "friction_screw: %g is too "
		                   "high for a helix angle of %g deg at the "
		                   "mean diameter (flight force diverges)",
		                   in->mat->friction_screw, pm * 180.0 / OW_PI);
	if (ow_screw_width(in->screw, ds) <= 0.0)
		return ow_diag_set(d, OW_EINPUT,
		                   "flight_width: %g mm leaves "
		                   "no channel at the root of the feed "
		                   "section",
		                   in->screw->flight_width_m * 1e3);
	coefficients(in, s);
	if (!(s->area_m2 > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "feed section: free "
		                   "cross-section %g m2 is not positive",
		                   s->area_m2);
	return OW_OK;
}

/* theta = arccos(M / sqrt(1 + K^2)) - arctan(K), the root of
 * cos(theta) - K sin(theta) = M (Tadmor & Klein 1970, ch. 8). */
enum ow_status ow_solids_theta(const struct ow_solids *s, double ln_ratio,
                               double zb_m, double *theta_rad,
                               struct ow_diag *d)
{
	double m, r = sqrt(1.0 + s->k * s->k);

	if (!(zb_m > 0.0) || !isfinite(ln_ratio))
		return ow_diag_set(d, OW_EARG,
		                   "solids: pressure rise over "
		                   "z_b = %g m needs z_b > 0 and a finite "
		                   "ratio",
		                   zb_m);
	m = s->m1 + s->mp_m * ln_ratio / zb_m;
	if (fabs(m) > r)
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "solids: no conveying angle"
		                   " (M = %g, sqrt(1 + K^2) = %g): friction "
		                   "on the screw outweighs the barrel's",
		                   m, r);
	*theta_rad = acos(m / r) - atan(s->k);
	return OW_OK;
}

enum ow_status ow_solids_theta_free(const struct ow_solids *s,
                                    double *theta_rad, struct ow_diag *d)
{
	return ow_solids_theta(s, 0.0, 1.0, theta_rad, d);
}

/* V_pl = V_b tan(theta) tan(phi_b) / (tan(theta) + tan(phi_b)), written as
 * V_b sin(theta) sin(phi_b) / sin(theta + phi_b) so theta = pi/2 is finite
 * (Tadmor & Klein 1970, ch. 8). */
double ow_solids_plug_speed(const struct ow_solids *s, double theta_rad)
{
	double p = s->helix_rad;

	if (!(theta_rad > 0.0))
		return 0.0;
	return s->barrel_speed_m_s * sin(theta_rad) * sin(p) /
	       sin(theta_rad + p);
}

/* G = rho_b V_pl [pi H (D_b - H) - p e H / sin(phi_mean)]. */
double ow_solids_mass_flow(const struct ow_solids *s, double theta_rad)
{
	return s->bulk_density_kg_m3 * s->area_m2 *
	       ow_solids_plug_speed(s, theta_rad);
}

/* Inverse of the kinematics: with r = V_pl / V_b,
 * tan(theta) = r tan(phi_b) / (tan(phi_b) - r), valid for r < tan(phi_b). */
enum ow_status ow_solids_theta_for(const struct ow_solids *s, double g_kg_s,
                                   double *theta_rad, struct ow_diag *d)
{
	double tp = tan(s->helix_rad), r, gmax;

	if (!(isfinite(g_kg_s) && g_kg_s >= 0.0))
		return ow_diag_set(d, OW_EARG,
		                   "solids: mass flow %g kg/h must "
		                   "be >= 0",
		                   g_kg_s * 3600.0);
	r = g_kg_s / (s->bulk_density_kg_m3 * s->area_m2 * s->barrel_speed_m_s);
	if (r >= tp) {
		gmax = ow_solids_mass_flow(s, OW_PI / 2.0);
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "solids: mass flow %g kg/h "
		                   "reaches the feed section's kinematic "
		                   "limit %g kg/h",
		                   g_kg_s * 3600.0, gmax * 3600.0);
	}
	*theta_rad = atan2(r * tp, tp - r);
	return OW_OK;
}

/* beta = f_b W_b (cos(theta) - K sin(theta) - M1)
 *        / [W_mean H sin(phi_mean) (K + (D_mean/D_b) cot(phi_mean))]
 *      = (cos(theta) - K sin(theta) - M1) / mp   (Tadmor & Klein 1970,
 * ch. 8: the angle equation solved for ln(P2/P1) / z_b). */
double ow_solids_beta(const struct ow_solids *s, double theta_rad)
{
	return (cos(theta_rad) - s->k * sin(theta_rad) - s->m1) / s->mp_m;
}

double ow_solids_max_flow(const struct ow_solids *s)
{
	double theta;

	if (ow_solids_theta_free(s, &theta, NULL) != OW_OK || theta <= 0.0)
		return 0.0;
	return ow_solids_mass_flow(s, theta);
}

/* Seen from the barrel the plug moves at angle theta to the circumference
 * with axial speed V_pl, so |V_slip| = V_pl / sin(theta)
 * = V_b sin(phi_b) / sin(theta + phi_b); V_b when the plug stands still. */
double ow_solids_slip_speed(const struct ow_solids *s, double theta_rad)
{
	double p = s->helix_rad;

	if (!(theta_rad > 0.0))
		return s->barrel_speed_m_s;
	return s->barrel_speed_m_s * sin(p) / sin(theta_rad + p);
}

/* Coulomb friction f_b P on the barrel strip W_b sliding at V_slip. */
double ow_solids_barrel_power(const struct ow_solids *s, double theta_rad,
                              double pressure_Pa)
{
	return s->friction_barrel * pressure_Pa * s->width_m *
	       ow_solids_slip_speed(s, theta_rad);
}

enum ow_status ow_solids_eval(const struct ow_solids *s, double g_kg_s,
                              struct ow_solids_out *o, struct ow_diag *d)
{
	double theta;

	if (!(isfinite(g_kg_s) && g_kg_s >= 0.0))
		return ow_diag_set(d, OW_EARG,
		                   "solids: mass flow %g kg/h must "
		                   "be >= 0",
		                   g_kg_s * 3600.0);
	o->max_flow_kg_s = ow_solids_max_flow(s);
	if (ow_solids_theta_for(s, g_kg_s, &theta, NULL) != OW_OK)
		theta = OW_PI / 2.0; /* beyond the kinematic maximum */
	o->theta_rad = theta;
	o->beta_1_m = ow_solids_beta(s, theta);
	o->plug_speed_m_s = ow_solids_plug_speed(s, theta);
	o->slip_speed_m_s = ow_solids_slip_speed(s, theta);
	o->feed_limited = g_kg_s > o->max_flow_kg_s;
	return OW_OK;
}
