/* ow_spread.h - the window that holds across the spread of the inputs a
 * line does not control: the next resin lot's viscosity and melting point,
 * the season's feed temperature, a worn screw's clearance, the barrel's
 * heat transfer, and the calibrated factors within their standard errors.
 *
 * The study's `spread` block (or --spread) names each varied input with a
 * range (uniform) or a standard deviation (normal, truncated at 3 sd).
 * Every grid point of a nominal sweep is solved again for a Latin
 * hypercube of samples of those inputs (McKay, Beckman & Conover 1979),
 * drawn from a seed and the point's lattice index alone, so the answers do
 * not depend on the number of threads. Each sample is a copy of the study
 * with the inputs moved (the calibration factor table applies the factor
 * inputs) and is warm-started from the nominal solve. Points whose
 * nominal margins exceed what the spread can move (a bound measured by
 * one-at-a-time probes) are not sampled: every sample agrees there.
 *
 * Per point: the share of safe samples, the worst margin per limit over
 * the samples; over the map: the robust grid (a point unsafe unless at
 * least `level` of its samples are safe) whose window ow_window_extract
 * draws with the same procedure as the nominal one, and the inputs ranked
 * by how strongly they move the margins near the window's edge. */
#ifndef OW_SPREAD_H
#define OW_SPREAD_H

#include "ow_spread_input.h"
#include "ow_status.h"

/* Limits with margins (OW_CK_LIMITS of ow_classify.h, which includes this
 * header through ow_study.h; spread_run.c asserts they agree). */
#define OW_SPREAD_LIMITS 10

struct ow_study; /* ow_study.h */
struct ow_grid;  /* ow_sweep.h */

/* ---- the sampled sweep ----------------------------------------------------
 */

struct ow_spread_config {
	int jobs;     /* threads; 0: all cores */
	int samples;  /* > 0: override the block's count */
	long seed;    /* >= 0: override the block's seed */
	double level; /* > 0: override the block's level */
	void (*progress)(void *ctx, int done, int total);
	void *progress_ctx;
};

/* Per lattice point. */
struct ow_spread_point {
	int sampled;                    /* 1: samples solved; 0: decided by
	                                   the nominal margins (or filled
	                                   from a solved corner) */
	double share;                   /* safe samples / samples */
	double worst[OW_SPREAD_LIMITS]; /* lowest margin over the samples
	                               (NAN: limit not set or not
	                               sampled) */
	double level_margin[OW_SPREAD_LIMITS]; /* margin the `level` share of
	                                      samples exceeds */
	unsigned fail_bits;                    /* checks any sample failed */
};

struct ow_spread_rank {
	int input;   /* index into the spread's inputs */
	double corr; /* correlation of the input with the smallest margin
	                over the fringe points' samples: < 0, a higher
	                value shrinks the window */
};

struct ow_spread_result {
	int n_rpm, n_axis;           /* lattice of the nominal grid */
	struct ow_spread_point *pts; /* [ia * n_rpm + ir] */
	int samples;
	unsigned long seed;
	double level;
	int solves;       /* sample solves done (probes too) */
	int solves_saved; /* samples not solved at decided points */
	int probe_solves;
	double bound[OW_SPREAD_LIMITS]; /* how far the spread moves each margin
	                               (probe estimate) */
	int n_rank;
	struct ow_spread_rank rank[OW_SPREAD_MAX_INPUTS];
};

void ow_spread_config_default(struct ow_spread_config *c);

/* Sample every solved point of nominal grid g of study s across the
 * study's spread (s->spread; OW_EINPUT when it has no inputs). *out is
 * owned by the caller (ow_spread_result_destroy). */
enum ow_status ow_spread_run(const struct ow_study *s, const struct ow_grid *g,
                             const struct ow_spread_config *c,
                             struct ow_spread_result **out, struct ow_diag *d);
void ow_spread_result_destroy(struct ow_spread_result *r);

/* The robust grid: a copy of g whose points with a share below the level
 * fail (the checks their samples failed) and whose margins are the level
 * margins. ow_window_extract on it gives the robust window. The caller
 * owns *out (ow_grid_destroy). */
enum ow_status ow_spread_robust_grid(const struct ow_grid *g,
                                     const struct ow_spread_result *r,
                                     struct ow_grid **out, struct ow_diag *d);

/* Clip robust window rw to nominal window w (struct ow_window, passed as
 * the window module's type through ow_window.h): the largest rectangle of
 * the robust safe set may trade speed for set-point against the nominal
 * one; the part of it inside the nominal rectangle is still robust-safe.
 * Bounds, axis range, zone ranges and centre are clipped; empty when they
 * do not overlap. */
struct ow_window;
void ow_spread_clip_window(struct ow_window *rw, const struct ow_window *w);

#endif
