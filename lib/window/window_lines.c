/* window_lines.c - each check's pass/fail boundary, and the window's own
 * edge, as polylines: marching squares (Lorensen & Cline, Computer Graphics
 * 21 (1987) 163, in two dimensions) on the signed margins, crossings placed
 * by linear interpolation along lattice edges, segments chained through
 * shared edges. A refined lattice is traced level by level: each cell at
 * the size it was solved at. */
#include "window_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* One level of the lattice: every s-th point, nr x na of them. */
struct field {
	const struct ow_grid *g;
	const struct ow_limits *lim;
	int c;          /* check, or OW_WINDOW_EDGE */
	int s;          /* lattice step of this level */
	int nr, na, nh; /* level size, number of horizontal edges */
};

const char *ow_window_boundary_key(int check)
{
	return check == OW_WINDOW_EDGE ? "window"
	                               : ow_check_key((enum ow_check)check);
}

static const struct ow_grid_point *at(const struct field *f, int i, int j)
{
	return ow_grid_at(f->g, i * f->s, j * f->s);
}

/* The window's edge as one implicit function: -1 where a flag fails,
 * otherwise the smallest margin of the limits set (capped at 1). */
static double edge_value(const struct field *f, const struct ow_grid_point *p)
{
	double v = 1.0;
	int c;

	if (p->v.bits >> OW_CK_LIMITS)
		return -1.0;
	for (c = 0; c < OW_CK_LIMITS; c++)
		if (ow_check_active(f->lim, (enum ow_check)c))
			v = fmin(v, p->v.margin[c]);
	return v;
}

/* Signed pass value at level point (i, j); NAN: not solved. */
static double value(const struct field *f, int i, int j)
{
	const struct ow_grid_point *p = at(f, i, j);

	if (p->solved != 1)
		return NAN;
	if (f->c == OW_WINDOW_EDGE)
		return edge_value(f, p);
	if (f->c < OW_CK_LIMITS)
		return p->v.margin[f->c];
	return (p->v.bits >> f->c) & 1u ? -1.0 : 1.0;
}

/* Edge k (0 bottom, 1 right, 2 top, 3 left) of level cell (i, j). */
static int edge_id(const struct field *f, int i, int j, int k)
{
	switch (k) {
	case 0:
		return j * (f->nr - 1) + i;
	case 1:
		return f->nh + j * f->nr + i + 1;
	case 2:
		return (j + 1) * (f->nr - 1) + i;
	default:
		return f->nh + j * f->nr + i;
	}
}

/* Where the margin crosses zero on edge id. */
static struct ow_xy crossing(const struct field *f, int id)
{
	int i0, j0, i1, j1;
	double v0, v1, t;
	const struct ow_grid_point *a, *b;

	if (id < f->nh) {
		j0 = j1 = id / (f->nr - 1);
		i0 = id % (f->nr - 1);
		i1 = i0 + 1;
	} else {
		j0 = (id - f->nh) / f->nr;
		i0 = i1 = (id - f->nh) % f->nr;
		j1 = j0 + 1;
	}
	v0 = value(f, i0, j0);
	v1 = value(f, i1, j1);
	t = v0 / (v0 - v1);
	a = at(f, i0, j0);
	b = at(f, i1, j1);
	return (struct ow_xy){a->rpm + t * (b->rpm - a->rpm),
	                      a->axis + t * (b->axis - a->axis)};
}

struct segs {
	int n, cap;
	int *a, *b; /* edge ids of the two ends */
	int *slot;  /* per edge: two segment indices (-1 empty) */
	int oom;
};

static void add_seg(struct segs *s, int ea, int eb)
{
	int k;

	if (s->n == s->cap) {
		int cap = s->cap ? 2 * s->cap : 256;
		int *na = realloc(s->a, sizeof *na * (size_t)cap);
		int *nb = na ? realloc(s->b, sizeof *nb * (size_t)cap) : NULL;

		if (na)
			s->a = na;
		if (!na || !nb) {
			s->oom = 1;
			return;
		}
		s->b = nb;
		s->cap = cap;
	}
	s->a[s->n] = ea;
	s->b[s->n] = eb;
	for (k = 0; k < 2; k++) {
		int *sl = &s->slot[2 * (k ? eb : ea)];

		sl[sl[0] < 0 ? 0 : 1] = s->n;
	}
	s->n++;
}

/* A cell is traced at this level when its corners are solved and it was
 * not refined further (its centre point unsolved, or the finest level). */
static int leaf(const struct field *f, int i, int j)
{
	int h = f->s / 2;

	return f->s == 1 ||
	       ow_grid_at(f->g, i * f->s + h, j * f->s + h)->solved != 1;
}

/* Segments of one cell; a saddle is split by the cell-centre value. */
static void cell(const struct field *f, int i, int j, struct segs *s)
{
	double v[4] = {value(f, i, j), value(f, i + 1, j),
	               value(f, i + 1, j + 1), value(f, i, j + 1)};
	int cut[4], n = 0, k;

	for (k = 0; k < 4; k++)
		if (isnan(v[k]))
			return;
	if (!leaf(f, i, j))
		return;
	for (k = 0; k < 4; k++)
		if ((v[k] >= 0.0) != (v[(k + 1) % 4] >= 0.0))
			cut[n++] = edge_id(f, i, j, k);
	if (n == 2) {
		add_seg(s, cut[0], cut[1]);
	} else if (n == 4) {
		int centre_in = v[0] + v[1] + v[2] + v[3] >= 0.0;

		if (centre_in == (v[0] >= 0.0)) {
			add_seg(s, cut[0], cut[1]);
			add_seg(s, cut[2], cut[3]);
		} else {
			add_seg(s, cut[0], cut[3]);
			add_seg(s, cut[1], cut[2]);
		}
	}
}

static int other_end(const struct segs *s, int seg, int edge)
{
	return s->a[seg] == edge ? s->b[seg] : s->a[seg];
}

static int grow(struct ow_xy **p, int *cap, int n)
{
	struct ow_xy *np;

	if (n < *cap)
		return 0;
	np = realloc(*p, sizeof **p * (size_t)(*cap * 2));
	if (!np)
		return -1;
	*p = np;
	*cap *= 2;
	return 0;
}

/* Walk from edge `start` along unused segments, appending points. */
static int walk(const struct field *f, struct segs *s, unsigned char *used,
                int start, struct ow_polyline *pl)
{
	int edge = start, n = 0, cap = 16, k;
	struct ow_xy *p = malloc(sizeof *p * (size_t)cap);

	if (!p)
		return -1;
	p[n++] = crossing(f, edge);
	for (;;) {
		int seg = -1;

		for (k = 0; k < 2 && seg < 0; k++) {
			int c = s->slot[2 * edge + k];

			if (c >= 0 && !used[c])
				seg = c;
		}
		if (seg < 0)
			break;
		used[seg] = 1;
		edge = other_end(s, seg, edge);
		if (grow(&p, &cap, n)) {
			free(p);
			return -1;
		}
		p[n++] = crossing(f, edge);
	}
	pl->n = n;
	pl->p = p;
	return 0;
}

static int open_end(const struct segs *s, int edge)
{
	return s->slot[2 * edge + 1] < 0;
}

/* Chain segments into polylines (open chains first, then loops) appended
 * to b->lines. */
static int chain(const struct field *f, struct segs *s, struct ow_boundary *b)
{
	unsigned char *used = calloc((size_t)s->n + 1, 1);
	struct ow_polyline *nl;
	int pass, i;

	nl = realloc(b->lines, sizeof *nl * (size_t)(b->n_lines + s->n + 1));
	if (!used || !nl) {
		free(used);
		if (nl)
			b->lines = nl;
		return -1;
	}
	b->lines = nl;
	for (pass = 0; pass < 2; pass++)
		for (i = 0; i < s->n; i++) {
			int start = open_end(s, s->a[i]) ? s->a[i] : s->b[i];

			if (used[i] || (pass == 0 && !open_end(s, start)))
				continue;
			if (walk(f, s, used, start, &b->lines[b->n_lines])) {
				free(used);
				return -1;
			}
			b->n_lines++;
		}
	free(used);
	return 0;
}

static int one_level(struct field *f, int *slot, struct ow_boundary *b)
{
	struct segs s = {0, 0, NULL, NULL, slot, 0};
	size_t ne;
	int i, j, rc = 0;

	f->nr = (f->g->n_rpm - 1) / f->s + 1;
	f->na = (f->g->n_axis - 1) / f->s + 1;
	f->nh = f->na * (f->nr - 1);
	ne = (size_t)f->nh + (size_t)f->na * (size_t)f->nr;
	for (size_t k = 0; k < 2 * ne; k++)
		slot[k] = -1;
	for (j = 0; j + 1 < f->na; j++)
		for (i = 0; i + 1 < f->nr; i++)
			cell(f, i, j, &s);
	if (s.oom || (s.n && chain(f, &s, b)))
		rc = -1;
	free(s.a);
	free(s.b);
	return rc;
}

static int one_check(const struct ow_study *st, const struct ow_grid *g, int c,
                     int *slot, struct ow_boundary *b)
{
	struct field f = {g, &st->line.limits, c, g->stride, 0, 0, 0};

	b->check = c;
	for (; f.s >= 1; f.s /= 2)
		if (one_level(&f, slot, b))
			return -1;
	return 0;
}

enum ow_status ow_window_boundaries(const struct ow_study *s,
                                    const struct ow_grid *g,
                                    struct ow_window *w, struct ow_diag *d)
{
	size_t ne = 4 * (size_t)g->n_axis * (size_t)g->n_rpm;
	int *slot = malloc(sizeof *slot * ne), c;

	if (!slot)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	for (c = 0; c <= OW_WINDOW_EDGE; c++) {
		struct ow_boundary *b = &w->bounds[w->n_boundaries];
		int fails = c == OW_WINDOW_EDGE ? w->safe_fraction < 1.0
		                                : w->fail_count[c] > 0;

		if ((c < OW_CK_COUNT &&
		     !ow_check_active(&s->line.limits, (enum ow_check)c)) ||
		    !fails || (c == OW_WINDOW_EDGE && w->empty))
			continue;
		memset(b, 0, sizeof *b);
		w->n_boundaries++; /* counted first: destroy frees partials */
		if (one_check(s, g, c, slot, b)) {
			free(slot);
			return ow_diag_set(d, OW_ENOMEM, "out of memory");
		}
	}
	free(slot);
	return OW_OK;
}
