/* testmap.c - a real map for tests: the demo line swept on a small
 * grid. */
#include "testmap.h"
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_sweep.h"
#include "ow_window.h"

/* Profile of the window's centre, copied out of a solver. */
static void centre_profile(struct ow_test_map *m)
{
	double set_K[OW_MAX_ZONES];
	struct ow_solver *sv = NULL;
	const struct ow_profile_row *r;

	assert_int_equal(ow_solver_create(m->s, &sv, NULL), OW_OK);
	ow_line_apply_axis(&m->s->line, m->w->centre.axis, set_K);
	assert_int_equal(
	    ow_solver_run(sv, m->w->centre.rpm, set_K, 0.0, &m->centre, NULL),
	    OW_OK);
	r = ow_solver_profile(sv, &m->n_rows);
	assert_true(m->n_rows > 10);
	m->rows = malloc(sizeof *r * (size_t)m->n_rows);
	assert_non_null(m->rows);
	memcpy(m->rows, r, sizeof *r * (size_t)m->n_rows);
	ow_solver_destroy(sv);
}

void ow_test_map_make(struct ow_test_map *m, int rpm_steps, int axis_steps,
                      int refine)
{
	struct ow_sweep_config c;
	struct ow_diag d = {{0}};

	memset(m, 0, sizeof *m);
	m->s = calloc(1, sizeof *m->s);
	assert_non_null(m->s);
	assert_int_equal(ow_units_create(&m->u, &d), OW_OK);
	assert_int_equal(
	    ow_config_load_study(m->u, "demo/study-si.json", m->s, &d), OW_OK);
	ow_sweep_default(&c);
	c.rpm_steps = rpm_steps;
	c.axis_steps = axis_steps;
	c.refine = refine;
	assert_int_equal(ow_sweep_run(m->s, &c, &m->g, &d), OW_OK);
	assert_int_equal(ow_window_extract(m->s, m->g, &m->w, &d), OW_OK);
	assert_false(m->w->empty); /* the demo line has a window */
	centre_profile(m);
	m->map.study = m->s;
	m->map.grid = m->g;
	m->map.window = m->w;
	m->map.has_centre = 1;
	m->map.centre = m->centre;
	m->map.profile = m->rows;
	m->map.n_profile = m->n_rows;
}

void ow_test_map_free(struct ow_test_map *m)
{
	ow_window_destroy(m->w);
	ow_grid_destroy(m->g);
	free(m->rows);
	free(m->s);
	ow_units_destroy(m->u);
	memset(m, 0, sizeof *m);
}
