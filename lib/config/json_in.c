/* json_in.c - one JSON input file: reading, parsing with line:column
 * messages, strict key sets and typed getters (see json_in.h). */
#include "json_in.h"
#include "ow_io.h"

#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MAX_FILE_BYTES                                                         \
	((size_t)4 << 20) /* inputs are small: a guard, not a limit */

enum ow_status ow_jin_fail(const struct ow_jin *j, const char *path,
                           const char *fmt, ...)
{
	char what[OW_DIAG_LEN];
	va_list ap;

	va_start(ap, fmt);
	vsnprintf(what, sizeof what, fmt, ap);
	va_end(ap);
	return ow_diag_set(j->d, OW_EINPUT, "%s: %s: %s", j->file, path, what);
}

const char *ow_jin_key(char *out, const char *parent, const char *key)
{
	snprintf(out, OW_JPATH_LEN, "%s%s%s", parent, *parent ? "." : "", key);
	return out;
}

const char *ow_jin_index(char *out, const char *parent, int i)
{
	snprintf(out, OW_JPATH_LEN, "%s[%d]", parent, i);
	return out;
}

static enum ow_status open_error(const struct ow_jin *j, const char *who,
                                 const char *key, int err)
{
	char eb[128];

	ow_io_strerror(err, eb, sizeof eb);
	if (who)
		return ow_diag_set(j->d, OW_EINPUT,
		                   "%s: %s: cannot open \"%s\": %s", who, key,
		                   j->file, eb);
	return ow_diag_set(j->d, OW_EINPUT, "%s: cannot open: %s", j->file, eb);
}

/* Malformed JSON: name line and column (1-based, columns in bytes) of the
 * byte where the parser stopped, and show a little of the text there. */
static enum ow_status syntax_error(const struct ow_jin *j, const char *buf,
                                   size_t len, const char *at)
{
	size_t off =
	    at && at >= buf && at <= buf + len ? (size_t)(at - buf) : len;
	size_t i, line = 1, col = 1, k;
	char near[24];

	for (i = 0; i < off; i++, col++)
		if (buf[i] == '\n') {
			line++;
			col = 0;
		}
	for (k = 0; k + 1 < sizeof near && off + k < len &&
	            buf[off + k] != '\n' && buf[off + k] != '\r';
	     k++)
		near[k] = buf[off + k];
	near[k] = '\0';
	return ow_diag_set(j->d, OW_EINPUT,
	                   "%s: line %zu, column %zu: malformed JSON%s%s%s",
	                   j->file, line, col,
	                   k ? " near \""
	                     : " (unexpected "
	                       "end of file)",
	                   near, k ? "\"" : "");
}

/* Every key and string under node is UTF-8 text (JSON texts are UTF-8,
 * RFC 8259 section 8.1; a stray byte would reach study.json and the PDF). */
static enum ow_status utf8_tree(const struct ow_jin *j, const cJSON *node,
                                const char *path)
{
	char p[OW_JPATH_LEN];
	const cJSON *c;
	size_t n, bad;
	int i = 0;

	for (c = node->child; c; c = c->next, i++) {
		const char *at = c->string ? ow_jin_key(p, path, c->string)
		                           : ow_jin_index(p, path, i);

		if (c->string && (n = strlen(c->string),
		                  ow_io_utf8_check(c->string, n) != n))
			return ow_jin_fail(j, path[0] ? path : "(top level)",
			                   "a key is not UTF-8 text");
		if (cJSON_IsString(c) &&
		    (n = strlen(c->valuestring),
		     (bad = ow_io_utf8_check(c->valuestring, n)) != n))
			return ow_jin_fail(j, at,
			                   "not UTF-8 text (byte 0x%02X "
			                   "at byte %zu of the string)",
			                   (unsigned char)c->valuestring[bad],
			                   bad + 1);
		if (utf8_tree(j, c, at) != OW_OK)
			return OW_EINPUT;
	}
	return OW_OK;
}

enum ow_status ow_jin_load(const struct ow_jin *j, const char *who,
                           const char *key, unsigned long *crc, cJSON **root)
{
	const char *end = NULL;
	char *buf = NULL;
	size_t len = 0, bom;
	int err;

	*root = NULL;
	len = strlen(j->file);
	if (ow_io_utf8_check(j->file, len) !=
	    len) /* it is copied into outputs */
		return ow_diag_set(j->d, OW_EINPUT,
		                   "%s: the file name is not "
		                   "UTF-8 text: rename the file",
		                   j->file);
	err = ow_io_slurp(j->file, MAX_FILE_BYTES, &buf, &len);
	if (err)
		return open_error(j, who, key, err);
	*crc = ow_io_crc32(*crc, buf, len);
	if (strlen(buf) != len) { /* cJSON would stop at the NUL */
		free(buf);
		return ow_diag_set(j->d, OW_EINPUT,
		                   "%s: contains a NUL byte: not a JSON text",
		                   j->file);
	}
	/* Some editors start UTF-8 files with a byte order mark: skip it. */
	bom = len >= 3 && !memcmp(buf, "\xEF\xBB\xBF", 3) ? 3 : 0;
	/* The length includes the terminating NUL, so that "require null
	 * terminated" rejects trailing text after the object. The parse end
	 * pointer (not cJSON_GetErrorPtr, which is global) marks errors. */
	*root = cJSON_ParseWithLengthOpts(buf + bom, len - bom + 1, &end, 1);
	if (!*root) {
		enum ow_status st = syntax_error(j, buf + bom, len - bom, end);

		free(buf);
		return st;
	}
	free(buf);
	if (utf8_tree(j, *root, "") != OW_OK) {
		cJSON_Delete(*root);
		*root = NULL;
		return OW_EINPUT;
	}
	if (!cJSON_IsObject(*root)) {
		cJSON_Delete(*root);
		*root = NULL;
		return ow_diag_set(j->d, OW_EINPUT,
		                   "%s: expected a JSON object {...} at the "
		                   "top level",
		                   j->file);
	}
	return OW_OK;
}

const cJSON *ow_jin_get(const cJSON *obj, const char *key)
{
	return cJSON_GetObjectItemCaseSensitive(obj, key);
}

/* A JSON value in a message: "two", 3.5, true, an array, ... */
static const char *describe(const cJSON *v, char *out, size_t n)
{
	if (cJSON_IsString(v))
		snprintf(out, n, "\"%.60s\"", v->valuestring);
	else if (cJSON_IsNumber(v))
		snprintf(out, n, "%.15g", v->valuedouble);
	else if (cJSON_IsBool(v))
		snprintf(out, n, "%s", cJSON_IsTrue(v) ? "true" : "false");
	else if (cJSON_IsNull(v))
		snprintf(out, n, "null");
	else
		snprintf(out, n, "%s",
		         cJSON_IsArray(v) ? "an array" : "an object");
	return out;
}

static int listed(const char *key, const char *const *names)
{
	for (; *names; names++)
		if (!strcmp(key, *names))
			return 1;
	return 0;
}

static void join_names(char *out, size_t n, const char *const *names)
{
	size_t used = 0;

	out[0] = '\0';
	for (; *names && used < n; names++)
		used += (size_t)snprintf(out + used, n - used, "%s%s",
		                         used ? ", " : "", *names);
}

enum ow_status ow_jin_keys(const struct ow_jin *j, const cJSON *obj,
                           const char *path, const char *const *allowed)
{
	char p[OW_JPATH_LEN], names[OW_DIAG_LEN / 2];
	const cJSON *c, *e;

	for (c = obj->child; c; c = c->next) {
		for (e = obj->child; e != c; e = e->next)
			if (!strcmp(e->string, c->string))
				return ow_jin_fail(
				    j, ow_jin_key(p, path, c->string),
				    "duplicate key (each key may "
				    "appear once)");
		if (!listed(c->string, allowed)) {
			join_names(names, sizeof names, allowed);
			return ow_jin_fail(j, ow_jin_key(p, path, c->string),
			                   "unknown key (expected one of: "
			                   "%s)",
			                   names);
		}
	}
	return OW_OK;
}

enum ow_status ow_jin_object(const struct ow_jin *j, const cJSON *node,
                             const char *path)
{
	char got[80];

	if (cJSON_IsObject(node))
		return OW_OK;
	return ow_jin_fail(j, path, "expected an object {...}, got %s",
	                   describe(node, got, sizeof got));
}

enum ow_status ow_jin_array(const struct ow_jin *j, const cJSON *node,
                            const char *path, int n_min, int n_max)
{
	char got[80];
	int n;

	if (!cJSON_IsArray(node))
		return ow_jin_fail(j, path, "expected an array [...], got %s",
		                   describe(node, got, sizeof got));
	n = cJSON_GetArraySize(node);
	if (n < n_min || n > n_max)
		return ow_jin_fail(j, path, "%d entries; expected %d..%d", n,
		                   n_min, n_max);
	return OW_OK;
}

/* Look obj.key up: OW_OK with *v NULL when optional and absent. */
static enum ow_status member(const struct ow_jin *j, const cJSON *obj,
                             const char *path, const char *key, int flags,
                             const cJSON **v)
{
	char p[OW_JPATH_LEN];

	*v = ow_jin_get(obj, key);
	if (!*v && (flags & OW_JIN_REQUIRED))
		return ow_jin_fail(j, ow_jin_key(p, path, key),
		                   "required key is missing");
	return OW_OK;
}

static enum ow_status add_source(const struct ow_jin *j, const char *path,
                                 const char *written, const cJSON *src)
{
	struct ow_study *s = j->study;
	struct ow_source *r;

	if (!s)
		return OW_OK;
	if (s->n_sources >= OW_MAX_SOURCES)
		return ow_jin_fail(j, path,
		                   "more than %d values carry a "
		                   "source",
		                   OW_MAX_SOURCES);
	r = &s->sources[s->n_sources];
	if (snprintf(r->key, sizeof r->key, "%s%s", j->src_root, path) >=
	        (int)sizeof r->key ||
	    snprintf(r->value, sizeof r->value, "%s", written) >=
	        (int)sizeof r->value)
		return ow_jin_fail(j, path,
		                   "value \"%.40s\" is too long to "
		                   "keep with its source",
		                   written);
	if (snprintf(r->text, sizeof r->text, "%s", src->valuestring) >=
	    (int)sizeof r->text)
		return ow_jin_fail(j, path, "source: at most %zu characters",
		                   sizeof r->text - 1);
	s->n_sources++;
	return OW_OK;
}

/* A string with its unit, or a bare number meaning SI. */
static enum ow_status plain_qty(const struct ow_jin *j, const cJSON *v,
                                const char *path, enum ow_dim dim, int flags,
                                double *out, char *written, size_t n)
{
	struct ow_diag ud = {{0}};
	double si = NAN;

	if (cJSON_IsNumber(v)) {
		snprintf(written, n, "%.15g", v->valuedouble);
		if (!isfinite(v->valuedouble))
			return ow_jin_fail(j, path,
			                   "not a finite number (out "
			                   "of range)");
		*out = v->valuedouble;
		return OW_OK;
	}
	snprintf(written, n, "%s", v->valuestring);
	if (ow_units_parse(j->u, v->valuestring, dim,
	                   (flags & OW_JIN_IN_D) ? j->diameter_m : 0.0, &si,
	                   &ud) != OW_OK)
		return ow_jin_fail(j, path, "%s",
		                   ud.msg[0] ? ud.msg : ow_dim_expect(dim));
	if (!isfinite(si))
		return ow_jin_fail(j, path, "\"%.60s\" is not a finite %s",
		                   v->valuestring, ow_dim_expect(dim));
	*out = si;
	return OW_OK;
}

static enum ow_status qty_type_error(const struct ow_jin *j, const cJSON *v,
                                     const char *path, enum ow_dim dim)
{
	char got[80];

	return ow_jin_fail(j, path,
	                   "expected %s: a string with its unit, a "
	                   "bare number in SI units or {\"value\": ..., "
	                   "\"source\": \"...\"}; got %s",
	                   ow_dim_expect(dim), describe(v, got, sizeof got));
}

enum ow_status ow_jin_qty_node(const struct ow_jin *j, const cJSON *v,
                               const char *path, enum ow_dim dim, int flags,
                               double *out)
{
	static const char *const keys[] = {"value", "source", NULL};
	char written[128], p[OW_JPATH_LEN];
	const cJSON *val, *src;
	enum ow_status st;

	if (cJSON_IsNumber(v) || cJSON_IsString(v))
		return plain_qty(j, v, path, dim, flags, out, written,
		                 sizeof written);
	if (!cJSON_IsObject(v))
		return qty_type_error(j, v, path, dim);
	st = ow_jin_keys(j, v, path, keys);
	if (st == OW_OK)
		st = member(j, v, path, "value", OW_JIN_REQUIRED, &val);
	if (st == OW_OK)
		st = member(j, v, path, "source", OW_JIN_REQUIRED, &src);
	if (st != OW_OK)
		return st;
	if (!cJSON_IsString(src) || !src->valuestring[0])
		return ow_jin_fail(j, ow_jin_key(p, path, "source"),
		                   "expected a non-empty string naming where "
		                   "the value comes from");
	if (!cJSON_IsNumber(val) && !cJSON_IsString(val))
		return qty_type_error(j, val, ow_jin_key(p, path, "value"),
		                      dim);
	st = plain_qty(j, val, ow_jin_key(p, path, "value"), dim, flags, out,
	               written, sizeof written);
	return st == OW_OK ? add_source(j, path, written, src) : st;
}

enum ow_status ow_jin_qty(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, enum ow_dim dim,
                          int flags, double *out)
{
	char p[OW_JPATH_LEN];
	const cJSON *v;
	enum ow_status st = member(j, obj, path, key, flags, &v);

	if (st != OW_OK || !v)
		return st;
	return ow_jin_qty_node(j, v, ow_jin_key(p, path, key), dim, flags, out);
}

enum ow_status ow_jin_int(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, int lo, int hi,
                          int flags, int *out)
{
	char p[OW_JPATH_LEN], got[80];
	const cJSON *v;
	enum ow_status st = member(j, obj, path, key, flags, &v);

	if (st != OW_OK || !v)
		return st;
	if (!cJSON_IsNumber(v) || !isfinite(v->valuedouble) ||
	    v->valuedouble != floor(v->valuedouble) ||
	    v->valuedouble < (double)lo || v->valuedouble > (double)hi)
		return ow_jin_fail(j, ow_jin_key(p, path, key),
		                   "expected an integer %d..%d, got %s", lo, hi,
		                   describe(v, got, sizeof got));
	*out = (int)v->valuedouble;
	return OW_OK;
}

enum ow_status ow_jin_str(const struct ow_jin *j, const cJSON *obj,
                          const char *path, const char *key, int flags,
                          char *out, size_t n)
{
	char p[OW_JPATH_LEN], got[80];
	const cJSON *v;
	enum ow_status st = member(j, obj, path, key, flags, &v);

	if (st != OW_OK || !v)
		return st;
	if (!cJSON_IsString(v))
		return ow_jin_fail(j, ow_jin_key(p, path, key),
		                   "expected a string, got %s",
		                   describe(v, got, sizeof got));
	if (strlen(v->valuestring) >= n)
		return ow_jin_fail(j, ow_jin_key(p, path, key),
		                   "at most %zu characters", n - 1);
	memcpy(out, v->valuestring, strlen(v->valuestring) + 1);
	return OW_OK;
}

enum ow_status ow_jin_choice(const struct ow_jin *j, const cJSON *obj,
                             const char *path, const char *key,
                             const char *const *names, int flags, int *out)
{
	char p[OW_JPATH_LEN], got[80], list[OW_DIAG_LEN / 2];
	const cJSON *v;
	enum ow_status st = member(j, obj, path, key, flags, &v);
	int i;

	if (st != OW_OK || !v)
		return st;
	for (i = 0; cJSON_IsString(v) && names[i]; i++)
		if (!strcmp(v->valuestring, names[i])) {
			*out = i;
			return OW_OK;
		}
	join_names(list, sizeof list, names);
	return ow_jin_fail(j, ow_jin_key(p, path, key), "%s is not one of: %s",
	                   describe(v, got, sizeof got), list);
}
