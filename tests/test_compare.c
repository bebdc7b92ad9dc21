/* test_compare.c - two studies on one lattice: the combined verdicts, the
 * axes check, the common window against both cases' safe sets, a worn
 * screw against the new one, the figures at the centres and the input
 * fields that differ. */
#include "testutil.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_compare.h"
#include "ow_config.h"
#include "ow_units.h"

#define FAST "tests/data/map-fast.json"
#define WORN "tests/data/compare-fast-worn.json"

static struct ow_compare *run(const struct ow_study *a,
                              const struct ow_study *b, int refine)
{
	struct ow_sweep_config c;
	struct ow_compare *cmp = NULL;
	struct ow_diag d = {{0}};

	ow_sweep_default(&c);
	c.jobs = 2;
	c.refine = refine;
	if (ow_compare_run(a, b, &c, &cmp, &d) != OW_OK)
		fail_msg("%s", d.msg);
	return cmp;
}

/* A lattice of 2 x 1 points with the given bits and pressure margins. */
static struct ow_grid *tiny(unsigned b0, unsigned b1, double m0, double m1)
{
	struct ow_grid *g = calloc(1, sizeof *g);
	int i, c;

	assert_non_null(g);
	g->n_rpm = 2;
	g->n_axis = 1;
	g->stride = 1;
	g->pts = calloc(2, sizeof *g->pts);
	assert_non_null(g->pts);
	for (i = 0; i < 2; i++) {
		g->pts[i].solved = 1;
		g->pts[i].rpm = 10.0 * (i + 1);
		for (c = 0; c < OW_CK_LIMITS; c++)
			g->pts[i].v.margin[c] = NAN;
	}
	g->pts[0].v.bits = b0;
	g->pts[1].v.bits = b1;
	g->pts[0].v.margin[OW_CK_PRESSURE] = m0;
	g->pts[1].v.margin[OW_CK_PRESSURE] = m1;
	return g;
}

/* Definition of the common window (unsafe if unsafe in A or in B): bits
 * OR-ed, margins the smaller, a margin set in one study only kept. */
static void combined_verdict_is_unsafe_where_either_case_is(void **state)
{
	struct ow_grid *a = tiny(0u, 1u << OW_CK_PEAK_TEMP, 0.3, 0.2);
	struct ow_grid *b = tiny(1u << OW_CK_PRESSURE, 0u, -0.1, NAN);
	struct ow_grid *g = NULL;
	(void)state;
	b->pts[1].solved = 0; /* inside a uniform cell of B */
	assert_int_equal(ow_compare_combine(a, b, 0, &g, NULL), OW_OK);
	assert_int_equal(g->pts[0].v.bits, 1u << OW_CK_PRESSURE);
	assert_int_equal(g->pts[1].v.bits, 1u << OW_CK_PEAK_TEMP);
	assert_abs(g->pts[0].v.margin[OW_CK_PRESSURE], -0.1, 0.0);
	assert_abs(g->pts[1].v.margin[OW_CK_PRESSURE], 0.2, 0.0);
	assert_true(isnan(g->pts[0].v.margin[OW_CK_POWER]));
	assert_int_equal(g->pts[0].solved, 1);
	assert_int_equal(g->pts[1].solved, 0);
	assert_int_equal(g->solves, 1);
	assert_abs(g->pts[1].rpm, 20.0, 0.0);
	ow_grid_destroy(g);
	ow_grid_destroy(a);
	ow_grid_destroy(b);
}

static void combine_refuses_lattices_of_different_size(void **state)
{
	struct ow_grid *a = tiny(0u, 0u, 1.0, 1.0);
	struct ow_grid *b = tiny(0u, 0u, 1.0, 1.0);
	struct ow_grid *g = NULL;
	(void)state;
	b->n_rpm = 1;
	b->n_axis = 2;
	assert_int_equal(ow_compare_combine(a, b, 0, &g, NULL), OW_EARG);
	assert_null(g);
	ow_grid_destroy(a);
	ow_grid_destroy(b);
}

/* The first differing sweep field is named, with both files. */
static void expect_refused(const struct ow_study *a, const struct ow_study *b,
                           const struct ow_sweep_config *c, const char *field)
{
	struct ow_diag d = {{0}};

	assert_int_equal(ow_compare_check_axes(a, b, c, &d), OW_EINPUT);
	if (!strstr(d.msg, field) || !strstr(d.msg, a->path) ||
	    !strstr(d.msg, b->path))
		fail_msg("message lacks %s or a file: %s", field, d.msg);
}

static void axes_that_differ_are_refused_naming_the_field(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_study *c = malloc(sizeof *c);
	struct ow_sweep_config grid;
	(void)state;
	assert_non_null(c);
	assert_int_equal(ow_compare_check_axes(a, b, NULL, NULL), OW_OK);
	*c = *b;
	c->line.axes.rpm_steps = 21;
	expect_refused(a, c, NULL, "sweep.rpm.steps");
	ow_sweep_default(&grid);
	grid.rpm_steps = 15; /* --grid: one lattice whatever the studies say */
	grid.axis_steps = 15;
	assert_int_equal(ow_compare_check_axes(a, c, &grid, NULL), OW_OK);
	*c = *b;
	c->line.axes.rpm_to = 150.0;
	expect_refused(a, c, NULL, "sweep.rpm.to");
	*c = *b;
	c->line.axes.mode = OW_AXIS_ZONE;
	expect_refused(a, c, NULL, "sweep.barrel.mode");
	*c = *b;
	c->line.axes.axis_from = -20.0;
	expect_refused(a, c, NULL, "sweep.barrel.from");
	*c = *b;
	/* two resins at their own set-points: a shift moves each study's
	 * own zones, so the two are aligned on the shift, not refused */
	c->line.zones[1].set_K += 10.0;
	assert_int_equal(ow_compare_check_axes(a, c, NULL, NULL), OW_OK);
	free(a);
	free(b);
	free(c);
}

static int safe(const struct ow_grid *g, int ir, int ia)
{
	return ow_grid_at(g, ir, ia)->v.bits == 0;
}

/* The common window's safe set is the intersection of both safe sets,
 * and its rectangle lies in both (as points of the lattice). */
static void check_common_inside_both(const struct ow_compare *cmp)
{
	const struct ow_window *w = cmp->common[0];
	int ir, ia, both = 0;

	assert_false(w->empty);
	for (ia = 0; ia < cmp->n_axis; ia++)
		for (ir = 0; ir < cmp->n_rpm; ir++) {
			int in = safe(cmp->map[0]->grid, ir, ia) &&
			         safe(cmp->map[1]->grid, ir, ia);

			assert_int_equal(safe(cmp->common_grid[0], ir, ia), in);
			both += in;
			assert_int_equal(ow_compare_class_at(cmp, ir, ia) ==
			                     OW_CMP_BOTH,
			                 in);
			if (ir >= w->ir0 && ir <= w->ir1 && ia >= w->ia0 &&
			    ia <= w->ia1)
				assert_true(in);
		}
	assert_int_equal(both, cmp->count[OW_CMP_BOTH]);
	assert_true(w->safe_fraction <= cmp->map[0]->window->safe_fraction);
	assert_true(w->safe_fraction <= cmp->map[1]->window->safe_fraction);
}

static void common_window_lies_inside_both_safe_sets(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_compare *cmp = run(a, b, 0);
	struct ow_compare *ref = run(a, b, 1);
	(void)state;
	check_common_inside_both(cmp);
	check_common_inside_both(ref); /* refined: lattices refined apart */
	assert_int_equal(cmp->count[0] + cmp->count[1] + cmp->count[2] +
	                     cmp->count[3],
	                 cmp->n_rpm * cmp->n_axis);
	ow_compare_destroy(cmp);
	ow_compare_destroy(ref);
	free(a);
	free(b);
}

/* Same verdicts, so the same rectangle and centre whichever case's
 * figures the combined lattice carries; the ranges are each case's. */
static void common_window_is_the_same_for_either_case_figures(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_compare *cmp = run(a, b, 0);
	const struct ow_window *x = cmp->common[0], *y = cmp->common[1];
	(void)state;
	assert_int_equal(x->ir0, y->ir0);
	assert_int_equal(x->ir1, y->ir1);
	assert_int_equal(x->ia0, y->ia0);
	assert_int_equal(x->ia1, y->ia1);
	assert_abs(x->centre.rpm, y->centre.rpm, 0.0);
	assert_abs(x->centre.axis, y->centre.axis, 0.0);
	assert_true(x->output_max_kg_s > y->output_max_kg_s); /* A: new */
	ow_compare_destroy(cmp);
	free(a);
	free(b);
}

/* Common practice: a worn screw delivers less at the same speed, and its
 * window is smaller or lies elsewhere. Why: flights worn from 0.06 mm to
 * 0.4 mm let melt leak back over them, the pressure-driven leakage growing
 * with the cube of the clearance (Crawford, Plastics Engineering, 3rd ed.,
 * 1998, sec. 4.2, eq. 4.8). */
static void worn_screw_gives_less_output_and_another_window(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_compare *cmp = run(a, b, 0);
	const struct ow_window *wa = cmp->map[0]->window;
	const struct ow_window *wb = cmp->map[1]->window;
	int i, n = cmp->n_rpm * cmp->n_axis, moved;
	(void)state;
	for (i = 0; i < n; i++) {
		const struct ow_grid_point *p = &cmp->map[0]->grid->pts[i];
		const struct ow_grid_point *q = &cmp->map[1]->grid->pts[i];

		assert_abs(p->rpm, q->rpm, 0.0);
		assert_true(q->pt.output_kg_s < p->pt.output_kg_s);
	}
	moved = wa->rpm_min != wb->rpm_min || wa->rpm_max != wb->rpm_max ||
	        wa->axis_min != wb->axis_min || wa->axis_max != wb->axis_max;
	assert_true(moved || wb->safe_fraction < wa->safe_fraction);
	/* the reason printed: where only the worn screw is safe, the new
	 * one breaks its pressure limit (less leakage, more pressure) */
	assert_true(cmp->count[OW_CMP_B_ONLY] > 0);
	assert_true(cmp->lost[OW_CMP_B][OW_CK_PRESSURE] > 0);
	ow_compare_destroy(cmp);
	free(a);
	free(b);
}

/* The figures at a centre are those of one cold solve there, as `opwin
 * point` would give (same solver, same start). */
static void centre_figures_are_those_of_a_single_solve(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_compare *cmp = run(a, b, 0);
	int at, k;
	(void)state;
	for (at = 0; at < OW_CMP_AT_COUNT; at++) {
		const struct ow_cmp_point *p = &cmp->at[at];

		assert_true(p->valid);
		for (k = 0; k < 2; k++) {
			struct ow_solver *sv = NULL;
			struct ow_point pt;
			double set_K[OW_MAX_ZONES];

			ow_line_apply_axis(&cmp->study[k]->line, p->axis,
			                   set_K);
			assert_int_equal(
			    ow_solver_create(cmp->study[k], &sv, NULL), OW_OK);
			assert_int_equal(
			    ow_solver_run(sv, p->rpm, set_K, 0.0, &pt, NULL),
			    OW_OK);
			assert_rel(p->pt[k].output_kg_s, pt.output_kg_s, 1e-12);
			assert_rel(p->pt[k].peak_K, pt.peak_K, 1e-12);
			assert_int_equal(p->v[k].bits, 0); /* centres safe */
			ow_solver_destroy(sv);
		}
	}
	assert_abs(cmp->at[OW_CMP_AT_COMMON].rpm, cmp->common[0]->centre.rpm,
	           0.0);
	assert_abs(cmp->at[OW_CMP_AT_B].axis, cmp->map[1]->window->centre.axis,
	           0.0);
	ow_compare_destroy(cmp);
	free(a);
	free(b);
}

/* An empty window has no centre: nothing to solve there. */
static void empty_windows_have_no_centre_points(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_compare *cmp;
	(void)state;
	b->line.limits.pressure_Pa = 1e3; /* no point builds under 1 kPa */
	cmp = run(a, b, 0);
	assert_true(cmp->map[1]->window->empty);
	assert_true(cmp->common[0]->empty);
	assert_false(cmp->at[OW_CMP_AT_COMMON].valid);
	assert_false(cmp->at[OW_CMP_AT_B].valid);
	assert_true(cmp->at[OW_CMP_AT_A].valid);
	assert_int_equal(cmp->count[OW_CMP_BOTH], 0);
	ow_compare_destroy(cmp);
	free(a);
	free(b);
}

static const struct ow_input_diff *find(const struct ow_input_diff *e, int n,
                                        const char *field)
{
	int i;

	for (i = 0; i < n; i++)
		if (!strcmp(e[i].field, field))
			return &e[i];
	return NULL;
}

static void input_differences_name_the_fields_with_units(void **state)
{
	struct ow_study *a = ow_test_study(FAST), *b = ow_test_study(WORN);
	struct ow_input_diff e[64];
	const struct ow_input_diff *w;
	int n;
	(void)state;
	assert_int_equal(ow_compare_inputs(a, a, OW_SYS_SI, e, 64), 0);
	n = ow_compare_inputs(a, b, OW_SYS_SI, e, 64);
	assert_int_equal(n, 5); /* title, screw name, the wear entry */
	w = find(e, n, "screw.wear[0].clearance");
	assert_non_null(w);
	assert_string_equal(w->a, "—");
	assert_string_equal(w->b, "0.4 mm");
	assert_non_null(find(e, n, "screw.wear[0].to"));
	assert_string_equal(find(e, n, "screw.wear[0].to")->b, "8 D");
	b->line.limits.power_W = 5e3;
	b->resin.melt_density_kg_m3 = 800.0;
	n = ow_compare_inputs(a, b, OW_SYS_US, e, 64);
	/* 0.4 mm = 0.015748 in (NIST SP 811: 1 in = 25.4 mm exactly) */
	assert_string_equal(find(e, n, "screw.wear[0].clearance")->b,
	                    "0.015748 in");
	assert_string_equal(find(e, n, "limits.power")->a, "not set");
	assert_non_null(find(e, n, "resin.melt_density"));
	assert_int_equal(ow_compare_inputs(a, b, OW_SYS_SI, e, 2), n);
	free(a);
	free(b);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(combined_verdict_is_unsafe_where_either_case_is),
	    cmocka_unit_test(combine_refuses_lattices_of_different_size),
	    cmocka_unit_test(axes_that_differ_are_refused_naming_the_field),
	    cmocka_unit_test(common_window_lies_inside_both_safe_sets),
	    cmocka_unit_test(common_window_is_the_same_for_either_case_figures),
	    cmocka_unit_test(worn_screw_gives_less_output_and_another_window),
	    cmocka_unit_test(centre_figures_are_those_of_a_single_solve),
	    cmocka_unit_test(empty_windows_have_no_centre_points),
	    cmocka_unit_test(input_differences_name_the_fields_with_units),
	};

	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
