/* spread_run.c - the sampled sweep: every solved point of a nominal grid
 * solved again for its Latin hypercube of input samples, the points the
 * spread cannot change decided from their nominal margins, the robust
 * grid, and the ranking of the inputs. Each thread owns a copy of the
 * study that it moves to each sample and a solver bound to that copy. */
#include "ow_spread.h"

#include <math.h>
#include <omp.h>
#include <stdlib.h>
#include <string.h>

#include "ow_study.h"
#include "ow_sweep.h"
#include "ow_window.h"

_Static_assert(OW_SPREAD_LIMITS == OW_CK_LIMITS, "limits with margins");

#define BOUND_SAFETY 1.5 /* on the probes' summed one-at-a-time changes */

/* One thread's workspace. */
struct worker {
	struct ow_study *s;   /* moved to each sample */
	struct ow_solver *sv; /* bound to s */
	double *u;            /* samples x inputs */
	double *m;            /* samples x limits */
	double *mmin;         /* samples: smallest margin */
	int solves;           /* solves this thread did */
};

struct srun {
	const struct ow_study *s;
	const struct ow_spread *sp;
	const struct ow_grid *g;
	const struct ow_spread_config *c;
	struct ow_spread_result *r;
	int n, d;    /* samples, inputs */
	double *acc; /* per point: 2 d + 2 centred sums (ranking) */
	int done, planned;
};

void ow_spread_config_default(struct ow_spread_config *c)
{
	memset(c, 0, sizeof *c);
	c->seed = -1;
}

void ow_spread_result_destroy(struct ow_spread_result *r)
{
	if (!r)
		return;
	free(r->pts);
	free(r);
}

/* Restore the moved parts of w->s and move every input to vals[]. */
static void move_study(const struct srun *x, struct worker *w,
                       const double *vals)
{
	int k;

	w->s->screw = x->s->screw;
	w->s->resin = x->s->resin;
	w->s->line = x->s->line;
	for (k = 0; k < x->d; k++)
		ow_spread_apply(w->s, &x->sp->in[k], vals[k]);
}

/* Solve grid point gp for the study moved to vals (a sample equal to the
 * nominal study takes the nominal solve), started from the nominal solve
 * there (its throughput, match slope and floating zones). */
static void solve_moved(const struct srun *x, struct worker *w,
                        const struct ow_grid_point *gp, const double *vals,
                        struct ow_verdict *v)
{
	double set_K[OW_MAX_ZONES];
	struct ow_solver_start s0;
	struct ow_point pt;
	struct ow_diag d = {{0}};
	int k, same = 1;

	for (k = 0; k < x->d; k++)
		same &= vals[k] == x->sp->in[k].nominal;
	if (same) {
		*v = gp->v;
		return;
	}
	move_study(x, w, vals);
	w->solves++;
	ow_line_apply_axis(&w->s->line, gp->axis, set_K);
	ow_solver_start_from(&gp->pt, &s0);
	if (ow_solver_run_from(w->sv, gp->rpm, set_K, &s0, &pt, &d) != OW_OK)
		pt.flags |= OW_FLAG_NOT_CONVERGED; /* never stop a sweep */
	ow_classify(&pt, &w->s->line.limits, ow_screw_length(&w->s->screw), v);
}

/* ---- the bound: how far the spread moves each margin ------------------- */

/* Probe points: the solved coarse points nearest the corners, edge
 * middles and centre of the map. */
static int probe_points(const struct ow_grid *g, int *idx)
{
	int n = 0, i, j, st = g->stride;
	int nr = (g->n_rpm - 1) / st, na = (g->n_axis - 1) / st;

	for (j = 0; j < 3; j++)
		for (i = 0; i < 3; i++) {
			int ir = (nr * i / 2) * st, ia = (na * j / 2) * st;
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			if (p->solved == 1 &&
			    !(p->pt.flags & OW_FLAG_NOT_CONVERGED))
				idx[n++] = ia * g->n_rpm + ir;
		}
	return n;
}

/* At a probe, each input alone at both ends of its extent: the change of
 * each margin, summed over the inputs (the first-order worst case). */
static void probe_one(const struct srun *x, struct worker *w, int idx,
                      double *delta)
{
	const struct ow_grid_point *gp = &x->g->pts[idx];
	double vals[OW_SPREAD_MAX_INPUTS], e[2];
	struct ow_verdict v;
	int i, k, end;

	for (k = 0; k < OW_CK_LIMITS; k++)
		delta[k] = 0.0;
	for (i = 0; i < x->d; i++) {
		double worst[OW_CK_LIMITS] = {0};

		ow_spread_extent(&x->sp->in[i], &e[0], &e[1]);
		for (end = 0; end < 2; end++) {
			for (k = 0; k < x->d; k++)
				vals[k] = x->sp->in[k].nominal;
			vals[i] = e[end];
			solve_moved(x, w, gp, vals, &v);
			for (k = 0; k < OW_CK_LIMITS; k++) {
				double c = fabs(v.margin[k] - gp->v.margin[k]);

				if (isnan(gp->v.margin[k]))
					continue;
				worst[k] = isnan(c)       ? INFINITY
				           : c > worst[k] ? c
				                          : worst[k];
			}
		}
		for (k = 0; k < OW_CK_LIMITS; k++)
			delta[k] += worst[k];
	}
}

static void measure_bound(struct srun *x, struct worker *ws)
{
	int idx[9], np = probe_points(x->g, idx), p, k;
	double delta[9][OW_CK_LIMITS];

#pragma omp parallel for schedule(dynamic) num_threads(x->c->jobs)
	for (p = 0; p < np; p++)
		probe_one(x, &ws[omp_get_thread_num()], idx[p], delta[p]);
	for (k = 0; k < OW_CK_LIMITS; k++) {
		double b = np ? 0.0 : INFINITY;

		for (p = 0; p < np; p++)
			b = delta[p][k] > b ? delta[p][k] : b;
		x->r->bound[k] = BOUND_SAFETY * b;
	}
	for (p = 0; p < x->c->jobs; p++)
		x->r->probe_solves += ws[p].solves;
}

/* 1: every sample safe, 0: every sample unsafe, -1: sample the point.
 * Deep inside: safe with each set limit's margin beyond the bound. Far
 * outside: a limit's margin below minus the bound. */
static int decide(const struct ow_spread_result *r,
                  const struct ow_grid_point *gp)
{
	int k, inside = gp->v.bits == 0;

	if (gp->pt.flags & OW_FLAG_NOT_CONVERGED)
		return -1;
	for (k = 0; k < OW_CK_LIMITS; k++) {
		double m = gp->v.margin[k];

		if (isnan(m))
			continue;
		if (m < -r->bound[k])
			return 0;
		inside &= m > r->bound[k];
	}
	return inside ? 1 : -1;
}

/* ---- one sampled point -------------------------------------------------- */

static int cmp_desc(const void *a, const void *b)
{
	double x = *(const double *)a, y = *(const double *)b;

	return (x < y) - (x > y);
}

/* The margin at least `level` of the samples reach (NaN counts lowest). */
static double level_margin(double *m, int n, double level)
{
	int i, q = (int)ceil(level * n - 1e-9) - 1;

	for (i = 0; i < n; i++)
		if (isnan(m[i]))
			m[i] = -INFINITY;
	qsort(m, (size_t)n, sizeof *m, cmp_desc);
	return m[q < 0 ? 0 : q];
}

/* Centred sums over the point's samples with a finite smallest margin:
 * for each input sum (u - ub)^2 and sum (u - ub)(m - mb), then sum
 * (m - mb)^2 and the count. */
static void rank_sums(const struct srun *x, const struct worker *w, double *acc)
{
	double ub[OW_SPREAD_MAX_INPUTS] = {0}, mb = 0.0;
	int i, k, c = 0;

	for (i = 0; i < x->n; i++)
		if (isfinite(w->mmin[i])) {
			c++;
			mb += w->mmin[i];
			for (k = 0; k < x->d; k++)
				ub[k] += w->u[i * x->d + k];
		}
	memset(acc, 0, sizeof *acc * (size_t)(2 * x->d + 2));
	if (c < 2)
		return;
	mb /= c;
	for (k = 0; k < x->d; k++)
		ub[k] /= c;
	for (i = 0; i < x->n; i++) {
		double dm = w->mmin[i] - mb;

		if (!isfinite(w->mmin[i]))
			continue;
		for (k = 0; k < x->d; k++) {
			double du = w->u[i * x->d + k] - ub[k];

			acc[2 * k] += du * du;
			acc[2 * k + 1] += du * dm;
		}
		acc[2 * x->d] += dm * dm;
	}
	acc[2 * x->d + 1] = c;
}

static void sample_point(const struct srun *x, struct worker *w, int idx)
{
	const struct ow_grid_point *gp = &x->g->pts[idx];
	struct ow_spread_point *sp = &x->r->pts[idx];
	double vals[OW_SPREAD_MAX_INPUTS];
	struct ow_verdict v;
	int i, k, safe = 0;

	ow_spread_lhs(x->r->seed, idx, x->n, x->d, w->u);
	for (i = 0; i < x->n; i++) {
		for (k = 0; k < x->d; k++)
			vals[k] =
			    ow_spread_value(&x->sp->in[k], w->u[i * x->d + k]);
		solve_moved(x, w, gp, vals, &v);
		safe += v.bits == 0;
		sp->fail_bits |= v.bits;
		w->mmin[i] = INFINITY;
		for (k = 0; k < OW_CK_LIMITS; k++) {
			double m = v.margin[k];

			w->m[k * x->n + i] = m;
			if (!isnan(gp->v.margin[k]))
				w->mmin[i] = isnan(m)         ? NAN
				             : m < w->mmin[i] ? m
				                              : w->mmin[i];
			if (!isnan(m) && !(m >= sp->worst[k]) &&
			    !isnan(gp->v.margin[k]))
				sp->worst[k] = m;
		}
	}
	sp->sampled = 1;
	sp->share = (double)safe / x->n;
	for (k = 0; k < OW_CK_LIMITS; k++)
		sp->level_margin[k] =
		    isnan(gp->v.margin[k])
		        ? NAN
		        : level_margin(&w->m[k * x->n], x->n, x->r->level);
	rank_sums(x, w, &x->acc[(size_t)idx * (size_t)(2 * x->d + 2)]);
}

static void point_pass(struct srun *x, struct worker *ws)
{
	int i, total = x->g->n_rpm * x->g->n_axis;

#pragma omp parallel for schedule(dynamic) num_threads(x->c->jobs)
	for (i = 0; i < total; i++) {
		const struct ow_grid_point *gp = &x->g->pts[i];
		struct ow_spread_point *sp = &x->r->pts[i];
		int k, verdict, done;

		for (k = 0; k < OW_CK_LIMITS; k++)
			sp->worst[k] = sp->level_margin[k] = NAN;
		if (gp->solved != 1)
			continue;
		verdict = decide(x->r, gp);
		if (verdict >= 0) {
			sp->share = verdict;
			sp->fail_bits = gp->v.bits;
			continue;
		}
		sample_point(x, &ws[omp_get_thread_num()], i);
#pragma omp atomic capture
		done = ++x->done;
		if (x->c->progress && omp_get_thread_num() == 0)
			x->c->progress(x->c->progress_ctx, done, x->planned);
	}
}

/* Unsolved lattice points take the share of the smallest enclosing solved
 * cell's corner, as their verdict does. */
static void fill_unsolved(const struct ow_grid *g, struct ow_spread_result *r)
{
	int ir, ia, s;

	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			int i = ia * g->n_rpm + ir;

			for (s = 2; g->pts[i].solved != 1 && s <= g->stride;
			     s *= 2) {
				int c = (ia - ia % s) * g->n_rpm + ir - ir % s;

				if (g->pts[c].solved == 1) {
					r->pts[i] = r->pts[c];
					r->pts[i].sampled = 0;
					break;
				}
			}
		}
}

/* ---- the ranking --------------------------------------------------------- */

static int cmp_rank(const void *a, const void *b)
{
	double x = fabs(((const struct ow_spread_rank *)a)->corr);
	double y = fabs(((const struct ow_spread_rank *)b)->corr);

	return (x < y) - (x > y);
}

/* Pooled within-point correlation of each input with the smallest margin
 * over the fringe points (some but not all samples safe; every sampled
 * point when there are none), summed in lattice order. */
static void rank_inputs(struct srun *x)
{
	int total = x->g->n_rpm * x->g->n_axis, w = 2 * x->d + 2;
	int i, k, fringe = 0, pass;
	double sum[2 * OW_SPREAD_MAX_INPUTS + 2];

	for (i = 0; i < total; i++)
		fringe |= x->r->pts[i].sampled && x->r->pts[i].share > 0.0 &&
		          x->r->pts[i].share < 1.0;
	memset(sum, 0, sizeof sum);
	for (pass = 0, i = 0; i < total; i++) {
		const struct ow_spread_point *p = &x->r->pts[i];

		if (!p->sampled || x->g->pts[i].solved != 1 ||
		    (fringe && !(p->share > 0.0 && p->share < 1.0)))
			continue;
		for (k = 0; k < w; k++)
			sum[k] += x->acc[(size_t)i * (size_t)w + (size_t)k];
		pass++;
	}
	x->r->n_rank = 0;
	for (k = 0; pass && k < x->d; k++) {
		double den = sqrt(sum[2 * k] * sum[2 * x->d]);

		if (!(den > 0.0))
			continue;
		x->r->rank[x->r->n_rank].input = k;
		x->r->rank[x->r->n_rank++].corr = sum[2 * k + 1] / den;
	}
	qsort(x->r->rank, (size_t)x->r->n_rank, sizeof *x->r->rank, cmp_rank);
}

/* ---- the run ------------------------------------------------------------- */

static enum ow_status make_workers(const struct srun *x, struct worker *ws,
                                   int threads, struct ow_diag *d)
{
	enum ow_status st = OW_OK;
	int t;

	for (t = 0; t < threads && st == OW_OK; t++) {
		struct worker *w = &ws[t];

		w->s = malloc(sizeof *w->s);
		w->u = malloc(sizeof *w->u * (size_t)(x->n * x->d));
		w->m = malloc(sizeof *w->m * (size_t)(x->n * OW_CK_LIMITS));
		w->mmin = malloc(sizeof *w->mmin * (size_t)x->n);
		if (!w->s || !w->u || !w->m || !w->mmin)
			return ow_diag_set(d, OW_ENOMEM, "out of memory");
		*w->s = *x->s;
		st = ow_solver_create(w->s, &w->sv, d);
	}
	return st;
}

static void free_workers(struct worker *ws, int threads)
{
	int t;

	for (t = 0; ws && t < threads; t++) {
		ow_solver_destroy(ws[t].sv);
		free(ws[t].s);
		free(ws[t].u);
		free(ws[t].m);
		free(ws[t].mmin);
	}
	free(ws);
}

static enum ow_status setup(struct srun *x, const struct ow_study *s,
                            const struct ow_grid *g, struct ow_diag *d)
{
	const struct ow_spread_config *c = x->c;
	size_t total = (size_t)g->n_rpm * (size_t)g->n_axis;

	if (s->spread.n < 1)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: spread: no input is "
		                   "varied (the spread block or --spread "
		                   "names none)",
		                   s->path);
	x->r = calloc(1, sizeof *x->r);
	if (!x->r || !(x->r->pts = calloc(total, sizeof *x->r->pts)))
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	x->r->n_rpm = g->n_rpm;
	x->r->n_axis = g->n_axis;
	x->r->samples = x->n = c->samples > 0 ? c->samples : s->spread.samples;
	x->r->seed = c->seed >= 0 ? (unsigned long)c->seed : s->spread.seed;
	x->r->level = c->level > 0 ? c->level : s->spread.level;
	x->d = s->spread.n;
	x->acc = calloc(total * (size_t)(2 * x->d + 2), sizeof *x->acc);
	if (!x->acc)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (x->n < 2 || x->n > OW_SPREAD_MAX_SAMPLES)
		return ow_diag_set(d, OW_EARG, "%d samples: expected 2..%d",
		                   x->n, OW_SPREAD_MAX_SAMPLES);
	return OW_OK;
}

/* Solves done (probes included), and samples not solved: at decided
 * points and where a sample is the nominal study. */
static void count(struct srun *x, const struct worker *ws)
{
	int i, total = x->g->n_rpm * x->g->n_axis, solved = 0;

	x->r->solves = 0;
	for (i = 0; i < x->c->jobs; i++)
		x->r->solves += ws[i].solves;
	for (i = 0; i < total; i++)
		solved += x->g->pts[i].solved == 1;
	x->r->solves_saved =
	    solved * x->n - (x->r->solves - x->r->probe_solves);
}

enum ow_status ow_spread_run(const struct ow_study *s, const struct ow_grid *g,
                             const struct ow_spread_config *c,
                             struct ow_spread_result **out, struct ow_diag *d)
{
	struct ow_spread_config cc = *c;
	struct srun x = {s, &s->spread, g, &cc, NULL, 0, 0, NULL, 0, 0};
	struct worker *ws = NULL;
	enum ow_status st;

	*out = NULL;
	cc.jobs = c->jobs > 0 ? c->jobs : omp_get_max_threads();
	st = setup(&x, s, g, d);
	if (st == OW_OK && !(ws = calloc((size_t)cc.jobs, sizeof *ws)))
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (st == OW_OK)
		st = make_workers(&x, ws, cc.jobs, d);
	if (st != OW_OK)
		goto done;
	x.planned = g->solves;
	measure_bound(&x, ws);
	point_pass(&x, ws);
	fill_unsolved(g, x.r);
	rank_inputs(&x);
	count(&x, ws);
	if (c->progress)
		c->progress(c->progress_ctx, x.planned, x.planned);
	*out = x.r;
	x.r = NULL;
done:
	free_workers(ws, cc.jobs);
	free(x.acc);
	ow_spread_result_destroy(x.r);
	return st;
}

/* ---- the robust grid ----------------------------------------------------- */

/* The limit with the lowest level margin (a failing point must name one). */
static unsigned lowest_limit(const struct ow_spread_point *p)
{
	int k, best = -1;

	for (k = 0; k < OW_CK_LIMITS; k++)
		if (!isnan(p->level_margin[k]) &&
		    (best < 0 || p->level_margin[k] < p->level_margin[best]))
			best = k;
	return best < 0 ? 1u << OW_CK_NOCONV : 1u << best;
}

enum ow_status ow_spread_robust_grid(const struct ow_grid *g,
                                     const struct ow_spread_result *r,
                                     struct ow_grid **out, struct ow_diag *d)
{
	size_t total = (size_t)g->n_rpm * (size_t)g->n_axis, i;
	struct ow_grid *h = malloc(sizeof *h);
	int k;

	*out = NULL;
	if (h)
		*h = *g;
	if (!h || !(h->pts = malloc(total * sizeof *h->pts))) {
		free(h);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	memcpy(h->pts, g->pts, total * sizeof *h->pts);
	for (i = 0; i < total; i++) {
		const struct ow_spread_point *p = &r->pts[i];
		struct ow_verdict *v = &h->pts[i].v;

		for (k = 0; k < OW_CK_LIMITS; k++)
			if (p->level_margin[k] < v->margin[k])
				v->margin[k] = p->level_margin[k];
		if (p->share < r->level)
			v->bits |=
			    p->fail_bits ? p->fail_bits : lowest_limit(p);
	}
	*out = h;
	return OW_OK;
}

static void clip(double *lo, double *hi, double a, double b)
{
	*lo = *lo > a ? *lo : a;
	*hi = *hi < b ? *hi : b;
}

static double inside(double v, double lo, double hi)
{
	return v < lo ? lo : (v > hi ? hi : v);
}

void ow_spread_clip_window(struct ow_window *rw, const struct ow_window *w)
{
	double shift;
	int z;

	if (rw->empty)
		return;
	if (w->empty) {
		rw->empty = 1;
		return;
	}
	shift = rw->set_min_K - rw->axis_min; /* set-point = axis + shift */
	clip(&rw->rpm_min, &rw->rpm_max, w->rpm_min, w->rpm_max);
	clip(&rw->set_min_K, &rw->set_max_K, w->set_min_K, w->set_max_K);
	clip(&rw->axis_min, &rw->axis_max, w->axis_min, w->axis_max);
	for (z = 0; z < OW_MAX_ZONES; z++)
		clip(&rw->zone_min_K[z], &rw->zone_max_K[z], w->zone_min_K[z],
		     w->zone_max_K[z]);
	if (!(rw->rpm_min <= rw->rpm_max && rw->set_min_K <= rw->set_max_K)) {
		rw->empty = 1;
		return;
	}
	rw->centre.rpm = inside(rw->centre.rpm, rw->rpm_min, rw->rpm_max);
	rw->centre_set_K =
	    inside(rw->centre_set_K, rw->set_min_K, rw->set_max_K);
	rw->centre.axis = rw->centre_set_K - shift;
}
