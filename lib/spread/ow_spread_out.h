/* ow_spread_out.h - writing a spread run: grid.csv with safe_share and
 * worst_margin_<limit> columns, window.json with robust_window and the
 * spread record. Both take the nominal text as ow_results wrote it and
 * return a new text the caller frees. */
#ifndef OW_SPREAD_OUT_H
#define OW_SPREAD_OUT_H

#include "ow_config.h"
#include "ow_spread.h"
#include "ow_sweep.h"
#include "ow_window.h"

/* csv: grid.csv of grid g (ow_results_grid_csv); each row gets the share
 * of safe samples at its point and the lowest margin over the samples per
 * set limit (empty where the point was decided without sampling). */
enum ow_status ow_spread_grid_csv(const struct ow_study *s,
                                  const struct ow_grid *g,
                                  const struct ow_spread_result *r,
                                  const char *csv, char **out,
                                  struct ow_diag *d);

/* json: window.json of the nominal window; adds `robust_window` (the
 * window w of the robust grid with the keys of the nominal one, and its
 * level) and `spread` (samples, seed, level, design, solves,
 * solves_saved, inputs, sensitivity). */
enum ow_status ow_spread_window_json(const struct ow_study *s,
                                     const struct ow_grid *robust,
                                     const struct ow_window *w,
                                     const struct ow_spread_result *r,
                                     const char *json, char **out,
                                     struct ow_diag *d);

/* spread.json of a map folder: the spread's inputs and the result per
 * lattice point, so `opwin report DIR` can draw the robust window and the
 * share map again. The caller frees *out. */
enum ow_status ow_spread_save_json(const struct ow_study *s,
                                   const struct ow_spread_result *r, char **out,
                                   struct ow_diag *d);

/* Read spread.json text (name for messages) back for grid g: the inputs
 * into *sp, the result into *out (ow_spread_result_destroy). OW_EINPUT
 * when it is not the record of a lattice of g's size. */
enum ow_status ow_spread_load_json(const char *text, const char *name,
                                   const struct ow_grid *g,
                                   struct ow_spread *sp,
                                   struct ow_spread_result **out,
                                   struct ow_diag *d);

#endif
