/* testutil.c - shared test helpers. */
#include "testutil.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
#include "ow_material.h"
#include "ow_screw.h"
#include "ow_solver.h"
#include "ow_units.h"

static struct ow_units *units;

void ow_test_assert_rel(double a, double b, double tol, const char *expr,
                        const char *file, int line)
{
	double scale = fabs(b) > 1e-300 ? fabs(b) : 1e-300;

	if (!(fabs(a - b) <= tol * scale)) {
		fprintf(stderr,
		        "%s:%d: %s = %.10g, expected %.10g (rel %.3g)\n", file,
		        line, expr, a, b, tol);
		fail_msg("relative check failed at %s:%d", file, line);
	}
}

void ow_test_assert_abs(double a, double b, double tol, const char *expr,
                        const char *file, int line)
{
	if (!(fabs(a - b) <= tol)) {
		fprintf(stderr,
		        "%s:%d: %s = %.10g, expected %.10g (abs %.3g)\n", file,
		        line, expr, a, b, tol);
		fail_msg("absolute check failed at %s:%d", file, line);
	}
}

void ow_test_square_pitch_screw(struct ow_screw *s, double depth_m)
{
	memset(s, 0, sizeof *s);
	snprintf(s->name, sizeof s->name, "square pitch 63.5 mm");
	s->diameter_m = 0.0635;
	s->lead_m = 0.0635;
	s->flights = 1;
	s->flight_width_m = 0.00635;
	s->clearance_m = 0.0000635;
	s->n_sections = 1;
	s->sections[0].type = OW_SEC_METERING;
	s->sections[0].length_m = 24 * 0.0635;
	s->sections[0].depth_m = depth_m;
	ow_screw_prepare(s, NULL);
}

int ow_test_units_setup(void **state)
{
	(void)state;
	return ow_units_create(&units, NULL) == OW_OK ? 0 : -1;
}

int ow_test_units_teardown(void **state)
{
	(void)state;
	ow_units_destroy(units);
	units = NULL;
	return 0;
}

struct ow_study *ow_test_study(const char *path)
{
	struct ow_study *s = calloc(1, sizeof *s);
	struct ow_diag d = {{0}};

	assert_non_null(s);
	if (ow_config_load_study(units, path, s, &d) != OW_OK)
		fail_msg("%s", d.msg);
	return s;
}

struct ow_point ow_test_solve(const struct ow_study *s, double rpm,
                              const double *set_K)
{
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	struct ow_diag d = {{0}};

	if (ow_solver_create(s, &sv, &d) != OW_OK ||
	    ow_solver_run(sv, rpm, set_K, 0.0, &pt, &d) != OW_OK)
		fail_msg("solver: %s", d.msg);
	ow_solver_destroy(sv);
	assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
	return pt;
}

struct ow_material ow_test_power_law_melt(double m, double n, double rho)
{
	struct ow_material r;

	memset(&r, 0, sizeof r);
	r.melt_density_kg_m3 = rho;
	r.melt_cp_J_kgK = 2500.0;
	r.melt_k_W_mK = 0.2;
	r.visc.model = OW_VISC_POWER_LAW;
	r.visc.consistency_Pa_sn = m;
	r.visc.index = n;
	r.visc.ref_temp_K = 473.15;
	r.visc.shift = OW_SHIFT_ARRHENIUS;
	r.visc.activation_J_mol = 0.0;
	return r;
}
