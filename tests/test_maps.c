/* test_maps.c - the map images of the demo study on a small grid: every
 * file written, PNG size, identical bytes for identical inputs, labels as
 * text in the SVG (limits with their values, axes with units), hatching in
 * the unsafe region and a clear safe region, the empty-window message,
 * the axis labels per barrel mode, and the centre profile. Drawing time
 * is measured and printed, never asserted. */
#include "testutil.h"

#include <cairo.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "ow_config.h"
#include "ow_io.h"
#include "ow_map.h"
#include "ow_maps.h"
#include "ow_sweep.h"
#include "ow_window.h"

struct fix {
	struct ow_units *u;
	struct ow_study s;
	struct ow_grid *g;
	struct ow_window *w;
	struct ow_map m; /* a view of s, g, w and the centre's profile */
	char dir[64];
};

/* The demo study (demo/study-si.json: limits peak melt 240 degC, pressure
 * 45 MPa, power 30 kW, invented for the demo) on a 7 x 7 grid refined
 * once near boundaries. */
static int setup(void **state)
{
	struct fix *f = calloc(1, sizeof *f);
	struct ow_sweep_config c;
	struct ow_diag d = {{0}};

	if (!f || ow_units_create(&f->u, &d) != OW_OK ||
	    ow_config_load_study(f->u, "demo/study-si.json", &f->s, &d) !=
	        OW_OK)
		goto fail;
	ow_sweep_default(&c);
	c.rpm_steps = 7;
	c.axis_steps = 7;
	c.refine = 1;
	if (ow_sweep_run(&f->s, &c, &f->g, &d) != OW_OK ||
	    ow_window_extract(&f->s, f->g, &f->w, &d) != OW_OK ||
	    ow_map_centre(&f->s, f->w, &f->m.profile, &f->m.n_profile,
	                  &f->m.centre, &d) != OW_OK)
		goto fail;
	f->m.study = &f->s;
	f->m.grid = f->g;
	f->m.window = f->w;
	f->m.has_centre = 1;
	snprintf(f->dir, sizeof f->dir, "/tmp/ow_maps_XXXXXX");
	if (!mkdtemp(f->dir))
		goto fail;
	*state = f;
	return 0;
fail:
	fprintf(stderr, "setup: %s\n", d.msg);
	free(f);
	return -1;
}

static int teardown(void **state)
{
	struct fix *f = *state;
	char cmd[128];

	snprintf(cmd, sizeof cmd, "rm -rf %s", f->dir);
	if (system(cmd) != 0)
		fprintf(stderr, "could not remove %s\n", f->dir);
	free(f->m.profile);
	ow_window_destroy(f->w);
	ow_grid_destroy(f->g);
	ow_units_destroy(f->u);
	free(f);
	return 0;
}

static unsigned char *slurp(const char *path, size_t *n)
{
	char *b = NULL;

	if (ow_io_slurp(path, (size_t)1 << 30, &b, n) != 0 || *n == 0) {
		free(b);
		return NULL;
	}
	return (unsigned char *)b;
}

static unsigned char *file_in(const char *dir, const char *name, size_t *n)
{
	char path[256];

	snprintf(path, sizeof path, "%s/%s", dir, name);
	return slurp(path, n);
}

static unsigned be32(const unsigned char *b)
{
	return (unsigned)b[0] << 24 | (unsigned)b[1] << 16 |
	       (unsigned)b[2] << 8 | (unsigned)b[3];
}

static double seconds(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static void maps_write_every_image_at_900_by_650(void **state)
{
	static const char *const stems[] = {
	    "window",       "map-peak-temp", "map-unmelted-solids",
	    "map-pressure", "map-output",    "map-specific-energy",
	    "profile"};
	struct fix *f = *state;
	struct ow_maps_options o;
	struct ow_diag d = {{0}};
	double t0, t1;
	unsigned k;

	ow_maps_default(&o);
	assert_false(f->w->empty);
	t0 = seconds();
	assert_int_equal(ow_maps_write_all(&f->m, &o, f->dir, &d), OW_OK);
	t1 = seconds();
	print_message("maps: 7 PNG + 7 SVG in %.3f s\n", t1 - t0);
	for (k = 0; k < sizeof stems / sizeof stems[0]; k++) {
		char name[64];
		size_t n = 0;
		unsigned char *b;

		snprintf(name, sizeof name, "%s.png", stems[k]);
		b = file_in(f->dir, name, &n);
		assert_non_null(b);
		/* IHDR width and height (ISO/IEC 15948:2004, 11.2.2) */
		assert_int_equal(be32(b + 16), 900);
		assert_int_equal(be32(b + 20), 650);
		free(b);
		snprintf(name, sizeof name, "%s.svg", stems[k]);
		b = file_in(f->dir, name, &n);
		assert_non_null(b);
		assert_non_null(strstr((char *)b, "</svg>"));
		free(b);
	}
}

static void maps_same_inputs_give_byte_identical_pngs(void **state)
{
	struct fix *f = *state;
	struct ow_maps_options o;
	char dir2[80];
	const char *names[] = {"window.png", "map-peak-temp.png",
	                       "profile.png"};
	unsigned k;

	ow_maps_default(&o);
	o.svg = 0;
	snprintf(dir2, sizeof dir2, "%s/again", f->dir);
	assert_int_equal(mkdir(dir2, 0755), 0);
	assert_int_equal(ow_maps_write_all(&f->m, &o, f->dir, NULL), OW_OK);
	assert_int_equal(ow_maps_write_all(&f->m, &o, dir2, NULL), OW_OK);
	for (k = 0; k < 3; k++) {
		size_t na = 0, nb = 0;
		unsigned char *a = file_in(f->dir, names[k], &na);
		unsigned char *b = file_in(dir2, names[k], &nb);

		assert_non_null(a);
		assert_non_null(b);
		assert_int_equal(na, nb);
		assert_memory_equal(a, b, na);
		free(a);
		free(b);
	}
}

static char *draw_svg(struct fix *f, struct ow_window *w,
                      const struct ow_maps_options *o)
{
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	struct ow_diag d = {{0}};
	struct ow_map m = f->m;
	unsigned char *b = NULL;
	size_t n = 0;
	char *s;

	m.window = w;
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, box.w, box.h, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_maps_draw_window(cv, &box, &m, o, &d), OW_OK);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	ow_canvas_destroy(cv);
	s = realloc(b, n + 1);
	s[n] = '\0';
	return s;
}

/* The limits of demo/study-si.json, as the labels must say them. */
static void maps_window_labels_each_limit_with_name_and_value(void **state)
{
	struct fix *f = *state;
	struct ow_maps_options o;
	char *svg;

	ow_maps_default(&o);
	o.has_current = 1;
	o.current_rpm = 50.0;
	o.current_set_K = 273.15 + 200.0;
	svg = draw_svg(f, f->w, &o);
	assert_non_null(strstr(svg, ">peak melt 240 °C</text>"));
	assert_non_null(strstr(svg, ">power 30 kW</text>"));
	assert_non_null(strstr(svg, ">screw speed (rpm)</text>"));
	assert_non_null(strstr(svg, ">last zone set-point (°C)</text>"));
	assert_non_null(strstr(svg, ">recommended "));
	assert_non_null(strstr(svg, ">centre "));
	assert_non_null(strstr(svg, ">current 50 rpm, 200 °C</text>"));
	assert_non_null(strstr(svg, ">current operating point</text>"));
	free(svg);

	o.units = OW_SYS_US; /* 240 degC = 464 degF; 30 kW = 40.2 hp
	                        (NIST SP 811, 2008, App. B; recomputed) */
	svg = draw_svg(f, f->w, &o);
	assert_non_null(strstr(svg, ">peak melt 464 °F</text>"));
	assert_non_null(strstr(svg, ">power 40.2 hp</text>"));
	assert_non_null(strstr(svg, ">last zone set-point (°F)</text>"));
	free(svg);
}

/* Decode a PNG file into an image surface. */
static cairo_surface_t *png_file(const char *dir, const char *name)
{
	char path[256];
	cairo_surface_t *s;

	snprintf(path, sizeof path, "%s/%s", dir, name);
	s = cairo_image_surface_create_from_png(path);
	assert_int_equal(cairo_surface_status(s), CAIRO_STATUS_SUCCESS);
	return s;
}

/* Grey levels (mean of R, G, B) of a square of half-width r (px) around
 * (X, Y): their standard deviation and darkest value. */
static void patch(cairo_surface_t *s, double X, double Y, int r, double *sd,
                  int *darkest)
{
	double sum = 0.0, sum2 = 0.0;
	int x, y, n = 0;

	*darkest = 255;
	for (y = (int)Y - r; y <= (int)Y + r; y++)
		for (x = (int)X - r; x <= (int)X + r; x++) {
			const unsigned char *p =
			    cairo_image_surface_get_data(s) +
			    y * cairo_image_surface_get_stride(s) + 4 * x;
			int g = (p[0] + p[1] + p[2]) / 3;

			sum += g;
			sum2 += (double)g * g;
			*darkest = g < *darkest ? g : *darkest;
			n++;
		}
	*sd = sqrt(fmax(0.0, sum2 / n - (sum / n) * (sum / n)));
}

/* Greyscale readability proxy: a patch of the unsafe corner (top speed,
 * hottest set-point) holds both hatch lines and gaps; a patch inside
 * the recommended rectangle holds no hatching at all. */
static void maps_unsafe_region_is_hatched_and_safe_region_clear(void **state)
{
	struct fix *f = *state;
	struct ow_maps_options o;
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	struct ow_plot p;
	const struct ow_grid_point *corner =
	    ow_grid_at(f->g, f->g->n_rpm - 1, f->g->n_axis - 1);
	cairo_surface_t *s;
	double sc = OW_MAPS_PNG_SCALE, sd, X, Y;
	int darkest;

	ow_maps_default(&o);
	assert_true(corner->v.bits != 0); /* the demo's corner is unsafe */
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, box.w, box.h, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_maps_window_frame(cv, &box, &f->m, &o, &p, NULL),
	                 OW_OK);
	ow_canvas_destroy(cv);
	s = png_file(f->dir, "window.png");
	X = sc * (p.area.x + p.area.w) - 30.0;
	Y = sc * p.area.y + 30.0;
	patch(s, X, Y, 15, &sd, &darkest);
	assert_true(sd > 15.0); /* lines and gaps, not one flat tint */
	assert_true(darkest < 170);
	/* a quarter into the rectangle from its lower-left corner, clear
	 * of its outline, labels and the centre mark */
	X = sc * ow_plot_px(&p, f->w->rpm_min +
	                            0.25 * (f->w->rpm_max - f->w->rpm_min));
	Y = sc * ow_plot_py(&p, (f->w->set_min_K - 273.15) +
	                            0.25 * (f->w->set_max_K - f->w->set_min_K));
	patch(s, X, Y, 6, &sd, &darkest);
	assert_true(darkest > 200); /* white paper, at most a light grid line */
	cairo_surface_destroy(s);
}

/* Every lattice point made to fail the peak temperature limit: the map
 * says so in plain words, naming the limit. */
static void maps_empty_window_says_so_on_the_map(void **state)
{
	struct fix *f = *state;
	struct ow_grid g = *f->g;
	struct ow_window *w = NULL;
	struct ow_maps_options o;
	size_t n = (size_t)g.n_rpm * (size_t)g.n_axis, k;
	char *svg;

	g.pts = malloc(n * sizeof *g.pts);
	assert_non_null(g.pts);
	memcpy(g.pts, f->g->pts, n * sizeof *g.pts);
	for (k = 0; k < n; k++) {
		g.pts[k].v.bits |= 1u << OW_CK_PEAK_TEMP;
		g.pts[k].v.margin[OW_CK_PEAK_TEMP] = -0.5;
	}
	assert_int_equal(ow_window_extract(&f->s, &g, &w, NULL), OW_OK);
	assert_true(w->empty);
	ow_maps_default(&o);
	svg = draw_svg(f, w, &o);
	assert_non_null(strstr(svg, ">no safe operating point</text>"));
	assert_non_null(strstr(svg, ">binding limits: peak melt 240 °C"));
	assert_null(strstr(svg, ">recommended "));
	free(svg);
	ow_window_destroy(w);
	free(g.pts);
}

static void maps_axis_label_names_the_reference_zone(void **state)
{
	struct fix *f = *state;
	struct ow_study *s = malloc(sizeof *s);
	char buf[64];

	assert_non_null(s);
	*s = f->s; /* the demo: 5 zones, mode shift */
	assert_string_equal(ow_maps_axis_label(s, buf, sizeof buf),
	                    "last zone set-point");
	s->line.axes.mode = OW_AXIS_SET;
	s->line.axes.zones_from = 2;
	assert_string_equal(ow_maps_axis_label(s, buf, sizeof buf),
	                    "zones 3–5 set-point");
	s->line.axes.zones_from = 4;
	assert_string_equal(ow_maps_axis_label(s, buf, sizeof buf),
	                    "zone 5 set-point");
	s->line.axes.mode = OW_AXIS_ZONE;
	s->line.axes.zone = 1;
	assert_string_equal(ow_maps_axis_label(s, buf, sizeof buf),
	                    "zone 2 set-point");
	free(s);
}

/* The centre profile runs hopper to tip over the demo screw's 30 D, and
 * its chart names every section of the screw (demo/screw-si.json). */
static void maps_profile_shows_the_screw_sections(void **state)
{
	struct fix *f = *state;
	struct ow_profile_row *rows = NULL;
	struct ow_canvas *cv = NULL;
	struct ow_rect box = {0, 0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	unsigned char *b = NULL;
	size_t n = 0;
	int m = 0;
	char *svg;

	assert_int_equal(ow_map_centre(&f->s, f->w, &rows, &m, NULL, NULL),
	                 OW_OK);
	assert_true(m > 20);
	assert_abs(rows[m - 1].axial_m / f->s.screw.diameter_m, 30.0, 0.5);
	assert_int_equal(
	    ow_canvas_create_image(OW_CANVAS_SVG, box.w, box.h, 1.0, &cv, NULL),
	    OW_OK);
	assert_int_equal(ow_maps_draw_profile(cv, &box, &f->s, rows, m,
	                                      "centre", NULL, NULL),
	                 OW_OK);
	assert_int_equal(ow_canvas_encode(cv, &b, &n, NULL), OW_OK);
	ow_canvas_destroy(cv);
	svg = realloc(b, n + 1);
	svg[n] = '\0';
	assert_non_null(strstr(svg, ">feed</text>"));
	assert_non_null(strstr(svg, ">taper</text>"));
	assert_non_null(strstr(svg, ">metering</text>"));
	assert_non_null(strstr(svg, ">mixer</text>"));
	assert_non_null(strstr(svg, ">pressure (MPa)</text>"));
	assert_non_null(strstr(svg, ">temperature (°C)</text>"));
	assert_non_null(strstr(svg, ">axial position from the hopper end "
	                            "(D)</text>"));
	assert_non_null(strstr(svg, ">limit: peak melt 240 °C</text>"));
	free(svg);
	free(rows);
	assert_int_equal(
	    ow_maps_draw_profile(cv, &box, &f->s, NULL, 0, NULL, NULL, NULL),
	    OW_EARG);
}

static void maps_figure_maps_carry_colour_bar_titles_with_units(void **state)
{
	static const char *const want[OW_MAP_COUNT] = {
	    ">peak melt temperature (°C)</text>",
	    ">unmelted fraction at discharge (%)</text>",
	    ">highest pressure (MPa)</text>",
	    ">throughput (kg/h)</text>",
	    ">specific energy (kWh/kg)</text>",
	    ">highest zone load (% of its heating or cooling power)</text>"};
	struct fix *f = *state;
	int k;

	for (k = 0; k < OW_MAP_COUNT; k++) {
		char name[64];
		size_t n = 0;
		unsigned char *b;

		snprintf(name, sizeof name, "%s.svg",
		         ow_maps_figure_file((enum ow_map_figure)k));
		b = file_in(f->dir, name, &n);
		assert_non_null(b);
		assert_non_null(strstr((char *)b, want[k]));
		assert_non_null(strstr((char *)b, ">screw speed (rpm)</text>"));
		free(b);
	}
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(maps_write_every_image_at_900_by_650),
	    cmocka_unit_test(maps_same_inputs_give_byte_identical_pngs),
	    cmocka_unit_test(maps_window_labels_each_limit_with_name_and_value),
	    cmocka_unit_test(
	        maps_unsafe_region_is_hatched_and_safe_region_clear),
	    cmocka_unit_test(maps_empty_window_says_so_on_the_map),
	    cmocka_unit_test(maps_axis_label_names_the_reference_zone),
	    cmocka_unit_test(maps_profile_shows_the_screw_sections),
	    cmocka_unit_test(
	        maps_figure_maps_carry_colour_bar_titles_with_units),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
