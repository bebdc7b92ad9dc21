/* maps_window.c - the operating window map: screw speed across, the
 * reference zone's set-point up; every region where a limit is exceeded
 * tinted and hatched (hatch angle and line dash by limit group, so the
 * map reads in greyscale print), each limit's boundary drawn and labelled
 * with the limit's name and value, the recommended rectangle in bold, the
 * robust centre and the current point marked, and a legend. */
#include "maps_impl.h"
#include "ow_const.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define TINT_ALPHA 0.16

struct group {
	double r, g, b;   /* ink */
	double angle_deg; /* hatch */
	enum ow_dash_style dash;
};

/* Groups: melt temperature, melting, pressure, drive, throughput and
 * feed, no solution, barrel zone control. Hues from Okabe & Ito, "Color
 * Universal Design" (2008), darkened for thin lines. */
static const struct group groups[7] = {
    {0.78, 0.20, 0.05, 45.0, OW_DASH_SOLID},
    {0.60, 0.30, 0.55, 135.0, OW_DASH_DASHED},
    {0.00, 0.36, 0.60, 90.0, OW_DASH_DASH_DOT},
    {0.55, 0.40, 0.00, 0.0, OW_DASH_LONG},
    {0.00, 0.48, 0.36, 67.5, OW_DASH_DOTTED},
    {0.35, 0.35, 0.35, 112.5, OW_DASH_SOLID},
    {0.15, 0.55, 0.78, 22.5, OW_DASH_DASHED}};

static const struct group *group_of(int c)
{
	switch (c) {
	case OW_CK_PEAK_TEMP:
	case OW_CK_MIN_MELT_TEMP:
		return &groups[0];
	case OW_CK_ZONE_CONTROL:
		return &groups[6];
	case OW_CK_UNMELT:
	case OW_CK_MAX_SBR:
	case OW_CK_PLUGGING:
		return &groups[1];
	case OW_CK_PRESSURE:
	case OW_CK_PARTIAL_FILL:
		return &groups[2];
	case OW_CK_POWER:
	case OW_CK_TORQUE:
		return &groups[3];
	case OW_CK_MIN_OUTPUT:
	case OW_CK_MAX_OUTPUT:
	case OW_CK_FEED:
		return &groups[4];
	default:
		return &groups[5];
	}
}

/* Each check its own hatch direction and line style, so two limits of one
 * colour group stay apart on a map, also printed in grey. */
static double angle_of(int c)
{
	static const double deg[OW_CK_COUNT] = {
	    [OW_CK_PEAK_TEMP] = 45.0,    [OW_CK_UNMELT] = 135.0,
	    [OW_CK_PRESSURE] = 90.0,     [OW_CK_POWER] = 0.0,
	    [OW_CK_TORQUE] = 22.5,       [OW_CK_MIN_MELT_TEMP] = 157.5,
	    [OW_CK_MIN_OUTPUT] = 67.5,   [OW_CK_MAX_OUTPUT] = 112.5,
	    [OW_CK_MAX_SBR] = 30.0,      [OW_CK_ZONE_CONTROL] = 150.0,
	    [OW_CK_PLUGGING] = 120.0,    [OW_CK_FEED] = 60.0,
	    [OW_CK_PARTIAL_FILL] = 75.0, [OW_CK_NOCONV] = 105.0};

	return c >= 0 && c < OW_CK_COUNT ? deg[c] : group_of(c)->angle_deg;
}

static enum ow_dash_style dash_of(int c)
{
	static const enum ow_dash_style alt[4] = {
	    OW_DASH_DOTTED, OW_DASH_LONG, OW_DASH_DASH_DOT, OW_DASH_DASHED};
	const struct group *g = group_of(c);
	int k, nth = 0;

	for (k = 0; k < c; k++) /* how many earlier checks share its group */
		nth += group_of(k) == g;
	return nth == 0 ? g->dash : alt[(nth - 1 + (int)(g - groups)) % 4];
}

static struct ow_rgba ink_of(int c)
{
	const struct group *g = group_of(c);

	return ow_rgb(g->r, g->g, g->b);
}

static struct ow_hatch hatch_of(int c)
{
	struct ow_hatch h;

	h.angle_deg = angle_of(c);
	h.spacing_pt = 5.0;
	h.width_pt = 0.6;
	h.colour = ow_rgba_with_alpha(ink_of(c), 0.75);
	return h;
}

/* Failing > 0 where check c fails: minus the margin for limits, +-1 for
 * flags (the values the window's boundaries are traced on). */
static double fail_value(const struct ow_grid_point *p, const void *ctx)
{
	int c = *(const int *)ctx;

	if (c < OW_CK_LIMITS)
		return -p->v.margin[c];
	return (p->v.bits >> c) & 1u ? 1.0 : -1.0;
}

static int shown(const struct ow_study *s, const struct ow_window *w, int c)
{
	return w->fail_count[c] > 0 &&
	       ow_check_active(&s->line.limits, (enum ow_check)c);
}

static enum ow_status unsafe_regions(const struct ow_plot *p,
                                     const struct ow_study *s,
                                     const struct ow_grid *g,
                                     const struct ow_window *w,
                                     struct maps_field *mf, struct ow_diag *d)
{
	enum ow_status st = OW_OK;
	int c;

	for (c = 0; c < OW_CK_COUNT && st == OW_OK; c++) {
		struct ow_hatch h = hatch_of(c);

		if (!shown(s, w, c))
			continue;
		ow_maps_fill(g, fail_value, &c, mf->z);
		st = ow_plot_field_region(
		    p, &mf->f, 0.0, ow_rgba_with_alpha(ink_of(c), TINT_ALPHA),
		    &h, d);
	}
	return st;
}

static const struct ow_boundary *boundary_of(const struct ow_window *w, int c)
{
	int b;

	for (b = 0; b < w->n_boundaries; b++)
		if (w->bounds[b].check == c)
			return &w->bounds[b];
	return NULL;
}

static void boundary_lines(const struct ow_plot *p, const struct ow_study *s,
                           const struct ow_window *w, enum ow_unit_system u)
{
	int c;

	for (c = 0; c < OW_CK_COUNT; c++) {
		const struct ow_boundary *bd = boundary_of(w, c);
		struct ow_line_style halo = {ow_rgb(1, 1, 1), 3.4,
		                             OW_DASH_SOLID, OW_MARK_NONE};
		struct ow_line_style ln = {ink_of(c), 1.6, dash_of(c),
		                           OW_MARK_NONE};

		if (bd && shown(s, w, c))
			ow_maps_stroke_boundary(p, s, bd, u, &halo, &ln);
	}
}

/* Canvas length of a boundary polyline, and the point at arc fraction t
 * with the line's direction (kept upright) there. */
static double along(const struct ow_plot *p, const struct ow_pt2 *q, int n,
                    double t, double *X, double *Y, double *ang)
{
	double total = 0.0, s = 0.0, at;
	int k;

	for (k = 1; k < n; k++)
		total +=
		    hypot(ow_plot_px(p, q[k].x) - ow_plot_px(p, q[k - 1].x),
		          ow_plot_py(p, q[k].y) - ow_plot_py(p, q[k - 1].y));
	at = t * total;
	for (k = 1; k < n; k++) {
		double x0 = ow_plot_px(p, q[k - 1].x),
		       y0 = ow_plot_py(p, q[k - 1].y);
		double x1 = ow_plot_px(p, q[k].x), y1 = ow_plot_py(p, q[k].y);
		double ds = hypot(x1 - x0, y1 - y0);

		if (s + ds >= at && ds > 0.0) {
			double f = (at - s) / ds;

			*X = x0 + f * (x1 - x0);
			*Y = y0 + f * (y1 - y0);
			*ang = atan2(-(y1 - y0), x1 - x0) * 180.0 / OW_PI;
			*ang = ow_plot_upright(*ang);
			return total;
		}
		s += ds;
	}
	*X = ow_plot_px(p, q[0].x);
	*Y = ow_plot_py(p, q[0].y);
	*ang = 0.0;
	return total;
}

/* Place the label of check c on its longest boundary piece, where it
 * fits inside the plot and clear of labels already placed. */
static void label_boundary(const struct ow_plot *p, const struct ow_study *s,
                           const struct ow_window *w, enum ow_unit_system u,
                           int c, struct maps_labels *taken)
{
	static const double frac[] = {0.5, 0.35, 0.65, 0.2, 0.8, 0.1, 0.9};
	const struct ow_boundary *bd = boundary_of(w, c);
	double fs = 0.9 * p->font_pt, best = 0.0, tw, X = 0, Y = 0, ang = 0;
	struct ow_pt2 *pts = NULL;
	char text[96];
	int k, b = -1, ok = 0, n;

	if (!bd || bd->n_lines < 1)
		return;
	for (k = 0; k < bd->n_lines; k++)
		if (bd->lines[k].n > (b < 0 ? 1 : bd->lines[b].n))
			b = k;
	if (b < 0)
		return;
	n = bd->lines[b].n;
	pts = malloc((size_t)n * sizeof *pts);
	if (!pts)
		return;
	ow_maps_boundary_points(s, &bd->lines[b], u, pts);
	ow_maps_limit_text(s, c, u, NULL, text, sizeof text);
	ow_canvas_set_font(p->cv, fs, 0);
	tw = ow_canvas_text_width(p->cv, text) + 0.5 * fs;
	for (k = 0; k < (int)(sizeof frac / sizeof frac[0]) && !ok; k++) {
		double a, hx, hy;

		best = along(p, pts, n, frac[k], &X, &Y, &ang);
		a = ang * OW_PI / 180.0;
		hx = 0.5 * tw * fabs(cos(a)) + 0.65 * fs * fabs(sin(a));
		hy = 0.5 * tw * fabs(sin(a)) + 0.65 * fs * fabs(cos(a));
		ok = X - hx >= p->area.x && X + hx <= p->area.x + p->area.w &&
		     Y - hy >= p->area.y && Y + hy <= p->area.y + p->area.h &&
		     ow_maps_labels_free(taken, X - hx, Y - hy, X + hx, Y + hy);
		if (ok)
			ow_maps_labels_take(taken, X - hx, Y - hy, X + hx,
			                    Y + hy);
	}
	if (!ok) /* no free place: the middle, so it is labelled anyway */
		best = along(p, pts, n, 0.5, &X, &Y, &ang);
	(void)best;
	ow_plot_label_on_line(p->cv, X, Y, ang, text, fs, ink_of(c));
	free(pts);
}

/* "recommended 40–90 rpm, 190–215 °C" inside the rectangle's top-left
 * corner if it fits there, else just above or below it; a second line
 * when a side lies on the sweep's edge. */
static void label_rectangle(const struct ow_plot *p, const struct ow_window *w,
                            enum ow_unit_system u, struct maps_labels *taken)
{
	static const char note[] = "dashed side: edge of the sweep, not a "
	                           "limit: widen the sweep";
	char a[32], b[32], c[32], e[32], text[160];
	double f = p->font_pt, x0 = ow_plot_px(p, w->rpm_min);
	double x1 = ow_plot_px(p, w->rpm_max);
	double yt = ow_plot_py(p, ow_maps_temp(u, w->set_max_K));
	double yb = ow_plot_py(p, ow_maps_temp(u, w->set_min_K));
	int lines = w->at_sweep_edge ? 2 : 1;
	double tw, h = 1.35 * f * lines, bx, by;

	snprintf(text, sizeof text, "recommended %s–%s rpm, %s–%s %s",
	         ow_maps_num(a, sizeof a, w->rpm_min),
	         ow_maps_num(b, sizeof b, w->rpm_max),
	         ow_plot_format(c, sizeof c, ow_maps_temp(u, w->set_min_K), 0),
	         ow_plot_format(e, sizeof e, ow_maps_temp(u, w->set_max_K), 0),
	         ow_display_label(u, OW_DIM_TEMPERATURE));
	ow_canvas_set_font(p->cv, f, 1);
	tw = ow_canvas_text_width(p->cv, text) + 0.6 * f;
	if (lines == 2) {
		ow_canvas_set_font(p->cv, 0.85 * f, 0);
		tw = fmax(tw, ow_canvas_text_width(p->cv, note) + 0.6 * f);
	}
	bx = fmin(x0 + 3.0, p->area.x + p->area.w - tw);
	by = yt + 3.0;
	if (tw > x1 - x0 - 6.0 || h > yb - yt - 6.0) {
		by = yt - 3.0 - h; /* above */
		if (by < p->area.y)
			by = yb + 3.0; /* below */
	}
	ow_canvas_save(p->cv);
	ow_canvas_rect(p->cv, bx, by, tw, h);
	ow_canvas_set_colour(p->cv, ow_rgba_with_alpha(ow_rgb(1, 1, 1), 0.9));
	ow_canvas_fill(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_set_font(p->cv, f, 1);
	ow_canvas_text(p->cv, bx + 0.3 * f, by + 0.675 * f, text, OW_ALIGN_LEFT,
	               OW_VALIGN_MIDDLE, 0);
	if (lines == 2) {
		ow_canvas_set_font(p->cv, 0.85 * f, 0);
		ow_canvas_text(p->cv, bx + 0.3 * f, by + 2.025 * f, note,
		               OW_ALIGN_LEFT, OW_VALIGN_MIDDLE, 0);
	}
	ow_canvas_restore(p->cv);
	ow_maps_labels_take(taken, bx, by, bx + tw, by + h);
}

/* Legend entries: each limit that excludes points (most first), then the
 * safe region, the rectangle, the centre and the current point. */
static int legend_entries(const struct ow_study *s, const struct ow_window *w,
                          const struct ow_maps_options *o,
                          struct ow_legend_entry *e, struct ow_hatch *h,
                          char (*text)[96])
{
	enum ow_check order[OW_CK_COUNT];
	int nb = ow_window_binding(w, order), k, n = 0;

	memset(e, 0, 16 * sizeof *e);
	for (k = 0; k < nb && n < 11; k++) {
		int c = (int)order[k];
		int min = c == OW_CK_MIN_MELT_TEMP || c == OW_CK_MIN_OUTPUT;

		if (!shown(s, w, c))
			continue;
		h[n] = hatch_of(c);
		ow_maps_limit_text(s, c, o->units, min ? " < " : " > ", text[n],
		                   sizeof text[n]);
		e[n].label = text[n];
		e[n].swatch = 1;
		e[n].fill = ow_rgba_with_alpha(ink_of(c), TINT_ALPHA);
		e[n].hatch = &h[n];
		e[n].line.colour = ink_of(c);
		e[n].line.width_pt = 1.4;
		e[n].line.dash = dash_of(c);
		n++;
	}
	e[n].label = "safe: every limit met";
	e[n].swatch = 1;
	e[n].fill = ow_rgb(1, 1, 1);
	e[n].line.colour = ow_rgb(0.5, 0.5, 0.5);
	e[n++].line.width_pt = 0.5;
	if (!w->empty) {
		e[n].label = "recommended window";
		e[n].line.colour = ow_rgb(0, 0, 0);
		e[n++].line.width_pt = 2.2;
		if (w->at_sweep_edge) {
			e[n].label = "side on the sweep's edge: no limit";
			e[n].line.colour = ow_rgb(0, 0, 0);
			e[n].line.dash = OW_DASH_DASHED;
			e[n++].line.width_pt = 2.2;
		}
		e[n].label = "centre point";
		e[n].marker = OW_MARK_DIAMOND;
		e[n++].line.colour = ow_rgb(0, 0, 0);
	}
	if (o->has_current) {
		e[n].label = "current operating point";
		e[n].marker = OW_MARK_TRIANGLE;
		e[n++].line.colour = ow_rgb(0, 0, 0);
	}
	return n;
}

/* The box of the empty-window message: two lines, centred. */
static void empty_box(const struct ow_plot *p, const char *l1, const char *l2,
                      double *x, double *y, double *w, double *h)
{
	double f = p->font_pt, w1, w2;

	ow_canvas_set_font(p->cv, 1.2 * f, 1);
	w1 = ow_canvas_text_width(p->cv, l1);
	ow_canvas_set_font(p->cv, f, 0);
	w2 = ow_canvas_text_width(p->cv, l2);
	*w = fmin(fmax(w1, w2) + 1.6 * f, p->area.w);
	*h = 3.6 * f;
	*x = p->area.x + 0.5 * (p->area.w - *w);
	*y = p->area.y + 0.5 * (p->area.h - *h);
}

/* "no safe operating point" and the limits that exclude most points. */
static void empty_lines(const struct ow_study *s, const struct ow_window *w,
                        enum ow_unit_system u, char *l2, size_t n)
{
	enum ow_check order[OW_CK_COUNT];
	int nb = ow_window_binding(w, order), k;
	char one[96];

	snprintf(l2, n, "binding limits:");
	for (k = 0; k < nb && k < 3; k++) {
		ow_maps_limit_text(s, (int)order[k], u, NULL, one, sizeof one);
		snprintf(l2 + strlen(l2), n - strlen(l2), "%s %s", k ? "," : "",
		         one);
	}
}

static void empty_message(const struct ow_plot *p, const struct ow_study *s,
                          const struct ow_window *w, enum ow_unit_system u,
                          int draw, struct maps_labels *taken)
{
	const char *l1 = "no safe operating point";
	char l2[320], fit[320];
	double f = p->font_pt, x, y, bw, bh;

	empty_lines(s, w, u, l2, sizeof l2);
	empty_box(p, l1, l2, &x, &y, &bw, &bh);
	if (!draw) {
		ow_maps_labels_take(taken, x, y, x + bw, y + bh);
		return;
	}
	ow_canvas_save(p->cv);
	ow_canvas_rect(p->cv, x, y, bw, bh);
	ow_canvas_set_colour(p->cv, ow_rgb(1, 1, 1));
	ow_canvas_fill_preserve(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_set_line_width(p->cv, 1.2);
	ow_canvas_stroke(p->cv);
	ow_canvas_set_font(p->cv, 1.2 * f, 1);
	ow_canvas_text(p->cv, x + 0.5 * bw, y + 1.2 * f, l1, OW_ALIGN_CENTRE,
	               OW_VALIGN_MIDDLE, 0);
	ow_canvas_set_font(p->cv, f, 0);
	ow_canvas_text(p->cv, x + 0.5 * bw, y + 2.6 * f,
	               ow_maps_fit_text(p->cv, l2, bw - f, fit, sizeof fit),
	               OW_ALIGN_CENTRE, OW_VALIGN_MIDDLE, 0);
	ow_canvas_restore(p->cv);
}

static void subtitle_of(const struct ow_study *s, const struct ow_window *w,
                        char *buf, size_t n)
{
	char pct[32];

	snprintf(buf, n,
	         "White: safe (%s %% of the map). Hatched: a limit is "
	         "exceeded.%s",
	         ow_maps_num(pct, sizeof pct, 100.0 * w->safe_fraction),
	         s->line.axes.mode == OW_AXIS_SHIFT
	             ? " All zones shifted together."
	             : "");
}

static enum ow_status
draw_body(const struct ow_plot *p, const struct ow_study *s,
          const struct ow_grid *g, const struct ow_window *w,
          const struct ow_maps_options *o, struct ow_diag *d)
{
	struct maps_field mf;
	struct maps_labels taken = {0};
	enum ow_status st;
	int c;

	st = ow_maps_field_create(s, g, o->units, &mf, d);
	if (st != OW_OK)
		return st;
	ow_plot_grid(p);
	st = unsafe_regions(p, s, g, w, &mf, d);
	ow_maps_field_free(&mf);
	if (st != OW_OK)
		return st;
	boundary_lines(p, s, w, o->units);
	ow_maps_draw_rectangle(p, s, w, o->units, 2.2);
	ow_maps_draw_points(p, s, w, o, 0, &taken);
	if (!w->empty)
		label_rectangle(p, w, o->units, &taken);
	else
		empty_message(p, s, w, o->units, 0, &taken); /* reserve */
	for (c = 0; c < OW_CK_COUNT; c++)
		if (shown(s, w, c))
			label_boundary(p, s, w, o->units, c, &taken);
	if (w->empty)
		empty_message(p, s, w, o->units, 1, &taken);
	return OW_OK;
}

/* Everything the window map lays out before drawing. */
struct wlayout {
	struct ow_legend_entry e[16];
	struct ow_hatch h[16];
	char text[16][96], ytitle[128];
	struct ow_plot_axis x, y;
	struct ow_plot p;
	int n;
	int cols;      /* legend columns: 1 beside the plot, more below */
	double lx, ly; /* legend's top-left corner */
};

static enum ow_status
window_layout(struct ow_canvas *cv, const struct ow_rect *box,
              const struct ow_study *s, const struct ow_grid *g,
              const struct ow_window *w, const struct ow_maps_options *o,
              struct wlayout *ly, struct ow_diag *d)
{
	double f = ow_maps_font(o), lw, lh, right = 0.0;
	struct ow_rect inner = *box;

	ly->n = legend_entries(s, w, o, ly->e, ly->h, ly->text);
	ow_plot_legend_size(cv, ly->e, ly->n, 0.9 * f, &lw, &lh);
	inner.y += 3.4 * f;
	inner.h -= 3.4 * f;
	ly->cols = 1;
	if (lw > 0.25 * box->w) { /* a narrow box: the legend goes below */
		double gw, gh;

		ly->cols = 3;
		do
			ow_plot_legend_grid_size(cv, ly->e, ly->n, 0.9 * f,
			                         ly->cols, &gw, &gh);
		while (gw > box->w - 2.0 * f && --ly->cols > 1);
		inner.h -= gh + 0.6 * f;
		ly->lx = box->x + 0.5 * (box->w - gw);
		ly->ly = inner.y + inner.h + 0.3 * f;
	} else {
		right = lw + 0.8 * f;
	}
	ow_maps_axes(s, g, o->units, &ly->x, &ly->y, ly->ytitle,
	             sizeof ly->ytitle);
	if (ow_plot_init(&ly->p, cv, &inner, &ly->x, &ly->y, f, right) != OW_OK)
		return ow_diag_set(d, OW_EARG,
		                   "window map: box %.0f x %.0f pt "
		                   "too small",
		                   box->w, box->h);
	if (ly->cols == 1) {
		ly->lx = ly->p.area.x + ly->p.area.w + 1.2 * f;
		ly->ly = ly->p.area.y;
	}
	return OW_OK;
}

enum ow_status ow_maps_window_frame(struct ow_canvas *cv,
                                    const struct ow_rect *box,
                                    const struct ow_map *m,
                                    const struct ow_maps_options *o,
                                    struct ow_plot *p, struct ow_diag *d)
{
	struct ow_maps_options def;
	struct wlayout *ly;
	enum ow_status st;

	if (!cv || !box || !m || !m->study || !m->grid || !m->window || !p)
		return ow_diag_set(d, OW_EARG, "window frame: NULL argument");
	if (!o) {
		ow_maps_default(&def);
		o = &def;
	}
	ly = calloc(1, sizeof *ly);
	if (!ly)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	st = window_layout(cv, box, m->study, m->grid, m->window, o, ly, d);
	if (st == OW_OK)
		*p = ly->p;
	free(ly);
	return st;
}

enum ow_status ow_maps_draw_window(struct ow_canvas *cv,
                                   const struct ow_rect *box,
                                   const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   struct ow_diag *d)
{
	const struct ow_study *s = m ? m->study : NULL;
	const struct ow_grid *g = m ? m->grid : NULL;
	const struct ow_window *w = m ? m->window : NULL;
	struct ow_maps_options def;
	struct wlayout *ly;
	char sub[256];
	double f;
	enum ow_status st;

	if (!cv || !box || !s || !g || !w)
		return ow_diag_set(d, OW_EARG, "window map: NULL argument");
	if (!o) {
		ow_maps_default(&def);
		o = &def;
	}
	f = ow_maps_font(o);
	ly = calloc(1, sizeof *ly);
	if (!ly)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	st = window_layout(cv, box, s, g, w, o, ly, d);
	if (st == OW_OK) {
		subtitle_of(s, w, sub, sizeof sub);
		ow_maps_paper(cv, box, s->title, sub, f);
		st = draw_body(&ly->p, s, g, w, o, d);
	}
	if (st == OW_OK) {
		ow_plot_axes(&ly->p, &ly->x, &ly->y);
		ow_plot_legend_grid(cv, ly->lx, ly->ly, ly->e, ly->n, 0.9 * f,
		                    ly->cols);
		st = ow_canvas_status(cv, d);
	}
	free(ly);
	return st;
}
