/* test_canvas.c - the drawing interface over its back-ends: PNG size and
 * byte-identical output, SVG text, text metrics, hatching, clipping,
 * sticky errors, and the PDF back-end read back with poppler's tools. */
#include "testutil.h"
#include "pngutil.h"
#include "pdfutil.h"

#include <cairo.h>
#include <hpdf.h>
#include <stdio.h>
#include <stdlib.h>
#include <stdint.h>
#include <string.h>
#include <unistd.h>

#include "ow_canvas.h"

/* Big-endian 32-bit number at b. */
static unsigned be32(const unsigned char *b)
{
	return (unsigned)b[0] << 24 | (unsigned)b[1] << 16 |
	       (unsigned)b[2] << 8 | (unsigned)b[3];
}

/* A small scene using every kind of call. */
static void scene(struct ow_canvas *cv)
{
	struct ow_hatch h = {45.0, 5.0, 0.8, {0.5, 0.0, 0.0, 1.0}};
	double dash[2] = {4.0, 2.0};

	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_rect(cv, 0, 0, 200, 100);
	ow_canvas_fill(cv);
	ow_canvas_set_colour(cv,
	                     ow_rgba_with_alpha(ow_rgb(0.8, 0.2, 0.1), 0.3));
	ow_canvas_rect(cv, 10, 10, 80, 50);
	ow_canvas_fill_preserve(cv);
	ow_canvas_hatch(cv, &h);
	ow_canvas_set_colour(cv, ow_rgb(0, 0, 0.5));
	ow_canvas_set_dash(cv, dash, 2);
	ow_canvas_set_line_width(cv, 1.5);
	ow_canvas_circle(cv, 150, 40, 25);
	ow_canvas_stroke(cv);
	ow_canvas_set_dash(cv, NULL, 0);
	ow_canvas_set_colour(cv, ow_rgb(0, 0, 0));
	ow_canvas_set_font(cv, 11, 1);
	ow_canvas_text(cv, 100, 90, "peak melt 240 °C", OW_ALIGN_CENTRE,
	               OW_VALIGN_BASELINE, 0);
	ow_canvas_set_font(cv, 9, 0);
	ow_canvas_text(cv, 8, 95, "set-point (°F)", OW_ALIGN_LEFT,
	               OW_VALIGN_MIDDLE, 90);
}

static void png_of(double w, double h, double scale, unsigned char **b,
                   size_t *n)
{
	struct ow_canvas *cv = NULL;
	struct ow_diag d = {{0}};

	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, w, h, scale, &cv, &d), OW_OK);
	scene(cv);
	assert_int_equal(ow_canvas_encode(cv, b, n, &d), OW_OK);
	ow_canvas_destroy(cv);
}

static void canvas_png_has_the_size_of_points_times_scale(void **state)
{
	unsigned char *b = NULL;
	size_t n = 0;

	(void)state;
	png_of(600.0, 433.3333333333333, 1.5, &b, &n);
	/* PNG signature, then IHDR: width and height (ISO/IEC 15948:2004,
	 * sections 5.2 and 11.2.2) */
	assert_true(n > 33);
	assert_memory_equal(b, "\x89PNG\r\n\x1a\n", 8);
	assert_memory_equal(b + 12, "IHDR", 4);
	assert_int_equal(be32(b + 16), 900);
	assert_int_equal(be32(b + 20), 650);
	free(b);
}

static void canvas_same_drawing_gives_byte_identical_png(void **state)
{
	unsigned char *a = NULL, *b = NULL;
	size_t na = 0, nb = 0;

	(void)state;
	png_of(200.0, 100.0, 2.0, &a, &na);
	png_of(200.0, 100.0, 2.0, &b, &nb);
	assert_int_equal(na, nb);
	assert_memory_equal(a, b, na);
	free(a);
	free(b);
}

static char *svg_of(void (*draw)(struct ow_canvas *), size_t *n)
{
	struct ow_canvas *cv = NULL;
	struct ow_diag d = {{0}};
	unsigned char *b = NULL;
	char *s;

	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 200, 100, 1.0, &cv, &d),
	    OW_OK);
	draw(cv);
	assert_int_equal(ow_canvas_encode(cv, &b, n, &d), OW_OK);
	ow_canvas_destroy(cv);
	s = realloc(b, *n + 1);
	assert_non_null(s);
	s[*n] = '\0';
	return s;
}

static void canvas_svg_keeps_labels_as_text(void **state)
{
	size_t n;
	char *s = svg_of(scene, &n);

	(void)state;
	assert_non_null(strstr(s, "<svg"));
	assert_non_null(strstr(s, ">peak melt 240 °C</text>"));
	assert_non_null(strstr(s, ">set-point (°F)</text>"));
	assert_non_null(strstr(s, "rotate(-90)"));
	assert_non_null(strstr(s, "font-weight=\"bold\""));
	assert_non_null(strstr(s, "</svg>"));
	free(s);
}

static void markup(struct ow_canvas *cv)
{
	ow_canvas_text(cv, 10, 10, "a<b & \"c\">d", OW_ALIGN_LEFT,
	               OW_VALIGN_TOP, 0);
}

static void canvas_svg_escapes_markup_in_text(void **state)
{
	size_t n;
	char *s = svg_of(markup, &n);

	(void)state;
	assert_non_null(strstr(s, ">a&lt;b &amp; &quot;c&quot;&gt;d</text>"));
	free(s);
}

static void canvas_text_width_scales_with_size_and_weight(void **state)
{
	struct ow_canvas *cv = NULL;
	double w10, w20, wb;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 100, 100, 1.0, &cv, NULL),
	    OW_OK);
	ow_canvas_set_font(cv, 10, 0);
	w10 = ow_canvas_text_width(cv, "screw speed (rpm)");
	ow_canvas_set_font(cv, 20, 0);
	w20 = ow_canvas_text_width(cv, "screw speed (rpm)");
	ow_canvas_set_font(cv, 10, 1);
	wb = ow_canvas_text_width(cv, "screw speed (rpm)");
	/* unhinted outlines scale exactly with the size */
	assert_rel(w20, 2.0 * w10, 1e-6);
	assert_true(wb > w10);
	/* DejaVu Sans averages roughly 0.55 em per character here (from
	 * its hmtx table; 17 characters at 10 pt) */
	assert_true(w10 > 0.4 * 10 * 17 && w10 < 0.7 * 10 * 17);
	assert_int_equal(ow_canvas_status(cv, NULL), OW_OK);
	ow_canvas_destroy(cv);
}

/* Grey level 0..255 and alpha of pixel (x, y). */
static int grey_at(cairo_surface_t *s, int x, int y, int *alpha)
{
	const unsigned char *p = cairo_image_surface_get_data(s) +
	                         y * cairo_image_surface_get_stride(s) + 4 * x;

	*alpha = p[3];
	return (p[0] + p[1] + p[2]) / 3; /* premultiplied BGRA */
}

static void hatch_scene(struct ow_canvas *cv)
{
	struct ow_hatch h = {30.0, 6.0, 1.0, {0, 0, 0, 1}};

	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_rect(cv, 0, 0, 100, 100);
	ow_canvas_fill(cv);
	ow_canvas_rect(cv, 20, 20, 60, 60);
	ow_canvas_hatch(cv, &h);
}

static void canvas_hatch_draws_lines_only_inside_the_path(void **state)
{
	struct ow_canvas *cv = NULL;
	unsigned char *b = NULL;
	size_t n = 0;
	cairo_surface_t *s;
	int x, y, a, dark = 0, light = 0, outside_dark = 0;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 100, 100, 1.0, &cv, NULL),
	    OW_OK);
	hatch_scene(cv);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	s = ow_test_png_decode(b, n);
	for (y = 0; y < 100; y++)
		for (x = 0; x < 100; x++) {
			int g = grey_at(s, x, y, &a);
			int in = x > 21 && x < 78 && y > 21 && y < 78;

			if (in && g < 100)
				dark++;
			if (in && g > 200)
				light++;
			if ((x < 18 || x > 82 || y < 18 || y > 82) && g < 250)
				outside_dark++;
		}
	/* 1 pt lines every 6 pt: about a sixth of the inside is ink */
	assert_true(dark > 300);
	assert_true(light > 1500);
	assert_int_equal(outside_dark, 0);
	cairo_surface_destroy(s);
	free(b);
	ow_canvas_destroy(cv);
}

static void canvas_clip_keeps_paint_inside_and_restore_lifts_it(void **state)
{
	struct ow_canvas *cv = NULL;
	unsigned char *b = NULL;
	size_t n = 0;
	cairo_surface_t *s;
	int a;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 40, 40, 1.0, &cv, NULL),
	    OW_OK);
	ow_canvas_save(cv);
	ow_canvas_clip_rect(cv, 0, 0, 20, 40);
	ow_canvas_set_colour(cv, ow_rgb(0, 0, 0));
	ow_canvas_rect(cv, 0, 0, 40, 20);
	ow_canvas_fill(cv);
	ow_canvas_restore(cv);
	ow_canvas_rect(cv, 0, 30, 40, 10);
	ow_canvas_fill(cv);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	s = ow_test_png_decode(b, n);
	grey_at(s, 10, 10, &a);
	assert_int_equal(a, 255); /* inside the clip: painted */
	grey_at(s, 30, 10, &a);
	assert_int_equal(a, 0); /* outside: untouched, transparent */
	grey_at(s, 30, 35, &a);
	assert_int_equal(a, 255); /* after restore: no clip */
	cairo_surface_destroy(s);
	free(b);
	ow_canvas_destroy(cv);
}

/* PNG stores colour without alpha premultiplied (W3C PNG 2nd ed., 2003,
 * sec. 12.8): half-transparent red is stored as R 255, A 128, which a
 * decoder into premultiplied ARGB32 (cairo) reads back as R 128; stored
 * premultiplied it would read back as R 64. */
static void canvas_png_stores_translucent_colour_unpremultiplied(void **st)
{
	struct ow_canvas *cv = NULL;
	unsigned char *b = NULL;
	size_t n = 0;
	cairo_surface_t *s;
	uint32_t px;

	(void)st;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 10, 10, 1.0, &cv, NULL),
	    OW_OK);
	ow_canvas_set_colour(cv, ow_rgba_with_alpha(ow_rgb(1, 0, 0), 0.5));
	ow_canvas_rect(cv, 0, 0, 10, 10);
	ow_canvas_fill(cv);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	s = ow_test_png_decode(b, n);
	memcpy(&px,
	       cairo_image_surface_get_data(s) +
	           5 * cairo_image_surface_get_stride(s) + 4 * 5,
	       4);
	assert_int_equal(px >> 24, 128);
	assert_in_range((px >> 16) & 0xff, 127, 129);
	assert_int_equal(px & 0xffff, 0);
	cairo_surface_destroy(s);
	free(b);
	ow_canvas_destroy(cv);
}

static void canvas_keeps_the_first_error_and_refuses_late_drawing(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_diag d = {{0}};
	unsigned char *b = NULL;
	size_t n = 0;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 10, 10, 1.0, &cv, NULL),
	    OW_OK);
	ow_canvas_restore(cv); /* without save */
	ow_canvas_set_line_width(cv, -1.0);
	assert_int_equal(ow_canvas_status(cv, &d), OW_EARG);
	assert_non_null(strstr(d.msg, "restore without save"));
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_EARG);
	ow_canvas_destroy(cv);

	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 10, 10, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	free(b);
	ow_canvas_rect(cv, 0, 0, 1, 1);
	memset(&d, 0, sizeof d);
	assert_int_equal(ow_canvas_status(cv, &d), OW_EARG);
	assert_non_null(strstr(d.msg, "after the image was written"));
	ow_canvas_destroy(cv);
	ow_canvas_destroy(NULL); /* NULL-safe */
}

static void canvas_rejects_sizes_and_formats_out_of_range(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_diag d = {{0}};

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 0, 10, 1.0, &cv, &d),
	    OW_EARG);
	assert_null(cv);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 10, 10, 0.0, &cv, NULL),
	    OW_EARG);
	assert_int_equal(ow_canvas_create_image((enum ow_canvas_format)7, 10,
	                                        10, 1.0, &cv, NULL),
	                 OW_EARG);
	assert_int_equal(
	    ow_canvas_create_pdf(NULL, NULL, NULL, NULL, 10, 10, &cv, NULL),
	    OW_EARG);
	assert_non_null(strstr(d.msg, "size"));
}

static void canvas_writes_files_atomically_and_names_bad_paths(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_diag d = {{0}};
	char path[] = "/tmp/ow_canvas_XXXXXX";
	char file[64];
	FILE *f;

	(void)state;
	assert_non_null(mkdtemp(path));
	snprintf(file, sizeof file, "%s/a.png", path);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 20, 20, 1.0, &cv, NULL),
	    OW_OK);
	scene(cv);
	assert_int_equal(ow_canvas_write_file(cv, file, &d), OW_OK);
	ow_canvas_destroy(cv);
	f = fopen(file, "rb");
	assert_non_null(f);
	fclose(f);
	remove(file);
	rmdir(path);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 20, 20, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_canvas_write_file(cv, "/nonexistent-dir/a.svg", &d),
	                 OW_EIO);
	assert_non_null(strstr(d.msg, "/nonexistent-dir/a.svg"));
	ow_canvas_destroy(cv);
}

/* --- the PDF back-end ------------------------------------------------ */

static void pdf_error(HPDF_STATUS e, HPDF_STATUS detail, void *user)
{
	(void)detail;
	if (*(HPDF_STATUS *)user == 0)
		*(HPDF_STATUS *)user = e;
}

/* pdffonts: after two header lines, one line per font whose fifth
 * column from the end is "emb" (yes/no). */
static int all_embedded(const char *out)
{
	const char *line = out;
	int k = 0, fonts = 0;

	for (; line && *line; k++) {
		const char *end = strchr(line, '\n');
		char buf[512], *tok[32];
		size_t len = end ? (size_t)(end - line) : strlen(line);
		int n = 0;

		if (k >= 2 && len > 0 && len < sizeof buf) {
			memcpy(buf, line, len);
			buf[len] = '\0';
			for (tok[n] = strtok(buf, " "); tok[n] && n < 31;
			     tok[++n] = strtok(NULL, " "))
				;
			if (n < 6 || strcmp(tok[n - 5], "yes") != 0)
				return 0;
			fonts++;
		}
		line = end ? end + 1 : NULL;
	}
	return fonts > 0;
}

static void canvas_pdf_back_end_draws_readable_embedded_text(void **state)
{
	HPDF_STATUS err = 0;
	HPDF_Doc doc = HPDF_New(pdf_error, &err);
	HPDF_Page page;
	struct ow_canvas_fonts fonts;
	struct ow_canvas_place place = {50.0, 60.0, 0.8};
	struct ow_canvas *cv = NULL, *img = NULL;
	struct ow_diag d = {{0}};
	char path[] = "/tmp/ow_canvas_pdf_XXXXXX", cmd[128];
	char *out;
	double wp, wi;
	int fd, rc;

	(void)state;
	assert_non_null(doc);
	HPDF_SetCompressionMode(doc, HPDF_COMP_ALL);
	assert_int_equal(ow_canvas_pdf_fonts(doc, &fonts, &d), OW_OK);
	page = HPDF_AddPage(doc);
	HPDF_Page_SetSize(page, HPDF_PAGE_SIZE_A4, HPDF_PAGE_PORTRAIT);
	assert_int_equal(
	    ow_canvas_create_pdf(doc, page, &fonts, &place, 200, 100, &cv, &d),
	    OW_OK);
	scene(cv);
	assert_int_equal(ow_canvas_status(cv, &d), OW_OK);
	/* both back-ends measure the same font's advance widths */
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 10, 10, 1.0, &img, NULL),
	    OW_OK);
	ow_canvas_set_font(cv, 12, 0);
	ow_canvas_set_font(img, 12, 0);
	wp = ow_canvas_text_width(cv, "last zone set-point (°C)");
	wi = ow_canvas_text_width(img, "last zone set-point (°C)");
	assert_rel(wp, wi, 0.01);
	ow_canvas_destroy(img);
	ow_canvas_destroy(cv);
	assert_int_equal(err, 0);
	fd = mkstemp(path);
	assert_true(fd >= 0);
	close(fd);
	assert_int_equal(HPDF_SaveToFile(doc, path), HPDF_OK);
	HPDF_Free(doc);
	snprintf(cmd, sizeof cmd, "pdftotext %s - 2>/dev/null", path);
	out = ow_test_run(cmd, &rc);
	if (rc == 0) { /* poppler-utils present (deps installs it) */
		assert_non_null(strstr(out, "peak melt 240 °C"));
		free(out);
		snprintf(cmd, sizeof cmd, "pdffonts %s 2>/dev/null", path);
		out = ow_test_run(cmd, &rc);
		assert_int_equal(rc, 0);
		assert_non_null(strstr(out, "DejaVuSans-Bold"));
		assert_true(all_embedded(out));
	}
	free(out);
	remove(path);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(canvas_png_has_the_size_of_points_times_scale),
	    cmocka_unit_test(canvas_same_drawing_gives_byte_identical_png),
	    cmocka_unit_test(
	        canvas_png_stores_translucent_colour_unpremultiplied),
	    cmocka_unit_test(canvas_svg_keeps_labels_as_text),
	    cmocka_unit_test(canvas_svg_escapes_markup_in_text),
	    cmocka_unit_test(canvas_text_width_scales_with_size_and_weight),
	    cmocka_unit_test(canvas_hatch_draws_lines_only_inside_the_path),
	    cmocka_unit_test(
	        canvas_clip_keeps_paint_inside_and_restore_lifts_it),
	    cmocka_unit_test(
	        canvas_keeps_the_first_error_and_refuses_late_drawing),
	    cmocka_unit_test(canvas_rejects_sizes_and_formats_out_of_range),
	    cmocka_unit_test(
	        canvas_writes_files_atomically_and_names_bad_paths),
	    cmocka_unit_test(canvas_pdf_back_end_draws_readable_embedded_text),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
