/* ow_solver.h - one operating point: march from the hopper to the screw tip
 * through solids conveying (Darnell & Mol 1956), melting (Tadmor 1966;
 * Tadmor & Klein 1970) and depth-resolved melt conveying, and find the
 * throughput at which the pressure the screw builds equals what the die and
 * screen pack need (screw-die matching, Tadmor & Gogos 2006, ch. 9).
 *
 * A solver object is a per-thread workspace: create one per thread, share
 * the (read-only) study between threads. */
#ifndef OW_SOLVER_H
#define OW_SOLVER_H

#include "ow_study.h"
#include "ow_status.h"

/* Flags of a solved point (bits). */
#define OW_FLAG_FEED_LIMITED  0x01u /* feed section cannot supply the rate */
#define OW_FLAG_PLUGGING      0x02u /* solid bed filled the channel */
#define OW_FLAG_NOT_CONVERGED 0x04u /* screw-die match failed */
#define OW_FLAG_BACKFLOW      0x08u /* a band's down-channel flow floored */
#define OW_FLAG_NO_MELTING                                                     \
	0x10u /* barrel never above the melting point                          \
	         and no melting by dissipation */
#define OW_FLAG_PARTIAL_FILL                                                   \
	0x20u /* absolute pressure below zero somewhere:                       \
	         the channel cannot run full there                             \
	         (starved, partly filled) */
#define OW_FLAG_ZONE_FLOAT                                                     \
	0x40u /* a zone cannot hold its set-point and                          \
	         runs at the temperature it can hold */
#define OW_FLAG_UNHEATED_MELT                                                  \
	0x80u /* a plugged bed gave up solids as melt                          \
	         with no heat to melt them: the energy                         \
	         book is short by unheated_melt_W */

/* Figures of one operating point, SI. */
struct ow_point {
	double rpm;
	double set_K[OW_MAX_ZONES];   /* zone set-points used */
	double output_kg_s;           /* matched throughput G */
	double discharge_pressure_Pa; /* at the screw tip: die + screen at the
	                                 matched G (the march's own tip value
	                                 differs by the match residual) */
	double max_pressure_Pa;       /* anywhere on the screw */
	double max_pressure_at_m;
	double discharge_bulk_K; /* flow-weighted mean at the tip */
	double discharge_peak_K; /* hottest band at the tip */
	double peak_K;           /* hottest melt anywhere (bands, film) */
	double peak_at_m;
	double unmelt_frac;     /* solid mass fraction at the tip */
	double melt_start_m;    /* NAN when melting never starts */
	double melt_complete_m; /* NAN when solids reach the tip */
	double max_sbr;         /* solid bed ratio X/W, max where the
	                           bed's channel gets shallower (the
	                           transition); 0 if the bed is gone
	                           before */
	double max_sbr_at_m;    /* NAN when max_sbr is 0 */
	double plug_ratio;      /* Tadmor's plugging number there, max:
	                           A sqrt(X/W) rho_s V_sz sqrt(W) / Phi;
	                           >= 1: the bed widens as it is
	                           squeezed */
	double plugging_at_m;   /* NAN unless plugging */
	double power_W;         /* screw drive power (shaft) */
	double torque_Nm;
	double sec_J_kg;                    /* drive power / throughput */
	double barrel_heat_W;               /* net heat barrel -> resin */
	double zone_heat_W[OW_MAX_ZONES];   /* heat each zone gives the resin */
	double zone_demand_W[OW_MAX_ZONES]; /* heat each zone must give to
	                                       hold its set-point (< 0:
	                                       cooling) */
	double zone_control_K[OW_MAX_ZONES]; /* control-point temperature the
	                                        zone runs at (the set-point
	                                        unless it floats) */
	double zone_load;                    /* max over zones of demand / the
	                                        heating (or cooling) power, - */
	unsigned zone_floating;              /* bit i: zone i cannot hold its
	                                        set-point */
	double residence_s;        /* mean residence time hopper -> tip */
	double feed_capacity_kg_s; /* feed section's Darnell-Mol rate at
	                              no pressure loss (NAN: melt-fed) */
	/* energy book: power + barrel + root = enthalpy rise + flow work */
	double root_heat_W;     /* heat screw root -> resin */
	double enthalpy_rise_W; /* G (h(T_bulk) - h(T_feed)), solids
	                           leaving at the feed temperature;
	                           h: sensible + latent */
	double flow_work_W;     /* sum of Q dP along the screw (~ G
	                           (P_tip - P_feed)/rho_melt): the
	                           pressure energy the melt takes to
	                           the die */
	double energy_residual; /* (in - out) / drive power, - */
	double unheated_melt_W; /* melting heat of the solids a plugged
	                           bed gave up unheated (the book's
	                           shortfall, its residual is about
	                           -unheated_melt_W / power_W) */
	double match_slope;     /* d(P_tip - P_need)/dG near the answer,
	                           Pa s/kg (secant of the last two
	                           marches; 0 when unknown) */
	double zone_slope_W_K[OW_MAX_ZONES]; /* d(zone heat)/d(control
	                                        temperature) of each zone
	                                        that floats, W/K (secant of
	                                        its last tries; 0: holds) */
	int n_iter;                          /* marches done by the match */
	unsigned flags;
};

/* One row of the axial profile of the last solved point. */
struct ow_profile_row {
	double axial_m;
	double depth_m;
	double barrel_K;
	double pressure_Pa;
	double bulk_K;      /* melt bulk temperature (pool or channel) */
	double peak_K;      /* hottest melt at this station (bands, film) */
	double sbr;         /* X/W, 0 once melted */
	double unmelt_frac; /* solid mass flow / G */
	double shear_max_1_s;
};

struct ow_solver;

/* Create a workspace for study s (borrowed: it must outlive the solver).
 * Sizes come from s->line.numerics. */
enum ow_status ow_solver_create(const struct ow_study *s,
                                struct ow_solver **out, struct ow_diag *d);
void ow_solver_destroy(struct ow_solver *sv);

/* Solve at screw speed rpm (rev/min) with zone set-points set_K (NULL: the
 * study's own). warm_kg_s > 0 is a throughput guess (e.g. a neighbouring
 * grid point's). A point that does not converge returns OW_OK with
 * OW_FLAG_NOT_CONVERGED set: only invalid arguments or memory fail. */
enum ow_status ow_solver_run(struct ow_solver *sv, double rpm,
                             const double *set_K, double warm_kg_s,
                             struct ow_point *out, struct ow_diag *d);

/* Where the match starts: a predicted throughput and the match function's
 * slope (a neighbouring point's match_slope), which gives the second trial
 * by one Newton step instead of a fixed probe. */
struct ow_solver_start {
	double g_kg_s; /* > 0: first trial throughput; otherwise a cold start */
	double slope;  /* < 0: d(P_tip - P_need)/dG, Pa s/kg; otherwise
	                  unknown */
	/* zones a neighbour floated: side[z] 1 short of heating, -1 short of
	 * cooling (0: held, nothing known), its control point zone_K[z] and
	 * slope zone_slope_W_K[z] > 0 (a neighbour's zone_slope_W_K): the
	 * zone's first try of the first march starts there instead of at
	 * the set-point */
	int zone_side[OW_MAX_ZONES];
	double zone_K[OW_MAX_ZONES];
	double zone_slope_W_K[OW_MAX_ZONES];
};

/* The start a solved point pt gives a solve near it: its throughput,
 * match slope and floating zones as they are (a cold start when pt did
 * not converge). */
void ow_solver_start_from(const struct ow_point *pt,
                          struct ow_solver_start *out);

/* ow_solver_run from start (NULL: cold). The answer does not depend on
 * the start beyond the match tolerance. */
enum ow_status ow_solver_run_from(struct ow_solver *sv, double rpm,
                                  const double *set_K,
                                  const struct ow_solver_start *start,
                                  struct ow_point *out, struct ow_diag *d);

/* Profile of the last run (stations from hopper to tip); valid until the
 * next run or destroy. */
const struct ow_profile_row *ow_solver_profile(const struct ow_solver *sv,
                                               int *n_rows);

/* Names of the flags set in flags, e.g. "plugging", into names[] (at most
 * max); returns the count. */
int ow_solver_flag_names(unsigned flags, const char **names, int max);

#endif
