/* test_plot.c - nice ticks, number format, colour maps against their
 * published tables, contours of analytic fields, seamless filled
 * contours, the plot frame and hatched regions. */
#include "testutil.h"
#include "pngutil.h"

#include <cairo.h>
#include <stdlib.h>
#include <string.h>

#include "ow_plot.h"

static void assert_ticks(const struct ow_ticks *t, const double *v, int n)
{
	int i;

	assert_int_equal(t->n, n);
	for (i = 0; i < n; i++)
		assert_abs(t->v[i], v[i], 1e-9 * fabs(t->step));
}

/* Heckbert, "Nice numbers for graph labels", Graphics Gems (1990): steps
 * of 1, 2 or 5 times a power of ten; expected ticks recomputed by hand. */
static void plot_nice_ticks_cover_0_to_117_in_steps_of_20(void **state)
{
	static const double want[] = {0, 20, 40, 60, 80, 100, 120};
	struct ow_ticks t;

	(void)state;
	assert_int_equal(ow_plot_nice_ticks(0.0, 117.0, 7, &t), OW_OK);
	assert_ticks(&t, want, 7);
	assert_abs(t.step, 20.0, 1e-12);
	assert_int_equal(t.decimals, 0);
}

static void plot_nice_ticks_choose_the_finest_step_that_fits(void **state)
{
	static const double frac[] = {0, 0.2, 0.4, 0.6, 0.8, 1.0};
	static const double neg[] = {-40, -20, 0, 20, 40, 60};
	static const double set[] = {185, 190, 195, 200, 205, 210,
	                             215, 220, 225, 230, 235};
	struct ow_ticks t;

	(void)state;
	/* 0.1 would need 9 ticks over 0.12..0.87, 0.2 needs 6 */
	assert_int_equal(ow_plot_nice_ticks(0.12, 0.87, 6, &t), OW_OK);
	assert_ticks(&t, frac, 6);
	assert_int_equal(t.decimals, 1);
	/* 10 would need 9 ticks over -23..41, 20 needs 6 */
	assert_int_equal(ow_plot_nice_ticks(-23.0, 41.0, 8, &t), OW_OK);
	assert_ticks(&t, neg, 6);
	assert_true(t.v[2] == 0.0 && !signbit(t.v[2])); /* no -0 */
	/* a set-point axis 185..235 degC with room for 12 ticks: step 5 */
	assert_int_equal(ow_plot_nice_ticks(185.0, 235.0, 12, &t), OW_OK);
	assert_ticks(&t, set, 11);
	/* 0.002..0.0047 with 4 ticks: step 0.001, three decimals */
	assert_int_equal(ow_plot_nice_ticks(0.002, 0.0047, 4, &t), OW_OK);
	assert_abs(t.step, 0.001, 1e-15);
	assert_int_equal(t.decimals, 3);
}

static void plot_nice_ticks_refuse_empty_and_non_finite_ranges(void **state)
{
	struct ow_ticks t;

	(void)state;
	assert_int_equal(ow_plot_nice_ticks(1.0, 1.0, 5, &t), OW_EARG);
	assert_int_equal(ow_plot_nice_ticks(2.0, 1.0, 5, &t), OW_EARG);
	assert_int_equal(ow_plot_nice_ticks(NAN, 1.0, 5, &t), OW_EARG);
	assert_int_equal(ow_plot_nice_ticks(0.0, INFINITY, 5, &t), OW_EARG);
}

static void plot_format_uses_a_minus_sign_and_never_minus_zero(void **state)
{
	char buf[32];

	(void)state;
	assert_string_equal(ow_plot_format(buf, sizeof buf, -20.0, 0),
	                    "\xe2\x88\x92"
	                    "20");
	assert_string_equal(ow_plot_format(buf, sizeof buf, -0.0001, 2),
	                    "0.00");
	assert_string_equal(ow_plot_format(buf, sizeof buf, 0.35, 2), "0.35");
	assert_string_equal(ow_plot_format(buf, sizeof buf, 240.0, 0), "240");
}

/* End points and middle entry of the published 256-entry tables:
 * viridis, van der Walt & Smith (2015), matplotlib _cm_listed.py entries
 * 0, 128 and 255; cividis, Nunez, Anderton & Renslow, PLoS ONE 13(7)
 * e0199239 (2018), entries 0 and 255. */
static void plot_colour_maps_match_the_published_tables(void **state)
{
	struct ow_rgba c;

	(void)state;
	c = ow_cmap_at(OW_CMAP_VIRIDIS, 0.0);
	assert_abs(c.r, 0.267004, 1e-6);
	assert_abs(c.g, 0.004874, 1e-6);
	assert_abs(c.b, 0.329415, 1e-6);
	c = ow_cmap_at(OW_CMAP_VIRIDIS, 128.0 / 255.0);
	assert_abs(c.r, 0.127568, 1e-6);
	assert_abs(c.g, 0.566949, 1e-6);
	assert_abs(c.b, 0.550556, 1e-6);
	c = ow_cmap_at(OW_CMAP_VIRIDIS, 1.0);
	assert_abs(c.r, 0.993248, 1e-6);
	assert_abs(c.g, 0.906157, 1e-6);
	assert_abs(c.b, 0.143936, 1e-6);
	c = ow_cmap_at(OW_CMAP_CIVIDIS, 0.0);
	assert_abs(c.r, 0.000000, 1e-6);
	assert_abs(c.g, 0.135112, 1e-6);
	assert_abs(c.b, 0.304751, 1e-6);
	c = ow_cmap_at(OW_CMAP_CIVIDIS, 1.0);
	assert_abs(c.r, 0.995737, 1e-6);
	assert_abs(c.g, 0.909344, 1e-6);
	assert_abs(c.b, 0.217772, 1e-6);
	/* viridis entry 100 (0.166617, 0.463708, 0.558119) lies between the
	 * kept entries 96 and 112: linear interpolation stays within 0.003 */
	c = ow_cmap_at(OW_CMAP_VIRIDIS, 100.0 / 255.0);
	assert_abs(c.r, 0.166617, 3e-3);
	assert_abs(c.g, 0.463708, 3e-3);
	assert_abs(c.b, 0.558119, 3e-3);
	c = ow_cmap_at(OW_CMAP_VIRIDIS, -1.0); /* clamped */
	assert_abs(c.r, 0.267004, 1e-6);
}

/* Relative luminance of an sRGB colour (IEC 61966-2-1:1999 transfer,
 * ITU-R BT.709 weights). */
static double luminance(struct ow_rgba c)
{
	double v[3] = {c.r, c.g, c.b}, w[3] = {0.2126, 0.7152, 0.0722}, y = 0;
	int i;

	for (i = 0; i < 3; i++)
		y +=
		    w[i] * (v[i] <= 0.04045 ? v[i] / 12.92
		                            : pow((v[i] + 0.055) / 1.055, 2.4));
	return y;
}

/* Both maps rise monotonically in lightness, so they read in greyscale
 * (the design aim of both: van der Walt & Smith 2015; Nunez et al.
 * 2018). */
static void plot_colour_maps_grow_lighter_from_end_to_end(void **state)
{
	int m, k;

	(void)state;
	for (m = 0; m < 2; m++) {
		double prev = -1.0;

		for (k = 0; k <= 64; k++) {
			double y =
			    luminance(ow_cmap_at((enum ow_cmap)m, k / 64.0));

			assert_true(y > prev);
			prev = y;
		}
	}
}

/* A field on a deliberately uneven grid. */
struct grid {
	double x[9], y[7], z[63];
	struct ow_field f;
};

static void make_grid(struct grid *g, double (*fn)(double, double))
{
	static const double xs[9] = {0,    0.07, 0.2, 0.33, 0.5,
	                             0.61, 0.8,  0.9, 1.0};
	static const double ys[7] = {0, 0.1, 0.3, 0.45, 0.7, 0.85, 1.0};
	int i, j;

	memcpy(g->x, xs, sizeof xs);
	memcpy(g->y, ys, sizeof ys);
	for (j = 0; j < 7; j++)
		for (i = 0; i < 9; i++)
			g->z[j * 9 + i] = fn(xs[i], ys[j]);
	g->f.nx = 9;
	g->f.ny = 7;
	g->f.x = g->x;
	g->f.y = g->y;
	g->f.z = g->z;
}

static double plane(double x, double y)
{
	return x + y;
}

/* z = x + y is linear on every triangle, so its piecewise-linear
 * iso-line z = 1 lies exactly on the line x + y = 1 (recomputed), from
 * the corner (0, 1) to the corner (1, 0) of the unit square. */
static void plot_contour_of_a_plane_lies_on_its_exact_line(void **state)
{
	struct grid g;
	struct ow_isolines *L = NULL;
	const struct ow_isoline *l;
	int k;

	(void)state;
	make_grid(&g, plane);
	assert_int_equal(ow_contour_lines(&g.f, 1.0, &L, NULL), OW_OK);
	assert_int_equal(L->n, 1);
	l = &L->lines[0];
	assert_true(l->n >= 9);
	for (k = 0; k < l->n; k++) {
		assert_abs(l->p[k].x + l->p[k].y, 1.0, 1e-12);
		assert_true(l->p[k].x >= 0.0 && l->p[k].x <= 1.0);
	}
	/* the two ends are the square's corners, in either order */
	assert_abs(fabs(l->p[0].x - l->p[l->n - 1].x), 1.0, 1e-12);
	assert_abs(l->p[0].x * l->p[l->n - 1].x, 0.0, 1e-12);
	ow_isolines_destroy(L);

	/* z = 0.5: from (0, 0.5) to (0.5, 0), vertices on x + y = 0.5 */
	assert_int_equal(ow_contour_lines(&g.f, 0.5, &L, NULL), OW_OK);
	assert_int_equal(L->n, 1);
	for (k = 0; k < L->lines[0].n; k++)
		assert_abs(L->lines[0].p[k].x + L->lines[0].p[k].y, 0.5, 1e-12);
	ow_isolines_destroy(L);
}

static double cone(double x, double y)
{
	return hypot(x - 0.5, y - 0.5);
}

/* The circle r = 0.3 of a cone centred in the square is one closed loop;
 * linear interpolation puts its vertices within the grid's spacing
 * (under 0.25 here) of the true radius, and well within 0.02. */
static void plot_contour_of_a_cone_is_one_closed_loop(void **state)
{
	struct grid g;
	struct ow_isolines *L = NULL;
	const struct ow_isoline *l;
	int k;

	(void)state;
	make_grid(&g, cone);
	assert_int_equal(ow_contour_lines(&g.f, 0.3, &L, NULL), OW_OK);
	assert_int_equal(L->n, 1);
	l = &L->lines[0];
	assert_true(l->n > 8);
	assert_true(l->p[0].x == l->p[l->n - 1].x &&
	            l->p[0].y == l->p[l->n - 1].y);
	for (k = 0; k < l->n; k++)
		assert_abs(hypot(l->p[k].x - 0.5, l->p[k].y - 0.5), 0.3, 0.02);
	ow_isolines_destroy(L);
	/* a level above the field's maximum: no line at all */
	assert_int_equal(ow_contour_lines(&g.f, 5.0, &L, NULL), OW_OK);
	assert_int_equal(L->n, 0);
	ow_isolines_destroy(L);
}

static void plot_contour_leaves_out_cells_with_missing_values(void **state)
{
	struct grid g;
	struct ow_isolines *L = NULL;
	int k, i;

	(void)state;
	make_grid(&g, plane);
	for (k = 0; k < 9; k++) /* the row y = 0.3 is missing */
		g.z[2 * 9 + k] = NAN;
	assert_int_equal(ow_contour_lines(&g.f, 1.0, &L, NULL), OW_OK);
	assert_int_equal(L->n, 2); /* the line is cut in two */
	for (k = 0; k < L->n; k++)
		for (i = 0; i < L->lines[k].n; i++)
			assert_true(L->lines[k].p[i].y <= 0.1 + 1e-12 ||
			            L->lines[k].p[i].y >= 0.45 - 1e-12);
	ow_isolines_destroy(L);
	assert_int_equal(ow_contour_lines(NULL, 1.0, &L, NULL), OW_EARG);
}

static void plot_contour_levels_span_the_field(void **state)
{
	struct grid g;
	struct ow_ticks t;
	int k;

	(void)state;
	make_grid(&g, plane); /* 0..2 */
	assert_int_equal(ow_contour_levels(&g.f, 10, &t), OW_OK);
	assert_true(t.v[0] <= 0.0 && t.v[t.n - 1] >= 2.0);
	assert_true(t.n >= 5 && t.n <= 11);
	for (k = 0; k < 63; k++)
		g.z[k] = 7.0; /* constant: still two levels or more */
	assert_int_equal(ow_contour_levels(&g.f, 10, &t), OW_OK);
	assert_true(t.n >= 2 && t.v[0] <= 7.0 && t.v[t.n - 1] >= 7.0);
	for (k = 0; k < 63; k++)
		g.z[k] = NAN;
	assert_int_equal(ow_contour_levels(&g.f, 10, &t), OW_EARG);
}

/* --- drawing ---------------------------------------------------------- */

/* Encode cv as PNG and decode it into an image surface. */
static cairo_surface_t *pixels(struct ow_canvas *cv)
{
	unsigned char *b = NULL;
	size_t n = 0;
	cairo_surface_t *s;

	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	s = ow_test_png_decode(b, n);
	free(b);
	return s;
}

static unsigned pixel(cairo_surface_t *s, int x, int y)
{
	const unsigned char *p = cairo_image_surface_get_data(s) +
	                         y * cairo_image_surface_get_stride(s) + 4 * x;

	return (unsigned)p[0] | (unsigned)p[1] << 8 | (unsigned)p[2] << 16 |
	       (unsigned)p[3] << 24;
}

static void plot_frame_maps_the_ranges_onto_the_data_area(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {10, 20, 400, 300};
	struct ow_plot_axis x = {20, 117, "screw speed (rpm)", 1, 7};
	struct ow_plot_axis y = {185, 235, "set-point (°C)", 0, 0};
	struct ow_plot p;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 420, 330, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 50.0), OW_OK);
	assert_true(p.area.x > box.x + 20.0); /* room for labels and title */
	assert_true(p.area.x + p.area.w <= box.x + box.w - 50.0);
	assert_true(p.area.y + p.area.h < box.y + box.h - 20.0);
	assert_abs(p.x0, 20.0, 1e-12); /* nice: widened to whole ticks */
	assert_abs(p.x1, 120.0, 1e-12);
	assert_abs(p.y0, 185.0, 1e-12); /* not nice: as given */
	assert_abs(p.y1, 235.0, 1e-12);
	assert_abs(ow_plot_px(&p, 20.0), p.area.x, 1e-9);
	assert_abs(ow_plot_px(&p, 120.0), p.area.x + p.area.w, 1e-9);
	assert_abs(ow_plot_py(&p, 185.0), p.area.y + p.area.h, 1e-9);
	assert_abs(ow_plot_py(&p, 235.0), p.area.y, 1e-9);
	box.w = 30.0; /* too small for the margins */
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 0.0), OW_EARG);
	ow_canvas_destroy(cv);
}

/* A base-10 logarithmic scale puts v at log10(v): the decades 10^k are
 * equally spaced and m x 10^k (m = 2..9) lies log10(m) of a decade above
 * 10^k (Cleveland, "The Elements of Graphing Data", 1985, on logarithms
 * in graphs). Expected ticks over 1..1e4 written out by hand. */
static void plot_log_ticks_over_1_to_1e4_are_decades_and_2_to_9(void **state)
{
	static const double dec[] = {1, 10, 100, 1000, 10000};
	struct ow_log_ticks t;
	int k, m, i = 0;

	(void)state;
	assert_int_equal(ow_plot_log_ticks(1.0, 1e4, 0, &t), OW_OK);
	assert_int_equal(t.n_major, 5);
	for (k = 0; k < 5; k++)
		assert_abs(t.major[k], dec[k], 1e-12 * dec[k]);
	assert_int_equal(t.n_minor, 4 * 8);
	for (k = 0; k < 4; k++)
		for (m = 2; m <= 9; m++, i++)
			assert_abs(t.minor[i], m * dec[k], 1e-12 * dec[k]);
	assert_int_equal(t.plain, 1); /* 1 .. 10000 all fit as decimals */
	/* nice widens 3..4700 to whole decades: the same ticks */
	assert_int_equal(ow_plot_log_ticks(3.0, 4700.0, 1, &t), OW_OK);
	assert_int_equal(t.n_major, 5);
	assert_abs(t.major[0], 1.0, 1e-12);
	assert_abs(t.major[4], 1e4, 1e-8);
	assert_int_equal(t.n_minor, 32);
	/* not nice: only the ticks inside 3..4700 */
	assert_int_equal(ow_plot_log_ticks(3.0, 4700.0, 0, &t), OW_OK);
	assert_int_equal(t.n_major, 3);
	assert_abs(t.major[0], 10.0, 1e-12);
	assert_abs(t.minor[0], 3.0, 1e-12);
	assert_abs(t.minor[t.n_minor - 1], 4000.0, 1e-9);
	assert_int_equal(t.n_minor, 7 + 8 + 8 + 3);
	/* a log scale has no place for zero, negatives or an empty range */
	assert_int_equal(ow_plot_log_ticks(0.0, 10.0, 1, &t), OW_EARG);
	assert_int_equal(ow_plot_log_ticks(-1.0, 10.0, 1, &t), OW_EARG);
	assert_int_equal(ow_plot_log_ticks(10.0, 10.0, 1, &t), OW_EARG);
	assert_int_equal(ow_plot_log_ticks(1.0, NAN, 1, &t), OW_EARG);
	assert_int_equal(ow_plot_log_ticks(1e-30, 1e30, 1, &t), OW_EARG);
}

static void plot_log_labels_are_decimals_or_1eK_as_the_range_needs(void **state)
{
	char buf[32];
	struct ow_log_ticks t;

	(void)state;
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 10000, 1),
	                    "10000");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 1e4, 0), "1e4");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 1000, 0),
	                    "1000");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 1, 0), "1");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 0.01, 0),
	                    "0.01");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 1e-5, 0),
	                    "1e\xe2\x88\x92"
	                    "5");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 20, 0), "20");
	assert_string_equal(ow_plot_format_log(buf, sizeof buf, 0.02, 1),
	                    "0.02");
	/* 1..1e5 is too wide for plain decimals everywhere */
	assert_int_equal(ow_plot_log_ticks(1.0, 1e5, 0, &t), OW_OK);
	assert_int_equal(t.plain, 0);
}

/* Mapping on log-log axes: ow_plot_px(v) = x + w (log10 v - log10 x0) /
 * (log10 x1 - log10 x0), the definition of a logarithmic scale. */
static void plot_log_axes_map_values_through_log10(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, 500, 360};
	struct ow_plot_axis x = {1.3, 9000, "shear rate (1/s)", 1, 0};
	struct ow_plot_axis y = {20, 7e4, "viscosity (Pa·s)", 1, 0};
	struct ow_plot p;
	unsigned char *b = NULL;
	size_t n = 0;
	char *svg;

	(void)state;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 500, 360, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_plot_init_log(&p, cv, &box, &x, &y, 9.0, 0.0,
	                                  OW_PLOT_LOG_X | OW_PLOT_LOG_Y),
	                 OW_OK);
	assert_abs(p.x0, 1.0, 1e-12); /* nice: whole decades */
	assert_abs(p.x1, 1e4, 1e-8);
	assert_abs(p.y0, 10.0, 1e-12);
	assert_abs(p.y1, 1e5, 1e-7);
	assert_abs(ow_plot_px(&p, 1.0), p.area.x, 1e-9);
	assert_abs(ow_plot_px(&p, 100.0), p.area.x + 0.5 * p.area.w, 1e-9);
	assert_abs(ow_plot_px(&p, 1e4), p.area.x + p.area.w, 1e-9);
	/* log10 2 = 0.30103 of one decade of four */
	assert_abs(ow_plot_px(&p, 2.0), p.area.x + 0.30103 / 4.0 * p.area.w,
	           1e-4);
	/* 1000 Pa·s is two decades of four above 10 */
	assert_abs(ow_plot_py(&p, 1000.0), p.area.y + 0.5 * p.area.h, 1e-9);
	assert_abs(ow_plot_py(&p, 5000.0),
	           p.area.y + p.area.h * (1.0 - (log10(5000.0) - 1.0) / 4.0),
	           1e-9);
	assert_true(isnan(ow_plot_px(&p, 0.0))); /* no place for zero */
	assert_int_equal(p.xt.n, 5);             /* labelled decades */
	{ /* inside one decade the 2..9 x 10^k ticks carry the labels */
		struct ow_plot q;
		struct ow_plot_axis nx = {230, 780, NULL, 0, 0};
		struct ow_plot_axis ny = {3.1, 42, NULL, 0, 0};

		assert_int_equal(
		    ow_plot_init_log(&q, cv, &box, &nx, &ny, 9.0, 0.0,
		                     OW_PLOT_LOG_X | OW_PLOT_LOG_Y),
		    OW_OK);
		assert_int_equal(q.xt.n, 5); /* 300, 400, ..., 700 */
		assert_abs(q.xt.v[0], 300.0, 1e-9);
		assert_abs(q.xt.v[4], 700.0, 1e-9);
		assert_int_equal(q.yt.n, 3); /* 5, 10, 20 */
		assert_abs(q.yt.v[1], 10.0, 1e-12);
		assert_abs(ow_plot_px(&q, 400.0),
		           q.area.x + q.area.w * log10(400.0 / 230.0) /
		                          log10(780.0 / 230.0),
		           1e-9);
	}
	ow_plot_grid(&p);
	ow_plot_axes(&p, &x, &y);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	svg = realloc(b, n + 1);
	svg[n] = '\0';
	assert_non_null(strstr(svg, ">10000</text>"));
	assert_non_null(strstr(svg, ">1e5</text>"));
	free(svg);
	ow_canvas_destroy(cv);
}

static double ramp(double x, double y)
{
	(void)y;
	return x;
}

/* Filled contours drawn as stacked regions {z >= level}, each one path,
 * show no seams where cells meet: every pixel well inside a band has
 * exactly that band's colour, also on the cell edges x = 0.2, 0.33, 0.5
 * crossing the band 0..0.5 (cells split in triangles, merged under the
 * non-zero fill rule). */
static void plot_filled_contours_have_no_seams(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, 400, 300};
	struct ow_plot_axis x = {0, 1, NULL, 0, 0}, y = {0, 1, NULL, 0, 0};
	struct ow_ticks lv = {3, {0.0, 0.5, 1.0}, 0.5, 1};
	struct ow_plot p;
	struct grid g;
	cairo_surface_t *s;
	unsigned band0, band1;
	int X, Y;

	(void)state;
	make_grid(&g, ramp);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 400, 300, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 0.0), OW_OK);
	assert_int_equal(
	    ow_plot_contour_fill(&p, &g.f, &lv, OW_CMAP_VIRIDIS, NULL), OW_OK);
	s = pixels(cv);
	Y = (int)(p.area.y + 0.5 * p.area.h);
	band0 = pixel(s, (int)ow_plot_px(&p, 0.1), Y);
	band1 = pixel(s, (int)ow_plot_px(&p, 0.8), Y);
	assert_true(band0 != band1);
	assert_int_equal(band0 >> 24, 255); /* opaque */
	for (X = (int)ow_plot_px(&p, 0.02); X < (int)ow_plot_px(&p, 0.48); X++)
		assert_int_equal(pixel(s, X, Y), band0);
	for (Y = (int)p.area.y + 2; Y < (int)(p.area.y + p.area.h) - 2; Y++)
		assert_int_equal(pixel(s, (int)ow_plot_px(&p, 0.33), Y), band0);
	for (X = (int)ow_plot_px(&p, 0.52); X < (int)ow_plot_px(&p, 0.98); X++)
		assert_int_equal(pixel(s, X, Y - 5), band1);
	cairo_surface_destroy(s);
	ow_canvas_destroy(cv);
}

/* A hatched region is not uniform (lines and gaps, so it reads in
 * greyscale print); outside it the paper stays clear. */
static void plot_field_region_is_tinted_and_hatched(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, 400, 300};
	struct ow_plot_axis x = {0, 1, NULL, 0, 0}, y = {0, 1, NULL, 0, 0};
	struct ow_hatch h = {45.0, 5.0, 0.6, {0.6, 0.1, 0.0, 1.0}};
	struct ow_plot p;
	struct grid g;
	cairo_surface_t *s;
	int X, Y, dark = 0, pale = 0, outside = 0;

	(void)state;
	make_grid(&g, plane);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_PNG, 400, 300, 1.0, &cv, NULL),
	    OW_OK);
	ow_canvas_set_colour(cv, ow_rgb(1, 1, 1));
	ow_canvas_rect(cv, 0, 0, 400, 300);
	ow_canvas_fill(cv);
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 0.0), OW_OK);
	assert_int_equal(
	    ow_plot_field_region(&p, &g.f, 1.5,
	                         ow_rgba_with_alpha(h.colour, 0.15), &h, NULL),
	    OW_OK);
	s = pixels(cv);
	for (Y = (int)p.area.y; Y < (int)(p.area.y + p.area.h); Y++)
		for (X = (int)p.area.x; X < (int)(p.area.x + p.area.w); X++) {
			double dx = (X - p.area.x) / p.area.w;
			double dy = 1.0 - (Y - p.area.y) / p.area.h;
			unsigned c = pixel(s, X, Y);
			int grey = (int)(((c & 255) + (c >> 8 & 255) +
			                  (c >> 16 & 255)) /
			                 3);

			if (dx + dy > 1.56) { /* inside, off the edge */
				dark += grey < 150;
				pale += grey > 200;
			} else if (dx + dy < 1.44) {
				outside += grey != 255;
			}
		}
	assert_true(dark > 100);
	assert_true(pale > 100);
	assert_int_equal(outside, 0);
	cairo_surface_destroy(s);
	ow_canvas_destroy(cv);
}

static void plot_isolines_are_labelled_with_their_levels(void **state)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, 400, 300};
	struct ow_plot_axis x = {0, 1, "x (m)", 0, 0},
	                    y = {0, 1, "y (m)", 0, 0};
	struct ow_ticks lv = {3, {0.5, 1.0, 1.5}, 0.5, 1};
	struct ow_plot p;
	struct grid g;
	unsigned char *b = NULL;
	size_t n = 0;
	char *svg;

	(void)state;
	make_grid(&g, plane);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 400, 300, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 0.0), OW_OK);
	assert_int_equal(
	    ow_plot_isolines(&p, &g.f, &lv, 1, ow_rgb(0, 0, 0), 0.6, NULL),
	    OW_OK);
	ow_plot_axes(&p, &x, &y);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	svg = realloc(b, n + 1);
	svg[n] = '\0';
	assert_non_null(strstr(svg, ">0.5</text>"));
	assert_non_null(strstr(svg, ">1.0</text>"));
	assert_non_null(strstr(svg, ">1.5</text>"));
	assert_non_null(strstr(svg, ">x (m)</text>"));
	assert_non_null(strstr(svg, ">y (m)</text>"));
	free(svg);
	ow_canvas_destroy(cv);
}

static void plot_line_chart_draws_series_and_legend(void **state)
{
	static const double xs[5] = {0, 1, 2, 3, 4};
	static const double y1[5] = {1, 2, NAN, 4, 5}, y2[5] = {5, 4, 3, 2, 1};
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, 400, 300};
	struct ow_plot_axis x = {0, 4, "axial position (D)", 0, 0};
	struct ow_plot_axis y = {0, 5, "pressure (MPa)", 1, 0};
	struct ow_series s[2] = {{"bulk", 5, xs, y1, ow_plot_series_style(0)},
	                         {"peak", 5, xs, y2, ow_plot_series_style(1)}};
	struct ow_plot p;
	unsigned char *b = NULL;
	size_t n = 0;
	double lo, hi;
	char *svg;

	(void)state;
	assert_true(ow_plot_series_range(s, 2, 1, &lo, &hi));
	assert_abs(lo, 1.0, 0.0);
	assert_abs(hi, 5.0, 0.0);
	/* series differ in dash and marker too, not only in colour */
	assert_true(s[0].style.dash != s[1].style.dash);
	assert_true(s[0].style.marker != s[1].style.marker);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, 400, 300, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_plot_init(&p, cv, &box, &x, &y, 9.0, 0.0), OW_OK);
	ow_plot_lines(&p, &x, &y, s, 2, 1);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	svg = realloc(b, n + 1);
	svg[n] = '\0';
	assert_non_null(strstr(svg, ">bulk</text>"));
	assert_non_null(strstr(svg, ">peak</text>"));
	assert_non_null(strstr(svg, "stroke-dasharray"));
	assert_non_null(strstr(svg, ">pressure (MPa)</text>"));
	free(svg);
	ow_canvas_destroy(cv);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(plot_nice_ticks_cover_0_to_117_in_steps_of_20),
	    cmocka_unit_test(plot_nice_ticks_choose_the_finest_step_that_fits),
	    cmocka_unit_test(
	        plot_nice_ticks_refuse_empty_and_non_finite_ranges),
	    cmocka_unit_test(
	        plot_format_uses_a_minus_sign_and_never_minus_zero),
	    cmocka_unit_test(plot_colour_maps_match_the_published_tables),
	    cmocka_unit_test(plot_colour_maps_grow_lighter_from_end_to_end),
	    cmocka_unit_test(plot_contour_of_a_plane_lies_on_its_exact_line),
	    cmocka_unit_test(plot_contour_of_a_cone_is_one_closed_loop),
	    cmocka_unit_test(plot_contour_leaves_out_cells_with_missing_values),
	    cmocka_unit_test(plot_contour_levels_span_the_field),
	    cmocka_unit_test(plot_frame_maps_the_ranges_onto_the_data_area),
	    cmocka_unit_test(
	        plot_log_ticks_over_1_to_1e4_are_decades_and_2_to_9),
	    cmocka_unit_test(
	        plot_log_labels_are_decimals_or_1eK_as_the_range_needs),
	    cmocka_unit_test(plot_log_axes_map_values_through_log10),
	    cmocka_unit_test(plot_filled_contours_have_no_seams),
	    cmocka_unit_test(plot_field_region_is_tinted_and_hatched),
	    cmocka_unit_test(plot_isolines_are_labelled_with_their_levels),
	    cmocka_unit_test(plot_line_chart_draws_series_and_legend),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
