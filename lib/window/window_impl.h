/* window_impl.h - internals of the window module (not public). */
#ifndef OW_WINDOW_IMPL_H
#define OW_WINDOW_IMPL_H

#include "ow_window.h"

/* Fill w->bounds with each check's pass/fail boundary (marching squares
 * on the margins, chained into polylines). */
enum ow_status ow_window_boundaries(const struct ow_study *s,
                                    const struct ow_grid *g,
                                    struct ow_window *w, struct ow_diag *d);

/* Locate the recommended rectangle on the interpolated margins of g:
 * sets w->empty, w->bound[], w->at_sweep_edge and the steps. */
enum ow_status ow_window_locate(const struct ow_study *s,
                                const struct ow_grid *g, struct ow_window *w,
                                struct ow_diag *d);

#endif
