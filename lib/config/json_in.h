/* json_in.h - private to config: reading one JSON input file with precise
 * messages ("<file>: <json.path>: <what was expected>"), typed getters for
 * quantities with units, integers, strings and choices, strict key sets,
 * and the sources that {"value", "source"} objects carry.
 *
 * Not a public header: only config.c, config_calib.c and config_spread.c
 * include it.
 * Everything here is re-entrant; the state of one file lives in struct
 * ow_jin. */
#ifndef OW_JSON_IN_H
#define OW_JSON_IN_H

#include <stddef.h>

#include <cjson/cJSON.h>

#include "ow_config.h"

#define OW_JPATH_LEN 160 /* JSON paths in messages */

/* Flags of the getters. */
enum {
	OW_JIN_OPTIONAL = 0,
	OW_JIN_REQUIRED = 1, /* a missing key is an error */
	OW_JIN_IN_D = 2,     /* lengths may be written in screw diameters */
};

/* One file being read. */
struct ow_jin {
	const struct ow_units *u;
	const char *file;       /* named in every message */
	const char *src_root;   /* prepended to paths in source keys */
	struct ow_study *study; /* collects sources; NULL: they are dropped */
	double diameter_m;      /* screw diameter for "D" lengths, 0 unknown */
	struct ow_diag *d;
};

/* "<file>: <path>: <printf text>", OW_EINPUT. */
enum ow_status ow_jin_fail(const struct ow_jin *j, const char *path,
                           const char *fmt, ...)
    __attribute__((format(printf, 3, 4)));

/* "parent.key" (or "key" at the root) and "parent[i]" into out. */
const char *ow_jin_key(char *out, const char *parent, const char *key);
const char *ow_jin_index(char *out, const char *parent, int i);

/* Read and parse file j->file; *crc is continued over its bytes. A file
 * that cannot be opened is reported as "<who>: <key>: cannot open ..." when
 * who is given (the referencing file and key), else under j->file. The
 * root must be an object. The caller frees *root with cJSON_Delete. */
enum ow_status ow_jin_load(const struct ow_jin *j, const char *who,
                           const char *key, unsigned long *crc, cJSON **root);

/* Reject duplicate keys and keys not in the NULL-terminated list. */
enum ow_status ow_jin_keys(const struct ow_jin *j, const cJSON *obj,
                           const char *path, const char *const *allowed);

/* The node must be an object (or, for arrays, an array of n_min..n_max). */
enum ow_status ow_jin_object(const struct ow_jin *j, const cJSON *node,
                             const char *path);
enum ow_status ow_jin_array(const struct ow_jin *j, const cJSON *node,
                            const char *path, int n_min, int n_max);

/* obj.key as a quantity of dim in SI (a string with unit, a bare number in
 * SI, or {"value", "source"}); left untouched when optional and absent. */
enum ow_status ow_jin_qty(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, enum ow_dim dim,
                          int flags, double *out);

/* The same for a node already in hand (path names the node). */
enum ow_status ow_jin_qty_node(const struct ow_jin *j, const cJSON *v,
                               const char *path, enum ow_dim dim, int flags,
                               double *out);

/* obj.key as a JSON integer in lo..hi. */
enum ow_status ow_jin_int(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, int lo, int hi,
                          int flags, int *out);

/* obj.key as a string of at most n - 1 bytes. */
enum ow_status ow_jin_str(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, int flags,
                          char *out, size_t n);

/* obj.key as one of the NULL-terminated names; *out is its index. */
enum ow_status ow_jin_choice(const struct ow_jin *j, const cJSON *obj,
                             const char *path, const char *key,
                             const char *const *names, int flags, int *out);

/* The member named key (case-sensitive), or NULL. */
const cJSON *ow_jin_get(const cJSON *obj, const char *key);

/* The study's optional `calibration` block into s->calib (defaults when
 * absent); config_calib.c. The caller applies the factors. */
enum ow_status ow_config_calibration(const struct ow_jin *j, const cJSON *o,
                                     struct ow_study *s);

/* The study's optional `spread` block into s->spread (after the
 * calibration is applied: the nominal is the calibrated study);
 * config_spread.c. */
enum ow_status ow_config_spread(const struct ow_jin *j, const cJSON *o,
                                struct ow_study *s);

#endif
