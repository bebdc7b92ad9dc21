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

#include "ow_material.h"
#include "ow_screw.h"
#include "ow_status.h"
#include "ow_study.h"
#include "ow_units.h"

/* Load a study file and the files it names into *out (fully validated:
 * screw prepared, resin and line checked against each other). */
enum ow_status ow_config_load_study(const struct ow_units *u, const char *path,
                                    struct ow_study *out, struct ow_diag *d);

/* Load a screw file or a resin file on its own (used by tools and tests). */
enum ow_status ow_config_load_screw(const struct ow_units *u, const char *path,
                                    struct ow_screw *out, struct ow_diag *d);
enum ow_status ow_config_load_resin(const struct ow_units *u, const char *path,
                                    struct ow_material *out, struct ow_diag *d);

/* Replace s->spread by the spread block in JSON text (--spread); name
 * stands for the file in messages. OW_EINPUT as for a study file. */
enum ow_status ow_config_spread_text(const struct ow_units *u, const char *text,
                                     const char *name, struct ow_study *s,
                                     struct ow_diag *d);

/* The keys a resin file may hold, NULL-terminated (static storage). */
const char *const *ow_config_resin_keys(void);

#endif
