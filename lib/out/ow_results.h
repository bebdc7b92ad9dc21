/* ow_results.h - machine-readable outputs: JSON and CSV texts in the units
 * their keys name (the output contract in the README), whatever display unit
 * system people read. Numbers are printed locale-independently with enough
 * digits to round-trip. Returned strings are malloc'd: the caller frees them
 * with free(). */
#ifndef OW_RESULTS_H
#define OW_RESULTS_H

#include <stddef.h>

#include "ow_advise.h"
#include "ow_classify.h"
#include "ow_study.h"
#include "ow_solver.h"
#include "ow_window.h"
#include "ow_status.h"

/* `opwin check --json`: length_D, helix_angle_deg, compression_ratio, the
 * sections array and the warnings array (plus further derived data). */
enum ow_status ow_results_check_json(const struct ow_study *s, char **out,
                                     struct ow_diag *d);

/* The figures of a point in output units, in one fixed order: the keys
 * of `point --json` and the columns of grid.csv. */
int ow_results_n_figures(void);
const char *ow_results_figure_key(int i);
double ow_results_figure(const struct ow_study *s, const struct ow_point *pt,
                         int i);

/* `opwin point --json`: every figure, status (array of names), notes
 * (informational flags), margins, zone set-points and heats. */
enum ow_status ow_results_point_json(const struct ow_study *s,
                                     const struct ow_point *pt,
                                     const struct ow_verdict *v, char **out,
                                     struct ow_diag *d);

/* `--profile`: one row per solver station (axial_D, pressure_MPa,
 * bulk_temp_C, peak_temp_C, sbr, unmelt_fraction, depth_mm, barrel_C,
 * shear_max_1_s). */
enum ow_status ow_results_profile_csv(const struct ow_study *s,
                                      const struct ow_profile_row *rows, int n,
                                      char **out, struct ow_diag *d);

/* grid.csv: one row per solved point: rpm, axis_value, set_C, every figure
 * of `point --json`, status (names joined by ';', empty when safe). */
enum ow_status ow_results_grid_csv(const struct ow_study *s,
                                   const struct ow_grid *g, char **out,
                                   struct ow_diag *d);

/* window.json: rpm_min, rpm_max, set_min_C, set_max_C, centre{rpm,set_C},
 * output_kg_h_min/max, safe_fraction, zones, plus melt temperature range,
 * axis, boundaries, binding limits and solves. Null bounds when empty. */
enum ow_status ow_results_window_json(const struct ow_study *s,
                                      const struct ow_grid *g,
                                      const struct ow_window *w, char **out,
                                      struct ow_diag *d);

#endif
