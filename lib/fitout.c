/* fitout.c - a fitted viscosity model as the `viscosity` block of a resin
 * file (README "Input files", resin), written alone or merged into a resin file. */
#include "ow_fit.h"

#include <cjson/cJSON.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_io.h"
#include "ow_results.h"

#define MAX_RESIN_BYTES ((size_t)16 * 1024 * 1024)

/* Six significant digits: far finer than any fit's standard error, and
 * readable in a file people edit. */
static double round6(double x)
{
	char buf[32];

	snprintf(buf, sizeof buf, "%.6g", x);
	return strtod(buf, NULL);
}

static int put_unit(cJSON *o, const char *key, double x, const char *unit)
{
	char buf[64];

	snprintf(buf, sizeof buf, "%.6g %s", x, unit);
	return cJSON_AddStringToObject(o, key, buf) != NULL;
}

static int put_num(cJSON *o, const char *key, double x)
{
	return cJSON_AddNumberToObject(o, key, round6(x)) != NULL;
}

static cJSON *shift_object(const struct ow_viscosity *v)
{
	cJSON *s = cJSON_CreateObject();
	int ok = s && cJSON_AddStringToObject(s, "type",
					      ow_fit_shift_name(v->shift));

	if (ok && v->shift == OW_SHIFT_ARRHENIUS)
		ok = put_unit(s, "activation_energy", v->activation_J_mol / 1e3,
			      "kJ/mol");
	else if (ok)
		ok = put_num(s, "c1", v->wlf_c1) &&
		     put_unit(s, "c2", v->wlf_c2_K, "K");
	if (!ok) {
		cJSON_Delete(s);
		return NULL;
	}
	return s;
}

/* Keys as the resin file defines them, values as strings with SI units. */
static cJSON *visc_object(const struct ow_viscosity *v)
{
	cJSON *o = cJSON_CreateObject(), *s;
	int ok = o && cJSON_AddStringToObject(o, "model",
					      ow_fit_model_name(v->model));

	if (ok && v->model == OW_VISC_POWER_LAW)
		ok = put_unit(o, "consistency", v->consistency_Pa_sn,
			      "Pa s^n");
	if (ok && v->model != OW_VISC_POWER_LAW)
		ok = put_unit(o, "zero_shear", v->zero_shear_Pa_s, "Pa s");
	if (ok && v->model == OW_VISC_CROSS)
		ok = put_unit(o, "critical_stress", v->critical_stress_Pa,
			      "Pa");
	if (ok && v->model == OW_VISC_CARREAU_YASUDA)
		ok = put_unit(o, "time_constant", v->time_constant_s, "s");
	ok = ok && put_num(o, "index", v->index);
	if (ok && v->model == OW_VISC_CARREAU_YASUDA)
		ok = put_num(o, "a", v->a);
	ok = ok && put_unit(o, "reference_temperature",
			    v->ref_temp_K - OW_ZERO_C_K, "degC");
	s = ok ? shift_object(v) : NULL;
	if (!s || !cJSON_AddItemToObject(o, "shift", s)) {
		cJSON_Delete(s);
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

/* cJSON text -> a malloc'd copy ending in a newline (free() releases it). */
static enum ow_status print_json(const cJSON *root, char **text,
				 struct ow_diag *d)
{
	char *s = cJSON_Print(root);
	size_t len;

	*text = NULL;
	if (!s)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	len = strlen(s);
	*text = malloc(len + 2);
	if (*text) {
		memcpy(*text, s, len);
		memcpy(*text + len, "\n", 2);
	}
	cJSON_free(s);
	return *text ? OW_OK : ow_diag_set(d, OW_ENOMEM, "out of memory");
}

enum ow_status ow_fit_block_text(const struct ow_viscosity *v,
				 const char *notes, char **text,
				 struct ow_diag *d)
{
	cJSON *root = cJSON_CreateObject(), *o = visc_object(v);
	enum ow_status st;

	*text = NULL;
	if (!root || !o || (notes && !cJSON_AddStringToObject(root, "notes",
							      notes)) ||
	    !cJSON_AddItemToObject(root, "viscosity", o)) {
		cJSON_Delete(root);
		cJSON_Delete(o);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	st = print_json(root, text, d);
	cJSON_Delete(root);
	return st;
}

enum ow_status ow_fit_write_block(const struct ow_viscosity *v,
				  const char *notes, const char *path,
				  struct ow_diag *d)
{
	char *text = NULL;
	enum ow_status st = ow_fit_block_text(v, notes, &text, d);

	if (st == OW_OK)
		st = ow_io_write_file(path, text, strlen(text), d);
	free(text);
	return st;
}

/* The whole file as a NUL-terminated string, or an input rejection. */
static enum ow_status slurp(const char *path, char **out, struct ow_diag *d)
{
	return ow_io_read_file(path, MAX_RESIN_BYTES, out, NULL, d);
}

/* Line of byte offset pos, for the parse error message. */
static int line_of(const char *text, const char *pos)
{
	int line = 1;

	for (; text < pos && *text; text++)
		line += *text == '\n';
	return line;
}

static enum ow_status parse_resin(const char *path, const char *text,
				  cJSON **root, struct ow_diag *d)
{
	const char *end = NULL;

	*root = cJSON_ParseWithOpts(text, &end, 0);
	if (!*root)
		return ow_diag_set(d, OW_EINPUT,
				   "%s: line %d: not valid JSON", path,
				   line_of(text, end ? end : text));
	if (!cJSON_IsObject(*root)) {
		cJSON_Delete(*root);
		*root = NULL;
		return ow_diag_set(d, OW_EINPUT, "%s: a resin file must hold "
				   "one JSON object", path);
	}
	return OW_OK;
}

enum ow_status ow_fit_merge_into(const struct ow_viscosity *v,
				 const char *path, struct ow_diag *d)
{
	char *text = NULL, *out = NULL;
	cJSON *root = NULL, *o = NULL;
	enum ow_status st = slurp(path, &text, d);

	if (st == OW_OK)
		st = parse_resin(path, text, &root, d);
	if (st != OW_OK)
		goto fail;
	o = visc_object(v);
	if (!o) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	/* replace in place so the file keeps its key order */
	if (cJSON_GetObjectItemCaseSensitive(root, "viscosity")
		    ? !cJSON_ReplaceItemInObjectCaseSensitive(root, "viscosity",
							      o)
		    : !cJSON_AddItemToObject(root, "viscosity", o)) {
		cJSON_Delete(o);
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	st = print_json(root, &out, d);
	if (st == OW_OK)
		st = ow_io_write_file(path, out, strlen(out), d);
fail:
	cJSON_Delete(root);
	free(text);
	free(out);
	return st;
}
