/* plot_contour.c - contours of a field on a rectilinear grid: iso-lines
 * as joined polylines, seamless filled contours, iso-line labels and the
 * colour bar.
 *
 * Each grid cell is split into two triangles along its (i,j)-(i+1,j+1)
 * diagonal and z is taken linear in each (piecewise-linear interpolation,
 * the triangle variant of marching squares: Lorensen & Cline, Computer
 * Graphics 21(4) (1987) 163, for the cell classification; the triangle
 * split removes the saddle ambiguity). A vertex with z >= level counts as
 * inside, so the filled regions {z >= level} and the iso-lines agree. */
#include "ow_plot.h"
#include "ow_const.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Corner k (0..2) of triangle t (0: lower-right, 1: upper-left) of cell
 * (i, j), as grid indices; counter-clockwise for x right, y up. */
static void tri_corner(int i, int j, int t, int k, int *ci, int *cj)
{
	static const int lr[3][2] = {{0, 0}, {1, 0}, {1, 1}};
	static const int ul[3][2] = {{0, 0}, {1, 1}, {0, 1}};
	const int(*c)[2] = t == 0 ? lr : ul;

	*ci = i + c[k][0];
	*cj = j + c[k][1];
}

static double zat(const struct ow_field *f, int i, int j)
{
	return f->z[j * f->nx + i];
}

static int cell_ok(const struct ow_field *f, int i, int j)
{
	return isfinite(zat(f, i, j)) && isfinite(zat(f, i + 1, j)) &&
	       isfinite(zat(f, i, j + 1)) && isfinite(zat(f, i + 1, j + 1));
}

/* Id of the mesh edge between grid points a and b (horizontal, vertical
 * or diagonal), so that crossing points shared by two triangles match. */
static long edge_id(const struct ow_field *f, int ai, int aj, int bi, int bj)
{
	int i = ai < bi ? ai : bi, j = aj < bj ? aj : bj;
	int type = aj == bj ? 0 : ai == bi ? 1 : 2;

	return 3L * ((long)j * f->nx + i) + type;
}

/* --- iso-lines -------------------------------------------------------- */

struct seg {
	struct ow_pt2 p[2];
	long e[2]; /* edge ids of the ends */
	int used;
};

struct segs {
	struct seg *s;
	int n, cap;
};

static int seg_push(struct segs *S, const struct seg *g)
{
	if (S->n == S->cap) {
		int cap = S->cap ? 2 * S->cap : 256;
		struct seg *p = realloc(S->s, (size_t)cap * sizeof *p);

		if (!p)
			return 0;
		S->s = p;
		S->cap = cap;
	}
	S->s[S->n++] = *g;
	return 1;
}

static struct ow_pt2 cross_pt(const struct ow_field *f, int ai, int aj, int bi,
                              int bj, double level)
{
	double za = zat(f, ai, aj), zb = zat(f, bi, bj);
	double t = (level - za) / (zb - za);
	struct ow_pt2 p;

	p.x = f->x[ai] + t * (f->x[bi] - f->x[ai]);
	p.y = f->y[aj] + t * (f->y[bj] - f->y[aj]);
	return p;
}

/* The segment of triangle t of cell (i, j) where z = level, if any. */
static int tri_segment(const struct ow_field *f, int i, int j, int t,
                       double level, struct seg *g)
{
	int ci[3], cj[3], in[3], k, m = 0, n_in = 0;

	for (k = 0; k < 3; k++) {
		tri_corner(i, j, t, k, &ci[k], &cj[k]);
		in[k] = zat(f, ci[k], cj[k]) >= level;
		n_in += in[k];
	}
	if (n_in == 0 || n_in == 3)
		return 0;
	for (k = 0; k < 3; k++) {
		int a = k, b = (k + 1) % 3;

		if (in[a] == in[b])
			continue;
		g->p[m] = cross_pt(f, ci[a], cj[a], ci[b], cj[b], level);
		g->e[m] = edge_id(f, ci[a], cj[a], ci[b], cj[b]);
		m++;
	}
	g->used = 0;
	return m == 2;
}

static int collect(const struct ow_field *f, double level, struct segs *S)
{
	int i, j, t;
	struct seg g;

	for (j = 0; j + 1 < f->ny; j++)
		for (i = 0; i + 1 < f->nx; i++) {
			if (!cell_ok(f, i, j))
				continue;
			for (t = 0; t < 2; t++)
				if (tri_segment(f, i, j, t, level, &g) &&
				    !seg_push(S, &g))
					return 0;
		}
	return 1;
}

/* Per edge id, the (at most two) segments ending on it. */
struct edge_index {
	long n;
	int (*slot)[2];
};

static int index_build(const struct ow_field *f, const struct segs *S,
                       struct edge_index *x)
{
	int k, e;

	x->n = 3L * f->nx * f->ny;
	x->slot = malloc((size_t)x->n * sizeof *x->slot);
	if (!x->slot)
		return 0;
	memset(x->slot, 0xff, (size_t)x->n * sizeof *x->slot); /* -1 */
	for (k = 0; k < S->n; k++)
		for (e = 0; e < 2; e++) {
			int *sl = x->slot[S->s[k].e[e]];

			sl[sl[0] < 0 ? 0 : 1] = k;
		}
	return 1;
}

static int other_seg(const struct edge_index *x, long e, int k)
{
	const int *sl = x->slot[e];

	return sl[0] == k ? sl[1] : sl[0];
}

static int line_push(struct ow_isolines *L, struct ow_pt2 *p, int n)
{
	struct ow_isoline *q =
	    realloc(L->lines, (size_t)(L->n + 1) * sizeof *q);

	if (!q)
		return 0;
	L->lines = q;
	L->lines[L->n].n = n;
	L->lines[L->n].p = p;
	L->n++;
	return 1;
}

/* Follow the chain from segment k leaving through its end `end`. */
static int trace(const struct segs *S, const struct edge_index *x, int k,
                 int end, struct ow_isolines *L)
{
	struct ow_pt2 *p = malloc((size_t)(S->n + 2) * sizeof *p);
	long first = S->s[k].e[1 - end], last = -1;
	int n = 0;

	if (!p)
		return 0;
	p[n++] = S->s[k].p[1 - end];
	while (k >= 0 && !S->s[k].used) {
		long e = S->s[k].e[end];
		int next;

		S->s[k].used = 1;
		p[n++] = S->s[k].p[end];
		last = e;
		next = other_seg(x, e, k);
		if (next < 0 || S->s[next].used)
			break;
		end = S->s[next].e[0] == e ? 1 : 0; /* leave by the far end */
		k = next;
	}
	if (last == first && n > 2)
		p[n - 1] = p[0]; /* a loop: close it exactly */
	if (!line_push(L, p, n)) {
		free(p);
		return 0;
	}
	return 1;
}

static int join(const struct segs *S, const struct edge_index *x,
                struct ow_isolines *L)
{
	int k, e;

	/* open lines first: start where an end has no neighbour */
	for (k = 0; k < S->n; k++)
		for (e = 0; e < 2 && !S->s[k].used; e++)
			if (other_seg(x, S->s[k].e[e], k) < 0 &&
			    !trace(S, x, k, 1 - e, L))
				return 0;
	for (k = 0; k < S->n; k++) /* then closed loops */
		if (!S->s[k].used && !trace(S, x, k, 1, L))
			return 0;
	return 1;
}

void ow_isolines_destroy(struct ow_isolines *l)
{
	int i;

	if (!l)
		return;
	for (i = 0; i < l->n; i++)
		free(l->lines[i].p);
	free(l->lines);
	free(l);
}

static int field_ok(const struct ow_field *f)
{
	return f && f->x && f->y && f->z && f->nx >= 2 && f->ny >= 2 &&
	       (long)f->nx * f->ny < 50000000L;
}

enum ow_status ow_contour_lines(const struct ow_field *f, double level,
                                struct ow_isolines **out, struct ow_diag *d)
{
	struct segs S = {NULL, 0, 0};
	struct edge_index x = {0, NULL};
	struct ow_isolines *L;
	enum ow_status st = OW_OK;

	if (!out)
		return ow_diag_set(d, OW_EARG, "contour: no output pointer");
	*out = NULL;
	if (!field_ok(f) || !isfinite(level))
		return ow_diag_set(d, OW_EARG,
		                   "contour: a field of at least "
		                   "2 x 2 values and a finite level needed");
	L = calloc(1, sizeof *L);
	if (!L || !collect(f, level, &S) || !index_build(f, &S, &x) ||
	    !join(&S, &x, L)) {
		st = ow_diag_set(d, OW_ENOMEM, "contour: out of memory");
		ow_isolines_destroy(L);
		L = NULL;
	}
	if (L)
		L->level = level;
	free(S.s);
	free(x.slot);
	*out = L;
	return st;
}

/* --- levels and filled contours --------------------------------------- */

enum ow_status ow_contour_levels(const struct ow_field *f, int max_levels,
                                 struct ow_ticks *levels)
{
	double lo = INFINITY, hi = -INFINITY;
	long k;

	if (!field_ok(f) || !levels)
		return OW_EARG;
	for (k = 0; k < (long)f->nx * f->ny; k++)
		if (isfinite(f->z[k])) {
			lo = fmin(lo, f->z[k]);
			hi = fmax(hi, f->z[k]);
		}
	if (!isfinite(lo))
		return OW_EARG;
	if (hi - lo <= 1e-12 * fmax(1.0, fabs(hi))) { /* constant */
		double w = hi == 0.0 ? 1.0 : 0.05 * fabs(hi);

		lo -= w;
		hi += w;
	}
	if (max_levels > OW_PLOT_MAX_LEVELS)
		max_levels = OW_PLOT_MAX_LEVELS;
	return ow_plot_nice_ticks(lo, hi, max_levels + 1, levels);
}

struct ow_rgba ow_contour_band_colour(enum ow_cmap map, int k, int n)
{
	/* band centres, so the darkest and lightest ends stay unused */
	return ow_cmap_at(map, n > 0 ? ((double)k + 0.5) / (double)n : 0.5);
}

static void poly_to(const struct ow_plot *p, const struct ow_pt2 *q, int n)
{
	int k;

	for (k = 0; k < n; k++) {
		double X = ow_plot_px(p, q[k].x), Y = ow_plot_py(p, q[k].y);

		if (k == 0)
			ow_canvas_move_to(p->cv, X, Y);
		else
			ow_canvas_line_to(p->cv, X, Y);
	}
	ow_canvas_close_path(p->cv);
}

/* Part of triangle t of cell (i, j) where z >= level (0, 3 or 4
 * vertices), counter-clockwise like the triangle. */
static int tri_clip(const struct ow_field *f, int i, int j, int t, double level,
                    struct ow_pt2 *q)
{
	int ci[3], cj[3], k, n = 0;

	for (k = 0; k < 3; k++)
		tri_corner(i, j, t, k, &ci[k], &cj[k]);
	for (k = 0; k < 3; k++) {
		int a = k, b = (k + 1) % 3;
		int ina = zat(f, ci[a], cj[a]) >= level;
		int inb = zat(f, ci[b], cj[b]) >= level;

		if (ina) {
			q[n].x = f->x[ci[a]];
			q[n].y = f->y[cj[a]];
			n++;
		}
		if (ina != inb)
			q[n++] = cross_pt(f, ci[a], cj[a], ci[b], cj[b], level);
	}
	return n;
}

static int cell_in(const struct ow_field *f, int i, int j, double level)
{
	return cell_ok(f, i, j) && zat(f, i, j) >= level &&
	       zat(f, i + 1, j) >= level && zat(f, i, j + 1) >= level &&
	       zat(f, i + 1, j + 1) >= level;
}

/* The region {z >= level} as one path: runs of whole cells as rectangles,
 * partial cells as clipped triangles, all the same orientation. */
static void region_path(const struct ow_plot *p, const struct ow_field *f,
                        double level)
{
	struct ow_pt2 q[5];
	int i, j, t;

	for (j = 0; j + 1 < f->ny; j++)
		for (i = 0; i + 1 < f->nx; i++) {
			if (cell_in(f, i, j, level)) {
				int i1 = i;

				while (i1 + 2 < f->nx &&
				       cell_in(f, i1 + 1, j, level))
					i1++;
				q[0].x = f->x[i], q[0].y = f->y[j];
				q[1].x = f->x[i1 + 1], q[1].y = f->y[j];
				q[2].x = f->x[i1 + 1], q[2].y = f->y[j + 1];
				q[3].x = f->x[i], q[3].y = f->y[j + 1];
				poly_to(p, q, 4);
				i = i1;
				continue;
			}
			if (!cell_ok(f, i, j))
				continue;
			for (t = 0; t < 2; t++) {
				int n = tri_clip(f, i, j, t, level, q);

				if (n >= 3)
					poly_to(p, q, n);
			}
		}
}

enum ow_status ow_plot_contour_fill(const struct ow_plot *p,
                                    const struct ow_field *f,
                                    const struct ow_ticks *levels,
                                    enum ow_cmap map, struct ow_diag *d)
{
	int k, nb;

	if (!p || !field_ok(f) || !levels || levels->n < 2)
		return ow_diag_set(d, OW_EARG,
		                   "contour fill: a field of at "
		                   "least 2 x 2 values and two levels needed");
	nb = levels->n - 1;
	ow_plot_clip(p);
	for (k = 0; k < nb; k++) {
		/* band 0 also takes whatever lies below the first level */
		double v = k == 0 ? -INFINITY : levels->v[k];

		region_path(p, f, v);
		ow_canvas_set_colour(p->cv, ow_contour_band_colour(map, k, nb));
		ow_canvas_fill(p->cv);
	}
	ow_canvas_restore(p->cv);
	return ow_canvas_status(p->cv, d);
}

enum ow_status ow_plot_field_region(const struct ow_plot *p,
                                    const struct ow_field *f, double level,
                                    struct ow_rgba tint,
                                    const struct ow_hatch *h, struct ow_diag *d)
{
	if (!p || !field_ok(f) || !isfinite(level))
		return ow_diag_set(d, OW_EARG,
		                   "field region: a field of at "
		                   "least 2 x 2 values and a finite level "
		                   "needed");
	ow_plot_clip(p);
	region_path(p, f, level);
	if (tint.a > 0.0) {
		ow_canvas_set_colour(p->cv, tint);
		ow_canvas_fill_preserve(p->cv);
	}
	if (h)
		ow_canvas_hatch(p->cv, h);
	ow_canvas_new_path(p->cv);
	ow_canvas_restore(p->cv);
	return ow_canvas_status(p->cv, d);
}

/* --- labelled iso-lines ----------------------------------------------- */

static double canvas_len(const struct ow_plot *p, const struct ow_isoline *l)
{
	double s = 0.0;
	int k;

	for (k = 1; k < l->n; k++)
		s += hypot(
		    ow_plot_px(p, l->p[k].x) - ow_plot_px(p, l->p[k - 1].x),
		    ow_plot_py(p, l->p[k].y) - ow_plot_py(p, l->p[k - 1].y));
	return s;
}

static void stroke_line(const struct ow_plot *p, const struct ow_isoline *l)
{
	int k;

	for (k = 0; k < l->n; k++) {
		double X = ow_plot_px(p, l->p[k].x),
		       Y = ow_plot_py(p, l->p[k].y);

		if (k == 0)
			ow_canvas_move_to(p->cv, X, Y);
		else
			ow_canvas_line_to(p->cv, X, Y);
	}
	ow_canvas_stroke(p->cv);
}

/* Point at arc length `at` along l (canvas), and the direction there. */
static void point_along(const struct ow_plot *p, const struct ow_isoline *l,
                        double at, double *X, double *Y, double *ang)
{
	double s = 0.0;
	int k;

	for (k = 1; k < l->n; k++) {
		double x0 = ow_plot_px(p, l->p[k - 1].x);
		double y0 = ow_plot_py(p, l->p[k - 1].y);
		double x1 = ow_plot_px(p, l->p[k].x),
		       y1 = ow_plot_py(p, l->p[k].y);
		double ds = hypot(x1 - x0, y1 - y0);

		if (s + ds >= at || k == l->n - 1) {
			double t = ds > 0.0 ? fmin(1.0, (at - s) / ds) : 0.0;

			*X = x0 + t * (x1 - x0);
			*Y = y0 + t * (y1 - y0);
			*ang = ow_plot_upright(atan2(-(y1 - y0), x1 - x0) *
			                       180.0 / OW_PI);
			return;
		}
		s += ds;
	}
	*X = ow_plot_px(p, l->p[0].x);
	*Y = ow_plot_py(p, l->p[0].y);
	*ang = 0.0;
}

double ow_plot_upright(double a)
{
	while (a > 100.0)
		a -= 180.0;
	while (a <= -80.0)
		a += 180.0;
	return a;
}

void ow_plot_label_on_line(struct ow_canvas *cv, double X, double Y, double ang,
                           const char *text, double font_pt, struct ow_rgba ink)
{
	double w, h = 1.25 * font_pt, a = ang * OW_PI / 180.0;
	double ux = cos(a), uy = -sin(a), vx = sin(a), vy = cos(a);
	double hw, hh = 0.5 * h;

	ow_canvas_save(cv);
	ow_canvas_set_font(cv, font_pt, 0);
	w = ow_canvas_text_width(cv, text) + 0.5 * font_pt;
	hw = 0.5 * w;
	ow_canvas_move_to(cv, X - hw * ux - hh * vx, Y - hw * uy - hh * vy);
	ow_canvas_line_to(cv, X + hw * ux - hh * vx, Y + hw * uy - hh * vy);
	ow_canvas_line_to(cv, X + hw * ux + hh * vx, Y + hw * uy + hh * vy);
	ow_canvas_line_to(cv, X - hw * ux + hh * vx, Y - hw * uy + hh * vy);
	ow_canvas_close_path(cv);
	ow_canvas_set_colour(cv, ow_rgba_with_alpha(ow_rgb(1, 1, 1), 0.85));
	ow_canvas_fill(cv);
	ow_canvas_set_colour(cv, ink);
	ow_canvas_text(cv, X, Y, text, OW_ALIGN_CENTRE, OW_VALIGN_MIDDLE, ang);
	ow_canvas_restore(cv);
}

static void label_longest(const struct ow_plot *p, const struct ow_isolines *L,
                          const char *text, struct ow_rgba ink)
{
	static const double frac[7] = {0.5, 0.4, 0.6, 0.3, 0.7, 0.2, 0.8};
	double best = 0.0, len, X = 0, Y = 0, ang = 0, need, tw;
	int k, b = -1;

	for (k = 0; k < L->n; k++) {
		len = canvas_len(p, &L->lines[k]);
		if (len > best) {
			best = len;
			b = k;
		}
	}
	ow_canvas_set_font(p->cv, 0.85 * p->font_pt, 0);
	tw = ow_canvas_text_width(p->cv, text);
	need = 2.0 * tw;
	if (b < 0 || best < need)
		return;
	/* the middle, or the nearest place where the label stays inside */
	for (k = 0; k < 7; k++) {
		double a, hx, hy;

		point_along(p, &L->lines[b], frac[k] * best, &X, &Y, &ang);
		a = ang * OW_PI / 180.0;
		hx = 0.5 * (tw + p->font_pt) * fabs(cos(a)) +
		     0.7 * p->font_pt * fabs(sin(a));
		hy = 0.5 * (tw + p->font_pt) * fabs(sin(a)) +
		     0.7 * p->font_pt * fabs(cos(a));
		if (X - hx >= p->area.x && X + hx <= p->area.x + p->area.w &&
		    Y - hy >= p->area.y && Y + hy <= p->area.y + p->area.h)
			break;
	}
	if (k == 7)
		return; /* no room: an unlabelled line beats a clipped label */
	ow_plot_label_on_line(p->cv, X, Y, ang, text, 0.85 * p->font_pt, ink);
}

enum ow_status ow_plot_isolines(const struct ow_plot *p,
                                const struct ow_field *f,
                                const struct ow_ticks *levels, int every,
                                struct ow_rgba colour, double width_pt,
                                struct ow_diag *d)
{
	enum ow_status st = OW_OK;
	char buf[64];
	int k, i;

	if (!p || !levels)
		return ow_diag_set(d, OW_EARG, "isolines: NULL argument");
	every = every < 1 ? 1 : every;
	ow_plot_clip(p);
	for (k = 0; k < levels->n && st == OW_OK; k += every) {
		struct ow_isolines *L = NULL;

		st = ow_contour_lines(f, levels->v[k], &L, d);
		if (st != OW_OK)
			break;
		ow_canvas_set_colour(p->cv, colour);
		ow_canvas_set_line_width(p->cv, width_pt);
		for (i = 0; i < L->n; i++)
			stroke_line(p, &L->lines[i]);
		ow_plot_format(buf, sizeof buf, levels->v[k], levels->decimals);
		label_longest(p, L, buf, colour);
		ow_isolines_destroy(L);
	}
	ow_canvas_restore(p->cv);
	return st != OW_OK ? st : ow_canvas_status(p->cv, d);
}

/* --- colour bar ------------------------------------------------------- */

void ow_plot_colour_bar(struct ow_canvas *cv, const struct ow_rect *box,
                        const struct ow_ticks *levels, enum ow_cmap map,
                        const char *title, double font_pt)
{
	double bw = 1.3 * font_pt, top = box->y + 2.0 * font_pt;
	double bot = box->y + box->h - 3.4 * font_pt - 4.0, lw = 0.0;
	double v0, v1, gap;
	char buf[64];
	int k, nb, step;

	if (!levels || levels->n < 2 || bot - top < 2.0 * font_pt)
		return;
	nb = levels->n - 1;
	v0 = levels->v[0];
	v1 = levels->v[nb];
	ow_canvas_save(cv);
	for (k = 0; k < nb; k++) {
		double ya = bot - (levels->v[k] - v0) / (v1 - v0) * (bot - top);
		double yb =
		    bot - (levels->v[k + 1] - v0) / (v1 - v0) * (bot - top);

		ow_canvas_rect(cv, box->x, yb, bw, ya - yb + 0.02);
		ow_canvas_set_colour(cv, ow_contour_band_colour(map, k, nb));
		ow_canvas_fill(cv);
	}
	ow_canvas_set_colour(cv, ow_rgb(0.12, 0.12, 0.12));
	ow_canvas_set_line_width(cv, 0.6);
	ow_canvas_rect(cv, box->x, top, bw, bot - top);
	ow_canvas_stroke(cv);
	ow_canvas_set_font(cv, font_pt, 0);
	gap = (bot - top) / (double)nb;
	step = gap >= 1.5 * font_pt ? 1 : (int)ceil(1.5 * font_pt / gap);
	for (k = 0; k <= nb; k += step) {
		double y = bot - (double)k * gap;

		ow_canvas_move_to(cv, box->x + bw, y);
		ow_canvas_line_to(cv, box->x + bw + 3.0, y);
		ow_plot_format(buf, sizeof buf, levels->v[k], levels->decimals);
		ow_canvas_text(cv, box->x + bw + 4.5, y, buf, OW_ALIGN_LEFT,
		               OW_VALIGN_MIDDLE, 0);
		lw = fmax(lw, ow_canvas_text_width(cv, buf));
	}
	ow_canvas_stroke(cv);
	if (title)
		ow_canvas_text(cv, box->x + bw + 6.0 + lw + 0.3 * font_pt,
		               0.5 * (top + bot), title, OW_ALIGN_CENTRE,
		               OW_VALIGN_TOP, 90);
	ow_canvas_restore(cv);
}
