/* melt_impl.h - the melt workspace, shared by melt.c (driver), melt_flow.c
 * (velocity across the depth) and melt_heat.c (temperature bands). Private
 * to those three files. */
#ifndef OW_MELT_IMPL_H
#define OW_MELT_IMPL_H

#include "ow_const.h"
#include "ow_melt.h"

/* Fixed data of one station solve (effective infinite-width channel). */
struct melt_station {
	const struct ow_material *mat;
	struct ow_visc_log vlog; /* the resin's viscosity in log form */
	double H;                /* depth, m */
	double W;                /* width, m */
	double fd, fp;           /* shape factors */
	double vz, vx;   /* effective barrel speeds V_bz F_d/F_p and V_bx */
	double qz;       /* imposed down-channel flow per unit width without the
	                    gradient-driven leakage, (Q + Q_L0)/(W F_p), m^2/s */
	double lz, lx;   /* leakage per unit width per Pa of beta_z, beta_x
	                    (beta = gradient * H), m^2/(s Pa) */
	double ql0;      /* leak flow at zero gradients (drag part), m^3/s */
	double leak_byp; /* bypass length, m */
	double leak_coef; /* delta^3/(12 mu_f e), m^3/(Pa s) per m of flight */
	double leak_heat; /* clearance drag heating per unit length, W/m */
	double tol;       /* tolerance scale (ow_melt_tolerance) */
};

/* The viscosity of every cell for one set of stresses; the line search
 * fills a trial set and swaps it in when accepted. */
struct melt_cells {
	double *lnv;  /* ln viscosity, ln(Pa s) */
	double *phi;  /* fluidity exp(-lnv), 1/(Pa s) */
	double *lu;   /* ln of the reduced shear rate aT gdot, ln(1/s) */
	double *ltau; /* ln |tau| the cell was solved for, ln Pa */
	double *tau2; /* tau^2 the cell was solved for, Pa^2 */
	double *nloc; /* local power-law index 1 + d ln eta / d ln gdot */
	double *h2;   /* d nloc / d lu, for the next prediction */
};

struct ow_melt_ws {
	int nn, nc, nb; /* nodes, cells (nn - 1), bands */
	/* per cell */
	struct melt_cells cur, trial; /* accepted and trial solutions */
	double *cell_mem; /* the allocation behind the per-cell arrays */
	double *tc;       /* cell temperature, K */
	double *lat;      /* ln of the shift factor at tc */
	int *cell_band;   /* band holding the cell's midpoint */
	/* per node */
	double *y, *uz, *ux, *gd, *dis, *eta, *tn, *psi;
	/* per band */
	double *t;       /* band temperatures, K (the thermal state) */
	double *w;       /* down-channel flow weight per unit width, m^2/s */
	double *dk;      /* heating per unit width, W/m^2 */
	double *gnext;   /* conductance to band k+1 per unit width, W/(m^2 K) */
	double *gb, *gr; /* conductance to barrel / root, W/(m^2 K) */
	double *legs;    /* 4 per band: lo0, hi0, lo1, hi1 (m) */
	double *tri;     /* 3 per band: tridiagonal work */
	double *level;   /* psi/psi* at the outer edge of each band */
	/* segments in depth order (2 nb at most) */
	double *seg_lo, *seg_hi;
	int *seg_band;
	int nseg;
	/* solution of the last station */
	double p[4];      /* a_z, beta_z, a_x, beta_x: tau = a + beta y/H, Pa */
	double pcells[4]; /* the last Newton iterate, which cur belongs to */
	double H, fp;
	double ystar, psistar;
	int circ; /* band layout: 1 streamline pairs, 0 layers */
	int have_profile;
	int warm;                        /* cur holds a previous solution */
	double bulk;                     /* flow-weighted band mean, K */
	double hcache, fdcache, fpcache; /* last shape factors */
	double tol;                      /* tolerance scale, 1 by default */
};

/* melt_flow.c: Newton solve of the viscosity and stress parameters at one
 * station; fills ws->cur, ws->p and the node profiles. */
enum ow_status ow_melt_solve_velocity(struct ow_melt_ws *ws,
                                      const struct melt_station *st,
                                      int *iterations, struct ow_diag *d);

/* melt_flow.c: exact integrals over [y0, y1] (m) of the last profile:
 * down-channel flow per unit width (m^2/s) and heating per unit width
 * F_p tau_z u_z' + tau_x u_x' (W/m^2). */
void ow_melt_seg_integrals(const struct ow_melt_ws *ws, double y0, double y1,
                           double *q, double *heat);

/* melt_flow.c: stream function of the cross-channel flow at y (m), m^2/s,
 * and the cross-channel velocity there. */
double ow_melt_psi_at(const struct ow_melt_ws *ws, double y);
double ow_melt_psi_ux(const struct ow_melt_ws *ws, double y, double *ux);

/* melt_heat.c: band layout from the last profile, band flows and heating,
 * conductances; cell temperatures for the next station. */
void ow_melt_build_bands(struct ow_melt_ws *ws, const struct melt_station *st,
                         const struct ow_melt_cond *c);

/* melt_heat.c: implicit step of the band temperatures over dz (> 0) for a
 * net flow q_net > 0 (m^3/s); returns whether a band flow was floored. */
int ow_melt_advance(struct ow_melt_ws *ws, const struct melt_station *st,
                    const struct ow_melt_cond *c, double dz_m);

/* melt_heat.c: cell temperatures from the band map, and barrel/root heat
 * (W/m) with the current band temperatures. */
void ow_melt_cell_temps(struct ow_melt_ws *ws);
void ow_melt_wall_heat(const struct ow_melt_ws *ws,
                       const struct ow_melt_cond *c, double *barrel_W_m,
                       double *root_W_m);

/* melt_heat.c: first depth, walking from the root (upper = 0) or the
 * barrel (upper = 1) toward y*, where psi/psi* reaches s in [0, 1]. */
double ow_melt_level_depth(const struct ow_melt_ws *ws, double s, int upper);

#endif
