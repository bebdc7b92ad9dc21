/* mapdir.c - save a map folder (self-contained study, lattice, centre
 * profile) and load it back so the maps and the report can be drawn again
 * without solving. Layout of the files: ow_mapdir.h. */
#include "mapdir_impl.h"

#include <cjson/cJSON.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "ow_classify.h"
#include "ow_config.h"
#include "ow_io.h"
#include "ow_results.h"

#define FORMAT         "opwin map folder"
#define FORMAT_VERSION 1
#define MAX_STRIDE     16 /* 2^4: the sweep's deepest refinement */
#define BIT_DIGITS     ((OW_CK_COUNT + 3) / 4) /* hex digits of a status */

/* ---- exact numbers in JSON ---------------------------------------------- */

/* A JSON number that reads back as exactly v: the shortest of 15, 16 or
 * 17 significant digits that round-trips (cJSON's own printer accepts a
 * 15-digit text within an epsilon); null for NaN and infinities. */
static cJSON *exact_num(double v)
{
	char buf[40];
	int digits;

	if (!isfinite(v))
		return cJSON_CreateNull();
	for (digits = 15; digits < 17; digits++) {
		snprintf(buf, sizeof buf, "%.*g", digits, v);
		if (strtod(buf, NULL) == v)
			break;
	}
	if (digits == 17)
		snprintf(buf, sizeof buf, "%.17g", v);
	return cJSON_CreateRaw(buf);
}

/* Every number of the tree under node printed exactly. */
static int exact_tree(cJSON *node)
{
	cJSON *c = node->child, *next, *raw;

	for (; c; c = next) {
		next = c->next;
		if (!cJSON_IsNumber(c)) {
			if (!exact_tree(c))
				return 0;
			continue;
		}
		raw = exact_num(c->valuedouble);
		if (!raw ||
		    !(c->string ? cJSON_ReplaceItemInObjectCaseSensitive(
		                      node, c->string, raw)
		                : cJSON_ReplaceItemViaPointer(node, c, raw))) {
			cJSON_Delete(raw);
			return 0;
		}
	}
	return 1;
}

/* ---- study.json: the inputs with screw and resin embedded ------------ */

/* Parse the file at path (continuing *crc over its bytes, skipping a
 * UTF-8 byte order mark as the loader does). */
static enum ow_status read_json(const char *path, unsigned long *crc,
                                cJSON **out, struct ow_diag *d)
{
	char *buf = NULL;
	size_t len = 0, bom;
	char eb[128];
	int err = ow_mapdir_slurp(path, &buf, &len);

	if (err)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: cannot read it again to "
		                   "copy it into the map folder: %s",
		                   path, ow_io_strerror(err, eb, sizeof eb));
	*crc = ow_io_crc32(*crc, buf, len);
	bom = len >= 3 && !memcmp(buf, "\xEF\xBB\xBF", 3) ? 3 : 0;
	*out = cJSON_ParseWithLength(buf + bom, len - bom);
	free(buf);
	if (!*out)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: no longer a JSON text "
		                   "(changed since it was loaded)",
		                   path);
	return OW_OK;
}

/* Replace the file name under key by the parsed file (when it was one). */
static enum ow_status embed(cJSON *study, const char *key, const char *file,
                            unsigned long *crc, struct ow_diag *d)
{
	cJSON *part = NULL;
	enum ow_status st;

	if (!file[0])
		return OW_OK; /* embedded already */
	st = read_json(file, crc, &part, d);
	if (st != OW_OK)
		return st;
	if (!cJSON_ReplaceItemInObjectCaseSensitive(study, key, part)) {
		cJSON_Delete(part);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	return OW_OK;
}

/* The text of DIR/study.json, in the reading order of the loader (study,
 * screw, resin) so the CRC-32 must equal the one taken at loading. */
static enum ow_status study_text(const struct ow_study *s, char **out,
                                 struct ow_diag *d)
{
	unsigned long crc = 0;
	cJSON *doc = NULL;
	enum ow_status st = read_json(s->path, &crc, &doc, d);

	*out = NULL;
	if (st == OW_OK)
		st = embed(doc, "screw", s->screw_path, &crc, d);
	if (st == OW_OK)
		st = embed(doc, "resin", s->resin_path, &crc, d);
	if (st == OW_OK && crc != s->input_crc)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: the input files changed "
		                 "since they were loaded (CRC-32 %08lX, was "
		                 "%08lX): run again",
		                 s->path, crc, s->input_crc);
	if (st == OW_OK && (!exact_tree(doc) || !(*out = cJSON_Print(doc))))
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	cJSON_Delete(doc);
	return st;
}

/* ---- points-si.json ------------------------------------------------------ */

/* Status bits of lattice row ia as hex digits, BIT_DIGITS per point. */
static char *status_row(const struct ow_grid *g, int ia)
{
	char *row = malloc((size_t)g->n_rpm * BIT_DIGITS + 1);
	int ir;

	if (!row)
		return NULL;
	for (ir = 0; ir < g->n_rpm; ir++)
		snprintf(row + ir * BIT_DIGITS, BIT_DIGITS + 1, "%0*X",
		         BIT_DIGITS, ow_grid_at(g, ir, ia)->v.bits);
	return row;
}

static int add_status(cJSON *o, const struct ow_grid *g)
{
	cJSON *rows = cJSON_AddArrayToObject(o, "status");
	int ia, ok = rows != NULL;

	for (ia = 0; ok && ia < g->n_axis; ia++) {
		char *row = status_row(g, ia);
		cJSON *item = row ? cJSON_CreateString(row) : NULL;

		ok = item && cJSON_AddItemToArray(rows, item);
		free(row);
	}
	return ok;
}

static int add_exact(cJSON *array, double v)
{
	cJSON *item = exact_num(v);

	if (item && cJSON_AddItemToArray(array, item))
		return 1;
	cJSON_Delete(item);
	return 0;
}

/* The rpm of every lattice column and the axis value of every row. */
static int add_axes(cJSON *o, const struct ow_grid *g)
{
	cJSON *rpm = cJSON_AddArrayToObject(o, "rpm");
	cJSON *axis = cJSON_AddArrayToObject(o, "axis");
	int i, ok = rpm && axis;

	for (i = 0; ok && i < g->n_rpm; i++)
		ok = add_exact(rpm, ow_grid_at(g, i, 0)->rpm);
	for (i = 0; ok && i < g->n_axis; i++)
		ok = add_exact(axis, ow_grid_at(g, 0, i)->axis);
	return ok;
}

static int add_num(cJSON *o, const char *key, double v)
{
	cJSON *item = exact_num(v);

	if (item && cJSON_AddItemToObject(o, key, item))
		return 1;
	cJSON_Delete(item);
	return 0;
}

static int add_zone_array(cJSON *o, const char *key, const double *v, int n)
{
	cJSON *a = cJSON_AddArrayToObject(o, key);
	int k, ok = a != NULL;

	for (k = 0; ok && k < n; k++)
		ok = add_exact(a, v[k]);
	return ok;
}

/* "centre": the centre point's figures in SI (null when none). */
static int add_centre(cJSON *o, const struct ow_point *c, int n_zones)
{
	struct ow_point pt;
	cJSON *j;
	int k, ok;

	if (!c)
		return cJSON_AddNullToObject(o, "centre") != NULL;
	pt = *c;
	j = cJSON_AddObjectToObject(o, "centre");
	ok = j && cJSON_AddNumberToObject(j, "flags", pt.flags) &&
	     cJSON_AddNumberToObject(j, "n_iter", pt.n_iter);
	for (k = 0; ok && k < ow_mapdir_n_fields(); k++)
		ok = add_num(j, ow_mapdir_field_name(k),
		             *ow_mapdir_field(&pt, k));
	return ok && add_zone_array(j, "set_K", pt.set_K, n_zones) &&
	       add_zone_array(j, "zone_heat_W", pt.zone_heat_W, n_zones);
}

static int add_inputs(cJSON *o, const struct ow_study *s, int has_profile)
{
	cJSON *in = cJSON_AddObjectToObject(o, "inputs");
	const char *keys[OW_CK_COUNT];
	char crc[16];
	int k;

	snprintf(crc, sizeof crc, "%08lX", s->input_crc);
	for (k = 0; k < OW_CK_COUNT; k++)
		keys[k] = ow_check_key((enum ow_check)k);
	return in && cJSON_AddStringToObject(in, "study", s->path) &&
	       cJSON_AddStringToObject(in, "screw", s->screw_path) &&
	       cJSON_AddStringToObject(in, "resin", s->resin_path) &&
	       cJSON_AddStringToObject(in, "crc32", crc) &&
	       cJSON_AddItemToObject(
	           o, "checks", cJSON_CreateStringArray(keys, OW_CK_COUNT)) &&
	       cJSON_AddBoolToObject(o, "profile", has_profile);
}

static enum ow_status lattice_text(const struct ow_study *s,
                                   const struct ow_grid *g,
                                   const struct ow_point *centre,
                                   int has_profile, char **out,
                                   struct ow_diag *d)
{
	cJSON *o = cJSON_CreateObject();
	int ok = o && cJSON_AddStringToObject(o, "format", FORMAT) &&
	         cJSON_AddNumberToObject(o, "version", FORMAT_VERSION) &&
	         add_inputs(o, s, has_profile) &&
	         add_centre(o, centre, s->line.n_zones) &&
	         cJSON_AddNumberToObject(o, "n_rpm", g->n_rpm) &&
	         cJSON_AddNumberToObject(o, "n_axis", g->n_axis) &&
	         cJSON_AddNumberToObject(o, "stride", g->stride) &&
	         cJSON_AddNumberToObject(o, "solves", g->solves) &&
	         add_axes(o, g) && add_status(o, g);

	*out = ok ? cJSON_Print(o) : NULL;
	cJSON_Delete(o);
	return *out ? OW_OK : ow_diag_set(d, OW_ENOMEM, "out of memory");
}

/* ---- save ------------------------------------------------------------- */

static enum ow_status put(const char *dir, const char *name, char *text,
                          struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32];
	enum ow_status st = OW_OK;

	if (!text)
		return OW_OK;
	st = ow_mapdir_path(path, sizeof path, dir, name, d);
	if (st == OW_OK)
		st = ow_io_write_file(path, text, strlen(text), d);
	return st;
}

enum ow_status ow_mapdir_save(const struct ow_study *s, const struct ow_grid *g,
                              const struct ow_point *centre,
                              const struct ow_profile_row *rows, int n_rows,
                              const char *dir, struct ow_diag *d)
{
	char *study = NULL, *lat = NULL, *pts = NULL, *prof = NULL;
	int has_profile = rows && n_rows > 0;
	enum ow_status st;

	if (!s || !g || !dir)
		return ow_diag_set(d, OW_EARG, "ow_mapdir_save: NULL argument");
	st = study_text(s, &study, d);
	if (st == OW_OK)
		st = lattice_text(s, g, centre, has_profile, &lat, d);
	if (st == OW_OK)
		st = ow_mapdir_points_csv(g, s->line.n_zones, &pts, d);
	if (st == OW_OK && has_profile)
		st = ow_results_profile_csv(s, rows, n_rows, &prof, d);
	/* points-si.json last: it marks a complete folder */
	if (st == OW_OK)
		st = put(dir, "study.json", study, d);
	if (st == OW_OK)
		st = put(dir, MD_POINTS_CSV, pts, d);
	if (st == OW_OK && has_profile)
		st = put(dir, "profile.csv", prof, d);
	if (st == OW_OK)
		st = put(dir, MD_POINTS_JSON, lat, d);
	free(study);
	free(lat);
	free(pts);
	free(prof);
	return st;
}

/* ---- load ------------------------------------------------------------- */

struct lattice_doc {
	const char *file; /* for messages */
	const cJSON *o;
	struct ow_diag *d;
};

static enum ow_status key_bad(const struct lattice_doc *L, const char *key,
                              const char *what)
{
	return ow_diag_set(L->d, OW_EINPUT, "%s: %s: %s", L->file, key, what);
}

static enum ow_status get_int(const struct lattice_doc *L, const char *key,
                              int lo, int hi, int *out)
{
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(L->o, key);

	if (!cJSON_IsNumber(v) || v->valuedouble != floor(v->valuedouble) ||
	    v->valuedouble < lo || v->valuedouble > hi)
		return key_bad(L, key, "missing or out of range");
	*out = (int)v->valuedouble;
	return OW_OK;
}

/* Format, version and the status bit order this build uses. */
static enum ow_status check_format(const struct lattice_doc *L)
{
	const cJSON *f = cJSON_GetObjectItemCaseSensitive(L->o, "format");
	const cJSON *c = cJSON_GetObjectItemCaseSensitive(L->o, "checks");
	int v = 0, k;

	if (!cJSON_IsString(f) || strcmp(f->valuestring, FORMAT))
		return key_bad(L, "format", "not \"" FORMAT "\"");
	if (get_int(L, "version", FORMAT_VERSION, FORMAT_VERSION, &v))
		return OW_EINPUT;
	if (cJSON_GetArraySize(c) != OW_CK_COUNT)
		goto checks;
	for (k = 0; k < OW_CK_COUNT; k++) {
		const cJSON *e = cJSON_GetArrayItem(c, k);

		if (!cJSON_IsString(e) ||
		    strcmp(e->valuestring, ow_check_key((enum ow_check)k)))
			goto checks;
	}
	return OW_OK;
checks:
	return key_bad(L, "checks",
	               "the status bits were saved in another "
	               "order (another version of opwin): run the map again");
}

static enum ow_status make_lattice(const struct lattice_doc *L,
                                   struct ow_grid **out)
{
	struct ow_grid *g = calloc(1, sizeof *g);
	enum ow_status st;

	*out = g;
	if (!g)
		return ow_diag_set(L->d, OW_ENOMEM, "out of memory");
	st = get_int(L, "stride", 1, MAX_STRIDE, &g->stride);
	if (st == OW_OK)
		st = get_int(L, "n_rpm", 2, 999 * MAX_STRIDE + 1, &g->n_rpm);
	if (st == OW_OK)
		st = get_int(L, "n_axis", 2, 999 * MAX_STRIDE + 1, &g->n_axis);
	if (st == OW_OK)
		st = get_int(L, "solves", 0, g->n_rpm * g->n_axis, &g->solves);
	if (st == OW_OK &&
	    ((g->n_rpm - 1) % g->stride || (g->n_axis - 1) % g->stride))
		st = key_bad(L, "stride", "does not divide the lattice");
	if (st != OW_OK)
		return st;
	g->pts = calloc((size_t)g->n_rpm * (size_t)g->n_axis, sizeof *g->pts);
	return g->pts ? OW_OK : ow_diag_set(L->d, OW_ENOMEM, "out of memory");
}

/* rpm of every column, axis value of every row; set-points from the
 * study as the sweep computes them. */
static enum ow_status lattice_axes(const struct lattice_doc *L,
                                   const struct ow_study *s, struct ow_grid *g)
{
	const cJSON *r = cJSON_GetObjectItemCaseSensitive(L->o, "rpm");
	const cJSON *a = cJSON_GetObjectItemCaseSensitive(L->o, "axis");
	int ir, ia;

	if (cJSON_GetArraySize(r) != g->n_rpm)
		return key_bad(L, "rpm", "expected n_rpm numbers");
	if (cJSON_GetArraySize(a) != g->n_axis)
		return key_bad(L, "axis", "expected n_axis numbers");
	for (ia = 0; ia < g->n_axis; ia++) {
		const cJSON *va = cJSON_GetArrayItem(a, ia);
		double set_K;

		if (!cJSON_IsNumber(va))
			return key_bad(L, "axis", "expected numbers");
		set_K = ow_line_axis_ref_K(&s->line, va->valuedouble);
		for (ir = 0; ir < g->n_rpm; ir++) {
			const cJSON *vr = cJSON_GetArrayItem(r, ir);
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);

			if (!cJSON_IsNumber(vr))
				return key_bad(L, "rpm", "expected numbers");
			p->rpm = vr->valuedouble;
			p->axis = va->valuedouble;
			p->set_ref_K = set_K;
		}
	}
	return OW_OK;
}

static int hex_bits(const char *s, unsigned *bits)
{
	char h[BIT_DIGITS + 1], *end = NULL;
	unsigned long v;

	memcpy(h, s, BIT_DIGITS);
	h[BIT_DIGITS] = '\0';
	v = strtoul(h, &end, 16);
	*bits = (unsigned)v;
	return *end == '\0' && v < (1UL << OW_CK_COUNT);
}

/* Status bits of every lattice point. */
static enum ow_status lattice_status(const struct lattice_doc *L,
                                     struct ow_grid *g)
{
	const cJSON *rows = cJSON_GetObjectItemCaseSensitive(L->o, "status");
	size_t len = (size_t)g->n_rpm * BIT_DIGITS;
	int ia, ir;

	if (cJSON_GetArraySize(rows) != g->n_axis)
		return key_bad(L, "status", "expected n_axis rows");
	for (ia = 0; ia < g->n_axis; ia++) {
		const cJSON *row = cJSON_GetArrayItem(rows, ia);

		if (!cJSON_IsString(row) || strlen(row->valuestring) != len)
			return key_bad(L, "status",
			               "a row of the wrong length");
		for (ir = 0; ir < g->n_rpm; ir++)
			if (!hex_bits(row->valuestring + ir * BIT_DIGITS,
			              &ow_grid_at(g, ir, ia)->v.bits))
				return key_bad(L, "status", "not hex digits");
	}
	return OW_OK;
}

/* The sweep gives a point it did not solve the verdict of the smallest
 * enclosing solved cell's corner; the saved status bits stay authoritative
 * (the margins come along as the sweep copied them). */
static void fill_unsolved(struct ow_grid *g)
{
	int ir, ia, s;

	for (ia = 0; ia < g->n_axis; ia++)
		for (ir = 0; ir < g->n_rpm; ir++) {
			struct ow_grid_point *p = ow_grid_at(g, ir, ia);
			unsigned bits = p->v.bits;

			for (s = 2; p->solved != 1 && s <= g->stride; s *= 2) {
				const struct ow_grid_point *c =
				    ow_grid_at(g, ir - ir % s, ia - ia % s);

				if (c->solved == 1) {
					p->v = c->v;
					p->v.bits = bits;
					break;
				}
			}
		}
}

/* The original input names and CRC-32, so the report traces to them. */
static enum ow_status restore_inputs(const struct lattice_doc *L,
                                     struct ow_study *s)
{
	const cJSON *in = cJSON_GetObjectItemCaseSensitive(L->o, "inputs");
	const char *keys[3] = {"study", "screw", "resin"};
	char *dst[3] = {s->path, s->screw_path, s->resin_path};
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(in, "crc32");
	char *end = NULL;
	int k;

	if (!cJSON_IsString(v) || strlen(v->valuestring) != 8)
		return key_bad(L, "inputs.crc32", "expected 8 hex digits");
	s->input_crc = strtoul(v->valuestring, &end, 16);
	if (*end)
		return key_bad(L, "inputs.crc32", "expected 8 hex digits");
	for (k = 0; k < 3; k++) {
		v = cJSON_GetObjectItemCaseSensitive(in, keys[k]);
		if (!cJSON_IsString(v) || strlen(v->valuestring) >= OW_PATH_LEN)
			return key_bad(L, "inputs", "expected file names");
		memcpy(dst[k], v->valuestring, strlen(v->valuestring) + 1);
	}
	return OW_OK;
}

/* Read DIR/name whole; a missing file is reported with `missing`. */
static enum ow_status read_in(const char *dir, const char *name, char *path,
                              char **text, const char *missing,
                              struct ow_diag *d)
{
	char eb[128];
	size_t len = 0;
	enum ow_status st =
	    ow_mapdir_path(path, OW_PATH_LEN + 32, dir, name, d);
	int err;

	*text = NULL;
	if (st != OW_OK)
		return st;
	err = ow_mapdir_slurp(path, text, &len);
	if (err == ENOENT && missing)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s is not a map folder: %s "
		                   "(`opwin map STUDY.json -o DIR` makes one)",
		                   dir, missing);
	if (err)
		return ow_diag_set(d, err == ENOMEM ? OW_ENOMEM : OW_EINPUT,
		                   "%s: cannot read: %s", path,
		                   ow_io_strerror(err, eb, sizeof eb));
	if (strlen(*text) != len) {
		free(*text);
		*text = NULL;
		return ow_diag_set(d, OW_EINPUT, "%s: contains a NUL byte",
		                   path);
	}
	return OW_OK;
}

static enum ow_status check_dir(const char *dir, struct ow_diag *d)
{
	struct stat sb;

	if (stat(dir, &sb) != 0)
		return ow_diag_set(d, OW_EINPUT, "%s: no such folder: %s", dir,
		                   strerror(errno));
	if (!S_ISDIR(sb.st_mode))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: not a folder (expected "
		                   "the output folder of opwin map)",
		                   dir);
	return OW_OK;
}

/* File `name`, or `old` in a folder written before that name. */
static enum ow_status read_either(const char *dir, const char *name,
                                  const char *old, char *path, char **text,
                                  struct ow_diag *d)
{
	char missing[96];
	struct stat sb;
	enum ow_status st =
	    ow_mapdir_path(path, OW_PATH_LEN + 32, dir, name, d);

	if (st == OW_OK && stat(path, &sb) != 0 &&
	    ow_mapdir_path(path, OW_PATH_LEN + 32, dir, old, d) == OW_OK &&
	    stat(path, &sb) == 0)
		name = old;
	snprintf(missing, sizeof missing, "%s is missing", name);
	return st == OW_OK ? read_in(dir, name, path, text, missing, d) : st;
}

/* The lattice of points-si.json and points-si.csv, points as the sweep left
 * them. */
static enum ow_status load_lattice(const struct lattice_doc *L, const char *dir,
                                   const struct ow_study *s,
                                   struct ow_grid **out, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], *text = NULL;
	int n_solved = 0;
	enum ow_status st = make_lattice(L, out);

	if (st == OW_OK)
		st = lattice_axes(L, s, *out);
	if (st == OW_OK)
		st = lattice_status(L, *out);
	if (st == OW_OK)
		st = read_either(dir, MD_POINTS_CSV, MD_OLD_POINTS_CSV, path,
		                 &text, d);
	if (st == OW_OK)
		st = ow_mapdir_points_read(text, path, s->line.n_zones, *out,
		                           &n_solved, d);
	if (st == OW_OK && n_solved != (*out)->solves)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: %d points, points-si.json "
		                 "says %d were solved",
		                 path, n_solved, (*out)->solves);
	free(text);
	if (st == OW_OK)
		fill_unsolved(*out);
	return st;
}

/* A number of the centre object, null meaning NAN. */
static int centre_num(const cJSON *v, double *x)
{
	if (cJSON_IsNull(v)) {
		*x = NAN;
		return 1;
	}
	if (!cJSON_IsNumber(v))
		return 0;
	*x = v->valuedouble;
	return 1;
}

static int centre_zones(const cJSON *j, const char *key, double *v, int n)
{
	const cJSON *a = cJSON_GetObjectItemCaseSensitive(j, key);
	int k;

	if (cJSON_GetArraySize(a) != n)
		return 0;
	for (k = 0; k < n; k++)
		if (!centre_num(cJSON_GetArrayItem(a, k), &v[k]))
			return 0;
	return 1;
}

/* The centre point's figures from "centre" (null: none). */
static enum ow_status read_centre(const struct lattice_doc *L, int n_zones,
                                  struct ow_mapdir_centre *c)
{
	const cJSON *j = cJSON_GetObjectItemCaseSensitive(L->o, "centre");
	const cJSON *f = cJSON_GetObjectItemCaseSensitive(j, "flags");
	const cJSON *it = cJSON_GetObjectItemCaseSensitive(j, "n_iter");
	int k;

	if (cJSON_IsNull(j))
		return OW_OK;
	if (!cJSON_IsObject(j) || !cJSON_IsNumber(f) || !cJSON_IsNumber(it))
		return key_bad(L, "centre", "expected the centre point");
	c->pt.flags = (unsigned)f->valuedouble;
	c->pt.n_iter = (int)it->valuedouble;
	for (k = 0; k < ow_mapdir_n_fields(); k++)
		if (!centre_num(cJSON_GetObjectItemCaseSensitive(
		                    j, ow_mapdir_field_name(k)),
		                ow_mapdir_field(&c->pt, k)))
			return key_bad(L, "centre", "a figure is missing");
	if (!centre_zones(j, "set_K", c->pt.set_K, n_zones) ||
	    !centre_zones(j, "zone_heat_W", c->pt.zone_heat_W, n_zones))
		return key_bad(L, "centre", "expected one value per zone");
	c->valid = 1;
	return OW_OK;
}

static enum ow_status load_centre(const struct lattice_doc *L, const char *dir,
                                  const struct ow_study *s,
                                  struct ow_mapdir_centre *c, struct ow_diag *d)
{
	const cJSON *p = cJSON_GetObjectItemCaseSensitive(L->o, "profile");
	char path[OW_PATH_LEN + 32], *text = NULL;
	enum ow_status st;

	if (!c)
		return OW_OK;
	if (!cJSON_IsBool(p))
		return key_bad(L, "profile", "expected true or false");
	st = read_centre(L, s->line.n_zones, c);
	if (st != OW_OK || cJSON_IsFalse(p))
		return st;
	st = read_in(dir, "profile.csv", path, &text, "profile.csv is missing",
	             d);
	if (st == OW_OK)
		st = ow_mapdir_profile_read(text, path, s->screw.diameter_m,
		                            &c->rows, &c->n_rows, d);
	free(text);
	return st;
}

void ow_mapdir_centre_free(struct ow_mapdir_centre *c)
{
	if (!c)
		return;
	free(c->rows);
	memset(c, 0, sizeof *c);
}

enum ow_status ow_mapdir_load(const struct ow_units *u, const char *dir,
                              struct ow_study *study, struct ow_grid **grid,
                              struct ow_mapdir_centre *centre,
                              struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], *text = NULL;
	struct lattice_doc L = {path, NULL, d};
	cJSON *doc = NULL;
	enum ow_status st;

	if (!u || !dir || !study || !grid)
		return ow_diag_set(d, OW_EARG, "ow_mapdir_load: NULL argument");
	*grid = NULL;
	if (centre)
		memset(centre, 0, sizeof *centre);
	st = check_dir(dir, d);
	if (st == OW_OK)
		st = read_either(dir, MD_POINTS_JSON, MD_OLD_POINTS_JSON, path,
		                 &text, d);
	if (st == OW_OK && !(doc = cJSON_Parse(text)))
		st = ow_diag_set(d, OW_EINPUT, "%s: not a JSON text", path);
	L.o = doc;
	if (st == OW_OK)
		st = check_format(&L);
	if (st == OW_OK) {
		char sp[OW_PATH_LEN + 32];

		st = ow_mapdir_path(sp, sizeof sp, dir, "study.json", d);
		if (st == OW_OK)
			st = ow_config_load_study(u, sp, study, d);
	}
	if (st == OW_OK)
		st = load_lattice(&L, dir, study, grid, d);
	if (st == OW_OK)
		st = load_centre(&L, dir, study, centre, d);
	if (st == OW_OK)
		st = restore_inputs(&L, study);
	if (st != OW_OK) {
		ow_grid_destroy(*grid);
		*grid = NULL;
		ow_mapdir_centre_free(centre);
	}
	cJSON_Delete(doc);
	free(text);
	return st;
}
