/* testutil.c - shared test helpers. */
#include "testutil.h"

#include <stdio.h>
#include <string.h>

#include "ow_screw.h"

void ow_test_assert_rel(double a, double b, double tol, const char *expr,
			const char *file, int line)
{
	double scale = fabs(b) > 1e-300 ? fabs(b) : 1e-300;

	if (!(fabs(a - b) <= tol * scale)) {
		fprintf(stderr, "%s:%d: %s = %.10g, expected %.10g (rel %.3g)\n",
			file, line, expr, a, b, tol);
		fail_msg("relative check failed at %s:%d", file, line);
	}
}

void ow_test_assert_abs(double a, double b, double tol, const char *expr,
			const char *file, int line)
{
	if (!(fabs(a - b) <= tol)) {
		fprintf(stderr, "%s:%d: %s = %.10g, expected %.10g (abs %.3g)\n",
			file, line, expr, a, b, tol);
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
