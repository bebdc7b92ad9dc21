/* test_window_bounds.c - the recommended rectangle does not move with the
 * grid, every bound says what sets it, and every limit reads one way. */
#include "testmap.h"
#include "testutil.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "ow_sweep.h"
#include "ow_window.h"

#define STUDY "fixtures/studies/hdpe-sf.json" /* 20..120 rpm, 180..230 C */

/* A lattice of n x n points over the study's sweep whose margins are
 * given by fn (set-point in degC); every other limit passes. */
typedef void (*margins_fn)(double rpm, double set_C, double *m);

static struct ow_grid *synthetic(const struct ow_study *s, int n, margins_fn fn)
{
	const struct ow_axes *ax = &s->line.axes;
	struct ow_grid *g = calloc(1, sizeof *g);
	int ir, ia, c;

	assert_non_null(g);
	g->n_rpm = g->n_axis = n;
	g->stride = 1;
	g->pts = calloc((size_t)n * (size_t)n, sizeof *g->pts);
	assert_non_null(g->pts);
	for (ia = 0; ia < n; ia++)
		for (ir = 0; ir < n; ir++) {
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			p->solved = 1;
			p->rpm = ax->rpm_from +
			         (ax->rpm_to - ax->rpm_from) * ir / (n - 1);
			p->axis = ax->axis_from +
			          (ax->axis_to - ax->axis_from) * ia / (n - 1);
			p->set_ref_K = ow_line_axis_ref_K(&s->line, p->axis);
			for (c = 0; c < OW_CK_LIMITS; c++)
				p->v.margin[c] =
				    ow_check_active(&s->line.limits,
				                    (enum ow_check)c)
				        ? 1.0
				        : NAN;
			fn(p->rpm, p->set_ref_K - OW_ZERO_C_K, p->v.margin);
			for (c = 0; c < OW_CK_LIMITS; c++)
				if (p->v.margin[c] < 0.0)
					p->v.bits |= 1u << c;
			g->solves++;
		}
	return g;
}

static struct ow_window *window_of(const struct ow_study *s, int n,
                                   margins_fn fn)
{
	struct ow_grid *g = synthetic(s, n, fn);
	struct ow_window *w = NULL;

	assert_int_equal(ow_window_extract(s, g, &w, NULL), OW_OK);
	ow_grid_destroy(g);
	return w;
}

static double set_C(const struct ow_window *w, int max)
{
	return (max ? w->set_max_K : w->set_min_K) - OW_ZERO_C_K;
}

/* Pressure crosses its limit at 57.3 rpm at every set-point. */
static void pressure_at_57_3(double rpm, double set, double *m)
{
	(void)set;
	m[OW_CK_PRESSURE] = (57.3 - rpm) / 100.0;
}

static void a_speed_limit_is_found_between_points_on_any_grid(void **state)
{
	struct ow_study *s = ow_test_study(STUDY);
	/* 12 and 14 points: speed steps that binary floating point cannot
	 * hold exactly, so neighbouring segments must still join */
	static const int sizes[5] = {11, 12, 14, 21, 41};
	int k;

	(void)state;
	for (k = 0; k < 5; k++) {
		struct ow_window *w = window_of(s, sizes[k], pressure_at_57_3);

		assert_false(w->empty);
		/* a linear margin is exact under linear interpolation
		 * (Press et al., Numerical Recipes, 3rd ed., 3.1): the
		 * crossing at 57.3 rpm, rounded inward to whole rpm */
		assert_abs(w->rpm_max, 57.0, 1e-9);
		assert_int_equal(w->bound[OW_WB_RPM_MAX].check, OW_CK_PRESSURE);
		assert_abs(w->bound[OW_WB_RPM_MAX].resolution, 1.0, 1e-12);
		/* the other three sides are the sweep's edges, said so */
		assert_abs(w->rpm_min, 20.0, 1e-9);
		assert_abs(set_C(w, 0), 180.0, 1e-9);
		assert_abs(set_C(w, 1), 230.0, 1e-9);
		assert_int_equal(w->bound[OW_WB_RPM_MIN].check,
		                 OW_WINDOW_SWEEP_EDGE);
		assert_int_equal(w->bound[OW_WB_SET_MIN].check,
		                 OW_WINDOW_SWEEP_EDGE);
		assert_int_equal(w->bound[OW_WB_SET_MAX].check,
		                 OW_WINDOW_SWEEP_EDGE);
		assert_true(w->at_sweep_edge);
		ow_window_destroy(w);
	}
	free(s);
}

/* Peak temperature limit along the line through (100 rpm, 180 C) and
 * (20 rpm, 222.6 C): unsafe above it. */
static void peak_on_a_diagonal(double rpm, double set, double *m)
{
	m[OW_CK_PEAK_TEMP] = 1.0 - (rpm - 20.0) / 80.0 - (set - 180.0) / 42.6;
}

static void a_sloping_limit_gives_the_same_corner_on_any_grid(void **state)
{
	struct ow_study *s = ow_test_study(STUDY);
	static const int sizes[3] = {11, 21, 41};
	int k;

	(void)state;
	for (k = 0; k < 3; k++) {
		struct ow_window *w =
		    window_of(s, sizes[k], peak_on_a_diagonal);

		/* The largest rectangle x y under x/a + y/b = 1 has its
		 * corner at (a/2, b/2) (Stewart, Calculus, 8th ed., 4.7,
		 * rectangle inscribed in a triangle): 21.3 K above the
		 * sweep's foot; on whole degrees the area u (80 - 80 u /
		 * 42.6) is largest at u = 21 K (201 C), where the line
		 * is at 20 + 80 (1 - 21/42.6) = 60.56 rpm -> 60 rpm. */
		assert_abs(set_C(w, 1), 201.0, 1e-9);
		assert_abs(w->rpm_max, 60.0, 1e-9);
		assert_int_equal(w->bound[OW_WB_SET_MAX].check,
		                 OW_CK_PEAK_TEMP);
		assert_int_equal(w->bound[OW_WB_RPM_MAX].check,
		                 OW_CK_PEAK_TEMP);
		assert_abs(w->rpm_min, 20.0, 1e-9);
		assert_abs(set_C(w, 0), 180.0, 1e-9);
		ow_window_destroy(w);
	}
	free(s);
}

static void all_safe(double rpm, double set, double *m)
{
	(void)rpm;
	(void)set;
	(void)m;
}

static void a_map_safe_everywhere_is_bounded_only_by_the_sweep(void **state)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_window *w = window_of(s, 11, all_safe);
	char why[160];
	int k;

	(void)state;
	assert_abs(w->safe_fraction, 1.0, 1e-12);
	for (k = 0; k < OW_WB_COUNT; k++) {
		assert_int_equal(w->bound[k].check, OW_WINDOW_SWEEP_EDGE);
		ow_window_setter_text(w->bound[k].check, why, sizeof why);
		assert_string_equal(why, OW_WINDOW_SWEEP_EDGE_TEXT);
		assert_string_equal(ow_window_setter_key(w->bound[k].check),
		                    "sweep_edge");
	}
	assert_true(w->at_sweep_edge);
	ow_window_destroy(w);
	free(s);
}

/* The demo line on 21 x 21, 41 x 41 and 41 x 41 refined once: every bound
 * agrees within the resolution it states, and is set by the same thing.
 * (The figures are the model's, so no value is fixed here: the promise
 * checked is that a numerical setting does not move a bound.) */
static void the_demo_bounds_do_not_move_with_the_grid(void **state)
{
	static const int grid[3][3] = {{21, 21, 0}, {41, 41, 0}, {41, 41, 1}};
	struct ow_test_map m[3];
	int k, b;

	(void)state;
	for (k = 0; k < 3; k++)
		ow_test_map_make(&m[k], grid[k][0], grid[k][1], grid[k][2]);
	for (k = 1; k < 3; k++)
		for (b = 0; b < OW_WB_COUNT; b++) {
			const struct ow_window_bound *x = &m[0].w->bound[b];
			const struct ow_window_bound *y = &m[k].w->bound[b];

			assert_int_equal(x->check, y->check);
			assert_abs(x->value, y->value,
			           fmax(x->resolution, y->resolution) + 1e-9);
		}
	for (k = 0; k < 3; k++)
		ow_test_map_free(&m[k]);
}

/* Every limit reads "<quantity> at most <value>" or "... at least ...",
 * and a point failing it "... above its limit" or "... below its limit",
 * never a minimum with "at most" (a contradiction read aloud). */
static void every_limit_reads_one_way(void **state)
{
	int c;

	(void)state;
	for (c = 0; c < OW_CK_COUNT; c++) {
		const char *key = ow_check_key((enum ow_check)c);
		const char *rel = ow_check_relation((enum ow_check)c);
		const char *fail = ow_check_failure((enum ow_check)c);
		const char *text = ow_check_text((enum ow_check)c);
		int lower = strncmp(key, "min_", 4) == 0;

		assert_non_null(strstr(fail, text));
		assert_null(strstr(text, "minimum"));
		assert_null(strstr(text, "maximum"));
		if (c >= OW_CK_LIMITS) {
			assert_null(rel);
			assert_string_equal(fail, text);
			continue;
		}
		assert_string_equal(rel, lower ? "at least" : "at most");
		assert_non_null(strstr(fail, lower ? " below its limit"
		                                   : " above its limit"));
	}
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(a_speed_limit_is_found_between_points_on_any_grid),
	    cmocka_unit_test(a_sloping_limit_gives_the_same_corner_on_any_grid),
	    cmocka_unit_test(
	        a_map_safe_everywhere_is_bounded_only_by_the_sweep),
	    cmocka_unit_test(every_limit_reads_one_way),
	    cmocka_unit_test(the_demo_bounds_do_not_move_with_the_grid),
	};

	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
