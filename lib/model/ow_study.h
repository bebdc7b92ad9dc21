/* ow_study.h - one study: the screw, the resin and the line as loaded, with
 * where each input came from, the calibration and the spread blocks. A
 * plain value struct (large: allocate it). Filled by the loader
 * (ow_config.h); read by the solver and everything above it, none of which
 * needs the loader. */
#ifndef OW_STUDY_H
#define OW_STUDY_H

#include "ow_calib_factor.h"
#include "ow_line.h"
#include "ow_material.h"
#include "ow_screw.h"
#include "ow_spread_input.h"
#include "ow_units.h"

#define OW_PATH_LEN    1024
#define OW_MAX_SOURCES 160

/* Where one input value came from, as the input file said. */
struct ow_source {
	char key[96];   /* "resin.melt_density", "screw.sections[1].depth" */
	char value[64]; /* the value as written ("760 kg/m3") */
	char text[192]; /* the source ("Polymer Handbook, 4th ed., ...") */
};

struct ow_study {
	char title[256];
	char path[OW_PATH_LEN];       /* the study file */
	char screw_path[OW_PATH_LEN]; /* file the screw came from ("" when
	                                 embedded) */
	char resin_path[OW_PATH_LEN];
	struct ow_screw screw;
	struct ow_material resin;
	struct ow_line line;
	int n_sources;
	struct ow_source sources[OW_MAX_SOURCES];
	unsigned long input_crc;       /* CRC-32 over the bytes of every input
	                                  file read, in reading order */
	enum ow_unit_system own_units; /* what the study is written in (its
	                                  first zone's set-point): bare
	                                  numbers on the command line */
	struct ow_calibration calib;   /* the calibration block; its factors
	                                  are applied to screw, resin and
	                                  line above */
	struct ow_spread spread;       /* the spread block (present 0 when
	                                  absent) */
};

#endif
