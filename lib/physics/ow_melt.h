/* ow_melt.h - melt conveying in the unwound screw channel: flight-edge shape
 * factors, the exact power-law drag/pressure flow, leakage over the flight
 * clearance, and the station solver that resolves velocity and temperature
 * across the channel depth for a generalised Newtonian melt.
 *
 * Frame and signs (Tadmor & Klein, Engineering Principles of Plasticating
 * Extrusion, 1970, ch. 7; Tadmor & Gogos, Principles of Polymer Processing,
 * 2nd ed., 2006, ch. 6): screw at rest, barrel moving at V_b with a
 * down-channel component V_bz and a cross-channel component V_bx >= 0
 * (toward the pushing flight). y runs from the screw root (0) to the barrel
 * (H). dP/dz > 0 means pressure rising toward the die. Everything SI.
 *
 * The station solver works on an infinite-width channel and applies the
 * flight edges by the substitution that is exact for a Newtonian melt:
 * barrel speed V_bz F_d/F_p and flow per unit width Q/(W F_p) (Tadmor &
 * Klein 1970, ch. 7); for a shear-thinning melt this is an approximation.
 *
 * Thread safety: the pure functions are reentrant; a workspace belongs to
 * one thread at a time. Nothing here prints or allocates after create. */
#ifndef OW_MELT_H
#define OW_MELT_H

#include "ow_material.h"
#include "ow_status.h"

/* ---- flight-edge shape factors ----------------------------------------- */

/* Drag and pressure flow shape factors of a rectangular channel of depth H
 * and width W, as functions of h = H/W > 0 (Rowell & Finlayson, Engineering,
 * 1922; the series as used by Tadmor & Klein 1970, ch. 7):
 *   F_d = (16/(pi^3 h)) sum_{i odd} tanh(i pi h/2) / i^3
 *   F_p = 1 - (192 h/pi^5) sum_{i odd} tanh(i pi/(2h)) / i^5
 * Summed to full double precision. Both -> 1 as h -> 0; NAN for h <= 0. */
double ow_melt_shape_fd(double h_over_w);
double ow_melt_shape_fp(double h_over_w);

/* Barrel speed that drags as much as a side wall of the channel (depth H,
 * width W) sliding down-channel at wall_speed, e.g. the solid bed beside
 * the melt pool: V_s F_d(W/H)/F_d(H/W) (Rowell & Finlayson's drag solution
 * with width and depth exchanged; exact for a Newtonian melt, whose drag
 * flows add). m/s; NAN for a non-positive depth or width. */
double ow_melt_side_drag_speed(double depth_m, double width_m,
                               double wall_speed_m_s);

/* ---- power-law drag + pressure flow (exact) ---------------------------- */

/* Combined drag and pressure flow of a power-law fluid (tau = m gdot^n)
 * between a fixed wall and one moving at V, depth H, pressure gradient G:
 * Lambda = G H^(n+1) / (m V^n). Returns the dimensionless flow per unit width
 * qhat = Q/(W H V) and the dimensionless root shear stress
 * tau0hat = tau(0)/(m (V/H)^n). The shear stress is linear across the depth,
 * so the velocity integrals are closed forms; the wall-speed condition is
 * solved for tau0hat by bisection (it is monotone). Newtonian check:
 * qhat = 1/2 - Lambda/12. OW_EARG for n outside (0, 1.5] or a non-finite
 * Lambda. Either output pointer may be NULL. */
enum ow_status ow_melt_powerlaw_qhat(double n, double lambda, double *qhat,
                                     double *tau0hat);

/* ---- leakage over the flight clearance --------------------------------- */

/* Flux over unit length of flight land, m^2/s: barrel drag across the land
 * plus pressure flow through the gap (Tadmor & Klein 1970, ch. 7):
 *   q_f = V_bx delta/2 + delta^3 dP_land / (12 mu_f e)
 * with dP_land the pressure difference between the two faces of the flight
 * (cross-channel rise plus the down-channel difference), mu_f the melt
 * viscosity in the clearance, e the land width. Positive = backward (into
 * the upstream turn). 0 when delta <= 0. */
double ow_melt_leak_flux(double vbx_m_s, double clearance_m, double dp_land_Pa,
                         double visc_Pa_s, double flight_width_m);

/* Viscous heating in the clearance per unit flight length, W/m: Couette
 * shear at the full barrel speed, mu_f (V_b/delta)^2 delta e. 0 when
 * delta <= 0. */
double ow_melt_leak_heat(double vb_m_s, double clearance_m, double visc_Pa_s,
                         double flight_width_m);

/* ---- fluted barrier mixer -------------------------------------------- */

/* Flow of q_m3_s over n_lands barrier lands of a fluted mixer, each of
 * length_m along the section, land width e (in the flow direction), gap
 * g over the land, the barrel moving across the land at vb_m_s, melt
 * viscosity mu (Tadmor & Gogos, Principles of Polymer Processing, 2nd ed.
 * 2006, ch. 10; Rauwendaal, Polymer Extrusion, barrier-flight flow). Per
 * unit land length, plane Couette-Poiseuille flow through the gap (Bird,
 * Stewart & Lightfoot, Transport Phenomena, 2nd ed. 2002, ch. 2 and section
 * 10.4):
 *   q = Q / (n L) = V g/2 - g^3 dP / (12 mu e)
 *   => dP = 12 mu e (V g/2 - q) / g^3   (rise across a land; > 0: the
 *                                       mixer pumps)
 *   heat  = n L e [mu V^2/g + g^3 (dP/e)^2 / (12 mu)]  (the cross term of
 *           the two flows integrates to zero across the gap)
 *   power = heat + Q dP                  (barrel shear stress times V)
 * Newtonian forms; for a shear-thinning melt mu is taken at the gap's
 * Couette shear rate V/g. Every output NAN for a non-positive gap, land
 * length, land count or viscosity. */
struct ow_mixer_land {
	double dp_Pa;     /* pressure rise across the lands */
	double heat_W;    /* viscous heating in all the land gaps */
	double power_W;   /* barrel work on the land gaps */
	double shear_1_s; /* Couette shear rate in the gap, V/g */
};
void ow_melt_mixer_land(double q_m3_s, double n_lands, double length_m,
                        double gap_m, double land_width_m, double vb_m_s,
                        double visc_Pa_s, struct ow_mixer_land *out);

/* Local power-law index n = 1 + dln(eta)/dln(gdot) of the resin's model at
 * shear rate gdot_1_s and temp_K (central difference in ln gdot). */
double ow_melt_local_index(const struct ow_viscosity *v, double gdot_1_s,
                           double temp_K);

/* ---- the station solver ------------------------------------------------ */

struct ow_melt_ws; /* per-thread workspace: profiles, band temperatures */

/* Create a workspace for depth_nodes nodes across the depth (>= 5; the
 * depth is split into depth_nodes - 1 equal cells, each with one
 * viscosity) and `bands` temperature bands (>= 2). Band temperatures start
 * at 0 K: call ow_melt_reset before the first step. The caller owns *out and
 * frees it with ow_melt_destroy. OW_EARG for bad sizes, OW_ENOMEM. */
enum ow_status ow_melt_create(int depth_nodes, int bands,
                              struct ow_melt_ws **out, struct ow_diag *d);

/* Free a workspace; NULL-safe. */
void ow_melt_destroy(struct ow_melt_ws *ws);

/* Multiply the velocity solve's tolerances by scale > 0 (1 on create). */
void ow_melt_tolerance(struct ow_melt_ws *ws, double scale);

/* One station of one channel. The lead computes the kinematics from the
 * screw (Tadmor & Klein 1970): V_b = pi D_b N, V_bz = V_b cos phi_b,
 * V_bx = V_b sin phi_b. */
struct ow_melt_cond {
	const struct ow_material *mat; /* melt density, cp, k, viscosity */
	double depth_m;                /* H of the channel carrying melt */
	double width_m;                /* W of that channel (> 0) */
	int infinite_width;            /* 1: F_d = F_p = 1 (no flight edges);
	                                  width_m still scales per-length
	                                  quantities */
	double vbz_m_s;                /* barrel down-channel speed */
	double vbx_m_s;                /* barrel cross-channel speed, >= 0 */
	double vb_m_s;                 /* barrel speed (clearance shear) */
	double vol_flow_m3_s;          /* net melt flow Q of this channel */
	double barrel_K;               /* barrel wall temperature */
	int root_adiabatic;            /* 1: no heat through the screw root */
	double root_K;                 /* root temperature when not adiabatic */
	double clearance_m;            /* radial flight clearance; 0: none */
	double flight_width_m;         /* land width e (leakage) */
	double leak_bypass_m;          /* flight length over which the leak
	                                  bypasses one channel cross-section:
	                                  pi D_b cos(phi_b) for one flight;
	                                  also the down-channel distance
	                                  between the two faces of a flight */
	double leak_flight_len_per_z;  /* flight land length beside unit
	                                  down-channel length (1 for an
	                                  ordinary channel) for the clearance
	                                  heating */
	double wall_h_W_m2K;           /* heat-transfer coefficient between
	                                  the barrel's control point (at
	                                  barrel_K) and its inner surface,
	                                  per unit area of melt on the
	                                  barrel; 0: ideal wall (the inner
	                                  surface at barrel_K) */
};

/* Results of one station (per unit down-channel length of this channel).
 * With dz > 0 the step conserves energy exactly:
 *   rho c_p Q (bulk_after - bulk_before) = (dissipation + barrel_heat
 *                                           + root_heat) dz
 * and always power = dissipation + Q dP/dz (Tadmor & Klein 1970, ch. 7). */
struct ow_melt_out {
	double dpdz_Pa_m;         /* down-channel pressure gradient G */
	double dpdx_Pa_m;         /* cross-channel pressure gradient */
	double bulk_K;            /* flow-weighted mean of the bands */
	double peak_K;            /* hottest band */
	double power_W_m;         /* drive power: barrel-wall stress times
	                             barrel speed (effective speeds) plus
	                             clearance shear */
	double barrel_heat_W_m;   /* heat barrel -> melt (< 0: melt cooled) */
	double root_heat_W_m;     /* heat root -> melt */
	double dissipation_W_m;   /* channel + clearance viscous heating, plus
	                             the pressure work G Q_L the leak flow
	                             releases falling back over the flight */
	double leak_flow_m3_s;    /* Q_L, backward over the flight */
	double channel_flow_m3_s; /* Q + Q_L carried down the channel */
	double tau_barrel_z_Pa;   /* barrel-wall shear stress, down-channel */
	double tau_barrel_x_Pa;   /* barrel-wall shear stress, cross-channel */
	double max_shear_1_s;     /* largest shear-rate magnitude in depth */
	double fd, fp;            /* shape factors used */
	int q_floor_used;         /* a band's flow was floored (back flow) */
	int circulating;          /* 1: bands on cross-channel streamlines;
	                             0: plain depth layers (V_bx = 0) */
	int iterations;           /* Newton iterations of the velocity solve */
};

/* Set every band to temp_K (e.g. melt entering from the melting zone at its
 * bulk temperature) and forget the viscosity warm start. */
void ow_melt_reset(struct ow_melt_ws *ws, double temp_K);

/* Solve the velocity profiles at the station (one viscosity per depth
 * cell, at its midpoint's shear-rate magnitude and the temperature of the
 * band holding the midpoint, solved by Newton's method warm-started from
 * the previous call), then, when dz_m > 0, advance the band temperatures
 * over dz_m by one implicit step (dz_m = 0: pressure gradient and heat
 * terms only, temperatures untouched; only a switch between circulating
 * and layered bands, i.e. V_bx becoming 0 or not, re-maps them by depth).
 * The clearance viscosity is taken at V_b/delta and the mean of the barrel
 * and outer-band temperatures; its heat goes to the band at the barrel. OW_EARG
 * for bad conditions (names the field), OW_ENOCONV when the velocity iteration
 * fails, OW_ECOMPUTE for a non-finite viscosity or, with dz > 0, a net flow Q
 * <= 0. On failure the band temperatures are unchanged. */
enum ow_status ow_melt_step(struct ow_melt_ws *ws, const struct ow_melt_cond *c,
                            double dz_m, struct ow_melt_out *out,
                            struct ow_diag *d);

/* Melt joining the channel: every band becomes (1 - frac) T + frac temp_K,
 * i.e. the inflow spreads in proportion to the bands' flow, which keeps the
 * flow-weighted enthalpy exact (frac = inflow / flow after joining). */
void ow_melt_mix(struct ow_melt_ws *ws, double frac, double temp_K);

/* Raise every band by dT_K (heat added uniformly, e.g. a mixing element). */
void ow_melt_heat(struct ow_melt_ws *ws, double dT_K);

/* One step of dz_m > 0 through a mixing section: the melt keeps the band
 * layout and band flows of the last conveying station (the flutes, open to
 * the barrel, carry it as the channel before them did), gains heat_W_m per
 * unit down-channel length spread over the bands in proportion to their
 * flow (every particle crosses a land, where the Couette shear heating is
 * uniform across the gap: Bird, Stewart & Lightfoot 2002, section 10.4),
 * and exchanges heat with the barrel (through wall_h_W_m2K) and the root
 * like any station. Without a previous station the bands are equal depth
 * layers of depth_m. Fills bulk_K, peak_K, barrel_heat_W_m, root_heat_W_m
 * and dissipation_W_m (= heat_W_m) of *out; energy is conserved exactly
 * as in ow_melt_step. Errors as ow_melt_step. */
enum ow_status ow_melt_mixer_step(struct ow_melt_ws *ws,
                                  const struct ow_melt_cond *c, double dz_m,
                                  double heat_W_m, struct ow_melt_out *out,
                                  struct ow_diag *d);

/* Copy the whole state of src (band temperatures, layout, warm start) into
 * dst, created with the same sizes; for restarting a stretch of a march. */
void ow_melt_copy(struct ow_melt_ws *dst, const struct ow_melt_ws *src);

/* Flow-weighted bulk and peak band temperature now, K. */
double ow_melt_bulk(const struct ow_melt_ws *ws);
double ow_melt_peak(const struct ow_melt_ws *ws);

/* Profiles of the last solved station on the depth nodes (root first),
 * borrowed from the workspace and valid until its next step or destroy.
 * Velocities are those of the equivalent infinite-width channel (barrel
 * speed V_bz F_d/F_p). */
struct ow_melt_profile {
	int nodes;
	const double *y_m;         /* node depth from the root */
	const double *uz_m_s;      /* down-channel velocity */
	const double *ux_m_s;      /* cross-channel velocity */
	const double *shear_1_s;   /* shear-rate magnitude */
	const double *dissip_W_m3; /* eta gdot^2 */
	const double *visc_Pa_s;   /* viscosity */
	const double *temp_K;      /* temperature of the node's band */
};
void ow_melt_profile(const struct ow_melt_ws *ws, struct ow_melt_profile *p);

/* Number of bands, and band k's (0-based; 0 next to the circulation centre,
 * bands-1 at the walls) two legs [lo0, hi0] (below the centre) and
 * [lo1, hi1] (above) in m from the root, from the last solved station. In
 * layer mode (no circulation) band k is the single layer [lo0, hi0], root
 * first, and lo1 = hi1. */
int ow_melt_bands(const struct ow_melt_ws *ws);
void ow_melt_band_legs(const struct ow_melt_ws *ws, int k, double legs[4]);
double ow_melt_band_temp(const struct ow_melt_ws *ws, int k);

/* Depth (m) on the other side of the circulation centre lying on the same
 * cross-channel streamline as depth y_m (equal stream function), from the
 * last solved station (Mohr, Saxton & Jepson, Ind. Eng. Chem., 1957).
 * OW_ECOMPUTE when the station has no circulation. */
enum ow_status ow_melt_partner(const struct ow_melt_ws *ws, double y_m,
                               double *partner_m);

#endif
