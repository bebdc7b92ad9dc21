/* test_classify.c - every limit kind on both sides and on the limit, the
 * flags that are always unsafe, and the limits of a line around its
 * closed-form operating point.
 *
 * The limits come from studies built for these checks (tests/data/
 * limits-all.json, limits-rod.json), read through the config loader so
 * the units are converted as a user's file would be. Each expected verdict
 * is worked out by hand beside it: a point passes a limit when its margin
 * is >= 0 (on the limit is inside), and fails it otherwise. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include "ow_classify.h"
#include "ow_solver.h"

#define C0    273.15 /* K at 0 degC */
#define LEN_M 0.508  /* screw length used by the unmelt margin (8 D) */

/* A point comfortably inside every limit of limits-all.json (hand-picked:
 * each figure 10-50 % away from its limit), with distinct figures where
 * one check could be confused with another (bulk below peak, discharge
 * pressure below the maximum, torque in N m unlike power in W). */
static struct ow_point inside_point(void)
{
	struct ow_point p;

	memset(&p, 0, sizeof p);
	p.rpm = 60.0;
	p.output_kg_s = 60.0 / 3600.0;   /* 60 kg/h in 30..90 */
	p.discharge_pressure_Pa = 12e6;  /* tip 12 MPa */
	p.max_pressure_Pa = 25e6;        /* 25 MPa < 35 */
	p.discharge_bulk_K = C0 + 210.0; /* 210 degC > 190 */
	p.discharge_peak_K = C0 + 215.0;
	p.peak_K = C0 + 225.0; /* 225 degC < 240 */
	p.unmelt_frac = 0.002; /* 0.2 % < 0.5 % */
	p.melt_start_m = 0.1;
	p.melt_complete_m = NAN; /* solids reach the tip */
	p.max_sbr = 0.6;         /* < 0.8 */
	p.power_W = 20e3;        /* 20 kW < 40 */
	p.torque_Nm = 3183.1;    /* 20 kW at 60 rpm < 5000 */
	p.zone_load = 0.5;       /* half a zone's power < 90 % */
	return p;
}

static struct ow_study *all_limits(void)
{
	return ow_test_study("tests/data/limits-all.json");
}

static unsigned verdict(const struct ow_study *s, const struct ow_point *p,
                        struct ow_verdict *v)
{
	ow_classify(p, &s->line.limits, LEN_M, v);
	return v->bits;
}

/* The study's limits, converted to SI by hand: 240 degC = 513.15 K;
 * 0.5 % = 0.005; 35 MPa; 40 kW; 5000 N m; 190 degC = 463.15 K; 30 and
 * 90 kg/h = 1/120 and 1/40 kg/s; SBR 0.8; zone control 90 % = 0.9. */
static void study_limits_load_in_si(void **st)
{
	struct ow_study *s = all_limits();
	const struct ow_limits *l = &s->line.limits;
	(void)st;
	assert_rel(l->peak_temp_K, 513.15, 1e-12);
	assert_rel(l->unmelt_frac, 0.005, 1e-12);
	assert_rel(l->pressure_Pa, 35e6, 1e-12);
	assert_rel(l->power_W, 40e3, 1e-12);
	assert_rel(l->torque_Nm, 5000.0, 1e-12);
	assert_rel(l->min_melt_temp_K, 463.15, 1e-12);
	assert_rel(l->min_output_kg_s, 1.0 / 120.0, 1e-12);
	assert_rel(l->max_output_kg_s, 1.0 / 40.0, 1e-12);
	assert_rel(l->max_sbr, 0.8, 1e-12);
	assert_rel(l->zone_load, 0.9, 1e-12);
	free(s);
}

/* The comfortable point passes every limit, each margin positive. */
static void point_inside_every_limit_is_safe(void **st)
{
	struct ow_study *s = all_limits();
	struct ow_point p = inside_point();
	struct ow_verdict v;
	int c;
	(void)st;
	assert_int_equal(verdict(s, &p, &v), 0u);
	for (c = 0; c < OW_CK_LIMITS; c++)
		assert_true(v.margin[c] > 0.0);
	free(s);
}

/* One figure of the comfortable point moved to a value. */
enum fig {
	F_PEAK,
	F_UNMELT,
	F_PMAX,
	F_POWER,
	F_TORQUE,
	F_BULK,
	F_OUTPUT,
	F_SBR,
	F_ZONE
};

static void set_fig(struct ow_point *p, enum fig f, double x)
{
	switch (f) {
	case F_PEAK:
		p->peak_K = x;
		break;
	case F_UNMELT:
		p->unmelt_frac = x;
		break;
	case F_PMAX:
		p->max_pressure_Pa = x;
		break;
	case F_POWER:
		p->power_W = x;
		break;
	case F_TORQUE:
		p->torque_Nm = x;
		break;
	case F_BULK:
		p->discharge_bulk_K = x;
		break;
	case F_OUTPUT:
		p->output_kg_s = x;
		break;
	case F_SBR:
		p->max_sbr = x;
		break;
	case F_ZONE:
		p->zone_load = x;
		break;
	}
}

/* A limit's three cases: the figure just inside, on, and just outside
 * the limit (by hand: inside and on pass, outside fails that check and no
 * other; the margin is zero on the limit and has the side's sign). */
struct side_case {
	enum ow_check check;
	enum fig fig;
	double in, on, out; /* figure values, SI */
};

static void check_sides(const struct side_case *k)
{
	struct ow_study *s = all_limits();
	struct ow_point p = inside_point();
	struct ow_verdict v;

	set_fig(&p, k->fig, k->in);
	assert_int_equal(verdict(s, &p, &v), 0u);
	assert_true(v.margin[k->check] > 0.0);
	set_fig(&p, k->fig, k->on);
	assert_int_equal(verdict(s, &p, &v), 0u);
	assert_abs(v.margin[k->check], 0.0, 1e-12);
	set_fig(&p, k->fig, k->out);
	assert_int_equal(verdict(s, &p, &v), 1u << k->check);
	assert_true(v.margin[k->check] < 0.0);
	free(s);
}

/* Upper limits: just below passes, equal passes, just above fails. */
static void peak_temperature_limit_has_three_sides(void **st)
{
	/* 240 degC: 239.9 inside, 240.0 on, 240.1 outside (the bulk stays
	 * at 210 degC: the peak, not the bulk, is checked) */
	struct side_case k = {OW_CK_PEAK_TEMP, F_PEAK, C0 + 239.9, C0 + 240.0,
	                      C0 + 240.1};
	(void)st;
	check_sides(&k);
}

static void unmelt_limit_has_three_sides(void **st)
{
	/* 0.5 %: 0.49 % inside, 0.5 % on, 0.51 % outside */
	struct side_case k = {OW_CK_UNMELT, F_UNMELT, 0.0049, 0.005, 0.0051};
	(void)st;
	check_sides(&k);
}

static void pressure_limit_has_three_sides(void **st)
{
	/* 35 MPa on the maximum anywhere (the tip stays at 12 MPa) */
	struct side_case k = {OW_CK_PRESSURE, F_PMAX, 34.99e6, 35e6, 35.01e6};
	(void)st;
	check_sides(&k);
}

static void power_limit_has_three_sides(void **st)
{
	/* 40 kW: 39.99, 40, 40.01 kW (torque stays at 3183 N m) */
	struct side_case k = {OW_CK_POWER, F_POWER, 39.99e3, 40e3, 40.01e3};
	(void)st;
	check_sides(&k);
}

static void torque_limit_has_three_sides(void **st)
{
	/* 5000 N m: 4999, 5000, 5001 (power stays at 20 kW) */
	struct side_case k = {OW_CK_TORQUE, F_TORQUE, 4999.0, 5000.0, 5001.0};
	(void)st;
	check_sides(&k);
}

/* Lower limits: just above passes, equal passes, just below fails. */
static void minimum_melt_temperature_has_three_sides(void **st)
{
	/* 190 degC on the bulk at discharge: 190.1, 190, 189.9 */
	struct side_case k = {OW_CK_MIN_MELT_TEMP, F_BULK, C0 + 190.1,
	                      C0 + 190.0, C0 + 189.9};
	(void)st;
	check_sides(&k);
}

static void minimum_output_has_three_sides(void **st)
{
	/* 30 kg/h: 30.01, 30, 29.99 kg/h */
	struct side_case k = {OW_CK_MIN_OUTPUT, F_OUTPUT, 30.01 / 3600.0,
	                      30.0 / 3600.0, 29.99 / 3600.0};
	(void)st;
	check_sides(&k);
}

static void maximum_output_has_three_sides(void **st)
{
	/* 90 kg/h: 89.99, 90, 90.01 kg/h */
	struct side_case k = {OW_CK_MAX_OUTPUT, F_OUTPUT, 89.99 / 3600.0,
	                      90.0 / 3600.0, 90.01 / 3600.0};
	(void)st;
	check_sides(&k);
}

static void solid_bed_ratio_limit_has_three_sides(void **st)
{
	/* 0.8: 0.799, 0.8, 0.801 (pressure stays at 25 MPa) */
	struct side_case k = {OW_CK_MAX_SBR, F_SBR, 0.799, 0.8, 0.801};
	(void)st;
	check_sides(&k);
}

static void zone_control_limit_has_three_sides(void **st)
{
	/* 90 % of a zone's heating or cooling power: 89.9, 90, 90.1 % */
	struct side_case k = {OW_CK_ZONE_CONTROL, F_ZONE, 0.899, 0.9, 0.901};
	(void)st;
	check_sides(&k);
}

/* Margins by hand at the comfortable point: relative to the limit for
 * pressures, powers, torques, outputs and ratios, per 50 K for
 * temperatures; unmelt per max(limit, 1 %). */
static void margins_are_the_documented_normalised_distances(void **st)
{
	struct ow_study *s = all_limits();
	struct ow_point p = inside_point();
	struct ow_verdict v;
	(void)st;
	verdict(s, &p, &v);
	assert_rel(v.margin[OW_CK_PEAK_TEMP], 15.0 / 50.0, 1e-9);
	assert_rel(v.margin[OW_CK_UNMELT], (0.005 - 0.002) / 0.01, 1e-9);
	assert_rel(v.margin[OW_CK_PRESSURE], 10.0 / 35.0, 1e-9);
	assert_rel(v.margin[OW_CK_POWER], 20.0 / 40.0, 1e-9);
	assert_rel(v.margin[OW_CK_TORQUE], (5000.0 - 3183.1) / 5000.0, 1e-9);
	assert_rel(v.margin[OW_CK_MIN_MELT_TEMP], 20.0 / 50.0, 1e-9);
	assert_rel(v.margin[OW_CK_MIN_OUTPUT], 30.0 / 30.0, 1e-9);
	assert_rel(v.margin[OW_CK_MAX_OUTPUT], 30.0 / 90.0, 1e-9);
	assert_rel(v.margin[OW_CK_MAX_SBR], 0.2 / 0.8, 1e-9);
	assert_rel(v.margin[OW_CK_ZONE_CONTROL], 0.4 / 0.9, 1e-9);
	free(s);
}

/* Melting complete before the tip: the unmelt margin keeps growing with
 * the unused screw, limit/max(limit, 1 %) + (L - z_done)/L; by hand at
 * z_done = 2/3 L: 0.5 + 1/3. */
static void unmelt_margin_grows_with_the_screw_left_after_melting(void **st)
{
	struct ow_study *s = all_limits();
	struct ow_point p = inside_point();
	struct ow_verdict v;
	(void)st;
	p.unmelt_frac = 0.0;
	p.melt_complete_m = LEN_M * 2.0 / 3.0;
	assert_int_equal(verdict(s, &p, &v), 0u);
	assert_rel(v.margin[OW_CK_UNMELT], 0.5 + 1.0 / 3.0, 1e-12);
	free(s);
}

/* Plugging, a feed limit and a point that did not converge are unsafe
 * whatever the figures say (each flag alone sets its own bit only). */
static void flags_are_always_unsafe(void **st)
{
	struct ow_study *s = all_limits();
	const unsigned flag[] = {OW_FLAG_PLUGGING, OW_FLAG_FEED_LIMITED,
	                         OW_FLAG_NOT_CONVERGED};
	const enum ow_check bit[] = {OW_CK_PLUGGING, OW_CK_FEED, OW_CK_NOCONV};
	size_t i;
	(void)st;
	for (i = 0; i < 3; i++) {
		struct ow_point p = inside_point();
		struct ow_verdict v;

		p.flags = flag[i];
		assert_int_equal(verdict(s, &p, &v), 1u << bit[i]);
	}
	free(s);
}

/* A point whose figures are not numbers (a failed solve) fails every
 * limit that is set, and none that is not. */
static void a_point_without_figures_fails_every_limit_set(void **st)
{
	struct ow_study *s = all_limits();
	struct ow_point p;
	struct ow_verdict v;
	unsigned all = (1u << OW_CK_LIMITS) - 1u;
	(void)st;
	memset(&p, 0, sizeof p);
	p.output_kg_s = p.max_pressure_Pa = p.peak_K = NAN;
	p.discharge_bulk_K = p.unmelt_frac = p.max_sbr = NAN;
	p.power_W = p.torque_Nm = p.melt_complete_m = p.zone_load = NAN;
	assert_int_equal(verdict(s, &p, &v), all);
	s->line.limits.max_sbr = NAN; /* not set: neither checked */
	s->line.limits.torque_Nm = NAN;
	assert_int_equal(verdict(s, &p, &v),
	                 all & ~(1u << OW_CK_MAX_SBR) & ~(1u << OW_CK_TORQUE));
	assert_true(isnan(v.margin[OW_CK_MAX_SBR]));
	assert_false(ow_check_active(&s->line.limits, OW_CK_MAX_SBR));
	assert_true(ow_check_active(&s->line.limits, OW_CK_PLUGGING));
	free(s);
}

/* The Newtonian rod line's operating point has a closed form: G =
 * 1.42774e-5 m3/s x 760 kg/m3 = 39.063 kg/h at 18.615 MPa (Tadmor & Klein
 * 1970 screw characteristic with the Hagen-Poiseuille die, Bird, Stewart &
 * Lightfoot 2002; recomputed). Its study puts min_output 39.0 and
 * max_output 39.2 kg/h and pressure 18.7 MPa around it: safe. Moved by
 * hand 0.15 % past the point, each limit fails alone. */
static void limits_around_a_closed_form_operating_point(void **st)
{
	struct ow_study *s = ow_test_study("tests/data/limits-rod.json");
	struct ow_limits *l = &s->line.limits;
	struct ow_point p = ow_test_solve(s, 60.0, NULL);
	struct ow_verdict v;
	double len = 8.0 * 0.0635;
	(void)st;
	assert_rel(p.output_kg_s * 3600.0, 39.063, 3e-4);
	assert_rel(p.max_pressure_Pa, 1.8615e7, 3e-4);
	ow_classify(&p, l, len, &v);
	assert_int_equal(v.bits, 0u);
	l->min_output_kg_s = 39.12 / 3600.0; /* above 39.063 */
	ow_classify(&p, l, len, &v);
	assert_int_equal(v.bits, 1u << OW_CK_MIN_OUTPUT);
	l->min_output_kg_s = 39.0 / 3600.0;
	l->max_output_kg_s = 39.005 / 3600.0; /* below 39.063 */
	ow_classify(&p, l, len, &v);
	assert_int_equal(v.bits, 1u << OW_CK_MAX_OUTPUT);
	l->max_output_kg_s = 39.2 / 3600.0;
	l->pressure_Pa = 18.585e6; /* below 18.615 MPa */
	ow_classify(&p, l, len, &v);
	assert_int_equal(v.bits, 1u << OW_CK_PRESSURE);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(study_limits_load_in_si),
	    cmocka_unit_test(point_inside_every_limit_is_safe),
	    cmocka_unit_test(peak_temperature_limit_has_three_sides),
	    cmocka_unit_test(unmelt_limit_has_three_sides),
	    cmocka_unit_test(pressure_limit_has_three_sides),
	    cmocka_unit_test(power_limit_has_three_sides),
	    cmocka_unit_test(torque_limit_has_three_sides),
	    cmocka_unit_test(minimum_melt_temperature_has_three_sides),
	    cmocka_unit_test(minimum_output_has_three_sides),
	    cmocka_unit_test(maximum_output_has_three_sides),
	    cmocka_unit_test(solid_bed_ratio_limit_has_three_sides),
	    cmocka_unit_test(zone_control_limit_has_three_sides),
	    cmocka_unit_test(margins_are_the_documented_normalised_distances),
	    cmocka_unit_test(
	        unmelt_margin_grows_with_the_screw_left_after_melting),
	    cmocka_unit_test(flags_are_always_unsafe),
	    cmocka_unit_test(a_point_without_figures_fails_every_limit_set),
	    cmocka_unit_test(limits_around_a_closed_form_operating_point),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
