/* testutil.h - helpers shared by the cmocka test programs. */
#ifndef OW_TESTUTIL_H
#define OW_TESTUTIL_H

#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <cmocka.h>

#include <math.h>

#define OW_PI 3.14159265358979323846

/* Folder the end-to-end tests write into: the build folder's tests/ (the
 * Makefile passes it, so `make sanitize` writes under build-san/). */
#ifndef OW_TEST_OUT
#define OW_TEST_OUT "build/tests"
#endif

/* Relative closeness |a - b| <= tol * max(|b|, tiny). */
#define assert_rel(a, b, tol)                                                  \
	ow_test_assert_rel((a), (b), (tol), #a, __FILE__, __LINE__)
/* Absolute closeness. */
#define assert_abs(a, b, tol)                                                  \
	ow_test_assert_abs((a), (b), (tol), #a, __FILE__, __LINE__)

void ow_test_assert_rel(double a, double b, double tol, const char *expr,
                        const char *file, int line);
void ow_test_assert_abs(double a, double b, double tol, const char *expr,
                        const char *file, int line);

/* The 63.5 mm square-pitch single-flight screw used in Tadmor & Klein's and
 * many textbook examples: e = 6.35 mm, one constant-depth section of depth
 * depth_m and length 24 D. Prepared. */
struct ow_screw;
void ow_test_square_pitch_screw(struct ow_screw *s, double depth_m);

/* A UDUNITS-2 system for the whole test program, as cmocka group
 * setup and teardown; ow_test_study reads with it. */
int ow_test_units_setup(void **state);
int ow_test_units_teardown(void **state);

/* The study file at path in a new calloc'd study (free() it); the test
 * fails with the loader's message when it does not load. */
struct ow_study;
struct ow_study *ow_test_study(const char *path);

/* Solve study s at rpm and zone set-points set_K (NULL: the study's own)
 * from a cold start; the test fails unless the point converged. */
struct ow_point;
struct ow_point ow_test_solve(const struct ow_study *s, double rpm,
                              const double *set_K);

/* A melt-only test resin: power law m (Pa s^n), index n at 200 degC with
 * no temperature dependence (Arrhenius, zero activation energy), melt
 * density rho, cp 2500 J/(kg K), k 0.2 W/(m K). */
struct ow_material;
struct ow_material ow_test_power_law_melt(double m, double n, double rho);

#endif
