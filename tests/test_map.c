/* test_map.c - the map result type (ow_map.h): a run holds the window's
 * centre as a single cold solve there gives it, a run asked for less
 * holds less, a spread's robust window lies inside the nominal one, and a
 * map saved and read back holds the same window, centre and profile. The
 * data: tests/data/map-fast.json, a melt-fed study quick to sweep. */
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "opwin.h"
#include "ow_map.h"
#include "ow_mapdir.h"
#include "ow_report.h"

#define STUDY "tests/data/map-fast.json"

static struct ow_map *run(const struct ow_study *s, int centre,
                          const char *spread_json, struct ow_units *u,
                          struct ow_study *mutable_s)
{
	struct ow_map_config c;
	struct ow_map *m = NULL;
	struct ow_diag d = {{0}};

	if (spread_json)
		assert_int_equal(ow_config_spread_text(
		                     u, spread_json, "--spread", mutable_s, &d),
		                 OW_OK);
	ow_map_default(&c);
	c.sweep.rpm_steps = 5;
	c.sweep.axis_steps = 5;
	c.spread.samples = 4;
	c.centre = centre;
	if (ow_map_run(s, &c, &m, &d) != OW_OK)
		fail_msg("ow_map_run: %s", d.msg);
	return m;
}

/* The centre of a map is the point `opwin point` gives there: a cold
 * solve at the window's centre speed and set-points, figure for figure,
 * with a profile from the hopper to the tip of the 8 D screw. */
static void map_centre_is_the_point_solved_alone_there(void **state)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_map *m = run(s, 1, NULL, NULL, NULL);
	double set_K[OW_MAX_ZONES];
	struct ow_point p;

	(void)state;
	assert_false(m->window->empty);
	assert_true(m->has_centre);
	ow_line_apply_axis(&s->line, m->window->centre.axis, set_K);
	p = ow_test_solve(s, m->window->centre.rpm, set_K);
	assert_abs(m->centre.output_kg_s, p.output_kg_s, 0.0);
	assert_abs(m->centre.peak_K, p.peak_K, 0.0);
	assert_abs(m->centre.power_W, p.power_W, 0.0);
	assert_true(m->n_profile > 10);
	assert_abs(m->profile[0].axial_m, 0.0, 1e-12);
	assert_abs(m->profile[m->n_profile - 1].axial_m / s->screw.diameter_m,
	           8.0, 1e-9);
	assert_null(m->spread); /* the study has no spread */
	assert_null(m->robust);
	ow_map_destroy(m);
	free(s);
}

/* Asked without the centre, a map holds none; the lattice and window are
 * the same as with it. */
static void map_without_the_centre_holds_none(void **state)
{
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_map *a = run(s, 0, NULL, NULL, NULL);
	struct ow_map *b = run(s, 1, NULL, NULL, NULL);

	(void)state;
	assert_false(a->has_centre);
	assert_null(a->profile);
	assert_int_equal(a->n_profile, 0);
	assert_abs(a->window->rpm_min, b->window->rpm_min, 0.0);
	assert_abs(a->window->rpm_max, b->window->rpm_max, 0.0);
	assert_abs(a->window->set_min_K, b->window->set_min_K, 0.0);
	assert_abs(a->window->set_max_K, b->window->set_max_K, 0.0);
	ow_map_destroy(a);
	ow_map_destroy(b);
	free(s);
}

/* Across a spread the robust window is clipped to the nominal one
 * (ow_spread_clip_window): it never reaches beyond it. */
static void map_robust_window_lies_inside_the_nominal_one(void **state)
{
	struct ow_units *u = NULL;
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_map *m;
	const struct ow_window *w, *r;

	(void)state;
	assert_int_equal(ow_units_create(&u, NULL), OW_OK);
	m = run(s, 1, "{\"viscosity_scale\":{\"from\":\"0.9\",\"to\":\"1.1\"}}",
	        u, s);
	w = m->window;
	r = m->robust;
	assert_non_null(m->spread);
	assert_non_null(m->robust_grid);
	assert_non_null(r);
	assert_false(r->empty); /* +-10 % of viscosity leaves a window */
	assert_true(r->rpm_min >= w->rpm_min - 1e-9);
	assert_true(r->rpm_max <= w->rpm_max + 1e-9);
	assert_true(r->set_min_K >= w->set_min_K - 1e-9);
	assert_true(r->set_max_K <= w->set_max_K + 1e-9);
	ow_map_destroy(m);
	free(s);
	ow_units_destroy(u);
}

/* Saved (every file, sealed with its manifest) and read back, a map holds
 * the same window and centre, figure for figure, and the same profile:
 * points-si.* keep 17 digits. */
static void map_saved_and_loaded_holds_the_same_window_and_centre(void **state)
{
	struct ow_units *u = NULL;
	struct ow_study *s = ow_test_study(STUDY);
	struct ow_map *m = run(s, 1, NULL, NULL, NULL), *l = NULL;
	struct ow_report_options o;
	struct ow_diag d = {{0}};
	char dir[] = "/tmp/ow_map_XXXXXX", cmd[64];
	int k;

	(void)state;
	assert_non_null(mkdtemp(dir));
	assert_int_equal(ow_units_create(&u, NULL), OW_OK);
	ow_report_default(&o);
	o.date = "2026-03-14";
	if (ow_map_save(m, &o, 1, dir, &d) != OW_OK ||
	    ow_mapdir_seal(dir, &d) != OW_OK || ow_map_load(u, dir, &l, &d))
		fail_msg("%s", d.msg);
	assert_abs(l->window->rpm_min, m->window->rpm_min, 0.0);
	assert_abs(l->window->rpm_max, m->window->rpm_max, 0.0);
	assert_abs(l->window->set_min_K, m->window->set_min_K, 0.0);
	assert_abs(l->window->set_max_K, m->window->set_max_K, 0.0);
	assert_true(l->has_centre);
	assert_abs(l->centre.output_kg_s, m->centre.output_kg_s, 0.0);
	assert_abs(l->centre.max_pressure_Pa, m->centre.max_pressure_Pa, 0.0);
	assert_int_equal(l->n_profile, m->n_profile);
	for (k = 0; k < m->n_profile; k++)
		assert_abs(l->profile[k].pressure_Pa, m->profile[k].pressure_Pa,
		           1e-9 * (1.0 + fabs(m->profile[k].pressure_Pa)));
	assert_ptr_equal(l->study, l->own_study);
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
	assert_int_equal(system(cmd), 0);
	ow_map_destroy(l);
	ow_map_destroy(m);
	ow_units_destroy(u);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(map_centre_is_the_point_solved_alone_there),
	    cmocka_unit_test(map_without_the_centre_holds_none),
	    cmocka_unit_test(map_robust_window_lies_inside_the_nominal_one),
	    cmocka_unit_test(
	        map_saved_and_loaded_holds_the_same_window_and_centre),
	};

	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
