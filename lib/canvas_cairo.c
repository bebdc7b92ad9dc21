/* canvas_cairo.c - the PNG back-end of the canvas over cairo, and the
 * DejaVu Sans faces loaded through FreeType (unhinted) that it and the SVG
 * back-end's text measure share: the picture then does not depend on the
 * machine's font configuration, and the same inputs give the same bytes. */
#include "canvas_impl.h"

#include <cairo-ft.h>
#include <cairo.h>
#include <ft2build.h>
#include FT_FREETYPE_H
#include <math.h>
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

/* The FreeType library and faces are freed by cairo's destroy callback
 * when cairo lets go of the last face: cairo may hold a face in its font
 * caches after we destroy it, possibly until another thread evicts it,
 * hence the atomic count. */
struct ft_shared {
	FT_Library lib;
	FT_Face face[2];
	atomic_int refs;
};

struct canvas_ft {
	struct ft_shared *sh;
	cairo_font_face_t *cface[2];
};

static const char *const font_file[2] = {OW_FONT_REGULAR_FILE,
                                         OW_FONT_BOLD_FILE};
static const cairo_user_data_key_t face_key; /* its address is the key */

static void shared_release(void *p)
{
	struct ft_shared *sh = p;
	int i;

	if (atomic_fetch_sub(&sh->refs, 1) != 1)
		return;
	for (i = 0; i < 2; i++)
		if (sh->face[i])
			FT_Done_Face(sh->face[i]);
	if (sh->lib)
		FT_Done_FreeType(sh->lib);
	free(sh);
}

void canvas_ft_close(struct canvas_ft *f)
{
	int i;

	if (!f)
		return;
	for (i = 0; i < 2; i++)
		if (f->cface[i])
			cairo_font_face_destroy(f->cface[i]);
	if (f->sh)
		shared_release(f->sh); /* our own reference */
	free(f);
}

static enum ow_status open_face(struct canvas_ft *f, int i, struct ow_diag *d)
{
	struct ft_shared *sh = f->sh;

	if (FT_New_Face(sh->lib, font_file[i], 0, &sh->face[i]) != 0) {
		sh->face[i] = NULL;
		return ow_diag_set(d, OW_EIO,
		                   "font %s is missing or "
		                   "unreadable: install the Debian package "
		                   "fonts-dejavu-core",
		                   font_file[i]);
	}
	f->cface[i] = cairo_ft_font_face_create_for_ft_face(sh->face[i],
	                                                    FT_LOAD_NO_HINTING);
	atomic_fetch_add(&sh->refs, 1);
	if (cairo_font_face_set_user_data(f->cface[i], &face_key, sh,
	                                  shared_release) !=
	    CAIRO_STATUS_SUCCESS) {
		atomic_fetch_sub(&sh->refs, 1);
		return ow_diag_set(d, OW_EIO, "font %s: cairo refused it",
		                   font_file[i]);
	}
	return OW_OK;
}

enum ow_status canvas_ft_open(struct canvas_ft **out, struct ow_diag *d)
{
	struct canvas_ft *f = calloc(1, sizeof *f);
	enum ow_status st = OW_OK;
	int i;

	*out = NULL;
	if (!f || !(f->sh = calloc(1, sizeof *f->sh))) {
		free(f);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	atomic_init(&f->sh->refs, 1);
	if (FT_Init_FreeType(&f->sh->lib) != 0) {
		f->sh->lib = NULL;
		st = ow_diag_set(d, OW_EIO, "FreeType could not be started");
		goto fail;
	}
	for (i = 0; i < 2; i++) {
		st = open_face(f, i, d);
		if (st != OW_OK)
			goto fail;
	}
	*out = f;
	return OW_OK;
fail:
	canvas_ft_close(f);
	return st;
}

void *canvas_ft_face(struct canvas_ft *f, int bold)
{
	return f->cface[bold ? 1 : 0];
}

void canvas_ft_select(void *cairo_cr, struct canvas_ft *f, int bold,
                      double size)
{
	cairo_t *cr = cairo_cr;
	cairo_font_options_t *o = cairo_font_options_create();

	/* no hinting: glyph shapes and advances as designed, the same in
	 * every back-end and at every scale */
	cairo_font_options_set_hint_style(o, CAIRO_HINT_STYLE_NONE);
	cairo_font_options_set_hint_metrics(o, CAIRO_HINT_METRICS_OFF);
	cairo_font_options_set_antialias(o, CAIRO_ANTIALIAS_GRAY);
	cairo_set_font_options(cr, o);
	cairo_font_options_destroy(o);
	cairo_set_font_face(cr, canvas_ft_face(f, bold));
	cairo_set_font_size(cr, size);
}

/* --- the PNG back-end ------------------------------------------------- */

struct png_impl {
	cairo_surface_t *surf;
	cairo_t *cr;
	struct canvas_ft *ft;
};

static cairo_t *cr_of(struct ow_canvas *cv)
{
	return ((struct png_impl *)cv->impl)->cr;
}

static void check(struct ow_canvas *cv)
{
	cairo_status_t s = cairo_status(cr_of(cv));

	if (s != CAIRO_STATUS_SUCCESS)
		canvas_fail(cv,
		            s == CAIRO_STATUS_NO_MEMORY ? OW_ENOMEM : OW_EIO,
		            "cairo: %s", cairo_status_to_string(s));
}

static void replay(cairo_t *cr, const struct ow_canvas *cv)
{
	int i;

	cairo_new_path(cr);
	for (i = 0; i < cv->n_path; i++) {
		const double *p = cv->path[i].p;

		switch (cv->path[i].op) {
		case CANVAS_MOVE:
			cairo_move_to(cr, p[0], p[1]);
			break;
		case CANVAS_LINE:
			cairo_line_to(cr, p[0], p[1]);
			break;
		case CANVAS_CURVE:
			cairo_curve_to(cr, p[0], p[1], p[2], p[3], p[4], p[5]);
			break;
		case CANVAS_CLOSE:
			cairo_close_path(cr);
			break;
		}
	}
}

static void source(cairo_t *cr, const struct ow_canvas *cv)
{
	const struct ow_rgba *c = &cv->gs.colour;

	cairo_set_source_rgba(cr, c->r, c->g, c->b, c->a);
}

static void png_paint(struct ow_canvas *cv, enum canvas_paint op)
{
	cairo_t *cr = cr_of(cv);

	replay(cr, cv);
	switch (op) {
	case CANVAS_FILL:
		source(cr, cv);
		cairo_set_fill_rule(cr, CAIRO_FILL_RULE_WINDING);
		cairo_fill(cr);
		break;
	case CANVAS_STROKE:
		source(cr, cv);
		cairo_set_line_width(cr, cv->gs.line_width);
		cairo_set_dash(cr, cv->gs.dash, cv->gs.n_dash, 0.0);
		cairo_stroke(cr);
		break;
	case CANVAS_CLIP:
		cairo_set_fill_rule(cr, CAIRO_FILL_RULE_WINDING);
		cairo_clip(cr);
		break;
	}
	check(cv);
}

static void png_save(struct ow_canvas *cv)
{
	cairo_save(cr_of(cv));
}

static void png_restore(struct ow_canvas *cv)
{
	cairo_restore(cr_of(cv));
	check(cv);
}

static void png_text(struct ow_canvas *cv, double x, double y, double angle_rad,
                     double dx, double dy, const char *s)
{
	struct png_impl *im = cv->impl;
	cairo_t *cr = im->cr;

	cairo_save(cr);
	canvas_ft_select(cr, im->ft, cv->gs.bold, cv->gs.font_pt);
	source(cr, cv);
	cairo_translate(cr, x, y);
	cairo_rotate(cr, -angle_rad); /* y down: counter-clockwise as seen */
	cairo_new_path(cr);
	cairo_move_to(cr, dx, dy);
	cairo_show_text(cr, s);
	cairo_restore(cr);
	check(cv);
}

static double png_text_width(struct ow_canvas *cv, const char *s)
{
	struct png_impl *im = cv->impl;
	cairo_text_extents_t e;

	cairo_save(im->cr);
	canvas_ft_select(im->cr, im->ft, cv->gs.bold, cv->gs.font_pt);
	cairo_text_extents(im->cr, s, &e);
	cairo_restore(im->cr);
	return e.x_advance;
}

/* Growing memory buffer for cairo_surface_write_to_png_stream. */
struct membuf {
	unsigned char *b;
	size_t n, cap;
};

static cairo_status_t to_mem(void *closure, const unsigned char *data,
                             unsigned int len)
{
	struct membuf *m = closure;

	if (m->n + len > m->cap) {
		size_t cap = m->cap ? m->cap : 65536;
		unsigned char *p;

		while (cap < m->n + len)
			cap *= 2;
		p = realloc(m->b, cap);
		if (!p)
			return CAIRO_STATUS_NO_MEMORY;
		m->b = p;
		m->cap = cap;
	}
	memcpy(m->b + m->n, data, len);
	m->n += len;
	return CAIRO_STATUS_SUCCESS;
}

static enum ow_status png_encode(struct ow_canvas *cv, unsigned char **bytes,
                                 size_t *len, struct ow_diag *d)
{
	struct png_impl *im = cv->impl;
	struct membuf m = {NULL, 0, 0};
	cairo_status_t s;

	cairo_surface_flush(im->surf);
	s = cairo_surface_write_to_png_stream(im->surf, to_mem, &m);
	if (s != CAIRO_STATUS_SUCCESS) {
		free(m.b);
		return ow_diag_set(
		    d, s == CAIRO_STATUS_NO_MEMORY ? OW_ENOMEM : OW_EIO,
		    "PNG encoding failed: %s", cairo_status_to_string(s));
	}
	*bytes = m.b;
	*len = m.n;
	return OW_OK;
}

static void png_destroy(struct ow_canvas *cv)
{
	struct png_impl *im = cv->impl;

	if (!im)
		return;
	if (im->cr)
		cairo_destroy(im->cr);
	if (im->surf)
		cairo_surface_destroy(im->surf);
	canvas_ft_close(im->ft);
	free(im);
	cv->impl = NULL;
}

static const struct canvas_ops png_ops = {
    png_paint,      png_save,   png_restore, png_text,
    png_text_width, png_encode, png_destroy,
};

enum ow_status canvas_cairo_png(double width_pt, double height_pt, double scale,
                                struct ow_canvas **out, struct ow_diag *d)
{
	struct ow_canvas *cv = canvas_new(&png_ops, width_pt, height_pt);
	struct png_impl *im = calloc(1, sizeof *im);
	int wpx = (int)ceil(width_pt * scale - 1e-9);
	int hpx = (int)ceil(height_pt * scale - 1e-9);
	enum ow_status st;

	if (!cv || !im) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	cv->impl = im;
	st = canvas_ft_open(&im->ft, d);
	if (st != OW_OK)
		goto fail;
	im->surf = cairo_image_surface_create(CAIRO_FORMAT_ARGB32, wpx, hpx);
	im->cr = cairo_create(im->surf);
	if (cairo_status(im->cr) != CAIRO_STATUS_SUCCESS) {
		st = ow_diag_set(d, OW_ENOMEM, "cairo: %s",
		                 cairo_status_to_string(cairo_status(im->cr)));
		goto fail;
	}
	cairo_scale(im->cr, scale, scale);
	cairo_set_line_join(im->cr, CAIRO_LINE_JOIN_ROUND);
	cairo_set_line_cap(im->cr, CAIRO_LINE_CAP_BUTT);
	*out = cv;
	return OW_OK;
fail:
	if (cv)
		ow_canvas_destroy(cv);
	else
		free(im);
	return st;
}
