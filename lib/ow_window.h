/* ow_window.h - the recommended operating window from a classified grid:
 * the safe set, each limit's boundary as polylines interpolated from the
 * signed margins (marching squares), the largest axis-aligned rectangle of
 * safe lattice points (the rpm and set-point bounds to write down), a
 * robust centre (the point of the rectangle farthest, in units normalised
 * to the sweep ranges, from any unsafe point or the edge of the sweep), and
 * the throughput and melt temperature ranges over the rectangle. */
#ifndef OW_WINDOW_H
#define OW_WINDOW_H

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

/* Where one check (or, for OW_WINDOW_EDGE, the whole verdict) changes from
 * pass to fail. */
struct ow_boundary {
	int check; /* enum ow_check, or OW_WINDOW_EDGE */
	int n_lines;
	struct ow_polyline *lines;
};

struct ow_window {
	int empty;                 /* no safe point at all */
	double safe_fraction;      /* safe lattice points / all */
	/* recommended rectangle (lattice-exact), and its corners */
	double rpm_min, rpm_max, axis_min, axis_max;
	double set_min_K, set_max_K; /* reference zone */
	int ir0, ir1, ia0, ia1;      /* its lattice index range */
	struct ow_xy centre;
	double centre_set_K;
	double centre_clearance;     /* distance to nearest unsafe, norm. */
	double output_min_kg_s, output_max_kg_s;
	double melt_min_K, melt_max_K; /* discharge bulk over the rectangle */
	double peak_max_K;             /* hottest peak over the rectangle */
	double zone_min_K[OW_MAX_ZONES], zone_max_K[OW_MAX_ZONES];
	int fail_count[OW_CK_COUNT];   /* lattice points failing each check */
	int n_boundaries;
	struct ow_boundary bounds[OW_CK_COUNT + 1];
};

/* Output name of a boundary's check: ow_check_key, or "window". */
const char *ow_window_boundary_key(int check);

/* Extract the window from grid g of study s. *out is owned by the caller
 * (ow_window_destroy). */
enum ow_status ow_window_extract(const struct ow_study *s,
				 const struct ow_grid *g,
				 struct ow_window **out, struct ow_diag *d);
void ow_window_destroy(struct ow_window *w);

/* Checks ordered by how many points they exclude (most first); returns
 * how many exclude any. */
int ow_window_binding(const struct ow_window *w, enum ow_check *order);

#endif
