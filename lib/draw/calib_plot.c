/* calib_plot.c - the calibration's residual plot: one panel per measured
 * quantity, modelled against measured value per reading, the 1:1 line and
 * each reading's stated uncertainty as a bar of +-2 standard deviations,
 * readings labelled by their line in the file. Drawn with the plot module
 * on any canvas (image here, a PDF page in the report). */
#include "ow_calib_plot.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_canvas.h"
#include "ow_plot.h"

#define IMG_SCALE  1.5
#define IMG_W_PT   (1000.0 / IMG_SCALE)
#define ROW_H_PT   (330.0)
#define FONT_PT    9.0
#define TITLE_H_PT 40.0
#define MARK_PT    6.0

static const char *const qty_titles[OW_CQ_COUNT] = {
    "output", "head pressure", "melt temperature", "drive power", "torque"};

static double shown(enum ow_unit_system sys, enum ow_calib_qty q, double si)
{
	return ow_display_value(sys, ow_calib_qty_dim(q), si);
}

/* The common range of measured and modelled values (and the +-2 sd bars)
 * of quantity q, with a margin. */
static int range(const struct ow_calib_resid *e, int n, enum ow_calib_qty q,
                 enum ow_unit_system sys, double *lo, double *hi)
{
	int i, count = 0;
	double pad;

	*lo = INFINITY;
	*hi = -INFINITY;
	for (i = 0; i < n; i++) {
		double a, b, c;

		if (e[i].qty != q)
			continue;
		a = shown(sys, q, e[i].measured - 2 * e[i].sd);
		b = shown(sys, q, e[i].measured + 2 * e[i].sd);
		c = shown(sys, q, e[i].modelled);
		*lo = fmin(*lo, fmin(fmin(a, b), c));
		*hi = fmax(*hi, fmax(fmax(a, b), c));
		count++;
	}
	pad = 0.05 * (*hi - *lo) + 1e-9 * fabs(*hi);
	*lo -= pad;
	*hi += pad;
	return count;
}

static void one_point(const struct ow_plot *p, const struct ow_calib_resid *e,
                      enum ow_unit_system sys, struct ow_rgba c)
{
	struct ow_line_style bar = {c, 1.0, OW_DASH_SOLID, OW_MARK_NONE};
	double x = shown(sys, e->qty, e->measured),
	       y = shown(sys, e->qty, e->modelled);
	struct ow_pt2 seg[2] = {
	    {shown(sys, e->qty, e->measured - 2 * e->sd), y},
	    {shown(sys, e->qty, e->measured + 2 * e->sd), y}};
	char lab[16];

	ow_plot_polyline(p, seg, 2, &bar);
	ow_plot_marker(p, x, y, OW_MARK_CIRCLE, MARK_PT, c, c);
	snprintf(lab, sizeof lab, "%d", e->line);
	ow_canvas_set_colour(p->cv, ow_rgb(0.25, 0.25, 0.25));
	ow_canvas_set_font(p->cv, 0.8 * FONT_PT, 0);
	ow_canvas_text(p->cv, ow_plot_px(p, x) + 0.5 * MARK_PT + 1.5,
	               ow_plot_py(p, y) - 0.5 * MARK_PT, lab, OW_ALIGN_LEFT,
	               OW_VALIGN_BOTTOM, 0);
}

/* Panel of quantity q in box. */
static void panel(struct ow_canvas *cv, const struct ow_rect *box,
                  const struct ow_calib_resid *e, int n, enum ow_calib_qty q,
                  enum ow_unit_system sys)
{
	char xt[80], yt[80];
	const char *unit = ow_display_label(sys, ow_calib_qty_dim(q));
	/* the same tick count on both axes: the same nice range, so the
	 * 1:1 line runs corner to corner */
	struct ow_plot_axis x = {0, 0, xt, 1, 5}, y = {0, 0, yt, 1, 5};
	struct ow_line_style one = {ow_rgb(0.45, 0.45, 0.45), 0.8,
	                            OW_DASH_DASHED, OW_MARK_NONE};
	struct ow_rgba c = ow_plot_series_style(0).colour;
	struct ow_pt2 diag[2];
	struct ow_plot p;
	int i;

	range(e, n, q, sys, &x.min, &x.max);
	y.min = x.min;
	y.max = x.max;
	snprintf(xt, sizeof xt, "measured %s (%s)", qty_titles[q], unit);
	snprintf(yt, sizeof yt, "modelled (%s)", unit);
	if (ow_plot_init(&p, cv, box, &x, &y, FONT_PT, 0) != OW_OK)
		return;
	ow_plot_grid(&p);
	diag[0].x = diag[0].y = p.x0 < p.y0 ? p.x0 : p.y0;
	diag[1].x = diag[1].y = p.x1 > p.y1 ? p.x1 : p.y1;
	ow_plot_polyline(&p, diag, 2, &one);
	ow_plot_clip(&p);
	for (i = 0; i < n; i++)
		if (e[i].qty == q)
			one_point(&p, &e[i], sys, c);
	ow_canvas_restore(cv);
	ow_plot_axes(&p, &x, &y);
}

/* Quantities present, in table order. */
static int present(const struct ow_calib_resid *e, int n, int *qs)
{
	int q, i, m = 0;

	for (q = 0; q < OW_CQ_COUNT; q++)
		for (i = 0; i < n; i++)
			if (e[i].qty == (enum ow_calib_qty)q) {
				qs[m++] = q;
				break;
			}
	return m;
}

int ow_calib_plot_rows(const struct ow_calib_resid *e, int n)
{
	int qs[OW_CQ_COUNT], m = present(e, n, qs);

	return m <= 3 ? 1 : 2;
}

void ow_calib_draw(struct ow_canvas *cv, double x_pt, double y_pt, double w_pt,
                   double h_pt, const struct ow_calib_resid *e, int n,
                   enum ow_unit_system sys, const char *title)
{
	int qs[OW_CQ_COUNT], m = present(e, n, qs), rows = m <= 3 ? 1 : 2,
	                     cols = m <= 3 ? m : 3, k;
	double top = title ? TITLE_H_PT : 4.0, pw, ph;

	if (m == 0)
		return;
	pw = w_pt / cols;
	ph = (h_pt - top) / rows;
	if (title) {
		ow_canvas_set_colour(cv, ow_rgb(0.05, 0.05, 0.05));
		ow_canvas_set_font(cv, 1.2 * FONT_PT, 0);
		ow_canvas_text(cv, x_pt + 8.0, y_pt + 18.0, title,
		               OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0);
		ow_canvas_set_colour(cv, ow_rgb(0.3, 0.3, 0.3));
		ow_canvas_set_font(cv, 0.9 * FONT_PT, 0);
		ow_canvas_text(cv, x_pt + 8.0, y_pt + 32.0,
		               "dots: modelled against measured, labelled by "
		               "the line of the readings file; bars: ±2 "
		               "standard deviations of the reading; dashed: "
		               "model = measurement",
		               OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0);
	}
	for (k = 0; k < m; k++) {
		struct ow_rect box = {x_pt + (k % cols) * pw + 4.0,
		                      y_pt + top + (k / cols) * ph + 4.0,
		                      pw - 12.0, ph - 8.0};

		panel(cv, &box, e, n, (enum ow_calib_qty)qs[k], sys);
	}
}

enum ow_status ow_calib_plot(const struct ow_calib_resid *e, int n,
                             enum ow_unit_system sys, const char *title,
                             const char *path, struct ow_diag *d)
{
	const char *dot = strrchr(path, '.');
	enum ow_canvas_format fmt =
	    dot && !strcmp(dot, ".svg") ? OW_CANVAS_SVG : OW_CANVAS_PNG;
	double h = TITLE_H_PT + ROW_H_PT * ow_calib_plot_rows(e, n);
	struct ow_canvas *cv = NULL;
	enum ow_status st;

	if (n == 0)
		return ow_diag_set(d, OW_EARG, "%s: no readings to plot", path);
	st = ow_canvas_create_image(fmt, IMG_W_PT, h, IMG_SCALE, &cv, d);
	if (st != OW_OK)
		return st;
	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_rect(cv, 0, 0, IMG_W_PT, h);
	ow_canvas_fill(cv);
	ow_calib_draw(cv, 0.0, 0.0, IMG_W_PT, h, e, n, sys, title);
	st = ow_canvas_write_file(cv, path, d);
	ow_canvas_destroy(cv);
	return st;
}
