/* test_solver.c - one operating point end to end: the screw-die match
 * against a closed form, the energy balance, resolution, and the trends
 * every extrusion engineer expects. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
#include "ow_solver.h"
#include "ow_sweep.h"
#include "ow_units.h"

static struct ow_point solve(const struct ow_study *s, double rpm,
			     const double *set_K)
{
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	struct ow_diag d = {{0}};

	assert_int_equal(ow_solver_create(s, &sv, &d), OW_OK);
	assert_int_equal(ow_solver_run(sv, rpm, set_K, 0.0, &pt, &d), OW_OK);
	ow_solver_destroy(sv);
	assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
	return pt;
}

/* Melt-fed Newtonian metering section (8 D, H = 3.175 mm, mu = 1000 Pa s,
 * 60 rpm, shape factors F_d and F_p, no leakage) against a rod die R =
 * 2.5 mm, L = 20 mm: operating point dP = mu Q_d / (K + B) = 1.8615e7 Pa,
 * Q = 1.42774e-5 m3/s (Tadmor & Klein 1970 screw characteristic with the
 * Hagen-Poiseuille die, Bird, Stewart & Lightfoot 2002; values
 * recomputed). The full march, energy equation and matching reproduce it
 * because the melt is Newtonian and its viscosity temperature-free. */
static void match_reproduces_newtonian_rod_die_operating_point(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-rod.json");
	struct ow_point pt = solve(s, 60.0, NULL);
	(void)st;
	assert_rel(pt.discharge_pressure_Pa, 1.8615e7, 2e-4);
	assert_rel(pt.output_kg_s / 760.0, 1.42774e-5, 2e-4);
	free(s);
}

/* Drive power + barrel heat = G (h_out - h_in) + flow work, within 1 %
 * (first law for the open system hopper -> tip; enthalpies with latent
 * heat, Tadmor & Gogos 2006 ch. 9). */
static void energy_closes_on_demo_and_melt_fed_line(void **st)
{
	const char *studies[] = {"demo/study-si.json",
				 "fixtures/studies/melt-fed.json",
				 "fixtures/studies/hdpe-barrier.json"};
	double rpm[] = {30.0, 90.0};
	size_t i, k;
	(void)st;
	for (i = 0; i < 3; i++) {
		struct ow_study *s = ow_test_study(studies[i]);

		for (k = 0; k < 2; k++) {
			struct ow_point pt = solve(s, rpm[k], NULL);

			assert_abs(pt.energy_residual, 0.0, 0.01);
			assert_true(pt.power_W > 0.0);
		}
		free(s);
	}
}

/* Halving the station spacing and the depth spacing moves the peak
 * temperature by < 0.5 K and the throughput by < 0.5 % (the default
 * resolution is converged). */
static void default_resolution_is_converged_on_demo(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double rpm[] = {30.0, 70.0, 120.0};
	size_t k;
	(void)st;
	for (k = 0; k < 3; k++) {
		struct ow_point a, b;
		struct ow_numerics keep = s->line.numerics;

		a = solve(s, rpm[k], NULL);
		s->line.numerics.stations_per_turn *= 2;
		s->line.numerics.depth_nodes =
			2 * (s->line.numerics.depth_nodes - 1) + 1;
		b = solve(s, rpm[k], NULL);
		s->line.numerics = keep;
		assert_abs(a.peak_K, b.peak_K, 0.5);
		assert_rel(a.output_kg_s, b.output_kg_s, 0.005);
	}
	free(s);
}

/* Trends of the trade (common practice): output and peak melt temperature
 * rise with screw speed. */
static void output_and_peak_rise_with_speed(void **st)
{
	struct ow_study *s = ow_test_study("fixtures/studies/hdpe-sf.json");
	struct ow_point prev = solve(s, 30.0, NULL), pt;
	double rpm;
	(void)st;
	for (rpm = 50.0; rpm <= 130.0; rpm += 20.0) {
		pt = solve(s, rpm, NULL);
		assert_true(pt.output_kg_s > prev.output_kg_s);
		assert_true(pt.peak_K > prev.peak_K);
		assert_true(pt.power_W > prev.power_W);
		prev = pt;
	}
	free(s);
}

/* A deeper metering section gives more output and a cooler melt at the
 * same speed (common practice; drag flow grows with depth, shear heating
 * falls). */
static void deeper_metering_gives_more_output_and_cooler_melt(void **st)
{
	struct ow_study *a = ow_test_study("fixtures/studies/hdpe-sf.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-deep.json");
	struct ow_point pa = solve(a, 80.0, NULL), pb = solve(b, 80.0, NULL);
	(void)st;
	assert_true(pb.output_kg_s > pa.output_kg_s);
	assert_true(pb.peak_K < pa.peak_K);
	free(a);
	free(b);
}

/* A worn screw (larger flight clearance) gives less output and a hotter
 * melt at the same speed (common practice: leakage flow back over the
 * flights, sheared hard in the clearance). */
static void worn_screw_gives_less_output_and_hotter_melt(void **st)
{
	struct ow_study *a = ow_test_study("fixtures/studies/hdpe-sf.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-worn.json");
	struct ow_point pa = solve(a, 80.0, NULL), pb = solve(b, 80.0, NULL);
	(void)st;
	assert_true(pb.output_kg_s < pa.output_kg_s);
	assert_true(pb.discharge_bulk_K > pa.discharge_bulk_K);
	assert_true(pb.peak_K > pa.peak_K);
	free(a);
	free(b);
}

/* With a cool feed barrel (below the melting point up to 12 D) the bed
 * starts melting at 12 D at full width. The abrupt screw compresses the
 * channel over 0.75 D there, faster than the bed can melt (Tadmor's
 * criterion psi_t <= A, Tadmor & Klein 1970 ch. 9): the bed fills the
 * channel and the point is flagged plugging. The gradual 8 D taper at the
 * same rate is not. */
static void abrupt_compression_plugs_and_gradual_does_not(void **st)
{
	struct ow_study *a = ow_test_study("fixtures/studies/hdpe-abrupt.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-sf.json");
	double set[OW_MAX_ZONES];
	struct ow_point pa, pb;
	int i;
	(void)st;
	for (i = 0; i < a->line.n_zones; i++)
		set[i] = a->line.zones[i].set_K;
	set[0] = set[1] = 393.15; /* 120 degC, below 130 degC melting */
	pa = solve(a, 60.0, set);
	pb = solve(b, 60.0, set);
	assert_true(pa.flags & OW_FLAG_PLUGGING);
	assert_abs(pa.max_sbr, 1.0, 1e-9);
	assert_false(pb.flags & OW_FLAG_PLUGGING);
	assert_true(pb.max_sbr < 1.0);
	free(a);
	free(b);
}

/* The same point solved twice, and from a warm start, gives the same
 * figures (no hidden state in the workspace). */
static void solver_is_repeatable_and_warm_start_agrees(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	struct ow_point a, b, c;
	(void)st;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 70.0, NULL, 0.0, &a, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 70.0, NULL, 0.0, &b, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 70.0, NULL, a.output_kg_s * 0.9,
				       &c, NULL), OW_OK);
	assert_memory_equal(&a, &b, sizeof a);
	assert_rel(c.output_kg_s, a.output_kg_s, 1e-3);
	ow_solver_destroy(sv);
	free(s);
}

/* A start predicted from the two speeds before (continuation along a
 * sweep row, with the nearer point's match slope) reaches the cold
 * start's answer within the match tolerance, in fewer marches. */
static void start_from_neighbouring_speeds_agrees_with_cold(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	struct ow_point p65, p675, cold, warm;
	const struct ow_point *prev[2] = {&p675, &p65};
	struct ow_solver_start s0;
	(void)st;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 65.0, NULL, 0.0, &p65, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 67.5, NULL, 0.0, &p675, NULL),
			 OW_OK);
	assert_int_equal(ow_solver_run(sv, 70.0, NULL, 0.0, &cold, NULL),
			 OW_OK);
	assert_true(p675.match_slope < 0.0);
	ow_sweep_predict(prev, 2, 70.0, &s0);
	assert_int_equal(ow_solver_run_from(sv, 70.0, NULL, &s0, &warm, NULL),
			 OW_OK);
	assert_false(warm.flags & OW_FLAG_NOT_CONVERGED);
	assert_rel(warm.output_kg_s, cold.output_kg_s, 3e-5);
	assert_rel(warm.discharge_pressure_Pa, cold.discharge_pressure_Pa,
		   3e-5);
	assert_abs(warm.discharge_bulk_K, cold.discharge_bulk_K, 0.01);
	assert_true(warm.n_iter < cold.n_iter);
	ow_solver_destroy(sv);
	free(s);
}

/* The continuation's prediction is the Lagrange polynomial through the
 * previous points of throughput per speed, exact for G/N linear in N
 * (Burden & Faires, Numerical Analysis, 9th ed., 2011, Theorem 3.2):
 * G = N (a + b N) from N = 37.5 and 40 gives G(42.5) exactly. */
static void prediction_is_exact_for_specific_output_linear_in_speed(void **st)
{
	struct ow_point p[2];
	const struct ow_point *prev[2] = {&p[0], &p[1]};
	struct ow_solver_start s0;
	double a = 2e-4, b = 3e-6;
	(void)st;
	memset(p, 0, sizeof p);
	p[0].rpm = 40.0;
	p[1].rpm = 37.5;
	p[0].output_kg_s = 40.0 * (a + b * 40.0);
	p[1].output_kg_s = 37.5 * (a + b * 37.5);
	p[0].match_slope = -2e10;
	p[1].match_slope = -3e10;
	ow_sweep_predict(prev, 2, 42.5, &s0);
	assert_rel(s0.g_kg_s, 42.5 * (a + b * 42.5), 1e-14);
	assert_rel(s0.slope, -2e10, 1e-15); /* the nearer point's */
	ow_sweep_predict(prev, 1, 42.5, &s0);
	assert_rel(s0.g_kg_s, 42.5 * (a + b * 40.0), 1e-14);
	ow_sweep_predict(prev, 0, 42.5, &s0);
	assert_true(s0.g_kg_s == 0.0 && s0.slope == 0.0);
}

/* Feed capacity of every point is the Darnell-Mol rate at no pressure
 * loss: for D = 63.5 mm square pitch, e = 6.35 mm, H = 9.4 mm, 60 rpm,
 * bulk density 500 kg/m3, f_b = 0.45, f_s = 0.25 it is 110.1 kg/h
 * (Darnell & Mol, SPE J. 12 (1956) 20, in the Tadmor-Klein form;
 * recomputed), and a rate above it is flagged feed_limited. */
static void feed_capacity_follows_darnell_mol(void **st)
{
	struct ow_study *s = ow_test_study("fixtures/studies/hdpe-sf.json");
	struct ow_point pt;
	(void)st;
	s->screw.sections[0].depth_m = 0.0094;
	assert_int_equal(ow_screw_prepare(&s->screw, NULL), OW_OK);
	s->resin.bulk_density_kg_m3 = 500.0;
	s->resin.friction_barrel = 0.45;
	s->resin.friction_screw = 0.25;
	pt = solve(s, 60.0, NULL);
	assert_abs(pt.feed_capacity_kg_s * 3600.0, 110.1, 0.05);
	assert_false(pt.flags & OW_FLAG_FEED_LIMITED);
	s->resin.friction_barrel = 0.30; /* f_b = f_s = 0.30: 33.5 kg/h */
	s->resin.friction_screw = 0.30;
	pt = solve(s, 60.0, NULL);
	assert_abs(pt.feed_capacity_kg_s * 3600.0, 33.5, 0.05);
	assert_true(pt.flags & OW_FLAG_FEED_LIMITED);
	free(s);
}

/* A barrel far below the melting point never melts the feed: the point is
 * returned with its flags and figures, never a crash. */
static void cold_barrel_returns_a_flagged_point(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	double set[OW_MAX_ZONES];
	int i;
	(void)st;
	for (i = 0; i < s->line.n_zones; i++)
		set[i] = 363.15; /* 90 degC */
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 60.0, set, 0.0, &pt, NULL), OW_OK);
	assert_true(pt.flags & (OW_FLAG_NO_MELTING | OW_FLAG_NOT_CONVERGED));
	ow_solver_destroy(sv);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(match_reproduces_newtonian_rod_die_operating_point),
		cmocka_unit_test(energy_closes_on_demo_and_melt_fed_line),
		cmocka_unit_test(default_resolution_is_converged_on_demo),
		cmocka_unit_test(output_and_peak_rise_with_speed),
		cmocka_unit_test(deeper_metering_gives_more_output_and_cooler_melt),
		cmocka_unit_test(worn_screw_gives_less_output_and_hotter_melt),
		cmocka_unit_test(abrupt_compression_plugs_and_gradual_does_not),
		cmocka_unit_test(solver_is_repeatable_and_warm_start_agrees),
		cmocka_unit_test(start_from_neighbouring_speeds_agrees_with_cold),
		cmocka_unit_test(
		    prediction_is_exact_for_specific_output_linear_in_speed),
		cmocka_unit_test(cold_barrel_returns_a_flagged_point),
		cmocka_unit_test(feed_capacity_follows_darnell_mol),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
