/* ow_die.h - the die characteristic: pressure the die needs to pass a mass
 * flow of melt at a given temperature, for the die geometries of ow_line.h
 * (struct ow_die) and for a die known only by one measured operating point.
 *
 * Geometric dies are evaluated as generalised Newtonian flows: the
 * viscosity is taken at the true wall shear rate of the power-law solution
 * (the Rabinowitsch correction, Rabinowitsch 1929), with the local
 * power-law index n = 1 + dln(eta)/dln(gdot) of the resin at that rate and
 * temperature, iterated until rate and index agree (Bird, Armstrong &
 * Hassager, Dynamics of Polymeric Liquids, vol. 1, 2nd ed., 1987, ch. 4).
 * For a Newtonian or power-law resin this is exact. Entrance and exit losses
 * are not included.
 *
 * Everything SI; pure functions, thread-safe, nothing allocated. */
#ifndef OW_DIE_H
#define OW_DIE_H

#include "ow_line.h"
#include "ow_material.h"
#include "ow_status.h"

/* Length-to-diameter ratio of the capillary assumed to stand in for a
 * measured die whose geometry is unknown (order of magnitude of extrusion
 * die lands, common practice). Only its wall shear rate level matters, and
 * for a power-law resin not even that. */
#define OW_DIE_MEASURED_LD 10.0

/* Pressure drop dp_Pa the die needs for mass_flow_kg_s (melt density of m)
 * at melt temperature temp_K.
 * - circle: pi R^3 Q relation of the power law at the local index;
 * - slit: wide-slit relation with the flow divided by the finite-width
 *   factor F_p(gap/width) (exact for a Newtonian melt);
 * - annulus: slit relation with W = pi (R_o + R_i), h = R_o - R_i, divided
 *   by the exact Newtonian annulus/slit flow ratio (ow_die_annulus_factor),
 *   at every radius ratio: exact for a Newtonian melt, within about 1 % of
 *   the power-law annulus for kappa >= 0.5 (the ratio is 1.00787 there);
 * - measured: dp = dp_meas (Q/Q_meas) eta(gdot(Q), T)/eta(gdot_meas,
 *   T_meas) with the wall shear rate proportional to the flow (geometry
 *   unknown: a capillary-equivalent die). gdot_meas is the wall shear rate
 *   of a capillary of die->diameter_m if that is > 0, otherwise of a
 *   capillary with L/D = OW_DIE_MEASURED_LD passing the measured point.
 * A negative flow gives the negative of the drop for the positive one.
 * OW_EINPUT for bad dimensions (naming the field), OW_ENOCONV if the
 * rate/index iteration fails, OW_ECOMPUTE for a non-finite viscosity. */
enum ow_status ow_die_pressure(const struct ow_die *die,
                               const struct ow_material *m,
                               double mass_flow_kg_s, double temp_K,
                               double *dp_Pa, struct ow_diag *d);

/* The die's true wall shear rate (1/s) at the same conditions (the slit
 * value for an annulus). */
enum ow_status ow_die_wall_shear_rate(const struct ow_die *die,
                                      const struct ow_material *m,
                                      double mass_flow_kg_s, double temp_K,
                                      double *gdot_1_s, struct ow_diag *d);

/* Dimensions of the die for its type positive (annulus: inner < outer;
 * measured: pressure, output and temperature positive). OW_EINPUT naming
 * "die.<field>". */
enum ow_status ow_die_check(const struct ow_die *die, struct ow_diag *d);

/* ---- pure formulas (m^3/s from a pressure drop dp_Pa) ------------------ */

/* Newtonian (Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. 2002,
 * ch. 2: section 2.3 tube, 2.4 annulus, the slit by the same balance):
 *   circle   Q = pi R^4 dp / (8 mu L)
 *   slit     Q = W h^3 dp / (12 mu L)  (times F_p(h/W) when edges != 0)
 *   annulus  Q = pi dp/(8 mu L) [Ro^4 - Ri^4 - (Ro^2 - Ri^2)^2/ln(Ro/Ri)] */
double ow_die_newtonian_flow_circle(double radius_m, double length_m,
                                    double visc_Pa_s, double dp_Pa);
double ow_die_newtonian_flow_slit(double width_m, double gap_m, double length_m,
                                  double visc_Pa_s, double dp_Pa, int edges);
double ow_die_newtonian_flow_annulus(double outer_radius_m,
                                     double inner_radius_m, double length_m,
                                     double visc_Pa_s, double dp_Pa);

/* Exact Newtonian annulus flow over the slit approximation (W = pi(Ro+Ri),
 * h = Ro - Ri) at the same pressure drop, for kappa = Ri/Ro in (0, 1). */
double ow_die_annulus_factor(double kappa);

/* Power law tau = m gdot^n (Bird, Armstrong & Hassager 1987, ch. 4):
 *   circle  Q = (pi n R^3/(3n+1)) (R dp/(2 m L))^(1/n)
 *   slit    Q = (n W h^2/(2(2n+1))) (h dp/(2 m L))^(1/n) */
double ow_die_powerlaw_flow_circle(double radius_m, double length_m,
                                   double consistency_Pa_sn, double index,
                                   double dp_Pa);
double ow_die_powerlaw_flow_slit(double width_m, double gap_m, double length_m,
                                 double consistency_Pa_sn, double index,
                                 double dp_Pa);

#endif
