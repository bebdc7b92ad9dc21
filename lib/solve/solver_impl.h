/* solver_impl.h - internals shared by solver.c (matching, public API) and
 * solver_march.c (the march from hopper to tip at one trial throughput).
 * Not a public header. */
#ifndef OW_SOLVER_IMPL_H
#define OW_SOLVER_IMPL_H

#include "ow_delay.h"
#include "ow_melt.h"
#include "ow_melting.h"
#include "ow_solids.h"
#include "ow_solver.h"

/* Totals of one march at one trial throughput G (whole screw: all parallel
 * channels). */
struct march {
	double tip_Pa; /* pressure reached at the tip */
	double max_Pa, max_at_m;
	double bulk_K, peak_tip_K;
	double peak_K, peak_at_m;
	double unmelt; /* solid mass fraction at the tip */
	double melt_start_m, melt_done_m;
	double max_sbr, max_sbr_at_m, plug_at_m; /* max_sbr where the bed's
	                                channel gets shallower (0: none) */
	double plug_ratio;  /* Tadmor's plugging number, max there */
	double power_W;     /* drive power */
	double barrel_W;    /* heat barrel -> resin */
	double root_W;      /* heat root -> resin */
	double flow_work_W; /* sum of Q dP over the screw */
	double unheated_W;  /* melting heat of solids a held (plugged) bed
	                       gave up without heat: no stage supplies it */
	double zone_W[OW_MAX_ZONES];
	double zone_demand_W[OW_MAX_ZONES]; /* at the set-point */
	double ctrl_K[OW_MAX_ZONES];        /* control points as run */
	unsigned zone_floating;             /* bit per zone */
	double zone_k[OW_MAX_ZONES]; /* a floating zone's d(heat)/d(control
	                                temperature), W/K (0: none) */
	double hold_kg;              /* resin held in the channel (residence) */
	double feed_cap_kg_s;        /* feed section capacity (NAN: melt-fed) */
	unsigned flags;
};

struct ow_solver {
	const struct ow_study *s;
	struct ow_melt_ws *melt;
	double rev_s;                 /* screw speed of the current run */
	double set_K[OW_MAX_ZONES];   /* zone set-points of the current run */
	double ctrl_K[OW_MAX_ZONES];  /* control points of the current march
	                                 (the set-points unless a zone
	                                 floats) */
	struct ow_melt_ws *melt_save; /* melt state at a zone's start */
	double zone_slope[OW_MAX_ZONES];   /* last d(zone heat)/d(control
	                                      temperature), W/K, in this run:
	                                      the first step of the next
	                                      float */
	double last_ctrl_K[OW_MAX_ZONES];  /* each zone's control point in
	                                      the previous march of this run */
	int last_side[OW_MAX_ZONES];       /* that march's zone floated short of
	                                      heating (1), of cooling (-1), or
	                                      held or was not solved (0) */
	double last_g[OW_MAX_ZONES];       /* that march's channel throughput */
	double last2_ctrl_K[OW_MAX_ZONES]; /* the same, one march earlier */
	double last2_g[OW_MAX_ZONES];
	int last2_side[OW_MAX_ZONES];
	double last_k[OW_MAX_ZONES];  /* zone slopes after the last march */
	double last2_k[OW_MAX_ZONES]; /* ... and after the one before */
	double zone_slope_m;          /* the last zone slope learnt in this
	                                 run per metre of zone, W/(K m): a
	                                 first step for a zone yet to float */
	int n_steps;                  /* axial steps hopper -> tip */
	double dx_m;                  /* axial step */
	struct ow_profile_row *rows;  /* n_steps + 1 rows */
	int n_rows;
	int record;          /* store the profile during a march */
	struct ow_diag diag; /* first failure inside a march */
	double tol;          /* tolerance scale (numerics) */
};

/* March from hopper to tip at throughput g_kg_s; fills *m. Returns OW_OK,
 * or the stage failure (the point is then not converged). */
enum ow_status ow_solver_march(struct ow_solver *sv, double g_kg_s,
                               struct march *m);

/* Barrel control-point temperature at axial position x of the current
 * march. */
double ow_solver_barrel(const struct ow_solver *sv, double x_m);

#endif
