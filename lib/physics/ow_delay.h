/* ow_delay.h - the delay zone between solids conveying and Tadmor melting
 * (Kacir & Tadmor, "Solids conveying in screw extruders. Part III: the
 * delay zone", Polym. Eng. Sci. 12 (1972) 387; Tadmor & Klein,
 * Engineering Principles of Plasticating Extrusion, 1970).
 *
 * The solid plug slides along the barrel at the bed speed V_sz; a plug
 * element touches the barrel for t = z / V_sz. It is taken as a
 * semi-infinite solid (the heated layer stays thin against the channel
 * depth) in full contact with the barrel bore. With an ideal wall its
 * surface takes the wall temperature T_c at once and its interior follows
 * the erfc solution (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd
 * ed. 1959, section 2.4); with a heat-transfer coefficient h between the
 * wall's controlled temperature and the bore, the surface rises as
 *   T_s = T_0 + (T_c - T_0) [1 - exp(beta^2) erfc(beta)],
 *   beta = h sqrt(alpha t) / k_s          (Carslaw & Jaeger section 2.7),
 * both superposed over the steps of T_c (Duhamel). The barrel friction
 * work goes into the wall, which the zone holds at its temperature.
 *
 * Once the plug surface reaches the melting point T_m it melts: a
 * melt film of thickness s grows between the barrel (T_b) and the solid
 * (T_m), fed by conduction and the film's viscous heating (the Couette
 * film of Tadmor's model) and drained by conduction into the solid:
 *   rho_m [lambda + c_m (T_b - T_m)/3] ds/dt
 *       = [k_m (T_b - T_m) + mu V_j^2 / 2] / s - q_s(t)
 * (the bracket adds the heat the film stores, which makes the film exact
 * to first order in the Stefan number c_m (T_b - T_m)/lambda against
 * Neumann's solution, Carslaw & Jaeger section 11.2; the film melt leaves
 * at T_m + (T_b - T_m)/3; q_s is the erfc flux into a solid held at T_m,
 * its age chosen so its heat content is kept). Through a wall coefficient
 * the bore temperature over the film follows from the film's own balance.
 * While the film is thinner than the flight
 * clearance the flight passes over it and no melt pool forms; the delay
 * zone ends where it reaches the clearance (Kacir & Tadmor 1972 found the
 * film several clearances thick there: this end is the earliest).
 *
 * Everything SI, per unit area of barrel contact. Nothing allocates or
 * prints; a state belongs to one march. */
#ifndef OW_DELAY_H
#define OW_DELAY_H

#include "ow_material.h"
#include "ow_status.h"

#define OW_DELAY_STEPS 16 /* wall steps kept; later ones join the last */

struct ow_delay {
	const struct ow_material *mat;
	double feed_K; /* T_0, the plug entering */
	double t_s;    /* contact time so far */
	double wall_h; /* wall -> bore heat-transfer coefficient (0:
	                  ideal), W/(m^2 K) */
	double wall_K; /* wall temperature now (the last step's end) */
	int n;         /* steps of the wall temperature so far */
	double at_s[OW_DELAY_STEPS];   /* when each step happened */
	double step_K[OW_DELAY_STEPS]; /* its size */
	int film;                      /* 1 once the surface melts */
	double film_m;                 /* melt film thickness s */
	double age0_s;   /* film phase: equivalent age of the solid when the
	                    film formed (same heat as its real history) */
	double film_t_s; /* contact time when the film formed */
	double film_K;   /* mean temperature of the film melt, K */
};

/* Results of one step of contact time, per unit area of contact. */
struct ow_delay_out {
	double heat_J_m2;   /* heat into the plug and its film */
	double dissip_J_m2; /* viscous heating in the film (drive power) */
	double peak_K;      /* film maximum (NAN before a film forms) */
	double done_s;      /* time into the step at which the film reached
	                       the clearance; -1 while it has not */
};

/* Start a plug of resin m entering at feed_K (at or below the melting
 * point). */
void ow_delay_start(struct ow_delay *z, const struct ow_material *m,
                    double feed_K);

/* Advance the plug by dt_s of contact under a wall controlled at wall_K
 * with heat-transfer coefficient wall_h to the bore (0: an ideal wall), the
 * barrel sliding past at slip_m_s, a flight clearance clearance_m (<= 0:
 * the pool forms with the film). OW_EARG for dt <= 0 or non-finite
 * inputs. */
enum ow_status ow_delay_advance(struct ow_delay *z, double wall_K,
                                double wall_h_W_m2K, double slip_m_s,
                                double clearance_m, double dt_s,
                                struct ow_delay_out *o, struct ow_diag *d);

/* Surface temperature of the plug now (T_m once it melts), K. */
double ow_delay_surface(const struct ow_delay *z);

/* Temperature of the solid at depth_m below its surface now: T_0 +
 * sum_k dT_k erfc(y / (2 sqrt(alpha (t - t_k)))), alpha = k_s/(rho_s c_s);
 * in the film phase the solid under the film, surface at T_m. K. */
double ow_delay_temp(const struct ow_delay *z, double depth_m);

/* Heat conducted into the solid so far, J/m^2: sum_k 2 dT_k sqrt(k_s rho_s
 * c_s (t - t_k) / pi) (Carslaw & Jaeger section 2.4). */
double ow_delay_solid_heat(const struct ow_delay *z);

/* The plug handed to the melting stage in a channel depth_m deep holding
 * heat_J_m2 per unit area of contact (what went into it, per unit mass
 * times the bed's mass per unit area there: the channel may have become
 * shallower since the heat went in): the share of its mass already melt
 * (the film, more where the solid would pass T_m, at most one half), the
 * mean temperature of the solid left (at most T_m) and of the melt. The
 * three hold exactly heat_J_m2 (enthalpy from T_0: c_s below T_m, lambda,
 * c_m above). */
void ow_delay_bed(const struct ow_delay *z, double depth_m, double heat_J_m2,
                  double *melt_frac, double *bed_K, double *melt_K);

#endif
