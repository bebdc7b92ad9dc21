/* window_lines.c - each check's pass/fail boundary as polylines: marching
 * squares (Lorensen & Cline, Computer Graphics 21 (1987) 163, in two
 * dimensions) on the signed margins, crossings placed by linear
 * interpolation along lattice edges, segments chained through shared
 * edges. */
#include "window_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

struct field {
	const struct ow_grid *g;
	enum ow_check c;
	int nh; /* number of horizontal edges */
};

/* Signed pass value of check c at a lattice point (NAN: unknown). */
static double value(const struct field *f, int ir, int ia)
{
	const struct ow_grid_point *p = ow_grid_at(f->g, ir, ia);

	if (p->solved != 1)
		return NAN;
	if (f->c < OW_CK_LIMITS)
		return p->v.margin[f->c];
	return (p->v.bits >> f->c) & 1u ? -1.0 : 1.0;
}

/* Edge k (0 bottom, 1 right, 2 top, 3 left) of cell (ir, ia): its id and
 * end points. */
static int edge_id(const struct field *f, int ir, int ia, int k, int e[4])
{
	int nr = f->g->n_rpm;

	switch (k) {
	case 0: e[0] = ir; e[1] = ia; e[2] = ir + 1; e[3] = ia;
		return ia * (nr - 1) + ir;
	case 1: e[0] = ir + 1; e[1] = ia; e[2] = ir + 1; e[3] = ia + 1;
		return f->nh + ia * nr + ir + 1;
	case 2: e[0] = ir; e[1] = ia + 1; e[2] = ir + 1; e[3] = ia + 1;
		return (ia + 1) * (nr - 1) + ir;
	default: e[0] = ir; e[1] = ia; e[2] = ir; e[3] = ia + 1;
		return f->nh + ia * nr + ir;
	}
}

/* Where the margin crosses zero on edge id. */
static struct ow_xy crossing(const struct field *f, int id)
{
	const struct ow_grid *g = f->g;
	int nr = g->n_rpm, ir0, ia0, ir1, ia1;
	double v0, v1, t;
	const struct ow_grid_point *a, *b;

	if (id < f->nh) {
		ia0 = ia1 = id / (nr - 1);
		ir0 = id % (nr - 1);
		ir1 = ir0 + 1;
	} else {
		ia0 = (id - f->nh) / nr;
		ir0 = ir1 = (id - f->nh) % nr;
		ia1 = ia0 + 1;
	}
	v0 = value(f, ir0, ia0);
	v1 = value(f, ir1, ia1);
	t = v0 / (v0 - v1);
	a = ow_grid_at(g, ir0, ia0);
	b = ow_grid_at(g, ir1, ia1);
	return (struct ow_xy){a->rpm + t * (b->rpm - a->rpm),
			      a->axis + t * (b->axis - a->axis)};
}

struct segs {
	int n, cap;
	int *a, *b;     /* edge ids of the two ends */
	int *slot;      /* per edge: two segment indices (-1 empty) */
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

/* Segments of one cell; a saddle is split by the cell-centre value. */
static void cell(const struct field *f, int ir, int ia, struct segs *s)
{
	double v[4] = {value(f, ir, ia), value(f, ir + 1, ia),
		       value(f, ir + 1, ia + 1), value(f, ir, ia + 1)};
	int cut[4], n = 0, k, e[4];

	for (k = 0; k < 4; k++)
		if (isnan(v[k]))
			return;
	for (k = 0; k < 4; k++)
		if ((v[k] >= 0.0) != (v[(k + 1) % 4] >= 0.0))
			cut[n++] = edge_id(f, ir, ia, k, e);
	if (n == 2) {
		add_seg(s, cut[0], cut[1]);
	} else if (n == 4) {
		int centre_in = v[0] + v[1] + v[2] + v[3] >= 0.0;
		int corner_in = v[0] >= 0.0;

		if (centre_in == corner_in) { /* corner 0 joined to 2 */
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

		for (k = 0; k < 2; k++) {
			int c = s->slot[2 * edge + k];

			if (c >= 0 && !used[c]) {
				seg = c;
				break;
			}
		}
		if (seg < 0)
			break;
		used[seg] = 1;
		edge = other_end(s, seg, edge);
		if (n == cap) {
			struct ow_xy *np = realloc(p, sizeof *p * (size_t)(cap *= 2));

			if (!np) {
				free(p);
				return -1;
			}
			p = np;
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

/* Chain segments into polylines: open chains first, then closed loops. */
static int chain(const struct field *f, struct segs *s, struct ow_boundary *b)
{
	unsigned char *used = calloc((size_t)s->n + 1, 1);
	int pass, i;

	if (!used)
		return -1;
	b->lines = calloc((size_t)s->n + 1, sizeof *b->lines);
	if (!b->lines) {
		free(used);
		return -1;
	}
	for (pass = 0; pass < 2; pass++)
		for (i = 0; i < s->n; i++) {
			int start = open_end(s, s->a[i]) ? s->a[i] : s->b[i];

			if (used[i] || (pass == 0 && !open_end(s, start)))
				continue;
			if (walk(f, s, used, start, &b->lines[b->n_lines]))
				return free(used), -1;
			b->n_lines++;
		}
	free(used);
	return 0;
}

static int one_check(const struct ow_grid *g, enum ow_check c, int *slot,
		     struct ow_boundary *b)
{
	struct field f = {g, c, g->n_axis * (g->n_rpm - 1)};
	struct segs s = {0, 0, NULL, NULL, slot, 0};
	int ir, ia, rc = 0;
	size_t ne = (size_t)f.nh + (size_t)g->n_axis * (size_t)g->n_rpm;

	for (size_t k = 0; k < 2 * ne; k++)
		slot[k] = -1;
	for (ia = 0; ia + 1 < g->n_axis; ia++)
		for (ir = 0; ir + 1 < g->n_rpm; ir++)
			cell(&f, ir, ia, &s);
	b->check = c;
	if (s.oom || (s.n && chain(&f, &s, b)))
		rc = -1;
	free(s.a);
	free(s.b);
	return rc;
}

enum ow_status ow_window_boundaries(const struct ow_study *s,
				    const struct ow_grid *g,
				    struct ow_window *w, struct ow_diag *d)
{
	size_t ne = 2 * ((size_t)g->n_axis * (size_t)g->n_rpm) * 2;
	int *slot = malloc(sizeof *slot * ne), c;

	if (!slot)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	for (c = 0; c < OW_CK_COUNT; c++) {
		struct ow_boundary *b = &w->bounds[w->n_boundaries];

		if (!ow_check_active(&s->line.limits, (enum ow_check)c) ||
		    !w->fail_count[c])
			continue;
		memset(b, 0, sizeof *b);
		w->n_boundaries++; /* counted first: destroy frees partials */
		if (one_check(g, (enum ow_check)c, slot, b)) {
			free(slot);
			return ow_diag_set(d, OW_ENOMEM, "out of memory");
		}
	}
	free(slot);
	return OW_OK;
}
