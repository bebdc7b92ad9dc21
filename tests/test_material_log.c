/* test_material_log.c - the log-space viscosity path the melt solver uses
 * (ow_viscosity_log_*) against the direct forms of material.c. */
#include "testutil.h"

#include <string.h>

#include "ow_material.h"

static struct ow_viscosity model(enum ow_visc_model m)
{
	struct ow_viscosity v;

	memset(&v, 0, sizeof v);
	v.model = m;
	v.index = 0.41;
	v.consistency_Pa_sn = 2.0e4;
	v.zero_shear_Pa_s = 5.0e4;
	v.critical_stress_Pa = 3.0e4;
	v.time_constant_s = 4.3;
	v.a = 0.5;
	v.ref_temp_K = 453.15;
	v.shift = OW_SHIFT_ARRHENIUS;
	v.activation_J_mol = 28e3;
	return v;
}

/* The same value over 17 decades of shear rate, across the rate clamp and
 * for the extremes of the accepted parameter ranges (n = 0.05, a = 10). */
static void log_viscosity_equals_the_direct_form(void **state)
{
	enum ow_visc_model ms[] = {OW_VISC_POWER_LAW, OW_VISC_CROSS,
	                           OW_VISC_CARREAU_YASUDA};
	(void)state;
	for (int k = 0; k < 4; k++) {
		struct ow_viscosity v = model(ms[k < 3 ? k : 2]);
		struct ow_visc_log lv;

		if (k == 3) {
			v.index = 0.05;
			v.a = 10.0;
			v.time_constant_s = 1e3;
		}
		ow_viscosity_log_init(&v, &lv);
		for (double lg = -25.0; lg < 15.0; lg += 0.0731) {
			double direct = ow_viscosity_ref(&v, exp(lg));

			assert_rel(exp(ow_viscosity_log_ref(&lv, lg, NULL)),
			           direct, 1e-12);
		}
	}
}

/* The slope is d ln eta / d ln gdot (a central difference of the direct
 * form), zero below the clamp, and its change is bounded by curv. */
static void log_slope_is_the_local_index_minus_one(void **state)
{
	enum ow_visc_model ms[] = {OW_VISC_POWER_LAW, OW_VISC_CROSS,
	                           OW_VISC_CARREAU_YASUDA};
	const double h = 1e-4;
	(void)state;
	for (int k = 0; k < 3; k++) {
		struct ow_viscosity v = model(ms[k]);
		struct ow_visc_log lv;
		double s, sp, prev = NAN;

		ow_viscosity_log_init(&v, &lv);
		for (double lg = -18.0; lg < 12.0; lg += 0.05) {
			double fd = (log(ow_viscosity_ref(&v, exp(lg + h))) -
			             log(ow_viscosity_ref(&v, exp(lg - h)))) /
			            (2.0 * h);

			ow_viscosity_log_ref(&lv, lg, &s);
			assert_abs(s, fd, 1e-7);
			assert_true(s <= 0.0 && s >= v.index - 1.0);
			if (!isnan(prev))
				assert_true(fabs(s - prev) <=
				            lv.curv * 0.05 * (1.0 + 1e-9));
			prev = s;
		}
		ow_viscosity_log_ref(&lv, lv.ln_gmin - 1.0, &sp);
		assert_abs(sp, 0.0, 0.0);
	}
}

/* ln aT of both shifts, and +inf where WLF is singular (T <= Tref - C2). */
static void log_shift_equals_the_log_of_the_direct_shift(void **state)
{
	struct ow_viscosity v = model(OW_VISC_CARREAU_YASUDA);
	(void)state;
	for (double t = 380.0; t < 620.0; t += 3.7)
		assert_abs(ow_viscosity_log_shift(&v, t),
		           log(ow_viscosity_shift(&v, t)), 1e-14);
	v.shift = OW_SHIFT_WLF;
	v.wlf_c1 = 17.44;  /* universal constants (Williams, Landel & Ferry */
	v.wlf_c2_K = 51.6; /* 1955), as test_material uses them */
	for (double t = 410.0; t < 620.0; t += 3.7)
		assert_abs(ow_viscosity_log_shift(&v, t),
		           log(ow_viscosity_shift(&v, t)), 1e-13);
	assert_true(isinf(ow_viscosity_log_shift(&v, 453.15 - 51.6)));
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(log_viscosity_equals_the_direct_form),
	    cmocka_unit_test(log_slope_is_the_local_index_minus_one),
	    cmocka_unit_test(log_shift_equals_the_log_of_the_direct_shift),
	};
	return cmocka_run_group_tests(tests, NULL, NULL);
}
