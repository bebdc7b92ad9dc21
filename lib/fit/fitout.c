/* fitout.c - a fitted viscosity model as the `viscosity` block of a resin
 * file (README "Input files", resin), written alone or merged into a resin
 * file. */
#include "ow_fit.h"

#include <cjson/cJSON.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_config.h"
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
		ok = put_unit(o, "consistency", v->consistency_Pa_sn, "Pa s^n");
	if (ok && v->model != OW_VISC_POWER_LAW)
		ok = put_unit(o, "zero_shear", v->zero_shear_Pa_s, "Pa s");
	if (ok && v->model == OW_VISC_CROSS)
		ok =
		    put_unit(o, "critical_stress", v->critical_stress_Pa, "Pa");
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
	if (!root || !o ||
	    (notes && !cJSON_AddStringToObject(root, "notes", notes)) ||
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

/* A resin file: one JSON object (nothing after it) whose keys are all
 * keys of a resin, so that a study, a screw or a fit block is never
 * rewritten as if it were one. */
static enum ow_status parse_resin(const char *path, const char *text,
                                  cJSON **root, struct ow_diag *d)
{
	const char *const *keys = ow_config_resin_keys();
	const char *end = NULL;
	const cJSON *e;
	size_t k;

	*root = cJSON_ParseWithOpts(text, &end, 1);
	if (!*root)
		return ow_diag_set(d, OW_EINPUT, "%s: line %d: not valid JSON",
		                   path, line_of(text, end ? end : text));
	if (!cJSON_IsObject(*root))
		goto not_resin;
	cJSON_ArrayForEach(e, *root)
	{
		for (k = 0; keys[k] && strcmp(keys[k], e->string); k++)
			;
		if (!keys[k]) {
			ow_diag_set(d, OW_EINPUT,
			            "%s: key \"%.40s\" is not a key "
			            "of a resin file: --into replaces the "
			            "viscosity block of a resin file only",
			            path, e->string);
			cJSON_Delete(*root);
			*root = NULL;
			return OW_EINPUT;
		}
	}
	if (cJSON_GetObjectItemCaseSensitive(*root, "name"))
		return OW_OK;
not_resin:
	cJSON_Delete(*root);
	*root = NULL;
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: not a resin file (a resin "
	                   "file holds one JSON object with its \"name\" "
	                   "and properties)",
	                   path);
}

/* ---- keeping the file's layout ---------------------------------------- */

static const char *skip_ws(const char *p)
{
	while (*p == ' ' || *p == '\t' || *p == '\n' || *p == '\r')
		p++;
	return p;
}

/* End of the JSON value at p (the text is known to be valid JSON). */
static const char *skip_value(const char *p)
{
	int depth = 0;

	do {
		if (*p == '"') {
			for (p++; *p && *p != '"'; p++)
				if (*p == '\\' && p[1])
					p++;
			p++;
		} else if (*p == '{' || *p == '[') {
			depth++;
			p++;
		} else if (*p == '}' || *p == ']') {
			depth--;
			p++;
		} else if (depth == 0) {
			while (*p && !strchr(",}] \t\r\n", *p))
				p++;
		} else {
			p++;
		}
	} while (depth > 0 && *p);
	return p;
}

/* Where the top-level member "viscosity" of the object text is: its value
 * [*vb, *ve), its key at *key (*vb = NULL when there is none); *last is
 * the end of the object's last value (the object's "{" + 1 when empty). */
static void find_member(const char *text, const char **key, const char **vb,
                        const char **ve, const char **last)
{
	const char *p = skip_ws(text) + 1; /* after "{" */

	*key = *vb = *ve = NULL;
	*last = p;
	for (p = skip_ws(p); *p == '"'; p = skip_ws(p + 1)) {
		const char *k = p, *v;

		p = skip_value(p);
		v = skip_ws(skip_ws(p) + 1); /* after ":" */
		p = skip_value(v);
		*last = p;
		if (p - v > 0 && !strncmp(k, "\"viscosity\"", 11)) {
			*key = k;
			*vb = v;
			*ve = p;
		}
		p = skip_ws(p);
		if (*p != ',')
			break;
	}
}

/* The block printed by cJSON (tab per level, tab after ':') re-indented with
 * unit, each line after the first starting with the key's own indent. */
static void add_indented(struct ow_buf *b, const char *block,
                         const char *indent, size_t ilen, const char *unit)
{
	for (; *block; block++) {
		if (block[0] == ':' && block[1] == '\t') {
			ow_buf_adds(b, ": "); /* cJSON puts a tab after ':' */
			block++;
			continue;
		}
		ow_buf_add(b, block, 1);
		if (*block != '\n')
			continue;
		ow_buf_add(b, indent, ilen);
		for (; block[1] == '\t'; block++)
			ow_buf_adds(b, unit);
	}
}

/* The resin text with its viscosity block replaced (or added last) and
 * every other byte as the user wrote it; NULL when out of memory. */
static char *splice(const char *text, const cJSON *o)
{
	const char *key, *vb, *ve, *last, *ls, *ind;
	char *block = cJSON_Print(o), *out = NULL, unit[16];
	struct ow_buf b = {0};
	size_t ilen;

	if (!block)
		return NULL;
	find_member(text, &key, &vb, &ve, &last);
	ls = key ? key : last;
	while (ls > text && ls[-1] != '\n')
		ls--;
	for (ilen = 0; ls[ilen] == ' ' || ls[ilen] == '\t'; ilen++)
		;
	ind = ilen ? ls : "  "; /* one level: the members' own indent */
	ilen = ilen ? ilen : 2;
	snprintf(unit, sizeof unit, "%.*s", ilen < sizeof unit ? (int)ilen : 2,
	         ind);
	ow_buf_add(&b, text, (size_t)((vb ? vb : last) - text));
	if (!vb) {
		ow_buf_adds(&b, last > skip_ws(text) + 1 ? ",\n" : "\n");
		ow_buf_add(&b, ind, ilen);
		ow_buf_adds(&b, "\"viscosity\": ");
	}
	add_indented(&b, block, ind, ilen, unit);
	ow_buf_adds(&b, vb ? ve : last);
	ow_buf_take(&b, &out, NULL, NULL);
	free(block);
	return out;
}

enum ow_status ow_fit_merge_into(const struct ow_viscosity *v, const char *path,
                                 struct ow_diag *d)
{
	char *text = NULL, *out = NULL;
	cJSON *root = NULL, *o = NULL, *back = NULL;
	enum ow_status st = slurp(path, &text, d);

	if (st == OW_OK)
		st = parse_resin(path, text, &root, d);
	if (st != OW_OK)
		goto fail;
	o = visc_object(v);
	out = o ? splice(text, o) : NULL;
	if (!out) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	/* the spliced text must read back as the file with the new block */
	back = cJSON_Parse(out);
	if (!cJSON_Compare(cJSON_GetObjectItemCaseSensitive(back, "viscosity"),
	                   o, 1) ||
	    cJSON_GetArraySize(back) !=
	        cJSON_GetArraySize(root) +
	            !cJSON_GetObjectItemCaseSensitive(root, "viscosity")) {
		st = ow_diag_set(d, OW_ECOMPUTE,
		                 "%s: the viscosity block "
		                 "could not be placed in the file's own "
		                 "layout; the file was left as it was",
		                 path);
		goto fail;
	}
	st = ow_io_write_file(path, out, strlen(out), d);
fail:
	cJSON_Delete(back);
	cJSON_Delete(o);
	cJSON_Delete(root);
	free(text);
	free(out);
	return st;
}
