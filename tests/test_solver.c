/* test_solver.c - one operating point end to end: the screw-die match
 * against a closed form, the energy balance, resolution, and the trends
 * every extrusion engineer expects. */
#include "testutil.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "ow_classify.h"
#include "ow_config.h"
#include "ow_melt.h"
#include "ow_solver.h"
#include "ow_sweep.h"
#include "ow_units.h"

static struct ow_point solve(const struct ow_study *s, double rpm,
                             const double *set_K)
{
	return ow_test_solve(s, rpm, set_K);
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
 * resolution is converged), at 15 points spread over the demo map: 20 to
 * 120 rpm, -20 to +30 K, zones holding and zones floating. The limits are
 * those of a mesh study (Roache, Verification and Validation in
 * Computational Science and Engineering, 1998, ch. 5: the change on
 * refinement bounds the discretisation error of a converging scheme). */
static void default_resolution_is_converged_on_demo(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double rpm[] = {20.0, 45.0, 70.0, 95.0, 120.0};
	double shift[] = {-20.0, 5.0, 30.0};
	size_t k, j;
	(void)st;
	for (k = 0; k < 5; k++) {
		for (j = 0; j < 3; j++) {
			struct ow_point a, b;
			struct ow_numerics keep = s->line.numerics;
			double set[OW_MAX_ZONES];

			ow_line_apply_axis(&s->line, shift[j], set);
			a = solve(s, rpm[k], set);
			s->line.numerics.stations_per_turn *= 2;
			s->line.numerics.depth_nodes =
			    2 * (s->line.numerics.depth_nodes - 1) + 1;
			b = solve(s, rpm[k], set);
			s->line.numerics = keep;
			assert_abs(a.peak_K, b.peak_K, 0.5);
			assert_rel(a.output_kg_s, b.output_kg_s, 0.005);
		}
	}
	free(s);
}

/* Every iteration tolerance of the solver (the screw-die match, the
 * floating zones, the melt's Newton solves) at its default against all of
 * them 1000 times tighter, at the 15 points above: the figures agree
 * within 1e-4 (relative) and 0.01 K, the resolution a map's figures are
 * judged at, far inside the discretisation error bounded above; the same
 * zones float, at the same control points. */
static void default_tolerances_match_a_tight_solve(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double rpm[] = {20.0, 45.0, 70.0, 95.0, 120.0};
	double shift[] = {-20.0, 5.0, 30.0};
	size_t k, j;
	int z;
	(void)st;
	for (k = 0; k < 5; k++) {
		for (j = 0; j < 3; j++) {
			struct ow_point a, b;
			double set[OW_MAX_ZONES];

			ow_line_apply_axis(&s->line, shift[j], set);
			a = solve(s, rpm[k], set);
			s->line.numerics.tol_scale = 1e-3;
			b = solve(s, rpm[k], set);
			s->line.numerics.tol_scale = 1.0;
			assert_rel(a.output_kg_s, b.output_kg_s, 1e-4);
			assert_rel(a.discharge_pressure_Pa,
			           b.discharge_pressure_Pa, 1e-4);
			assert_rel(a.max_pressure_Pa, b.max_pressure_Pa, 1e-4);
			assert_rel(a.power_W, b.power_W, 1e-4);
			assert_abs(a.discharge_bulk_K, b.discharge_bulk_K,
			           0.01);
			assert_abs(a.peak_K, b.peak_K, 0.01);
			assert_int_equal(a.zone_floating, b.zone_floating);
			for (z = 0; z < s->line.n_zones; z++)
				assert_abs(a.zone_control_K[z],
				           b.zone_control_K[z], 0.01);
		}
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

/* Every zone of s holds its set-point whatever heat it takes (unlimited
 * heating and cooling power). */
static void hold_every_zone(struct ow_study *s)
{
	for (int i = 0; i < s->line.n_zones; i++)
		s->line.zones[i].heating_W = s->line.zones[i].cooling_W = NAN;
}

/* A worn screw (larger flight clearance) gives less output and a hotter
 * melt at the same speed and barrel temperatures (common practice:
 * leakage flow back over the flights, sheared hard in the clearance). */
static void worn_screw_gives_less_output_and_hotter_melt(void **st)
{
	struct ow_study *a = ow_test_study("fixtures/studies/hdpe-sf.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-worn.json");
	struct ow_point pa, pb;
	(void)st;
	hold_every_zone(a);
	hold_every_zone(b);
	pa = solve(a, 80.0, NULL);
	pb = solve(b, 80.0, NULL);
	assert_true(pb.output_kg_s < pa.output_kg_s);
	assert_true(pb.discharge_bulk_K > pa.discharge_bulk_K);
	assert_true(pb.peak_K > pa.peak_K);
	free(a);
	free(b);
}

/* Solve s at rpm with its own set-points and copy the profile into *rows
 * (malloc'd, the caller frees it). */
static struct ow_point solve_profile(const struct ow_study *s, double rpm,
                                     struct ow_profile_row **rows, int *n)
{
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	const struct ow_profile_row *r;

	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, rpm, NULL, 0.0, &pt, NULL), OW_OK);
	assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
	r = ow_solver_profile(sv, n);
	*rows = malloc(sizeof **rows * (size_t)*n);
	assert_non_null(*rows);
	memcpy(*rows, r, sizeof **rows * (size_t)*n);
	ow_solver_destroy(sv);
	return pt;
}

/* The melt pool beside the bed is a channel of its own width w = W - X,
 * one side wall of which (the bed) slides at V_sz; for a Newtonian melt
 * with no clearance its pressure gradient is the closed form
 *   Q = [F_d(H/w) V_bz + F_d(w/H) V_sz] w H/2 - F_p(H/w) w H^3 G/(12 mu)
 * (Tadmor & Klein 1970, ch. 9, pool of width W - X; Rowell & Finlayson
 * 1922 shape factors, the side wall's by exchanging width and depth), with
 * Q = G_m (1 - unmelt)/rho_m. Checked on every step of the constant-depth
 * feed section where the pool is at least as wide as deep. */
static void melt_pool_conveys_at_its_own_width(void **st)
{
	struct ow_study *s =
	    ow_test_study("tests/data/newtonian-plasticating.json");
	const struct ow_screw *sc = &s->screw;
	struct ow_profile_row *r;
	int n, i, checked = 0;
	double rpm = 40.0, H = 9.525e-3, mu = 1000.0;
	double phi = ow_screw_helix(sc, sc->diameter_m);
	double W = ow_screw_width(sc, sc->diameter_m);
	double vbz = OW_PI * sc->diameter_m * rpm / 60.0 * cos(phi);
	struct ow_point pt = solve_profile(s, rpm, &r, &n);
	double vsz = pt.output_kg_s / (950.0 * H * W);
	(void)st;
	for (i = 1; i < n; i++) {
		double w = W * (1.0 - r[i].sbr), h = H / w, q, g, dpdz;

		if (r[i].axial_m > 10.0 * 0.0635 || r[i].sbr <= 0.0 ||
		    r[i - 1].sbr >= 1.0 || w < H)
			continue;
		q = pt.output_kg_s * (1.0 - r[i].unmelt_frac) / 760.0;
		g = 12.0 * mu *
		    ((ow_melt_shape_fd(h) * vbz +
		      ow_melt_shape_fd(1.0 / h) * vsz) *
		         w * H / 2.0 -
		     q) /
		    (ow_melt_shape_fp(h) * w * H * H * H);
		dpdz = (r[i].pressure_Pa - r[i - 1].pressure_Pa) /
		       (r[i].axial_m - r[i - 1].axial_m) * sin(phi);
		assert_rel(dpdz, g, 1e-6);
		checked++;
	}
	assert_true(checked >= 20);
	free(r);
	free(s);
}

/* Metering-controlled screw: once the bed is gone the pressure peaks where
 * the tapering channel's drag flow equals the throughput, F_d(H* / W) V_bz W
 * H* / 2 = Q (Newtonian, no clearance: the gradient changes sign there;
 * Tadmor & Klein 1970, ch. 7), and falls along the shallower metering
 * section. The maximum lies within one station of the taper's depth H*. */
static void pressure_peaks_where_taper_drag_equals_throughput(void **st)
{
	struct ow_study *s =
	    ow_test_study("tests/data/newtonian-plasticating.json");
	const struct ow_screw *sc = &s->screw;
	struct ow_profile_row *r;
	int n, it;
	double rpm = 40.0, D = sc->diameter_m, lo = 3.175e-3, hi = 9.525e-3;
	double phi = ow_screw_helix(sc, D), W = ow_screw_width(sc, D);
	double vbz = OW_PI * D * rpm / 60.0 * cos(phi), q, xs;
	struct ow_point pt = solve_profile(s, rpm, &r, &n);
	(void)st;
	q = pt.output_kg_s / 760.0;
	for (it = 0; it < 100; it++) { /* drag flow rises with depth */
		double mid = 0.5 * (lo + hi);

		if (ow_melt_shape_fd(mid / W) * vbz * W * mid / 2.0 < q)
			lo = mid;
		else
			hi = mid;
	}
	xs = 10.0 * D + 6.0 * D * (9.525e-3 - lo) / (9.525e-3 - 3.175e-3);
	assert_true(xs > 10.0 * D && xs < 16.0 * D);
	assert_true(pt.melt_complete_m < xs - D); /* all melt by then */
	assert_abs(pt.max_pressure_at_m, xs, D / 6.0);
	assert_true(pt.discharge_pressure_Pa < 0.5 * pt.max_pressure_Pa);
	free(r);
	free(s);
}

/* Drag capacity A = F_d V_bz W H/2 and pressure conductance B = F_p W H^3
 * / (12 mu) of a Newtonian channel (Tadmor & Klein 1970, ch. 7). */
static void channel_ab(double vbz, double w, double h, double mu, double *a,
                       double *b)
{
	*a = ow_melt_shape_fd(h / w) * vbz * w * h / 2.0;
	*b = ow_melt_shape_fp(h / w) * w * h * h * h / (12.0 * mu);
}

/* In a barrier section the solids and melt channels, side by side under
 * the barrel, carry the melt at one pressure gradient: Q = A_1 + A_2 -
 * (B_1 + B_2) G, each channel with the Newtonian drag and pressure flow of
 * its own width and depth (Tadmor & Klein 1970, ch. 7). Checked on every
 * step of the barrier section of a melt-fed Newtonian screw. */
static void barrier_channels_share_one_gradient(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-barrier.json");
	const struct ow_screw *sc = &s->screw;
	struct ow_profile_row *r;
	int n, i, checked = 0;
	double rpm = 40.0, D = sc->diameter_m, mu = 1000.0;
	double phi = ow_screw_helix(sc, D), W = ow_screw_width(sc, D);
	double vbz = OW_PI * D * rpm / 60.0 * cos(phi), q;
	struct ow_point pt = solve_profile(s, rpm, &r, &n);
	(void)st;
	q = pt.output_kg_s / 760.0;
	for (i = 1; i < n; i++) {
		double xm = 0.5 * (r[i].axial_m + r[i - 1].axial_m);
		double f = (xm - 4.0 * D) / (12.0 * D), a1, b1, a2, b2, g;
		double share = 0.1 + 0.75 * f, dpdz;

		if (f <= 0.0 || f >= 1.0)
			continue;
		channel_ab(vbz, W * (1.0 - share), 7.0e-3 - 5.5e-3 * f, mu, &a1,
		           &b1);
		channel_ab(vbz, W * share, 2.0e-3 + 2.0e-3 * f, mu, &a2, &b2);
		g = (a1 + a2 - q) / (b1 + b2);
		assert_true(a1 - b1 * g > 0.0 && a2 - b2 * g > 0.0);
		dpdz = (r[i].pressure_Pa - r[i - 1].pressure_Pa) /
		       (r[i].axial_m - r[i - 1].axial_m) * sin(phi);
		assert_rel(dpdz, g, 1e-5);
		checked++;
	}
	assert_true(checked >= 70);
	free(r);
	free(s);
}

/* A shallow first section fed with melt cannot carry the throughput the
 * deep section after it draws (drag flow V_bz W H/2 too small, Tadmor &
 * Klein 1970, ch. 7): the computed pressure falls below zero there, which
 * melt cannot hold. The point is flagged partial_fill, classified unsafe
 * with that reason, and the profile prints no such pressure. */
static void negative_pressure_flags_a_partly_filled_channel(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-barrier.json");
	struct ow_profile_row *r;
	struct ow_verdict v;
	int n, i, empty = 0;
	struct ow_point pt;
	(void)st;
	s->screw.sections[0].depth_m = 1.5e-3; /* shallow feed */
	assert_int_equal(ow_screw_prepare(&s->screw, NULL), OW_OK);
	pt = solve_profile(s, 40.0, &r, &n);
	assert_true(pt.flags & OW_FLAG_PARTIAL_FILL);
	ow_classify(&pt, &s->line.limits, ow_screw_length(&s->screw), &v);
	assert_true(v.bits & (1u << OW_CK_PARTIAL_FILL));
	for (i = 0; i < n; i++) {
		assert_false(r[i].pressure_Pa < 0.0);
		empty += isnan(r[i].pressure_Pa);
	}
	assert_true(empty > 0);
	free(r);
	free(s);
}

/* The barrier fixture against the single-flight screw of the same line
 * (same zones, die and feed depth): a barrier screw delivers about the
 * same output at a given speed (common practice), with no pressure below
 * zero anywhere. */
static void barrier_screw_keeps_pace_with_single_flight(void **st)
{
	struct ow_study *a =
	    ow_test_study("fixtures/studies/hdpe-barrier.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-sf.json");
	double rpm[] = {40.0, 80.0};
	int k;
	(void)st;
	for (k = 0; k < 2; k++) {
		struct ow_point pa = solve(a, rpm[k], NULL);
		struct ow_point pb = solve(b, rpm[k], NULL);

		assert_false(pa.flags & OW_FLAG_PARTIAL_FILL);
		assert_rel(pa.output_kg_s, pb.output_kg_s, 0.15);
	}
	free(a);
	free(b);
}

/* Plugging as the trade reads it: the solid bed ratio where the channel
 * gets shallower, and Tadmor's plugging number A sqrt(X/W) / psi_t there
 * (>= 1: the channel compresses faster than the bed melts, Tadmor & Klein
 * 1970 ch. 9). The abrupt fixture's 0.75 D transition, reached by a bed
 * still unmelted, squeezes faster than it melts; the gradual 8 D taper of
 * the single-flight fixture does not. Both readings lie in the transition. */
static void plugging_is_read_in_the_transition(void **st)
{
	struct ow_study *a = ow_test_study("fixtures/studies/hdpe-abrupt.json");
	struct ow_study *b = ow_test_study("fixtures/studies/hdpe-sf.json");
	double D = a->screw.diameter_m;
	struct ow_point pa = solve(a, 80.0, NULL), pb = solve(b, 80.0, NULL);
	(void)st;
	assert_true(pa.max_sbr > 0.0 && pa.max_sbr < 1.0);
	assert_true(pa.max_sbr_at_m > 12.0 * D &&
	            pa.max_sbr_at_m <= 12.75 * D + D / 6.0); /* one station */
	assert_true(pa.plug_ratio >= 1.0);
	assert_true(pb.max_sbr > 0.0 && pb.max_sbr < 1.0);
	assert_true(pb.max_sbr_at_m > 6.0 * D &&
	            pb.max_sbr_at_m <= 14.0 * D + D / 6.0);
	assert_true(pb.plug_ratio > 0.0 && pb.plug_ratio < 1.0);
	free(a);
	free(b);
}

/* The delay zone (Kacir & Tadmor, Polym. Eng. Sci. 12 (1972) 387): the
 * melt film must grow to the flight clearance before a pool forms, which
 * takes a contact time; a faster screw moves the plug further in that
 * time (longer delay in diameters), a hotter first zone or a warmer feed
 * shortens it. Melting then starts after the hopper, not at it. */
static void delay_zone_follows_speed_wall_and_feed(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double set[OW_MAX_ZONES], d[3], base;
	double rpm[] = {40.0, 80.0, 120.0};
	int i, k;
	(void)st;
	for (k = 0; k < 3; k++) {
		d[k] = solve(s, rpm[k], NULL).melt_start_m;
		assert_true(d[k] > 0.0);
		if (k > 0)
			assert_true(d[k] > d[k - 1]);
	}
	base = d[1];
	for (i = 0; i < s->line.n_zones; i++)
		set[i] = s->line.zones[i].set_K;
	set[0] += 20.0;
	assert_true(solve(s, 80.0, set).melt_start_m < base);
	s->line.feed_temp_K += 35.0;
	assert_true(solve(s, 80.0, NULL).melt_start_m < base);
	free(s);
}

/* A first zone at 140 degC, below the polystyrene's flow temperature
 * (150 degC), holds melting back until the transition: the bed reaches it
 * nearly whole (common practice: a cold feed zone starves melting), so
 * the solid bed ratio there fires the study's max_sbr limit (0.95).
 * Beside that bed the melt pool runs partly filled (the bed carries the
 * load): not a starved channel, so no partial_fill. */
static void bed_reaching_the_transition_whole_fires_max_sbr(void **st)
{
	struct ow_study *s = ow_test_study("fixtures/studies/ps-rod.json");
	double set[OW_MAX_ZONES];
	struct ow_verdict v;
	struct ow_point pt;
	int i;
	(void)st;
	for (i = 0; i < s->line.n_zones; i++)
		set[i] = s->line.zones[i].set_K;
	set[0] = 413.15; /* 140 degC */
	pt = solve(s, 60.0, set);
	ow_classify(&pt, &s->line.limits, ow_screw_length(&s->screw), &v);
	assert_true(pt.max_sbr > 0.95);
	assert_true(v.bits & (1u << OW_CK_MAX_SBR));
	assert_false(pt.flags & OW_FLAG_PARTIAL_FILL);
	free(s);
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
	assert_true(pa.plug_ratio >= 1.0); /* psi_t <= A */
	assert_false(pb.flags & OW_FLAG_PLUGGING);
	assert_true(pb.max_sbr < 1.0);
	assert_true(pb.plug_ratio < 1.0);
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
	assert_int_equal(
	    ow_solver_run(sv, 70.0, NULL, a.output_kg_s * 0.9, &c, NULL),
	    OW_OK);
	assert_memory_equal(&a, &b, sizeof a);
	assert_rel(c.output_kg_s, a.output_kg_s, 1e-3);
	ow_solver_destroy(sv);
	free(s);
}

/* A start predicted from the two speeds before (continuation along a
 * sweep row, with the nearer point's match slope) reaches the cold
 * start's answer within the match tolerance, in fewer marches (at speeds
 * where every zone holds its set-point: a floating zone's control point
 * is itself iterated, to a looser tolerance). */
static void start_from_neighbouring_speeds_agrees_with_cold(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	struct ow_point p40, p425, cold, warm;
	const struct ow_point *prev[2] = {&p425, &p40};
	struct ow_solver_start s0;
	(void)st;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 40.0, NULL, 0.0, &p40, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 42.5, NULL, 0.0, &p425, NULL),
	                 OW_OK);
	assert_int_equal(ow_solver_run(sv, 45.0, NULL, 0.0, &cold, NULL),
	                 OW_OK);
	assert_true(p425.match_slope < 0.0);
	ow_sweep_predict(prev, 2, 45.0, &s0);
	assert_int_equal(ow_solver_run_from(sv, 45.0, NULL, &s0, &warm, NULL),
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

/* Zones a neighbour floated are handed on with the start (control
 * points extrapolated along the row, the nearer point's slope): at 90
 * rpm on the demo's set-points, where three of its five zones run out of
 * cooling, the warm answer is the cold start's to the match
 * tolerance, with the same zones floating at the same control points to
 * the zone tolerance. A start that claims a float for every zone (the
 * zones that hold included) leaves the answer as it is: the float is
 * only kept where its control point lands on the floating side. The
 * reference is the cold solve, which starts every zone at its set-point. */
static void start_with_floating_zones_agrees_with_cold(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	struct ow_point p85, p875, cold, warm, lie;
	const struct ow_point *prev[2] = {&p875, &p85};
	struct ow_solver_start s0;
	double set[OW_MAX_ZONES];
	int z;
	(void)st;
	for (z = 0; z < s->line.n_zones; z++)
		set[z] = s->line.zones[z].set_K;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 85.0, set, 0.0, &p85, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 87.5, set, 0.0, &p875, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 90.0, set, 0.0, &cold, NULL), OW_OK);
	assert_true(cold.zone_floating != 0);
	assert_true(cold.zone_floating != (1u << s->line.n_zones) - 1u);
	ow_sweep_predict(prev, 2, 90.0, &s0);
	for (z = 0; z < s->line.n_zones; z++)
		assert_int_equal(s0.zone_side[z] != 0,
		                 !!(p875.zone_floating & (1u << z)));
	assert_int_equal(ow_solver_run_from(sv, 90.0, set, &s0, &warm, NULL),
	                 OW_OK);
	assert_int_equal(warm.zone_floating, cold.zone_floating);
	assert_rel(warm.output_kg_s, cold.output_kg_s, 3e-5);
	assert_abs(warm.discharge_bulk_K, cold.discharge_bulk_K, 0.01);
	for (z = 0; z < s->line.n_zones; z++)
		assert_abs(warm.zone_control_K[z], cold.zone_control_K[z],
		           1e-2);
	for (z = 0; z < s->line.n_zones; z++) {
		s0.zone_side[z] = -1;
		s0.zone_K[z] = set[z] + 5.0;
		s0.zone_slope_W_K[z] = 50.0;
	}
	assert_int_equal(ow_solver_run_from(sv, 90.0, set, &s0, &lie, NULL),
	                 OW_OK);
	assert_int_equal(lie.zone_floating, cold.zone_floating);
	assert_rel(lie.output_kg_s, cold.output_kg_s, 3e-5);
	assert_abs(lie.discharge_bulk_K, cold.discharge_bulk_K, 0.01);
	ow_solver_destroy(sv);
	free(s);
}

/* The sweep's continuation (the lead-in down the barrel axis, rows
 * started from two solved speeds, floating zones and match slopes handed
 * on) answers every point of a 6x4 demo grid as a cold solve with every
 * tolerance 1000 times tighter does: output and maximum pressure within
 * 1e-4, bulk and peak melt temperatures within 0.01 K, the same zones
 * floating; and 1 and 2 threads give the same grid to the bit. */
static void sweep_continuation_matches_tight_cold_solves(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_sweep_config c;
	struct ow_grid *g1 = NULL, *g2 = NULL;
	int k;
	(void)st;
	ow_sweep_default(&c);
	c.rpm_steps = 6;
	c.axis_steps = 4;
	c.jobs = 1;
	assert_int_equal(ow_sweep_run(s, &c, &g1, NULL), OW_OK);
	c.jobs = 2;
	assert_int_equal(ow_sweep_run(s, &c, &g2, NULL), OW_OK);
	assert_int_equal(g1->solves, 24);
	s->line.numerics.tol_scale = 1e-3;
	for (k = 0; k < 24; k++) {
		const struct ow_grid_point *a = &g1->pts[k];
		double set[OW_MAX_ZONES];
		struct ow_point b;

		assert_memory_equal(&a->pt, &g2->pts[k].pt, sizeof a->pt);
		ow_line_apply_axis(&s->line, a->axis, set);
		b = solve(s, a->rpm, set);
		assert_rel(a->pt.output_kg_s, b.output_kg_s, 1e-4);
		assert_rel(a->pt.max_pressure_Pa, b.max_pressure_Pa, 1e-4);
		assert_abs(a->pt.discharge_bulk_K, b.discharge_bulk_K, 0.01);
		assert_abs(a->pt.peak_K, b.peak_K, 0.01);
		assert_int_equal(a->pt.zone_floating, b.zone_floating);
	}
	ow_grid_destroy(g1);
	ow_grid_destroy(g2);
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

/* The fluted mixer's pressure change against the closed form of its land
 * flow: per unit land length q = Q/(n L) = V_b g/2 - g^3 dP/(12 mu e), so
 * dP = 12 mu e (V_b g/2 - Q/(n L))/g^3 over the section (plane
 * Couette-Poiseuille flow over a barrier land, Tadmor & Gogos 2006 ch. 10,
 * Rauwendaal, Polymer Extrusion; Newtonian melt of 1000 Pa s without
 * temperature shift, 8 lands of 2 D, gap 1 mm, land 6.35 mm, 60 rpm on
 * 63.5 mm; inputs chosen for the check). The energy book still closes. */
static void mixer_pressure_follows_the_land_flow_closed_form(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-mixer.json");
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	const struct ow_profile_row *r;
	double D = 0.0635, vb = OW_PI * D, q, want, p_in = NAN, p_out = NAN;
	int n, i;
	(void)st;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 60.0, NULL, 0.0, &pt, NULL), OW_OK);
	assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
	r = ow_solver_profile(sv, &n);
	for (i = 0; i < n; i++) {
		if (fabs(r[i].axial_m - 8.0 * D) < 1e-9)
			p_in = r[i].pressure_Pa;
		if (fabs(r[i].axial_m - 10.0 * D) < 1e-9)
			p_out = r[i].pressure_Pa;
	}
	q = pt.output_kg_s / 760.0;
	want = 12.0 * 1000.0 * 6.35e-3 *
	       (vb * 1e-3 / 2.0 - q / (8.0 * 2.0 * D)) / 1e-9;
	assert_rel(p_out - p_in, want, 1e-6);
	assert_true(want > 1e6); /* the lands pump: drag beats the flow */
	assert_abs(pt.energy_residual, 0.0, 1e-6);
	ow_solver_destroy(sv);
	free(s);
}

/* A barrel zone is a controlled wall with finite heating and cooling
 * power. On the demo line at 100 rpm the last zones need more cooling than
 * they have: each such zone gives the resin exactly minus its cooling
 * power, its control point floats above the set-point, the point says so
 * and fails zone_control; the energy book still closes (first law,
 * Tadmor & Gogos 2006 ch. 9). With unlimited power every zone holds its
 * set-point, gives what it needs, and the melt leaves cooler. */
static void zone_out_of_cooling_floats_to_the_heat_it_can_remove(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_point pt = solve(s, 100.0, NULL), held;
	struct ow_verdict v;
	int i, floating = 0;
	(void)st;
	for (i = 0; i < s->line.n_zones; i++) {
		const struct ow_zone *z = &s->line.zones[i];

		if (!(pt.zone_floating & (1u << i))) {
			assert_rel(pt.zone_control_K[i], pt.set_K[i], 1e-12);
			assert_abs(pt.zone_heat_W[i], pt.zone_demand_W[i],
			           1e-6);
			continue;
		}
		floating++;
		assert_true(pt.zone_demand_W[i] < -z->cooling_W);
		assert_abs(pt.zone_heat_W[i], -z->cooling_W,
		           1e-5 * z->cooling_W + 1e-2);
		assert_true(pt.zone_control_K[i] > pt.set_K[i] + 1.0);
	}
	assert_true(floating >= 1);
	assert_true(pt.flags & OW_FLAG_ZONE_FLOAT);
	assert_true(pt.zone_load > 1.0);
	assert_abs(pt.energy_residual, 0.0, 1e-6);
	ow_classify(&pt, &s->line.limits, ow_screw_length(&s->screw), &v);
	assert_true(v.bits & (1u << OW_CK_ZONE_CONTROL));
	assert_true(v.margin[OW_CK_ZONE_CONTROL] < 0.0);
	s->line.limits.zone_load = NAN; /* switched off: not classified */
	ow_classify(&pt, &s->line.limits, ow_screw_length(&s->screw), &v);
	assert_false(v.bits & (1u << OW_CK_ZONE_CONTROL));
	hold_every_zone(s);
	held = solve(s, 100.0, NULL);
	assert_int_equal(held.zone_floating, 0);
	assert_true(held.barrel_heat_W < pt.barrel_heat_W);
	assert_true(held.discharge_bulk_K < pt.discharge_bulk_K - 5.0);
	free(s);
}

/* The study's heat_transfer_factor multiplies every zone's wall
 * coefficient: a factor of 1000 makes the walls ideal to within a small
 * share of the barrel heat (resistances in series, Bird, Stewart &
 * Lightfoot 2002 section 10.6), and a weaker wall lets less heat through,
 * so the melt the barrel cools leaves hotter (at 40 rpm every zone of the
 * demo holds its set-point). */
static void heat_transfer_factor_scales_the_wall(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_point base, stiff, ideal, weak;
	int i;
	(void)st;
	base = solve(s, 40.0, NULL);
	assert_int_equal(base.zone_floating, 0);
	s->line.heat_transfer_factor = 1000.0;
	stiff = solve(s, 40.0, NULL);
	s->line.heat_transfer_factor = 1.0;
	for (i = 0; i < s->line.n_zones; i++)
		s->line.zones[i].wall_h_W_m2K = NAN;
	ideal = solve(s, 40.0, NULL);
	assert_rel(stiff.barrel_heat_W, ideal.barrel_heat_W, 0.01);
	assert_abs(stiff.discharge_bulk_K, ideal.discharge_bulk_K, 0.1);
	free(s);
	s = ow_test_study("demo/study-si.json");
	s->line.heat_transfer_factor = 0.25;
	weak = solve(s, 40.0, NULL);
	assert_true(base.barrel_heat_W < 0.0);
	assert_true(weak.barrel_heat_W > base.barrel_heat_W);
	assert_true(weak.discharge_bulk_K > base.discharge_bulk_K);
	free(s);
}

/* The largest second difference of the output over n speeds h apart from
 * r0, relative to the output. */
static double output_d2(const struct ow_study *s, double r0, double h, int n,
                        unsigned *floating)
{
	double g[16], worst = 0.0;
	int i;

	for (i = 0; i < n; i++) {
		struct ow_point pt = solve(s, r0 + i * h, NULL);

		g[i] = pt.output_kg_s;
		floating[i] = pt.zone_floating;
	}
	for (i = 1; i + 1 < n; i++)
		worst =
		    fmax(worst, fabs(g[i - 1] - 2.0 * g[i] + g[i + 1]) / g[i]);
	return worst;
}

/* Where a zone reaches its cooling power the screw characteristic only
 * bends: the output is continuous in speed with a kink in its slope
 * (a controlled wall turning into a wall of fixed heat; Tadmor & Klein
 * 1970, ch. 8, the output a continuous function of N and wall
 * temperature). So the second difference of the output over speeds 0.05
 * rpm apart across the demo's third zone reaching its cooling power stays
 * at the order of the slope's change times the step and of the match's
 * own tolerance (2e-5 of G), far below the 0.1 % steps a zone solve that
 * stops loosely or depends on its history leaves. */
static void output_is_smooth_where_a_zone_reaches_its_power(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double lo = 80.0, hi = 90.0, h = 0.05;
	unsigned fl[9];
	int i, held = 0, floated = 0;
	(void)st;
	assert_false(solve(s, lo, NULL).zone_floating & 4u);
	assert_true(solve(s, hi, NULL).zone_floating & 4u);
	while (hi - lo > 1e-3) {
		double mid = 0.5 * (lo + hi);

		if (solve(s, mid, NULL).zone_floating & 4u)
			hi = mid;
		else
			lo = mid;
	}
	assert_true(output_d2(s, lo - 4.37 * h, h, 9, fl) < 1e-4);
	for (i = 0; i < 9; i++) {
		held += !(fl[i] & 4u);
		floated += !!(fl[i] & 4u);
	}
	assert_true(held >= 3 && floated >= 3);
	/* the floating zone gives exactly its cooling power */
	{
		struct ow_point pt = solve(s, hi + 0.3, NULL);

		assert_abs(pt.zone_heat_W[2], -s->line.zones[2].cooling_W,
		           1e-5 * s->line.zones[2].cooling_W + 1e-2);
	}
	free(s);
}

/* A bed that ends just past a station carries a vanishing share of the
 * throughput there (the bed width falls as the square of the distance to
 * its end, Tadmor & Klein 1970 ch. 9): it melts within that step instead
 * of costing a further melting step, so where the end of melting crosses
 * a station the output changes by no step. Bisected to 1e-6 rpm, the
 * crossing's neighbours 1e-4 rpm apart include a leftover bed far below
 * 1e-9 of the throughput. */
static void negligible_leftover_bed_adds_no_step(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	double dx, lo = 85.0, hi = 90.0;
	unsigned fl[9];
	long k;
	struct ow_point a;
	(void)st;
	{
		struct ow_solver *sv = NULL;
		struct ow_diag d = {{0}};
		struct ow_point pt;
		int n;

		assert_int_equal(ow_solver_create(s, &sv, &d), OW_OK);
		assert_int_equal(ow_solver_run(sv, lo, NULL, 0.0, &pt, &d),
		                 OW_OK);
		ow_solver_profile(sv, &n);
		dx = ow_screw_length(&s->screw) / (n - 1);
		ow_solver_destroy(sv);
	}
	a = solve(s, lo, NULL);
	k = (long)floor(a.melt_complete_m / dx);
	assert_true((long)floor(solve(s, hi, NULL).melt_complete_m / dx) != k);
	while (hi - lo > 1e-6) {
		double mid = 0.5 * (lo + hi);

		if ((long)floor(solve(s, mid, NULL).melt_complete_m / dx) == k)
			lo = mid;
		else
			hi = mid;
	}
	assert_true(output_d2(s, lo - 4e-4, 1e-4, 9, fl) < 1e-5);
	free(s);
}

/* ---- solver extras against hand calculations ------------------------- */

/* Rowell & Finlayson (1922) shape factors as Tadmor & Klein (1970) ch. 7
 * write them, summed here independently of the library:
 * F_d = 16/(pi^3 h) sum_odd tanh(i pi h/2)/i^3,
 * F_p = 1 - 192 h/pi^5 sum_odd tanh(i pi/(2h))/i^5, h = H/W. */
static double shape_fd(double h)
{
	double sum = 0.0;

	for (int i = 1; i < 20001; i += 2)
		sum += tanh(i * OW_PI * h / 2.0) / ((double)i * i * i);
	return 16.0 / (OW_PI * OW_PI * OW_PI * h) * sum;
}

static double shape_fp(double h)
{
	double sum = 0.0;

	for (int i = 1; i < 20001; i += 2)
		sum += tanh(i * OW_PI / (2.0 * h)) / pow(i, 5.0);
	return 1.0 - 192.0 * h / pow(OW_PI, 5.0) * sum;
}

/* The melt-fed Newtonian screw (constant depth H, length L, p flights,
 * clearance delta, land e, viscosity mu in channel and clearance alike)
 * with a rod die (radius R, length L_d) and a screen pack dP_s, in closed
 * form. Per channel (Tadmor & Klein 1970 ch. 7, with their leakage over
 * the flight): Q_c = F_d V_bz W H/2 - F_p W H^3 G/(12 mu) - Q_L,
 * Q_L = L_b [V_bx delta/2 + delta^3 (G L_b + G_x W)/(12 mu e)], with
 * L_b = pi D cos(phi)/p the flight length beside one channel
 * cross-section, G = dP/Z (Z = L/sin phi) and G_x = 6 mu V_bx/H^2 the
 * cross-channel gradient of zero net cross flow. Whole screw p Q_c; die
 * Q = pi R^4 dP_die/(8 mu L_d) (Hagen-Poiseuille, Bird, Stewart &
 * Lightfoot 2002 section 2.3); tip pressure dP_die + dP_s. Linear in the
 * pressures: q = pA/(K + pB) with A, B the screw's intercept and slope. */
struct line_cf {
	double D, Ls, H, L, e, delta, mu, R, Ld, rpm, screen;
	int p;
};

static void closed_form(const struct line_cf *l, double *q, double *tip)
{
	double phi = atan(l->Ls / (OW_PI * l->D)),
	       vb = OW_PI * l->D * l->rpm / 60.0;
	double vbz = vb * cos(phi), vbx = vb * sin(phi);
	double W = l->Ls * cos(phi) / l->p - l->e, H = l->H,
	       d3 = pow(l->delta, 3.0);
	double lb = OW_PI * l->D * cos(phi) / l->p, Z = l->L / sin(phi);
	double A = shape_fd(H / W) * vbz * W * H / 2.0 -
	           lb * vbx * l->delta / 2.0 -
	           lb * d3 * W * vbx / (2.0 * l->e * H * H);
	double B = (shape_fp(H / W) * W * H * H * H / (12.0 * l->mu) +
	            lb * lb * d3 / (12.0 * l->mu * l->e)) /
	           Z;
	double K = OW_PI * pow(l->R, 4.0) / (8.0 * l->mu * l->Ld);
	double die = l->p * (A - B * l->screen) / (K + l->p * B);

	*q = K * die;
	*tip = die + l->screen;
}

/* The rod study's line (tests/data/newtonian-rod.json) in those terms. */
static struct line_cf rod_line(void)
{
	struct line_cf l = {0.0635, 0.0635, 0.003175, 8 * 0.0635, 0.00635, 0.0,
	                    1000.0, 0.0025, 0.020,    60.0,       0.0,     1};
	return l;
}

/* First the closed form itself against the published operating point
 * (Q = 1.42774e-5 m3/s at 18.615 MPa, above); then a 5 MPa screen pack:
 * the tip must carry die + screen, so the output falls along the screw
 * characteristic to q = p(A - B dP_s)/(K + pB): 1.3903e-5 m3/s, tip
 * 23.126 MPa (recomputed by hand from the published Q_d = 1.582355e-5
 * m3/s and dP_max = 1.9051e8 Pa). */
static void screen_pack_moves_output_along_the_die_characteristic(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-rod.json");
	struct line_cf l = rod_line();
	struct ow_point a, b;
	double q, tip;
	(void)st;
	closed_form(&l, &q, &tip);
	assert_rel(q, 1.42774e-5, 1e-4);
	assert_rel(tip, 1.8615e7, 1e-4);
	a = solve(s, 60.0, NULL);
	s->line.screen_pressure_Pa = l.screen = 5e6;
	closed_form(&l, &q, &tip);
	assert_rel(q, 1.3903e-5, 2e-4);
	assert_rel(tip, 2.3126e7, 2e-4);
	b = solve(s, 60.0, NULL);
	assert_rel(b.output_kg_s / 760.0, q, 3e-4);
	assert_rel(b.discharge_pressure_Pa, tip, 3e-4);
	assert_true(b.output_kg_s < a.output_kg_s);
	/* drive power from torque, P = 2 pi N T (rotational power; 1000 N m
	 * at 60 rpm is 6283.2 W) */
	assert_rel(b.power_W, 2.0 * OW_PI * (60.0 / 60.0) * b.torque_Nm, 1e-12);
	free(s);
}

/* The pressure figure classified is the largest anywhere on the screw:
 * the maximum over the profile's stations and where it is (on the demo
 * line the pressure peaks before the tip). */
static void max_pressure_is_the_largest_on_the_profile(void **st)
{
	struct ow_study *s = ow_test_study("demo/study-si.json");
	struct ow_solver *sv = NULL;
	const struct ow_profile_row *r;
	struct ow_point pt;
	double mx = -1.0, at = 0.0;
	int n, i;
	(void)st;
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 60.0, NULL, 0.0, &pt, NULL), OW_OK);
	r = ow_solver_profile(sv, &n);
	for (i = 0; i < n; i++)
		if (r[i].pressure_Pa > mx) {
			mx = r[i].pressure_Pa;
			at = r[i].axial_m;
		}
	/* figures and profile agree to the match's tolerance (the figures
	 * may take the last Newton step the profile's march did not) */
	assert_rel(pt.max_pressure_Pa, mx, 1e-3);
	assert_rel(pt.max_pressure_at_m, at, 1e-12);
	assert_rel(pt.discharge_pressure_Pa, r[n - 1].pressure_Pa, 1e-3);
	assert_true(mx > 1.5 * r[n - 1].pressure_Pa); /* peaks before the tip */
	ow_solver_destroy(sv);
	free(s);
}

/* Channel volume of a constant-depth screw: the annulus pi H (D - H)
 * less the flight lands, p e H / sin(phi_mean) per axial length (the
 * helical land of normal width e at the mean diameter; Tadmor & Gogos
 * 2006, ch. 9 channel geometry). */
static double channel_area(double D, double Ls, double H, double e, int p)
{
	double phim = atan(Ls / (OW_PI * (D - H)));

	return OW_PI * H * (D - H) - p * e * H / sin(phim);
}

/* A two-flight screw with a 0.1 mm clearance (and the single-flight one
 * with it) against the closed form with leakage: each channel leaks over
 * its own flight length pi D cos(phi)/p. */
static void two_flight_leakage_matches_the_closed_form(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-rod.json");
	struct line_cf l = rod_line();
	int p;
	(void)st;
	for (p = 1; p <= 2; p++) {
		struct ow_point pt;
		double q, tip, q0, tip0;

		s->screw.flights = l.p = p;
		s->screw.clearance_m = l.delta = 1e-4;
		assert_int_equal(ow_screw_prepare(&s->screw, NULL), OW_OK);
		closed_form(&l, &q, &tip);
		l.delta = 0.0;
		closed_form(&l, &q0, &tip0);
		assert_true(q < 0.97 * q0); /* the leak matters here */
		pt = solve(s, 60.0, NULL);
		assert_rel(pt.output_kg_s / 760.0, q, 5e-4);
		assert_rel(pt.discharge_pressure_Pa, tip, 5e-4);
		/* and the energy book of all p channels closes (first law,
		 * Tadmor & Gogos 2006 ch. 9); melt-fed, each station's power
		 * is its dissipation plus Q dP exactly (Tadmor & Klein 1970
		 * ch. 7), so to round-off, not just 1 % */
		assert_abs(pt.energy_residual, 0.0, 1e-6);
		/* the hold-up fills every channel: melt over the channel
		 * volume of p flights */
		assert_rel(
		    pt.residence_s,
		    760.0 * channel_area(0.0635, 0.0635, 0.003175, 0.00635, p) *
		        8 * 0.0635 / pt.output_kg_s,
		    1e-6);
	}
	free(s);
}

/* Mean residence time = hold-up mass / throughput. Melt-fed rod line:
 * the hold-up is the melt (760 kg/m3) filling the 8 D channel. */
static void residence_time_is_melt_hold_up_over_throughput(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/newtonian-rod.json");
	struct ow_point pt = solve(s, 60.0, NULL);
	double vol =
	    channel_area(0.0635, 0.0635, 0.003175, 0.00635, 1) * 8 * 0.0635;
	(void)st;
	assert_rel(pt.residence_s, 760.0 * vol / pt.output_kg_s, 1e-6);
	free(s);
}

/* The solids ahead of melting are held at the bulk density: with the
 * first zone below the melting point the bed starts melting past 6 D, and
 * changing only the bulk density (560 -> 400 kg/m3) changes the hold-up
 * by the difference times the channel volume up to there, nothing else
 * (the solids pass G at the feed pressure). */
static void residence_time_holds_the_feed_at_bulk_density(void **st)
{
	struct ow_study *s = ow_test_study("fixtures/studies/hdpe-sf.json");
	double set[OW_MAX_ZONES], vol, x, dx;
	struct ow_point a, b;
	int i;
	(void)st;
	for (i = 0; i < s->line.n_zones; i++)
		set[i] = s->line.zones[i].set_K;
	set[0] = 393.15; /* 120 degC, below the 130 degC melting point */
	s->resin.bulk_density_kg_m3 = 560.0;
	a = solve(s, 60.0, set);
	s->resin.bulk_density_kg_m3 = 400.0;
	b = solve(s, 60.0, set);
	assert_rel(b.output_kg_s, a.output_kg_s, 1e-9);
	assert_rel(b.melt_start_m, a.melt_start_m, 1e-9);
	assert_true(a.melt_start_m >= 6 * 0.0635);
	/* the plug fills every station up to the one in which it starts
	 * melting (steps of lead / stations per turn, area at mid-step) */
	dx = 0.0635 / s->line.numerics.stations_per_turn;
	for (vol = 0.0, x = 0.0; x < a.melt_start_m - 1e-9; x += dx)
		vol += channel_area(0.0635, 0.0635,
		                    ow_screw_depth(&s->screw, x + 0.5 * dx),
		                    0.00635, 1) *
		       dx;
	assert_rel(a.residence_s - b.residence_s, 160.0 * vol / a.output_kg_s,
	           1e-6);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(
	        match_reproduces_newtonian_rod_die_operating_point),
	    cmocka_unit_test(energy_closes_on_demo_and_melt_fed_line),
	    cmocka_unit_test(default_resolution_is_converged_on_demo),
	    cmocka_unit_test(default_tolerances_match_a_tight_solve),
	    cmocka_unit_test(output_and_peak_rise_with_speed),
	    cmocka_unit_test(deeper_metering_gives_more_output_and_cooler_melt),
	    cmocka_unit_test(worn_screw_gives_less_output_and_hotter_melt),
	    cmocka_unit_test(melt_pool_conveys_at_its_own_width),
	    cmocka_unit_test(pressure_peaks_where_taper_drag_equals_throughput),
	    cmocka_unit_test(barrier_channels_share_one_gradient),
	    cmocka_unit_test(negative_pressure_flags_a_partly_filled_channel),
	    cmocka_unit_test(barrier_screw_keeps_pace_with_single_flight),
	    cmocka_unit_test(plugging_is_read_in_the_transition),
	    cmocka_unit_test(delay_zone_follows_speed_wall_and_feed),
	    cmocka_unit_test(bed_reaching_the_transition_whole_fires_max_sbr),
	    cmocka_unit_test(abrupt_compression_plugs_and_gradual_does_not),
	    cmocka_unit_test(solver_is_repeatable_and_warm_start_agrees),
	    cmocka_unit_test(start_from_neighbouring_speeds_agrees_with_cold),
	    cmocka_unit_test(start_with_floating_zones_agrees_with_cold),
	    cmocka_unit_test(sweep_continuation_matches_tight_cold_solves),
	    cmocka_unit_test(
	        prediction_is_exact_for_specific_output_linear_in_speed),
	    cmocka_unit_test(cold_barrel_returns_a_flagged_point),
	    cmocka_unit_test(feed_capacity_follows_darnell_mol),
	    cmocka_unit_test(mixer_pressure_follows_the_land_flow_closed_form),
	    cmocka_unit_test(
	        zone_out_of_cooling_floats_to_the_heat_it_can_remove),
	    cmocka_unit_test(heat_transfer_factor_scales_the_wall),
	    cmocka_unit_test(output_is_smooth_where_a_zone_reaches_its_power),
	    cmocka_unit_test(negligible_leftover_bed_adds_no_step),
	    cmocka_unit_test(
	        screen_pack_moves_output_along_the_die_characteristic),
	    cmocka_unit_test(max_pressure_is_the_largest_on_the_profile),
	    cmocka_unit_test(two_flight_leakage_matches_the_closed_form),
	    cmocka_unit_test(residence_time_is_melt_hold_up_over_throughput),
	    cmocka_unit_test(residence_time_holds_the_feed_at_bulk_density),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
