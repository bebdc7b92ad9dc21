/* fitplot.c - the rheology fit as a PNG: lab data as markers and the
 * fitted curve per temperature on log-log axes, over the band of shear
 * rates screws and dies see, with a legend per temperature. Drawn with
 * the plot module (lib/ow_plot.h) on an image canvas. */
#include "ow_fit.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_canvas.h"
#include "ow_plot.h"

/* 1000 x 700 pixels: 666.7 x 466.7 points at 1.5 pixels per point. */
#define IMG_SCALE   1.5
#define IMG_W_PT    (1000.0 / IMG_SCALE)
#define IMG_H_PT    (700.0 / IMG_SCALE)
#define FONT_PT     10.0
#define TITLE_H_PT  44.0
#define MARK_PT     7.0
#define CURVE_STEPS 240
#define N_MARKS     5

/* Marker shapes cycle with the temperature so groups differ in greyscale
 * too; colours from ow_plot_series_style (Okabe & Ito 2008). */
static enum ow_marker mark_of(int k)
{
	static const enum ow_marker m[N_MARKS] = {
	    OW_MARK_CIRCLE, OW_MARK_SQUARE, OW_MARK_TRIANGLE, OW_MARK_DIAMOND,
	    OW_MARK_CROSS};

	return m[k % N_MARKS];
}

static struct ow_line_style style_of(int k)
{
	struct ow_line_style s = ow_plot_series_style(k);

	s.dash = OW_DASH_SOLID;
	s.marker = OW_MARK_NONE; /* the data carry the markers */
	return s;
}

/* The temperature group of a point: the nearest fitted temperature. */
static int group_of(const struct ow_fit_result *fit, double T)
{
	int k, best = 0;

	for (k = 1; k < fit->n_temps; k++)
		if (fabs(fit->temps[k].temp_K - T) <
		    fabs(fit->temps[best].temp_K - T))
			best = k;
	return best;
}

/* Decade-aligned ranges (log10) around the data; the curves may extend
 * the viscosity range by at most one decade either way. */
static void ranges(const struct ow_fit_data *data,
                   const struct ow_fit_result *fit, double *lx0, double *lx1,
                   double *ly0, double *ly1)
{
	double x0 = INFINITY, x1 = 1e-300, y0 = INFINITY, y1 = 1e-300, c0, c1;
	size_t i;
	int k, e;

	for (i = 0; i < data->n; i++) {
		x0 = fmin(x0, data->points[i].shear_rate_1_s);
		x1 = fmax(x1, data->points[i].shear_rate_1_s);
		y0 = fmin(y0, data->points[i].viscosity_Pa_s);
		y1 = fmax(y1, data->points[i].viscosity_Pa_s);
	}
	*lx0 = floor(log10(x0) - 0.15);
	*lx1 = ceil(log10(x1) + 0.15);
	c0 = y0;
	c1 = y1;
	for (k = 0; k < fit->n_temps; k++)
		for (e = 0; e < 2; e++) {
			double eta = ow_viscosity_eval(
			    &fit->visc, pow(10.0, e ? *lx1 : *lx0),
			    fit->temps[k].temp_K);

			if (isfinite(eta) && eta > 0) {
				c0 = fmin(c0, fmax(eta, y0 / 10));
				c1 = fmax(c1, fmin(eta, y1 * 10));
			}
		}
	*ly0 = floor(log10(c0) - 0.05);
	*ly1 = ceil(log10(c1) + 0.05);
}

static void temp_label(enum ow_unit_system sys, double T, char *buf, size_t len)
{
	double t = ow_display_value(sys, OW_DIM_TEMPERATURE, T);
	int whole = fabs(t - round(t)) < 0.05;

	snprintf(buf, len, "%.*f %s", whole ? 0 : 1, t,
	         ow_display_label(sys, OW_DIM_TEMPERATURE));
}

/* The band of shear rates screw channels and dies see, roughly 10..1000
 * 1/s (common practice), lightly shaded so gaps in the data show. */
static void rate_band(const struct ow_plot *p)
{
	static const char *label = "typical channel and die shear rates";
	struct ow_pt2 r[4] = {
	    {10.0, p->y0}, {1000.0, p->y0}, {1000.0, p->y1}, {10.0, p->y1}};
	int count = 4;
	double X0 = ow_plot_px(p, fmax(10.0, p->x0));
	double X1 = ow_plot_px(p, fmin(1000.0, p->x1));

	if (X1 <= X0)
		return;
	ow_plot_region(p, r, &count, 1, ow_rgb(0.985, 0.965, 0.90), NULL);
	ow_canvas_save(p->cv);
	ow_canvas_set_font(p->cv, 0.8 * FONT_PT, 0);
	if (ow_canvas_text_width(p->cv, label) < X1 - X0) {
		ow_canvas_set_colour(p->cv, ow_rgb(0.50, 0.45, 0.35));
		ow_canvas_text(p->cv, 0.5 * (X0 + X1),
		               p->area.y + 0.5 * FONT_PT, label,
		               OW_ALIGN_CENTRE, OW_VALIGN_TOP, 0);
	}
	ow_canvas_restore(p->cv);
}

/* The fitted curve at temperature k, CURVE_STEPS log-spaced rates. */
static void curve(const struct ow_plot *p, const struct ow_fit_result *fit,
                  int k)
{
	struct ow_pt2 pts[CURVE_STEPS + 1];
	struct ow_line_style s = style_of(k);
	double l0 = log10(p->x0), l1 = log10(p->x1);
	int i;

	for (i = 0; i <= CURVE_STEPS; i++) {
		double rate =
		    pow(10.0, l0 + (l1 - l0) * (double)i / CURVE_STEPS);
		double eta =
		    ow_viscosity_eval(&fit->visc, rate, fit->temps[k].temp_K);

		pts[i].x = rate;
		pts[i].y = isfinite(eta) && eta > 0 ? eta : NAN;
	}
	ow_plot_polyline(p, pts, CURVE_STEPS + 1, &s);
}

static void series(const struct ow_plot *p, const struct ow_fit_data *data,
                   const struct ow_fit_result *fit)
{
	size_t i;
	int k;

	for (k = 0; k < fit->n_temps; k++)
		curve(p, fit, k);
	ow_plot_clip(p);
	for (i = 0; i < data->n; i++) {
		const struct ow_fit_point *pt = &data->points[i];
		int g = group_of(fit, pt->temp_K);
		struct ow_rgba c = style_of(g).colour;

		ow_plot_marker(p, pt->shear_rate_1_s, pt->viscosity_Pa_s,
		               mark_of(g), MARK_PT, c, c);
	}
	ow_canvas_restore(p->cv);
}

static void titles(struct ow_canvas *cv, double x,
                   const struct ow_fit_data *data,
                   const struct ow_fit_result *fit, enum ow_unit_system sys)
{
	const char *base = strrchr(data->source, '/');
	char buf[400], t[64];

	base = base ? base + 1 : data->source;
	snprintf(buf, sizeof buf, "Viscosity fit to %s: %s model, %s shift",
	         base, ow_fit_model_name(fit->visc.model),
	         fit->visc.shift == OW_SHIFT_WLF ? "WLF" : "Arrhenius");
	ow_canvas_set_colour(cv, ow_rgb(0.05, 0.05, 0.05));
	ow_canvas_set_font(cv, 1.25 * FONT_PT, 0);
	ow_canvas_text(cv, x, 20.0, buf, OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0);
	temp_label(sys, fit->visc.ref_temp_K, t, sizeof t);
	snprintf(buf, sizeof buf,
	         "RMS error %.4f in log10 viscosity (about %.1f %%), %zu "
	         "points; reference temperature %s",
	         fit->rms_log10, 100.0 * (pow(10.0, fit->rms_log10) - 1.0),
	         fit->n_points, t);
	ow_canvas_set_colour(cv, ow_rgb(0.3, 0.3, 0.3));
	ow_canvas_set_font(cv, 0.92 * FONT_PT, 0);
	ow_canvas_text(cv, x, 37.0, buf, OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0);
}

/* Legend entries, one per temperature (line and marker as drawn). */
static int legend_entries(const struct ow_fit_result *fit,
                          enum ow_unit_system sys, struct ow_legend_entry *e,
                          char (*lab)[32], int max)
{
	int k, n = fit->n_temps < max ? fit->n_temps : max;

	for (k = 0; k < n; k++) {
		temp_label(sys, fit->temps[k].temp_K, lab[k], sizeof lab[k]);
		memset(&e[k], 0, sizeof e[k]);
		e[k].label = lab[k];
		e[k].line = style_of(k);
		e[k].marker = mark_of(k);
		e[k].fill = e[k].line.colour; /* filled, like the data */
	}
	return n;
}

/* Heading, legend and the key to markers and lines, from (x, y). */
static void legend(struct ow_canvas *cv, double x, double y,
                   const struct ow_legend_entry *e, int n)
{
	double w, h;

	ow_canvas_set_colour(cv, ow_rgb(0.1, 0.1, 0.1));
	ow_canvas_set_font(cv, FONT_PT, 0);
	ow_canvas_text(cv, x, y, "temperature", OW_ALIGN_LEFT, OW_VALIGN_TOP,
	               0);
	y += 1.5 * FONT_PT;
	ow_plot_legend(cv, x, y, e, n, FONT_PT);
	ow_plot_legend_size(cv, e, n, FONT_PT, &w, &h);
	y += h + 1.6 * FONT_PT;
	ow_canvas_set_colour(cv, ow_rgb(0.35, 0.35, 0.35));
	ow_canvas_set_font(cv, 0.87 * FONT_PT, 0);
	ow_canvas_text(cv, x, y, "markers: lab data", OW_ALIGN_LEFT,
	               OW_VALIGN_TOP, 0);
	ow_canvas_text(cv, x, y + 1.35 * FONT_PT, "lines: fitted model",
	               OW_ALIGN_LEFT, OW_VALIGN_TOP, 0);
}

/* Width the legend column needs. */
static double legend_width(struct ow_canvas *cv,
                           const struct ow_legend_entry *e, int n)
{
	double w, h;

	ow_plot_legend_size(cv, e, n, FONT_PT, &w, &h);
	ow_canvas_set_font(cv, FONT_PT, 0);
	w = fmax(w, ow_canvas_text_width(cv, "temperature"));
	ow_canvas_set_font(cv, 0.87 * FONT_PT, 0);
	return fmax(w, ow_canvas_text_width(cv, "lines: fitted model"));
}

static enum ow_status draw(struct ow_canvas *cv, const struct ow_fit_data *data,
                           const struct ow_fit_result *fit,
                           enum ow_unit_system sys)
{
	struct ow_legend_entry e[16];
	char lab[16][32];
	struct ow_rect box = {8.0, TITLE_H_PT, IMG_W_PT - 16.0,
	                      IMG_H_PT - TITLE_H_PT - 6.0};
	struct ow_plot_axis x = {0, 0, NULL, 1, 0}, y = {0, 0, NULL, 1, 0};
	struct ow_plot p;
	double lx0, lx1, ly0, ly1, lw;
	int n = legend_entries(fit, sys, e, lab, 16);

	ranges(data, fit, &lx0, &lx1, &ly0, &ly1);
	x.min = pow(10.0, lx0), x.max = pow(10.0, lx1);
	y.min = pow(10.0, ly0), y.max = pow(10.0, ly1);
	x.title = data->cox_merz
	              ? "shear rate, or angular frequency (Cox–Merz) (1/s)"
	              : "shear rate (1/s)";
	y.title = data->cox_merz ? "viscosity, or complex viscosity (Pa·s)"
	                         : "viscosity (Pa·s)";
	lw = legend_width(cv, e, n);
	if (ow_plot_init_log(&p, cv, &box, &x, &y, FONT_PT, lw + FONT_PT,
	                     OW_PLOT_LOG_X | OW_PLOT_LOG_Y) != OW_OK)
		return OW_EARG;
	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_rect(cv, 0, 0, IMG_W_PT, IMG_H_PT);
	ow_canvas_fill(cv);
	rate_band(&p);
	ow_plot_grid(&p);
	series(&p, data, fit);
	ow_plot_axes(&p, &x, &y);
	titles(cv, p.area.x, data, fit, sys);
	legend(cv, p.area.x + p.area.w + 1.4 * FONT_PT, p.area.y, e, n);
	return OW_OK;
}

enum ow_status ow_fit_plot_png(const struct ow_fit_data *data,
                               const struct ow_fit_result *fit,
                               enum ow_unit_system sys, const char *path,
                               struct ow_diag *d)
{
	struct ow_canvas *cv = NULL;
	enum ow_status st;

	if (data->n == 0 || fit->n_temps == 0)
		return ow_diag_set(d, OW_EARG, "nothing to plot");
	st = ow_canvas_create_image(OW_CANVAS_PNG, IMG_W_PT, IMG_H_PT,
	                            IMG_SCALE, &cv, d);
	if (st != OW_OK)
		goto fail;
	if (draw(cv, data, fit, sys) != OW_OK) {
		st = ow_diag_set(d, OW_EARG,
		                 "%s: the data span no range to plot", path);
		goto fail;
	}
	st = ow_canvas_write_file(cv, path, d);
fail:
	ow_canvas_destroy(cv);
	return st;
}
