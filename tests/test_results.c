/* test_results.c - the machine-readable outputs against the output
 * contract (README.md, "Files a map folder holds"): the figure list, the
 * columns of grid.csv and the units of its numbers, and the same files
 * written again from a map folder read back. The map is real: the demo
 * line swept on 7 x 6 points with one level of refinement. */
#include "testutil.h"
#include "testmap.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "opwin.h"
#include "ow_mapdir.h"
#include "ow_results.h"
#include "ow_sweep.h"
#include "ow_window.h"

#define MAXTOK 96

static struct ow_test_map map;

static int setup(void **state)
{
	(void)state;
	ow_test_map_make(&map, 7, 6, 1);
	return 0;
}

static int teardown(void **state)
{
	(void)state;
	ow_test_map_free(&map);
	return 0;
}

static char *read_all(const char *path)
{
	FILE *f = fopen(path, "rb");
	char *b;
	long n;

	assert_non_null(f);
	assert_int_equal(fseek(f, 0, SEEK_END), 0);
	n = ftell(f);
	rewind(f);
	b = malloc((size_t)n + 1);
	assert_non_null(b);
	assert_int_equal(fread(b, 1, (size_t)n, f), (size_t)n);
	b[n] = '\0';
	fclose(f);
	return b;
}

/* The `backticked` names of README's grid.csv paragraph, in order. */
static int readme_grid_columns(char tok[MAXTOK][48])
{
	char *r = read_all("README.md"), *p, *end;
	int n = 0;

	p = strstr(r, "`grid.csv`, one row per solved grid point:");
	assert_non_null(p);
	p += strlen("`grid.csv`");
	end = strstr(p, "`window.json`:");
	assert_non_null(end);
	while ((p = strchr(p, '`')) && p < end) {
		char *q = strchr(p + 1, '`');
		size_t len;

		assert_non_null(q);
		len = (size_t)(q - p - 1);
		assert_true(len < 48 && n < MAXTOK);
		if (len &&
		    strspn(p + 1, "abcdefghijklmnopqrstuvwxyz"
		                  "ABCDEFGHIJKLMNOPQRSTUVWXYZ_0123456789") ==
		        len) { /* a column name, not "point --json"
			          or the ";" of the status */
			memcpy(tok[n], p + 1, len);
			tok[n++][len] = '\0';
		}
		p = q + 1;
	}
	free(r);
	return n;
}

/* The figures (ow_results_figure_key, the keys of `point --json`) are
 * README's list, in its order: the names between `set_C` and the
 * per-zone demand columns. */
static void figures_are_the_readme_list(void **st)
{
	char tok[MAXTOK][48];
	int n = readme_grid_columns(tok), i, first = -1, last = -1;
	(void)st;
	for (i = 0; i < n; i++) {
		if (!strcmp(tok[i], "set_C"))
			first = i + 1;
		if (!strcmp(tok[i], "zone_N_demand_kW"))
			last = i;
	}
	assert_true(first > 0 && last > first);
	assert_int_equal(ow_results_n_figures(), last - first);
	for (i = 0; i < ow_results_n_figures(); i++)
		assert_string_equal(ow_results_figure_key(i), tok[first + i]);
}

/* Append ",name" (no comma first) to the header being built. */
static void append(char *head, size_t size, const char *name)
{
	size_t n = strlen(head), k = strlen(name);

	assert_true(n + k + 2 < size);
	if (n)
		head[n++] = ',';
	memcpy(head + n, name, k + 1);
}

/* Split one CSV line (no quoting in grid.csv) into fields. */
static int split(char *line, char **f, int max)
{
	int n = 0;

	f[n++] = line;
	for (; *line && n < max; line++)
		if (*line == ',') {
			*line = '\0';
			f[n++] = line + 1;
		}
	return n;
}

static void expect_num(const char *field, double want)
{
	if (isnan(want) || isinf(want)) {
		assert_string_equal(field, "");
		return;
	}
	assert_true(*field != '\0');
	/* printed with every digit needed to read the double back: the
	 * conversion here and the program's differ by rounding at most */
	if (!(fabs(strtod(field, NULL) - want) <= 1e-14 * fabs(want)))
		fail_msg("grid.csv field %s, expected %.17g", field, want);
}

/* grid.csv's header is README's columns (zone_N_demand_kW once per zone),
 * one row per solved point, each number in the unit its name ends with:
 * kg/h = kg/s x 3600, MPa = Pa / 1e6, degC = K - 273.15, kW = W / 1000,
 * kWh/kg = J/kg / 3.6e6, D = metres / screw diameter (SI, BIPM SI
 * Brochure, 9th ed. 2019, tables 8 and 4); status the failed checks'
 * names joined by ';'. */
static void grid_csv_has_the_readme_columns_and_units(void **st)
{
	const struct ow_study *s = map.s;
	const struct ow_grid *g = map.g;
	char tok[MAXTOK][48], *csv = NULL, *line, *save = NULL, *f[MAXTOK];
	char head[4096] = "";
	int n = readme_grid_columns(tok), i, k, rows = 0, nf;
	double D = s->screw.diameter_m;
	(void)st;
	for (i = 0; i < n; i++) {
		if (!strcmp(tok[i], "zone_N_demand_kW")) {
			for (k = 1; k <= s->line.n_zones; k++) {
				char z[32];

				snprintf(z, sizeof z, "zone_%d_demand_kW", k);
				append(head, sizeof head, z);
			}
			continue;
		}
		append(head, sizeof head, tok[i]);
	}
	assert_int_equal(ow_results_grid_csv(s, g, &csv, NULL), OW_OK);
	line = strtok_r(csv, "\n", &save);
	assert_string_equal(line, head);
	nf = n - 1 + s->line.n_zones; /* zone_N expanded */
	for (k = 0; k < g->n_rpm * g->n_axis; k++) {
		const struct ow_grid_point *p = &g->pts[k];
		const struct ow_point *pt = &p->pt;
		const char *names[OW_CK_COUNT];
		char status[256] = "";
		int m, c;

		if (p->solved != 1)
			continue;
		line = strtok_r(NULL, "\n", &save);
		assert_non_null(line);
		rows++;
		/* the status may be empty: a line ending in ',' */
		assert_int_equal(split(line, f, MAXTOK), nf);
		expect_num(f[0], p->rpm);
		expect_num(f[1], p->axis);
		expect_num(f[2], p->set_ref_K - 273.15);
		expect_num(f[3], pt->output_kg_s * 3600.0);
		expect_num(f[4], pt->discharge_pressure_Pa / 1e6);
		expect_num(f[5], pt->max_pressure_Pa / 1e6);
		expect_num(f[6], pt->discharge_bulk_K - 273.15);
		expect_num(f[7], pt->discharge_peak_K - 273.15);
		expect_num(f[8], pt->peak_K - 273.15);
		expect_num(f[9], pt->unmelt_frac);
		expect_num(f[10], pt->melt_complete_m / D);
		expect_num(f[11], pt->max_sbr);
		expect_num(f[12], pt->power_W / 1e3);
		expect_num(f[13], pt->torque_Nm);
		expect_num(f[14], pt->sec_J_kg / 3.6e6);
		expect_num(f[15], pt->barrel_heat_W / 1e3);
		expect_num(f[16], pt->residence_s);
		expect_num(f[17], pt->melt_start_m / D);
		expect_num(f[18], pt->max_pressure_at_m / D);
		expect_num(f[19], pt->peak_at_m / D);
		expect_num(f[20], pt->energy_residual);
		expect_num(f[21], pt->feed_capacity_kg_s * 3600.0);
		expect_num(f[22], pt->plug_ratio);
		expect_num(f[23], pt->zone_load);
		expect_num(f[24], pt->root_heat_W / 1e3);
		expect_num(f[25], pt->enthalpy_rise_W / 1e3);
		expect_num(f[26], pt->flow_work_W / 1e3);
		for (c = 0; c < s->line.n_zones; c++)
			expect_num(f[27 + c], pt->zone_demand_W[c] / 1e3);
		expect_num(f[27 + s->line.n_zones], p->axis);
		m = ow_classify_names(&p->v, names, OW_CK_COUNT);
		for (c = 0; c < m; c++) {
			if (c)
				strcat(status, ";");
			assert_true(strlen(status) + strlen(names[c]) <
			            sizeof status);
			strcat(status, names[c]);
		}
		assert_string_equal(f[nf - 1], status);
		/* every failed check is named (ow_classify.h's keys) */
		for (c = 0; c < OW_CK_COUNT; c++)
			if (p->v.bits & (1u << c))
				assert_non_null(strstr(
				    status, ow_check_key((enum ow_check)c)));
	}
	assert_null(strtok_r(NULL, "\n", &save));
	assert_int_equal(rows, g->solves);
	free(csv);
}

static void rm_dir(const char *dir)
{
	char cmd[160];

	snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
	assert_int_equal(system(cmd), 0);
}

/* Saved to a map folder and read back (ow_mapdir_load, what `opwin
 * report` redraws from), the lattice gives grid.csv and window.json
 * byte for byte as the run wrote them. */
static void outputs_round_trip_through_a_map_folder(void **st)
{
	char dir[64] = "/tmp/test_results.XXXXXX";
	struct ow_study s2;
	struct ow_grid *g2 = NULL;
	struct ow_window *w2 = NULL;
	struct ow_diag d = {{0}};
	char *a = NULL, *b = NULL;
	(void)st;
	assert_non_null(mkdtemp(dir));
	if (ow_mapdir_save(map.s, map.g, &map.centre, map.rows, map.n_rows, dir,
	                   &d) != OW_OK ||
	    ow_mapdir_load(map.u, dir, &s2, &g2, NULL, &d) != OW_OK)
		fail_msg("map folder: %s", d.msg);
	assert_int_equal(ow_results_grid_csv(map.s, map.g, &a, NULL), OW_OK);
	assert_int_equal(ow_results_grid_csv(&s2, g2, &b, NULL), OW_OK);
	assert_string_equal(b, a);
	free(a);
	free(b);
	assert_int_equal(ow_window_extract(&s2, g2, &w2, NULL), OW_OK);
	assert_int_equal(ow_results_window_json(map.s, map.g, map.w, &a, NULL),
	                 OW_OK);
	assert_int_equal(ow_results_window_json(&s2, g2, w2, &b, NULL), OW_OK);
	assert_string_equal(b, a);
	free(a);
	free(b);
	ow_window_destroy(w2);
	ow_grid_destroy(g2);
	rm_dir(dir);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(figures_are_the_readme_list),
	    cmocka_unit_test(grid_csv_has_the_readme_columns_and_units),
	    cmocka_unit_test(outputs_round_trip_through_a_map_folder),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
