/* canvas_svg.c - the SVG back-end of the canvas: SVG 1.1 written directly,
 * so labels stay real <text> elements (searchable, selectable, editable)
 * rather than the glyph outlines cairo's SVG surface would write. Text is
 * measured with the same unhinted DejaVu Sans faces as the PNG back-end
 * (canvas_cairo.c), so both lay out identically. Numbers are written
 * locale-independently with two decimals. */
#include "canvas_impl.h"
#include "ow_const.h"
#include "ow_io.h"

#include <cairo.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

struct svg_impl {
	struct ow_buf out;                /* the document so far */
	int clips;                        /* clip paths defined so far */
	int groups[CANVAS_MAX_DEPTH + 1]; /* <g> opened at each save level */
	cairo_surface_t *msurf;           /* 1 x 1 surface for text measure */
	cairo_t *mcr;
	struct canvas_ft *ft;
};

static void put(struct svg_impl *im, const char *s, size_t len)
{
	ow_buf_add(&im->out, s, len);
}

static void puts_(struct svg_impl *im, const char *s)
{
	put(im, s, strlen(s));
}

/* Integer formatting only: no locale can change the decimal point. */
static void num(struct svg_impl *im, double v)
{
	char buf[48];
	long long c = llround(fabs(v) * 100.0);
	int neg = v < 0.0 && c != 0;

	if (c % 100 == 0)
		snprintf(buf, sizeof buf, "%s%lld", neg ? "-" : "", c / 100);
	else if (c % 10 == 0)
		snprintf(buf, sizeof buf, "%s%lld.%lld", neg ? "-" : "",
		         c / 100, c % 100 / 10);
	else
		snprintf(buf, sizeof buf, "%s%lld.%02lld", neg ? "-" : "",
		         c / 100, c % 100);
	puts_(im, buf);
}

static void colour(struct svg_impl *im, const char *attr,
                   const struct ow_rgba *c)
{
	char buf[64];

	snprintf(buf, sizeof buf, " %s=\"#%02x%02x%02x\"", attr,
	         (unsigned)lround(c->r * 255.0), (unsigned)lround(c->g * 255.0),
	         (unsigned)lround(c->b * 255.0));
	puts_(im, buf);
	if (c->a < 1.0) {
		snprintf(buf, sizeof buf, " %s-opacity=\"", attr);
		puts_(im, buf);
		num(im, c->a);
		puts_(im, "\"");
	}
}

static void path_data(struct svg_impl *im, const struct ow_canvas *cv)
{
	static const char *const cmd[] = {"M", "L", "C", "Z"};
	int i, k;

	puts_(im, " d=\"");
	for (i = 0; i < cv->n_path; i++) {
		const struct canvas_seg *s = &cv->path[i];
		int np = s->op == CANVAS_CURVE   ? 6
		         : s->op == CANVAS_CLOSE ? 0
		                                 : 2;

		puts_(im, cmd[s->op]);
		for (k = 0; k < np; k++) {
			if (k)
				puts_(im, " ");
			num(im, s->p[k]);
		}
	}
	puts_(im, "\"");
}

static void svg_paint(struct ow_canvas *cv, enum canvas_paint op)
{
	struct svg_impl *im = cv->impl;
	char buf[64];
	int k;

	if (op == CANVAS_CLIP) {
		snprintf(buf, sizeof buf, "<clipPath id=\"c%d\"><path",
		         ++im->clips);
		puts_(im, buf);
		path_data(im, cv);
		snprintf(buf, sizeof buf,
		         "/></clipPath>\n<g clip-path="
		         "\"url(#c%d)\">\n",
		         im->clips);
		puts_(im, buf);
		im->groups[cv->depth]++;
		return;
	}
	puts_(im, "<path");
	path_data(im, cv);
	if (op == CANVAS_FILL) {
		colour(im, "fill", &cv->gs.colour);
	} else {
		puts_(im, " fill=\"none\"");
		colour(im, "stroke", &cv->gs.colour);
		puts_(im, " stroke-width=\"");
		num(im, cv->gs.line_width);
		puts_(im, "\"");
		if (cv->gs.n_dash > 0) {
			puts_(im, " stroke-dasharray=\"");
			for (k = 0; k < cv->gs.n_dash; k++) {
				if (k)
					puts_(im, ",");
				num(im, cv->gs.dash[k]);
			}
			puts_(im, "\"");
		}
	}
	puts_(im, "/>\n");
}

static void svg_save(struct ow_canvas *cv)
{
	struct svg_impl *im = cv->impl;

	im->groups[cv->depth] = 0; /* depth already counts this save */
}

static void svg_restore(struct ow_canvas *cv)
{
	struct svg_impl *im = cv->impl;
	int lvl = cv->depth + 1; /* the level being left */

	for (; im->groups[lvl] > 0; im->groups[lvl]--)
		puts_(im, "</g>\n");
}

static void escaped(struct svg_impl *im, const char *s)
{
	for (; *s; s++) {
		switch (*s) {
		case '&':
			puts_(im, "&amp;");
			break;
		case '<':
			puts_(im, "&lt;");
			break;
		case '>':
			puts_(im, "&gt;");
			break;
		case '"':
			puts_(im, "&quot;");
			break;
		default:
			put(im, s, 1);
		}
	}
}

static void svg_text(struct ow_canvas *cv, double x, double y, double angle_rad,
                     double dx, double dy, const char *s)
{
	struct svg_impl *im = cv->impl;

	puts_(im, "<text x=\"");
	num(im, dx);
	puts_(im, "\" y=\"");
	num(im, dy);
	puts_(im, "\" transform=\"translate(");
	num(im, x);
	puts_(im, " ");
	num(im, y);
	puts_(im, ")");
	if (angle_rad != 0.0) {
		puts_(im, " rotate(");
		num(im, -angle_rad * 180.0 / OW_PI);
		puts_(im, ")");
	}
	puts_(im, "\" font-family=\"DejaVu Sans, sans-serif\" font-size=\"");
	num(im, cv->gs.font_pt);
	puts_(im, cv->gs.bold ? "\" font-weight=\"bold\"" : "\"");
	colour(im, "fill", &cv->gs.colour);
	puts_(im, ">");
	escaped(im, s);
	puts_(im, "</text>\n");
}

static double svg_text_width(struct ow_canvas *cv, const char *s)
{
	struct svg_impl *im = cv->impl;
	cairo_text_extents_t e;

	ow_canvas_ft_select(im->mcr, im->ft, cv->gs.bold, cv->gs.font_pt);
	cairo_text_extents(im->mcr, s, &e);
	return e.x_advance;
}

static enum ow_status svg_encode(struct ow_canvas *cv, unsigned char **bytes,
                                 size_t *len, struct ow_diag *d)
{
	struct svg_impl *im = cv->impl;
	enum ow_status st;
	char *text = NULL;

	for (; im->groups[0] > 0; im->groups[0]--)
		puts_(im, "</g>\n");
	puts_(im, "</svg>\n");
	if (im->out.oom) {
		ow_buf_free(&im->out);
		return ow_diag_set(d, OW_ENOMEM, "SVG: out of memory");
	}
	st = ow_buf_take(&im->out, &text, len, d);
	*bytes = (unsigned char *)text;
	return st;
}

static void svg_destroy(struct ow_canvas *cv)
{
	struct svg_impl *im = cv->impl;

	if (!im)
		return;
	ow_buf_free(&im->out);
	if (im->mcr)
		cairo_destroy(im->mcr);
	if (im->msurf)
		cairo_surface_destroy(im->msurf);
	ow_canvas_ft_close(im->ft);
	free(im);
	cv->impl = NULL;
}

static const struct canvas_ops svg_ops = {
    svg_paint,      svg_save,   svg_restore, svg_text,
    svg_text_width, svg_encode, svg_destroy,
};

static void header(struct svg_impl *im, double w, double h)
{
	puts_(im, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
	          "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" "
	          "width=\"");
	num(im, w);
	puts_(im, "pt\" height=\"");
	num(im, h);
	puts_(im, "pt\" viewBox=\"0 0 ");
	num(im, w);
	puts_(im, " ");
	num(im, h);
	puts_(im, "\" stroke-linejoin=\"round\">\n");
}

enum ow_status ow_canvas_svg(double width_pt, double height_pt,
                             struct ow_canvas **out, struct ow_diag *d)
{
	struct ow_canvas *cv = ow_canvas_new(&svg_ops, width_pt, height_pt);
	struct svg_impl *im = calloc(1, sizeof *im);
	enum ow_status st;

	if (!cv || !im) {
		free(im);
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	cv->impl = im;
	st = ow_canvas_ft_open(&im->ft, d);
	if (st != OW_OK)
		goto fail;
	im->msurf = cairo_image_surface_create(CAIRO_FORMAT_A8, 1, 1);
	im->mcr = cairo_create(im->msurf);
	if (cairo_status(im->mcr) != CAIRO_STATUS_SUCCESS) {
		st = ow_diag_set(d, OW_ENOMEM, "cairo: out of memory");
		goto fail;
	}
	header(im, width_pt, height_pt);
	if (im->out.oom) {
		st = ow_diag_set(d, OW_ENOMEM, "SVG: out of memory");
		goto fail;
	}
	*out = cv;
	return OW_OK;
fail:
	ow_canvas_destroy(cv);
	return st;
}
