/* ow_window.h - the recommended operating window from a classified grid:
 * the safe set, each limit's boundary as polylines interpolated from the
 * signed margins (marching squares), the largest axis-aligned safe
 * rectangle (the rpm and set-point bounds to write down) located on the
 * margins interpolated between solved points, so it does not move with
 * the grid (window_bounds.c): speeds rounded inward to whole rpm,
 * set-points on whole kelvin of the reference zone, each bound with what
 * sets it (a limit, or the edge of the swept range) and its resolution;
 * the centre (the whole-step setting in the rectangle farthest, in units
 * of the sweep ranges, from the window's edge and the sweep's edge), and
 * the throughput and melt temperature ranges over the rectangle. */
#ifndef OW_WINDOW_H
#define OW_WINDOW_H

#include <stddef.h>

#include "ow_sweep.h"

struct ow_xy {
	double rpm;
	double axis; /* barrel axis value (K or K difference) */
};

struct ow_polyline {
	int n;
	struct ow_xy *p;
};

/* Pseudo check of the window's own edge: where points stop being safe. */
#define OW_WINDOW_EDGE OW_CK_COUNT
/* What sets a bound that no limit sets: the edge of the swept range. */
#define OW_WINDOW_SWEEP_EDGE (-1)

/* The four bounds of the recommended rectangle. */
enum ow_window_side {
	OW_WB_RPM_MIN,
	OW_WB_RPM_MAX,
	OW_WB_SET_MIN,
	OW_WB_SET_MAX,
	OW_WB_COUNT
};

/* One bound: its value, what sets it and how finely it is located. */
struct ow_window_bound {
	double value;      /* rpm, or barrel axis value (K or K difference) */
	int check;         /* enum ow_check, or OW_WINDOW_SWEEP_EDGE */
	double resolution; /* rpm or K: the bound is within this of where
	                      the setting check crosses its limit (0 at the
	                      sweep's edge, which is exact but no limit) */
};

/* Where one check (or, for OW_WINDOW_EDGE, the whole verdict) changes from
 * pass to fail. */
struct ow_boundary {
	int check; /* enum ow_check, or OW_WINDOW_EDGE */
	int n_lines;
	struct ow_polyline *lines;
};

struct ow_window {
	int empty;            /* no safe point at all */
	double safe_fraction; /* safe lattice points / all */
	/* recommended rectangle (lattice-exact), and its corners */
	double rpm_min, rpm_max, axis_min, axis_max;
	double set_min_K, set_max_K; /* reference zone */
	int ir0, ir1, ia0, ia1;      /* lattice points inside it (ir0 > ir1
	                                when none) */
	struct ow_window_bound bound[OW_WB_COUNT];
	int at_sweep_edge;            /* a bound is the edge of the sweep */
	double rpm_step, temp_step_K; /* whole steps bounds are rounded to */
	struct ow_xy centre;
	double centre_set_K;
	double centre_clearance; /* distance to the window's or the
	                            sweep's edge, in sweep ranges */
	double output_min_kg_s, output_max_kg_s;
	double melt_min_K, melt_max_K; /* discharge bulk over the rectangle */
	double peak_max_K;             /* hottest peak over the rectangle */
	double zone_min_K[OW_MAX_ZONES], zone_max_K[OW_MAX_ZONES];
	int fail_count[OW_CK_COUNT]; /* lattice points failing each check */
	int n_boundaries;
	struct ow_boundary bounds[OW_CK_COUNT + 1];
};

/* Output name of a boundary's check: ow_check_key, or "window". */
const char *ow_window_boundary_key(int check);

/* Output name of what sets a bound: ow_check_key, or "sweep_edge". */
const char *ow_window_setter_key(int check);

/* What sets a bound in words, into buf (size n): "the peak melt
 * temperature limit", "where solid bed plugging starts", or for the sweep
 * edge OW_WINDOW_SWEEP_EDGE_TEXT. Returns buf. */
char *ow_window_setter_text(int check, char *buf, size_t n);

#define OW_WINDOW_SWEEP_EDGE_TEXT                                              \
	"edge of the swept range: not a limit, widen the sweep"

/* The note printed wherever a window touching the sweep's edge is shown. */
#define OW_WINDOW_SWEEP_EDGE_NOTE                                              \
	"The window runs into the edge of the swept range: a bound marked "    \
	"\"edge of the swept range\" is not a limit, the line may run safely " \
	"beyond it, and what limits it there is unknown. Widen the sweep "     \
	"to find it before writing that bound down."

/* Extract the window from grid g of study s. *out is owned by the caller
 * (ow_window_destroy). */
enum ow_status ow_window_extract(const struct ow_study *s,
                                 const struct ow_grid *g,
                                 struct ow_window **out, struct ow_diag *d);
void ow_window_destroy(struct ow_window *w);

/* The verdict at a setting that need not be a grid point: rpm and the
 * reference zone's set-point set_K. *inside 0 when it lies outside the
 * swept range (then nothing is known there and *bits is 0); else *bits
 * holds the checks failing there, by their margins interpolated between
 * solved points as the window's bounds are. */
enum ow_status ow_window_verdict_at(const struct ow_study *s,
                                    const struct ow_grid *g, double rpm,
                                    double set_K, int *inside, unsigned *bits,
                                    struct ow_diag *d);

/* Checks ordered by how many points they exclude (most first); returns
 * how many exclude any. */
int ow_window_binding(const struct ow_window *w, enum ow_check *order);

#endif
