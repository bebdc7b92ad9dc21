/* maps_figure.c - a map per figure over screw speed and set-point: filled
 * contours (perceptually uniform colour map) with a colour bar, labelled
 * iso-lines, the figure's own limit as a labelled line where one is set,
 * and the window (safe-region edge, recommended rectangle, centre)
 * overlaid thinly. */
#include "maps_impl.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_solver.h"
#include "ow_const.h"

#define MAX_LEVELS 10

struct fig_ctx {
	enum ow_map_figure fig;
	enum ow_unit_system u;
};

static double fig_value(const struct ow_grid_point *p, const void *ctx)
{
	const struct fig_ctx *c = ctx;
	const struct ow_point *pt = &p->pt;

	if (pt->flags & OW_FLAG_NOT_CONVERGED)
		return NAN;
	switch (c->fig) {
	case OW_MAP_PEAK_TEMP:
		return ow_display_value(c->u, OW_DIM_TEMPERATURE, pt->peak_K);
	case OW_MAP_UNMELT:
		return 100.0 * pt->unmelt_frac;
	case OW_MAP_PRESSURE:
		return ow_display_value(c->u, OW_DIM_PRESSURE,
		                        pt->max_pressure_Pa);
	case OW_MAP_OUTPUT:
		return ow_display_value(c->u, OW_DIM_MASS_FLOW,
		                        pt->output_kg_s);
	case OW_MAP_SEC:
		return ow_display_value(c->u, OW_DIM_SPECIFIC_ENERGY,
		                        pt->sec_J_kg);
	case OW_MAP_ZONE_LOAD:
		return 100.0 * pt->zone_load;
	case OW_MAP_COUNT:
		break;
	}
	return NAN;
}

static const char *unit_of(enum ow_map_figure f, enum ow_unit_system u)
{
	static const enum ow_dim dim[OW_MAP_COUNT] = {
	    OW_DIM_TEMPERATURE,     OW_DIM_NONE,
	    OW_DIM_PRESSURE,        OW_DIM_MASS_FLOW,
	    OW_DIM_SPECIFIC_ENERGY, OW_DIM_NONE};

	return f == OW_MAP_UNMELT || f == OW_MAP_ZONE_LOAD
	           ? "%"
	           : ow_display_label(u, dim[f]);
}

static char *bar_title(enum ow_map_figure f, enum ow_unit_system u, char *buf,
                       size_t n)
{
	switch (f) {
	case OW_MAP_PEAK_TEMP:
		snprintf(buf, n, "peak melt temperature (%s)",
		         ow_display_label(u, OW_DIM_TEMPERATURE));
		break;
	case OW_MAP_UNMELT:
		snprintf(buf, n, "unmelted fraction at discharge (%%)");
		break;
	case OW_MAP_PRESSURE:
		snprintf(buf, n, "highest pressure (%s)",
		         ow_display_label(u, OW_DIM_PRESSURE));
		break;
	case OW_MAP_OUTPUT:
		snprintf(buf, n, "throughput (%s)",
		         ow_display_label(u, OW_DIM_MASS_FLOW));
		break;
	case OW_MAP_ZONE_LOAD:
		snprintf(buf, n,
		         "highest zone load (%% of its heating or "
		         "cooling power)");
		break;
	default:
		snprintf(buf, n, "specific energy (%s)",
		         ow_display_label(u, OW_DIM_SPECIFIC_ENERGY));
	}
	return buf;
}

/* The limits that bound figure f, as checks (at most two). */
static int limits_of(enum ow_map_figure f, int *c)
{
	switch (f) {
	case OW_MAP_PEAK_TEMP:
		c[0] = OW_CK_PEAK_TEMP;
		return 1;
	case OW_MAP_UNMELT:
		c[0] = OW_CK_UNMELT;
		return 1;
	case OW_MAP_PRESSURE:
		c[0] = OW_CK_PRESSURE;
		return 1;
	case OW_MAP_OUTPUT:
		c[0] = OW_CK_MIN_OUTPUT;
		c[1] = OW_CK_MAX_OUTPUT;
		return 2;
	case OW_MAP_ZONE_LOAD:
		c[0] = OW_CK_ZONE_CONTROL;
		return 1;
	default:
		return 0;
	}
}

static double shown_limit(const struct ow_study *s, int c,
                          enum ow_unit_system u)
{
	double v = ow_check_limit(&s->line.limits, (enum ow_check)c);

	switch (c) {
	case OW_CK_PEAK_TEMP:
		return ow_display_value(u, OW_DIM_TEMPERATURE, v);
	case OW_CK_UNMELT:
	case OW_CK_ZONE_CONTROL:
		return 100.0 * v;
	case OW_CK_PRESSURE:
		return ow_display_value(u, OW_DIM_PRESSURE, v);
	default:
		return ow_display_value(u, OW_DIM_MASS_FLOW, v);
	}
}

/* Longest piece of L, drawn length in points. */
static int longest(const struct ow_plot *p, const struct ow_isolines *L,
                   double *len)
{
	int k, i, b = -1;

	*len = 0.0;
	for (k = 0; k < L->n; k++) {
		double s = 0.0;

		for (i = 1; i < L->lines[k].n; i++)
			s += hypot(ow_plot_px(p, L->lines[k].p[i].x) -
			               ow_plot_px(p, L->lines[k].p[i - 1].x),
			           ow_plot_py(p, L->lines[k].p[i].y) -
			               ow_plot_py(p, L->lines[k].p[i - 1].y));
		if (s > *len) {
			*len = s;
			b = k;
		}
	}
	return b;
}

/* Keep the box a rotated label covers from later labels. */
static void take_label(const struct ow_plot *p, struct maps_labels *taken,
                       double X, double Y, double ang, const char *text)
{
	double a = ang * OW_PI / 180.0, tw, hx, hy;

	ow_canvas_set_font(p->cv, 0.9 * p->font_pt, 0);
	tw = ow_canvas_text_width(p->cv, text) + 0.5 * p->font_pt;
	hx = 0.5 * tw * fabs(cos(a)) + 0.65 * p->font_pt * fabs(sin(a));
	hy = 0.5 * tw * fabs(sin(a)) + 0.65 * p->font_pt * fabs(cos(a));
	ow_maps_labels_take(taken, X - hx, Y - hy, X + hx, Y + hy);
}

/* The figure's limit as a bold red dashed line, labelled with the
 * limit's name and value a third of the way along its longest piece. */
static enum ow_status limit_line(const struct ow_plot *p,
                                 const struct ow_study *s, int c,
                                 const struct ow_field *fd,
                                 enum ow_unit_system u,
                                 struct maps_labels *taken, struct ow_diag *d)
{
	struct ow_rgba red = ow_rgb(0.80, 0.10, 0.05);
	struct ow_isolines *L = NULL;
	struct ow_line_style st = {red, 1.8, OW_DASH_DASHED, OW_MARK_NONE};
	double len, X, Y, ang;
	char text[96];
	int k, b;
	enum ow_status rc = ow_contour_lines(fd, shown_limit(s, c, u), &L, d);

	if (rc != OW_OK)
		return rc;
	for (k = 0; k < L->n; k++)
		ow_plot_polyline(p, L->lines[k].p, L->lines[k].n, &st);
	b = longest(p, L, &len);
	if (b >= 0 && len > 40.0) {
		const struct ow_isoline *l = &L->lines[b];
		double at = len / 3.0, run = 0.0;

		for (k = 1; k < l->n; k++) {
			double x0 = ow_plot_px(p, l->p[k - 1].x);
			double y0 = ow_plot_py(p, l->p[k - 1].y);
			double x1 = ow_plot_px(p, l->p[k].x);
			double y1 = ow_plot_py(p, l->p[k].y);
			double ds = hypot(x1 - x0, y1 - y0);

			if (run + ds < at || ds <= 0.0) {
				run += ds;
				continue;
			}
			X = x0 + (at - run) / ds * (x1 - x0);
			Y = y0 + (at - run) / ds * (y1 - y0);
			ang = atan2(y0 - y1, x1 - x0) * 57.29577951308232;
			ang = ow_plot_upright(ang);
			ow_maps_limit_text(s, c, u, NULL, text, sizeof text);
			ow_plot_label_on_line(p->cv, X, Y, ang, text,
			                      0.9 * p->font_pt, red);
			take_label(p, taken, X, Y, ang, text);
			break;
		}
	}
	ow_isolines_destroy(L);
	return ow_canvas_status(p->cv, d);
}

static enum ow_status
limit_lines(const struct ow_plot *p, const struct ow_study *s,
            enum ow_map_figure f, const struct ow_field *fd,
            enum ow_unit_system u, struct maps_labels *taken, struct ow_diag *d)
{
	int c[2], n = limits_of(f, c), k;
	enum ow_status st = OW_OK;

	for (k = 0; k < n && st == OW_OK; k++)
		if (isfinite(shown_limit(s, c[k], u)))
			st = limit_line(p, s, c[k], fd, u, taken, d);
	return st;
}

/* The levels without those a limit line takes (drawn apart, labelled). */
static void without_limits(const struct ow_study *s, enum ow_map_figure f,
                           enum ow_unit_system u, const struct ow_ticks *lv,
                           struct ow_ticks *out)
{
	int c[2], n = limits_of(f, c), i, k, m = 0;

	*out = *lv;
	for (i = 0; i < lv->n; i++) {
		int skip = 0;

		for (k = 0; k < n; k++)
			skip |= fabs(lv->v[i] - shown_limit(s, c[k], u)) <
			        1e-6 * lv->step;
		if (!skip)
			out->v[m++] = lv->v[i];
	}
	out->n = m;
}

/* Levels over the field's range (the unmelt map reaches up to its limit,
 * so the limit always has a place on the scale). */
static enum ow_status levels_of(const struct ow_study *s, enum ow_map_figure f,
                                enum ow_unit_system u,
                                const struct ow_field *fd, struct ow_ticks *lv,
                                int *constant)
{
	double lo = INFINITY, hi = -INFINITY;
	long k;

	for (k = 0; k < (long)fd->nx * fd->ny; k++)
		if (isfinite(fd->z[k]))
			lo = fmin(lo, fd->z[k]), hi = fmax(hi, fd->z[k]);
	if (!isfinite(lo))
		return OW_ECOMPUTE;
	*constant = hi - lo <= 1e-9 * fmax(1.0, fabs(hi));
	if (f == OW_MAP_UNMELT && isfinite(shown_limit(s, OW_CK_UNMELT, u)))
		hi = fmax(hi, shown_limit(s, OW_CK_UNMELT, u));
	if (hi - lo <= 1e-9 * fmax(1.0, fabs(hi)))
		return ow_contour_levels(fd, MAX_LEVELS, lv);
	return ow_plot_nice_ticks(lo, hi, MAX_LEVELS + 1, lv);
}

/* "0 % everywhere on the map" for a field with one value. */
static void constant_note(const struct ow_plot *p, const struct ow_field *fd,
                          const char *unit)
{
	char num[48], text[128];
	double f = p->font_pt, w;
	long k;

	for (k = 0; k < (long)fd->nx * fd->ny && !isfinite(fd->z[k]); k++)
		;
	snprintf(text, sizeof text, "%s %s everywhere on the map",
	         ow_maps_num(num, sizeof num, fd->z[k]), unit);
	ow_canvas_save(p->cv);
	ow_canvas_set_font(p->cv, 1.1 * f, 1);
	w = ow_canvas_text_width(p->cv, text) + 1.2 * f;
	ow_canvas_rect(p->cv, p->area.x + 0.5 * (p->area.w - w),
	               p->area.y + 1.0 * f, w, 2.0 * f);
	ow_canvas_set_colour(p->cv, ow_rgb(1, 1, 1));
	ow_canvas_fill(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_text(p->cv, p->area.x + 0.5 * p->area.w, p->area.y + 2.0 * f,
	               text, OW_ALIGN_CENTRE, OW_VALIGN_MIDDLE, 0);
	ow_canvas_restore(p->cv);
}

static void subtitle_of(enum ow_map_figure f, const struct ow_study *s,
                        char *buf, size_t n)
{
	int c[2];
	int lim =
	    limits_of(f, c) > 0 &&
	    isfinite(ow_check_limit(&s->line.limits, (enum ow_check)c[0]));

	snprintf(buf, n,
	         "%sDashed black: edge of the safe region. Box: "
	         "recommended window.",
	         lim ? "Bold dashed line with its value: the limit. " : "");
}

static enum ow_status draw_body(const struct ow_plot *p,
                                const struct ow_study *s,
                                const struct ow_window *w,
                                const struct ow_maps_options *o,
                                enum ow_map_figure f, const struct ow_field *fd,
                                const struct ow_ticks *lv, struct ow_diag *d)
{
	struct maps_labels taken = {0};
	struct ow_maps_options po = *o;
	struct ow_ticks iso;
	enum ow_status st;

	/* cells without a solution show as grey */
	ow_canvas_rect(p->cv, p->area.x, p->area.y, p->area.w, p->area.h);
	ow_canvas_set_colour(p->cv, ow_rgb(0.75, 0.75, 0.75));
	ow_canvas_fill(p->cv);
	without_limits(s, f, o->units, lv, &iso);
	st = ow_plot_contour_fill(p, fd, lv, OW_CMAP_VIRIDIS, d);
	if (st == OW_OK && iso.n > 0)
		st = ow_plot_isolines(p, fd, &iso, 1,
		                      ow_rgba_with_alpha(ow_rgb(0, 0, 0), 0.55),
		                      0.5, d);
	if (st != OW_OK)
		return st;
	ow_maps_draw_edge(p, s, w, o->units);
	ow_maps_draw_rectangle(p, s, w, o->units, 1.2);
	st = limit_lines(p, s, f, fd, o->units, &taken, d);
	po.has_current = 0; /* the window map shows it; keep these clear */
	ow_maps_draw_points(p, s, w, &po, 1, &taken);
	return st;
}

enum ow_status ow_maps_draw_figure(struct ow_canvas *cv,
                                   const struct ow_rect *box,
                                   enum ow_map_figure f, const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   struct ow_diag *d)
{
	const struct ow_study *s = m ? m->study : NULL;
	const struct ow_grid *g = m ? m->grid : NULL;
	const struct ow_window *w = m ? m->window : NULL;
	struct ow_maps_options def;
	struct maps_field mf;
	struct fig_ctx ctx;
	struct ow_plot_axis x, y;
	struct ow_plot p;
	struct ow_ticks lv;
	char ytitle[128], btitle[128], sub[256], title[400];
	double fs;
	enum ow_status st;
	int constant = 0;

	if (!cv || !box || !s || !g || !w || (unsigned)f >= OW_MAP_COUNT)
		return ow_diag_set(d, OW_EARG, "figure map: bad argument");
	if (!o) {
		ow_maps_default(&def);
		o = &def;
	}
	fs = ow_maps_font(o);
	st = ow_maps_field_create(s, g, o->units, &mf, d);
	if (st != OW_OK)
		return st;
	ctx.fig = f;
	ctx.u = o->units;
	ow_maps_fill(g, fig_value, &ctx, mf.z);
	if (levels_of(s, f, o->units, &mf.f, &lv, &constant) != OW_OK) {
		ow_maps_field_free(&mf);
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "%s map: no solved point "
		                   "to draw",
		                   ow_maps_figure_file(f));
	}
	subtitle_of(f, s, sub, sizeof sub);
	snprintf(title, sizeof title, "%s — %s", ow_maps_figure_title(f),
	         s->title);
	if (ow_maps_frame(cv, box, s, g, o->units, title, sub, fs, &p, &x, &y,
	                  ytitle, sizeof ytitle) != OW_OK) {
		ow_maps_field_free(&mf);
		return ow_diag_set(d, OW_EARG, "figure map: box too small");
	}
	st = draw_body(&p, s, w, o, f, &mf.f, &lv, d);
	if (st == OW_OK && constant)
		constant_note(&p, &mf.f, unit_of(f, o->units));
	ow_maps_field_free(&mf);
	if (st != OW_OK)
		return st;
	ow_plot_axes(&p, &x, &y);
	ow_maps_colour_bar(&p, &lv, OW_CMAP_VIRIDIS,
	                   bar_title(f, o->units, btitle, sizeof btitle), fs);
	return ow_canvas_status(cv, d);
}
