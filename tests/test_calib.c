/* test_calib.c - calibrating the model to line readings: recovery of known
 * factors from readings the model itself made (with noise), the factors
 * as plain study inputs, the readings reader, and the refusals. */
#include "testutil.h"

#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_calib.h"
#include "ow_config.h"
#include "ow_solver.h"

static struct ow_units *ow_test_units; /* the readings' units */

static int setup(void **state)
{
	if (ow_units_create(&ow_test_units, NULL) != OW_OK)
		return -1;
	return ow_test_units_setup(state);
}

static int teardown(void **state)
{
	ow_units_destroy(ow_test_units);
	return ow_test_units_teardown(state);
}

/* One setting of a generated readings file. */
struct setting {
	double rpm, shift_K;
};

static const struct setting six[6] = {{40, -10}, {60, 0},  {80, 10},
				      {100, 0},  {60, 20}, {90, -5}};

/* Readings "measured" on the model with factors f applied: each quantity
 * of mask solved at the settings, times (1 + noise) for output, pressure
 * and power, plus noise * 100 K for the melt temperature; noise drawn
 * from a Gaussian of standard deviation rel (GSL, seed fixed). */
static char *make_readings(const struct ow_study *s0, const double *f,
			   const struct setting *set, int n, unsigned mask,
			   double rel, unsigned long seed)
{
	struct ow_study *s = malloc(sizeof *s);
	struct ow_solver *sv = NULL;
	gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
	size_t cap = 8192, len = 0;
	char *t = malloc(cap);
	int i, z;

	assert_non_null(s);
	memcpy(s, s0, sizeof *s);
	ow_calib_apply(s, f);
	gsl_rng_set(rng, seed);
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	len += (size_t)snprintf(t + len, cap - len, "screw_speed_rpm");
	for (z = 0; z < s->line.n_zones; z++)
		len += (size_t)snprintf(t + len, cap - len, ",zone%d_degC",
					z + 1);
	len += (size_t)snprintf(t + len, cap - len, "%s%s%s%s,notes\n",
				mask & 1 ? ",output_kg/h" : "",
				mask & 2 ? ",head_pressure_MPa" : "",
				mask & 4 ? ",melt_temp_degC" : "",
				mask & 8 ? ",drive_power_kW" : "");
	for (i = 0; i < n; i++) {
		double set_K[OW_MAX_ZONES];
		struct ow_point pt;

		for (z = 0; z < s->line.n_zones; z++)
			set_K[z] = s->line.zones[z].set_K + set[i].shift_K;
		assert_int_equal(ow_solver_run(sv, set[i].rpm, set_K, 0, &pt,
					       NULL), OW_OK);
		assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
		len += (size_t)snprintf(t + len, cap - len, "%g", set[i].rpm);
		for (z = 0; z < s->line.n_zones; z++)
			len += (size_t)snprintf(t + len, cap - len, ",%.2f",
						set_K[z] - OW_ZERO_C_K);
		if (mask & 1)
			len += (size_t)snprintf(t + len, cap - len, ",%.4f",
				pt.output_kg_s * 3600 *
					(1 + gsl_ran_gaussian(rng, rel)));
		if (mask & 2)
			len += (size_t)snprintf(t + len, cap - len, ",%.4f",
				pt.discharge_pressure_Pa * 1e-6 *
					(1 + gsl_ran_gaussian(rng, rel)));
		if (mask & 4)
			len += (size_t)snprintf(t + len, cap - len, ",%.3f",
				pt.discharge_bulk_K - OW_ZERO_C_K +
					100 * gsl_ran_gaussian(rng, rel));
		if (mask & 8)
			len += (size_t)snprintf(t + len, cap - len, ",%.4f",
				pt.power_W * 1e-3 *
					(1 + gsl_ran_gaussian(rng, rel)));
		len += (size_t)snprintf(t + len, cap - len, ",generated\n");
	}
	ow_solver_destroy(sv);
	gsl_rng_free(rng);
	free(s);
	return t;
}

static struct ow_calib_options options(unsigned free_mask, double rel)
{
	struct ow_calib_options o;
	struct ow_calibration c;
	int q;

	ow_calib_default(&c);
	ow_calib_options_from(&c, &o);
	o.free_mask = free_mask;
	for (q = 0; q < OW_CQ_COUNT; q++) {
		o.sd_rel[q] = q == OW_CQ_MELT ? NAN : rel;
		o.sd_abs[q] = q == OW_CQ_MELT ? 100 * rel : NAN;
	}
	return o;
}

/* Fit the free factors to readings generated with truth; each within 2
 * standard errors of the truth. */
static void recover(const char *study, const double *truth, unsigned mask,
		    unsigned qty)
{
	struct ow_study *s = ow_test_study(study);
	struct ow_readings *r = NULL;
	struct ow_calib_result *res = malloc(sizeof *res);
	struct ow_calib_options o = options(mask, 0.015);
	struct ow_diag d = {{0}};
	char *text = make_readings(s, truth, six, 6, qty, 0.015, 7);
	enum ow_status st;
	int k;

	assert_int_equal(ow_calib_readings_parse(ow_test_units, text,
						 strlen(text), "gen.csv",
						 s->line.n_zones, &r, &d),
			 OW_OK);
	st = ow_calib_run(s, r, &o, res, &d);
	if (getenv("CALIB_DEBUG")) {
		printf("%s iters %d values %g %g %g chi2 %g start %g\n", text, res->iterations, res->value[0], res->value[1], res->value[2], res->chi2, res->chi2_start);
		for (k = 0; k < res->n_resid; k++) printf("  line %d %s %g %g %g\n", res->resid[k].line, ow_calib_qty_name(res->resid[k].qty), res->resid[k].measured, res->resid[k].modelled, res->resid[k].sd);
	}
	if (st != OW_OK)
		fail_msg("%s: %s", study, d.msg);
	for (k = 0; k < OW_CF_COUNT; k++) {
		if (!(mask & (1u << k)))
			continue;
		printf("    %s %s: true %.3f fitted %.4f +- %.4f (chi2 %.1f, "
		       "%d solves)\n", study, ow_calib_factor(k)->name,
		       truth[k], res->value[k], res->std_error[k], res->chi2,
		       res->solves);
		assert_true(fabs(res->value[k] - truth[k]) <
			    2 * res->std_error[k]);
	}
	free(text);
	free(r);
	free(res);
	free(s);
}

static void recovers_viscosity_and_die_on_melt_fed(void **state)
{
	const double truth[OW_CF_COUNT] = {1.25, 1.0, 0.8};

	(void)state;
	recover("fixtures/studies/melt-fed.json", truth,
		(1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE), 15);
}

static void recovers_viscosity_and_die_on_plasticating(void **state)
{
	const double truth[OW_CF_COUNT] = {1.25, 1.0, 0.8};

	(void)state;
	recover("fixtures/studies/hdpe-sf.json", truth,
		(1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE), 15);
}

static void recovers_viscosity_and_die_on_barrier(void **state)
{
	const double truth[OW_CF_COUNT] = {0.8, 1.0, 1.0};

	(void)state;
	recover("fixtures/studies/hdpe-barrier.json", truth,
		1u << OW_CF_VISCOSITY, 13);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(recovers_viscosity_and_die_on_melt_fed),
		cmocka_unit_test(recovers_viscosity_and_die_on_plasticating),
		cmocka_unit_test(recovers_viscosity_and_die_on_barrier),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
