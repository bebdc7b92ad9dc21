/* maps.c - the map images of a study: shared pieces (the lattice as a
 * field, limit texts, label placement, the window overlay, titles) and
 * writing every image file. The charts themselves: maps_window.c,
 * maps_figure.c, maps_profile.c. */
#include "maps_impl.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <omp.h>

#include "ow_classify.h"

void ow_maps_default(struct ow_maps_options *o)
{
	memset(o, 0, sizeof *o);
	o->units = OW_SYS_SI;
	o->png = 1;
	o->svg = 1;
	o->jobs = 1;
}

enum ow_status ow_maps_frame(struct ow_canvas *cv, const struct ow_rect *box,
                             const struct ow_study *s, const struct ow_grid *g,
                             enum ow_unit_system u, const char *title,
                             const char *sub, double font_pt, struct ow_plot *p,
                             struct ow_plot_axis *x, struct ow_plot_axis *y,
                             char *ytitle, size_t n)
{
	struct ow_rect inner = *box;

	ow_maps_paper(cv, box, title, sub, font_pt);
	inner.y += 3.4 * font_pt;
	inner.h -= 3.4 * font_pt;
	ow_maps_axes(s, g, u, x, y, ytitle, n);
	return ow_plot_init(p, cv, &inner, x, y, font_pt, 7.5 * font_pt);
}

void ow_maps_colour_bar(const struct ow_plot *p, const struct ow_ticks *lv,
                        enum ow_cmap map, const char *title, double font_pt)
{
	struct ow_rect bar;

	bar.x = p->area.x + p->area.w + 1.4 * font_pt;
	bar.y = p->area.y - 2.0 * font_pt;
	bar.w = 7.0 * font_pt;
	bar.h = p->area.h + 5.4 * font_pt + 4.0;
	ow_plot_colour_bar(p->cv, &bar, lv, map, title, font_pt);
}

double ow_maps_font(const struct ow_maps_options *o)
{
	return o && o->font_pt > 0.0 ? o->font_pt : 9.0;
}

static const char *const fig_file[OW_MAP_COUNT] = {
    "map-peak-temp", "map-unmelted-solids", "map-pressure",
    "map-output",    "map-specific-energy", "map-zone-load"};
static const char *const fig_title[OW_MAP_COUNT] = {
    "Peak melt temperature",         "Unmelted solids at discharge",
    "Highest pressure on the screw", "Throughput",
    "Specific energy (drive)",       "Barrel zone load"};

const char *ow_maps_figure_file(enum ow_map_figure f)
{
	return (unsigned)f < OW_MAP_COUNT ? fig_file[f] : "";
}

const char *ow_maps_figure_title(enum ow_map_figure f)
{
	return (unsigned)f < OW_MAP_COUNT ? fig_title[f] : "";
}

char *ow_maps_axis_label(const struct ow_study *s, char *buf, size_t n)
{
	const struct ow_line *l = &s->line;

	switch (l->axes.mode) {
	case OW_AXIS_SHIFT:
		snprintf(buf, n, "last zone set-point");
		break;
	case OW_AXIS_SET:
		if (l->axes.zones_from >= l->n_zones - 1)
			snprintf(buf, n, "zone %d set-point", l->n_zones);
		else
			snprintf(buf, n, "zones %d–%d set-point",
			         l->axes.zones_from + 1, l->n_zones);
		break;
	case OW_AXIS_ZONE:
		snprintf(buf, n, "zone %d set-point", l->axes.zone + 1);
		break;
	}
	return buf;
}

double ow_maps_temp(enum ow_unit_system u, double K)
{
	return ow_display_value(u, OW_DIM_TEMPERATURE, K);
}

char *ow_maps_y_title(const struct ow_study *s, enum ow_unit_system u,
                      char *buf, size_t n)
{
	char lab[96];

	snprintf(buf, n, "%s (%s)", ow_maps_axis_label(s, lab, sizeof lab),
	         ow_display_label(u, OW_DIM_TEMPERATURE));
	return buf;
}

char *ow_maps_num(char *buf, size_t n, double v)
{
	double a = fabs(v);
	int dec = a >= 100.0 ? 0 : a >= 10.0 ? 1 : a >= 1.0 ? 2 : 3;

	ow_plot_format(buf, n, v, dec);
	if (strchr(buf, '.')) { /* drop trailing zeros */
		char *e = buf + strlen(buf) - 1;

		while (*e == '0')
			*e-- = '\0';
		if (*e == '.')
			*e = '\0';
	}
	return buf;
}

char *ow_maps_limit_text(const struct ow_study *s, int check,
                         enum ow_unit_system u, const char *op, char *buf,
                         size_t n)
{
	static const struct {
		const char *name;
		enum ow_dim dim;
	} lim[OW_CK_LIMITS] = {
	    [OW_CK_PEAK_TEMP] = {"peak melt", OW_DIM_TEMPERATURE},
	    [OW_CK_UNMELT] = {"unmelted", OW_DIM_NONE},
	    [OW_CK_PRESSURE] = {"pressure", OW_DIM_PRESSURE},
	    [OW_CK_POWER] = {"power", OW_DIM_POWER},
	    [OW_CK_TORQUE] = {"torque", OW_DIM_TORQUE},
	    [OW_CK_MIN_MELT_TEMP] = {"melt at discharge", OW_DIM_TEMPERATURE},
	    [OW_CK_MIN_OUTPUT] = {"throughput", OW_DIM_MASS_FLOW},
	    [OW_CK_MAX_OUTPUT] = {"throughput", OW_DIM_MASS_FLOW},
	    [OW_CK_MAX_SBR] = {"solid bed ratio", OW_DIM_NONE},
	    [OW_CK_ZONE_CONTROL] = {"zone load", OW_DIM_NONE},
	};
	char num[48];
	double v;

	op = op ? op : " ";
	if (check == OW_CK_PLUGGING)
		return snprintf(buf, n, "plugging"), buf;
	if (check == OW_CK_FEED)
		return snprintf(buf, n, "starved feed"), buf;
	if (check == OW_CK_PARTIAL_FILL)
		return snprintf(buf, n, "partly filled"), buf;
	if (check == OW_CK_NOCONV || check < 0 || check >= OW_CK_LIMITS)
		return snprintf(buf, n, "no solution"), buf;
	v = ow_check_limit(&s->line.limits, (enum ow_check)check);
	if (check == OW_CK_UNMELT || check == OW_CK_ZONE_CONTROL) {
		snprintf(buf, n, "%s%s%s %%", lim[check].name, op,
		         ow_maps_num(num, sizeof num, 100.0 * v));
		return buf;
	}
	if (lim[check].dim == OW_DIM_NONE) {
		snprintf(buf, n, "%s%s%s", lim[check].name, op,
		         ow_maps_num(num, sizeof num, v));
		return buf;
	}
	snprintf(buf, n, "%s%s%s %s", lim[check].name, op,
	         ow_maps_num(num, sizeof num,
	                     ow_display_value(u, lim[check].dim, v)),
	         ow_display_label(u, lim[check].dim));
	return buf;
}

char *ow_maps_fit_text(struct ow_canvas *cv, const char *text, double max_w,
                       char *buf, size_t n)
{
	size_t len;

	snprintf(buf, n, "%s", text);
	if (ow_canvas_text_width(cv, buf) <= max_w)
		return buf;
	len = strlen(buf);
	while (len > 1) {
		len--;
		while (len > 0 && ((unsigned char)buf[len] & 0xC0) == 0x80)
			len--; /* whole UTF-8 characters only */
		while (len > 0 && buf[len - 1] == ' ')
			len--;
		if (len + 4 > n)
			continue;
		memcpy(buf + len, "…", 4); /* U+2026 and the terminator */
		if (ow_canvas_text_width(cv, buf) <= max_w)
			break;
	}
	return buf;
}

/* --- the lattice as a field ------------------------------------------- */

void ow_maps_field_free(struct maps_field *mf)
{
	free(mf->x);
	free(mf->y);
	free(mf->z);
	memset(mf, 0, sizeof *mf);
}

enum ow_status ow_maps_field_create(const struct ow_study *s,
                                    const struct ow_grid *g,
                                    enum ow_unit_system u,
                                    struct maps_field *mf, struct ow_diag *d)
{
	int i;

	(void)s;
	memset(mf, 0, sizeof *mf);
	if (!g || g->n_rpm < 2 || g->n_axis < 2)
		return ow_diag_set(d, OW_EARG,
		                   "maps: a lattice of at least "
		                   "2 x 2 points needed");
	mf->x = malloc((size_t)g->n_rpm * sizeof *mf->x);
	mf->y = malloc((size_t)g->n_axis * sizeof *mf->y);
	mf->z = malloc((size_t)g->n_rpm * (size_t)g->n_axis * sizeof *mf->z);
	if (!mf->x || !mf->y || !mf->z) {
		ow_maps_field_free(mf);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	for (i = 0; i < g->n_rpm; i++)
		mf->x[i] = ow_grid_at(g, i, 0)->rpm;
	for (i = 0; i < g->n_axis; i++)
		mf->y[i] = ow_maps_temp(u, ow_grid_at(g, 0, i)->set_ref_K);
	mf->f.nx = g->n_rpm;
	mf->f.ny = g->n_axis;
	mf->f.x = mf->x;
	mf->f.y = mf->y;
	mf->f.z = mf->z;
	return OW_OK;
}

/* Bilinear from the corners of the cell of size s holding (ir, ia). */
static int from_cell(const struct ow_grid *g, maps_get get, const void *ctx,
                     int ir, int ia, int s, double *z)
{
	int i0 = ir - ir % s, j0 = ia - ia % s;
	int i1 = i0 + s < g->n_rpm ? i0 + s : i0;
	int j1 = j0 + s < g->n_axis ? j0 + s : j0;
	double tx = (double)(ir - i0) / (double)s;
	double ty = (double)(ia - j0) / (double)s;
	const struct ow_grid_point *c[4] = {
	    ow_grid_at(g, i0, j0), ow_grid_at(g, i1, j0), ow_grid_at(g, i0, j1),
	    ow_grid_at(g, i1, j1)};
	int k;

	for (k = 0; k < 4; k++)
		if (c[k]->solved != 1)
			return 0;
	*z = (1 - ty) * ((1 - tx) * get(c[0], ctx) + tx * get(c[1], ctx)) +
	     ty * ((1 - tx) * get(c[2], ctx) + tx * get(c[3], ctx));
	return 1;
}

void ow_maps_fill(const struct ow_grid *g, maps_get get, const void *ctx,
                  double *z)
{
	int ir, ia, s;

	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			double *v = &z[ia * g->n_rpm + ir];

			*v = NAN;
			if (p->solved == 1) {
				*v = get(p, ctx);
				continue;
			}
			for (s = 2; s <= g->stride; s *= 2)
				if (from_cell(g, get, ctx, ir, ia, s, v))
					break;
		}
}

/* --- labels ----------------------------------------------------------- */

int ow_maps_labels_free(const struct maps_labels *l, double x0, double y0,
                        double x1, double y1)
{
	int k;

	for (k = 0; k < l->n; k++)
		if (x0 < l->x1[k] && x1 > l->x0[k] && y0 < l->y1[k] &&
		    y1 > l->y0[k])
			return 0;
	return 1;
}

void ow_maps_labels_take(struct maps_labels *l, double x0, double y0, double x1,
                         double y1)
{
	if (l->n == MAPS_MAX_LABELS)
		return;
	l->x0[l->n] = x0;
	l->y0[l->n] = y0;
	l->x1[l->n] = x1;
	l->y1[l->n] = y1;
	l->n++;
}

/* --- window overlay --------------------------------------------------- */

void ow_maps_boundary_points(const struct ow_study *s,
                             const struct ow_polyline *l, enum ow_unit_system u,
                             struct ow_pt2 *out)
{
	int k;

	for (k = 0; k < l->n; k++) {
		out[k].x = l->p[k].rpm;
		out[k].y =
		    ow_maps_temp(u, ow_line_axis_ref_K(&s->line, l->p[k].axis));
	}
}

void ow_maps_draw_rectangle(const struct ow_plot *p, const struct ow_study *s,
                            const struct ow_window *w, enum ow_unit_system u,
                            double width_pt)
{
	double x0, x1, y0, y1;

	(void)s;
	if (!w || w->empty)
		return;
	x0 = ow_plot_px(p, w->rpm_min);
	x1 = ow_plot_px(p, w->rpm_max);
	y0 = ow_plot_py(p, ow_maps_temp(u, w->set_min_K));
	y1 = ow_plot_py(p, ow_maps_temp(u, w->set_max_K));
	ow_plot_clip(p);
	{ /* a white halo keeps it clear of hatching and dark colours */
		ow_canvas_set_colour(p->cv, ow_rgb(1, 1, 1));
		ow_canvas_set_line_width(p->cv, width_pt + 1.6);
		ow_canvas_rect(p->cv, x0, y1, x1 - x0, y0 - y1);
		ow_canvas_stroke(p->cv);
	}
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_set_line_width(p->cv, width_pt);
	ow_canvas_rect(p->cv, x0, y1, x1 - x0, y0 - y1);
	ow_canvas_stroke(p->cv);
	ow_maps_mark_sweep_edges(p, w, x0, x1, y0, y1, width_pt);
	ow_canvas_restore(p->cv);
}

/* Sides of the rectangle on the sweep's edge (no limit there): white gaps
 * cut into the black line, so they read dashed in colour and grey. */
void ow_maps_mark_sweep_edges(const struct ow_plot *p,
                              const struct ow_window *w, double x0, double x1,
                              double y0, double y1, double width_pt)
{
	static const double dash[2] = {4.0, 4.0};
	const double side[OW_WB_COUNT][4] = {{x0, y0, x0, y1},
	                                     {x1, y0, x1, y1},
	                                     {x0, y0, x1, y0},
	                                     {x0, y1, x1, y1}};
	int k;

	ow_canvas_save(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(1, 1, 1));
	ow_canvas_set_line_width(p->cv, 0.7 * width_pt);
	ow_canvas_set_dash(p->cv, dash, 2);
	for (k = 0; k < OW_WB_COUNT; k++) {
		if (w->bound[k].check != OW_WINDOW_SWEEP_EDGE)
			continue;
		ow_canvas_move_to(p->cv, side[k][0], side[k][1]);
		ow_canvas_line_to(p->cv, side[k][2], side[k][3]);
		ow_canvas_stroke(p->cv);
	}
	ow_canvas_restore(p->cv);
}

void ow_maps_stroke_boundary(const struct ow_plot *p, const struct ow_study *s,
                             const struct ow_boundary *bd,
                             enum ow_unit_system u,
                             const struct ow_line_style *halo,
                             const struct ow_line_style *ln)
{
	int k;

	for (k = 0; k < bd->n_lines; k++) {
		struct ow_pt2 *pts =
		    malloc((size_t)bd->lines[k].n * sizeof *pts);

		if (!pts)
			continue;
		ow_maps_boundary_points(s, &bd->lines[k], u, pts);
		ow_plot_polyline(p, pts, bd->lines[k].n, halo);
		ow_plot_polyline(p, pts, bd->lines[k].n, ln);
		free(pts);
	}
}

void ow_maps_draw_edge(const struct ow_plot *p, const struct ow_study *s,
                       const struct ow_window *w, enum ow_unit_system u)
{
	const struct ow_line_style halo = {ow_rgb(1, 1, 1), 2.2, OW_DASH_SOLID,
	                                   OW_MARK_NONE};
	const struct ow_line_style ln = {ow_rgb(0, 0, 0), 0.9, OW_DASH_DASHED,
	                                 OW_MARK_NONE};
	int b;

	for (b = 0; w && b < w->n_boundaries; b++)
		if (w->bounds[b].check == OW_WINDOW_EDGE)
			ow_maps_stroke_boundary(p, s, &w->bounds[b], u, &halo,
			                        &ln);
}

/* A label box at (bx, by), w x h: white, bold text. */
static void point_label(const struct ow_plot *p, double bx, double by, double w,
                        double h, const char *text)
{
	double f = p->font_pt;

	ow_canvas_save(p->cv);
	ow_canvas_rect(p->cv, bx, by, w, h);
	ow_canvas_set_colour(p->cv, ow_rgba_with_alpha(ow_rgb(1, 1, 1), 0.9));
	ow_canvas_fill(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0, 0, 0));
	ow_canvas_set_font(p->cv, 0.95 * f, 1);
	ow_canvas_text(p->cv, bx + 0.3 * f, by + 0.5 * h, text, OW_ALIGN_LEFT,
	               OW_VALIGN_MIDDLE, 0);
	ow_canvas_restore(p->cv);
}

/* A marked point with a label beside it: at the first of eight places
 * (the four corners, then the same a line further out) that lies inside
 * the plot and clear of other labels and markers; failing that, the first
 * inside the plot; failing that, pushed inside. The marker is taken too,
 * so a later label does not cover it. */
static void mark_point(const struct ow_plot *p, double x, double y,
                       enum ow_marker m, const char *text,
                       struct maps_labels *taken)
{
	static const double off[8][3] = {{1, -1, 0},  {1, 1, 0},  {-1, -1, 0},
	                                 {-1, 1, 0},  {1, -1, 1}, {1, 1, 1},
	                                 {-1, -1, 1}, {-1, 1, 1}};
	double X = ow_plot_px(p, x), Y = ow_plot_py(p, y), f = p->font_pt;
	double w, h = 1.3 * f, bx[8], by[8];
	int k, pick = -1, inside = -1;

	ow_plot_marker(p, x, y, m, 9.0, ow_rgb(1, 1, 1), ow_rgb(0, 0, 0));
	ow_canvas_set_font(p->cv, 0.95 * f, 1);
	w = ow_canvas_text_width(p->cv, text) + 0.6 * f;
	for (k = 0; k < 8 && pick < 0; k++) {
		double far = off[k][2] * 1.2 * h;

		bx[k] = off[k][0] > 0 ? X + 6.0 : X - 6.0 - w;
		by[k] = off[k][1] < 0 ? Y - 6.0 - h - far : Y + 6.0 + far;
		if (bx[k] < p->area.x || bx[k] + w > p->area.x + p->area.w ||
		    by[k] < p->area.y || by[k] + h > p->area.y + p->area.h)
			continue;
		if (inside < 0)
			inside = k;
		if (ow_maps_labels_free(taken, bx[k], by[k], bx[k] + w,
		                        by[k] + h))
			pick = k;
	}
	if (pick < 0 && inside >= 0)
		pick = inside;
	if (pick < 0) {
		pick = 0;
		bx[0] = fmax(p->area.x, fmin(bx[0], p->area.x + p->area.w - w));
		by[0] = fmax(p->area.y, fmin(by[0], p->area.y + p->area.h - h));
	}
	point_label(p, bx[pick], by[pick], w, h, text);
	ow_maps_labels_take(taken, bx[pick], by[pick], bx[pick] + w,
	                    by[pick] + h);
	ow_maps_labels_take(taken, X - 5.0, Y - 5.0, X + 5.0, Y + 5.0);
}

static void point_text(char *buf, size_t n, const char *what, double rpm,
                       double shown, enum ow_unit_system u)
{
	char a[32], b[32];

	snprintf(buf, n, "%s %s rpm, %s %s", what,
	         ow_maps_num(a, sizeof a, rpm),
	         ow_plot_format(b, sizeof b, shown, 0),
	         ow_display_label(u, OW_DIM_TEMPERATURE));
}

void ow_maps_draw_points(const struct ow_plot *p, const struct ow_study *s,
                         const struct ow_window *w,
                         const struct ow_maps_options *o, int brief,
                         struct maps_labels *taken)
{
	char buf[128];

	(void)s;
	if (w && !w->empty) {
		double y = ow_maps_temp(o->units, w->centre_set_K);

		point_text(buf, sizeof buf, "centre", w->centre.rpm, y,
		           o->units);
		if (brief)
			snprintf(buf, sizeof buf, "centre");
		mark_point(p, w->centre.rpm, y, OW_MARK_DIAMOND, buf, taken);
	}
	if (o->has_current && isfinite(o->current_rpm) &&
	    isfinite(o->current_set_K)) {
		double y = ow_maps_temp(o->units, o->current_set_K);
		double x = o->current_rpm;
		double x0 = fmin(p->x0, p->x1), x1 = fmax(p->x0, p->x1);
		double y0 = fmin(p->y0, p->y1), y1 = fmax(p->y0, p->y1);
		int off = x < x0 || x > x1 || y < y0 || y > y1;

		point_text(buf, sizeof buf, "current", x, y, o->units);
		if (brief)
			snprintf(buf, sizeof buf, "current");
		if (off) /* drawn on the frame, said so: nothing known there */
			strncat(buf, " (outside the map)",
			        sizeof buf - strlen(buf) - 1);
		mark_point(p, fmin(x1, fmax(x0, x)), fmin(y1, fmax(y0, y)),
		           OW_MARK_TRIANGLE, buf, taken);
	}
}

/* --- frames ----------------------------------------------------------- */

/* The title on one line when it fits; else on two smaller lines broken
 * between words (the second shortened only when even that is too long),
 * so a long study title is not cut. */
static void title_lines(struct ow_canvas *cv, const struct ow_rect *box,
                        const char *title, double font_pt)
{
	double x = box->x + 0.8 * font_pt, w = box->w - 1.6 * font_pt;
	char line[320], rest[320];
	size_t cut = 0, k;

	ow_canvas_set_font(cv, 1.25 * font_pt, 1);
	if (ow_canvas_text_width(cv, title) <= w) {
		ow_canvas_text(cv, x, box->y + 0.8 * font_pt, title,
		               OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
		return;
	}
	ow_canvas_set_font(cv, 0.9 * font_pt, 1);
	snprintf(line, sizeof line, "%s", title);
	for (k = 1; line[k]; k++) { /* the longest first line that fits */
		char c = line[k];

		if (c != ' ')
			continue;
		line[k] = '\0';
		if (ow_canvas_text_width(cv, line) <= w)
			cut = k;
		line[k] = c;
	}
	if (!cut) { /* one long word: shorten it */
		ow_canvas_text(
		    cv, x, box->y + 0.8 * font_pt,
		    ow_maps_fit_text(cv, title, w, rest, sizeof rest),
		    OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
		return;
	}
	line[cut] = '\0';
	ow_canvas_text(cv, x, box->y + 0.45 * font_pt, line, OW_ALIGN_LEFT,
	               OW_VALIGN_TOP, 0);
	ow_canvas_text(
	    cv, x, box->y + 1.45 * font_pt,
	    ow_maps_fit_text(cv, title + cut + 1, w, rest, sizeof rest),
	    OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
}

void ow_maps_paper(struct ow_canvas *cv, const struct ow_rect *box,
                   const char *title, const char *subtitle, double font_pt)
{
	char buf[320];

	ow_canvas_save(cv);
	ow_canvas_rect(cv, box->x, box->y, box->w, box->h);
	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_fill(cv);
	ow_canvas_set_colour(cv, ow_rgb(0.1, 0.1, 0.1));
	title_lines(cv, box, title ? title : "", font_pt);
	if (subtitle) {
		ow_canvas_set_font(cv, 0.95 * font_pt, 0);
		ow_canvas_set_colour(cv, ow_rgb(0.3, 0.3, 0.3));
		ow_canvas_text(
		    cv, box->x + 0.8 * font_pt, box->y + 2.55 * font_pt,
		    ow_maps_fit_text(cv, subtitle, box->w - 1.6 * font_pt, buf,
		                     sizeof buf),
		    OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
	}
	ow_canvas_restore(cv);
}

void ow_maps_axes(const struct ow_study *s, const struct ow_grid *g,
                  enum ow_unit_system u, struct ow_plot_axis *x,
                  struct ow_plot_axis *y, char *ytitle, size_t n)
{
	double ya = ow_maps_temp(u, ow_grid_at(g, 0, 0)->set_ref_K);
	double yb = ow_maps_temp(u, ow_grid_at(g, 0, g->n_axis - 1)->set_ref_K);

	memset(x, 0, sizeof *x);
	memset(y, 0, sizeof *y);
	x->min = ow_grid_at(g, 0, 0)->rpm;
	x->max = ow_grid_at(g, g->n_rpm - 1, 0)->rpm;
	x->title = "screw speed (rpm)";
	y->min = fmin(ya, yb);
	y->max = fmax(ya, yb);
	y->title = ow_maps_y_title(s, u, ytitle, n);
}

/* --- files ------------------------------------------------------------ */

enum map_kind { MAP_WINDOW, MAP_FIGURE, MAP_PROFILE };

struct job {
	enum map_kind kind;
	enum ow_map_figure fig;
	const struct ow_map *m;
	const struct ow_maps_options *o;
	const char *subtitle;
};

static enum ow_status draw_job(struct ow_canvas *cv, const struct job *j,
                               struct ow_diag *d)
{
	struct ow_rect box = {0, 0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};

	switch (j->kind) {
	case MAP_WINDOW:
		return ow_maps_draw_window(cv, &box, j->m, j->o, d);
	case MAP_FIGURE:
		return ow_maps_draw_figure(cv, &box, j->fig, j->m, j->o, d);
	case MAP_PROFILE:
		return ow_maps_draw_profile(cv, &box, j->m->study,
		                            j->m->profile, j->m->n_profile,
		                            j->subtitle, j->o, d);
	}
	return OW_EARG;
}

static enum ow_status write_one(const struct job *j, const char *dir,
                                const char *stem, enum ow_canvas_format fmt,
                                struct ow_diag *d)
{
	struct ow_canvas *cv = NULL;
	size_t len = strlen(dir) + strlen(stem) + 8;
	char *path = malloc(len);
	enum ow_status st;

	if (!path)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	snprintf(path, len, "%s/%s.%s", dir, stem,
	         fmt == OW_CANVAS_PNG ? "png" : "svg");
	st = ow_canvas_create_image(fmt, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT,
	                            OW_MAPS_PNG_SCALE, &cv, d);
	if (st == OW_OK)
		st = draw_job(cv, j, d);
	if (st == OW_OK)
		st = ow_canvas_write_file(cv, path, d);
	ow_canvas_destroy(cv);
	free(path);
	return st;
}

static char *centre_subtitle(const struct ow_study *s,
                             const struct ow_window *w, enum ow_unit_system u,
                             char *buf, size_t n)
{
	char a[32], b[32], lab[96];

	snprintf(
	    buf, n, "at the window's centre: %s rpm, %s %s %s",
	    ow_maps_num(a, sizeof a, w->centre.rpm),
	    ow_maps_axis_label(s, lab, sizeof lab),
	    ow_plot_format(b, sizeof b, ow_maps_temp(u, w->centre_set_K), 0),
	    ow_display_label(u, OW_DIM_TEMPERATURE));
	return buf;
}

/* File k of a folder's images: window, the figure maps, then the
 * profile (only for a window that is not empty), each in the formats o
 * asks for, PNG first. */
static int file_of(const struct ow_window *w, const struct ow_maps_options *o,
                   int k, struct job *j, const char **stem,
                   enum ow_canvas_format *fmt)
{
	int nf = (o->png != 0) + (o->svg != 0), img;

	if (nf == 0 || k < 0)
		return 0;
	img = k / nf;
	*fmt = o->png && k % nf == 0 ? OW_CANVAS_PNG : OW_CANVAS_SVG;
	if (img == 0) {
		j->kind = MAP_WINDOW;
		*stem = "window";
	} else if (img <= OW_MAP_COUNT) {
		j->kind = MAP_FIGURE;
		j->fig = (enum ow_map_figure)(img - 1);
		*stem = fig_file[img - 1];
	} else if (img == OW_MAP_COUNT + 1 && !w->empty) {
		j->kind = MAP_PROFILE;
		*stem = "profile";
	} else {
		return 0;
	}
	return 1;
}

int ow_maps_file_count(const struct ow_map *m, const struct ow_maps_options *o)
{
	int nf = (o->png != 0) + (o->svg != 0);

	return nf * (OW_MAP_COUNT + 1 + (m->window->empty ? 0 : 1));
}

enum ow_status ow_maps_write_file(const struct ow_map *m,
                                  const struct ow_maps_options *o,
                                  const char *dir, int k, struct ow_diag *d)
{
	const char *stem = NULL;
	enum ow_canvas_format fmt;
	struct job j;
	char sub[200];

	if (!m || !m->study || !m->grid || !m->window || !o || !dir)
		return ow_diag_set(d, OW_EARG, "maps: NULL argument");
	memset(&j, 0, sizeof j);
	j.m = m, j.o = o;
	if (!file_of(m->window, o, k, &j, &stem, &fmt))
		return ow_diag_set(d, OW_EARG, "maps: no image file %d", k);
	if (j.kind == MAP_PROFILE)
		j.subtitle = centre_subtitle(m->study, m->window, o->units, sub,
		                             sizeof sub);
	return write_one(&j, dir, stem, fmt, d);
}

struct all_files {
	const struct ow_map *m;
	const struct ow_maps_options *o;
	const char *dir;
	enum ow_status (*beside)(void *ctx, struct ow_diag *d);
	void *ctx;
};

/* Piece k of the pool: 0 the work beside (when there is one, first so
 * that the longest piece starts at once), then the files in order. */
static enum ow_status piece(const struct all_files *a, int k, struct ow_diag *d)
{
	if (a->beside && k == 0)
		return a->beside(a->ctx, d);
	return ow_maps_write_file(a->m, a->o, a->dir, k - (a->beside != NULL),
	                          d);
}

/* Every piece on o->jobs threads, each with its own diagnostics; the
 * first failure in file order (the work beside last) goes to d. */
static enum ow_status run_pool(const struct all_files *a, struct ow_diag *d)
{
	int nb = a->beside != NULL, n = ow_maps_file_count(a->m, a->o) + nb;
	int jobs = a->o->jobs > 0 ? a->o->jobs : omp_get_max_threads(), k;
	struct ow_diag *dk = calloc((size_t)n + 1, sizeof *dk);
	enum ow_status *st = calloc((size_t)n + 1, sizeof *st);
	enum ow_status first = OW_OK;

	if (!dk || !st) {
		free(dk);
		free(st);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
#pragma omp parallel for schedule(dynamic) num_threads(jobs)
	for (k = 0; k < n; k++)
		st[k] = piece(a, k, &dk[k]);
	for (k = nb; k < n + nb && first == OW_OK; k++)
		if (st[k % n] != OW_OK)
			first = ow_diag_set(d, st[k % n], "%s", dk[k % n].msg);
	free(dk);
	free(st);
	return first;
}

enum ow_status
ow_maps_write_beside(const struct ow_map *m, const struct ow_maps_options *o,
                     const char *dir,
                     enum ow_status (*beside)(void *ctx, struct ow_diag *d),
                     void *ctx, struct ow_diag *d)
{
	struct ow_maps_options own;
	struct all_files a = {m, &own, dir, beside, ctx};

	if (!m || !m->study || !m->grid || !m->window || !dir)
		return ow_diag_set(d, OW_EARG, "maps: NULL argument");
	if (o)
		own = *o;
	else
		ow_maps_default(&own);
	return run_pool(&a, d);
}

enum ow_status ow_maps_write_all(const struct ow_map *m,
                                 const struct ow_maps_options *o,
                                 const char *dir, struct ow_diag *d)
{
	return ow_maps_write_beside(m, o, dir, NULL, NULL, d);
}
