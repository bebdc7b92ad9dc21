/* test_sweep.c - the grid driver: the lattice it lays out, the points the
 * refine pass solves, the same answers for any thread count, and a point
 * the solver refuses marked in the grid without stopping the sweep.
 *
 * The study is tests/data/map-fast.json (a melt-fed short screw that
 * solves quickly): 20..140 rpm, barrel shift -30..30 K, two zones at
 * 200 degC, limits on the peak temperature and the pressure. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
#include "ow_results.h"
#include "ow_sweep.h"

#define STUDY "tests/data/map-fast.json"

static struct ow_grid *sweep(const struct ow_study *s, int nr, int na,
                             int refine, int jobs)
{
	struct ow_sweep_config c;
	struct ow_grid *g = NULL;
	struct ow_diag d = {{0}};

	ow_sweep_default(&c);
	c.rpm_steps = nr;
	c.axis_steps = na;
	c.refine = refine;
	c.jobs = jobs;
	if (ow_sweep_run(s, &c, &g, &d) != OW_OK)
		fail_msg("ow_sweep_run: %s", d.msg);
	return g;
}

/* The README's sweep: `steps` points from `from` to `to` inclusive, evenly
 * spaced, on each axis; refinement makes the lattice 2^refine times finer
 * ((steps - 1) 2^refine + 1 points); in mode shift every zone's set-point
 * is the study's plus the barrel setting, so the reference zone's
 * set-point is 200 degC + axis. */
static void lattice_is_the_readme_sweep(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_grid *g = sweep(s, 5, 4, 1, 2);
	int ir, ia;
	(void)st;
	assert_int_equal(g->stride, 2);
	assert_int_equal(g->n_rpm, (5 - 1) * 2 + 1);
	assert_int_equal(g->n_axis, (4 - 1) * 2 + 1);
	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			assert_abs(p->rpm, 20.0 + 120.0 * ir / 8.0, 1e-9);
			assert_abs(p->axis, -30.0 + 60.0 * ia / 6.0, 1e-9);
			assert_abs(p->set_ref_K, 473.15 + p->axis, 1e-9);
			if (p->solved == 1) {
				assert_abs(p->pt.rpm, p->rpm, 1e-9);
				assert_abs(p->pt.set_K[0], 473.15 + p->axis,
				           1e-9);
				assert_abs(p->pt.set_K[1], 473.15 + p->axis,
				           1e-9);
			}
		}
	ow_grid_destroy(g);
	free(s);
}

/* A sweep of a study without a sweep, or with a grid outside 2..1000
 * points or a refinement outside 0..4, is refused with a message and no
 * grid. */
static void bad_grids_are_refused(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_sweep_config c;
	struct ow_grid *g = NULL;
	struct ow_diag d = {{0}};
	(void)st;
	ow_sweep_default(&c);
	c.rpm_steps = 1;
	assert_int_equal(ow_sweep_run(s, &c, &g, &d), OW_EARG);
	assert_null(g);
	assert_non_null(strstr(d.msg, "2..1000"));
	ow_diag_clear(&d);
	ow_sweep_default(&c);
	c.refine = 5;
	assert_int_equal(ow_sweep_run(s, &c, &g, &d), OW_EARG);
	assert_null(g);
	assert_non_null(strstr(d.msg, "refine 0..4"));
	ow_diag_clear(&d);
	s->line.axes.rpm_steps = 0; /* no sweep in the study */
	ow_sweep_default(&c);
	assert_int_equal(ow_sweep_run(s, &c, &g, &d), OW_EINPUT);
	assert_null(g);
	assert_non_null(strstr(d.msg, "no sweep"));
	free(s);
}

static int safe(const struct ow_grid *g, int ir, int ia)
{
	return ow_grid_at(g, ir, ia)->v.bits == 0;
}

/* One level of refinement (README: "refine the cells a boundary
 * crosses"): every coarse point is solved; a coarse cell whose corners are
 * not all safe or all unsafe has its centre and edge midpoints solved; a
 * point left unsolved lies only in cells whose corners agree, and takes
 * their verdict. The count of solves is the count of solved points. */
static void refine_solves_the_cells_the_window_edge_crosses(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_grid *g = sweep(s, 7, 6, 1, 2);
	int ir, ia, n = 0, refined = 0, skipped = 0;
	(void)st;
	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			n += p->solved == 1;
			if (ir % 2 == 0 && ia % 2 == 0)
				assert_int_equal(p->solved, 1);
		}
	assert_int_equal(g->solves, n);
	for (ia = 0; ia + 2 < g->n_axis; ia += 2)
		for (ir = 0; ir + 2 < g->n_rpm; ir += 2) {
			int a = safe(g, ir, ia),
			    mixed = safe(g, ir + 2, ia) != a ||
			            safe(g, ir, ia + 2) != a ||
			            safe(g, ir + 2, ia + 2) != a;
			int i, j;

			for (j = 0; j <= 2; j++)
				for (i = 0; i <= 2; i++) {
					const struct ow_grid_point *p =
					    ow_grid_at(g, ir + i, ia + j);

					if (mixed)
						assert_int_equal(p->solved, 1);
					else if (p->solved != 1)
						assert_int_equal(p->v.bits == 0,
						                 a);
				}
			refined += mixed;
			skipped += !mixed;
		}
	/* the map has a window edge inside it and cells away from it */
	assert_true(refined > 0);
	assert_true(skipped > 0);
	assert_true(n < g->n_rpm * g->n_axis);
	ow_grid_destroy(g);
	free(s);
}

/* A refined point started from its cell's corners gives the answer the
 * same point gives solved alone from a cold start (ow_test_solve), within
 * the throughput match's tolerance. */
static void refined_points_match_points_solved_alone(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_grid *g = sweep(s, 7, 6, 1, 2);
	int ir, ia, n = 0;
	(void)st;
	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			struct ow_point q;

			if (p->solved != 1 || (ir % 2 == 0 && ia % 2 == 0) ||
			    n >= 8)
				continue;
			q = ow_test_solve(s, p->rpm, p->pt.set_K);
			assert_rel(p->pt.output_kg_s, q.output_kg_s, 1e-3);
			assert_abs(p->pt.peak_K, q.peak_K, 0.1);
			n++;
		}
	assert_true(n >= 4);
	ow_grid_destroy(g);
	free(s);
}

static void same_double(double a, double b)
{
	if (isnan(b))
		assert_true(isnan(a));
	else
		assert_true(a == b);
}

/* ow_sweep.h: "the results do not depend on the number of threads":
 * one, two and three threads give every figure, verdict and margin bit
 * for bit, refined points included. */
static void any_thread_count_gives_the_same_grid(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_grid *g[3];
	int t, k, i;
	(void)st;
	for (t = 0; t < 3; t++)
		g[t] = sweep(s, 6, 5, 1, t + 1);
	for (t = 1; t < 3; t++) {
		assert_int_equal(g[t]->solves, g[0]->solves);
		for (k = 0; k < g[0]->n_rpm * g[0]->n_axis; k++) {
			const struct ow_grid_point *a = &g[0]->pts[k];
			const struct ow_grid_point *b = &g[t]->pts[k];

			assert_int_equal(a->solved, b->solved);
			assert_int_equal(a->v.bits, b->v.bits);
			if (a->solved != 1)
				continue;
			assert_int_equal(a->pt.flags, b->pt.flags);
			for (i = 0; i < ow_results_n_figures(); i++)
				same_double(ow_results_figure(s, &b->pt, i),
				            ow_results_figure(s, &a->pt, i));
			for (i = 0; i < OW_CK_LIMITS; i++)
				same_double(b->v.margin[i], a->v.margin[i]);
		}
	}
	for (t = 0; t < 3; t++)
		ow_grid_destroy(g[t]);
	free(s);
}

/* A barrel shift of -300 K puts the zones at 173 K, which the solver
 * refuses (not a plausible set-point): that row is marked not converged
 * and unsafe in the grid (README: a point that did not converge is always
 * unsafe), the sweep finishes, refines next to it, and the other rows
 * converge as before. */
static void a_point_the_solver_refuses_is_marked(void **st)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_grid *g;
	int ir, ia, bad = 0, good = 0;
	(void)st;
	s->line.axes.axis_from = -300.0;
	s->line.axes.axis_to = 0.0;
	g = sweep(s, 4, 4, 1, 2); /* shifts -300, -200, -100, 0 K */
	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			const struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			int refused = p->axis + 473.15 <= 200.0;

			if (p->solved != 1)
				continue;
			if (refused) {
				assert_true(p->pt.flags &
				            OW_FLAG_NOT_CONVERGED);
				assert_true(p->v.bits & (1u << OW_CK_NOCONV));
				bad++;
			} else {
				assert_false(p->pt.flags &
				             OW_FLAG_NOT_CONVERGED);
				assert_true(p->pt.output_kg_s > 0.0);
				good++;
			}
		}
	assert_int_equal(bad, g->n_rpm); /* the whole first row */
	assert_true(good >= 3 * 4);
	ow_grid_destroy(g);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(lattice_is_the_readme_sweep),
	    cmocka_unit_test(bad_grids_are_refused),
	    cmocka_unit_test(refine_solves_the_cells_the_window_edge_crosses),
	    cmocka_unit_test(refined_points_match_points_solved_alone),
	    cmocka_unit_test(any_thread_count_gives_the_same_grid),
	    cmocka_unit_test(a_point_the_solver_refuses_is_marked),
	};

	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
