/* window.c - safe set, boundaries, recommended rectangle and its centre. */
#include "window_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Distance from (x, y) to segment p-q (normalised coordinates). */
static double seg_dist(double x, double y, double px, double py, double qx,
                       double qy)
{
	double dx = qx - px, dy = qy - py, l2 = dx * dx + dy * dy;
	double t = l2 > 0.0 ? ((x - px) * dx + (y - py) * dy) / l2 : 0.0;

	t = fmin(1.0, fmax(0.0, t));
	dx = px + t * dx - x;
	dy = py + t * dy - y;
	return sqrt(dx * dx + dy * dy);
}

struct norm {
	double r0, rs, a0, as; /* sweep start and span, speed and axis */
};

/* Distance from (rpm, axis) to the window's edge (the interpolated line
 * where points stop being safe) and to the edge of the sweep (unknown
 * beyond), in units of the sweep ranges. */
static double clearance(const struct ow_window *w, const struct norm *n,
                        double rpm, double axis)
{
	double x = (rpm - n->r0) / n->rs, y = (axis - n->a0) / n->as;
	double dmin = fmin(fmin(x, 1.0 - x), fmin(y, 1.0 - y));
	int b, l, i;

	for (b = 0; b < w->n_boundaries; b++) {
		if (w->bounds[b].check != OW_WINDOW_EDGE)
			continue;
		for (l = 0; l < w->bounds[b].n_lines; l++) {
			const struct ow_polyline *pl = &w->bounds[b].lines[l];

			for (i = 0; i + 1 < pl->n; i++)
				dmin = fmin(
				    dmin,
				    seg_dist(
				        x, y, (pl->p[i].rpm - n->r0) / n->rs,
				        (pl->p[i].axis - n->a0) / n->as,
				        (pl->p[i + 1].rpm - n->r0) / n->rs,
				        (pl->p[i + 1].axis - n->a0) / n->as));
		}
	}
	return dmin;
}

/* Whole steps from lo to hi: the first value and how many; the midpoint
 * alone when no whole step lies inside. */
static int steps_in(double lo, double hi, double step, double offset,
                    double *first)
{
	double f = ceil((lo + offset) / step - 1e-9) * step - offset;
	int n = (int)floor((hi - f) / step + 1e-9) + 1;

	if (n < 1) {
		*first = 0.5 * (lo + hi);
		return 1;
	}
	*first = f;
	return n;
}

/* Centre: the setting inside the rectangle, on whole rpm and whole
 * set-point steps, farthest from the window's edge and from the edge of
 * the sweep (first found on ties). */
static void centre(const struct ow_study *s, const struct ow_grid *g,
                   struct ow_window *w)
{
	const struct ow_grid_point *p0 = ow_grid_at(g, 0, 0);
	const struct ow_grid_point *p1 =
	    ow_grid_at(g, g->n_rpm - 1, g->n_axis - 1);
	struct norm n = {p0->rpm, p1->rpm - p0->rpm, p0->axis,
	                 p1->axis - p0->axis};
	double off = ow_line_axis_ref_K(&s->line, 0.0) - OW_ZERO_C_K, r0, a0;
	int nr = steps_in(w->rpm_min, w->rpm_max, w->rpm_step, 0.0, &r0);
	int na = steps_in(w->axis_min, w->axis_max, w->temp_step_K, off, &a0);
	double best = -1.0;
	int i, j;

	for (j = 0; j < na; j++)
		for (i = 0; i < nr; i++) {
			double rpm = r0 + i * w->rpm_step;
			double axis = a0 + j * w->temp_step_K;
			double c = clearance(w, &n, rpm, axis);

			if (c > best) {
				best = c;
				w->centre.rpm = rpm;
				w->centre.axis = axis;
			}
		}
	w->centre_set_K = ow_line_axis_ref_K(&s->line, w->centre.axis);
	w->centre_clearance = best;
}

/* Lattice index range of the points inside the rectangle (widened by half
 * a lattice step when none lies inside). */
static void inside(const struct ow_grid *g, struct ow_window *w)
{
	const struct ow_grid_point *p0 = ow_grid_at(g, 0, 0);
	const struct ow_grid_point *p1 =
	    ow_grid_at(g, g->n_rpm - 1, g->n_axis - 1);
	double dr = (p1->rpm - p0->rpm) / (g->n_rpm - 1);
	double da = (p1->axis - p0->axis) / (g->n_axis - 1);
	double tol;

	for (tol = 1e-9; tol < 1.0; tol = 0.5) {
		w->ir0 = (int)ceil((w->rpm_min - p0->rpm) / dr - tol);
		w->ir1 = (int)floor((w->rpm_max - p0->rpm) / dr + tol);
		w->ia0 = (int)ceil((w->axis_min - p0->axis) / da - tol);
		w->ia1 = (int)floor((w->axis_max - p0->axis) / da + tol);
		if (w->ir0 <= w->ir1 && w->ia0 <= w->ia1)
			break;
	}
	w->ir0 = w->ir0 < 0 ? 0 : w->ir0;
	w->ia0 = w->ia0 < 0 ? 0 : w->ia0;
	w->ir1 = w->ir1 >= g->n_rpm ? g->n_rpm - 1 : w->ir1;
	w->ia1 = w->ia1 >= g->n_axis ? g->n_axis - 1 : w->ia1;
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
			w->melt_min_K =
			    fmin(w->melt_min_K, p->pt.discharge_bulk_K);
			w->melt_max_K =
			    fmax(w->melt_max_K, p->pt.discharge_bulk_K);
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

const char *ow_window_setter_key(int check)
{
	return check == OW_WINDOW_SWEEP_EDGE
	           ? "sweep_edge"
	           : ow_check_key((enum ow_check)check);
}

char *ow_window_setter_text(int check, char *buf, size_t n)
{
	const char *parts[3] = {OW_WINDOW_SWEEP_EDGE_TEXT, "", ""};
	const char *rel;
	int k;

	if (!n)
		return buf;
	if (check != OW_WINDOW_SWEEP_EDGE) {
		rel = ow_check_relation((enum ow_check)check);
		parts[0] =
		    !rel ? "the onset of "
		         : (!strcmp(rel, "at most") ? "the upper limit on "
		                                    : "the lower limit on ");
		parts[1] = ow_check_text((enum ow_check)check);
	}
	buf[0] = '\0';
	for (k = 0; k < 3; k++)
		strncat(buf, parts[k], n - strlen(buf) - 1);
	return buf;
}

int ow_window_binding(const struct ow_window *w, enum ow_check *order)
{
	int n = 0, c, i;

	for (c = 0; c < OW_CK_COUNT; c++) {
		if (!w->fail_count[c])
			continue;
		for (i = n;
		     i > 0 && w->fail_count[order[i - 1]] < w->fail_count[c];
		     i--)
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
	enum ow_status st = OW_OK;

	*out = NULL;
	if (!w)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	counts(g, w);
	st = ow_window_locate(s, g, w, d);
	if (st == OW_OK && !w->empty) {
		w->rpm_min = w->bound[OW_WB_RPM_MIN].value;
		w->rpm_max = w->bound[OW_WB_RPM_MAX].value;
		w->axis_min = w->bound[OW_WB_SET_MIN].value;
		w->axis_max = w->bound[OW_WB_SET_MAX].value;
		w->set_min_K = ow_line_axis_ref_K(&s->line, w->axis_min);
		w->set_max_K = ow_line_axis_ref_K(&s->line, w->axis_max);
		inside(g, w);
	}
	if (st == OW_OK)
		st = ow_window_boundaries(s, g, w, d);
	if (st != OW_OK)
		goto fail;
	if (!w->empty) {
		centre(s, g, w);
		ranges(s, g, w);
	}
	*out = w;
	w = NULL;
fail:
	ow_window_destroy(w);
	return st;
}
