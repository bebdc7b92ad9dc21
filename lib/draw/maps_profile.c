/* maps_profile.c - the axial profiles of one operating point, stacked
 * panels sharing x = axial position in screw diameters: pressure; bulk and
 * peak melt temperature with the barrel set-points; solid bed ratio and
 * unmelted fraction; and under them the screw itself, its channel depth
 * as a silhouette with each section named. Limits that apply to a panel
 * are drawn as labelled dashed lines. */
#include "maps_impl.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define N_PANELS         4
#define SILHOUETTE_STEPS 300

struct panel {
	struct ow_plot p;
	struct ow_plot_axis x, y;
	double share; /* of the panels' height */
};

/* Series values, in display units, filled from the rows. */
struct columns {
	int n;
	double *xD, *pres, *bulk, *peak, *barrel, *sbr, *unmelt;
};

static void columns_free(struct columns *c)
{
	free(c->xD);
	memset(c, 0, sizeof *c);
}

static int columns_fill(const struct ow_study *s,
                        const struct ow_profile_row *r, int n,
                        enum ow_unit_system u, struct columns *c)
{
	double D = s->screw.diameter_m;
	int i;

	memset(c, 0, sizeof *c);
	c->xD = malloc(7 * (size_t)n * sizeof *c->xD);
	if (!c->xD)
		return 0;
	c->n = n;
	c->pres = c->xD + n, c->bulk = c->pres + n, c->peak = c->bulk + n;
	c->barrel = c->peak + n, c->sbr = c->barrel + n;
	c->unmelt = c->sbr + n;
	for (i = 0; i < n; i++) {
		c->xD[i] = r[i].axial_m / D;
		c->pres[i] =
		    ow_display_value(u, OW_DIM_PRESSURE, r[i].pressure_Pa);
		c->bulk[i] =
		    ow_display_value(u, OW_DIM_TEMPERATURE, r[i].bulk_K);
		c->peak[i] =
		    ow_display_value(u, OW_DIM_TEMPERATURE, r[i].peak_K);
		c->barrel[i] =
		    ow_display_value(u, OW_DIM_TEMPERATURE, r[i].barrel_K);
		c->sbr[i] = r[i].sbr;
		c->unmelt[i] = r[i].unmelt_frac;
	}
	return 1;
}

static struct ow_series series(const char *name, const struct columns *c,
                               const double *y, int style)
{
	struct ow_series s;

	s.name = name;
	s.n = c->n;
	s.x = c->xD;
	s.y = y;
	s.style = ow_plot_series_style(style);
	return s;
}

/* Lay panel k out in rows [y0, y0 + h] of the chart's column. */
static enum ow_status panel_init(struct panel *pn, struct ow_canvas *cv,
                                 const struct ow_rect *col, double y0, double h,
                                 double f, double right, int last)
{
	struct ow_rect b = *col;
	double top = 2.0 * f, bot = 4.0 + (last ? 3.2 : 1.6) * f;

	b.y = y0 - top;
	b.h = h + top + bot;
	pn->y.max_ticks = h > 9.0 * f ? 5 : 4;
	if (ow_plot_init(&pn->p, cv, &b, &pn->x, &pn->y, f, right) != OW_OK)
		return OW_EARG;
	pn->p.hide_x_labels = !last;
	return OW_OK;
}

/* The same left edge for every panel, so they share the x axis. */
static void align(struct panel *pn, int n)
{
	double left = 0.0;
	int k;

	for (k = 0; k < n; k++)
		left = fmax(left, pn[k].p.area.x);
	for (k = 0; k < n; k++) {
		pn[k].p.area.w -= left - pn[k].p.area.x;
		pn[k].p.area.x = left;
	}
}

/* A horizontal dashed limit line with its label at the right end. */
static void limit_line(const struct ow_plot *p, double v, const char *text)
{
	double Y, f = p->font_pt;

	if (!isfinite(v) || v < p->y0 || v > p->y1)
		return;
	Y = ow_plot_py(p, v);
	ow_canvas_save(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0.80, 0.10, 0.05));
	ow_canvas_set_line_width(p->cv, 1.2);
	ow_plot_set_dash(p->cv, OW_DASH_DASHED, 1.2);
	ow_canvas_move_to(p->cv, p->area.x, Y);
	ow_canvas_line_to(p->cv, p->area.x + p->area.w, Y);
	ow_canvas_stroke(p->cv);
	ow_canvas_set_font(p->cv, 0.85 * f, 0);
	if (Y - p->area.y > 1.4 * f) /* above the line, else below it */
		ow_canvas_text(p->cv, p->area.x + p->area.w - 0.3 * f,
		               Y - 0.25 * f, text, OW_ALIGN_RIGHT,
		               OW_VALIGN_BOTTOM, 0);
	else
		ow_canvas_text(p->cv, p->area.x + p->area.w - 0.3 * f,
		               Y + 0.35 * f, text, OW_ALIGN_RIGHT,
		               OW_VALIGN_TOP, 0);
	ow_canvas_restore(p->cv);
}

static void panel_draw(struct panel *pn, const struct ow_series *s, int n)
{
	struct ow_legend_entry e[4];
	double w, h, f = pn->p.font_pt;
	int k;

	ow_plot_lines(&pn->p, &pn->x, &pn->y, s, n, 0);
	memset(e, 0, sizeof e);
	for (k = 0; k < n && k < 4; k++) {
		e[k].label = s[k].name;
		e[k].line = s[k].style;
	}
	ow_plot_legend_size(pn->p.cv, e, n, 0.85 * f, &w, &h);
	ow_plot_legend(pn->p.cv, pn->p.area.x + pn->p.area.w + 0.8 * f,
	               pn->p.area.y, e, n, 0.85 * f);
}

/* y range of the finite values of n series, padded; from zero if asked. */
static void y_range(struct panel *pn, const struct ow_series *s, int n,
                    int from_zero, double lim)
{
	double lo, hi;

	if (!ow_plot_series_range(s, n, 1, &lo, &hi))
		lo = 0.0, hi = 1.0;
	if (isfinite(lim))
		lo = fmin(lo, lim), hi = fmax(hi, lim);
	if (from_zero)
		lo = fmin(0.0, lo);
	if (hi - lo < 1e-9 * fmax(1.0, fabs(hi)))
		hi = lo + 1.0;
	pn->y.min = lo;
	pn->y.max = hi;
	pn->y.nice = 1;
}

/* The screw: barrel wall at the top, the root at the channel depth below
 * it, the root body shaded, sections separated and named. */
static void silhouette(struct panel *pn, const struct ow_study *s,
                       enum ow_unit_system u)
{
	struct ow_legend_entry e[2];
	const struct ow_screw *sc = &s->screw;
	const struct ow_plot *p = &pn->p;
	double D = sc->diameter_m, L = ow_screw_length(sc), f = p->font_pt;
	int i, k;

	ow_plot_clip(p);
	ow_canvas_rect(p->cv, p->area.x, p->area.y, p->area.w, p->area.h);
	ow_canvas_set_colour(p->cv, ow_rgb(0.62, 0.64, 0.67)); /* root */
	ow_canvas_fill(p->cv);
	ow_canvas_move_to(p->cv, ow_plot_px(p, 0.0), ow_plot_py(p, 0.0));
	for (i = 0; i <= SILHOUETTE_STEPS; i++) {
		double x = L * (double)i / SILHOUETTE_STEPS;

		ow_canvas_line_to(
		    p->cv, ow_plot_px(p, x / D),
		    ow_plot_py(p, ow_display_value(u, OW_DIM_LENGTH,
		                                   ow_screw_depth(sc, x))));
	}
	ow_canvas_line_to(p->cv, ow_plot_px(p, L / D), ow_plot_py(p, 0.0));
	ow_canvas_close_path(p->cv);
	ow_canvas_set_colour(p->cv, ow_rgb(0.97, 0.93, 0.82)); /* channel */
	ow_canvas_fill(p->cv);
	ow_canvas_set_line_width(p->cv, 0.6);
	ow_canvas_set_font(p->cv, 0.85 * f, 0);
	for (k = 0; k < sc->n_sections; k++) {
		const struct ow_section *sec = &sc->sections[k];
		double xa = ow_plot_px(p, sec->start_m / D);
		double xb = ow_plot_px(p, sec->end_m / D);
		const char *name = ow_section_name(sec->type);

		ow_canvas_set_colour(p->cv, ow_rgb(0.2, 0.2, 0.2));
		ow_canvas_move_to(p->cv, xb, p->area.y);
		ow_canvas_line_to(p->cv, xb, p->area.y + p->area.h);
		ow_canvas_stroke(p->cv);
		if (ow_canvas_text_width(p->cv, name) < xb - xa - 4.0)
			ow_canvas_text(p->cv, 0.5 * (xa + xb),
			               p->area.y + p->area.h - 0.4 * f, name,
			               OW_ALIGN_CENTRE, OW_VALIGN_BOTTOM, 0);
	}
	ow_canvas_restore(p->cv);
	ow_plot_axes(p, &pn->x, &pn->y);
	memset(e, 0, sizeof e);
	e[0].label = "channel";
	e[0].swatch = 1;
	e[0].fill = ow_rgb(0.97, 0.93, 0.82);
	e[0].line.colour = ow_rgb(0.2, 0.2, 0.2);
	e[0].line.width_pt = 0.5;
	e[1] = e[0];
	e[1].label = "screw root";
	e[1].fill = ow_rgb(0.62, 0.64, 0.67);
	ow_plot_legend(p->cv, p->area.x + p->area.w + 0.8 * f, p->area.y, e, 2,
	               0.85 * f);
}

/* Vertical gap between panels: room for the tick labels at both ends. */
#define GAP(f) (1.5 * (f))

/* The widest legend of the panels. */
static double legend_width(struct ow_canvas *cv, const struct ow_series *sr,
                           double f)
{
	struct ow_legend_entry e[6];
	double w, h;
	int k;

	memset(e, 0, sizeof e);
	for (k = 0; k < 6; k++) {
		e[k].label = sr[k].name;
		e[k].line = sr[k].style;
	}
	ow_plot_legend_size(cv, e, 6, 0.85 * f, &w, &h);
	return w;
}

struct layout {
	struct panel pn[N_PANELS];
	char t_pres[64], t_temp[64], t_depth[64], l_pres[96], l_temp[96];
};

static enum ow_status layout(struct layout *ly, struct ow_canvas *cv,
                             const struct ow_rect *box,
                             const struct ow_study *s,
                             const struct ow_series *sr, enum ow_unit_system u,
                             double f)
{
	static const double share[N_PANELS] = {1.0, 1.15, 0.85, 0.6};
	struct ow_rect col = *box;
	double right = legend_width(cv, sr, f) + 0.8 * f;
	double top = box->y + 3.4 * f + 1.2 * f;
	double avail = box->y + box->h - (4.0 + 3.2 * f) - top - 3 * GAP(f);
	double y = top, maxd = 0.0;
	int k;

	for (k = 0; k < s->screw.n_sections; k++)
		maxd = fmax(maxd, fmax(s->screw.sections[k].depth_m,
		                       s->screw.sections[k].depth_start_m));
	for (k = 0; k < N_PANELS; k++) {
		struct panel *pn = &ly->pn[k];

		pn->x.min = 0.0;
		pn->x.max = ow_screw_length(&s->screw) / s->screw.diameter_m;
		pn->x.max_ticks = (int)(col.w * 0.8 / (6.0 * f)) + 1;
		pn->x.title = k == N_PANELS - 1
		                  ? "axial position from the hopper end (D)"
		                  : NULL;
	}
	y_range(&ly->pn[0], sr, 1, 1, NAN);
	ly->pn[0].y.title = ly->t_pres;
	y_range(&ly->pn[1], sr + 1, 3, 0,
	        ow_display_value(u, OW_DIM_TEMPERATURE,
	                         s->line.limits.peak_temp_K));
	ly->pn[1].y.title = ly->t_temp;
	ly->pn[2].y.min = 0.0, ly->pn[2].y.max = 1.0;
	ly->pn[2].y.title = "fraction (–)";
	ly->pn[3].y.min = 0.0;
	ly->pn[3].y.max = ow_display_value(u, OW_DIM_LENGTH, maxd * 1.15);
	ly->pn[3].y.nice = 0;
	ly->pn[3].y.title = ly->t_depth;
	for (k = 0; k < N_PANELS; k++) {
		double h = avail * share[k] / 3.6;

		if (panel_init(&ly->pn[k], cv, &col, y, h, f, right,
		               k == N_PANELS - 1) != OW_OK)
			return OW_EARG;
		y += h + GAP(f);
	}
	align(ly->pn, N_PANELS);
	return OW_OK;
}

static void titles(struct layout *ly, const struct ow_study *s,
                   enum ow_unit_system u)
{
	char a[48];

	snprintf(ly->t_pres, sizeof ly->t_pres, "pressure (%s)",
	         ow_display_label(u, OW_DIM_PRESSURE));
	snprintf(ly->t_temp, sizeof ly->t_temp, "temperature (%s)",
	         ow_display_label(u, OW_DIM_TEMPERATURE));
	snprintf(ly->t_depth, sizeof ly->t_depth, "depth (%s)",
	         ow_display_label(u, OW_DIM_LENGTH));
	snprintf(ly->l_pres, sizeof ly->l_pres, "limit: %s",
	         ow_maps_limit_text(s, OW_CK_PRESSURE, u, NULL, a, sizeof a));
	snprintf(ly->l_temp, sizeof ly->l_temp, "limit: %s",
	         ow_maps_limit_text(s, OW_CK_PEAK_TEMP, u, NULL, a, sizeof a));
}

static enum ow_status
draw_panels(struct ow_canvas *cv, const struct ow_rect *box,
            const struct ow_study *s, const struct columns *c,
            enum ow_unit_system u, double f, struct ow_diag *d)
{
	struct ow_series sr[6];
	struct layout ly;
	const struct ow_limits *lim = &s->line.limits;

	memset(&ly, 0, sizeof ly);
	sr[0] = series("pressure", c, c->pres, 0);
	sr[1] = series("bulk melt", c, c->bulk, 1);
	sr[2] = series("peak melt", c, c->peak, 0);
	sr[3] = series("barrel set", c, c->barrel, 6);
	sr[3].style.dash = OW_DASH_DOTTED;
	sr[3].style.marker = OW_MARK_NONE;
	sr[3].style.colour = ow_rgb(0.45, 0.45, 0.45);
	sr[2].style = ow_plot_series_style(3);
	sr[4] = series("solid bed ratio", c, c->sbr, 2);
	sr[5] = series("unmelted fraction", c, c->unmelt, 1);
	titles(&ly, s, u);
	if (layout(&ly, cv, box, s, sr, u, f) != OW_OK)
		return ow_diag_set(d, OW_EARG, "profile: box too small");
	panel_draw(&ly.pn[0], sr, 1);
	if (ow_check_active(lim, OW_CK_PRESSURE))
		limit_line(
		    &ly.pn[0].p,
		    ow_display_value(u, OW_DIM_PRESSURE, lim->pressure_Pa),
		    ly.l_pres);
	panel_draw(&ly.pn[1], sr + 1, 3);
	if (ow_check_active(lim, OW_CK_PEAK_TEMP))
		limit_line(
		    &ly.pn[1].p,
		    ow_display_value(u, OW_DIM_TEMPERATURE, lim->peak_temp_K),
		    ly.l_temp);
	panel_draw(&ly.pn[2], sr + 4, 2);
	/* depth grows downwards, like the channel seen in section */
	ly.pn[3].p.y1 = ly.pn[3].p.y0;
	ly.pn[3].p.y0 = ly.pn[3].y.max;
	silhouette(&ly.pn[3], s, u);
	return ow_canvas_status(cv, d);
}

enum ow_status ow_maps_draw_profile(
    struct ow_canvas *cv, const struct ow_rect *box, const struct ow_study *s,
    const struct ow_profile_row *rows, int n, const char *subtitle,
    const struct ow_maps_options *o, struct ow_diag *d)
{
	struct ow_maps_options def;
	struct columns c;
	enum ow_status st;
	double f;

	if (!cv || !box || !s || !rows || n < 2)
		return ow_diag_set(d, OW_EARG, "profile: no rows to draw");
	if (!o) {
		ow_maps_default(&def);
		o = &def;
	}
	f = ow_maps_font(o);
	if (!columns_fill(s, rows, n, o->units, &c))
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	ow_maps_paper(cv, box, s->title,
	              subtitle ? subtitle : "Profiles along the screw", f);
	st = draw_panels(cv, box, s, &c, o->units, f, d);
	columns_free(&c);
	return st;
}
