/* ow_melting.h - contiguous solids melting: the Tadmor model.
 *
 * A solid bed of width X (full channel depth H) lies against the pushing
 * flight and moves down-channel at constant speed V_sz; a melt film of
 * thickness delta separates it from the barrel, which drags the film melt
 * into the melt pool. Conduction from the barrel plus viscous heating in the
 * film melt the bed at omega = Phi sqrt(X) per unit down-channel length:
 * Tadmor, Polym. Eng. Sci. 6 (1966) 185; Tadmor & Klein, Engineering
 * Principles of Plasticating Extrusion (1970), ch. 9.
 *
 *   Phi   = { V_bx rho_m [k_m (T_b - T_m) + mu V_j^2 / 2]
 *             / (2 [C_s (T_m - T_s) + lambda]) }^(1/2)       kg/(s m^1.5)
 *   V_j^2 = V_b^2 + V_sz^2 - 2 V_b V_sz cos(phi_b)    barrel relative to bed
 *   d(rho_s V_sz H X)/dz = -Phi sqrt(X)                  bed mass balance
 *
 * Conventions: z is down-channel at the barrel bore (axial l = z sin phi_b);
 * everything SI; the melt leaves the film at T_m (the film carries no
 * convected heat in this model), so barrel heat + film dissipation = heat
 * into the bed = omega [C_s (T_m - T_s) + lambda] exactly.
 *
 * The step function is geometry-agnostic: the caller passes the depth and
 * width of the channel that holds the bed (in a barrier section: the solids
 * channel) and the barrel temperature at both ends of a step; they are taken
 * as linear in z within the step. Nothing here allocates or prints; all
 * calls are thread-safe. */
#ifndef OW_MELTING_H
#define OW_MELTING_H

#include "ow_material.h"
#include "ow_status.h"

/* Fixed for one melting zone at one trial mass flow. */
struct ow_melting_in {
	const struct ow_material *mat; /* rho_s, rho_m, k_m, C_s, lambda, T_m,
	                                  viscosity model */
	double barrel_speed_m_s;       /* V_b = pi D_b N */
	double helix_rad;      /* phi_b, helix angle at the barrel bore */
	double bed_speed_m_s;  /* V_sz, see ow_melting_bed_speed */
	double solid_temp_K;   /* T_s, bed core temperature (<= T_m) */
	double film_visc_Pa_s; /* > 0: fixed film viscosity; 0: the resin's
	                          model at gdot = V_j/delta, T = (T_b+T_m)/2 */
	const struct ow_visc_log *visc_log; /* optional: mat->visc in log form
	                            (ow_viscosity_log_init), filled once by the
	                            caller; the film iteration then works in
	                            ln mu (same film to round-off, fewer
	                            pow calls). NULL: ow_viscosity_eval */
};

/* Local geometry and wall at one end of a step. */
struct ow_melting_station {
	double depth_m;       /* H of the channel holding the bed */
	double width_m;       /* W of that channel: the bed's room */
	double barrel_temp_K; /* T_b */
};

/* The melt film at one place. Energy terms are per metre down-channel and
 * cover the film's width X; all zero where the bed is gone or T_b <= T_m. */
struct ow_melting_film {
	double slip_speed_m_s;  /* V_j, barrel relative to the bed */
	double film_m;          /* delta */
	double visc_Pa_s;       /* mu in the film */
	double phi;             /* Phi, kg/(s m^1.5) */
	double melt_rate_kg_sm; /* omega = Phi sqrt(X), kg/(s m) */
	double peak_temp_K;     /* film maximum (T_m if no film) */
	double barrel_heat_W_m; /* X (k/delta)[(T_b - T_m) - mu V_j^2/(2k)] */
	double dissipation_W_m; /* X mu V_j^2 / delta */
	double drive_power_W_m; /* X (mu V_j/delta) (V_b - V_sz cos phi) V_b:
	                           barrel shear along V_b times V_b; exceeds
	                           the dissipation by the work done pushing
	                           the bed down-channel */
	double bed_heat_W_m;    /* X (k/delta)[(T_b - T_m) + mu V_j^2/(2k)] */
};

/* Result of one step. Integrals are over the step (up to where the bed
 * vanished), by Simpson's rule. */
struct ow_melting_step_out {
	double bed_width_m;     /* X at the end of the step (0: all melted) */
	double sbr;             /* solid bed ratio X/W at the end */
	double solid_flow_kg_s; /* rho_s V_sz H X at the end; / G = unmelt */
	double melted_kg_s;     /* solid flow in minus solid flow out */
	double melted_at_m;     /* where in the step X reached 0 (0 if the bed
	                           was already gone); -1 while a bed is left */
	int plugged;            /* bed reached the channel width W and was held
	                           there: the channel compresses faster than
	                           the bed melts */
	struct ow_melting_film film; /* at the end of the step */
	double barrel_heat_W; /* integrals of the film terms over the step */
	double dissipation_W;
	double drive_power_W;
	double bed_heat_W;
};

/* V_sz = G / (rho_s H1 W1): the bed fills the channel (H1, W1) where melting
 * starts (Tadmor & Klein 1970, ch. 9). m/s; 0 for bad inputs. */
double ow_melting_bed_speed(const struct ow_material *m, double g_kg_s,
                            double depth_m, double width_m);

/* Check *in: resin given, V_b > 0, 0 < phi_b < pi/2, V_sz > 0,
 * T_s <= T_m, positive melt density, conductivity, latent + sensible heat,
 * film_visc >= 0. OW_EINPUT naming the field. */
enum ow_status ow_melting_validate(const struct ow_melting_in *in,
                                   struct ow_diag *d);

/* The film over a bed of width bed_width_m under a barrel at barrel_temp_K.
 * With the resin's model the film thickness and viscosity are iterated to
 * consistency. OW_ENOCONV if that iteration fails, OW_EINPUT via validate. */
enum ow_status ow_melting_film(const struct ow_melting_in *in,
                               double barrel_temp_K, double bed_width_m,
                               struct ow_melting_film *f, struct ow_diag *d);

/* Advance the bed width from bed_width_m at station a over dz_m to station
 * b (RK4 in sqrt(X), exact for constant depth and Phi). Finds where the bed
 * vanishes inside the step; holds X at W and sets plugged when the bed would
 * outgrow the channel. OW_EARG for dz <= 0, bed width < 0 or a
 * non-positive depth or width. */
enum ow_status ow_melting_step(const struct ow_melting_in *in,
                               const struct ow_melting_station *a,
                               const struct ow_melting_station *b, double dz_m,
                               double bed_width_m,
                               struct ow_melting_step_out *o,
                               struct ow_diag *d);

/* Peak of the Couette film profile between the bed at bed_temp_K (xi = 0)
 * and the barrel at barrel_temp_K (xi = 1) with viscous heating:
 * T = T_m + (T_b - T_m) xi + (mu V^2 / 2k) xi (1 - xi) (Bird, Stewart &
 * Lightfoot, Transport Phenomena, 2nd ed. 2002, section 10.4). K. */
double ow_melting_film_peak(double bed_temp_K, double barrel_temp_K,
                            double visc_Pa_s, double speed_m_s, double k_W_mK);

/* Closed forms for a bed with constant Phi and V_sz (Tadmor & Klein 1970,
 * ch. 9). sbr0 is X/W where they start (1: the bed fills the channel).
 * Constant depth H: psi_c = Phi / (rho_s V_sz H sqrt(W)) (1/m),
 *   X/W = (sqrt(sbr0) - psi_c z / 2)^2, length Z_T = 2 sqrt(sbr0) / psi_c. */
double ow_melting_psi_const(double phi, double rho_s_kg_m3,
                            double bed_speed_m_s, double depth_m,
                            double width_m);
double ow_melting_sbr_const(double psi_c_1_m, double sbr0, double z_m);
double ow_melting_length_const(double psi_c_1_m, double sbr0);

/* Linear taper H = H1 - A z (A > 0, dimensionless), constant W:
 * psi_t = Phi / (rho_s V_sz sqrt(W)) (dimensionless),
 *   X/W = [psi_t/A - (psi_t/A - sqrt(sbr0)) sqrt(H1/H)]^2 (0 once melted),
 *   Z_T = (H1 u/psi_t)(2 - A u/psi_t), u = sqrt(sbr0);
 * Z_T is INFINITY when the bed never melts in the taper. The sbr may exceed
 * 1: the bed widens beyond the channel (plugging). */
double ow_melting_psi_taper(double phi, double rho_s_kg_m3,
                            double bed_speed_m_s, double width_m);
double ow_melting_sbr_taper(double psi_t, double taper, double sbr0,
                            double h1_m, double z_m);
double ow_melting_length_taper(double psi_t, double taper, double sbr0,
                               double h1_m);

/* Tadmor's plugging criterion for a bed filling the channel at the start of
 * a taper: psi_t <= A, the channel compresses faster than the bed melts. */
int ow_melting_taper_plugs(double psi_t, double taper);

#endif
