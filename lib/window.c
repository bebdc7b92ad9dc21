/* window.c - safe set, boundaries, recommended rectangle, robust centre. */
#include "window_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

static int safe_at(const struct ow_grid *g, int ir, int ia)
{
	return ow_grid_at(g, ir, ia)->v.bits == 0;
}

/* Largest rectangle of safe lattice points by area in normalised units
 * (spans over the sweep ranges); ties keep the first found. For each pair
 * of rows the columns safe in all of them are AND-ed up, and the longest
 * run of such columns is the widest rectangle of that height. */
static void largest_rectangle(const struct ow_grid *g, struct ow_window *w,
			      unsigned char *col)
{
	double best = -1.0;
	int a0, a1, ir;

	for (a0 = 0; a0 < g->n_axis; a0++) {
		memset(col, 1, (size_t)g->n_rpm);
		for (a1 = a0; a1 < g->n_axis; a1++) {
			int run = 0;

			for (ir = 0; ir < g->n_rpm; ir++) {
				double area;

				col[ir] &= (unsigned char)safe_at(g, ir, a1);
				run = col[ir] ? run + 1 : 0;
				if (!run)
					continue;
				/* area, then point count to break ties */
				area = (double)(run - 1) * (a1 - a0) +
				       1e-9 * run * (a1 - a0 + 1);
				if (area > best) {
					best = area;
					w->ir0 = ir - run + 1;
					w->ir1 = ir;
					w->ia0 = a0;
					w->ia1 = a1;
				}
			}
		}
	}
	w->empty = best < 0.0;
}

/* Unsafe points with a safe neighbour: the only ones that can be nearest. */
static int frontier(const struct ow_grid *g, int *list)
{
	static const int nb[4][2] = {{1, 0}, {-1, 0}, {0, 1}, {0, -1}};
	int n = 0, ir, ia, k;

	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			if (safe_at(g, ir, ia))
				continue;
			for (k = 0; k < 4; k++) {
				int jr = ir + nb[k][0], ja = ia + nb[k][1];

				if (jr >= 0 && ja >= 0 && jr < g->n_rpm &&
				    ja < g->n_axis && safe_at(g, jr, ja)) {
					list[n++] = ia * g->n_rpm + ir;
					break;
				}
			}
		}
	return n;
}

/* Robust centre: the rectangle's lattice point farthest from the nearest
 * unsafe point and from the edge of the sweep (unknown beyond), distances
 * in units of the sweep ranges. */
static void robust_centre(const struct ow_grid *g, struct ow_window *w,
			  int *list)
{
	double sx = 1.0 / (g->n_rpm - 1), sy = 1.0 / (g->n_axis - 1);
	int n = frontier(g, list), ir, ia, k;
	double best = -1.0;

	for (ia = w->ia0; ia <= w->ia1; ia++)
		for (ir = w->ir0; ir <= w->ir1; ir++) {
			double x = ir * sx, y = ia * sy;
			double dmin = fmin(fmin(x, 1.0 - x), fmin(y, 1.0 - y));

			for (k = 0; k < n && dmin > best; k++) {
				double dx = (list[k] % g->n_rpm) * sx - x;
				double dy = (list[k] / g->n_rpm) * sy - y;

				dmin = fmin(dmin, sqrt(dx * dx + dy * dy));
			}
			if (dmin > best) {
				best = dmin;
				w->centre.rpm = ow_grid_at(g, ir, ia)->rpm;
				w->centre.axis = ow_grid_at(g, ir, ia)->axis;
				w->centre_set_K =
					ow_grid_at(g, ir, ia)->set_ref_K;
			}
		}
	w->centre_clearance = best;
}

static void ranges(const struct ow_study *s, const struct ow_grid *g,
		   struct ow_window *w)
{
	double lo[OW_MAX_ZONES], hi[OW_MAX_ZONES];
	int ir, ia, z;

	w->output_min_kg_s = w->melt_min_K = INFINITY;
	w->output_max_kg_s = w->melt_max_K = w->peak_max_K = -INFINITY;
	for (ia = w->ia0; ia <= w->ia1; ia++)
		for (ir = w->ir0; ir <= w->ir1; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			if (p->solved != 1)
				continue;
			w->output_min_kg_s =
				fmin(w->output_min_kg_s, p->pt.output_kg_s);
			w->output_max_kg_s =
				fmax(w->output_max_kg_s, p->pt.output_kg_s);
			w->melt_min_K = fmin(w->melt_min_K,
					     p->pt.discharge_bulk_K);
			w->melt_max_K = fmax(w->melt_max_K,
					     p->pt.discharge_bulk_K);
			w->peak_max_K = fmax(w->peak_max_K, p->pt.peak_K);
		}
	ow_line_apply_axis(&s->line, w->axis_min, lo);
	ow_line_apply_axis(&s->line, w->axis_max, hi);
	for (z = 0; z < s->line.n_zones; z++) {
		w->zone_min_K[z] = fmin(lo[z], hi[z]);
		w->zone_max_K[z] = fmax(lo[z], hi[z]);
	}
}

static void counts(const struct ow_grid *g, struct ow_window *w)
{
	int i, c, n = g->n_rpm * g->n_axis, safe = 0;

	for (i = 0; i < n; i++) {
		unsigned b = g->pts[i].v.bits;

		safe += b == 0;
		for (c = 0; c < OW_CK_COUNT; c++)
			w->fail_count[c] += (b >> c) & 1u;
	}
	w->safe_fraction = (double)safe / n;
}

int ow_window_binding(const struct ow_window *w, enum ow_check *order)
{
	int n = 0, c, i;

	for (c = 0; c < OW_CK_COUNT; c++) {
		if (!w->fail_count[c])
			continue;
		for (i = n; i > 0 && w->fail_count[order[i - 1]] <
					      w->fail_count[c]; i--)
			order[i] = order[i - 1];
		order[i] = (enum ow_check)c;
		n++;
	}
	return n;
}

void ow_window_destroy(struct ow_window *w)
{
	int b, l;

	if (!w)
		return;
	for (b = 0; b < w->n_boundaries; b++) {
		for (l = 0; l < w->bounds[b].n_lines; l++)
			free(w->bounds[b].lines[l].p);
		free(w->bounds[b].lines);
	}
	free(w);
}

enum ow_status ow_window_extract(const struct ow_study *s,
				 const struct ow_grid *g,
				 struct ow_window **out, struct ow_diag *d)
{
	struct ow_window *w = calloc(1, sizeof *w);
	int *list = malloc(sizeof *list * (size_t)g->n_rpm * (size_t)g->n_axis);
	unsigned char *col = malloc((size_t)g->n_rpm);
	enum ow_status st = OW_OK;

	*out = NULL;
	if (!w || !list || !col) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	counts(g, w);
	largest_rectangle(g, w, col);
	if (!w->empty) {
		const struct ow_grid_point *a = ow_grid_at(g, w->ir0, w->ia0);
		const struct ow_grid_point *b = ow_grid_at(g, w->ir1, w->ia1);

		w->rpm_min = a->rpm;
		w->rpm_max = b->rpm;
		w->axis_min = a->axis;
		w->axis_max = b->axis;
		w->set_min_K = fmin(a->set_ref_K, b->set_ref_K);
		w->set_max_K = fmax(a->set_ref_K, b->set_ref_K);
		robust_centre(g, w, list);
		ranges(s, g, w);
	}
	st = ow_window_boundaries(s, g, w, d);
	if (st != OW_OK)
		goto fail;
	*out = w;
	w = NULL;
fail:
	free(list);
	free(col);
	ow_window_destroy(w);
	return st;
}
