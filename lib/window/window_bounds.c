/* window_bounds.c - the recommended rectangle located independently of the
 * grid: each limit's signed margin interpolated between solved points,
 * the rectangle's screw speed bounds found where a margin crosses zero,
 * its set-point bounds on whole steps a person sets on the line.
 *
 * The margins of every lattice point (unsolved points of a refined grid
 * interpolated bilinearly from the smallest solved cell around them) span
 * a bilinear field over the swept range. Along a line of constant
 * barrel-axis value each margin is then piecewise linear in screw speed,
 * so where it is >= 0 is found exactly as intervals (the crossing of a
 * linear function: linear interpolation, Press et al., Numerical Recipes,
 * 3rd ed., 2007, section 3.1). Between two lattice rows a margin is linear
 * in the axis value, so a band of rows is safe at one speed when it is
 * safe on its end rows and on every lattice row inside: the band's safe
 * speeds are the intersection of those rows' intervals.
 *
 * The rectangle maximises its area in units of the swept ranges (as the
 * lattice search did) over set-point bounds on the whole-step set
 * (reference zone at whole kelvin, or the sweep's own ends), with the
 * speed bounds continuous; the chosen speeds are then rounded inward to
 * whole rpm. Each bound records what sets it: a limit's margin crossing
 * zero, a flag (plugging, starved feed, no convergence: located half-way
 * between points, having no margin), or the edge of the swept range. */
#include "window_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Channels: the three flags first (they win ties), then the set limits. */
#define MAX_CH   (OW_CK_COUNT)
#define END_NONE (-2) /* an interval end that is only a segment's end */

struct field {
	int nr, na, nch;
	int ch[MAX_CH];        /* check of each channel */
	double *v;             /* [(ia * nr + ir) * nch + k] */
	double r0, dr, a0, da; /* lattice speeds and axis values */
};

struct iv {
	double lo, hi;
	int lo_ch, hi_ch; /* channel that sets the end, END_NONE, or
	                     OW_WINDOW_SWEEP_EDGE */
};

struct ivs {
	int n, cap;
	struct iv *p;
};

static double point_value(const struct ow_grid_point *p, int c)
{
	if (c >= OW_CK_LIMITS)
		return (p->v.bits >> c) & 1u ? -1.0 : 1.0;
	if (isnan(p->v.margin[c]))
		return (p->v.bits >> c) & 1u ? -1.0 : 1.0;
	return p->v.margin[c];
}

/* Values of an unsolved point: bilinear in the smallest cell around it
 * whose four corners were solved (the coarse cell at the latest). */
static void fill_point(const struct ow_grid *g, struct field *f, int ir, int ia,
                       double *out)
{
	int s, k;

	for (s = 2; s <= g->stride; s *= 2) {
		int i0 = ir - ir % s, j0 = ia - ia % s;
		int i1 = i0 + s < g->n_rpm ? i0 + s : i0;
		int j1 = j0 + s < g->n_axis ? j0 + s : j0;
		const struct ow_grid_point *c[4] = {
		    ow_grid_at(g, i0, j0), ow_grid_at(g, i1, j0),
		    ow_grid_at(g, i0, j1), ow_grid_at(g, i1, j1)};
		double tx = (double)(ir - i0) / s, ty = (double)(ia - j0) / s;

		if (c[0]->solved != 1 || c[1]->solved != 1 ||
		    c[2]->solved != 1 || c[3]->solved != 1)
			continue;
		for (k = 0; k < f->nch; k++) {
			double b = point_value(c[0], f->ch[k]) * (1 - tx) +
			           point_value(c[1], f->ch[k]) * tx;
			double t = point_value(c[2], f->ch[k]) * (1 - tx) +
			           point_value(c[3], f->ch[k]) * tx;

			out[k] = b * (1 - ty) + t * ty;
		}
		return;
	}
	for (k = 0; k < f->nch; k++) /* not reached on a swept lattice */
		out[k] = point_value(ow_grid_at(g, ir, ia), f->ch[k]);
}

static int field_make(const struct ow_study *s, const struct ow_grid *g,
                      struct field *f)
{
	int c, ir, ia, k;

	f->nr = g->n_rpm;
	f->na = g->n_axis;
	f->nch = 0;
	for (c = OW_CK_LIMITS; c < OW_CK_COUNT; c++)
		f->ch[f->nch++] = c;
	for (c = 0; c < OW_CK_LIMITS; c++)
		if (ow_check_active(&s->line.limits, (enum ow_check)c))
			f->ch[f->nch++] = c;
	f->v = malloc(sizeof *f->v * (size_t)f->nr * (size_t)f->na *
	              (size_t)f->nch);
	if (!f->v)
		return -1;
	f->r0 = ow_grid_at(g, 0, 0)->rpm;
	f->a0 = ow_grid_at(g, 0, 0)->axis;
	f->dr = (ow_grid_at(g, f->nr - 1, 0)->rpm - f->r0) / (f->nr - 1);
	f->da = (ow_grid_at(g, 0, f->na - 1)->axis - f->a0) / (f->na - 1);
	for (ia = 0; ia < f->na; ia++)
		for (ir = 0; ir < f->nr; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			double *out = &f->v[((size_t)ia * f->nr + ir) * f->nch];

			if (p->solved == 1)
				for (k = 0; k < f->nch; k++)
					out[k] = point_value(p, f->ch[k]);
			else
				fill_point(g, f, ir, ia, out);
		}
	return 0;
}

/* Channel k along the row at axis value a, at lattice speed index ir. */
static double row_value(const struct field *f, double a, int ir, int k)
{
	double x = (a - f->a0) / f->da;
	int j = (int)floor(x);
	double t;

	if (j < 0)
		j = 0;
	if (j > f->na - 2)
		j = f->na - 2;
	t = x - j;
	return f->v[((size_t)j * f->nr + ir) * f->nch + k] * (1 - t) +
	       f->v[((size_t)(j + 1) * f->nr + ir) * f->nch + k] * t;
}

static int ivs_push(struct ivs *s, struct iv v)
{
	if (s->n == s->cap) {
		int cap = s->cap ? 2 * s->cap : 8;
		struct iv *p = realloc(s->p, sizeof *p * (size_t)cap);

		if (!p)
			return -1;
		s->p = p;
		s->cap = cap;
	}
	s->p[s->n++] = v;
	return 0;
}

/* Safe part of segment [ir, ir + 1] of the row: where every channel's
 * linear piece is >= 0; the channel whose crossing sets each end. */
static int segment(const struct field *f, double a, int ir, struct iv *out)
{
	double x0 = f->r0 + ir * f->dr;
	int k;

	out->lo = x0;
	out->hi = f->r0 + (ir + 1) * f->dr; /* the next segment's x0 to the
	                                       bit, so the two join */
	out->lo_ch = out->hi_ch = END_NONE;
	for (k = 0; k < f->nch; k++) {
		double v0 = row_value(f, a, ir, k);
		double v1 = row_value(f, a, ir + 1, k);
		double x;

		if (v0 >= 0.0 && v1 >= 0.0)
			continue;
		if (v0 < 0.0 && v1 < 0.0)
			return 0;
		x = x0 + f->dr * v0 / (v0 - v1);
		if (v0 >= 0.0 && x < out->hi) {
			out->hi = x;
			out->hi_ch = k;
		} else if (v0 < 0.0 && x > out->lo) {
			out->lo = x;
			out->lo_ch = k;
		}
	}
	return out->lo <= out->hi;
}

/* The safe speeds of the row at axis value a, as intervals. */
static int row_safe(const struct field *f, double a, struct ivs *out)
{
	int ir;

	out->n = 0;
	for (ir = 0; ir + 1 < f->nr; ir++) {
		struct iv v;
		struct iv *last = out->n ? &out->p[out->n - 1] : NULL;

		if (!segment(f, a, ir, &v))
			continue;
		if (last && last->hi_ch == END_NONE && v.lo_ch == END_NONE &&
		    last->hi == v.lo) {
			last->hi = v.hi;
			last->hi_ch = v.hi_ch;
		} else if (ivs_push(out, v)) {
			return -1;
		}
	}
	if (out->n && out->p[0].lo_ch == END_NONE)
		out->p[0].lo_ch = OW_WINDOW_SWEEP_EDGE;
	if (out->n && out->p[out->n - 1].hi_ch == END_NONE)
		out->p[out->n - 1].hi_ch = OW_WINDOW_SWEEP_EDGE;
	return 0;
}

/* a := a intersected with b (both sorted, disjoint). */
static int intersect(struct ivs *a, const struct ivs *b, struct ivs *tmp)
{
	int i = 0, j = 0;

	tmp->n = 0;
	while (i < a->n && j < b->n) {
		const struct iv *x = &a->p[i], *y = &b->p[j];
		struct iv v;

		v.lo = fmax(x->lo, y->lo);
		v.lo_ch = x->lo >= y->lo ? x->lo_ch : y->lo_ch;
		v.hi = fmin(x->hi, y->hi);
		v.hi_ch = x->hi <= y->hi ? x->hi_ch : y->hi_ch;
		if (v.lo <= v.hi && ivs_push(tmp, v))
			return -1;
		if (x->hi < y->hi)
			i++;
		else
			j++;
	}
	{
		struct ivs t = *a;

		*a = *tmp;
		*tmp = t;
	}
	return 0;
}

/* The rows searched: every lattice row and every whole set-point step
 * (candidates for a bound), sorted. */
struct rows {
	int n;
	double *a; /* axis values */
	unsigned char *cand;
	struct ivs *safe;
};

/* Step in the bound's own unit: 1, or 2, 5, 10 ... while more than 1000
 * steps would span the range. */
static double nice_step(double range)
{
	static const double m[3] = {1.0, 2.0, 5.0};
	double p = 1.0;
	int i;

	if (!isfinite(range) || range <= 1000.0)
		return 1.0; /* a NaN or infinite span (one-point axis) ends too
		             */
	for (;;) {
		for (i = 0; i < 3; i++)
			if (range / (m[i] * p) <= 1000.0)
				return m[i] * p;
		p *= 10.0;
	}
}

struct row_in {
	double a;
	int cand;
};

static int cmp_row(const void *x, const void *y)
{
	double a = ((const struct row_in *)x)->a;
	double b = ((const struct row_in *)y)->a;

	return (a > b) - (a < b);
}

/* Lattice rows (the two ends are bound candidates: the sweep's edges) and
 * the reference zone's set-point at every whole step in degC (offset_K:
 * that set-point in degC at axis value 0), merged where they coincide. */
static int rows_make(const struct field *f, double offset_K, double step_K,
                     struct rows *r)
{
	double lo = f->a0, hi = f->a0 + (f->na - 1) * f->da;
	double first = ceil((lo + offset_K) / step_K - 1e-9) * step_K;
	int n_steps = (int)floor((hi + offset_K - first) / step_K + 1e-9) + 1;
	int n = 0, i;
	struct row_in *in;

	memset(r, 0, sizeof *r);
	n_steps = n_steps > 0 ? n_steps : 0;
	in = malloc(sizeof *in * (size_t)(f->na + n_steps));
	if (!in)
		return -1;
	for (i = 0; i < f->na; i++)
		in[n++] = (struct row_in){f->a0 + i * f->da,
		                          i == 0 || i == f->na - 1};
	for (i = 0; i < n_steps; i++)
		in[n++] = (struct row_in){first + i * step_K - offset_K, 1};
	qsort(in, (size_t)n, sizeof *in, cmp_row);
	r->a = malloc(sizeof *r->a * (size_t)n);
	r->cand = calloc((size_t)n, 1);
	r->safe = calloc((size_t)n, sizeof *r->safe);
	if (!r->a || !r->cand || !r->safe) {
		free(in);
		return -1;
	}
	for (i = 0; i < n; i++) {
		double a = fmin(fmax(in[i].a, lo), hi);

		/* a step within a hair of a lattice row is that row */
		if (r->n && fabs(a - r->a[r->n - 1]) <= 1e-9 * (1 + fabs(a))) {
			r->cand[r->n - 1] |= (unsigned char)in[i].cand;
			continue;
		}
		r->a[r->n] = a;
		r->cand[r->n++] = (unsigned char)in[i].cand;
	}
	free(in);
	for (i = 0; i < r->n; i++)
		if (row_safe(f, r->a[i], &r->safe[i]))
			return -1;
	return 0;
}

static void rows_free(struct rows *r)
{
	int i;

	for (i = 0; r->safe && i < r->n; i++)
		free(r->safe[i].p);
	free(r->safe);
	free(r->a);
	free(r->cand);
}

struct best {
	double score;
	int j0, j1;
	struct iv v;
};

/* Largest rectangle, normalised area (ties: larger normalised perimeter,
 * then the first found), bounds on candidate rows only unless any_row. */
static int search(const struct rows *r, double span_r, double span_a,
                  int any_row, struct best *b)
{
	struct ivs cur = {0, 0, NULL}, tmp = {0, 0, NULL};
	int j0, j1, i, rc = 0;

	b->score = -1.0;
	for (j0 = 0; j0 < r->n && !rc; j0++) {
		if (!r->cand[j0] && !any_row)
			continue;
		cur.n = 0;
		for (i = 0; i < r->safe[j0].n && !rc; i++)
			rc = ivs_push(&cur, r->safe[j0].p[i]);
		for (j1 = j0; j1 < r->n && cur.n && !rc; j1++) {
			double h = (r->a[j1] - r->a[j0]) / span_a;

			if (j1 > j0 && intersect(&cur, &r->safe[j1], &tmp)) {
				rc = -1;
				break;
			}
			if (!r->cand[j1] && !any_row)
				continue;
			for (i = 0; i < cur.n; i++) {
				double w = (cur.p[i].hi - cur.p[i].lo) / span_r;
				double sc = w * h + 1e-6 * (w + h);

				if (sc > b->score) {
					b->score = sc;
					b->j0 = j0;
					b->j1 = j1;
					b->v = cur.p[i];
				}
			}
		}
	}
	free(cur.p);
	free(tmp.p);
	return rc;
}

/* Lowest value of channel k over speeds [lo, hi] on the row at a. */
static double row_min(const struct field *f, double a, double lo, double hi,
                      int k)
{
	double m = INFINITY;
	int ir;

	for (ir = 0; ir + 1 < f->nr; ir++) {
		double x0 = f->r0 + ir * f->dr, x1 = x0 + f->dr;
		double v0 = row_value(f, a, ir, k),
		       v1 = row_value(f, a, ir + 1, k);
		double p = fmax(lo, x0), q = fmin(hi, x1);

		if (p > q)
			continue;
		m = fmin(m, v0 + (v1 - v0) * (p - x0) / f->dr);
		m = fmin(m, v0 + (v1 - v0) * (q - x0) / f->dr);
	}
	return m;
}

/* What stops a set-point bound from moving one step further (rows from
 * j (exclusive) to the next candidate row beyond it, direction dir): the
 * channel lowest over the rectangle's speeds there. */
static int axis_setter(const struct field *f, const struct rows *r, int j,
                       int dir, const struct iv *v)
{
	int best = -1, k, i;
	double low = INFINITY;

	for (i = j + dir; i >= 0 && i < r->n; i += dir) {
		for (k = 0; k < f->nch; k++) {
			double m = row_min(f, r->a[i], v->lo, v->hi, k);

			if (m < low) {
				low = m;
				best = k;
			}
		}
		if (r->cand[i] || low < 0.0)
			break;
	}
	return best;
}

static int check_of(const struct field *f, int ch)
{
	return ch >= 0 ? f->ch[ch] : OW_WINDOW_SWEEP_EDGE;
}

/* How finely a bound set by check c is located: half a lattice step for
 * a flag (no margin to interpolate), otherwise the rounding step. */
static double resolution(const struct field *f, int c, double step,
                         double lattice_step)
{
	(void)f;
	if (c == OW_WINDOW_SWEEP_EDGE)
		return 0.0;
	if (c >= OW_CK_LIMITS)
		return fmax(step, 0.5 * lattice_step);
	return step;
}

static void set_bounds(const struct field *f, const struct rows *r,
                       const struct best *b, double rpm_step,
                       double temp_step_K, struct ow_window *w)
{
	struct ow_window_bound *x = w->bound;
	double lo = b->v.lo, hi = b->v.hi;
	int c;

	x[OW_WB_RPM_MIN].check = check_of(f, b->v.lo_ch);
	x[OW_WB_RPM_MAX].check = check_of(f, b->v.hi_ch);
	x[OW_WB_SET_MIN].check =
	    b->j0 == 0 ? OW_WINDOW_SWEEP_EDGE
	               : check_of(f, axis_setter(f, r, b->j0, -1, &b->v));
	x[OW_WB_SET_MAX].check =
	    b->j1 == r->n - 1
	        ? OW_WINDOW_SWEEP_EDGE
	        : check_of(f, axis_setter(f, r, b->j1, +1, &b->v));
	if (x[OW_WB_RPM_MIN].check != OW_WINDOW_SWEEP_EDGE)
		lo = ceil(lo / rpm_step - 1e-9) * rpm_step;
	if (x[OW_WB_RPM_MAX].check != OW_WINDOW_SWEEP_EDGE)
		hi = floor(hi / rpm_step + 1e-9) * rpm_step;
	if (lo > hi) { /* narrower than a step: keep the located values */
		lo = b->v.lo;
		hi = b->v.hi;
	}
	x[OW_WB_RPM_MIN].value = lo;
	x[OW_WB_RPM_MAX].value = hi;
	x[OW_WB_SET_MIN].value = r->a[b->j0];
	x[OW_WB_SET_MAX].value = r->a[b->j1];
	for (c = 0; c < OW_WB_COUNT; c++) {
		int rpm = c == OW_WB_RPM_MIN || c == OW_WB_RPM_MAX;

		x[c].resolution =
		    resolution(f, x[c].check, rpm ? rpm_step : temp_step_K,
		               rpm ? f->dr : f->da);
		if (x[c].check == OW_WINDOW_SWEEP_EDGE)
			w->at_sweep_edge = 1;
	}
	w->rpm_step = rpm_step;
	w->temp_step_K = temp_step_K;
}

enum ow_status ow_window_locate(const struct ow_study *s,
                                const struct ow_grid *g, struct ow_window *w,
                                struct ow_diag *d)
{
	struct field f = {0};
	struct rows r = {0};
	struct best b;
	double offset = ow_line_axis_ref_K(&s->line, 0.0) - OW_ZERO_C_K, span_r,
	       span_a, rstep, tstep;
	enum ow_status st = OW_OK;

	if (g->n_rpm < 2 || g->n_axis < 2) /* no step to interpolate on */
		return ow_diag_set(
		    d, OW_EINPUT,
		    "the map's lattice has %d x %d "
		    "points; a window needs at least 2 in each axis",
		    g->n_rpm, g->n_axis);
	if (field_make(s, g, &f)) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto done;
	}
	span_r = (f.nr - 1) * f.dr;
	span_a = (f.na - 1) * f.da;
	rstep = nice_step(span_r);
	tstep = nice_step(span_a);
	if (rows_make(&f, offset, tstep, &r)) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto done;
	}
	if (search(&r, span_r, span_a, 0, &b) ||
	    (b.score < 0.0 && search(&r, span_r, span_a, 1, &b))) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto done;
	}
	w->empty = b.score < 0.0;
	if (!w->empty)
		set_bounds(&f, &r, &b, rstep, tstep, w);
done:
	rows_free(&r);
	free(f.v);
	return st;
}

/* Channel values at (rpm, axis): bilinear in the lattice cell. */
static void field_at(const struct field *f, double rpm, double axis,
                     double *out)
{
	double x = (rpm - f->r0) / f->dr, y = (axis - f->a0) / f->da;
	int i = (int)floor(x), j = (int)floor(y), k;
	double tx, ty;

	i = i < 0 ? 0 : (i > f->nr - 2 ? f->nr - 2 : i);
	j = j < 0 ? 0 : (j > f->na - 2 ? f->na - 2 : j);
	tx = x - i;
	ty = y - j;
	for (k = 0; k < f->nch; k++) {
		const double *v = f->v;
		size_t n = (size_t)f->nch, r = (size_t)f->nr;
		double b = v[((size_t)j * r + i) * n + k] * (1 - tx) +
		           v[((size_t)j * r + i + 1) * n + k] * tx;
		double t = v[((size_t)(j + 1) * r + i) * n + k] * (1 - tx) +
		           v[((size_t)(j + 1) * r + i + 1) * n + k] * tx;

		out[k] = b * (1 - ty) + t * ty;
	}
}

enum ow_status ow_window_verdict_at(const struct ow_study *s,
                                    const struct ow_grid *g, double rpm,
                                    double set_K, int *inside, unsigned *bits,
                                    struct ow_diag *d)
{
	struct field f = {0};
	double axis = set_K - ow_line_axis_ref_K(&s->line, 0.0), v[MAX_CH];
	double r1, a1, tol = 1e-9;
	int k;

	*bits = 0;
	if (g->n_rpm < 2 || g->n_axis < 2)
		return ow_diag_set(
		    d, OW_EINPUT,
		    "the map's lattice has %d x %d "
		    "points; a verdict needs at least 2 in each axis",
		    g->n_rpm, g->n_axis);
	if (field_make(s, g, &f)) {
		free(f.v);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	r1 = f.r0 + (f.nr - 1) * f.dr;
	a1 = f.a0 + (f.na - 1) * f.da;
	*inside = rpm >= f.r0 - tol && rpm <= r1 + tol && axis >= f.a0 - tol &&
	          axis <= a1 + tol;
	if (*inside) {
		field_at(&f, rpm, axis, v);
		for (k = 0; k < f.nch; k++)
			if (v[k] < 0.0)
				*bits |= 1u << f.ch[k];
	}
	free(f.v);
	return OW_OK;
}
