/* ow_solids.h - solids conveying in a flood-fed feed section.
 *
 * A rigid plug of pellets at bulk density moves down the feed channel, pushed
 * by Coulomb friction at the barrel and held back by friction at the screw
 * root and flights: Darnell & Mol, "Solids conveying in extruders", SPE J. 12
 * (1956) 20, in the form of Tadmor & Klein, Engineering Principles of
 * Plasticating Extrusion (1970), ch. 8.
 *
 * theta is the conveying angle: the angle between the plug's velocity as seen
 * from the barrel and the circumferential direction. theta fixes the plug's
 * axial speed and so the mass flow; the force and torque balance on the plug
 *     cos(theta) = K sin(theta) + M
 * fixes theta for a given pressure rise, or, for a theta set by the demanded
 * mass flow, the rate beta of the exponential pressure rise
 *     P(z_b) = P1 exp(beta z_b),
 * z_b measured down-channel at the barrel bore (axially: l = z_b sin phi_b).
 *
 * Usage: fill struct ow_solids_in, call ow_solids_prepare once per screw,
 * speed and resin; every other call reads the prepared plain struct, never
 * allocates and never prints, so one struct may be shared between threads. */
#ifndef OW_SOLIDS_H
#define OW_SOLIDS_H

#include "ow_material.h"
#include "ow_screw.h"
#include "ow_status.h"

struct ow_solids_in {
	const struct ow_screw *screw;  /* bore, lead, flights, land width */
	double depth_m;                /* feed channel depth H */
	double rev_s;                  /* screw speed N, rev/s */
	const struct ow_material *mat; /* bulk density, friction f_b, f_s */
};

/* Coefficients derived from ow_solids_in (transparent; read-only use). */
struct ow_solids {
	double k;                /* K of the angle equation, - */
	double m1;               /* M for no pressure rise (flight + root), - */
	double mp_m;             /* M = m1 + mp_m ln(P2/P1) / z_b; m */
	double area_m2;          /* free cross-section normal to the axis */
	double barrel_speed_m_s; /* V_b = pi D_b N */
	double helix_rad;        /* phi_b, helix angle at the bore */
	double width_m;          /* W_b, channel width at the bore */
	double bulk_density_kg_m3;
	double friction_barrel; /* f_b, - */
};

/* Everything the solver needs for one trial mass flow. */
struct ow_solids_out {
	double theta_rad;      /* conveying angle delivering G (pi/2 if none) */
	double beta_1_m;       /* pressure rise rate per down-channel metre */
	double plug_speed_m_s; /* axial plug speed V_pl */
	double slip_speed_m_s; /* barrel speed relative to the plug */
	double max_flow_kg_s;  /* feed limit: G at zero pressure gradient */
	int feed_limited;      /* G > max_flow: the plug pressure would fall */
};

/* Check the inputs and compute the coefficients into *s. Rejects (OW_EINPUT,
 * message naming the field) a depth outside 0 < H < D_b/2, a speed <= 0, a
 * bulk density <= 0, f_b <= 0, f_s < 0, no channel left between the flights,
 * or a screw friction so high that the flight force diverges
 * (cos phi_mean <= f_s sin phi_mean). */
enum ow_status ow_solids_prepare(const struct ow_solids_in *in,
                                 struct ow_solids *s, struct ow_diag *d);

/* Conveying angle (rad) for a pressure rise P2/P1 = exp(ln_ratio) over the
 * down-channel barrel length zb_m > 0. May be <= 0: the plug does not convey.
 * OW_ECOMPUTE when the angle equation has no root (|M| > sqrt(1 + K^2)). */
enum ow_status ow_solids_theta(const struct ow_solids *s, double ln_ratio,
                               double zb_m, double *theta_rad,
                               struct ow_diag *d);

/* Conveying angle with no pressure rise (P2 = P1): the zero-gradient angle. */
enum ow_status ow_solids_theta_free(const struct ow_solids *s,
                                    double *theta_rad, struct ow_diag *d);

/* Axial plug speed (m/s) and mass flow (kg/s) at angle theta; both 0 for
 * theta <= 0 (no conveying). theta = pi/2 is the kinematic maximum. */
double ow_solids_plug_speed(const struct ow_solids *s, double theta_rad);
double ow_solids_mass_flow(const struct ow_solids *s, double theta_rad);

/* Angle delivering the mass flow G (kg/s, >= 0). OW_ECOMPUTE when G reaches
 * the kinematic maximum (rho_b A V_b tan phi_b); OW_EARG for G < 0. */
enum ow_status ow_solids_theta_for(const struct ow_solids *s, double g_kg_s,
                                   double *theta_rad, struct ow_diag *d);

/* Pressure rise rate beta (1/m of down-channel barrel length) at angle theta;
 * negative when the plug cannot hold its pressure at that flow. */
double ow_solids_beta(const struct ow_solids *s, double theta_rad);

/* Feed limit: the largest mass flow (kg/s) delivered without the plug
 * pressure falling, the flow at the zero-gradient angle; 0 if the plug does
 * not convey at all. */
double ow_solids_max_flow(const struct ow_solids *s);

/* Speed of the barrel relative to the plug (m/s) at angle theta. */
double ow_solids_slip_speed(const struct ow_solids *s, double theta_rad);

/* Friction power at the barrel-plug interface per metre of down-channel
 * barrel length, f_b P W_b V_slip (W/m), at plug pressure pressure_Pa. All of
 * it is drive power turned into heat at the barrel wall. */
double ow_solids_barrel_power(const struct ow_solids *s, double theta_rad,
                              double pressure_Pa);

/* One trial mass flow G (kg/s, >= 0): angle, pressure rise rate, speeds and
 * the feed-limit flag. A G beyond the feed limit is not an error: *o says
 * feed_limited (and, beyond the kinematic maximum, theta = pi/2). OW_EARG for
 * a negative or non-finite G. */
enum ow_status ow_solids_eval(const struct ow_solids *s, double g_kg_s,
                              struct ow_solids_out *o, struct ow_diag *d);

#endif
