/* ow_calib_plot.h - the calibration's residual plot: modelled against
 * measured per quantity, drawn on any canvas (an image file, a page of the
 * report). The residuals come from the fit (ow_calib.h) or from a study's
 * calibration block (ow_calib_factor.h). */
#ifndef OW_CALIB_PLOT_H
#define OW_CALIB_PLOT_H

#include "ow_calib_factor.h"
#include "ow_status.h"
#include "ow_units.h"

struct ow_canvas; /* ow_canvas.h */

/* Modelled against measured per quantity (one panel each, up to three to
 * a row; the 1:1 line; each reading's +-2 sd bar, labelled by its line)
 * into path, PNG or SVG by its extension, in unit system sys, under
 * title. OW_EIO when it cannot be written. */
enum ow_status ow_calib_plot(const struct ow_calib_resid *e, int n,
                             enum ow_unit_system sys, const char *title,
                             const char *path, struct ow_diag *d);

/* The same drawing on canvas cv in the w_pt x h_pt area whose top-left
 * corner is (x_pt, y_pt) (title NULL: none), and the number of panel rows
 * it takes (1 or 2), for a page that places it. */
void ow_calib_draw(struct ow_canvas *cv, double x_pt, double y_pt, double w_pt,
                   double h_pt, const struct ow_calib_resid *e, int n,
                   enum ow_unit_system sys, const char *title);
int ow_calib_plot_rows(const struct ow_calib_resid *e, int n);

#endif
