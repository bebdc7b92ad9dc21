/* canvas.c - the drawing interface: graphics state stack, path recording,
 * text anchoring and hatching, dispatched to a back-end (canvas_impl.h).
 * The path is recorded here rather than in the back-end so every back-end
 * can replay it at paint time: libharu refuses colour changes while a path
 * is open, and hatching needs the path's extent. */
#include "canvas_impl.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_io.h"
#include "ow_const.h"

/* Bezier control distance for a quarter circle, 4/3 (sqrt 2 - 1)
 * (Riskus, "Approximation of a cubic Bezier curve by circular arcs and
 * vice versa", Information Technology and Control 35 (2006)). */
#define KAPPA 0.5522847498307936

struct ow_rgba ow_rgb(double r, double g, double b)
{
	struct ow_rgba c = {r, g, b, 1.0};

	return c;
}

struct ow_rgba ow_rgba_with_alpha(struct ow_rgba c, double a)
{
	c.a = a;
	return c;
}

struct ow_canvas *ow_canvas_new(const struct canvas_ops *ops, double width_pt,
                                double height_pt)
{
	struct ow_canvas *cv = calloc(1, sizeof *cv);

	if (!cv)
		return NULL;
	cv->ops = ops;
	cv->width_pt = width_pt;
	cv->height_pt = height_pt;
	cv->gs.colour = ow_rgb(0, 0, 0);
	cv->gs.line_width = 1.0;
	cv->gs.font_pt = 10.0;
	return cv;
}

void ow_canvas_fail(struct ow_canvas *cv, enum ow_status st, const char *fmt,
                    ...)
{
	va_list ap;

	if (cv->st != OW_OK)
		return;
	cv->st = st;
	va_start(ap, fmt);
	vsnprintf(cv->diag.msg, sizeof cv->diag.msg, fmt, ap);
	va_end(ap);
}

enum ow_status ow_canvas_create_image(enum ow_canvas_format fmt,
                                      double width_pt, double height_pt,
                                      double scale, struct ow_canvas **out,
                                      struct ow_diag *d)
{
	if (!out)
		return ow_diag_set(d, OW_EARG, "canvas: no output pointer");
	*out = NULL;
	if (!(width_pt >= 1.0 && height_pt >= 1.0 && width_pt <= 20000.0 &&
	      height_pt <= 20000.0))
		return ow_diag_set(d, OW_EARG,
		                   "canvas: size %g x %g pt out "
		                   "of range",
		                   width_pt, height_pt);
	if (fmt == OW_CANVAS_PNG) {
		if (!(scale > 0.0 && width_pt * scale <= 20000.0 &&
		      height_pt * scale <= 20000.0))
			return ow_diag_set(d, OW_EARG,
			                   "canvas: PNG scale %g "
			                   "out of range",
			                   scale);
		return ow_canvas_cairo_png(width_pt, height_pt, scale, out, d);
	}
	if (fmt == OW_CANVAS_SVG)
		return ow_canvas_svg(width_pt, height_pt, out, d);
	return ow_diag_set(d, OW_EARG, "canvas: unknown image format %d",
	                   (int)fmt);
}

void ow_canvas_destroy(struct ow_canvas *cv)
{
	if (!cv)
		return;
	if (cv->ops && cv->ops->destroy)
		cv->ops->destroy(cv);
	free(cv->path);
	free(cv);
}

enum ow_status ow_canvas_status(const struct ow_canvas *cv, struct ow_diag *d)
{
	if (!cv)
		return ow_diag_set(d, OW_EARG, "canvas: NULL");
	if (cv->st != OW_OK)
		ow_diag_set(d, cv->st, "%s", cv->diag.msg);
	return cv->st;
}

/* Calls after the image was encoded, or after a failure, do nothing. */
static int live(struct ow_canvas *cv)
{
	if (!cv)
		return 0;
	if (cv->finished) {
		ow_canvas_fail(cv, OW_EARG,
		               "canvas: drawing after the image "
		               "was written");
		return 0;
	}
	return cv->st == OW_OK;
}

enum ow_status ow_canvas_encode(struct ow_canvas *cv, unsigned char **bytes,
                                size_t *len, struct ow_diag *d)
{
	enum ow_status st;

	if (!cv || !bytes || !len)
		return ow_diag_set(d, OW_EARG, "canvas: NULL argument");
	*bytes = NULL;
	*len = 0;
	if (!cv->ops->encode)
		return ow_diag_set(d, OW_EARG,
		                   "canvas: a PDF canvas has no "
		                   "image to encode");
	if (cv->finished)
		return ow_diag_set(d, OW_EARG, "canvas: image already written");
	if (cv->st != OW_OK)
		return ow_canvas_status(cv, d);
	while (cv->depth > 0)
		ow_canvas_restore(cv);
	cv->finished = 1;
	st = cv->ops->encode(cv, bytes, len, d);
	return st;
}

enum ow_status ow_canvas_write_file(struct ow_canvas *cv, const char *path,
                                    struct ow_diag *d)
{
	unsigned char *b = NULL;
	size_t n = 0;
	enum ow_status st;

	if (!path)
		return ow_diag_set(d, OW_EARG, "canvas: no file name");
	st = ow_canvas_encode(cv, &b, &n, d);
	if (st == OW_OK)
		st = ow_io_write_file(path, (const char *)b, n, d);
	free(b);
	return st;
}

/* --- state ------------------------------------------------------------ */

void ow_canvas_save(struct ow_canvas *cv)
{
	if (!live(cv))
		return;
	if (cv->depth >= CANVAS_MAX_DEPTH) {
		ow_canvas_fail(cv, OW_EARG,
		               "canvas: save nested deeper than %d",
		               CANVAS_MAX_DEPTH);
		return;
	}
	cv->stack[cv->depth++] = cv->gs;
	cv->ops->save(cv);
}

void ow_canvas_restore(struct ow_canvas *cv)
{
	if (!live(cv))
		return;
	if (cv->depth <= 0) {
		ow_canvas_fail(cv, OW_EARG, "canvas: restore without save");
		return;
	}
	cv->gs = cv->stack[--cv->depth];
	cv->n_path = 0; /* a path does not survive a restore */
	cv->ops->restore(cv);
}

static double clamp01(double v)
{
	return isfinite(v) ? fmin(1.0, fmax(0.0, v)) : 0.0;
}

void ow_canvas_set_colour(struct ow_canvas *cv, struct ow_rgba c)
{
	if (!live(cv))
		return;
	cv->gs.colour.r = clamp01(c.r);
	cv->gs.colour.g = clamp01(c.g);
	cv->gs.colour.b = clamp01(c.b);
	cv->gs.colour.a = clamp01(c.a);
}

void ow_canvas_set_line_width(struct ow_canvas *cv, double width_pt)
{
	if (!live(cv))
		return;
	if (!(width_pt >= 0.0 && width_pt < 1000.0)) {
		ow_canvas_fail(cv, OW_EARG, "canvas: line width %g pt",
		               width_pt);
		return;
	}
	cv->gs.line_width = width_pt;
}

void ow_canvas_set_dash(struct ow_canvas *cv, const double *lengths_pt, int n)
{
	int i;

	if (!live(cv))
		return;
	if (n < 0 || n > CANVAS_MAX_DASH || (n > 0 && !lengths_pt)) {
		ow_canvas_fail(cv, OW_EARG,
		               "canvas: dash of %d lengths (at most "
		               "%d)",
		               n, CANVAS_MAX_DASH);
		return;
	}
	for (i = 0; i < n; i++)
		if (!(lengths_pt[i] > 0.0 && lengths_pt[i] < 1000.0)) {
			ow_canvas_fail(cv, OW_EARG, "canvas: dash length %g pt",
			               lengths_pt[i]);
			return;
		}
	if (n > 0)
		memcpy(cv->gs.dash, lengths_pt, (size_t)n * sizeof *lengths_pt);
	cv->gs.n_dash = n;
}

void ow_canvas_set_font(struct ow_canvas *cv, double size_pt, int bold)
{
	if (!live(cv))
		return;
	if (!(size_pt > 0.0 && size_pt < 1000.0)) {
		ow_canvas_fail(cv, OW_EARG, "canvas: font size %g pt", size_pt);
		return;
	}
	cv->gs.font_pt = size_pt;
	cv->gs.bold = bold != 0;
}

/* --- paths ------------------------------------------------------------ */

static struct canvas_seg *push(struct ow_canvas *cv, enum canvas_op op)
{
	struct canvas_seg *s;

	if (!live(cv))
		return NULL;
	if (cv->n_path == cv->cap_path) {
		int cap = cv->cap_path ? 2 * cv->cap_path : 64;
		struct canvas_seg *p =
		    realloc(cv->path, (size_t)cap * sizeof *p);

		if (!p) {
			ow_canvas_fail(cv, OW_ENOMEM, "canvas: out of memory");
			return NULL;
		}
		cv->path = p;
		cv->cap_path = cap;
	}
	s = &cv->path[cv->n_path++];
	s->op = op;
	return s;
}

static int finite2(struct ow_canvas *cv, double x, double y)
{
	if (isfinite(x) && isfinite(y))
		return 1;
	if (cv)
		ow_canvas_fail(cv, OW_EARG, "canvas: non-finite coordinate");
	return 0;
}

static void seg2(struct ow_canvas *cv, enum canvas_op op, double x, double y)
{
	struct canvas_seg *s;

	if (!finite2(cv, x, y))
		return;
	s = push(cv, op);
	if (!s)
		return;
	s->p[0] = x;
	s->p[1] = y;
}

void ow_canvas_move_to(struct ow_canvas *cv, double x, double y)
{
	seg2(cv, CANVAS_MOVE, x, y);
}

void ow_canvas_line_to(struct ow_canvas *cv, double x, double y)
{
	seg2(cv, CANVAS_LINE, x, y);
}

void ow_canvas_curve_to(struct ow_canvas *cv, double x1, double y1, double x2,
                        double y2, double x3, double y3)
{
	struct canvas_seg *s;

	if (!finite2(cv, x1, y1) || !finite2(cv, x2, y2) ||
	    !finite2(cv, x3, y3))
		return;
	s = push(cv, CANVAS_CURVE);
	if (!s)
		return;
	s->p[0] = x1, s->p[1] = y1, s->p[2] = x2;
	s->p[3] = y2, s->p[4] = x3, s->p[5] = y3;
}

void ow_canvas_close_path(struct ow_canvas *cv)
{
	push(cv, CANVAS_CLOSE);
}

void ow_canvas_rect(struct ow_canvas *cv, double x, double y, double w,
                    double h)
{
	ow_canvas_move_to(cv, x, y);
	ow_canvas_line_to(cv, x + w, y);
	ow_canvas_line_to(cv, x + w, y + h);
	ow_canvas_line_to(cv, x, y + h);
	ow_canvas_close_path(cv);
}

/* Four cubic arcs, counter-clockwise as seen. */
void ow_canvas_circle(struct ow_canvas *cv, double cx, double cy, double r)
{
	double k = KAPPA * r;

	ow_canvas_move_to(cv, cx + r, cy);
	ow_canvas_curve_to(cv, cx + r, cy - k, cx + k, cy - r, cx, cy - r);
	ow_canvas_curve_to(cv, cx - k, cy - r, cx - r, cy - k, cx - r, cy);
	ow_canvas_curve_to(cv, cx - r, cy + k, cx - k, cy + r, cx, cy + r);
	ow_canvas_curve_to(cv, cx + k, cy + r, cx + r, cy + k, cx + r, cy);
	ow_canvas_close_path(cv);
}

void ow_canvas_new_path(struct ow_canvas *cv)
{
	if (cv)
		cv->n_path = 0;
}

static void paint(struct ow_canvas *cv, enum canvas_paint op, int keep)
{
	if (!live(cv))
		return;
	if (cv->n_path > 0)
		cv->ops->paint(cv, op);
	if (!keep)
		cv->n_path = 0;
}

void ow_canvas_fill(struct ow_canvas *cv)
{
	paint(cv, CANVAS_FILL, 0);
}

void ow_canvas_fill_preserve(struct ow_canvas *cv)
{
	paint(cv, CANVAS_FILL, 1);
}

void ow_canvas_stroke(struct ow_canvas *cv)
{
	paint(cv, CANVAS_STROKE, 0);
}

void ow_canvas_stroke_preserve(struct ow_canvas *cv)
{
	paint(cv, CANVAS_STROKE, 1);
}

/* An empty clip path clips everything away, as in PostScript. */
void ow_canvas_clip(struct ow_canvas *cv)
{
	if (!live(cv))
		return;
	if (cv->n_path == 0)
		ow_canvas_rect(cv, -10, -10, 0, 0);
	paint(cv, CANVAS_CLIP, 0);
}

void ow_canvas_clip_rect(struct ow_canvas *cv, double x, double y, double w,
                         double h)
{
	if (!live(cv))
		return;
	cv->n_path = 0;
	ow_canvas_rect(cv, x, y, w, h);
	ow_canvas_clip(cv);
}

/* Extent of the recorded path (control points included). */
static int path_box(const struct ow_canvas *cv, double *x0, double *y0,
                    double *x1, double *y1)
{
	int i, k, n = 0;

	*x0 = *y0 = INFINITY;
	*x1 = *y1 = -INFINITY;
	for (i = 0; i < cv->n_path; i++) {
		const struct canvas_seg *s = &cv->path[i];
		int np = s->op == CANVAS_CURVE   ? 3
		         : s->op == CANVAS_CLOSE ? 0
		                                 : 1;

		for (k = 0; k < np; k++, n++) {
			*x0 = fmin(*x0, s->p[2 * k]);
			*x1 = fmax(*x1, s->p[2 * k]);
			*y0 = fmin(*y0, s->p[2 * k + 1]);
			*y1 = fmax(*y1, s->p[2 * k + 1]);
		}
	}
	return n > 0;
}

/* Hatch lines at whole multiples of the spacing from the canvas origin,
 * so neighbouring regions with the same hatch line up. */
static void hatch_lines(struct ow_canvas *cv, const struct ow_hatch *h,
                        double x0, double y0, double x1, double y1)
{
	double a = h->angle_deg * OW_PI / 180.0;
	double ux = cos(a), uy = -sin(a); /* along the lines (y down) */
	double nx = -uy, ny = ux;         /* across them */
	double c[4][2] = {{x0, y0}, {x1, y0}, {x0, y1}, {x1, y1}};
	double lo = INFINITY, hi = -INFINITY, len;
	long k, k0, k1;
	int i;

	for (i = 0; i < 4; i++) {
		double t = c[i][0] * nx + c[i][1] * ny;

		lo = fmin(lo, t);
		hi = fmax(hi, t);
	}
	len = hypot(x1 - x0, y1 - y0) + 1.0;
	k0 = (long)floor(lo / h->spacing_pt);
	k1 = (long)ceil(hi / h->spacing_pt);
	for (k = k0; k <= k1; k++) {
		double t = (double)k * h->spacing_pt;
		double mx = 0.5 * (x0 + x1), my = 0.5 * (y0 + y1);
		double s = t - (mx * nx + my * ny); /* move the mid to line k */
		double px = mx + s * nx, py = my + s * ny;

		ow_canvas_move_to(cv, px - len * ux, py - len * uy);
		ow_canvas_line_to(cv, px + len * ux, py + len * uy);
	}
}

void ow_canvas_hatch(struct ow_canvas *cv, const struct ow_hatch *h)
{
	double x0, y0, x1, y1;

	if (!live(cv))
		return;
	if (!h || !(h->spacing_pt >= 0.5) || !(h->width_pt > 0.0) ||
	    !isfinite(h->angle_deg)) {
		ow_canvas_fail(cv, OW_EARG,
		               "canvas: hatch needs a spacing of at "
		               "least 0.5 pt and a positive width");
		return;
	}
	if (!path_box(cv, &x0, &y0, &x1, &y1) ||
	    (x1 - x0) * (y1 - y0) / (h->spacing_pt * h->spacing_pt) > 4e6) {
		cv->n_path = 0;
		return;
	}
	ow_canvas_save(cv);
	ow_canvas_clip(cv);
	hatch_lines(cv, h, x0, y0, x1, y1);
	ow_canvas_set_colour(cv, h->colour);
	ow_canvas_set_line_width(cv, h->width_pt);
	ow_canvas_set_dash(cv, NULL, 0);
	ow_canvas_stroke(cv);
	ow_canvas_restore(cv);
}

/* --- text ------------------------------------------------------------- */

double ow_canvas_text_width(struct ow_canvas *cv, const char *utf8)
{
	if (!live(cv) || !utf8 || !*utf8)
		return 0.0;
	return cv->ops->text_width(cv, utf8);
}

void ow_canvas_text(struct ow_canvas *cv, double x, double y, const char *utf8,
                    enum ow_halign ha, enum ow_valign va, double angle_deg)
{
	double w, dx, dy, size;

	if (!live(cv) || !utf8 || !*utf8)
		return;
	if (!finite2(cv, x, y) || !isfinite(angle_deg))
		return;
	size = cv->gs.font_pt;
	w = cv->ops->text_width(cv, utf8);
	dx = ha == OW_ALIGN_CENTRE ? -0.5 * w : ha == OW_ALIGN_RIGHT ? -w : 0.0;
	dy = va == OW_VALIGN_TOP      ? CANVAS_CAP_EM * size
	     : va == OW_VALIGN_MIDDLE ? 0.5 * CANVAS_CAP_EM * size
	     : va == OW_VALIGN_BOTTOM ? -CANVAS_DESC_EM * size
	                              : 0.0;
	cv->ops->text(cv, x, y, angle_deg * OW_PI / 180.0, dx, dy, utf8);
}
