/* ow_config.h - study, screw and resin files (JSON, cJSON) -> the plain
 * structs of ow_screw.h, ow_material.h and ow_line.h.
 *
 * Every dimensional value is a string with its unit ("63.5 mm"), a bare
 * number meaning SI, or {"value": ..., "source": "..."} whose source is kept
 * for the report. Unknown keys are errors. Paths are relative to the file
 * that names them. Every rejection of input, a missing or unreadable file
 * included, is OW_EINPUT with "<file>: <json.path>: <what was expected>" in
 * the diag (malformed JSON: "<file>: line L, column C: ..."). On failure
 * the output struct holds what was read so far and must not be used. */
#ifndef OW_CONFIG_H
#define OW_CONFIG_H

#include "ow_calib.h"
#include "ow_line.h"
#include "ow_material.h"
#include "ow_screw.h"
#include "ow_status.h"
#include "ow_units.h"

#define OW_PATH_LEN 1024
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
	unsigned long input_crc; /* CRC-32 over the bytes of every input
				    file read, in reading order */
	enum ow_unit_system own_units; /* what the study is written in (its
					  first zone's set-point): bare
					  numbers on the command line */
	struct ow_calibration calib; /* the calibration block; its factors
					are applied to screw, resin and
					line above */
};

/* Load a study file and the files it names into *out (fully validated:
 * screw prepared, resin and line checked against each other). */
enum ow_status ow_config_load_study(const struct ow_units *u, const char *path,
				    struct ow_study *out, struct ow_diag *d);

/* Load a screw file or a resin file on its own (used by tools and tests). */
enum ow_status ow_config_load_screw(const struct ow_units *u, const char *path,
				    struct ow_screw *out, struct ow_diag *d);
enum ow_status ow_config_load_resin(const struct ow_units *u, const char *path,
				    struct ow_material *out,
				    struct ow_diag *d);

/* The keys a resin file may hold, NULL-terminated (static storage). */
const char *const *ow_config_resin_keys(void);

#endif
