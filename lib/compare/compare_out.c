/* compare_out.c - compare.json and compare.csv: machine-readable, in the
 * units their keys name (the output contract in the README), whatever system
 * people read. Each window reuses the window.json writer of one study. */
#include "ow_compare.h"
#include "text_impl.h"

#include "ow_results.h"
#include "json_num.h"

#include <cjson/cJSON.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define C_OF_K(k) ((k)-OW_ZERO_C_K)
#define MAX_DIFFS 200

static const char *const case_key[2] = {"a", "b"};

/* window.json of (s, g, w) parsed back into a cJSON object, or NULL. */
static cJSON *window_obj(const struct ow_study *s, const struct ow_grid *g,
                         const struct ow_window *w, struct ow_diag *d)
{
	char *text = NULL;
	cJSON *o;

	if (ow_results_window_json(s, g, w, &text, d) != OW_OK)
		return NULL;
	o = cJSON_Parse(text);
	free(text);
	return o;
}

static cJSON *case_window(const struct ow_compare *cmp, int k,
                          struct ow_diag *d)
{
	cJSON *o = window_obj(cmp->study[k], cmp->map[k]->grid,
	                      cmp->map[k]->window, d);

	if (o && !cJSON_AddStringToObject(o, "study", cmp->study[k]->path)) {
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

/* ---- the common window ---- */

static const char *const range_keys[] = {"output_kg_h_min", "output_kg_h_max",
                                         "melt_temp_C_min", "melt_temp_C_max",
                                         "peak_temp_C_max"};
#define N_RANGE_KEYS ((int)(sizeof range_keys / sizeof range_keys[0]))

/* Case k's own ranges and zones over the common rectangle. */
static cJSON *case_ranges(const cJSON *win)
{
	cJSON *o = cJSON_CreateObject();
	int i, ok = o != NULL;

	for (i = 0; ok && i < N_RANGE_KEYS; i++)
		ok = cJSON_AddItemToObject(
		    o, range_keys[i],
		    cJSON_Duplicate(cJSON_GetObjectItem(win, range_keys[i]),
		                    1));
	ok = ok && cJSON_AddItemToObject(
	               o, "zones",
	               cJSON_Duplicate(cJSON_GetObjectItem(win, "zones"), 1));
	if (!ok) {
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

/* The common ranges span both cases: lowest minimum, highest maximum. */
static int union_ranges(cJSON *common, const struct ow_compare *cmp)
{
	const struct ow_window *a = cmp->common[0], *b = cmp->common[1];
	double v[N_RANGE_KEYS];
	int i, ok = 1;

	if (a->empty)
		return 1; /* already null */
	v[0] = fmin(a->output_min_kg_s, b->output_min_kg_s) * 3600.0;
	v[1] = fmax(a->output_max_kg_s, b->output_max_kg_s) * 3600.0;
	v[2] = C_OF_K(fmin(a->melt_min_K, b->melt_min_K));
	v[3] = C_OF_K(fmax(a->melt_max_K, b->melt_max_K));
	v[4] = C_OF_K(fmax(a->peak_max_K, b->peak_max_K));
	for (i = 0; ok && i < N_RANGE_KEYS; i++) {
		cJSON *n = isfinite(v[i]) ? cJSON_CreateNumber(v[i])
		                          : cJSON_CreateNull();

		ok = n && cJSON_ReplaceItemInObject(common, range_keys[i], n);
	}
	return ok;
}

static cJSON *common_window(const struct ow_compare *cmp, struct ow_diag *d)
{
	struct ow_study *m[2] = {NULL, NULL};
	cJSON *w[2] = {NULL, NULL}, *out = NULL;
	int k, ok = 1;

	for (k = 0; ok && k < 2; k++) {
		m[k] =
		    ow_compare_merged_study(cmp->study[k], cmp->study[1 - k]);
		w[k] = m[k] ? window_obj(m[k], cmp->common_grid[k],
		                         cmp->common[k], d)
		            : NULL;
		ok = w[k] != NULL;
	}
	if (ok) {
		cJSON_DeleteItemFromObject(w[0], "title");
		ok = union_ranges(w[0], cmp);
		for (k = 0; ok && k < 2; k++)
			ok = cJSON_AddItemToObject(w[0], case_key[k],
			                           case_ranges(w[k]));
		if (ok) {
			out = w[0];
			w[0] = NULL;
		}
	}
	for (k = 0; k < 2; k++) {
		cJSON_Delete(w[k]);
		free(m[k]);
	}
	return out;
}

/* ---- differences ---- */

static cJSON *binding(const struct ow_window *w, const char *count_key)
{
	enum ow_check order[OW_CK_COUNT];
	int n = ow_window_binding(w, order), i, ok = 1;
	cJSON *arr = cJSON_CreateArray();

	for (i = 0; arr && ok && i < n; i++) {
		cJSON *e = cJSON_CreateObject();

		ok = e && cJSON_AddItemToArray(arr, e);
		ok = ok && cJSON_AddStringToObject(e, "limit",
		                                   ow_check_key(order[i]));
		ok = ok &&
		     ow_json_put_num(e, count_key, w->fail_count[order[i]]);
	}
	if (!ok) {
		cJSON_Delete(arr);
		return NULL;
	}
	return arr;
}

/* Checks failing in the other case where only case k is safe, most
 * points first. */
static cJSON *lost(const struct ow_compare *cmp, int k)
{
	struct ow_window tmp;
	int c;

	memset(&tmp, 0, sizeof tmp);
	for (c = 0; c < OW_CK_COUNT; c++)
		tmp.fail_count[c] = cmp->lost[k][c];
	return binding(&tmp, "points");
}

static int add_figures(cJSON *o, const struct ow_study *s,
                       const struct ow_point *pt, const struct ow_verdict *v,
                       double set_K)
{
	const char *names[OW_CK_COUNT];
	cJSON *st;
	int i, n, ok = ow_json_put_num(o, "set_C", C_OF_K(set_K));

	for (i = 0; ok && i < ow_compare_n_figures(); i++) {
		int f = ow_compare_figure_index(i);

		ok = ow_json_put_num(o, ow_results_figure_key(f),
		                     ow_results_figure(s, pt, f));
	}
	st = ok ? cJSON_AddArrayToObject(o, "status") : NULL;
	ok = st != NULL;
	n = ow_classify_names(v, names, OW_CK_COUNT);
	for (i = 0; ok && i < n; i++)
		ok = cJSON_AddItemToArray(st, cJSON_CreateString(names[i]));
	return ok;
}

static int add_delta(cJSON *o, const struct ow_compare *cmp,
                     const struct ow_cmp_point *p)
{
	int i, ok = 1;

	for (i = 0; ok && i < ow_compare_n_figures(); i++) {
		int f = ow_compare_figure_index(i);

		ok = ow_json_put_num(
		    o, ow_results_figure_key(f),
		    ow_results_figure(cmp->study[1], &p->pt[1], f) -
		        ow_results_figure(cmp->study[0], &p->pt[0], f));
	}
	return ok;
}

static cJSON *point_obj(const struct ow_compare *cmp,
                        const struct ow_cmp_point *p)
{
	cJSON *o, *c;
	int k, ok;

	if (!p->valid)
		return cJSON_CreateNull();
	o = cJSON_CreateObject();
	ok = o && ow_json_put_num(o, "rpm", p->rpm);
	ok = ok && ow_json_put_num(o, "axis_value", p->axis);
	ok = ok && ow_json_put_num(o, "barrel_setting_K", p->axis);
	for (k = 0; ok && k < 2; k++) {
		c = cJSON_AddObjectToObject(o, case_key[k]);
		ok = c && add_figures(c, cmp->study[k], &p->pt[k], &p->v[k],
		                      p->set_ref_K[k]);
	}
	c = ok ? cJSON_AddObjectToObject(o, "b_minus_a") : NULL;
	ok = c && add_delta(c, cmp, p);
	if (!ok) {
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

static int add_counts(cJSON *o, const struct ow_compare *cmp)
{
	int ok = ow_json_put_num(o, "lattice_points", cmp->n_rpm * cmp->n_axis);

	ok = ok && ow_json_put_num(o, "safe_both", cmp->count[OW_CMP_BOTH]);
	ok = ok && ow_json_put_num(o, "safe_a_only", cmp->count[OW_CMP_A_ONLY]);
	ok = ok && ow_json_put_num(o, "safe_b_only", cmp->count[OW_CMP_B_ONLY]);
	return ok &&
	       ow_json_put_num(o, "safe_neither", cmp->count[OW_CMP_NEITHER]);
}

static cJSON *differences(const struct ow_compare *cmp)
{
	cJSON *o = cJSON_CreateObject(), *b, *at;
	int k, ok = o && add_counts(o, cmp);

	b = ok ? cJSON_AddObjectToObject(o, "binding") : NULL;
	ok = b != NULL;
	for (k = 0; ok && k < 2; k++)
		ok = cJSON_AddItemToObject(
		    b, case_key[k],
		    binding(cmp->map[k]->window, "points_excluded"));
	ok = ok && cJSON_AddItemToObject(o, "only_a_safe_b_fails",
	                                 lost(cmp, OW_CMP_A));
	ok = ok && cJSON_AddItemToObject(o, "only_b_safe_a_fails",
	                                 lost(cmp, OW_CMP_B));
	at = ok ? cJSON_AddObjectToObject(o, "at") : NULL;
	ok = at != NULL;
	for (k = 0; ok && k < OW_CMP_AT_COUNT; k++)
		ok = cJSON_AddItemToObject(at,
		                           ow_compare_at_key((enum ow_cmp_at)k),
		                           point_obj(cmp, &cmp->at[k]));
	if (!ok) {
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

/* The input fields that differ, SI display. */
static cJSON *inputs(const struct ow_compare *cmp)
{
	struct ow_input_diff *e = malloc(sizeof *e * MAX_DIFFS);
	cJSON *arr = e ? cJSON_CreateArray() : NULL;
	int n, i, ok = arr != NULL;

	n = ok ? ow_compare_inputs(cmp->study[0], cmp->study[1], OW_SYS_SI, e,
	                           MAX_DIFFS)
	       : 0;
	for (i = 0; ok && i < n && i < MAX_DIFFS; i++) {
		cJSON *o = cJSON_CreateObject();

		ok = o && cJSON_AddItemToArray(arr, o);
		ok = ok && cJSON_AddStringToObject(o, "field", e[i].field);
		ok = ok && cJSON_AddStringToObject(o, "a", e[i].a);
		ok = ok && cJSON_AddStringToObject(o, "b", e[i].b);
	}
	free(e);
	if (!ok) {
		cJSON_Delete(arr);
		return NULL;
	}
	return arr;
}

enum ow_status ow_compare_json(const struct ow_compare *cmp, char **out,
                               struct ow_diag *d)
{
	cJSON *r = cJSON_CreateObject();
	int k, ok = r != NULL;

	*out = NULL;
	for (k = 0; ok && k < 2; k++)
		ok = cJSON_AddItemToObject(r, case_key[k],
		                           case_window(cmp, k, d));
	ok = ok && cJSON_AddItemToObject(r, "common", common_window(cmp, d));
	ok = ok && cJSON_AddBoolToObject(r, "aligned_on_shift", cmp->by_shift);
	{
		char how[320];

		ok = ok &&
		     cJSON_AddStringToObject(
		         r, "alignment",
		         ow_compare_alignment(cmp, OW_SYS_SI, how, sizeof how));
	}
	ok = ok && cJSON_AddItemToObject(r, "differences", differences(cmp));
	ok = ok && cJSON_AddItemToObject(r, "inputs", inputs(cmp));
	if (ok)
		*out = cJSON_Print(r);
	cJSON_Delete(r);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	return OW_OK;
}

/* ---- compare.csv ---- */

static void csv_head(struct ow_text *t)
{
	int f, k;

	ow_text_add(t, "rpm,axis_value,set_C");
	for (f = 0; f < ow_results_n_figures(); f++)
		for (k = 0; k < 2; k++) {
			ow_text_add(t, ",");
			ow_text_add(t, ow_results_figure_key(f));
			ow_text_add(t, k ? "_b" : "_a");
		}
	ow_text_add(t, ",barrel_setting_K,set_b_C,status_a,status_b\n");
}

enum ow_status ow_compare_csv(const struct ow_compare *cmp, char **out,
                              struct ow_diag *d)
{
	struct ow_text t = {0};
	int i, f, k, n = cmp->n_rpm * cmp->n_axis;

	csv_head(&t);
	for (i = 0; i < n; i++) {
		const struct ow_grid_point *p[2] = {&cmp->map[0]->grid->pts[i],
		                                    &cmp->map[1]->grid->pts[i]};

		if (p[0]->solved != 1 || p[1]->solved != 1)
			continue;
		ow_text_num(&t, p[0]->rpm, 0);
		ow_text_num(&t, p[0]->axis, 1);
		ow_text_num(&t, C_OF_K(p[0]->set_ref_K), 1);
		for (f = 0; f < ow_results_n_figures(); f++)
			for (k = 0; k < 2; k++)
				ow_text_num(&t,
				            ow_results_figure(cmp->study[k],
				                              &p[k]->pt, f),
				            1);
		ow_text_num(&t, p[0]->axis, 1); /* barrel_setting_K */
		ow_text_num(&t, C_OF_K(p[1]->set_ref_K), 1); /* set_b_C */
		ow_text_status(&t, &p[0]->v);
		ow_text_status(&t, &p[1]->v);
		ow_text_add(&t, "\n");
	}
	return ow_text_done(&t, out, d);
}
