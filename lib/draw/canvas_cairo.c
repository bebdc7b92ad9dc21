/* canvas_cairo.c - the PNG back-end of the canvas over cairo (the file
 * encoded here with zlib), and the DejaVu Sans faces loaded through
 * FreeType (unhinted) that it and the SVG back-end's text measure share:
 * the picture then does not depend on the machine's font configuration,
 * and the same inputs give the same bytes. */
#include "canvas_impl.h"

#include <cairo-ft.h>
#include <cairo.h>
#include <ft2build.h>
#include FT_FREETYPE_H
#include <math.h>
#include <stdatomic.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <zlib.h>

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

void ow_canvas_ft_close(struct canvas_ft *f)
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

enum ow_status ow_canvas_ft_open(struct canvas_ft **out, struct ow_diag *d)
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
	ow_canvas_ft_close(f);
	return st;
}

/* cairo_font_face_t * of the weight (borrowed from f). */
static void *ft_face(struct canvas_ft *f, int bold)
{
	return f->cface[bold ? 1 : 0];
}

void ow_canvas_ft_select(void *cairo_cr, struct canvas_ft *f, int bold,
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
	cairo_set_font_face(cr, ft_face(f, bold));
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
		ow_canvas_fail(cv,
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
	ow_canvas_ft_select(cr, im->ft, cv->gs.bold, cv->gs.font_pt);
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
	ow_canvas_ft_select(im->cr, im->ft, cv->gs.bold, cv->gs.font_pt);
	cairo_text_extents(im->cr, s, &e);
	cairo_restore(im->cr);
	return e.x_advance;
}

/* --- PNG encoding --------------------------------------------------------
 *
 * PNG (ISO/IEC 15948:2004, W3C PNG 2nd ed.) written with zlib: 8-bit RGB
 * when every pixel is opaque, else RGBA (cairo's premultiplied ARGB32
 * undone as cairo does it), every scan line with the Up filter and the
 * stream deflated at PNG_LEVEL. Against libpng's defaults through cairo
 * (adaptive filter choice per line, level 6) this is about a tenth of the
 * work for files some 10 % larger: maps are flat colour fields and lines. */
#define PNG_LEVEL     2
#define PNG_FILTER_UP 2

static void put32(unsigned char *p, unsigned long v)
{
	p[0] = (unsigned char)(v >> 24);
	p[1] = (unsigned char)(v >> 16);
	p[2] = (unsigned char)(v >> 8);
	p[3] = (unsigned char)v;
}

/* Chunk of type `type` with len data bytes already at out + 8: writes the
 * length, the type and the CRC over type and data; returns its size. */
static size_t chunk(unsigned char *out, const char *type, size_t len)
{
	put32(out, (unsigned long)len);
	memcpy(out + 4, type, 4);
	put32(out + 8 + len,
	      crc32(crc32(0L, Z_NULL, 0), out + 4, (uInt)(len + 4)));
	return len + 12;
}

static int all_opaque(const unsigned char *px, int w, int h, int stride)
{
	uint32_t and = 0xffffffffu;
	int x, y;

	for (y = 0; y < h; y++) {
		const uint32_t *r = (const uint32_t *)(px + (size_t)y * stride);

		for (x = 0; x < w; x++)
			and &= r[x];
	}
	return and >> 24 == 0xff;
}

/* Scan line y (cairo's native-endian ARGB32, premultiplied) as RGB or
 * RGBA bytes, without the filter byte, into row. */
static void scan_line(const unsigned char *px, int stride, int w, int y,
                      int channels, unsigned char *row)
{
	const uint32_t *r = (const uint32_t *)(px + (size_t)y * stride);
	int x, k;

	if (channels == 3) {
		for (x = 0; x < w; x++, row += 3) {
			row[0] = (unsigned char)(r[x] >> 16);
			row[1] = (unsigned char)(r[x] >> 8);
			row[2] = (unsigned char)r[x];
		}
		return;
	}
	for (x = 0; x < w; x++, row += 4) {
		unsigned a = r[x] >> 24;

		for (k = 0; k < 3; k++) {
			unsigned c = (r[x] >> (16 - 8 * k)) & 0xff;

			row[k] = (unsigned char)(a == 0 ? 0
			                         : a == 0xff
			                             ? c
			                             : (c * 255 + a / 2) / a);
		}
		row[3] = (unsigned char)a;
	}
}

/* Filtered scan lines: Up (PNG 2nd ed. 9.2), each line minus the one
 * above, byte by byte. */
static unsigned char *filtered(const unsigned char *px, int stride, int w,
                               int h, int channels, size_t *len)
{
	size_t rl = (size_t)channels * (size_t)w, i;
	unsigned char *f = malloc((rl + 1) * (size_t)h), *prev = calloc(1, rl),
	              *cur = malloc(rl), *t;
	int y;

	if (!f || !prev || !cur) {
		free(f);
		f = NULL;
		goto done;
	}
	for (y = 0; y < h; y++) {
		unsigned char *o = f + (rl + 1) * (size_t)y;

		scan_line(px, stride, w, y, channels, cur);
		o[0] = PNG_FILTER_UP;
		for (i = 0; i < rl; i++)
			o[i + 1] = (unsigned char)(cur[i] - prev[i]);
		t = prev;
		prev = cur;
		cur = t;
	}
	*len = (rl + 1) * (size_t)h;
done:
	free(prev);
	free(cur);
	return f;
}

static enum ow_status png_encode(struct ow_canvas *cv, unsigned char **bytes,
                                 size_t *len, struct ow_diag *d)
{
	static const unsigned char sig[8] = {0x89, 'P',  'N',  'G',
	                                     '\r', '\n', 0x1a, '\n'};
	struct png_impl *im = cv->impl;
	const unsigned char *px;
	unsigned char *raw = NULL, *out = NULL;
	size_t n_raw = 0, pos;
	uLongf n_z;
	int w, h, stride, channels;

	cairo_surface_flush(im->surf);
	px = cairo_image_surface_get_data(im->surf);
	w = cairo_image_surface_get_width(im->surf);
	h = cairo_image_surface_get_height(im->surf);
	stride = cairo_image_surface_get_stride(im->surf);
	if (!px)
		return ow_diag_set(d, OW_EIO, "PNG encoding: no image");
	channels = all_opaque(px, w, h, stride) ? 3 : 4;
	raw = filtered(px, stride, w, h, channels, &n_raw);
	n_z = raw ? compressBound((uLong)n_raw) : 0;
	out = raw ? malloc(8 + 25 + 12 + n_z + 12) : NULL;
	if (!out) {
		free(raw);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	memcpy(out, sig, 8);
	put32(out + 16, (unsigned long)w); /* IHDR */
	put32(out + 20, (unsigned long)h);
	memcpy(out + 24, (unsigned char[]){8, channels == 3 ? 2 : 6, 0, 0, 0},
	       5);
	pos = 8 + chunk(out + 8, "IHDR", 13);
	if (compress2(out + pos + 8, &n_z, raw, (uLong)n_raw, PNG_LEVEL) !=
	    Z_OK) {
		free(raw);
		free(out);
		return ow_diag_set(d, OW_ENOMEM, "PNG encoding: zlib failed");
	}
	pos += chunk(out + pos, "IDAT", n_z);
	pos += chunk(out + pos, "IEND", 0);
	free(raw);
	*bytes = out;
	*len = pos;
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
	ow_canvas_ft_close(im->ft);
	free(im);
	cv->impl = NULL;
}

static const struct canvas_ops png_ops = {
    png_paint,      png_save,   png_restore, png_text,
    png_text_width, png_encode, png_destroy,
};

enum ow_status ow_canvas_cairo_png(double width_pt, double height_pt,
                                   double scale, struct ow_canvas **out,
                                   struct ow_diag *d)
{
	struct ow_canvas *cv = ow_canvas_new(&png_ops, width_pt, height_pt);
	struct png_impl *im = calloc(1, sizeof *im);
	int wpx = (int)ceil(width_pt * scale - 1e-9);
	int hpx = (int)ceil(height_pt * scale - 1e-9);
	enum ow_status st;

	if (!cv || !im) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	cv->impl = im;
	st = ow_canvas_ft_open(&im->ft, d);
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
