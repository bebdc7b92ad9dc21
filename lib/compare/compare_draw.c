/* compare_draw.c - the overlay map of a comparison: screw speed across,
 * the reference zone's set-point up; where only A or only B is safe tinted
 * in that case's colour and hatched in its own direction, where neither
 * is safe grey; each case's window edge in its colour, line style and
 * label (so the map reads in greyscale print too); the common rectangle in
 * bold black; the three centres with distinct markers; a legend. Colours:
 * Okabe & Ito, "Color Universal Design" (2008), blue and vermillion. */
#include "ow_compare.h"

#include "ow_maps.h"
#include "ow_report.h"
#include "ow_const.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define TINT_ALPHA 0.20
#define MAX_TAKEN  8

struct case_style {
	double r, g, b;
	enum ow_dash_style dash;
	enum ow_marker marker;
	double hatch_deg;
};

static const struct case_style styles[2] = {
    {0.00, 0.447, 0.698, OW_DASH_SOLID, OW_MARK_CIRCLE, 45.0},
    {0.835, 0.369, 0.00, OW_DASH_DASHED, OW_MARK_SQUARE, 135.0},
};

static struct ow_rgba ink(int k)
{
	return ow_rgb(styles[k].r, styles[k].g, styles[k].b);
}

static struct ow_hatch hatch(int k)
{
	struct ow_hatch h = {styles[k].hatch_deg, 5.0, 0.7,
	                     ow_rgba_with_alpha(ink(k), 0.8)};

	return h;
}

char *ow_compare_format_range(char *buf, size_t n, double lo, double hi,
                              int decimals)
{
	char a[32] = "", b[32] = "";
	int dec;

	for (dec = decimals; dec <= decimals + 2; dec++) {
		ow_report_format_bound(a, sizeof a, lo, dec, OW_ROUND_UP);
		ow_report_format_bound(b, sizeof b, hi, dec, OW_ROUND_DOWN);
		if (ceil(lo * pow(10.0, dec) - 1e-6) <=
		    floor(hi * pow(10.0, dec) + 1e-6))
			break;
	}
	snprintf(buf, n, "%s–%s", a, b);
	return buf;
}

void ow_compare_draw_default(struct ow_compare_draw_options *o)
{
	memset(o, 0, sizeof *o);
	o->units = OW_SYS_SI;
	o->label[0] = "A";
	o->label[1] = "B";
}

static double font_of(const struct ow_compare_draw_options *o)
{
	return o->font_pt > 0.0 ? o->font_pt : 9.0;
}

static const char *label_of(const struct ow_compare_draw_options *o, int k)
{
	return o->label[k] && *o->label[k] ? o->label[k] : (k ? "B" : "A");
}

static double shown_temp(enum ow_unit_system u, double K)
{
	return ow_display_value(u, OW_DIM_TEMPERATURE, K);
}

/* ---- the lattice as fields -------------------------------------------- */

/* Where the window's edge lies, as one signed value (the window module's
 * edge function): -1 where a flag fails, else the smallest margin of the
 * limits set, capped at 1. */
static double edge_value(const struct ow_grid_point *p,
                         const struct ow_limits *lim)
{
	double v = 1.0;
	int c;

	if (p->v.bits >> OW_CK_LIMITS)
		return -1.0;
	for (c = 0; c < OW_CK_LIMITS; c++)
		if (ow_check_active(lim, (enum ow_check)c))
			v = fmin(v, p->v.margin[c]);
	return v;
}

struct fields {
	double *x, *y, *e[2], *z;
	struct ow_field f;
};

static void fields_free(struct fields *fs)
{
	free(fs->x);
	free(fs->y);
	free(fs->e[0]);
	free(fs->e[1]);
	free(fs->z);
}

/* The map's vertical coordinate of barrel axis value `axis`: the shift in
 * temperature difference units when the two cases are aligned on the
 * shift from their own set-points, else the reference zone's set-point
 * (equal in both cases then). */
static double y_axis(const struct ow_compare *cmp, enum ow_unit_system u,
                     double axis)
{
	if (cmp->by_shift)
		return ow_display_value(u, OW_DIM_TEMP_DIFF, axis);
	return shown_temp(u, ow_line_axis_ref_K(&cmp->study[0]->line, axis));
}

static enum ow_status fields_make(const struct ow_compare *cmp,
                                  enum ow_unit_system u, struct fields *fs,
                                  struct ow_diag *d)
{
	size_t n = (size_t)cmp->n_rpm * (size_t)cmp->n_axis;
	int i, k;

	memset(fs, 0, sizeof *fs);
	fs->x = malloc(sizeof *fs->x * (size_t)cmp->n_rpm);
	fs->y = malloc(sizeof *fs->y * (size_t)cmp->n_axis);
	fs->e[0] = malloc(sizeof *fs->z * n);
	fs->e[1] = malloc(sizeof *fs->z * n);
	fs->z = malloc(sizeof *fs->z * n);
	if (!fs->x || !fs->y || !fs->e[0] || !fs->e[1] || !fs->z) {
		fields_free(fs);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	for (i = 0; i < cmp->n_rpm; i++)
		fs->x[i] = ow_grid_at(cmp->map[0]->grid, i, 0)->rpm;
	for (i = 0; i < cmp->n_axis; i++)
		fs->y[i] =
		    y_axis(cmp, u, ow_grid_at(cmp->map[0]->grid, 0, i)->axis);
	for (k = 0; k < 2; k++)
		for (i = 0; i < (int)n; i++)
			fs->e[k][i] = edge_value(&cmp->map[k]->grid->pts[i],
			                         &cmp->study[k]->line.limits);
	fs->f = (struct ow_field){cmp->n_rpm, cmp->n_axis, fs->x, fs->y, fs->z};
	return OW_OK;
}

/* z = min(sa * e_A, sb * e_B): >= 0 where A is safe (sa 1) or unsafe
 * (sa -1) and likewise B. */
static void fields_set(struct fields *fs, double sa, double sb)
{
	int i, n = fs->f.nx * fs->f.ny;

	for (i = 0; i < n; i++)
		fs->z[i] = fmin(sa * fs->e[0][i], sb * fs->e[1][i]);
}

static enum ow_status regions(const struct ow_plot *p,
                              const struct ow_compare *cmp,
                              enum ow_unit_system u, struct ow_diag *d)
{
	struct fields fs;
	struct ow_hatch h[2] = {hatch(0), hatch(1)};
	enum ow_status st = fields_make(cmp, u, &fs, d);
	int k;

	if (st != OW_OK)
		return st;
	fields_set(&fs, -1.0, -1.0); /* safe in neither */
	st = ow_plot_field_region(
	    p, &fs.f, 0.0, ow_rgba_with_alpha(ow_rgb(0.45, 0.45, 0.45), 0.30),
	    NULL, d);
	for (k = 0; k < 2 && st == OW_OK; k++) {
		fields_set(&fs, k ? -1.0 : 1.0, k ? 1.0 : -1.0); /* k only */
		st = ow_plot_field_region(
		    p, &fs.f, 0.0, ow_rgba_with_alpha(ink(k), TINT_ALPHA),
		    &h[k], d);
	}
	fields_free(&fs);
	return st;
}

/* ---- edges, rectangle, centres ---------------------------------------- */

static const struct ow_boundary *edge_of(const struct ow_window *w)
{
	int b;

	for (b = 0; b < w->n_boundaries; b++)
		if (w->bounds[b].check == OW_WINDOW_EDGE)
			return &w->bounds[b];
	return NULL;
}

/* Polyline l in plot data (rpm, the map's vertical coordinate). */
static struct ow_pt2 *edge_points(const struct ow_compare *cmp,
                                  const struct ow_polyline *l,
                                  enum ow_unit_system u)
{
	struct ow_pt2 *q = malloc(sizeof *q * (size_t)(l->n > 0 ? l->n : 1));
	int i;

	for (i = 0; q && i < l->n; i++)
		q[i] =
		    (struct ow_pt2){l->p[i].rpm, y_axis(cmp, u, l->p[i].axis)};
	return q;
}

static void draw_edges(const struct ow_plot *p, const struct ow_compare *cmp,
                       enum ow_unit_system u)
{
	int k, l;

	for (k = 0; k < 2; k++) {
		const struct ow_boundary *b = edge_of(cmp->map[k]->window);
		struct ow_line_style halo = {ow_rgb(1, 1, 1), 4.2,
		                             OW_DASH_SOLID, OW_MARK_NONE};
		struct ow_line_style ln = {ink(k), 2.2, styles[k].dash,
		                           OW_MARK_NONE};

		for (l = 0; b && l < b->n_lines; l++) {
			struct ow_pt2 *q = edge_points(cmp, &b->lines[l], u);

			if (!q)
				continue;
			ow_plot_polyline(p, q, b->lines[l].n, &halo);
			ow_plot_polyline(p, q, b->lines[l].n, &ln);
			free(q);
		}
	}
}

static void rect_of(const struct ow_plot *p, const struct ow_compare *cmp,
                    const struct ow_window *w, enum ow_unit_system u,
                    double *x0, double *y0, double *x1, double *y1)
{
	*x0 = ow_plot_px(p, w->rpm_min);
	*x1 = ow_plot_px(p, w->rpm_max);
	*y0 = ow_plot_py(p, y_axis(cmp, u, w->axis_max));
	*y1 = ow_plot_py(p, y_axis(cmp, u, w->axis_min));
}

static void draw_common(const struct ow_plot *p, const struct ow_compare *cmp,
                        const struct ow_window *w, enum ow_unit_system u)
{
	double x0, y0, x1, y1;

	if (w->empty)
		return;
	rect_of(p, cmp, w, u, &x0, &y0, &x1, &y1);
	ow_canvas_save(p->cv);
	ow_canvas_set_dash(p->cv, NULL, 0);
	ow_canvas_rect(p->cv, x0, y0, x1 - x0, y1 - y0);
	ow_canvas_set_colour(p->cv, ow_rgb(1, 1, 1));
	ow_canvas_set_line_width(p->cv, 5.0);
	ow_canvas_stroke_preserve(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_set_line_width(p->cv, 2.6);
	ow_canvas_stroke(p->cv);
	ow_canvas_restore(p->cv);
}

static void draw_centres(const struct ow_plot *p, const struct ow_compare *cmp,
                         enum ow_unit_system u)
{
	const struct ow_window *c = cmp->common[0];
	int k;

	if (!c->empty)
		ow_plot_marker(p, c->centre.rpm, y_axis(cmp, u, c->centre.axis),
		               OW_MARK_DIAMOND, 15.0, ow_rgb(1, 1, 1),
		               ow_rgb(0, 0, 0));
	for (k = 0; k < 2; k++) {
		const struct ow_window *w = cmp->map[k]->window;

		if (!w->empty)
			ow_plot_marker(
			    p, w->centre.rpm, y_axis(cmp, u, w->centre.axis),
			    styles[k].marker, 8.0, ow_rgb(1, 1, 1), ink(k));
	}
}

/* ---- labels ------------------------------------------------------------ */

struct taken {
	int n;
	double x0[MAX_TAKEN], y0[MAX_TAKEN], x1[MAX_TAKEN], y1[MAX_TAKEN];
};

static int is_free(const struct taken *t, double x0, double y0, double x1,
                   double y1)
{
	int i;

	for (i = 0; i < t->n; i++)
		if (x0 < t->x1[i] && x1 > t->x0[i] && y0 < t->y1[i] &&
		    y1 > t->y0[i])
			return 0;
	return 1;
}

static void take(struct taken *t, double x0, double y0, double x1, double y1)
{
	if (t->n == MAX_TAKEN)
		return;
	t->x0[t->n] = x0;
	t->y0[t->n] = y0;
	t->x1[t->n] = x1;
	t->y1[t->n++] = y1;
}

/* Canvas point at arc fraction f of polyline q (n points) and the line's
 * direction there, kept upright. */
static void along(const struct ow_plot *p, const struct ow_pt2 *q, int n,
                  double f, double *X, double *Y, double *ang)
{
	double total = 0.0, s = 0.0;
	int k;

	for (k = 1; k < n; k++)
		total +=
		    hypot(ow_plot_px(p, q[k].x) - ow_plot_px(p, q[k - 1].x),
		          ow_plot_py(p, q[k].y) - ow_plot_py(p, q[k - 1].y));
	*X = ow_plot_px(p, q[0].x);
	*Y = ow_plot_py(p, q[0].y);
	*ang = 0.0;
	for (k = 1; k < n; k++) {
		double x0 = ow_plot_px(p, q[k - 1].x),
		       y0 = ow_plot_py(p, q[k - 1].y);
		double x1 = ow_plot_px(p, q[k].x), y1 = ow_plot_py(p, q[k].y);
		double ds = hypot(x1 - x0, y1 - y0);

		if (ds > 0.0 && s + ds >= f * total) {
			double t = (f * total - s) / ds;

			*X = x0 + t * (x1 - x0);
			*Y = y0 + t * (y1 - y0);
			*ang = atan2(-(y1 - y0), x1 - x0) * 180.0 / OW_PI;
			*ang = *ang > 90.0    ? *ang - 180.0
			       : *ang < -90.0 ? *ang + 180.0
			                      : *ang;
			return;
		}
		s += ds;
	}
}

/* Try to put text along polyline q at a free place inside the data area;
 * returns 1 when placed. */
static int place_on(const struct ow_plot *p, const struct ow_pt2 *q, int n,
                    const char *text, int k, struct taken *t)
{
	static const double frac[] = {0.5, 0.3, 0.7, 0.15, 0.85, 0.4, 0.6};
	double fs = p->font_pt, tw, X, Y, ang;
	size_t i;

	ow_canvas_set_font(p->cv, fs, 1);
	tw = ow_canvas_text_width(p->cv, text) + 0.6 * fs;
	for (i = 0; i < sizeof frac / sizeof frac[0]; i++) {
		double a, hx, hy;

		along(p, q, n, frac[i], &X, &Y, &ang);
		a = ang * OW_PI / 180.0;
		hx = 0.5 * tw * fabs(cos(a)) + 0.7 * fs * fabs(sin(a));
		hy = 0.5 * tw * fabs(sin(a)) + 0.7 * fs * fabs(cos(a));
		if (X - hx < p->area.x || X + hx > p->area.x + p->area.w ||
		    Y - hy < p->area.y || Y + hy > p->area.y + p->area.h ||
		    !is_free(t, X - hx, Y - hy, X + hx, Y + hy))
			continue;
		take(t, X - hx, Y - hy, X + hx, Y + hy);
		ow_plot_label_on_line(p->cv, X, Y, ang, text, fs, ink(k));
		return 1;
	}
	return 0;
}

/* Each case's label on its own edge: the longest piece first. */
static void label_edges(const struct ow_plot *p, const struct ow_compare *cmp,
                        const struct ow_compare_draw_options *o,
                        struct taken *t)
{
	int k, l;

	for (k = 0; k < 2; k++) {
		const struct ow_boundary *b = edge_of(cmp->map[k]->window);
		char text[96];
		int best = -1, placed = 0;

		snprintf(text, sizeof text, "%s", label_of(o, k));
		for (l = 0; b && l < b->n_lines; l++)
			if (best < 0 || b->lines[l].n > b->lines[best].n)
				best = l;
		for (l = -1; b && best >= 0 && l < b->n_lines && !placed; l++) {
			int m = l < 0 ? best : l;
			struct ow_pt2 *q =
			    edge_points(cmp, &b->lines[m], o->units);

			if (q && b->lines[m].n > 1)
				placed =
				    place_on(p, q, b->lines[m].n, text, k, t);
			free(q);
		}
	}
}

/* "common window 20–68 rpm, 188–218 °C" by the rectangle's top-left
 * corner, inside when it fits, else above or below. */
static void label_common(const struct ow_plot *p, const struct ow_compare *cmp,
                         const struct ow_window *w, enum ow_unit_system u,
                         struct taken *t)
{
	char a[64], b[64], text[160];
	double f = p->font_pt, x0, y0, x1, y1, tw, h = 1.4 * f, bx, by;

	if (w->empty)
		return;
	rect_of(p, cmp, w, u, &x0, &y0, &x1, &y1);
	snprintf(text, sizeof text, "common window %s rpm, %s %s",
	         ow_compare_format_range(a, sizeof a, w->rpm_min, w->rpm_max,
	                                 OW_REPORT_RPM_DECIMALS),
	         ow_compare_format_range(
	             b, sizeof b, y_axis(cmp, u, w->axis_min),
	             y_axis(cmp, u, w->axis_max), OW_REPORT_TEMP_DECIMALS),
	         ow_display_label(u, cmp->by_shift ? OW_DIM_TEMP_DIFF
	                                           : OW_DIM_TEMPERATURE));
	ow_canvas_set_font(p->cv, f, 1);
	tw = ow_canvas_text_width(p->cv, text) + 0.6 * f;
	bx = fmax(p->area.x, fmin(x0 + 4.0, p->area.x + p->area.w - tw));
	by = y0 + 4.0;
	if (tw > x1 - x0 - 8.0 || h > y1 - y0 - 8.0) {
		by = y0 - 4.0 - h;
		if (by < p->area.y)
			by = y1 + 4.0;
	}
	ow_canvas_save(p->cv);
	ow_canvas_set_dash(p->cv, NULL, 0);
	ow_canvas_rect(p->cv, bx, by, tw, h);
	ow_canvas_set_colour(p->cv, ow_rgba_with_alpha(ow_rgb(1, 1, 1), 0.92));
	ow_canvas_fill(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_text(p->cv, bx + 0.3 * f, by + 0.5 * h, text, OW_ALIGN_LEFT,
	               OW_VALIGN_MIDDLE, 0);
	ow_canvas_restore(p->cv);
	take(t, bx, by, bx + tw, by + h);
}

/* ---- legend, titles, layout ------------------------------------------- */

struct layout {
	struct ow_legend_entry e[12];
	struct ow_hatch h[2];
	char text[12][128];
	char ytitle[128];
	struct ow_plot_axis x, y;
	struct ow_plot p;
	int n;
};

static void entry_line(struct layout *ly, const char *text, struct ow_rgba c,
                       double w, enum ow_dash_style dash, enum ow_marker m)
{
	struct ow_legend_entry *e = &ly->e[ly->n];

	snprintf(ly->text[ly->n], sizeof ly->text[0], "%s", text);
	e->label = ly->text[ly->n++];
	e->line.colour = c;
	e->line.width_pt = w;
	e->line.dash = dash;
	e->marker = m;
}

static void entry_swatch(struct layout *ly, const char *text,
                         struct ow_rgba fill, const struct ow_hatch *h)
{
	struct ow_legend_entry *e = &ly->e[ly->n];

	snprintf(ly->text[ly->n], sizeof ly->text[0], "%s", text);
	e->label = ly->text[ly->n++];
	e->swatch = 1;
	e->fill = fill;
	e->hatch = h;
	e->line.colour = ow_rgb(0.5, 0.5, 0.5);
	e->line.width_pt = 0.5;
}

static void legend(struct layout *ly, const struct ow_compare_draw_options *o)
{
	char t[128];
	int k;

	memset(ly->e, 0, sizeof ly->e);
	ly->n = 0;
	for (k = 0; k < 2; k++) {
		snprintf(t, sizeof t, "%s: edge of its safe region",
		         label_of(o, k));
		entry_line(ly, t, ink(k), 2.2, styles[k].dash, OW_MARK_NONE);
	}
	entry_swatch(ly, "safe in both", ow_rgb(1, 1, 1), NULL);
	for (k = 0; k < 2; k++) {
		ly->h[k] = hatch(k);
		snprintf(t, sizeof t, "safe only in %s", label_of(o, k));
		entry_swatch(ly, t, ow_rgba_with_alpha(ink(k), TINT_ALPHA),
		             &ly->h[k]);
	}
	entry_swatch(ly, "safe in neither",
	             ow_rgba_with_alpha(ow_rgb(0.45, 0.45, 0.45), 0.30), NULL);
	entry_line(ly, "common window (safe in both)", ow_rgb(0, 0, 0), 2.6,
	           OW_DASH_SOLID, OW_MARK_NONE);
	entry_line(ly, "centre of the common window", ow_rgb(0, 0, 0), 0.0,
	           OW_DASH_SOLID, OW_MARK_DIAMOND);
	for (k = 0; k < 2; k++) {
		snprintf(t, sizeof t, "centre of %s's window", label_of(o, k));
		entry_line(ly, t, ink(k), 0.0, OW_DASH_SOLID, styles[k].marker);
	}
}

/* Title, and one line per case saying which line is which. */
static void titles(struct ow_canvas *cv, const struct ow_rect *box,
                   const struct ow_compare *cmp,
                   const struct ow_compare_draw_options *o, double f)
{
	static const char *const how[2] = {"solid", "dashed"};
	char line[400];
	int k;

	ow_canvas_save(cv);
	ow_canvas_set_colour(cv, ow_rgb(0.08, 0.08, 0.1));
	ow_canvas_set_font(cv, 1.25 * f, 1);
	snprintf(line, sizeof line, "Operating windows compared: %s and %s",
	         label_of(o, 0), label_of(o, 1));
	ow_canvas_text(cv, box->x + 0.8 * f, box->y + 0.6 * f, line,
	               OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
	for (k = 0; k < 2; k++) {
		double y = box->y + (2.35 + 1.35 * k) * f;

		double x = box->x + 0.8 * f;

		ow_canvas_set_font(cv, 0.9 * f, 1);
		ow_canvas_set_colour(cv, ink(k));
		snprintf(line, sizeof line, "%s (%s):", label_of(o, k), how[k]);
		ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
		x += ow_canvas_text_width(cv, line) + 0.5 * f;
		ow_canvas_set_font(cv, 0.9 * f, 0);
		ow_canvas_set_colour(cv, ow_rgb(0.15, 0.15, 0.15));
		ow_canvas_text(cv, x, y, cmp->study[k]->title, OW_ALIGN_LEFT,
		               OW_VALIGN_TOP, 0);
	}
	ow_canvas_restore(cv);
}

static enum ow_status layout(struct ow_canvas *cv, const struct ow_rect *box,
                             const struct ow_compare *cmp,
                             const struct ow_compare_draw_options *o,
                             struct layout *ly, struct ow_diag *d)
{
	double f = font_of(o), lw, lh;
	struct ow_rect inner = *box;
	const struct ow_axes *ax = &cmp->study[0]->line.axes;
	char lab[96];

	legend(ly, o);
	ow_plot_legend_size(cv, ly->e, ly->n, 0.9 * f, &lw, &lh);
	inner.y += 5.2 * f;
	inner.h -= 5.2 * f;
	snprintf(ly->ytitle, sizeof ly->ytitle, "%s (%s)",
	         ow_maps_axis_label(cmp->study[0], lab, sizeof lab),
	         ow_display_label(o->units, OW_DIM_TEMPERATURE));
	ly->x = (struct ow_plot_axis){ax->rpm_from, ax->rpm_to,
	                              "screw speed (rpm)", 0, 9};
	if (cmp->by_shift)
		snprintf(
		    ly->ytitle, sizeof ly->ytitle,
		    "every zone shifted from its case's own set-point (%s)",
		    ow_display_label(o->units, OW_DIM_TEMP_DIFF));
	ly->y = (struct ow_plot_axis){y_axis(cmp, o->units, ax->axis_from),
	                              y_axis(cmp, o->units, ax->axis_to),
	                              ly->ytitle, 0, 0};
	if (ow_plot_init(&ly->p, cv, &inner, &ly->x, &ly->y, f, lw + 0.8 * f) !=
	    OW_OK)
		return ow_diag_set(d, OW_EARG,
		                   "overlay map: box %.0f x %.0f pt "
		                   "too small",
		                   box->w, box->h);
	return OW_OK;
}

static enum ow_status draw_body(const struct ow_plot *p,
                                const struct ow_compare *cmp,
                                const struct ow_compare_draw_options *o,
                                struct ow_diag *d)
{
	struct taken t = {0};
	enum ow_status st;

	ow_plot_grid(p);
	st = regions(p, cmp, o->units, d);
	if (st != OW_OK)
		return st;
	draw_edges(p, cmp, o->units);
	draw_common(p, cmp, cmp->common[0], o->units);
	draw_centres(p, cmp, o->units);
	label_common(p, cmp, cmp->common[0], o->units, &t);
	label_edges(p, cmp, o, &t);
	return OW_OK;
}

/* Where only case k is safe: its share and the limits the other case
 * exceeds there (the reason for the difference). Returns the next y. */
static double only_notes(struct ow_canvas *cv, double x, double y,
                         const struct ow_compare *cmp,
                         const struct ow_compare_draw_options *o, double f,
                         int k)
{
	int only = cmp->count[k ? OW_CMP_B_ONLY : OW_CMP_A_ONLY], c;
	char line[160];

	if (!only)
		return y;
	ow_canvas_set_font(cv, f, 1);
	ow_canvas_set_colour(cv, ink(k));
	snprintf(line, sizeof line, "Safe only in %s: %.0f %%", label_of(o, k),
	         100.0 * only / (cmp->n_rpm * cmp->n_axis));
	ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
	y += 1.4 * f;
	ow_canvas_set_font(cv, f, 0);
	ow_canvas_set_colour(cv, ow_rgb(0.12, 0.12, 0.12));
	snprintf(line, sizeof line, "there %s fails:", label_of(o, 1 - k));
	ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
	y += 1.3 * f;
	for (c = 0; c < OW_CK_COUNT; c++) {
		if (!cmp->lost[k][c])
			continue;
		snprintf(line, sizeof line, "  %s (%d points)",
		         ow_check_text((enum ow_check)c), cmp->lost[k][c]);
		ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
		y += 1.3 * f;
	}
	return y + 0.6 * f;
}

/* Below the legend: the share safe in both, empty windows, and what each
 * case alone keeps and why. */
static void notes(struct ow_canvas *cv, double x, double y,
                  const struct ow_compare *cmp,
                  const struct ow_compare_draw_options *o, double f)
{
	char line[160];
	int k;

	ow_canvas_save(cv);
	ow_canvas_set_colour(cv, ow_rgb(0.12, 0.12, 0.12));
	ow_canvas_set_font(cv, f, 0);
	snprintf(line, sizeof line, "Safe in both: %.0f %% of the map",
	         100.0 * cmp->count[OW_CMP_BOTH] / (cmp->n_rpm * cmp->n_axis));
	ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
	y += 1.4 * f;
	for (k = 0; k < 2; k++)
		if (cmp->map[k]->window->empty) {
			snprintf(line, sizeof line, "%s: no safe point at all",
			         label_of(o, k));
			ow_canvas_text(cv, x, y, line, OW_ALIGN_LEFT,
			               OW_VALIGN_TOP, 0);
			y += 1.4 * f;
		}
	if (cmp->common[0]->empty) {
		ow_canvas_set_font(cv, f, 1);
		ow_canvas_text(cv, x, y, "No common window", OW_ALIGN_LEFT,
		               OW_VALIGN_TOP, 0);
		y += 1.4 * f;
	}
	y += 0.5 * f;
	for (k = 0; k < 2; k++)
		y = only_notes(cv, x, y, cmp, o, f, k);
	ow_canvas_restore(cv);
}

enum ow_status ow_compare_draw_overlay(struct ow_canvas *cv,
                                       const struct ow_rect *box,
                                       const struct ow_compare *cmp,
                                       const struct ow_compare_draw_options *o,
                                       struct ow_diag *d)
{
	struct ow_compare_draw_options def;
	struct layout *ly;
	enum ow_status st;
	double f;

	if (!cv || !box || !cmp)
		return ow_diag_set(d, OW_EARG, "overlay map: NULL argument");
	if (!o) {
		ow_compare_draw_default(&def);
		o = &def;
	}
	f = font_of(o);
	ly = calloc(1, sizeof *ly);
	if (!ly)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	st = layout(cv, box, cmp, o, ly, d);
	if (st == OW_OK) {
		titles(cv, box, cmp, o, f);
		st = draw_body(&ly->p, cmp, o, d);
	}
	if (st == OW_OK) {
		double lx = ly->p.area.x + ly->p.area.w + 1.0 * f, lw, lh;

		ow_plot_axes(&ly->p, &ly->x, &ly->y);
		ow_plot_legend(cv, lx, ly->p.area.y, ly->e, ly->n, 0.9 * f);
		ow_plot_legend_size(cv, ly->e, ly->n, 0.9 * f, &lw, &lh);
		notes(cv, lx + 0.3 * f, ly->p.area.y + lh + 1.2 * f, cmp, o,
		      0.9 * f);
		st = ow_canvas_status(cv, d);
	}
	free(ly);
	return st;
}

/* One image file: white paper, the overlay, written atomically. */
static enum ow_status write_image(const struct ow_compare *cmp,
                                  const struct ow_compare_draw_options *o,
                                  enum ow_canvas_format fmt, const char *path,
                                  struct ow_diag *d)
{
	struct ow_rect box = {0.0, 0.0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	struct ow_canvas *cv = NULL;
	enum ow_status st;

	st = ow_canvas_create_image(fmt, box.w, box.h, OW_MAPS_PNG_SCALE, &cv,
	                            d);
	if (st != OW_OK)
		return st;
	ow_canvas_rect(cv, 0, 0, box.w, box.h);
	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_fill(cv);
	st = ow_compare_draw_overlay(cv, &box, cmp, o, d);
	if (st == OW_OK)
		st = ow_canvas_write_file(cv, path, d);
	ow_canvas_destroy(cv);
	return st;
}

enum ow_status ow_compare_write_maps(const struct ow_compare *cmp,
                                     const struct ow_compare_draw_options *o,
                                     const char *dir, struct ow_diag *d)
{
	char path[OW_PATH_LEN];
	enum ow_status st;

	snprintf(path, sizeof path, "%s/compare.png", dir);
	st = write_image(cmp, o, OW_CANVAS_PNG, path, d);
	if (st != OW_OK)
		return st;
	snprintf(path, sizeof path, "%s/compare.svg", dir);
	return write_image(cmp, o, OW_CANVAS_SVG, path, d);
}
