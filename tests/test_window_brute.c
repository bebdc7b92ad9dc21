/* test_window_brute.c - the recommended rectangle against an independent
 * brute-force search, on hundreds of random lattices (fixed seed): random
 * safe/unsafe masks (a limit or a flag failing at a point) and random
 * smooth margin fields of every limit the study sets.
 *
 * The brute force knows only what the window promises (ow_window.h):
 * each margin is the bilinear interpolant of the lattice values (a flag
 * counts -1 where it is raised, +1 elsewhere); a setting is safe where
 * every interpolated margin is >= 0; the set-point bounds lie on whole
 * steps of the reference zone in degC or on the sweep's ends; the
 * rectangle has the largest area in units of the swept ranges; each
 * speed bound is where a margin crosses zero along the bound, rounded
 * inward to the whole step. It finds the safe speeds of every band of
 * set-points by sampling the speed range finely and bisecting each
 * run's ends (Burden & Faires, Numerical Analysis, 9th ed., 2011,
 * section 2.1), not by the library's interval arithmetic. Along the
 * set-point axis a bilinear interpolant is piecewise linear with kinks
 * on the lattice rows, so a band is safe at one speed when it is safe on
 * its two ends and on every lattice row inside (a piecewise linear
 * function takes its minimum at a kink or an end). */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
#include "ow_sweep.h"
#include "ow_window.h"

#define STUDY   "fixtures/studies/hdpe-sf.json" /* 4 limits set */
#define SAMPLES 1200 /* speed samples over the swept range */
#define MAXCH   OW_CK_COUNT
#define MAXROWS 128 /* candidate and lattice rows of one lattice */

/* Deterministic generator (Park & Miller, Comm. ACM 31 (1988) 1192,
 * minimal standard), so every run sees the same lattices. */
static unsigned long seed_state = 20261204ul;

static double uniform(double lo, double hi)
{
	seed_state = seed_state * 16807ul % 2147483647ul;
	return lo + (hi - lo) * (double)seed_state / 2147483647.0;
}

static int uniform_int(int lo, int hi)
{
	int v = lo + (int)uniform(0.0, (double)(hi - lo + 1));

	return v > hi ? hi : v;
}

/* The lattice as the brute force sees it. */
struct lat {
	int nr, na, nch;
	int ch[MAXCH]; /* check of each channel */
	double r0, r1, a0, a1;
	double *v;       /* [(ia * nr + ir) * nch + k] */
	double offset_C; /* reference set-point in degC at axis value 0 */
	double rstep, tstep;
};

/* Channel k at (rpm, axis): bilinear in the lattice cell holding it. */
static double value(const struct lat *L, int k, double rpm, double axis)
{
	double x = (rpm - L->r0) / (L->r1 - L->r0) * (L->nr - 1);
	double y = (axis - L->a0) / (L->a1 - L->a0) * (L->na - 1);
	int i = (int)floor(x), j = (int)floor(y);
	double tx, ty, v00, v10, v01, v11;

	if (i < 0)
		i = 0;
	if (i > L->nr - 2)
		i = L->nr - 2;
	if (j < 0)
		j = 0;
	if (j > L->na - 2)
		j = L->na - 2;
	tx = x - i;
	ty = y - j;
	v00 = L->v[((size_t)j * L->nr + i) * L->nch + k];
	v10 = L->v[((size_t)j * L->nr + i + 1) * L->nch + k];
	v01 = L->v[((size_t)(j + 1) * L->nr + i) * L->nch + k];
	v11 = L->v[((size_t)(j + 1) * L->nr + i + 1) * L->nch + k];
	return (1 - ty) * ((1 - tx) * v00 + tx * v10) +
	       ty * ((1 - tx) * v01 + tx * v11);
}

/* Lowest value of channel k (k < 0: of every channel) over the band of
 * set-points [A0, A1] at speed rpm: on its ends and the lattice rows
 * strictly inside. */
static double band_min(const struct lat *L, int k, double rpm, double A0,
                       double A1)
{
	double m = INFINITY, da = (L->a1 - L->a0) / (L->na - 1);
	int j, c;

	for (j = -1; j <= L->na; j++) {
		double a = j < 0 ? A0 : (j == L->na ? A1 : L->a0 + j * da);

		if (j >= 0 && j < L->na && !(a > A0 && a < A1))
			continue;
		for (c = 0; c < L->nch; c++)
			if (k < 0 || c == k)
				m = fmin(m, value(L, c, rpm, a));
	}
	return m;
}

/* Where band_min(k) crosses zero between a safe x_in and an unsafe x_out
 * (bisection to 1e-10 of the range). */
static double crossing(const struct lat *L, int k, double A0, double A1,
                       double x_in, double x_out)
{
	while (fabs(x_out - x_in) > 1e-10 * (L->r1 - L->r0)) {
		double m = 0.5 * (x_in + x_out);

		if (band_min(L, k, m, A0, A1) >= 0.0)
			x_in = m;
		else
			x_out = m;
	}
	return x_in;
}

/* Whole step of a bound's unit: 1, 2, 5, 10, ... with at most 1000 steps
 * over the span (what ow_window.h calls the rounding step). */
static double step_of(double span)
{
	double p = 1.0;

	for (;;) {
		if (span / p <= 1000.0)
			return p;
		if (span / (2 * p) <= 1000.0)
			return 2 * p;
		if (span / (5 * p) <= 1000.0)
			return 5 * p;
		p *= 10.0;
	}
}

/* Candidate set-point bounds: the sweep's ends and every whole step of
 * the reference zone's set-point in degC between them. */
static int candidates(const struct lat *L, double *a, int cap)
{
	int n = 0;
	double k;

	a[n++] = L->a0;
	for (k = ceil((L->a0 + L->offset_C) / L->tstep) * L->tstep;
	     k - L->offset_C <= L->a1 && n < cap - 1; k += L->tstep) {
		double x = k - L->offset_C;

		if (x - a[n - 1] > 1e-7 && L->a1 - x > 1e-7)
			a[n++] = x;
	}
	a[n++] = L->a1;
	return n;
}

struct rect {
	double score, lo, hi, A0, A1;
	int lo_k, hi_k; /* channel that stops each speed end, -1: sweep edge */
};

/* The channel lowest just beyond x (the one that crossed there). */
static int lowest_beyond(const struct lat *L, double x, double dir, double A0,
                         double A1)
{
	double xo = x + dir * 1e-7 * (L->r1 - L->r0), low = INFINITY;
	int k, best = -1;

	for (k = 0; k < L->nch; k++) {
		double m = band_min(L, k, xo, A0, A1);

		if (m < low) {
			low = m;
			best = k;
		}
	}
	return best;
}

/* The runs of safe samples in g (band [A0, A1]) as rectangles; the
 * largest kept in *pr. */
static void runs(const struct lat *L, const double *g, double A0, double A1,
                 struct rect *pr)
{
	double sr = L->r1 - L->r0, h = (A1 - A0) / (L->a1 - L->a0);
	int s, e;

	pr->score = -1.0;
	for (s = 0; s <= SAMPLES; s = e + 1) {
		double lo, hi, sc;

		e = s;
		if (g[s] < 0.0)
			continue;
		while (e < SAMPLES && g[e + 1] >= 0.0)
			e++;
		lo = s == 0 ? L->r0
		            : crossing(L, -1, A0, A1, L->r0 + sr * s / SAMPLES,
		                       L->r0 + sr * (s - 1) / SAMPLES);
		hi = e == SAMPLES
		         ? L->r1
		         : crossing(L, -1, A0, A1, L->r0 + sr * e / SAMPLES,
		                    L->r0 + sr * (e + 1) / SAMPLES);
		sc = (hi - lo) / sr * h;
		if (sc > pr->score) {
			pr->score = sc;
			pr->lo = lo;
			pr->hi = hi;
			pr->A0 = A0;
			pr->A1 = A1;
			pr->lo_k =
			    s == 0 ? -1 : lowest_beyond(L, lo, -1.0, A0, A1);
			pr->hi_k = e == SAMPLES
			               ? -1
			               : lowest_beyond(L, hi, 1.0, A0, A1);
		}
	}
}

struct row {
	double a;
	int cand;
};

static int cmp_row(const void *x, const void *y)
{
	double a = ((const struct row *)x)->a, b = ((const struct row *)y)->a;

	return (a > b) - (a < b);
}

/* Brute force: every pair of candidate rows, the band's safe speeds by
 * sampling (the lowest channel on every row of the band, candidate or
 * lattice row), each run's ends by bisection. best: the largest
 * normalised area; second: the largest over other pairs of rows. */
static void brute(const struct lat *L, struct rect *best, double *second)
{
	static double rowmin[MAXROWS][SAMPLES + 1], cur[SAMPLES + 1];
	static struct row rows[MAXROWS];
	double cand[2048], sr = L->r1 - L->r0;
	int nc = candidates(L, cand, 2048), n = 0, i, j0, j1, s, k;

	assert_true(nc + L->na <= MAXROWS);
	for (i = 0; i < nc; i++)
		rows[n++] = (struct row){cand[i], 1};
	for (i = 1; i + 1 < L->na; i++)
		rows[n++] =
		    (struct row){L->a0 + (L->a1 - L->a0) * i / (L->na - 1), 0};
	qsort(rows, (size_t)n, sizeof *rows, cmp_row);
	for (i = 0; i < n; i++)
		for (s = 0; s <= SAMPLES; s++) {
			double m = INFINITY, x = L->r0 + sr * s / SAMPLES;

			for (k = 0; k < L->nch; k++)
				m = fmin(m, value(L, k, x, rows[i].a));
			rowmin[i][s] = m;
		}
	best->score = -1.0;
	*second = -1.0;
	for (j0 = 0; j0 < n; j0++) {
		if (!rows[j0].cand)
			continue;
		memcpy(cur, rowmin[j0], sizeof cur);
		for (j1 = j0; j1 < n; j1++) {
			struct rect pr;

			for (s = 0; s <= SAMPLES; s++)
				cur[s] = fmin(cur[s], rowmin[j1][s]);
			if (!rows[j1].cand)
				continue;
			runs(L, cur, rows[j0].a, rows[j1].a, &pr);
			if (pr.score > best->score) {
				*second = fmax(*second, best->score);
				*best = pr;
			} else {
				*second = fmax(*second, pr.score);
			}
		}
	}
}

/* ---- lattices ----------------------------------------------------- */

static struct ow_study *random_study(void)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_axes *ax = &s->line.axes;

	ax->rpm_from = uniform(8.0, 35.0);
	ax->rpm_to = uniform(70.0, 160.0);
	if (uniform(0.0, 1.0) < 0.1) /* wide enough for a 2 or 5 rpm step */
		ax->rpm_to = ax->rpm_from + uniform(1200.0, 3000.0);
	ax->axis_from = uniform(-14.0, -2.0);
	ax->axis_to = uniform(2.0, 16.0);
	return s;
}

/* Grid of nr x na points over the study's sweep whose channel values
 * are v (as struct lat), flags raised where their value is negative. */
static struct ow_grid *grid_of(const struct ow_study *s, struct lat *L)
{
	struct ow_grid *g = calloc(1, sizeof *g);
	int ir, ia, k;

	assert_non_null(g);
	g->n_rpm = L->nr;
	g->n_axis = L->na;
	g->stride = 1;
	g->solves = L->nr * L->na;
	g->pts = calloc((size_t)L->nr * (size_t)L->na, sizeof *g->pts);
	assert_non_null(g->pts);
	for (ia = 0; ia < L->na; ia++)
		for (ir = 0; ir < L->nr; ir++) {
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			const double *v =
			    &L->v[((size_t)ia * L->nr + ir) * L->nch];

			p->solved = 1;
			p->rpm = L->r0 + (L->r1 - L->r0) * ir / (L->nr - 1);
			p->axis = L->a0 + (L->a1 - L->a0) * ia / (L->na - 1);
			p->set_ref_K = ow_line_axis_ref_K(&s->line, p->axis);
			for (k = 0; k < OW_CK_LIMITS; k++)
				p->v.margin[k] = NAN;
			for (k = 0; k < L->nch; k++) {
				int c = L->ch[k];

				if (c < OW_CK_LIMITS)
					p->v.margin[c] = v[k];
				if (v[k] < 0.0)
					p->v.bits |= 1u << c;
			}
		}
	return g;
}

/* Channels: the limits the study sets, then the three flags. */
static void lat_init(const struct ow_study *s, struct lat *L, int nr, int na)
{
	int c;

	memset(L, 0, sizeof *L);
	for (c = 0; c < OW_CK_LIMITS; c++)
		if (ow_check_active(&s->line.limits, (enum ow_check)c))
			L->ch[L->nch++] = c;
	L->ch[L->nch++] = OW_CK_PLUGGING;
	L->ch[L->nch++] = OW_CK_FEED;
	L->ch[L->nch++] = OW_CK_NOCONV;
	L->nr = nr;
	L->na = na;
	L->r0 = s->line.axes.rpm_from;
	L->r1 = s->line.axes.rpm_to;
	L->a0 = s->line.axes.axis_from;
	L->a1 = s->line.axes.axis_to;
	L->offset_C = ow_line_axis_ref_K(&s->line, 0.0) - OW_ZERO_C_K;
	L->rstep = step_of(L->r1 - L->r0);
	L->tstep = step_of(L->a1 - L->a0);
	L->v = malloc(sizeof *L->v * (size_t)(nr * na * L->nch));
	assert_non_null(L->v);
}

/* A random mask: each point unsafe with probability p, on one limit
 * (margin -1) or one flag; every other channel +1. */
static void random_mask(struct lat *L, double p)
{
	int i, k, n = L->nr * L->na;

	for (i = 0; i < n; i++) {
		double *v = &L->v[(size_t)i * L->nch];

		for (k = 0; k < L->nch; k++)
			v[k] = 1.0;
		if (uniform(0.0, 1.0) < p)
			v[uniform_int(0, L->nch - 1)] = -1.0;
	}
}

/* Random smooth margins: each limit a tilted plane plus a wave over the
 * normalised sweep (x, y in [0, 1]); flags never raised. */
static void random_smooth(struct lat *L)
{
	int k, ir, ia;

	for (k = 0; k < L->nch; k++) {
		int flag = L->ch[k] >= OW_CK_LIMITS;
		double c0 = uniform(-0.1, 0.9), cx = uniform(-1.5, 1.5);
		double cy = uniform(-1.5, 1.5), cw = uniform(0.0, 0.4);
		double fx = uniform(0.3, 2.0), fy = uniform(0.3, 2.0);
		double px = uniform(0.0, 1.0), py = uniform(0.0, 1.0);

		for (ia = 0; ia < L->na; ia++)
			for (ir = 0; ir < L->nr; ir++) {
				double x = (double)ir / (L->nr - 1);
				double y = (double)ia / (L->na - 1);
				double m = c0 + cx * (x - 0.5) +
				           cy * (y - 0.5) +
				           cw * sin(2 * OW_PI * (fx * x + px)) *
				               cos(2 * OW_PI * (fy * y + py));

				L->v[((size_t)ia * L->nr + ir) * L->nch + k] =
				    flag ? 1.0 : m;
			}
	}
}

/* ---- the comparison ------------------------------------------------ */

static int is_whole_step(double v, double step)
{
	return fabs(v / step - round(v / step)) < 1e-7;
}

/* Channel index of check c. */
static int channel_of(const struct lat *L, int c)
{
	int k;

	for (k = 0; k < L->nch; k++)
		if (L->ch[k] == c)
			return k;
	fail_msg("check %d is no channel", c);
	return -1;
}

/* A speed bound set by a check: a whole step; that check crosses zero
 * along the bound within the step beyond it (the bound is rounded
 * inward from the crossing) and within the stated resolution. */
static void check_speed_bound(const struct lat *L, const struct ow_window *w,
                              int side)
{
	const struct ow_window_bound *b = &w->bound[side];
	double dir = side == OW_WB_RPM_MAX ? 1.0 : -1.0, x_out = NAN, xc;
	int k, i;

	if (b->check == OW_WINDOW_SWEEP_EDGE) {
		assert_abs(b->value, dir > 0 ? L->r1 : L->r0, 1e-9);
		assert_abs(b->resolution, 0.0, 0.0);
		return;
	}
	k = channel_of(L, b->check);
	assert_abs(b->resolution,
	           L->ch[k] >= OW_CK_LIMITS
	               ? fmax(L->rstep, 0.5 * (L->r1 - L->r0) / (L->nr - 1))
	               : L->rstep,
	           1e-9);
	if (w->rpm_max - w->rpm_min >= L->rstep)
		assert_true(is_whole_step(b->value, L->rstep));
	/* first setting beyond the bound where the setter fails */
	for (i = 1; i <= 400; i++) {
		double x = b->value + dir * 1.0001 * L->rstep * i / 400.0;

		if (x < L->r0 || x > L->r1)
			break;
		if (band_min(L, k, x, w->axis_min, w->axis_max) < 0.0) {
			x_out = x;
			break;
		}
	}
	if (isnan(x_out))
		fail_msg("speed bound %g rpm (check %d): the check does not "
		         "fail within a step beyond it",
		         b->value, b->check);
	xc = crossing(L, k, w->axis_min, w->axis_max, b->value, x_out);
	assert_true(fabs(xc - b->value) <= b->resolution + 1e-9);
}

/* A set-point bound set by a check: on a whole step, and that check
 * fails between it and the next candidate beyond, over the speeds the
 * rectangle held before rounding (within a step of its bounds). */
static void check_set_bound(const struct lat *L, const struct ow_window *w,
                            int side)
{
	const struct ow_window_bound *b = &w->bound[side];
	double cand[2048], next, lo, hi, low = INFINITY;
	int nc = candidates(L, cand, 2048), i, k, at = -1;
	int up = side == OW_WB_SET_MAX;

	for (i = 0; i < nc; i++)
		if (fabs(cand[i] - b->value) < 1e-7)
			at = i;
	if (at < 0)
		fail_msg("set-point bound %g is no whole step", b->value);
	if (b->check == OW_WINDOW_SWEEP_EDGE) {
		assert_int_equal(at, up ? nc - 1 : 0);
		return;
	}
	assert_true(up ? at < nc - 1 : at > 0);
	next = cand[up ? at + 1 : at - 1];
	k = channel_of(L, b->check);
	lo = fmax(L->r0, w->rpm_min - L->rstep);
	hi = fmin(L->r1, w->rpm_max + L->rstep);
	/* linear in speed between lattice columns: its lowest value over
	 * [lo, hi] is at an end or on a column */
	for (i = -1; i <= L->nr; i++) {
		double x = i < 0 ? lo
		           : i == L->nr
		               ? hi
		               : L->r0 + (L->r1 - L->r0) * i / (L->nr - 1);

		if (x >= lo && x <= hi)
			low = fmin(low, band_min(L, k, x, fmin(b->value, next),
			                         fmax(b->value, next)));
	}
	assert_true(low < 0.0);
}

/* Distance from (x, y) to the segment p-q. */
static double to_segment(double x, double y, double px, double py, double qx,
                         double qy)
{
	double dx = qx - px, dy = qy - py, l2 = dx * dx + dy * dy, t;

	t = l2 > 0.0 ? ((x - px) * dx + (y - py) * dy) / l2 : 0.0;
	t = t < 0.0 ? 0.0 : (t > 1.0 ? 1.0 : t);
	return hypot(px + t * dx - x, py + t * dy - y);
}

/* Clearance of (rpm, axis) in units of the swept ranges: to the sweep's
 * edges and to every piece of the window's edge lines. */
static double clearance(const struct lat *L, const struct ow_window *w,
                        double rpm, double axis)
{
	double sr = L->r1 - L->r0, sa = L->a1 - L->a0;
	double x = (rpm - L->r0) / sr, y = (axis - L->a0) / sa;
	double d = fmin(fmin(x, 1.0 - x), fmin(y, 1.0 - y));
	int b, l, i;

	for (b = 0; b < w->n_boundaries; b++) {
		if (w->bounds[b].check != OW_WINDOW_EDGE)
			continue;
		for (l = 0; l < w->bounds[b].n_lines; l++) {
			const struct ow_polyline *pl = &w->bounds[b].lines[l];

			for (i = 1; i < pl->n; i++)
				d = fmin(
				    d,
				    to_segment(x, y,
				               (pl->p[i - 1].rpm - L->r0) / sr,
				               (pl->p[i - 1].axis - L->a0) / sa,
				               (pl->p[i].rpm - L->r0) / sr,
				               (pl->p[i].axis - L->a0) / sa));
		}
	}
	return d;
}

/* Whole steps in [lo, hi] (value + offset a multiple of step): n of them
 * from *first; the midpoint alone when none. */
static int whole_steps(double lo, double hi, double step, double offset,
                       double *first)
{
	int n = 0;
	double v;

	*first = NAN;
	for (v = ceil((lo + offset) / step - 1e-7) * step;
	     v - offset <= hi + 1e-7; v += step) {
		if (!n)
			*first = v - offset;
		n++;
	}
	if (!n)
		*first = 0.5 * (lo + hi);
	return n ? n : 1;
}

/* The centre: the whole-step setting in the rectangle with the largest
 * clearance (ow_window.h), ties to the lowest set-point, then the lowest
 * speed (as the library states it breaks them). */
static void check_centre(const struct lat *L, const struct ow_window *w)
{
	double r0, a0, best = -1.0, br = NAN, ba = NAN;
	int nr = whole_steps(w->rpm_min, w->rpm_max, L->rstep, 0.0, &r0);
	int na =
	    whole_steps(w->axis_min, w->axis_max, L->tstep, L->offset_C, &a0);
	int i, j;

	for (j = 0; j < na; j++)
		for (i = 0; i < nr; i++) {
			double rpm = r0 + i * L->rstep,
			       axis = a0 + j * L->tstep;
			double c = clearance(L, w, rpm, axis);

			if (c > best + 1e-9) {
				best = c;
				br = rpm;
				ba = axis;
			}
		}
	assert_abs(w->centre_clearance, best, 1e-9);
	assert_abs(w->centre.rpm, br, 1e-7);
	assert_abs(w->centre.axis, ba, 1e-7);
}

/* One case: the window of the lattice against the brute force. Returns
 * 1 when the brute-force optimum was clear enough to compare bounds. */
static int compare(const struct ow_study *s, struct lat *L, int smooth)
{
	struct ow_grid *g = grid_of(s, L);
	struct ow_window *w = NULL;
	struct ow_diag d = {{0}};
	struct rect bf;
	double second, sr = L->r1 - L->r0, sa = L->a1 - L->a0, h, area;
	int k, clear = 0;

	if (ow_window_extract(s, g, &w, &d) != OW_OK)
		fail_msg("ow_window_extract: %s", d.msg);
	brute(L, &bf, &second);
	assert_int_equal(w->empty, bf.score < 0.0);
	if (w->empty)
		goto done;
	assert_abs(w->rpm_step, L->rstep, 0.0);
	assert_abs(w->temp_step_K, L->tstep, 0.0);
	/* the rectangle is safe everywhere (sampled, plus its corners) */
	for (k = 0; k <= 200; k++) {
		double x = w->rpm_min + (w->rpm_max - w->rpm_min) * k / 200.0;

		assert_true(band_min(L, -1, x, w->axis_min, w->axis_max) >=
		            -1e-9);
	}
	/* as large as the largest, less what rounding each speed bound
	 * inward to a whole step may cost */
	h = (w->axis_max - w->axis_min) / sa;
	area = (w->rpm_max - w->rpm_min) / sr * h;
	assert_true(area <= bf.score + 1e-7);
	assert_true(area >= bf.score - 2.0 * L->rstep / sr * h - 1e-7);
	for (k = OW_WB_RPM_MIN; k <= OW_WB_RPM_MAX; k++)
		check_speed_bound(L, w, k);
	for (k = OW_WB_SET_MIN; k <= OW_WB_SET_MAX; k++)
		check_set_bound(L, w, k);
	check_centre(L, w);
	/* a clear optimum (no other pair of rows within 1e-3 of the area):
	 * the same set-point rows, speeds within the stated resolution of
	 * the brute-force crossings, set by the same checks */
	if (smooth && bf.score - second > 1e-3 &&
	    bf.hi - bf.lo > 2 * L->rstep) {
		clear = 1;
		assert_abs(w->axis_min, bf.A0, 1e-7);
		assert_abs(w->axis_max, bf.A1, 1e-7);
		assert_true(fabs(w->rpm_min - bf.lo) <=
		            w->bound[OW_WB_RPM_MIN].resolution + 1e-7);
		assert_true(fabs(w->rpm_max - bf.hi) <=
		            w->bound[OW_WB_RPM_MAX].resolution + 1e-7);
		assert_int_equal(w->bound[OW_WB_RPM_MIN].check,
		                 bf.lo_k < 0 ? OW_WINDOW_SWEEP_EDGE
		                             : L->ch[bf.lo_k]);
		assert_int_equal(w->bound[OW_WB_RPM_MAX].check,
		                 bf.hi_k < 0 ? OW_WINDOW_SWEEP_EDGE
		                             : L->ch[bf.hi_k]);
	}
done:
	ow_window_destroy(w);
	ow_grid_destroy(g);
	return clear;
}

static void random_masks_match_the_brute_force(void **st)
{
	int n;

	(void)st;
	for (n = 0; n < 200; n++) {
		struct ow_study *s = random_study();
		struct lat L;

		lat_init(s, &L, uniform_int(3, 9), uniform_int(3, 9));
		random_mask(&L, uniform(0.05, 0.5));
		compare(s, &L, 0);
		free(L.v);
		free(s);
	}
}

static void random_smooth_fields_match_the_brute_force(void **st)
{
	int n, clear = 0;

	(void)st;
	for (n = 0; n < 200; n++) {
		struct ow_study *s = random_study();
		struct lat L;

		lat_init(s, &L, uniform_int(4, 12), uniform_int(4, 12));
		random_smooth(&L);
		clear += compare(s, &L, 1);
		free(L.v);
		free(s);
	}
	/* most optima are clear, so the bound-by-bound comparison ran */
	assert_true(clear >= 100);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(random_masks_match_the_brute_force),
	    cmocka_unit_test(random_smooth_fields_match_the_brute_force),
	};

	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
