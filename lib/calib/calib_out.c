/* calib_out.c - the calibrated study: the study file as written, with its
 * `calibration` block holding the fitted factors (value, standard error,
 * the readings file as source), the free factors, the uncertainties used
 * and the record of the fit; paths to the screw and resin files rewritten
 * for the folder the new study is written into. */
#include "ow_calib.h"

#include <cjson/cJSON.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_study.h"
#include "ow_io.h"

#define MAX_STUDY_BYTES ((size_t)4 << 20) /* as the loader's guard */

/* The folder of path ("." when it has none) into out. */
static void folder_of(const char *path, char *out, size_t n)
{
	const char *slash = strrchr(path, '/');

	if (!slash)
		snprintf(out, n, ".");
	else if (slash == path)
		snprintf(out, n, "/");
	else
		snprintf(out, n, "%.*s", (int)(slash - path), path);
}

/* file as a path relative to folder dir (both resolved): "../a/b.json". */
static enum ow_status relative(const char *dir, const char *file, char *out,
                               size_t n, struct ow_diag *d)
{
	char rd[PATH_MAX], rf[PATH_MAX];
	size_t common = 0, i, used = 0;

	if (!realpath(dir, rd))
		return ow_diag_set(d, OW_EIO, "%s: %s", dir, strerror(errno));
	if (!realpath(file, rf))
		return ow_diag_set(d, OW_EINPUT, "%s: %s", file,
		                   strerror(errno));
	for (i = 0; rd[i] && rd[i] == rf[i]; i++)
		if (rd[i] == '/')
			common = i;
	if (!rd[i] && rf[i] == '/')
		common = i; /* dir is a prefix folder of file */
	else if (!strcmp(rd, "/"))
		common = 0;
	out[0] = '\0';
	for (i = common; rd[i]; i++)
		if (rd[i] == '/' && rd[i + 1])
			used += (size_t)snprintf(out + used, n - used, "../");
	if (used + strlen(rf + common + 1) + 1 > n)
		return ow_diag_set(d, OW_EINPUT, "%s: the path is too long",
		                   file);
	snprintf(out + used, n - used, "%s", rf + common + 1);
	return OW_OK;
}

static enum ow_status repoint(cJSON *doc, const char *key, const char *file,
                              const char *out_dir, struct ow_diag *d)
{
	char rel[PATH_MAX];
	enum ow_status st;

	if (!file[0])
		return OW_OK; /* embedded */
	st = relative(out_dir, file, rel, sizeof rel, d);
	if (st == OW_OK && !cJSON_ReplaceItemInObjectCaseSensitive(
	                       doc, key, cJSON_CreateString(rel)))
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	return st;
}

/* "2 %", "0.5 MPa", "3 K", "150 W", "2 N m": an uncertainty as a text. */
static cJSON *sd_text(const struct ow_calib_options *o, enum ow_calib_qty q)
{
	static const char *const si[OW_CQ_COUNT] = {"kg/s", "Pa", "K", "W",
	                                            "N m"};
	char buf[64];

	if (!isnan(o->sd_rel[q]))
		snprintf(buf, sizeof buf, "%.6g %%", 100.0 * o->sd_rel[q]);
	else if (q == OW_CQ_PRESSURE)
		snprintf(buf, sizeof buf, "%.6g MPa", o->sd_abs[q] * 1e-6);
	else
		snprintf(buf, sizeof buf, "%.6g %s", o->sd_abs[q], si[q]);
	return cJSON_CreateString(buf);
}

static cJSON *factor_json(double value, double se, const char *source)
{
	cJSON *f = cJSON_CreateObject();

	cJSON_AddNumberToObject(f, "value", value);
	if (isfinite(se))
		cJSON_AddNumberToObject(f, "std_error", se);
	if (source && source[0])
		cJSON_AddStringToObject(f, "source", source);
	return f;
}

static cJSON *resid_json(const struct ow_calib_resid *e)
{
	cJSON *o = cJSON_CreateObject();

	cJSON_AddNumberToObject(o, "line", e->line);
	cJSON_AddNumberToObject(o, "rpm", e->rpm);
	cJSON_AddStringToObject(o, "quantity", ow_calib_qty_name(e->qty));
	cJSON_AddNumberToObject(o, "measured", e->measured);
	cJSON_AddNumberToObject(o, "modelled", e->modelled);
	cJSON_AddNumberToObject(o, "sd", e->sd);
	return o;
}

/* The record of the fit (SI numbers). */
static cJSON *fit_json(const struct ow_calib_result *r, const char *readings)
{
	cJSON *f = cJSON_CreateObject(), *a = cJSON_CreateArray(),
	      *m = cJSON_CreateArray(), *res = cJSON_CreateArray(), *row;
	int k, l;

	cJSON_AddStringToObject(f, "readings", readings);
	cJSON_AddNumberToObject(f, "chi2", r->chi2);
	cJSON_AddNumberToObject(f, "dof", r->dof);
	for (k = 0; k < r->n_free; k++) {
		cJSON_AddItemToArray(
		    a, cJSON_CreateString(ow_calib_factor(r->ids[k])->name));
		row = cJSON_CreateArray();
		for (l = 0; l < r->n_free; l++)
			cJSON_AddItemToArray(row,
			                     cJSON_CreateNumber(r->corr[k][l]));
		cJSON_AddItemToArray(m, row);
	}
	cJSON_AddItemToObject(f, "factors", a);
	cJSON_AddItemToObject(f, "correlation", m);
	for (k = 0; k < r->n_resid; k++)
		cJSON_AddItemToArray(res, resid_json(&r->resid[k]));
	cJSON_AddItemToObject(f, "residuals", res);
	return f;
}

static cJSON *block(const struct ow_study *s, const cJSON *old,
                    const struct ow_calib_options *o,
                    const struct ow_calib_result *r, const char *readings)
{
	const struct ow_calibration *c = &s->calib;
	cJSON *b = cJSON_CreateObject(), *fr = cJSON_CreateArray(),
	      *u = cJSON_CreateObject();
	const cJSON *notes =
	    old ? cJSON_GetObjectItemCaseSensitive(old, "notes") : NULL;
	int k;

	if (cJSON_IsString(notes))
		cJSON_AddStringToObject(b, "notes", notes->valuestring);
	for (k = 0; k < OW_CF_COUNT; k++) {
		int fitted = (o->free_mask >> k) & 1u;

		if (fitted)
			cJSON_AddItemToObject(b, ow_calib_factor(k)->name,
			                      factor_json(r->value[k],
			                                  r->std_error[k],
			                                  readings));
		else if (c->value[k] != 1.0) /* kept as the study had it */
			cJSON_AddItemToObject(b, ow_calib_factor(k)->name,
			                      factor_json(c->value[k],
			                                  c->std_error[k],
			                                  c->source[k]));
		if (fitted)
			cJSON_AddItemToArray(
			    fr, cJSON_CreateString(ow_calib_factor(k)->name));
	}
	cJSON_AddItemToObject(b, "free", fr);
	for (k = 0; k < OW_CQ_COUNT; k++)
		cJSON_AddItemToObject(u,
		                      ow_calib_qty_name((enum ow_calib_qty)k),
		                      sd_text(o, (enum ow_calib_qty)k));
	cJSON_AddItemToObject(b, "uncertainty", u);
	cJSON_AddItemToObject(b, "fit", fit_json(r, readings));
	return b;
}

enum ow_status
ow_calib_study_text(const struct ow_study *s, const struct ow_calib_options *o,
                    const struct ow_calib_result *r, const char *readings_name,
                    const char *out_path, char **text, struct ow_diag *d)
{
	char dir[PATH_MAX], *buf = NULL;
	size_t len = 0, bom;
	cJSON *doc = NULL, *b;
	enum ow_status st =
	    ow_io_read_file(s->path, MAX_STUDY_BYTES, &buf, &len, d);

	*text = NULL;
	if (st != OW_OK)
		return st;
	bom = len >= 3 && !memcmp(buf, "\xEF\xBB\xBF", 3) ? 3 : 0;
	doc = cJSON_ParseWithLength(buf + bom, len - bom);
	free(buf);
	if (!doc)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: no longer a JSON text "
		                   "(changed since it was loaded)",
		                   s->path);
	folder_of(out_path, dir, sizeof dir);
	st = repoint(doc, "screw", s->screw_path, dir, d);
	if (st == OW_OK)
		st = repoint(doc, "resin", s->resin_path, dir, d);
	b = block(s, cJSON_GetObjectItemCaseSensitive(doc, "calibration"), o, r,
	          readings_name);
	cJSON_DeleteItemFromObjectCaseSensitive(doc, "calibration");
	cJSON_AddItemToObject(doc, "calibration", b);
	if (st == OW_OK && !(*text = cJSON_Print(doc)))
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	cJSON_Delete(doc);
	return st;
}
