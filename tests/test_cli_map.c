/* test_cli_map.c - end-to-end: `opwin point` and `opwin map` through the
 * command line, against the output contract and the window's promises. */
#include "testutil.h"
#include "clirun.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define FAST "tests/data/map-fast.json"

static void map(const char *study, const char *dir, const char *extra)
{
	struct cli_result r;
	char args[512];

	snprintf(args, sizeof args, "map %s -o %s --quiet %s", study, dir,
	         extra);
	cli_run(args, &r);
	if (r.code != 0)
		fprintf(stderr, "%s\n", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
}

/* The output contract of `point --json` and `--profile` (README). */
static void point_json_and_profile_follow_the_contract(void **state)
{
	static const char *keys[] = {
	    "output_kg_h",      "discharge_pressure_MPa",
	    "max_pressure_MPa", "discharge_bulk_temp_C",
	    "peak_temp_C",      "unmelt_fraction",
	    "max_sbr",          "power_kW",
	    "torque_Nm",        "sec_kWh_kg",
	    "barrel_heat_kW"};
	cJSON *j = cli_run_json("point demo/study-si.json --rpm 50 --json "
	                        "--profile " OW_TEST_OUT "/profile.csv");
	char *csv = cli_slurp(OW_TEST_OUT "/profile.csv");
	size_t i;
	(void)state;
	for (i = 0; i < sizeof keys / sizeof keys[0]; i++)
		(void)cli_json_num(j, keys[i]);
	(void)cli_json_num(j, "melt_complete_D");
	assert_true(cJSON_IsArray(cJSON_GetObjectItem(j, "status")));
	/* drive power from torque: P = 2 pi N T (rotational power, any
	 * mechanics text) */
	assert_rel(cli_json_num(j, "power_kW") * 1e3,
	           2.0 * OW_PI * 50.0 / 60.0 * cli_json_num(j, "torque_Nm"),
	           1e-9);
	/* specific energy = power / output: kWh/kg = kW / (kg/h) */
	assert_rel(cli_json_num(j, "sec_kWh_kg"),
	           cli_json_num(j, "power_kW") / cli_json_num(j, "output_kg_h"),
	           1e-9);
	assert_non_null(csv);
	assert_non_null(strstr(csv, "axial_D,pressure_MPa,bulk_temp_C,"
	                            "peak_temp_C,sbr,unmelt_fraction"));
	free(csv);
	cJSON_Delete(j);
}

/* People read their own units: the note of `point --units us` gives lb/h,
 * psi and degF, and its output equals the SI run's converted with NIST SP
 * 811 factors (1 lb = 0.45359237 kg). --json stays SI whatever --units. */
static void point_note_speaks_the_chosen_units(void **state)
{
	struct cli_result si, us;
	cJSON *a = cli_run_json("point " FAST " --rpm 60 --json");
	cJSON *b = cli_run_json("point " FAST " --rpm 60 --json --units us");
	double kg_h, lb_h;
	(void)state;
	cli_run("point " FAST " --rpm 60", &si);
	cli_run("point " FAST " --rpm 60 --units us", &us);
	assert_int_equal(si.code, 0);
	assert_int_equal(us.code, 0);
	assert_non_null(strstr(si.out, "kg/h"));
	assert_non_null(strstr(si.out, "MPa"));
	assert_non_null(strstr(us.out, "lb/h"));
	assert_non_null(strstr(us.out, "psi"));
	assert_non_null(strstr(us.out, "°F"));
	kg_h = atof(strstr(si.out, "output") + 6);
	lb_h = atof(strstr(us.out, "output") + 6);
	assert_rel(lb_h * 0.45359237, kg_h, 2e-3); /* printed to 0.01 */
	assert_rel(cli_json_num(a, "output_kg_h"),
	           cli_json_num(b, "output_kg_h"), 1e-12);
	cli_result_free(&si);
	cli_result_free(&us);
	cJSON_Delete(a);
	cJSON_Delete(b);
}

/* --set without a unit is read in the display system; with one it
 * converts: +18 degF as a shift is +10 K (NIST SP 811). */
static void point_set_reads_units(void **state)
{
	cJSON *a = cli_run_json("point " FAST " --rpm 60 --set 10 --json");
	cJSON *b = cli_run_json("point " FAST " --rpm 60 --set '18 degF' "
	                        "--json");
	/* a bare number is in the study's own units (here SI), not --units */
	cJSON *c = cli_run_json("point " FAST " --rpm 60 --set 10 --units us "
	                        "--json");
	(void)state;
	assert_rel(cli_json_num(a, "output_kg_h"),
	           cli_json_num(b, "output_kg_h"), 1e-9);
	assert_rel(cli_json_num(a, "peak_temp_C"),
	           cli_json_num(c, "peak_temp_C"), 1e-9);
	cJSON_Delete(a);
	cJSON_Delete(b);
	cJSON_Delete(c);
}

static int safe_point(double rpm, double axis)
{
	char args[256];
	cJSON *j, *st;
	int n;

	snprintf(args, sizeof args,
	         "point %s --rpm %.17g --set '%.17g K' "
	         "--json",
	         FAST, rpm, axis);
	j = cli_run_json(args);
	st = cJSON_GetObjectItem(j, "status");
	n = cJSON_GetArraySize(st);
	cJSON_Delete(j);
	return n == 0;
}

/* Every corner and the centre of the recommended rectangle, re-solved
 * alone, is safe; no unsafe grid point lies inside the rectangle. */
static void window_corners_and_centre_are_safe(void **state)
{
	cJSON *w, *c;
	char *grid, *line;
	double r0, r1, a0, a1;
	(void)state;
	map(FAST, OW_TEST_OUT "/map-a", "--grid 21x21");
	w = cli_read_json(OW_TEST_OUT "/map-a/window.json");
	r0 = cli_json_num(w, "rpm_min");
	r1 = cli_json_num(w, "rpm_max");
	a0 = cli_json_num(w, "axis_min");
	a1 = cli_json_num(w, "axis_max");
	c = cJSON_GetObjectItem(w, "centre");
	assert_true(r1 > r0 && a1 > a0);
	assert_true(safe_point(r0, a0) && safe_point(r0, a1));
	assert_true(safe_point(r1, a0) && safe_point(r1, a1));
	assert_true(
	    safe_point(cli_json_num(c, "rpm"), cli_json_num(c, "axis_value")));
	grid = cli_slurp(OW_TEST_OUT "/map-a/grid.csv");
	for (line = strtok(strchr(grid, '\n') + 1, "\n"); line;
	     line = strtok(NULL, "\n")) {
		double rpm = atof(line), ax = atof(strchr(line, ',') + 1);
		const char *status = strrchr(line, ',') + 1;

		if (rpm >= r0 && rpm <= r1 && ax >= a0 && ax <= a1)
			assert_int_equal(strlen(status), 0);
	}
	free(grid);
	cJSON_Delete(w);
}

/* --jobs 1 and --jobs 2 give byte-identical grid.csv (refined too). */
static void grid_is_identical_for_any_thread_count(void **state)
{
	char *a, *b;
	(void)state;
	map(FAST, OW_TEST_OUT "/map-j1", "--grid 15x13 --refine 1 --jobs 1");
	map(FAST, OW_TEST_OUT "/map-j2", "--grid 15x13 --refine 1 --jobs 2");
	a = cli_slurp(OW_TEST_OUT "/map-j1/grid.csv");
	b = cli_slurp(OW_TEST_OUT "/map-j2/grid.csv");
	assert_non_null(a);
	assert_non_null(b);
	assert_string_equal(a, b);
	free(a);
	free(b);
}

/* Distance from p to segment ab in fine-lattice cells. */
static double seg_dist(const double *p, const double *a, const double *b,
                       double sx, double sy)
{
	double ax = (a[0] - p[0]) / sx, ay = (a[1] - p[1]) / sy;
	double bx = (b[0] - p[0]) / sx, by = (b[1] - p[1]) / sy;
	double dx = bx - ax, dy = by - ay, l2 = dx * dx + dy * dy, t;

	t = l2 > 0.0 ? -(ax * dx + ay * dy) / l2 : 0.0;
	t = t < 0.0 ? 0.0 : (t > 1.0 ? 1.0 : t);
	return hypot(ax + t * dx, ay + t * dy);
}

static double nearest(const double *p, const cJSON *lines, double sx, double sy)
{
	const cJSON *l, *q;
	double best = INFINITY;

	cJSON_ArrayForEach(l, lines)
	{
		const cJSON *prev = NULL;

		cJSON_ArrayForEach(q, l)
		{
			double b[2] = {cJSON_GetArrayItem(q, 0)->valuedouble,
			               cJSON_GetArrayItem(q, 1)->valuedouble};
			if (prev) {
				double a[2] = {
				    cJSON_GetArrayItem(prev, 0)->valuedouble,
				    cJSON_GetArrayItem(prev, 1)->valuedouble};
				best = fmin(best, seg_dist(p, a, b, sx, sy));
			}
			prev = q;
		}
	}
	return best;
}

static const cJSON *lines_of(const cJSON *w, const char *limit)
{
	const cJSON *b;

	cJSON_ArrayForEach(b, cJSON_GetObjectItem(w, "boundaries")) if (
	    !strcmp(cJSON_GetObjectItem(b, "limit")->valuestring,
	            limit)) return cJSON_GetObjectItem(b, "lines");
	fail_msg("no boundary for %s", limit);
	return NULL;
}

/* --refine 2 on 21x21 places the window's boundary within one fine cell
 * of where a uniform 81x81 grid places it, with at most 40 % of its
 * solves. */
static void refinement_matches_fine_grid_with_fewer_solves(void **state)
{
	static const char *limits[] = {"window"};
	double sx = 120.0 / 80.0, sy = 60.0 / 80.0; /* fine cell: rpm, K */
	cJSON *fine, *ref;
	size_t k;
	(void)state;
	map(FAST, OW_TEST_OUT "/map-r2", "--grid 21x21 --refine 2");
	map(FAST, OW_TEST_OUT "/map-81", "--grid 81x81");
	ref = cli_read_json(OW_TEST_OUT "/map-r2/window.json");
	fine = cli_read_json(OW_TEST_OUT "/map-81/window.json");
	assert_true(cli_json_num(ref, "solves") <= 0.4 * 81 * 81);
	for (k = 0; k < sizeof limits / sizeof limits[0]; k++) {
		const cJSON *lr = lines_of(ref, limits[k]);
		const cJSON *lf = lines_of(fine, limits[k]);
		const cJSON *l, *q;
		int n = 0;

		cJSON_ArrayForEach(l, lr) cJSON_ArrayForEach(q, l)
		{
			double p[2] = {cJSON_GetArrayItem(q, 0)->valuedouble,
			               cJSON_GetArrayItem(q, 1)->valuedouble};
			assert_true(nearest(p, lf, sx, sy) <= 1.0);
			n++;
		}
		assert_true(n > 10);
	}
	cJSON_Delete(ref);
	cJSON_Delete(fine);
}

/* Limits that exclude everything: an empty window, exit 0, the binding
 * limits named, null bounds in window.json. */
static void impossible_limits_give_an_empty_window(void **state)
{
	FILE *f = fopen(OW_TEST_OUT "/empty.json", "w");
	char *text = cli_slurp(FAST), *p;
	struct cli_result r;
	cJSON *w;
	(void)state;
	assert_non_null(text);
	p = strstr(text, "\"peak_temp\": \"235 degC\"");
	assert_non_null(p);
	memcpy(p, "\"peak_temp\": \"150 degC\"", 23);
	fputs(text, f);
	fclose(f);
	free(text);
	/* the study file's relative paths: none (embedded) */
	cli_run("map " OW_TEST_OUT "/empty.json -o " OW_TEST_OUT "/map-empty "
	        "--grid 5x5",
	        &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "No safe operating point"));
	assert_non_null(strstr(r.out, "peak_temp"));
	cli_result_free(&r);
	w = cli_read_json(OW_TEST_OUT "/map-empty/window.json");
	assert_true(cJSON_IsTrue(cJSON_GetObjectItem(w, "empty")));
	assert_true(cJSON_IsNull(cJSON_GetObjectItem(w, "rpm_min")));
	assert_true(cJSON_IsNull(cJSON_GetObjectItem(w, "set_max_C")));
	cJSON_Delete(w);
}

/* An output folder that cannot be made: exit 4, nothing written. */
static void unwritable_output_exits_four(void **state)
{
	struct cli_result r;
	FILE *f = fopen(OW_TEST_OUT "/not-a-dir", "w");
	(void)state;
	fputs("x", f);
	fclose(f);
	cli_run("map " FAST " -o " OW_TEST_OUT "/not-a-dir --grid 3x3 --quiet",
	        &r);
	assert_int_equal(r.code, 4);
	cli_result_free(&r);
}

/* A reader closes the energy balance from the printed figures alone:
 * drive power + barrel heat + root heat = throughput x enthalpy rise +
 * flow work, to 0.1 % of the drive power (first law for the open system
 * hopper -> tip, Tadmor & Gogos 2006 ch. 9). The enthalpy rise is the
 * reader's own: G [c_s (T_m - T_feed) + lambda + c_m (T - T_m)] with the
 * demo resin's data (2.3 and 2.7 kJ/(kg K), 130 degC, 200 kJ/kg, feed at
 * 25 degC); the zones' heats add up to the barrel's. On the melt-fed
 * Newtonian line the flow work is Q (P_tip - P_feed) exactly
 * (incompressible melt). */
static void energy_balance_closes_from_the_printed_figures(void **state)
{
	double rpm[] = {30.0, 80.0, 120.0};
	size_t i;
	(void)state;
	for (i = 0; i < 3; i++) {
		char args[128];
		cJSON *j, *zones, *z;
		double g, t, h, in, out, sum = 0.0;

		snprintf(args, sizeof args,
		         "point demo/study-si.json --rpm %g --set 10 --json",
		         rpm[i]);
		j = cli_run_json(args);
		assert_abs(cli_json_num(j, "unmelt_fraction"), 0.0, 0.0);
		g = cli_json_num(j, "output_kg_h") / 3600.0;
		t = cli_json_num(j, "discharge_bulk_temp_C");
		h = 2300.0 * (130.0 - 25.0) + 200e3 + 2700.0 * (t - 130.0);
		assert_rel(cli_json_num(j, "enthalpy_rise_kW"), g * h * 1e-3,
		           1e-9);
		in = cli_json_num(j, "power_kW") +
		     cli_json_num(j, "barrel_heat_kW") +
		     cli_json_num(j, "root_heat_kW");
		out = g * h * 1e-3 + cli_json_num(j, "flow_work_kW");
		assert_abs(in - out, 0.0, 1e-3 * cli_json_num(j, "power_kW"));
		zones = cJSON_GetObjectItem(j, "zones");
		cJSON_ArrayForEach(z, zones) sum += cli_json_num(z, "heat_kW");
		assert_rel(sum, cli_json_num(j, "barrel_heat_kW"), 1e-9);
		cJSON_Delete(j);
	}
	{
		cJSON *j = cli_run_json("point tests/data/newtonian-rod.json "
		                        "--rpm 60 --json");

		assert_rel(
		    cli_json_num(j, "flow_work_kW") * 1e3,
		    cli_json_num(j, "output_kg_h") / 3600.0 / 760.0 *
		        (cli_json_num(j, "discharge_pressure_MPa") * 1e6 - 1.0),
		    1e-6);
		cJSON_Delete(j);
	}
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(point_json_and_profile_follow_the_contract),
	    cmocka_unit_test(energy_balance_closes_from_the_printed_figures),
	    cmocka_unit_test(point_set_reads_units),
	    cmocka_unit_test(point_note_speaks_the_chosen_units),
	    cmocka_unit_test(window_corners_and_centre_are_safe),
	    cmocka_unit_test(grid_is_identical_for_any_thread_count),
	    cmocka_unit_test(refinement_matches_fine_grid_with_fewer_solves),
	    cmocka_unit_test(impossible_limits_give_an_empty_window),
	    cmocka_unit_test(unwritable_output_exits_four),
	};
	return cmocka_run_group_tests(tests, NULL, NULL);
}
