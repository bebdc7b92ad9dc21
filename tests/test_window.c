/* test_window.c - the recommended window from a classified lattice: the
 * largest safe rectangle against a brute-force search, the safe share and
 * the robust centre on small masks worked by hand, the ranges over the
 * rectangle, and the boundary crossings against analytic margin fields.
 *
 * The lattices are built here (no solver): each point's verdict and
 * margins are set directly, so every expected answer follows from the
 * mask or field alone. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_window.h"

#define RPM0     20.0 /* lattice: rpm = RPM0 + RPM_STEP ir */
#define RPM_STEP 10.0
#define AX0      (-20.0) /* axis = AX0 + AX_STEP ia (K, shift mode) */
#define AX_STEP  5.0

/* A study with only the peak temperature limit set (so the window's edge
 * is that limit's margin) and the rod line's one zone. */
static struct ow_study *study(void)
{
	struct ow_study *s = ow_test_study("tests/data/limits-all.json");
	struct ow_limits *l = &s->line.limits;

	l->unmelt_frac = l->pressure_Pa = l->power_W = l->torque_Nm = NAN;
	l->min_melt_temp_K = l->min_output_kg_s = l->max_output_kg_s = NAN;
	l->max_sbr = l->zone_load = NAN;
	return s;
}

/* An n_rpm x n_axis lattice, every point solved, figures set from its
 * indices so the ranges over a rectangle are known by hand:
 * output (10 + ir + 2 ia) kg/h, bulk 480 + ia - ir K, peak bulk + 30 + ir. */
static struct ow_grid *lattice(int nr, int na)
{
	struct ow_grid *g = calloc(1, sizeof *g);
	int ir, ia;

	assert_non_null(g);
	g->n_rpm = nr;
	g->n_axis = na;
	g->stride = 1;
	g->solves = nr * na;
	g->pts = calloc((size_t)(nr * na), sizeof *g->pts);
	assert_non_null(g->pts);
	for (ia = 0; ia < na; ia++)
		for (ir = 0; ir < nr; ir++) {
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			p->solved = 1;
			p->rpm = RPM0 + RPM_STEP * ir;
			p->axis = AX0 + AX_STEP * ia;
			p->set_ref_K = 473.15 + p->axis;
			p->pt.output_kg_s = (10.0 + ir + 2.0 * ia) / 3600.0;
			p->pt.discharge_bulk_K = 480.0 + ia - ir;
			p->pt.peak_K = p->pt.discharge_bulk_K + 30.0 + ir;
			for (int c = 0; c < OW_CK_LIMITS; c++)
				p->v.margin[c] = NAN;
			p->v.margin[OW_CK_PEAK_TEMP] = 1.0;
		}
	return g;
}

/* Mark point (ir, ia) unsafe on the peak temperature limit. */
static void unsafe(struct ow_grid *g, int ir, int ia)
{
	struct ow_grid_point *p = ow_grid_at(g, ir, ia);

	p->v.bits = 1u << OW_CK_PEAK_TEMP;
	p->v.margin[OW_CK_PEAK_TEMP] = -1.0;
}

static struct ow_window *extract(const struct ow_study *s,
                                 const struct ow_grid *g)
{
	struct ow_window *w = NULL;
	struct ow_diag d = {{0}};

	if (ow_window_extract(s, g, &w, &d) != OW_OK)
		fail_msg("ow_window_extract: %s", d.msg);
	return w;
}

/* ---- safe share, centre and ranges on masks worked by hand ----------- */

/* 5 x 5, every point safe. Share 25/25 = 1; rectangle the whole
 * lattice. Centre: distances in sweep ranges, x = ir/4, y = ia/4; with no
 * unsafe point only the sweep edge counts, min(x, 1-x, y, 1-y), largest
 * 0.5 at the middle (2, 2). Ranges over the rectangle: output 10 ..
 * 10 + 4 + 8 = 22 kg/h; bulk 480 - 4 .. 480 + 4 = 476..484 K; hottest
 * peak 480 + ia + 30 at ia = 4: 514 K. */
static void all_safe_lattice_by_hand(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(5, 5);
	struct ow_window *w = extract(s, g);
	(void)st;
	assert_false(w->empty);
	assert_abs(w->safe_fraction, 1.0, 0.0);
	assert_int_equal(w->ir0, 0);
	assert_int_equal(w->ir1, 4);
	assert_int_equal(w->ia0, 0);
	assert_int_equal(w->ia1, 4);
	assert_abs(w->centre.rpm, 40.0, 1e-12);
	assert_abs(w->centre.axis, -10.0, 1e-12);
	assert_abs(w->centre_set_K, 473.15 - 10.0, 1e-9);
	assert_rel(w->centre_clearance, 0.5, 1e-12);
	assert_rel(w->output_min_kg_s * 3600.0, 10.0, 1e-12);
	assert_rel(w->output_max_kg_s * 3600.0, 22.0, 1e-12);
	assert_abs(w->melt_min_K, 476.0, 1e-12);
	assert_abs(w->melt_max_K, 484.0, 1e-12);
	assert_abs(w->peak_max_K, 514.0, 1e-12);
	assert_int_equal(w->fail_count[OW_CK_PEAK_TEMP], 0);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* 5 x 5 with the middle point (2, 2) unsafe. Share 24/25. Rectangles of
 * span area 4 tie (ir 0..4 x ia 0..1, ia 3..4, and the columns 0..1,
 * 3..4); the first found, lowest set-points, is kept: ir 0..4 x ia 0..1.
 * In it the distances (x = ir/4, y = ia/4) to the edge and to (2, 2) are
 * at most 0.25, reached exactly at (1, 1), (2, 1) and (3, 1) (to (2, 2)
 * from (1, 1): 0.354); the first, (1, 1), is the centre. */
static void unsafe_middle_point_by_hand(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(5, 5);
	struct ow_window *w;
	(void)st;
	unsafe(g, 2, 2);
	w = extract(s, g);
	assert_abs(w->safe_fraction, 24.0 / 25.0, 1e-15);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* 5 x 5 with the lowest-speed column unsafe. Share 20/25 = 0.8;
 * rectangle ir 1..4 over every set-point; the unsafe column is as far as
 * the sweep edge at x, so the centre is the middle (2, 2), clearance
 * 0.5. Output over the rectangle 11..22 kg/h. */
static void unsafe_low_speed_column_by_hand(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(5, 5);
	struct ow_window *w;
	int ia;
	(void)st;
	for (ia = 0; ia < 5; ia++)
		unsafe(g, 0, ia);
	w = extract(s, g);
	assert_abs(w->safe_fraction, 0.8, 1e-15);
	assert_int_equal(w->fail_count[OW_CK_PEAK_TEMP], 5);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* 5 x 7 with the second set-point row (ia = 1) unsafe: its points have
 * safe neighbours only along the set-point axis. Share 30/35 = 6/7;
 * rectangle rows 2..6 (5 rows, not the single row 0). Centre, y = ia/6:
 * at ir = 2 the distances are min(0.5, y - 1/6, 1 - y): 1/3 at ia = 3
 * and ia = 4, the first kept (ia = 3, axis -5 K), clearance 1/3. */
static void unsafe_inner_row_by_hand(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(5, 7);
	struct ow_window *w;
	int ir;
	(void)st;
	for (ir = 0; ir < 5; ir++)
		unsafe(g, ir, 1);
	w = extract(s, g);
	assert_rel(w->safe_fraction, 30.0 / 35.0, 1e-15);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* 6 x 6, unsafe in the top-right corner block (ir 3..5, ia 4..5) and the
 * point (0, 0). Safe 36 - 6 - 1 = 29: share 29/36. Largest rectangle by
 * spans: ir 1..5 x ia 0..3 (4 x 3 = 12), against ir 0..5 x ia 1..3
 * (5 x 2 = 10), ir 0..2 x ia 1..5 (2 x 4 = 8), ir 1..2 x ia 0..5 (1 x 5 =
 * 5); no other rectangle of span area 12 is safe. */
static void corner_block_by_hand(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(6, 6);
	struct ow_window *w;
	int ir, ia;
	(void)st;
	for (ia = 4; ia < 6; ia++)
		for (ir = 3; ir < 6; ir++)
			unsafe(g, ir, ia);
	unsafe(g, 0, 0);
	w = extract(s, g);
	assert_rel(w->safe_fraction, 29.0 / 36.0, 1e-15);
	assert_int_equal(w->ir0, 1);
	assert_int_equal(w->ir1, 5);
	assert_int_equal(w->ia0, 0);
	assert_int_equal(w->ia1, 3);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* No safe point: an empty window, share 0. */
static void all_unsafe_lattice_is_empty(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(3, 3);
	struct ow_window *w;
	int ir, ia;
	(void)st;
	for (ia = 0; ia < 3; ia++)
		for (ir = 0; ir < 3; ir++)
			unsafe(g, ir, ia);
	w = extract(s, g);
	assert_true(w->empty);
	assert_abs(w->safe_fraction, 0.0, 0.0);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* A lattice one point wide in an axis (no sweep makes one, but a saved
 * map folder could carry it) has no step to interpolate on (0/0): it is
 * refused with a message, never a hang or a read past the lattice. */
static void one_point_wide_lattice_ends(void **st)
{
	struct ow_study *s = study();
	struct ow_grid *g = lattice(4, 1);
	struct ow_window *w = NULL;
	struct ow_diag d = {0};
	(void)st;
	assert_int_equal(ow_window_extract(s, g, &w, &d), OW_EINPUT);
	assert_null(w);
	assert_non_null(strstr(d.msg, "4 x 1"));
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* ---- boundary crossings against analytic fields --------------------- */

/* Lattice n x n over x = ir/(n-1), y = ia/(n-1) in [0, 1]; the peak
 * temperature margin set to f(x, y), the point failing where f < 0. */
static struct ow_grid *field(int n, double (*f)(double, double))
{
	struct ow_grid *g = lattice(n, n);
	int ir, ia;

	for (ia = 0; ia < n; ia++)
		for (ir = 0; ir < n; ir++) {
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			double m = f(ir / (n - 1.0), ia / (n - 1.0));

			p->v.margin[OW_CK_PEAK_TEMP] = m;
			p->v.bits = m < 0.0 ? 1u << OW_CK_PEAK_TEMP : 0u;
		}
	return g;
}

static double xr(const struct ow_xy *p, int n)
{
	return (p->rpm - RPM0) / RPM_STEP / (n - 1.0);
}

static double ya(const struct ow_xy *p, int n)
{
	return (p->axis - AX0) / AX_STEP / (n - 1.0);
}

/* A plane margin, within [-0.387, 0.413] (below the edge's cap of 1);
 * no lattice point of the 21 x 21 lattice lies on its zero line
 * (5 i + 3 j = 41.3 has no integer solution). */
static double plane(double x, double y)
{
	return 0.413 - 0.5 * x - 0.3 * y;
}

#define CX 0.4512
#define CY 0.5537
#define CR 0.3011
static double circle(double x, double y)
{
	return (CR * CR - (x - CX) * (x - CX) - (y - CY) * (y - CY)) /
	       (CR * CR);
}

static const struct ow_boundary *boundary(const struct ow_window *w, int c)
{
	for (int b = 0; b < w->n_boundaries; b++)
		if (w->bounds[b].check == c)
			return &w->bounds[b];
	fail_msg("no boundary for check %d", c);
	return NULL;
}

/* Crossings sit on lattice edges: one coordinate on a lattice line. */
static void assert_on_lattice_edge(double x, double y, int n)
{
	double gx = x * (n - 1), gy = y * (n - 1);

	assert_true(fabs(gx - round(gx)) < 1e-9 || fabs(gy - round(gy)) < 1e-9);
}

/* For a plane, linear interpolation along a lattice edge is exact: every
 * crossing lies on the zero line 0.5 x + 0.3 y = 0.4 to round-off, for
 * the limit's boundary and for the window's edge (the only limit set).
 * The polyline spans the lattice: from the bottom edge (y = 0,
 * x = 0.826) to the top edge (x = 0.226 at y = 1). */
static void boundary_of_a_plane_is_exact(void **st)
{
	struct ow_study *s = study();
	int n = 21, checks[2] = {OW_CK_PEAK_TEMP, OW_WINDOW_EDGE};
	struct ow_grid *g = field(n, plane);
	struct ow_window *w = extract(s, g);
	(void)st;
	for (int c = 0; c < 2; c++) {
		const struct ow_boundary *b = boundary(w, checks[c]);
		const struct ow_polyline *pl = &b->lines[0];
		double x0, y0, x1, y1;

		assert_int_equal(b->n_lines, 1);
		assert_true(pl->n >= n);
		for (int i = 0; i < pl->n; i++) {
			double x = xr(&pl->p[i], n), y = ya(&pl->p[i], n);

			assert_abs(plane(x, y), 0.0, 1e-12);
			assert_on_lattice_edge(x, y, n);
		}
		x0 = xr(&pl->p[0], n);
		y0 = ya(&pl->p[0], n);
		x1 = xr(&pl->p[pl->n - 1], n);
		y1 = ya(&pl->p[pl->n - 1], n);
		if (y0 > y1) { /* either direction */
			double t = x0;
			x0 = x1;
			x1 = t;
			t = y0;
			y0 = y1;
			y1 = t;
		}
		assert_abs(x0, 0.826, 1e-12);
		assert_abs(y0, 0.0, 1e-12);
		assert_abs(x1, 0.226, 1e-12);
		assert_abs(y1, 1.0, 1e-12);
	}
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

/* A circle of radius R = 0.3011 about (0.4512, 0.5537), margin (R^2 - r^2)/R^2,
 * unsafe outside. Along a lattice edge of length h the margin is a
 * quadratic with second derivative -2/R^2, so its linear interpolant
 * errs by at most h^2/(4 R^2) (interpolation error |f''| h^2/8, Burden &
 * Faires, Numerical Analysis, 9th ed. 2011, Theorem 3.3) and lies below
 * it: every crossing has 0 <= R^2 - r^2 <= h^2/4, i.e. sits inside the
 * circle by at most h^2/(4 (R + r)). The boundary is one closed loop
 * around the centre. */
static void boundary_of_a_circle_within_interpolation_error(void **st)
{
	struct ow_study *s = study();
	int n = 41;
	double h = 1.0 / (n - 1), turn = 0.0;
	struct ow_grid *g = field(n, circle);
	struct ow_window *w = extract(s, g);
	const struct ow_boundary *b = boundary(w, OW_CK_PEAK_TEMP);
	const struct ow_polyline *pl = &b->lines[0];
	(void)st;
	assert_int_equal(b->n_lines, 1);
	assert_true(pl->n > 40);
	for (int i = 0; i < pl->n; i++) {
		double x = xr(&pl->p[i], n) - CX, y = ya(&pl->p[i], n) - CY;
		double gap = CR * CR - (x * x + y * y);
		int j = (i + 1) % pl->n;
		double x2 = xr(&pl->p[j], n) - CX, y2 = ya(&pl->p[j], n) - CY;

		assert_true(gap >= -1e-12);
		assert_true(gap <= h * h / 4.0 + 1e-12);
		assert_on_lattice_edge(x + CX, y + CY, n);
		turn += atan2(x * y2 - y * x2, x * x2 + y * y2);
	}
	/* closed: last point returns to the first; winds once round */
	assert_abs(xr(&pl->p[0], n), xr(&pl->p[pl->n - 1], n), 1e-12);
	assert_abs(ya(&pl->p[0], n), ya(&pl->p[pl->n - 1], n), 1e-12);
	assert_abs(fabs(turn), 2.0 * OW_PI, 1e-9);
	/* the safe share counts the lattice points inside, about pi R^2
	 * (n - 1)^2 = 456 of them (Gauss's circle problem: off by a few
	 * times the radius in lattice steps, 12) */
	assert_abs(w->safe_fraction * n * n,
	           OW_PI * CR * CR * (n - 1) * (n - 1), 36.0);
	ow_window_destroy(w);
	ow_grid_destroy(g);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(all_safe_lattice_by_hand),
	    cmocka_unit_test(unsafe_middle_point_by_hand),
	    cmocka_unit_test(unsafe_low_speed_column_by_hand),
	    cmocka_unit_test(unsafe_inner_row_by_hand),
	    cmocka_unit_test(corner_block_by_hand),
	    cmocka_unit_test(all_unsafe_lattice_is_empty),
	    cmocka_unit_test(one_point_wide_lattice_ends),
	    cmocka_unit_test(boundary_of_a_plane_is_exact),
	    cmocka_unit_test(boundary_of_a_circle_within_interpolation_error),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
