/* spread_out.c - the spread's outputs: grid.csv with the share of safe
 * samples and the worst margin per limit added to each row, and
 * window.json with the robust window (the keys of the nominal window, as
 * ow_results_window_json writes them for the robust grid) and a `spread`
 * record (inputs, samples, seed, level, solves, the ranking). */
#include "ow_spread_out.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cjson/cJSON.h>

#include "ow_results.h"
#include "text_impl.h"
#include "json_num.h"

/* Append ",safe_share,worst_margin_<limit>..." to each line of grid.csv
 * (rows are the solved points in lattice order, as the grid writes them). */
enum ow_status ow_spread_grid_csv(const struct ow_study *s,
                                  const struct ow_grid *g,
                                  const struct ow_spread_result *r,
                                  const char *csv, char **out,
                                  struct ow_diag *d)
{
	struct ow_text t = {0};
	const char *p = csv, *nl;
	int i = -1, k, total = g->n_rpm * g->n_axis, header = 1;

	for (; (nl = strchr(p, '\n')); p = nl + 1) {
		char *line = strndup(p, (size_t)(nl - p));

		ow_text_add(&t, line ? line : "");
		free(line);
		if (header) {
			header = 0;
			ow_text_add(&t, ",safe_share");
			for (k = 0; k < OW_CK_LIMITS; k++)
				if (ow_check_active(&s->line.limits, k)) {
					ow_text_add(&t, ",worst_margin_");
					ow_text_add(&t, ow_check_key(k));
				}
		} else {
			while (++i < total && g->pts[i].solved != 1)
				;
			if (i >= total)
				break; /* more rows than solved points */
			ow_text_num(&t, r->pts[i].share, 1);
			for (k = 0; k < OW_CK_LIMITS; k++)
				if (ow_check_active(&s->line.limits, k))
					ow_text_num(&t, r->pts[i].worst[k], 1);
		}
		ow_text_add(&t, "\n");
	}
	if (*p || i >= total) {
		ow_text_done(&t, out, d);
		free(*out);
		*out = NULL;
		return ow_diag_set(d, OW_EARG,
		                   "grid.csv does not match the "
		                   "grid");
	}
	return ow_text_done(&t, out, d);
}

static int add_inputs(cJSON *o, const struct ow_spread *sp)
{
	cJSON *a = cJSON_AddArrayToObject(o, "inputs");
	int i, ok = a != NULL;

	for (i = 0; ok && i < sp->n; i++) {
		const struct ow_spread_input *in = &sp->in[i];
		cJSON *e = cJSON_CreateObject();
		double lo, hi;

		ow_spread_extent(in, &lo, &hi);
		ok = e && cJSON_AddItemToArray(a, e);
		ok = ok && cJSON_AddStringToObject(e, "name", in->name);
		ok = ok &&
		     cJSON_AddStringToObject(e, "distribution",
		                             in->normal ? "normal" : "uniform");
		ok = ok && ow_json_put_num(e, "nominal", in->nominal);
		ok = ok && ow_json_put_num(e, "low", lo);
		ok = ok && ow_json_put_num(e, "high", hi);
		if (in->normal)
			ok = ok && ow_json_put_num(e, "sd", in->hi);
	}
	return ok;
}

static int add_ranking(cJSON *o, const struct ow_spread *sp,
                       const struct ow_spread_result *r)
{
	cJSON *a = cJSON_AddArrayToObject(o, "sensitivity");
	int i, ok = a != NULL;

	for (i = 0; ok && i < r->n_rank; i++) {
		cJSON *e = cJSON_CreateObject();

		ok = e && cJSON_AddItemToArray(a, e);
		ok = ok && cJSON_AddStringToObject(
		               e, "input", sp->in[r->rank[i].input].name);
		ok = ok && ow_json_put_num(e, "correlation", r->rank[i].corr);
	}
	return ok;
}

static int add_record(cJSON *root, const struct ow_spread *sp,
                      const struct ow_spread_result *r)
{
	cJSON *o = cJSON_AddObjectToObject(root, "spread");
	int ok = o != NULL;

	ok = ok && ow_json_put_num(o, "samples", r->samples);
	ok = ok && ow_json_put_num(o, "seed", (double)r->seed);
	ok = ok && ow_json_put_num(o, "level", r->level);
	ok = ok &&
	     cJSON_AddStringToObject(o, "design", "latin_hypercube") != NULL;
	ok = ok && ow_json_put_num(o, "solves", r->solves);
	ok = ok && ow_json_put_num(o, "solves_saved", r->solves_saved);
	ok = ok && add_inputs(o, sp);
	ok = ok && add_ranking(o, sp, r);
	return ok;
}

/* Keys of the window file that describe the run, not the window. */
static int run_key(const char *k)
{
	static const char *const keys[] = {
	    "title", "axis", "solves", "lattice_rpm", "lattice_axis", NULL};
	int i;

	for (i = 0; keys[i]; i++)
		if (strcmp(k, keys[i]) == 0)
			return 1;
	return 0;
}

enum ow_status ow_spread_window_json(const struct ow_study *s,
                                     const struct ow_grid *robust,
                                     const struct ow_window *w,
                                     const struct ow_spread_result *r,
                                     const char *json, char **out,
                                     struct ow_diag *d)
{
	cJSON *root = cJSON_Parse(json), *rw = NULL, *e, *next;
	char *text = NULL;
	enum ow_status st = ow_results_window_json(s, robust, w, &text, d);
	int ok;

	*out = NULL;
	if (st == OW_OK)
		rw = cJSON_Parse(text);
	free(text);
	if (st != OW_OK) {
		cJSON_Delete(root);
		return st;
	}
	ok = root && rw;
	for (e = rw ? rw->child : NULL; e; e = next) {
		next = e->next;
		if (run_key(e->string))
			cJSON_DeleteItemFromObject(rw, e->string);
	}
	ok = ok && ow_json_put_num(rw, "level", r->level);
	ok = ok && cJSON_AddItemToObject(root, "robust_window", rw);
	if (!ok)
		cJSON_Delete(rw);
	ok = ok && add_record(root, &s->spread, r);
	if (ok)
		*out = cJSON_Print(root);
	cJSON_Delete(root);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM,
		                   "window.json with the robust "
		                   "window: out of memory or not JSON");
	return OW_OK;
}

/* ---- spread.json: the run kept in the map folder --------------------------
 */

#define SPREAD_FORMAT "opwin spread"

static cJSON *num_array(const double *v, int n)
{
	cJSON *a = cJSON_CreateArray();
	int i;

	for (i = 0; a && i < n; i++)
		if (!cJSON_AddItemToArray(a, ow_json_num(v[i]))) {
			cJSON_Delete(a);
			return NULL;
		}
	return a;
}

static int save_inputs(cJSON *root, const struct ow_spread *sp)
{
	cJSON *a = cJSON_AddArrayToObject(root, "inputs");
	int i, ok = a != NULL;

	for (i = 0; ok && i < sp->n; i++) {
		const struct ow_spread_input *in = &sp->in[i];
		double v[5] = {in->kind, in->factor, in->normal, in->lo,
		               in->hi};
		cJSON *e = cJSON_CreateObject();

		ok = e && cJSON_AddItemToArray(a, e);
		ok = ok && cJSON_AddStringToObject(e, "name", in->name);
		ok = ok && ow_json_put_num(e, "nominal", in->nominal);
		ok = ok && cJSON_AddItemToObject(e, "def", num_array(v, 5));
	}
	return ok;
}

static int save_points(cJSON *root, const struct ow_spread_result *r)
{
	cJSON *a = cJSON_AddArrayToObject(root, "points");
	int i, n = r->n_rpm * r->n_axis, ok = a != NULL;

	for (i = 0; ok && i < n; i++) {
		const struct ow_spread_point *p = &r->pts[i];
		double v[3 + 2 * OW_CK_LIMITS];
		int k;

		v[0] = p->sampled;
		v[1] = p->share;
		v[2] = p->fail_bits;
		for (k = 0; k < OW_CK_LIMITS; k++) {
			v[3 + k] = p->worst[k];
			v[3 + OW_CK_LIMITS + k] = p->level_margin[k];
		}
		ok =
		    cJSON_AddItemToArray(a, num_array(v, 3 + 2 * OW_CK_LIMITS));
	}
	return ok;
}

enum ow_status ow_spread_save_json(const struct ow_study *s,
                                   const struct ow_spread_result *r, char **out,
                                   struct ow_diag *d)
{
	cJSON *root = cJSON_CreateObject(), *rk;
	double rank[2 * OW_SPREAD_MAX_INPUTS];
	int i, ok = root != NULL;

	*out = NULL;
	for (i = 0; i < r->n_rank; i++) {
		rank[2 * i] = r->rank[i].input;
		rank[2 * i + 1] = r->rank[i].corr;
	}
	ok = ok && cJSON_AddStringToObject(root, "format", SPREAD_FORMAT);
	ok = ok && ow_json_put_num(root, "samples", r->samples);
	ok = ok && ow_json_put_num(root, "seed", (double)r->seed);
	ok = ok && ow_json_put_num(root, "level", r->level);
	ok = ok && ow_json_put_num(root, "solves", r->solves);
	ok = ok && ow_json_put_num(root, "solves_saved", r->solves_saved);
	ok = ok && ow_json_put_num(root, "probe_solves", r->probe_solves);
	ok = ok && ow_json_put_num(root, "lattice_rpm", r->n_rpm);
	ok = ok && ow_json_put_num(root, "lattice_axis", r->n_axis);
	rk = ok ? num_array(rank, 2 * r->n_rank) : NULL;
	ok = ok && cJSON_AddItemToObject(root, "rank", rk);
	ok = ok && save_inputs(root, &s->spread);
	ok = ok && save_points(root, r);
	if (ok)
		*out = cJSON_PrintUnformatted(root);
	cJSON_Delete(root);
	return *out ? OW_OK : ow_diag_set(d, OW_ENOMEM, "out of memory");
}

/* a[i] as a number (null: NAN); 0 when a is not an array of n. */
static int get_nums(const cJSON *a, double *v, int n)
{
	const cJSON *e;
	int i = 0;

	if (!cJSON_IsArray(a) || cJSON_GetArraySize(a) != n)
		return 0;
	cJSON_ArrayForEach(e, a)
	{
		if (!cJSON_IsNumber(e) && !cJSON_IsNull(e))
			return 0;
		v[i++] = cJSON_IsNumber(e) ? e->valuedouble : NAN;
	}
	return 1;
}

static double get_num(const cJSON *o, const char *key)
{
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(o, key);

	return cJSON_IsNumber(v) ? v->valuedouble : NAN;
}

static int load_inputs(const cJSON *root, struct ow_spread *sp)
{
	const cJSON *a = cJSON_GetObjectItemCaseSensitive(root, "inputs"), *e;
	double v[5];

	ow_spread_default(sp);
	if (!cJSON_IsArray(a) || cJSON_GetArraySize(a) > OW_SPREAD_MAX_INPUTS)
		return 0;
	cJSON_ArrayForEach(e, a)
	{
		struct ow_spread_input *in = &sp->in[sp->n++];
		const cJSON *nm = cJSON_GetObjectItemCaseSensitive(e, "name");

		if (!get_nums(cJSON_GetObjectItemCaseSensitive(e, "def"), v,
		              5) ||
		    !cJSON_IsString(nm) || !(v[0] >= 0 && v[0] < OW_SK_COUNT) ||
		    !(v[1] >= -1 && v[1] < OW_CF_COUNT) ||
		    ((v[0] == OW_SK_VISCOSITY || v[0] == OW_SK_HEAT ||
		      v[0] == OW_SK_CALIB) &&
		     v[1] < 0))
			return 0;
		in->kind = (enum ow_spread_kind)v[0];
		in->factor = (int)v[1];
		in->normal = v[2] != 0.0;
		in->lo = v[3];
		in->hi = v[4];
		in->nominal = get_num(e, "nominal");
		snprintf(in->name, sizeof in->name, "%s", nm->valuestring);
	}
	sp->present = sp->n > 0;
	return sp->present;
}

static int load_points(const cJSON *root, struct ow_spread_result *r)
{
	const cJSON *a = cJSON_GetObjectItemCaseSensitive(root, "points"), *e;
	double v[3 + 2 * OW_CK_LIMITS];
	int i = 0, k;

	if (!cJSON_IsArray(a) || cJSON_GetArraySize(a) != r->n_rpm * r->n_axis)
		return 0;
	cJSON_ArrayForEach(e, a)
	{
		struct ow_spread_point *p = &r->pts[i++];

		if (!get_nums(e, v, 3 + 2 * OW_CK_LIMITS) ||
		    !(v[1] >= 0.0 && v[1] <= 1.0) || !(v[2] >= 0))
			return 0;
		p->sampled = v[0] != 0.0;
		p->share = v[1];
		p->fail_bits = (unsigned)v[2];
		for (k = 0; k < OW_CK_LIMITS; k++) {
			p->worst[k] = v[3 + k];
			p->level_margin[k] = v[3 + OW_CK_LIMITS + k];
		}
	}
	return 1;
}

static int load_head(const cJSON *root, const struct ow_grid *g,
                     const struct ow_spread *sp, struct ow_spread_result *r)
{
	const cJSON *f = cJSON_GetObjectItemCaseSensitive(root, "format");
	double rank[2 * OW_SPREAD_MAX_INPUTS];
	const cJSON *rk = cJSON_GetObjectItemCaseSensitive(root, "rank");
	int i;

	r->samples = (int)get_num(root, "samples");
	r->seed = (unsigned long)get_num(root, "seed");
	r->level = get_num(root, "level");
	r->solves = (int)get_num(root, "solves");
	r->solves_saved = (int)get_num(root, "solves_saved");
	r->probe_solves = (int)get_num(root, "probe_solves");
	r->n_rpm = (int)get_num(root, "lattice_rpm");
	r->n_axis = (int)get_num(root, "lattice_axis");
	r->n_rank = cJSON_GetArraySize(rk) / 2;
	if (!cJSON_IsString(f) || strcmp(f->valuestring, SPREAD_FORMAT) ||
	    r->n_rpm != g->n_rpm || r->n_axis != g->n_axis ||
	    !(r->level > 0 && r->level <= 1) || r->n_rank > sp->n ||
	    !get_nums(rk, rank, 2 * r->n_rank))
		return 0;
	for (i = 0; i < r->n_rank; i++) {
		r->rank[i].input = (int)rank[2 * i];
		r->rank[i].corr = rank[2 * i + 1];
		if (r->rank[i].input < 0 || r->rank[i].input >= sp->n)
			return 0;
	}
	return 1;
}

enum ow_status ow_spread_load_json(const char *text, const char *name,
                                   const struct ow_grid *g,
                                   struct ow_spread *sp,
                                   struct ow_spread_result **out,
                                   struct ow_diag *d)
{
	cJSON *root = cJSON_Parse(text);
	struct ow_spread_result *r = calloc(1, sizeof *r);
	size_t n = (size_t)g->n_rpm * (size_t)g->n_axis;
	int ok =
	    root && r && load_inputs(root, sp) && load_head(root, g, sp, r);

	*out = NULL;
	if (ok && !(r->pts = calloc(n, sizeof *r->pts))) {
		cJSON_Delete(root);
		ow_spread_result_destroy(r);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	ok = ok && load_points(root, r);
	cJSON_Delete(root);
	if (!ok) {
		ow_spread_result_destroy(r);
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: not the spread record of "
		                   "this map folder",
		                   name);
	}
	*out = r;
	return OW_OK;
}
