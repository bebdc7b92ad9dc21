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
		return ow_diag_set(d, OW_EARG, "grid.csv does not match the "
				   "grid");
	}
	return ow_text_done(&t, out, d);
}

static int put_num(cJSON *o, const char *key, double v)
{
	return isfinite(v) ? cJSON_AddNumberToObject(o, key, v) != NULL
			   : cJSON_AddNullToObject(o, key) != NULL;
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
		ok = ok && cJSON_AddStringToObject(e, "distribution",
						   in->normal ? "normal"
							      : "uniform");
		ok = ok && put_num(e, "nominal", in->nominal);
		ok = ok && put_num(e, "low", lo);
		ok = ok && put_num(e, "high", hi);
		if (in->normal)
			ok = ok && put_num(e, "sd", in->hi);
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
		ok = ok && put_num(e, "correlation", r->rank[i].corr);
	}
	return ok;
}

static int add_record(cJSON *root, const struct ow_spread *sp,
		      const struct ow_spread_result *r)
{
	cJSON *o = cJSON_AddObjectToObject(root, "spread");
	int ok = o != NULL;

	ok = ok && put_num(o, "samples", r->samples);
	ok = ok && put_num(o, "seed", (double)r->seed);
	ok = ok && put_num(o, "level", r->level);
	ok = ok && cJSON_AddStringToObject(o, "design",
					   "latin_hypercube") != NULL;
	ok = ok && put_num(o, "solves", r->solves);
	ok = ok && put_num(o, "solves_saved", r->solves_saved);
	ok = ok && add_inputs(o, sp);
	ok = ok && add_ranking(o, sp, r);
	return ok;
}

/* Keys of the window file that describe the run, not the window. */
static int run_key(const char *k)
{
	static const char *const keys[] = {"title", "axis", "solves",
					   "lattice_rpm", "lattice_axis",
					   NULL};
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
	ok = ok && put_num(rw, "level", r->level);
	ok = ok && cJSON_AddItemToObject(root, "robust_window", rw);
	if (!ok)
		cJSON_Delete(rw);
	ok = ok && add_record(root, &s->spread, r);
	if (ok)
		*out = cJSON_Print(root);
	cJSON_Delete(root);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM, "window.json with the robust "
				   "window: out of memory or not JSON");
	return OW_OK;
}
