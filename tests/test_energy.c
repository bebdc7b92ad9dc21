/* test_energy.c - the first law over the solver's energy book: drive
 * power + barrel heat = G (h_out - h_feed) + flow work (open system hopper
 * -> tip, Tadmor & Gogos 2006 ch. 9), within 1 % at every converged point
 * of every fixture map, with solids left at the tip, and at plugged points
 * once the heat the model could not supply is counted. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
#include "ow_solver.h"
#include "ow_sweep.h"

static struct ow_point solve(const struct ow_study *s, double rpm,
                             const double *set_K)
{
	return ow_test_solve(s, rpm, set_K);
}

/* A screw too short to melt the bed (tests/data/unmelt-short.json) leaves
 * solids at the tip, with one flight or two; they leave at the feed
 * temperature, so the energy book counts G (1 - unmelt) (h_out - h_feed) and
 * still closes within 1 % (first law for the open system hopper -> tip, Tadmor
 * & Gogos 2006 ch. 9). */
static void unmelt_at_the_tip_keeps_the_energy_balance(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/unmelt-short.json");
	int p;
	(void)st;
	for (p = 1; p <= 2; p++) { /* one flight, and two in parallel */
		struct ow_point pt;

		s->screw.flights = p;
		assert_int_equal(ow_screw_prepare(&s->screw, NULL), OW_OK);
		pt = solve(s, 60.0, NULL);
		assert_true(pt.unmelt_frac > 0.02);
		assert_false(pt.flags & OW_FLAG_PLUGGING);
		assert_abs(pt.energy_residual, 0.0, 0.01);
	}
	free(s);
}

/* The energy book of a converged point closes within 1 %, or the point
 * names why: a plugged bed held at the channel width gives up solids as
 * melt that no heat melted (note unheated_melt), and the residual is that
 * heat's share of the drive power, -unheated_melt_W / power_W, within
 * 1 %. */
static void assert_energy_closed(const struct ow_point *pt)
{
	double expect = 0.0;

	if (pt->flags & OW_FLAG_UNHEATED_MELT) {
		assert_true(pt->flags & OW_FLAG_PLUGGING);
		expect = -pt->unheated_melt_W / pt->power_W;
	}
	assert_abs(pt->energy_residual, expect, 0.01);
}

/* The abrupt screw (compression over 0.75 D) with its first two zones
 * below the melting point plugs at 60 rpm (Tadmor's psi_t <= A): the bed
 * is held at the channel width and the note is set. */
static void plugged_point_names_its_unheated_melt(void **st)
{
	struct ow_study *s = ow_test_study("fixtures/studies/hdpe-abrupt.json");
	double set[OW_MAX_ZONES];
	struct ow_point pt;
	int i;
	(void)st;
	for (i = 0; i < s->line.n_zones; i++)
		set[i] = s->line.zones[i].set_K;
	set[0] = set[1] = 393.15; /* 120 degC, below 130 degC melting */
	pt = solve(s, 60.0, set);
	assert_true(pt.flags & OW_FLAG_PLUGGING);
	assert_true(pt.flags & OW_FLAG_UNHEATED_MELT);
	assert_true(pt.unheated_melt_W > 0.05 * pt.power_W);
	/* the 12 D delay zone under walls below the melting point ahead of
	 * it hands the bed the heat that went in: the rest of the book
	 * closes */
	assert_energy_closed(&pt);
	free(s);
}

/* Sweep s on rpm_steps x axis_steps (0: the study's grid) and check the
 * book at every converged point; returns how many were checked, and in
 * *late how many start melting past x_m. */
static int check_map(const struct ow_study *s, int rpm_steps, int axis_steps,
                     double x_m, int *late)
{
	struct ow_sweep_config c;
	struct ow_grid *g = NULL;
	int k, checked = 0;

	ow_sweep_default(&c);
	c.jobs = 2;
	c.rpm_steps = rpm_steps;
	c.axis_steps = axis_steps;
	assert_int_equal(ow_sweep_run(s, &c, &g, NULL), OW_OK);
	*late = 0;
	for (k = 0; k < g->n_rpm * g->n_axis; k++) {
		const struct ow_point *pt = &g->pts[k].pt;

		if (g->pts[k].solved != 1 ||
		    (pt->flags & OW_FLAG_NOT_CONVERGED))
			continue;
		assert_energy_closed(pt);
		checked++;
		*late += pt->melt_start_m > x_m;
	}
	ow_grid_destroy(g);
	return checked;
}

/* Barrel zones far below the study's set-points: the plug slides under
 * walls below the melting point for many diameters (the delay zone:
 * conduction into the solid, Carslaw & Jaeger, Conduction of Heat in
 * Solids, 2nd ed. 1959, sections 2.4 and 2.7; Tadmor & Klein,
 * Engineering Principles of Plasticating Extrusion, 1970), often into the
 * taper, where the bed grows shallower than where the heat went in. Over
 * 20..120 rpm and every zone 40..70 K below the demo's set-points the
 * first law closes within 1 % at every converged point, flagged or not,
 * or the point names the heat it could not book (assert_energy_closed). */
static void energy_closes_with_cold_zones(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	int checked, long_delay;
	(void)st;
	s->line.axes.axis_from = -70.0;
	s->line.axes.axis_to = -40.0;
	/* melting starts past the feed section's 6 D at most points */
	checked = check_map(s, 6, 4, 6.0 * s->screw.diameter_m, &long_delay);
	assert_true(checked >= 20);
	assert_true(long_delay >= 10);
	free(s);
}

/* Every converged point of every fixture map (each study's own sweep
 * grid; the demo on an 11 x 11 grid over its sweep) keeps the energy
 * book. */
static void energy_closes_at_every_point_of_every_fixture_map(void **st)
{
	const char *studies[] = {"fixtures/studies/hdpe-abrupt.json",
	                         "fixtures/studies/hdpe-barrier.json",
	                         "fixtures/studies/hdpe-deep.json",
	                         "fixtures/studies/hdpe-sf.json",
	                         "fixtures/studies/hdpe-worn.json",
	                         "fixtures/studies/ldpe-sf.json",
	                         "fixtures/studies/melt-fed.json",
	                         "fixtures/studies/pp-sheet.json",
	                         "fixtures/studies/ps-rod.json",
	                         "demo/study-si.json"};
	size_t i;
	int checked = 0, late;
	(void)st;
	for (i = 0; i < sizeof studies / sizeof studies[0]; i++) {
		struct ow_study *s = ow_test_study(studies[i]);
		int n = strstr(studies[i], "demo") ? 11 : 0;

		checked += check_map(s, n, n, INFINITY, &late);
		free(s);
	}
	assert_true(checked > 1000);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(unmelt_at_the_tip_keeps_the_energy_balance),
	    cmocka_unit_test(plugged_point_names_its_unheated_melt),
	    cmocka_unit_test(energy_closes_with_cold_zones),
	    cmocka_unit_test(energy_closes_at_every_point_of_every_fixture_map),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
