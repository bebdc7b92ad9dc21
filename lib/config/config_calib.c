/* config_calib.c - the study's `calibration` block (README, "Study") ->
 * struct ow_calibration: the factor values with their standard errors and
 * source, the factors calibrate fits by default, the readings'
 * uncertainties and the record of the fit that produced the values. */
#include "ow_config.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "json_in.h"

/* o.key as an object whose keys are among allowed (its JSON path into p);
 * *out NULL when absent. */
static enum ow_status sub_object(const struct ow_jin *j, const cJSON *o,
                                 const char *path, const char *key,
                                 const char *const *allowed, const cJSON **out,
                                 char *p)
{
	enum ow_status st;

	*out = ow_jin_get(o, key);
	ow_jin_key(p, path, key);
	if (!*out)
		return OW_OK;
	st = ow_jin_object(j, *out, p);
	return st == OW_OK ? ow_jin_keys(j, *out, p, allowed) : st;
}

/* A factor: a bare number (or "125 %"), or {"value", "std_error",
 * "source"}; it must lie inside the factor's bounds. */
static enum ow_status parse_factor(const struct ow_jin *j, const cJSON *v,
                                   const char *path, int k,
                                   struct ow_calibration *c)
{
	static const char *const keys[] = {"value", "std_error", "source",
	                                   NULL};
	const struct ow_calib_factor *f = ow_calib_factor(k);
	enum ow_status st;

	if (!cJSON_IsObject(v))
		st = ow_jin_qty_node(j, v, path, OW_DIM_NONE, 0, &c->value[k]);
	else {
		st = ow_jin_keys(j, v, path, keys);
		if (st == OW_OK)
			st = ow_jin_qty(j, v, path, "value", OW_DIM_NONE,
			                OW_JIN_REQUIRED, &c->value[k]);
		if (st == OW_OK)
			st = ow_jin_qty(j, v, path, "std_error", OW_DIM_NONE, 0,
			                &c->std_error[k]);
		if (st == OW_OK)
			st = ow_jin_str(j, v, path, "source", 0, c->source[k],
			                sizeof c->source[k]);
	}
	if (st != OW_OK)
		return st;
	if (!(c->value[k] >= f->lo && c->value[k] <= f->hi))
		return ow_jin_fail(j, path,
		                   "%g: expected a factor in "
		                   "%g..%g (1 = off)",
		                   c->value[k], f->lo, f->hi);
	if (!isnan(c->std_error[k]) && !(c->std_error[k] >= 0.0))
		return ow_jin_fail(j, path,
		                   "std_error: expected a number "
		                   ">= 0");
	return OW_OK;
}

/* "free": ["viscosity_scale", ...] */
static enum ow_status parse_free(const struct ow_jin *j, const cJSON *o,
                                 const char *path, struct ow_calibration *c)
{
	const cJSON *a = ow_jin_get(o, "free"), *e;
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN];
	enum ow_status st;
	int i = 0, k;

	if (!a)
		return OW_OK;
	ow_jin_key(p, path, "free");
	st = ow_jin_array(j, a, p, 0, OW_CF_COUNT);
	for (e = a ? a->child : NULL; st == OW_OK && e; e = e->next, i++) {
		k = cJSON_IsString(e) ? ow_calib_factor_find(e->valuestring)
		                      : -1;
		if (k < 0)
			return ow_jin_fail(j, ow_jin_index(q, p, i),
			                   "expected a factor name: "
			                   "viscosity_scale, friction, "
			                   "die_factor or heat_transfer");
		c->free_mask |= 1u << k;
	}
	return st;
}

/* "uncertainty": {"output": "2 %", "head_pressure": "0.5 MPa", ...}: a
 * percentage is relative to the reading, anything else absolute (the
 * melt temperature's as a difference, "3 K"). */
static enum ow_status parse_uncertainty(const struct ow_jin *j, const cJSON *o,
                                        const char *path,
                                        struct ow_calibration *c)
{
	static const char *const keys[] = {"output",    "head_pressure",
	                                   "melt_temp", "drive_power",
	                                   "torque",    NULL};
	const cJSON *u, *v;
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN];
	enum ow_status st = sub_object(j, o, path, "uncertainty", keys, &u, p);
	enum ow_dim dim;
	int k, rel;

	for (k = 0; st == OW_OK && u && k < OW_CQ_COUNT; k++) {
		v = ow_jin_get(u, keys[k]);
		if (!v)
			continue;
		rel = cJSON_IsString(v) && strchr(v->valuestring, '%');
		dim =
		    rel ? OW_DIM_NONE : ow_calib_qty_dim((enum ow_calib_qty)k);
		if (dim == OW_DIM_TEMPERATURE)
			dim = OW_DIM_TEMP_DIFF;
		c->sd_abs[k] = c->sd_rel[k] = NAN;
		st = ow_jin_qty_node(j, v, ow_jin_key(q, p, keys[k]), dim, 0,
		                     rel ? &c->sd_rel[k] : &c->sd_abs[k]);
		if (st == OW_OK && !((rel ? c->sd_rel[k] : c->sd_abs[k]) > 0))
			st = ow_jin_fail(j, q, "expected an uncertainty > 0");
	}
	return st;
}

/* One entry of fit.residuals. */
static enum ow_status parse_resid(const struct ow_jin *j, const cJSON *o,
                                  const char *path, struct ow_calib_resid *e)
{
	static const char *const keys[] = {
	    "line", "rpm", "quantity", "measured", "modelled", "sd", NULL};
	static const char *const qty[] = {"output",    "head_pressure",
	                                  "melt_temp", "drive_power",
	                                  "torque",    NULL};
	int q = 0;
	enum ow_status st = ow_jin_object(j, o, path);

	if (st == OW_OK)
		st = ow_jin_keys(j, o, path, keys);
	if (st == OW_OK)
		st = ow_jin_int(j, o, path, "line", 0, 1000000, OW_JIN_REQUIRED,
		                &e->line);
	if (st == OW_OK)
		st = ow_jin_choice(j, o, path, "quantity", qty, OW_JIN_REQUIRED,
		                   &q);
	e->qty = (enum ow_calib_qty)q;
	if (st == OW_OK)
		st = ow_jin_qty(j, o, path, "rpm", OW_DIM_ROT_SPEED,
		                OW_JIN_REQUIRED, &e->rpm);
	if (st == OW_OK)
		st =
		    ow_jin_qty(j, o, path, "measured", ow_calib_qty_dim(e->qty),
		               OW_JIN_REQUIRED, &e->measured);
	if (st == OW_OK)
		st =
		    ow_jin_qty(j, o, path, "modelled", ow_calib_qty_dim(e->qty),
		               OW_JIN_REQUIRED, &e->modelled);
	if (st == OW_OK)
		st = ow_jin_qty(j, o, path, "sd", OW_DIM_NONE, OW_JIN_REQUIRED,
		                &e->sd);
	if (st == OW_OK && !(e->sd > 0))
		st = ow_jin_fail(j, path, "sd: expected a number > 0");
	return st;
}

/* The correlation matrix of the fitted factors: n rows of n numbers. */
static enum ow_status parse_corr(const struct ow_jin *j, const cJSON *f,
                                 const char *path, struct ow_calibration *c)
{
	const cJSON *m = ow_jin_get(f, "correlation"), *row, *x;
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN];
	enum ow_status st;
	int a = 0, b;

	ow_jin_key(p, path, "correlation");
	if (!m)
		return ow_jin_fail(j, p, "required key is missing");
	st = ow_jin_array(j, m, p, c->n_fit, c->n_fit);
	for (row = m->child; st == OW_OK && row; row = row->next, a++) {
		ow_jin_index(q, p, a);
		st = ow_jin_array(j, row, q, c->n_fit, c->n_fit);
		for (x = row->child, b = 0; st == OW_OK && x;
		     x = x->next, b++) {
			if (!cJSON_IsNumber(x) ||
			    fabs(x->valuedouble) > 1.0 + 1e-9)
				return ow_jin_fail(j, q,
				                   "expected numbers "
				                   "in -1..1");
			c->corr[a][b] = x->valuedouble;
		}
	}
	return st;
}

/* "fit": {"readings", "chi2", "dof", "factors", "correlation",
 * "residuals"}: what calibrate found, shown by the report. */
static enum ow_status parse_fit(const struct ow_jin *j, const cJSON *o,
                                const char *path, struct ow_calibration *c)
{
	static const char *const keys[] = {
	    "readings",    "chi2",      "dof", "factors",
	    "correlation", "residuals", NULL};
	const cJSON *f, *a, *e;
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN], r[OW_JPATH_LEN];
	enum ow_status st = sub_object(j, o, path, "fit", keys, &f, p);
	int i = 0, k;

	if (st != OW_OK || !f)
		return st;
	if (st == OW_OK)
		st = ow_jin_str(j, f, p, "readings", OW_JIN_REQUIRED,
		                c->fit_readings, sizeof c->fit_readings);
	if (st == OW_OK)
		st = ow_jin_qty(j, f, p, "chi2", OW_DIM_NONE, OW_JIN_REQUIRED,
		                &c->chi2);
	if (st == OW_OK)
		st = ow_jin_int(j, f, p, "dof", 0, OW_CALIB_MAX_RESID,
		                OW_JIN_REQUIRED, &c->dof);
	a = ow_jin_get(f, "factors");
	ow_jin_key(q, p, "factors");
	if (st == OW_OK && !a)
		st = ow_jin_fail(j, q, "required key is missing");
	if (st == OW_OK)
		st = ow_jin_array(j, a, q, 0, OW_CF_COUNT);
	for (e = st == OW_OK ? a->child : NULL; e; e = e->next) {
		k = cJSON_IsString(e) ? ow_calib_factor_find(e->valuestring)
		                      : -1;
		if (k < 0)
			return ow_jin_fail(j, ow_jin_index(r, q, c->n_fit),
			                   "expected a factor name");
		c->fit_ids[c->n_fit++] = k;
	}
	if (st == OW_OK)
		st = parse_corr(j, f, p, c);
	a = ow_jin_get(f, "residuals");
	ow_jin_key(q, p, "residuals");
	if (st == OW_OK && !a)
		st = ow_jin_fail(j, q, "required key is missing");
	if (st == OW_OK)
		st = ow_jin_array(j, a, q, 0, OW_CALIB_MAX_RESID);
	for (e = st == OW_OK ? a->child : NULL; st == OW_OK && e;
	     e = e->next, i++)
		st = parse_resid(j, e, ow_jin_index(r, q, i),
		                 &c->resid[c->n_resid++]);
	c->has_fit = st == OW_OK;
	return st;
}

/* The factor's source travels into the report's list of sources. */
static void add_sources(struct ow_study *s)
{
	const struct ow_calibration *c = &s->calib;
	int k;

	for (k = 0; k < OW_CF_COUNT; k++) {
		struct ow_source *r = &s->sources[s->n_sources];

		if (!c->source[k][0] || s->n_sources >= OW_MAX_SOURCES)
			continue;
		snprintf(r->key, sizeof r->key, "calibration.%s",
		         ow_calib_factor(k)->name);
		snprintf(r->value, sizeof r->value, "%.6g", c->value[k]);
		snprintf(r->text, sizeof r->text, "%s", c->source[k]);
		s->n_sources++;
	}
}

enum ow_status ow_config_calibration(const struct ow_jin *j, const cJSON *o,
                                     struct ow_study *s)
{
	static const char *const keys[] = {"notes",
	                                   "viscosity_scale",
	                                   "friction",
	                                   "die_factor",
	                                   "heat_transfer",
	                                   "free",
	                                   "uncertainty",
	                                   "fit",
	                                   NULL};
	struct ow_calibration *c = &s->calib;
	const cJSON *b, *v, *n;
	char p[OW_JPATH_LEN], bp[OW_JPATH_LEN];
	enum ow_status st;
	int k;

	ow_calib_default(c);
	st = sub_object(j, o, "", "calibration", keys, &b, bp);
	if (st != OW_OK || !b)
		return st;
	c->present = 1;
	n = ow_jin_get(b, "notes");
	if (st == OW_OK && n && !cJSON_IsString(n))
		st = ow_jin_fail(j, "calibration.notes", "expected a string");
	for (k = 0; st == OW_OK && k < OW_CF_COUNT; k++) {
		v = ow_jin_get(b, ow_calib_factor(k)->name);
		if (v)
			st = parse_factor(j, v,
			                  ow_jin_key(p, "calibration",
			                             ow_calib_factor(k)->name),
			                  k, c);
	}
	if (st == OW_OK)
		st = parse_free(j, b, "calibration", c);
	if (st == OW_OK)
		st = parse_uncertainty(j, b, "calibration", c);
	if (st == OW_OK)
		st = parse_fit(j, b, "calibration", c);
	if (st == OW_OK)
		add_sources(s);
	return st;
}
