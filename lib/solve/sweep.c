/* sweep.c - solve, classify and refine the rpm x barrel-axis grid. */
#include "ow_sweep.h"

#include <math.h>
#include <omp.h>
#include <stdlib.h>
#include <string.h>

#define MAX_REFINE   4
#define SLOPE_SMOOTH 0.1 /* match slopes this close extrapolate */

void ow_sweep_default(struct ow_sweep_config *c)
{
	memset(c, 0, sizeof *c);
}

void ow_grid_destroy(struct ow_grid *g)
{
	if (!g)
		return;
	free(g->pts);
	free(g);
}

/* Shared state of one sweep. */
struct run {
	const struct ow_study *s;
	const struct ow_sweep_config *c;
	struct ow_grid *g;
	int threads;
	int done, planned;
	enum ow_status st; /* first failure (memory) */
	struct ow_diag diag;
};

static void solve_point(struct run *r, struct ow_solver *sv, int ir, int ia,
                        const struct ow_solver_start *start)
{
	struct ow_grid_point *gp = ow_grid_at(r->g, ir, ia);
	double set_K[OW_MAX_ZONES];
	struct ow_diag d = {{0}};
	int done;

	ow_line_apply_axis(&r->s->line, gp->axis, set_K);
	if (ow_solver_run_from(sv, gp->rpm, set_K, start, &gp->pt, &d) != OW_OK)
		gp->pt.flags |= OW_FLAG_NOT_CONVERGED; /* never stop a sweep */
	ow_classify(&gp->pt, &r->s->line.limits, ow_screw_length(&r->s->screw),
	            &gp->v);
	gp->solved = 1;
#pragma omp atomic capture
	done = ++r->done;
	if (r->c->progress && omp_get_thread_num() == 0)
		r->c->progress(r->c->progress_ctx, done, r->planned);
}

static int usable(const struct ow_grid_point *gp)
{
	return gp->solved == 1 && !(gp->pt.flags & OW_FLAG_NOT_CONVERGED);
}

/* Lagrange weight of node k of x[0..n-1] at t. */
static double lagrange(const double *x, int n, int k, double t)
{
	double w = 1.0;
	int j;

	for (j = 0; j < n; j++)
		if (j != k)
			w *= (t - x[j]) / (x[k] - x[j]);
	return w;
}

/* Zones the nearest point floated (out holds its start): their control
 * points extrapolated along the points that floated them on the same
 * side, like the throughput. */
static void predict_zones(const struct ow_point *const *prev, int n,
                          const double *x, double t,
                          struct ow_solver_start *out)
{
	struct ow_solver_start other[OW_SWEEP_PREDICT];
	int z, k, m;

	for (k = 1; k < n; k++)
		ow_solver_start_from(prev[k], &other[k]);
	for (z = 0; z < OW_MAX_ZONES && n > 0; z++) {
		double tc = 0.0;

		if (out->zone_side[z] == 0)
			continue;
		for (m = 1; m < n && other[m].zone_side[z] == out->zone_side[z];
		     m++)
			;
		for (k = 0; k < m; k++)
			tc += lagrange(x, m, k, t) * prev[k]->zone_control_K[z];
		out->zone_K[z] = tc;
	}
}

/* The start at t from n points at x[k] along a row (per_rpm: the
 * throughput per speed extrapolated, x the speeds) or down a column of
 * one speed (the throughput itself, x the axis values). */
static void predict_along(const struct ow_point *const *prev, int n,
                          const double *x, double t, int per_rpm,
                          struct ow_solver_start *out)
{
	double sum = 0.0;
	int k;

	if (n > 0)
		ow_solver_start_from(prev[0], out);
	else
		memset(out, 0, sizeof *out);
	for (k = 0; k < n; k++)
		sum += lagrange(x, n, k, t) * prev[k]->output_kg_s /
		       (per_rpm ? prev[k]->rpm : 1.0);
	out->g_kg_s = sum * (per_rpm ? t : 1.0);
	/* the nearest slope, extrapolated where the two nearest agree within
	 * SLOPE_SMOOTH (a secant that straddled a jump of the match function
	 * is steep, and extrapolated it would run away) */
	if (n > 1 && prev[1]->match_slope < 0.0 && out->slope < 0.0 &&
	    fabs(out->slope / prev[1]->match_slope - 1.0) < SLOPE_SMOOTH)
		out->slope += (out->slope - prev[1]->match_slope) * (t - x[0]) /
		              (x[0] - x[1]);
	predict_zones(prev, n, x, t, out);
}

void ow_sweep_predict(const struct ow_point *const *prev, int n, double rpm,
                      struct ow_solver_start *out)
{
	double x[OW_SWEEP_PREDICT];
	int k;

	n = n < OW_SWEEP_PREDICT ? n : OW_SWEEP_PREDICT;
	for (k = 0; k < n; k++)
		x[k] = prev[k]->rpm;
	predict_along(prev, n, x, rpm, 1, out);
}

/* The nearest points of a continuation: prev[0] the latest, at x[0]. */
struct chain {
	const struct ow_point *prev[OW_SWEEP_PREDICT];
	double x[OW_SWEEP_PREDICT];
	int n;
};

/* Take point gp (at x along the chain) into the chain if it converged;
 * one that did not restarts the chain. */
static void chain_push(struct chain *ch, const struct ow_grid_point *gp,
                       double x)
{
	if (!usable(gp)) {
		ch->n = 0;
		return;
	}
	memmove(ch->prev + 1, ch->prev,
	        sizeof ch->prev[0] * (OW_SWEEP_PREDICT - 1));
	memmove(ch->x + 1, ch->x, sizeof ch->x[0] * (OW_SWEEP_PREDICT - 1));
	ch->prev[0] = &gp->pt;
	ch->x[0] = x;
	ch->n += ch->n < OW_SWEEP_PREDICT;
}

/* The lead-in: the first two speeds of every barrel row, each of the two
 * columns solved as continuations along the barrel axis (throughput
 * extrapolated in the axis value), in two chains from the middle row
 * outwards; so every row starts from two solved speeds instead of a cold
 * start, and each chain is fixed whatever the thread count. */
static void lead_in(struct run *r, struct ow_solver **svs)
{
	struct ow_grid *g = r->g;
	int rows = (g->n_axis - 1) / g->stride + 1, mid = rows / 2, k;
	int cols = g->n_rpm > g->stride ? 2 : 1;

#pragma omp parallel for schedule(dynamic) num_threads(r->threads)
	for (k = 0; k < 2 * cols; k++) {
		struct ow_solver *sv = svs[omp_get_thread_num()];
		struct chain ch = {{NULL}, {0.0}, 0};
		int ir = k / 2 * g->stride, up = k % 2;
		int j;

		for (j = up ? mid : mid - 1; j >= 0 && j < rows;
		     j += up ? 1 : -1) {
			struct ow_grid_point *gp =
			    ow_grid_at(g, ir, j * g->stride);
			struct ow_solver_start s0;

			predict_along(ch.prev, ch.n, ch.x, gp->axis, 0, &s0);
			solve_point(r, sv, ir, j * g->stride, &s0);
			chain_push(&ch, gp, gp->axis);
		}
	}
}

/* Coarse rows in parallel after the lead-in; along a row, each point
 * starts from the speeds before it in the same row, so every thread count
 * gives the same answers. A point that did not converge restarts the
 * continuation. */
static void coarse_pass(struct run *r, struct ow_solver **svs)
{
	struct ow_grid *g = r->g;
	int rows = (g->n_axis - 1) / g->stride + 1, k;

	lead_in(r, svs);
#pragma omp parallel for schedule(dynamic) num_threads(r->threads)
	for (k = 0; k < rows; k++) {
		struct ow_solver *sv = svs[omp_get_thread_num()];
		struct chain ch = {{NULL}, {0.0}, 0};
		int ia = k * g->stride, ir;

		for (ir = 0; ir < g->n_rpm; ir += g->stride) {
			struct ow_grid_point *gp = ow_grid_at(g, ir, ia);

			if (gp->solved != 1) {
				struct ow_solver_start s0;

				predict_along(ch.prev, ch.n, ch.x, gp->rpm, 1,
				              &s0);
				solve_point(r, sv, ir, ia, &s0);
			}
			chain_push(&ch, gp, gp->rpm);
		}
	}
}

/* A cell the window's edge crosses: its corners are not all safe or all
 * unsafe. (Where two limits meet inside the unsafe region nothing is
 * refined: no decision depends on it.) */
static int differ(const struct ow_grid *g, int ir, int ia, int s)
{
	int safe = ow_grid_at(g, ir, ia)->v.bits == 0;

	if (ow_grid_at(g, ir, ia)->solved != 1 ||
	    ow_grid_at(g, ir + s, ia)->solved != 1 ||
	    ow_grid_at(g, ir, ia + s)->solved != 1 ||
	    ow_grid_at(g, ir + s, ia + s)->solved != 1)
		return 0; /* inside a cell left unrefined at a coarser level */

	return (ow_grid_at(g, ir + s, ia)->v.bits == 0) != safe ||
	       (ow_grid_at(g, ir, ia + s)->v.bits == 0) != safe ||
	       (ow_grid_at(g, ir + s, ia + s)->v.bits == 0) != safe;
}

/* Mark the new points of every cell of size s that a boundary crosses;
 * returns how many; their lattice indices go to list. */
static int mark_level(struct ow_grid *g, int s, int *list)
{
	int h = s / 2, n = 0, ir, ia, k;
	static const int off[5][2] = {{1, 0}, {0, 1}, {1, 1}, {2, 1}, {1, 2}};

	for (ia = 0; ia + s < g->n_axis; ia += s)
		for (ir = 0; ir + s < g->n_rpm; ir += s) {
			if (!differ(g, ir, ia, s))
				continue;
			for (k = 0; k < 5; k++) {
				int jr = ir + off[k][0] * h;
				int ja = ia + off[k][1] * h;
				struct ow_grid_point *gp =
				    ow_grid_at(g, jr, ja);

				if (gp->solved) /* solved, or planned */
					continue;
				gp->solved = -1; /* planned */
				list[n++] = ja * g->n_rpm + jr;
			}
		}
	return n;
}

static int cmp_int(const void *a, const void *b)
{
	int x = *(const int *)a, y = *(const int *)b;

	return (x > y) - (x < y);
}

/* Start of a refined point (ir, ia) of level s: throughput and slope
 * interpolated bilinearly from the converged corners of its cell, which
 * were all solved at coarser levels. */
static void cell_start(const struct ow_grid *g, int ir, int ia, int s,
                       struct ow_solver_start *out)
{
	int i0 = ir - ir % s, j0 = ia - ia % s, k;
	double tx = (double)(ir - i0) / s, ty = (double)(ia - j0) / s;
	double wsum = 0.0, gsum = 0.0, ksum = 0.0;

	memset(out, 0, sizeof *out);
	for (k = 0; k < 4; k++) {
		int i = i0 + (k & 1) * s, j = j0 + (k >> 1) * s;
		double w =
		    ((k & 1) ? tx : 1.0 - tx) * ((k >> 1) ? ty : 1.0 - ty);
		const struct ow_grid_point *c;

		if (w <= 0.0 || i >= g->n_rpm || j >= g->n_axis)
			continue;
		c = ow_grid_at(g, i, j);
		if (!usable(c) || !(c->pt.match_slope < 0.0))
			continue;
		wsum += w;
		gsum += w * c->pt.output_kg_s;
		ksum += w * c->pt.match_slope;
	}
	out->g_kg_s = wsum > 0.0 ? gsum / wsum : 0.0;
	out->slope = wsum > 0.0 ? ksum / wsum : 0.0;
}

static void refine_pass(struct run *r, struct ow_solver **svs, int *list)
{
	struct ow_grid *g = r->g;
	int s, n, k;

	for (s = g->stride; s >= 2; s /= 2) {
		n = mark_level(g, s, list);
		qsort(list, (size_t)n, sizeof *list, cmp_int);
		r->planned += n;
#pragma omp parallel for schedule(dynamic) num_threads(r->threads)
		for (k = 0; k < n; k++) {
			int ir = list[k] % g->n_rpm, ia = list[k] / g->n_rpm;
			struct ow_solver_start s0;

			cell_start(g, ir, ia, s, &s0);
			solve_point(r, svs[omp_get_thread_num()], ir, ia, &s0);
		}
	}
}

/* Unsolved lattice points lie in cells no boundary crosses: they take the
 * verdict of the smallest enclosing solved cell's corner. */
static void fill_uniform(struct ow_grid *g)
{
	int ir, ia, s;

	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			struct ow_grid_point *gp = ow_grid_at(g, ir, ia);

			for (s = 2; !gp->solved && s <= g->stride; s *= 2) {
				const struct ow_grid_point *c =
				    ow_grid_at(g, ir - ir % s, ia - ia % s);

				if (c->solved == 1) {
					gp->v = c->v;
					break;
				}
			}
		}
}

static enum ow_status make_grid(const struct ow_study *s,
                                const struct ow_sweep_config *c,
                                struct ow_grid **out, struct ow_diag *d)
{
	const struct ow_axes *ax = &s->line.axes;
	int nr = c->rpm_steps > 0 ? c->rpm_steps : ax->rpm_steps;
	int na = c->axis_steps > 0 ? c->axis_steps : ax->axis_steps;
	int ref = c->refine, ir, ia;
	struct ow_grid *g;

	if (ax->rpm_steps < 2)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: sweep: the study has no sweep "
		                   "(sweep.rpm and sweep.barrel)",
		                   s->path);
	if (nr < 2 || na < 2 || nr > 1000 || na > 1000 || ref < 0 ||
	    ref > MAX_REFINE)
		return ow_diag_set(d, OW_EARG,
		                   "grid %dx%d with refine %d: steps must be "
		                   "2..1000 and refine 0..%d",
		                   nr, na, ref, MAX_REFINE);
	g = calloc(1, sizeof *g);
	if (!g)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	g->stride = 1 << ref;
	g->n_rpm = (nr - 1) * g->stride + 1;
	g->n_axis = (na - 1) * g->stride + 1;
	g->pts = calloc((size_t)g->n_rpm * (size_t)g->n_axis, sizeof *g->pts);
	if (!g->pts) {
		free(g);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			struct ow_grid_point *gp = ow_grid_at(g, ir, ia);

			gp->rpm = ax->rpm_from + (ax->rpm_to - ax->rpm_from) *
			                             ir / (g->n_rpm - 1);
			gp->axis =
			    ax->axis_from + (ax->axis_to - ax->axis_from) * ia /
			                        (g->n_axis - 1);
			gp->set_ref_K = ow_line_axis_ref_K(&s->line, gp->axis);
		}
	*out = g;
	return OW_OK;
}

static enum ow_status make_solvers(struct run *r, struct ow_solver **svs)
{
	enum ow_status st = OW_OK;
	int t;

	for (t = 0; t < r->threads && st == OW_OK; t++)
		st = ow_solver_create(r->s, &svs[t], &r->diag);
	return st;
}

enum ow_status ow_sweep_run(const struct ow_study *s,
                            const struct ow_sweep_config *c,
                            struct ow_grid **out, struct ow_diag *d)
{
	struct run r = {s, c, NULL, 0, 0, 0, OW_OK, {{0}}};
	struct ow_solver **svs = NULL;
	int *list = NULL, t;
	enum ow_status st = make_grid(s, c, &r.g, d);

	*out = NULL;
	if (st != OW_OK)
		return st;
	r.threads = c->jobs > 0 ? c->jobs : omp_get_max_threads();
	r.planned = ((r.g->n_rpm - 1) / r.g->stride + 1) *
	            ((r.g->n_axis - 1) / r.g->stride + 1);
	svs = calloc((size_t)r.threads, sizeof *svs);
	list = malloc(sizeof *list * (size_t)r.g->n_rpm * (size_t)r.g->n_axis);
	if (!svs || !list) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	st = make_solvers(&r, svs);
	if (st != OW_OK) {
		ow_diag_set(d, st, "%s", r.diag.msg);
		goto fail;
	}
	coarse_pass(&r, svs);
	refine_pass(&r, svs, list);
	fill_uniform(r.g);
	r.g->solves = r.done;
	if (c->progress)
		c->progress(c->progress_ctx, r.done, r.done);
	*out = r.g;
	r.g = NULL;
fail:
	for (t = 0; svs && t < r.threads; t++)
		ow_solver_destroy(svs[t]);
	free(svs);
	free(list);
	ow_grid_destroy(r.g);
	return st;
}
