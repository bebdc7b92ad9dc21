/* canvas_pdf.c - the libharu back-end of the canvas: vector paths and
 * UTF-8 text drawn onto a rectangle of a page of the caller's document.
 * Canvas points (y down, origin top-left of the canvas) are mapped to page
 * points (y up) here, so plot code is the same for images and the PDF.
 *
 * libharu refuses colour changes while a path is open, so every paint
 * sets its state first and then replays the recorded path; alpha goes
 * through ExtGState objects (one per distinct alpha, cached). */
#include "canvas_impl.h"

#include <hpdf.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MAX_ALPHAS 16

struct pdf_impl {
	HPDF_Doc doc;
	HPDF_Page page;
	HPDF_Font font[2];
	double ox, oy, s, page_h;           /* placement, scale, page height */
	double alpha[CANVAS_MAX_DEPTH + 1]; /* alpha in force per level */
	int n_alphas;
	double alpha_v[MAX_ALPHAS];
	HPDF_ExtGState alpha_gs[MAX_ALPHAS];
	int open; /* our outer GSave is open */
};

static int ok(struct ow_canvas *cv, HPDF_STATUS r, const char *what)
{
	if (r == HPDF_OK)
		return 1;
	ow_canvas_fail(cv, OW_EIO, "PDF: libharu refused %s (error 0x%04X)",
	               what, (unsigned)r);
	return 0;
}

static HPDF_REAL X(const struct pdf_impl *im, double x)
{
	return (HPDF_REAL)(im->ox + im->s * x);
}

static HPDF_REAL Y(const struct pdf_impl *im, double y)
{
	return (HPDF_REAL)(im->page_h - im->oy - im->s * y);
}

static HPDF_ExtGState alpha_state(struct ow_canvas *cv, double a)
{
	struct pdf_impl *im = cv->impl;
	int i;

	for (i = 0; i < im->n_alphas; i++)
		if (im->alpha_v[i] == a)
			return im->alpha_gs[i];
	if (im->n_alphas == MAX_ALPHAS)
		i = MAX_ALPHAS - 1; /* reuse the last slot */
	else
		i = im->n_alphas++;
	im->alpha_gs[i] = HPDF_CreateExtGState(im->doc);
	im->alpha_v[i] = a;
	if (!im->alpha_gs[i] ||
	    !ok(cv, HPDF_ExtGState_SetAlphaFill(im->alpha_gs[i], (HPDF_REAL)a),
	        "an alpha") ||
	    !ok(cv,
	        HPDF_ExtGState_SetAlphaStroke(im->alpha_gs[i], (HPDF_REAL)a),
	        "an alpha")) {
		ow_canvas_fail(cv, OW_EIO,
		               "PDF: libharu refused an alpha state");
		im->n_alphas = i; /* do not cache a broken one */
		return NULL;
	}
	return im->alpha_gs[i];
}

/* Colour (and alpha) of fills, strokes and text. */
static int set_colour(struct ow_canvas *cv, int stroke)
{
	struct pdf_impl *im = cv->impl;
	const struct ow_rgba *c = &cv->gs.colour;
	HPDF_STATUS r;

	if (c->a != im->alpha[cv->depth]) {
		HPDF_ExtGState g = alpha_state(cv, c->a);

		if (!g || !ok(cv, HPDF_Page_SetExtGState(im->page, g), "alpha"))
			return 0;
		im->alpha[cv->depth] = c->a;
	}
	if (stroke)
		r = HPDF_Page_SetRGBStroke(im->page, (HPDF_REAL)c->r,
		                           (HPDF_REAL)c->g, (HPDF_REAL)c->b);
	else
		r = HPDF_Page_SetRGBFill(im->page, (HPDF_REAL)c->r,
		                         (HPDF_REAL)c->g, (HPDF_REAL)c->b);
	return ok(cv, r, "a colour");
}

static int set_stroke(struct ow_canvas *cv)
{
	struct pdf_impl *im = cv->impl;
	HPDF_UINT16 dash[CANVAS_MAX_DASH];
	int k;

	for (k = 0; k < cv->gs.n_dash; k++) {
		double v = fmin(fmax(round(cv->gs.dash[k] * im->s), 1.0),
		                (double)HPDF_MAX_DASH_PATTERN);

		dash[k] = (HPDF_UINT16)v; /* libharu: whole points */
	}
	return set_colour(cv, 1) &&
	       ok(cv,
	          HPDF_Page_SetLineWidth(
	              im->page, (HPDF_REAL)(cv->gs.line_width * im->s)),
	          "a line width") &&
	       ok(cv,
	          HPDF_Page_SetDash(im->page, cv->gs.n_dash ? dash : NULL,
	                            (HPDF_UINT)cv->gs.n_dash, 0),
	          "a dash");
}

static int replay(struct ow_canvas *cv)
{
	struct pdf_impl *im = cv->impl;
	HPDF_STATUS r = HPDF_OK;
	int i, have = 0; /* a current point exists */

	for (i = 0; i < cv->n_path && r == HPDF_OK; i++) {
		const double *p = cv->path[i].p;

		switch (cv->path[i].op) {
		case CANVAS_MOVE:
			r = HPDF_Page_MoveTo(im->page, X(im, p[0]),
			                     Y(im, p[1]));
			have = 1;
			break;
		case CANVAS_LINE:
			r = have ? HPDF_Page_LineTo(im->page, X(im, p[0]),
			                            Y(im, p[1]))
			         : HPDF_Page_MoveTo(im->page, X(im, p[0]),
			                            Y(im, p[1]));
			have = 1;
			break;
		case CANVAS_CURVE:
			if (!have)
				r = HPDF_Page_MoveTo(im->page, X(im, p[0]),
				                     Y(im, p[1]));
			if (r == HPDF_OK)
				r = HPDF_Page_CurveTo(im->page, X(im, p[0]),
				                      Y(im, p[1]), X(im, p[2]),
				                      Y(im, p[3]), X(im, p[4]),
				                      Y(im, p[5]));
			have = 1;
			break;
		case CANVAS_CLOSE:
			if (have)
				r = HPDF_Page_ClosePath(im->page);
			break;
		}
	}
	return ok(cv, r, "a path");
}

static void pdf_paint(struct ow_canvas *cv, enum canvas_paint op)
{
	struct pdf_impl *im = cv->impl;

	switch (op) {
	case CANVAS_FILL:
		if (set_colour(cv, 0) && replay(cv))
			ok(cv, HPDF_Page_Fill(im->page), "a fill");
		break;
	case CANVAS_STROKE:
		if (set_stroke(cv) && replay(cv))
			ok(cv, HPDF_Page_Stroke(im->page), "a stroke");
		break;
	case CANVAS_CLIP:
		if (replay(cv) && ok(cv, HPDF_Page_Clip(im->page), "a clip"))
			ok(cv, HPDF_Page_EndPath(im->page), "a clip");
		break;
	}
}

static void pdf_save(struct ow_canvas *cv)
{
	struct pdf_impl *im = cv->impl;

	im->alpha[cv->depth] = im->alpha[cv->depth - 1];
	ok(cv, HPDF_Page_GSave(im->page), "GSave");
}

static void pdf_restore(struct ow_canvas *cv)
{
	ok(cv, HPDF_Page_GRestore(((struct pdf_impl *)cv->impl)->page),
	   "GRestore");
}

static void pdf_text(struct ow_canvas *cv, double x, double y, double angle_rad,
                     double dx, double dy, const char *s)
{
	struct pdf_impl *im = cv->impl;
	double c = cos(angle_rad), sn = sin(angle_rad);
	/* page frame, y up: along the text u = (c, sn), up v = (-sn, c) */
	double px = X(im, x) + im->s * (dx * c + dy * sn);
	double py = Y(im, y) + im->s * (dx * sn - dy * c);

	if (!set_colour(cv, 0) ||
	    !ok(cv, HPDF_Page_BeginText(im->page), "BeginText"))
		return;
	if (ok(cv,
	       HPDF_Page_SetFontAndSize(im->page, im->font[cv->gs.bold ? 1 : 0],
	                                (HPDF_REAL)(cv->gs.font_pt * im->s)),
	       "a font") &&
	    ok(cv,
	       HPDF_Page_SetTextMatrix(im->page, (HPDF_REAL)c, (HPDF_REAL)sn,
	                               (HPDF_REAL)-sn, (HPDF_REAL)c,
	                               (HPDF_REAL)px, (HPDF_REAL)py),
	       "a text matrix"))
		ok(cv, HPDF_Page_ShowText(im->page, s), "a text");
	ok(cv, HPDF_Page_EndText(im->page), "EndText");
}

/* libharu's widths come from the font's own metrics, in 1/1000 em. */
static double pdf_text_width(struct ow_canvas *cv, const char *s)
{
	struct pdf_impl *im = cv->impl;
	HPDF_TextWidth tw =
	    HPDF_Font_TextWidth(im->font[cv->gs.bold ? 1 : 0],
	                        (const HPDF_BYTE *)s, (HPDF_UINT)strlen(s));

	return (double)tw.width * cv->gs.font_pt / 1000.0;
}

static void pdf_destroy(struct ow_canvas *cv)
{
	struct pdf_impl *im = cv->impl;

	if (!im)
		return;
	/* close what plot code left open, then our own outer state */
	for (; cv->depth > 0; cv->depth--)
		HPDF_Page_GRestore(im->page);
	if (im->open)
		HPDF_Page_GRestore(im->page);
	free(im);
	cv->impl = NULL;
}

static const struct canvas_ops pdf_ops = {
    pdf_paint,      pdf_save, pdf_restore, pdf_text,
    pdf_text_width, NULL,     pdf_destroy,
};

enum ow_status ow_canvas_create_pdf(void *hpdf_doc, void *hpdf_page,
                                    const struct ow_canvas_fonts *fonts,
                                    const struct ow_canvas_place *place,
                                    double width_pt, double height_pt,
                                    struct ow_canvas **out, struct ow_diag *d)
{
	struct ow_canvas *cv;
	struct pdf_impl *im;

	if (!out)
		return ow_diag_set(d, OW_EARG, "canvas: no output pointer");
	*out = NULL;
	if (!hpdf_doc || !hpdf_page || !fonts || !fonts->regular ||
	    !fonts->bold || !place || !(place->scale > 0.0) ||
	    !(width_pt >= 1.0 && height_pt >= 1.0))
		return ow_diag_set(d, OW_EARG,
		                   "PDF canvas: missing document, "
		                   "page, fonts, placement or size");
	cv = ow_canvas_new(&pdf_ops, width_pt, height_pt);
	im = calloc(1, sizeof *im);
	if (!cv || !im) {
		free(cv);
		free(im);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	cv->impl = im;
	im->doc = hpdf_doc;
	im->page = hpdf_page;
	im->font[0] = fonts->regular;
	im->font[1] = fonts->bold;
	im->ox = place->x_pt;
	im->oy = place->y_pt;
	im->s = place->scale;
	im->page_h = HPDF_Page_GetHeight(im->page);
	im->alpha[0] = 1.0;
	im->open = HPDF_Page_GSave(im->page) == HPDF_OK;
	if (!im->open || HPDF_Page_SetLineJoin(im->page, HPDF_ROUND_JOIN) ||
	    HPDF_Page_SetLineCap(im->page, HPDF_BUTT_END)) {
		ow_canvas_destroy(cv);
		return ow_diag_set(d, OW_EIO,
		                   "PDF canvas: libharu refused "
		                   "the page (is a path or text open?)");
	}
	*out = cv;
	return OW_OK;
}

static int file_exists(const char *path)
{
	FILE *f = fopen(path, "rb");

	if (!f)
		return 0;
	fclose(f);
	return 1;
}

enum ow_status ow_canvas_pdf_fonts(void *hpdf_doc, struct ow_canvas_fonts *out,
                                   struct ow_diag *d)
{
	static const char *const file[2] = {OW_FONT_REGULAR_FILE,
	                                    OW_FONT_BOLD_FILE};
	HPDF_Font f[2];
	int i;

	if (!hpdf_doc || !out)
		return ow_diag_set(d, OW_EARG, "PDF fonts: NULL argument");
	for (i = 0; i < 2; i++)
		if (!file_exists(file[i]))
			return ow_diag_set(d, OW_EIO,
			                   "font %s is missing: "
			                   "install the Debian package "
			                   "fonts-dejavu-core",
			                   file[i]);
	if (HPDF_UseUTFEncodings(hpdf_doc) != HPDF_OK ||
	    HPDF_SetCurrentEncoder(hpdf_doc, "UTF-8") != HPDF_OK)
		return ow_diag_set(d, OW_EIO,
		                   "PDF fonts: libharu has no "
		                   "UTF-8 encoder");
	for (i = 0; i < 2; i++) {
		const char *name =
		    HPDF_LoadTTFontFromFile(hpdf_doc, file[i], HPDF_TRUE);

		f[i] = name ? HPDF_GetFont(hpdf_doc, name, "UTF-8") : NULL;
		if (!f[i])
			return ow_diag_set(d, OW_EIO,
			                   "font %s: libharu could "
			                   "not load it",
			                   file[i]);
	}
	out->regular = f[0];
	out->bold = f[1];
	return OW_OK;
}
