/* ow_sweep.h - the grid driver: solve every point of rpm x barrel-axis
 * (the study's sweep), classify it, and refine the cells a boundary
 * crosses. Points are stored on a lattice 2^refine times finer than the
 * study's grid; only the coarse points and the refined cells are solved.
 *
 * Parallel over barrel-axis rows with OpenMP; within a row each point
 * starts from the previous speeds of the same row (continuation: their
 * throughputs and match slopes extrapolated), a refined point from the
 * corners of its cell, so the results do not depend on the number of
 * threads. */
#ifndef OW_SWEEP_H
#define OW_SWEEP_H

#include "ow_classify.h"
#include "ow_study.h"
#include "ow_solver.h"

struct ow_sweep_config {
	int jobs;      /* threads; 0: all cores */
	int refine;    /* levels of halving around boundaries, 0..4 */
	int rpm_steps; /* > 0: override the study's grid (--grid NxM) */
	int axis_steps;
	/* called now and then from one thread with points done / planned;
	 * may be NULL */
	void (*progress)(void *ctx, int done, int total);
	void *progress_ctx;
};

struct ow_grid_point {
	int solved; /* 0: not solved (inside a uniform cell) */
	double rpm;
	double axis;      /* barrel axis value (K or K difference) */
	double set_ref_K; /* reference zone's set-point */
	struct ow_point pt;
	struct ow_verdict v;
};

struct ow_grid {
	int n_rpm, n_axis;         /* lattice size (fine) */
	int stride;                /* 2^refine: lattice steps per coarse step */
	int solves;                /* points solved */
	struct ow_grid_point *pts; /* [ia * n_rpm + ir] */
};

/* Defaults: all cores, no refinement, the study's grid. */
void ow_sweep_default(struct ow_sweep_config *c);

/* Run the sweep for study s (its sweep must be set: OW_EINPUT otherwise).
 * *out is owned by the caller (ow_grid_destroy). */
enum ow_status ow_sweep_run(const struct ow_study *s,
                            const struct ow_sweep_config *c,
                            struct ow_grid **out, struct ow_diag *d);

void ow_grid_destroy(struct ow_grid *g);

/* Point at lattice indices (ir, ia). */
static inline struct ow_grid_point *ow_grid_at(const struct ow_grid *g, int ir,
                                               int ia)
{
	return &g->pts[ia * g->n_rpm + ir];
}

/* Start of the match at rpm from n (0..OW_SWEEP_PREDICT) solved points of
 * the same barrel row, prev[0] the nearest: their throughputs per screw
 * speed (nearly constant: drag flow grows with speed) extrapolated to rpm
 * along the line through them, the nearest one's match slope. n = 0 gives
 * a cold start. */
#define OW_SWEEP_PREDICT 2
void ow_sweep_predict(const struct ow_point *const *prev, int n, double rpm,
                      struct ow_solver_start *out);

#endif
