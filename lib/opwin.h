/* opwin.h - umbrella header of libopwin: include this one from programs.
 * Every public header is listed here, lowest layer first. */
#ifndef OPWIN_H
#define OPWIN_H

#define OW_VERSION "0.1.0"

#include "ow_status.h"
#include "ow_units.h"
#include "ow_material.h"
#include "ow_screw.h"
#include "ow_line.h"
#include "ow_config.h"
#include "ow_advise.h"
#include "ow_results.h"

#endif
