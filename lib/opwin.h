/* opwin.h - umbrella header of libopwin: include this one from programs.
 * Every public header is listed here, lowest layer first. */
#ifndef OPWIN_H
#define OPWIN_H

#include "ow_version.h"
#include "ow_const.h"
#include "ow_status.h"
#include "ow_io.h"
#include "ow_units.h"
#include "ow_material.h"
#include "ow_screw.h"
#include "ow_line.h"
#include "ow_calib.h"
#include "ow_calib_factor.h"
#include "ow_calib_plot.h"
#include "ow_study.h"
#include "ow_config.h"
#include "ow_advise.h"
#include "ow_results.h"
#include "ow_solver.h"
#include "ow_classify.h"
#include "ow_sweep.h"
#include "ow_window.h"
#include "ow_map.h"
#include "ow_fit.h"
#include "ow_canvas.h"
#include "ow_plot.h"
#include "ow_maps.h"
#include "ow_report.h"
#include "ow_mapdir.h"
#include "ow_compare.h"

#endif
