/* test_mapdir.c - a saved map folder loads back to the same lattice, the
 * same window and the same inputs, and damaged or foreign folders are
 * refused with a message naming the file. The data are real: the demo
 * line swept on a small grid with one level of refinement, so the lattice
 * holds points the sweep never solved. */
#include "testutil.h"
#include "clirun.h"
#include "testmap.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "opwin.h"
#include "ow_mapdir.h"
#include "ow_sweep.h"
#include "ow_window.h"

struct fx {
	struct ow_test_map m;
	char dir[64];
};

static void rm_dir(const char *dir)
{
	char cmd[160];

	snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
	assert_int_equal(system(cmd), 0);
}

static int setup(void **state)
{
	struct fx *f = calloc(1, sizeof *f);
	struct ow_diag d = {{0}};

	assert_non_null(f);
	ow_test_map_make(&f->m, 7, 6, 1);
	strcpy(f->dir, "/tmp/test_mapdir.XXXXXX");
	assert_non_null(mkdtemp(f->dir));
	assert_int_equal(ow_mapdir_save(f->m.s, f->m.g, &f->m.centre, f->m.rows,
	                                f->m.n_rows, f->dir, &d),
	                 OW_OK);
	*state = f;
	return 0;
}

static int teardown(void **state)
{
	struct fx *f = *state;

	rm_dir(f->dir);
	ow_test_map_free(&f->m);
	free(f);
	return 0;
}

struct loaded {
	struct ow_study s;
	struct ow_grid *g;
	struct ow_mapdir_centre c;
};

static void load(const struct fx *f, struct loaded *L)
{
	struct ow_diag d = {{0}};
	enum ow_status st =
	    ow_mapdir_load(f->m.u, f->dir, &L->s, &L->g, &L->c, &d);

	if (st != OW_OK)
		fprintf(stderr, "%s\n", d.msg);
	assert_int_equal(st, OW_OK);
}

static void unload(struct loaded *L)
{
	ow_grid_destroy(L->g);
	ow_mapdir_centre_free(&L->c);
}

/* Two doubles equal bit for bit, NaN equal to NaN. */
static void same(double a, double b)
{
	if (isnan(b))
		assert_true(isnan(a));
	else
		assert_true(a == b);
}

static void same_point(const struct ow_grid_point *a,
                       const struct ow_grid_point *b, int n_zones)
{
	int k;

	assert_int_equal(a->solved == 1, b->solved == 1);
	assert_int_equal(a->v.bits, b->v.bits);
	same(a->rpm, b->rpm);
	same(a->axis, b->axis);
	same(a->set_ref_K, b->set_ref_K);
	if (b->solved != 1)
		return;
	for (k = 0; k < OW_CK_LIMITS; k++)
		same(a->v.margin[k], b->v.margin[k]);
	assert_int_equal(a->pt.flags, b->pt.flags);
	same(a->pt.output_kg_s, b->pt.output_kg_s);
	same(a->pt.peak_K, b->pt.peak_K);
	same(a->pt.melt_complete_m, b->pt.melt_complete_m);
	same(a->pt.sec_J_kg, b->pt.sec_J_kg);
	for (k = 0; k < n_zones; k++) {
		same(a->pt.set_K[k], b->pt.set_K[k]);
		same(a->pt.zone_heat_W[k], b->pt.zone_heat_W[k]);
	}
}

static void mapdir_reload_gives_every_lattice_point_back(void **state)
{
	const struct fx *f = *state;
	struct loaded L;
	int i, unsolved = 0;

	load(f, &L);
	assert_int_equal(L.g->n_rpm, f->m.g->n_rpm);
	assert_int_equal(L.g->n_axis, f->m.g->n_axis);
	assert_int_equal(L.g->stride, 2);
	assert_int_equal(L.g->solves, f->m.g->solves);
	for (i = 0; i < f->m.g->n_rpm * f->m.g->n_axis; i++) {
		same_point(&L.g->pts[i], &f->m.g->pts[i], f->m.s->line.n_zones);
		unsolved += f->m.g->pts[i].solved != 1;
	}
	assert_true(unsolved > 0); /* refinement left points unsolved */
	unload(&L);
}

static void same_boundaries(const struct ow_window *a,
                            const struct ow_window *b)
{
	int k, l, i;

	assert_int_equal(a->n_boundaries, b->n_boundaries);
	for (k = 0; k < b->n_boundaries; k++) {
		assert_int_equal(a->bounds[k].check, b->bounds[k].check);
		assert_int_equal(a->bounds[k].n_lines, b->bounds[k].n_lines);
		for (l = 0; l < b->bounds[k].n_lines; l++) {
			const struct ow_polyline *p = &a->bounds[k].lines[l];
			const struct ow_polyline *q = &b->bounds[k].lines[l];

			assert_int_equal(p->n, q->n);
			for (i = 0; i < q->n; i++) {
				same(p->p[i].rpm, q->p[i].rpm);
				same(p->p[i].axis, q->p[i].axis);
			}
		}
	}
}

static void mapdir_reload_then_extract_gives_the_same_window(void **state)
{
	const struct fx *f = *state;
	struct ow_window *w = NULL;
	struct loaded L;
	int z;

	load(f, &L);
	assert_int_equal(ow_window_extract(&L.s, L.g, &w, NULL), OW_OK);
	assert_int_equal(w->empty, 0);
	assert_int_equal(w->ir0, f->m.w->ir0);
	assert_int_equal(w->ir1, f->m.w->ir1);
	assert_int_equal(w->ia0, f->m.w->ia0);
	assert_int_equal(w->ia1, f->m.w->ia1);
	same(w->rpm_min, f->m.w->rpm_min);
	same(w->rpm_max, f->m.w->rpm_max);
	same(w->set_min_K, f->m.w->set_min_K);
	same(w->set_max_K, f->m.w->set_max_K);
	same(w->centre.rpm, f->m.w->centre.rpm);
	same(w->centre.axis, f->m.w->centre.axis);
	same(w->centre_set_K, f->m.w->centre_set_K);
	same(w->output_min_kg_s, f->m.w->output_min_kg_s);
	same(w->output_max_kg_s, f->m.w->output_max_kg_s);
	same(w->melt_max_K, f->m.w->melt_max_K);
	same(w->peak_max_K, f->m.w->peak_max_K);
	same(w->safe_fraction, f->m.w->safe_fraction);
	for (z = 0; z < f->m.s->line.n_zones; z++) {
		same(w->zone_min_K[z], f->m.w->zone_min_K[z]);
		same(w->zone_max_K[z], f->m.w->zone_max_K[z]);
	}
	same_boundaries(w, f->m.w);
	ow_window_destroy(w);
	unload(&L);
}

static void mapdir_reload_keeps_sources_crc_and_file_names(void **state)
{
	const struct fx *f = *state;
	struct loaded L;
	int k;

	load(f, &L);
	assert_int_equal(L.s.input_crc, f->m.s->input_crc);
	assert_string_equal(L.s.path, "demo/study-si.json");
	assert_string_equal(L.s.screw_path, f->m.s->screw_path);
	assert_string_equal(L.s.resin_path, f->m.s->resin_path);
	assert_string_equal(L.s.title, f->m.s->title);
	assert_string_equal(L.s.screw.name, f->m.s->screw.name);
	assert_int_equal(L.s.n_sources, f->m.s->n_sources);
	assert_true(f->m.s->n_sources > 10);
	for (k = 0; k < f->m.s->n_sources; k++) {
		assert_string_equal(L.s.sources[k].key, f->m.s->sources[k].key);
		assert_string_equal(L.s.sources[k].value,
		                    f->m.s->sources[k].value);
		assert_string_equal(L.s.sources[k].text,
		                    f->m.s->sources[k].text);
	}
	same(L.s.resin.visc.zero_shear_Pa_s,
	     f->m.s->resin.visc.zero_shear_Pa_s);
	same(L.s.line.zones[2].set_K, f->m.s->line.zones[2].set_K);
	unload(&L);
}

static void mapdir_study_embeds_screw_and_resin_with_sources(void **state)
{
	const struct fx *f = *state;
	char path[128], *text;
	const cJSON *screw, *dia;
	cJSON *doc;

	snprintf(path, sizeof path, "%s/study.json", f->dir);
	text = cli_slurp(path);
	doc = cJSON_Parse(text);
	assert_non_null(doc);
	screw = cJSON_GetObjectItemCaseSensitive(doc, "screw");
	assert_true(cJSON_IsObject(screw));
	assert_true(
	    cJSON_IsObject(cJSON_GetObjectItemCaseSensitive(doc, "resin")));
	dia = cJSON_GetObjectItemCaseSensitive(screw, "diameter");
	assert_true(cJSON_IsObject(dia));
	assert_string_equal(
	    cJSON_GetObjectItemCaseSensitive(dia, "value")->valuestring,
	    "63.5 mm");
	assert_non_null(cJSON_GetObjectItemCaseSensitive(dia, "source"));
	cJSON_Delete(doc);
	free(text);
}

static void mapdir_reload_gives_the_centre_point_and_profile(void **state)
{
	const struct fx *f = *state;
	const struct ow_profile_row *rows;
	struct loaded L;
	int i, z;

	load(f, &L);
	assert_true(L.c.valid);
	same(L.c.pt.rpm, f->m.centre.rpm);
	same(L.c.pt.output_kg_s, f->m.centre.output_kg_s);
	same(L.c.pt.discharge_bulk_K, f->m.centre.discharge_bulk_K);
	same(L.c.pt.peak_K, f->m.centre.peak_K);
	same(L.c.pt.plugging_at_m, f->m.centre.plugging_at_m); /* NAN */
	assert_int_equal(L.c.pt.flags, f->m.centre.flags);
	for (z = 0; z < f->m.s->line.n_zones; z++)
		same(L.c.pt.set_K[z], f->m.centre.set_K[z]);
	rows = L.c.rows;
	assert_int_equal(L.c.n_rows, f->m.n_rows);
	for (i = 0; i < f->m.n_rows; i++) {
		/* through mm, MPa and degC with 17 digits: a few ulps */
		assert_rel(rows[i].axial_m + 1e-9, f->m.rows[i].axial_m + 1e-9,
		           1e-12);
		assert_rel(rows[i].pressure_Pa, f->m.rows[i].pressure_Pa,
		           1e-12);
		assert_rel(rows[i].depth_m, f->m.rows[i].depth_m, 1e-12);
		assert_rel(rows[i].sbr + 1.0, f->m.rows[i].sbr + 1.0, 1e-12);
		if (isnan(f->m.rows[i].bulk_K))
			assert_true(isnan(rows[i].bulk_K));
		else
			assert_rel(rows[i].bulk_K, f->m.rows[i].bulk_K, 1e-12);
	}
	unload(&L);
}

static void expect_refusal(const struct fx *f, const char *dir,
                           const char *words)
{
	struct ow_diag d = {{0}};
	struct ow_grid *g = (struct ow_grid *)1;
	struct ow_study *s = calloc(1, sizeof *s);

	assert_int_equal(ow_mapdir_load(f->m.u, dir, s, &g, NULL, &d),
	                 OW_EINPUT);
	assert_null(g);
	if (!strstr(d.msg, words))
		fprintf(stderr, "message: %s\n", d.msg);
	assert_non_null(strstr(d.msg, words));
	free(s);
}

static void mapdir_load_refuses_a_missing_or_foreign_folder(void **state)
{
	const struct fx *f = *state;
	char dir[] = "/tmp/test_mapdir_empty.XXXXXX";

	expect_refusal(f, "/tmp/no/such/map/folder", "no such folder");
	expect_refusal(f, "demo",
	               "not a map folder: points-si.json is missing");
	assert_non_null(mkdtemp(dir));
	expect_refusal(f, dir, "not a map folder");
	rm_dir(dir);
}

/* Copy the saved folder, then spoil one file of the copy. */
static void spoil(const struct fx *f, const char *copy, const char *file,
                  const char *sed)
{
	char cmd[512];

	snprintf(cmd, sizeof cmd,
	         "rm -rf '%s' && cp -r '%s' '%s' && "
	         "sed -i '%s' '%s/%s'",
	         copy, f->dir, copy, sed, copy, file);
	assert_int_equal(system(cmd), 0);
}

static void mapdir_load_refuses_damaged_files_naming_them(void **state)
{
	const struct fx *f = *state;
	const char *copy = "/tmp/test_mapdir_spoilt";

	/* status bits of the first solved row changed */
	spoil(f, copy, "points-si.csv",
	      "2s/^\\([0-9]*,[0-9]*\\),[0-9]*,/\\1,4095,/");
	expect_refusal(f, copy, "points-si.csv: line 2");
	spoil(f, copy, "points-si.csv", "3s/,[^,]*$/,12x/");
	expect_refusal(f, copy, "points-si.csv: line 3, column");
	spoil(f, copy, "points-si.json", "s/\"stride\":.*/\"stride\": 3,/");
	expect_refusal(f, copy, "points-si.json: stride");
	spoil(f, copy, "points-si.json", "s/\"peak_temp\"/\"hot\"/");
	expect_refusal(f, copy, "points-si.json: checks");
	spoil(f, copy, "study.json", "s/\"title\"/\"tittle\"/");
	expect_refusal(f, copy, "study.json");
	rm_dir(copy);
}

static void mapdir_save_refuses_inputs_changed_since_loading(void **state)
{
	const struct fx *f = *state;
	char dir[] = "/tmp/test_mapdir_in.XXXXXX", path[96], cmd[256];
	struct ow_study *s = calloc(1, sizeof *s);
	struct ow_diag d = {{0}};

	assert_non_null(mkdtemp(dir));
	snprintf(cmd, sizeof cmd,
	         "cp demo/study-si.json demo/screw-si.json "
	         "demo/resin-si.json '%s'",
	         dir);
	assert_int_equal(system(cmd), 0);
	snprintf(path, sizeof path, "%s/study-si.json", dir);
	assert_int_equal(ow_config_load_study(f->m.u, path, s, &d), OW_OK);
	snprintf(cmd, sizeof cmd,
	         "sed -i 's/950 kg/951 kg/' '%s/resin-si.json'", dir);
	assert_int_equal(system(cmd), 0);
	assert_int_equal(ow_mapdir_save(s, f->m.g, NULL, NULL, 0, dir, &d),
	                 OW_EINPUT);
	assert_non_null(strstr(d.msg, "changed since they were loaded"));
	snprintf(path, sizeof path, "%s/points-si.json", dir);
	assert_int_equal(access(path, F_OK), -1); /* nothing half-saved */
	rm_dir(dir);
	free(s);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(mapdir_reload_gives_every_lattice_point_back),
	    cmocka_unit_test(mapdir_reload_then_extract_gives_the_same_window),
	    cmocka_unit_test(mapdir_reload_keeps_sources_crc_and_file_names),
	    cmocka_unit_test(mapdir_study_embeds_screw_and_resin_with_sources),
	    cmocka_unit_test(mapdir_reload_gives_the_centre_point_and_profile),
	    cmocka_unit_test(mapdir_load_refuses_a_missing_or_foreign_folder),
	    cmocka_unit_test(mapdir_load_refuses_damaged_files_naming_them),
	    cmocka_unit_test(mapdir_save_refuses_inputs_changed_since_loading),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
