/* test_cli_compare.c - end-to-end: `opwin compare` through the command
 * line: the common window re-solved point by point with `opwin point`,
 * compare.csv against compare.json, a worn screw against the new one,
 * refusal of studies whose sweeps differ, and the files written. */
#include "testutil.h"
#include "clirun.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#define FAST "tests/data/map-fast.json"
#define WORN "tests/data/compare-fast-worn.json"
#define OUT  OW_TEST_OUT "/cmp-fast"

static int ran;

static const cJSON *obj(const cJSON *o, const char *key)
{
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(o, key);

	if (!v)
		fail_msg("key %s is missing", key);
	return v;
}

/* One compare run shared by the tests that read its files. */
static void compare_fast(void)
{
	struct cli_result r;

	if (ran)
		return;
	cli_run("compare " FAST " " WORN " -o " OUT " --quiet --jobs 2 "
	        "--date 2024-01-02 --label-a new --label-b worn",
	        &r);
	if (r.code != 0)
		fprintf(stderr, "%s\n", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	ran = 1;
}

/* Is (rpm, axis) safe for study, solved alone by `opwin point`? */
static int safe_point(const char *study, double rpm, double axis)
{
	struct cli_result r;
	char args[512];
	cJSON *j;
	int n;

	snprintf(args, sizeof args,
	         "point %s --rpm %.17g --set '%.17g K' "
	         "--json",
	         study, rpm, axis);
	cli_run(args, &r);
	assert_int_equal(r.code, 0);
	j = cJSON_Parse(r.out);
	assert_non_null(j);
	n = cJSON_GetArraySize(cJSON_GetObjectItem(j, "status"));
	cJSON_Delete(j);
	cli_result_free(&r);
	return n == 0;
}

static int safe_in_both(double rpm, double axis)
{
	return safe_point(FAST, rpm, axis) && safe_point(WORN, rpm, axis);
}

/* Issue acceptance: every corner and the centre of the common rectangle
 * is safe for both cases when re-solved with `opwin point`. */
static void common_corners_and_centre_are_safe_for_both(void **state)
{
	cJSON *j;
	const cJSON *c, *ctr;
	double r0, r1, a0, a1;
	(void)state;
	compare_fast();
	j = cli_read_json(OUT "/compare.json");
	c = obj(j, "common");
	r0 = cli_json_num(c, "rpm_min");
	r1 = cli_json_num(c, "rpm_max");
	a0 = cli_json_num(c, "axis_min");
	a1 = cli_json_num(c, "axis_max");
	assert_true(r1 > r0 && a1 > a0);
	assert_true(safe_in_both(r0, a0));
	assert_true(safe_in_both(r0, a1));
	assert_true(safe_in_both(r1, a0));
	assert_true(safe_in_both(r1, a1));
	ctr = obj(c, "centre");
	assert_true(safe_in_both(cli_json_num(ctr, "rpm"),
	                         cli_json_num(ctr, "axis_value")));
	cJSON_Delete(j);
}

/* Issue acceptance: the common window is contained in each case's window
 * (as lattice point sets): every row of compare.csv inside the common
 * rectangle is safe in both, and the counts agree with compare.json. */
static void common_window_is_contained_in_each_case(void **state)
{
	cJSON *j;
	const cJSON *c, *d;
	char *csv, *line, *save = NULL;
	double r0, r1, a0, a1;
	int rows = 0, both = 0, a_only = 0, b_only = 0;
	(void)state;
	compare_fast();
	j = cli_read_json(OUT "/compare.json");
	c = obj(j, "common");
	d = obj(j, "differences");
	r0 = cli_json_num(c, "rpm_min");
	r1 = cli_json_num(c, "rpm_max");
	a0 = cli_json_num(c, "axis_min");
	a1 = cli_json_num(c, "axis_max");
	csv = cli_slurp(OUT "/compare.csv");
	assert_non_null(csv);
	assert_non_null(strstr(csv, "rpm,axis_value,set_C,output_kg_h_a,"
	                            "output_kg_h_b,"));
	for (line = strtok_r(strchr(csv, '\n') + 1, "\n", &save); line;
	     line = strtok_r(NULL, "\n", &save)) {
		double rpm = atof(line), ax = atof(strchr(line, ',') + 1);
		const char *sb = strrchr(line, ',') + 1, *sa = sb - 2;
		int safe_a, safe_b = *sb == '\0';

		while (sa > line && *sa != ',')
			sa--;
		safe_a = sa[1] == ',';
		rows++;
		both += safe_a && safe_b;
		a_only += safe_a && !safe_b;
		b_only += !safe_a && safe_b;
		if (rpm >= r0 && rpm <= r1 && ax >= a0 && ax <= a1)
			assert_true(safe_a && safe_b);
	}
	assert_int_equal(
	    rows, (int)cli_json_num(d, "lattice_points")); /* no refine */
	assert_int_equal(both, (int)cli_json_num(d, "safe_both"));
	assert_int_equal(a_only, (int)cli_json_num(d, "safe_a_only"));
	assert_int_equal(b_only, (int)cli_json_num(d, "safe_b_only"));
	assert_true(cli_json_num(c, "safe_fraction") <=
	            cli_json_num(obj(j, "a"), "safe_fraction"));
	assert_true(cli_json_num(c, "safe_fraction") <=
	            cli_json_num(obj(j, "b"), "safe_fraction"));
	free(csv);
	cJSON_Delete(j);
}

/* Issue acceptance, common practice: the worn screw gives less
 * throughput at the same speed and a smaller or shifted window (flights
 * worn from 0.06 to 0.4 mm leak melt back; pressure-driven leakage grows
 * with the cube of the clearance, Crawford, Plastics Engineering, 3rd
 * ed., 1998, sec. 4.2, eq. 4.8). */
static void worn_screw_shows_less_output_and_another_window(void **state)
{
	static const char *keys[] = {"rpm_min", "rpm_max", "axis_min",
	                             "axis_max"};
	cJSON *j;
	const cJSON *a, *b, *at, *p;
	size_t k;
	int moved = 0;
	(void)state;
	compare_fast();
	j = cli_read_json(OUT "/compare.json");
	a = obj(j, "a");
	b = obj(j, "b");
	for (k = 0; k < sizeof keys / sizeof keys[0]; k++)
		moved |= cli_json_num(a, keys[k]) != cli_json_num(b, keys[k]);
	assert_true(moved || cli_json_num(b, "safe_fraction") <
	                         cli_json_num(a, "safe_fraction"));
	at = obj(obj(j, "differences"), "at");
	for (p = at->child; p; p = p->next) {
		double qa = cli_json_num(obj(p, "a"), "output_kg_h");
		double qb = cli_json_num(obj(p, "b"), "output_kg_h");

		assert_true(qb < qa);
		assert_rel(cli_json_num(obj(p, "b_minus_a"), "output_kg_h"),
		           qb - qa, 1e-12);
	}
	for (p = obj(j, "inputs")->child; p; p = p->next)
		if (!strcmp(obj(p, "field")->valuestring,
		            "screw.wear[0].clearance"))
			break;
	assert_non_null(p);
	assert_string_equal(obj(p, "b")->valuestring, "0.4 mm");
	cJSON_Delete(j);
}

/* A copy of the fast study with its text edited: from -> to. */
static void variant(const char *path, const char *from, const char *to)
{
	char *text = cli_slurp(FAST), *at;
	FILE *f = fopen(path, "w");

	assert_non_null(text);
	assert_non_null(f);
	at = strstr(text, from);
	assert_non_null(at);
	*at = '\0';
	fprintf(f, "%s%s%s", text, to, at + strlen(from));
	fclose(f);
	free(text);
}

static void studies_whose_sweeps_differ_are_refused(void **state)
{
	struct cli_result r;
	(void)state;
	variant(OW_TEST_OUT "/cmp-steps.json", "\"steps\": 11",
	        "\"steps\": 21");
	cli_run("compare " FAST " " OW_TEST_OUT
	        "/cmp-steps.json -o " OW_TEST_OUT "/cmp-refused --quiet",
	        &r);
	assert_int_equal(r.code, 1);
	assert_non_null(strstr(r.err, "sweep.rpm.steps"));
	assert_non_null(strstr(r.err, FAST));
	assert_non_null(strstr(r.err, OW_TEST_OUT "/cmp-steps.json"));
	cli_result_free(&r);
	variant(OW_TEST_OUT "/cmp-mode.json",
	        "\"mode\": \"shift\",\n      \"from\": \"-30 K\",\n"
	        "      \"to\": \"30 K\"",
	        "\"mode\": \"zone\", \"zone\": 2, \"from\": \"170 degC\", "
	        "\"to\": \"230 degC\"");
	cli_run("compare " OW_TEST_OUT "/cmp-mode.json " FAST
	        " --quiet -o " OW_TEST_OUT "/cmp-refused",
	        &r);
	assert_int_equal(r.code, 1);
	assert_non_null(strstr(r.err, "sweep.barrel.mode"));
	assert_non_null(strstr(r.err, "give both studies the same sweep"));
	cli_result_free(&r);
	/* --grid sets one lattice for both: the steps no longer matter */
	cli_run("compare " FAST " " OW_TEST_OUT "/cmp-steps.json --grid 6x5 "
	        "--quiet -o " OW_TEST_OUT "/cmp-grid",
	        &r);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	cli_run("compare " FAST " --quiet", &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
}

/* Two resins at their own set-points (the documented fixture pair: same
 * screw, die and sweep, LDPE zones 20 K below HDPE's) are compared on the
 * shift from each one's own set-points, and each case's window is given
 * in its own zones' temperatures. */
static void two_resins_at_their_own_set_points_are_compared(void **state)
{
	struct cli_result r;
	cJSON *j;
	const cJSON *b;
	(void)state;
	cli_run("compare fixtures/studies/hdpe-sf.json "
	        "fixtures/studies/ldpe-sf.json --grid 6x6 --jobs 2 --quiet "
	        "-o build/tests/cmp-resins",
	        &r);
	if (r.code != 0)
		fprintf(stderr, "%s\n", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	j = cli_read_json("build/tests/cmp-resins/compare.json");
	assert_true(cJSON_IsTrue(obj(j, "aligned_on_shift")));
	assert_non_null(
	    strstr(obj(j, "alignment")->valuestring, "own barrel set-points"));
	b = obj(j, "b");
	if (!cJSON_IsNull(obj(b, "set_min_C"))) {
		/* B's last zone is 180 degC, swept -20..+30 K */
		assert_true(cli_json_num(b, "set_min_C") >= 160.0 - 1e-9);
		assert_true(cli_json_num(b, "set_max_C") <= 210.0 + 1e-9);
	}
	cJSON_Delete(j);
}

static long file_size(const char *path)
{
	struct stat st;

	return stat(path, &st) == 0 ? (long)st.st_size : -1;
}

/* The overlay map and the PDF exist; the PDF names both cases, lists the
 * differing input field and carries the comparison table. */
static void maps_and_pdf_are_written(void **state)
{
	(void)state;
	compare_fast();
	assert_true(file_size(OUT "/compare.png") > 1000);
	assert_true(file_size(OUT "/compare.svg") > 1000);
	assert_true(file_size(OUT "/compare.pdf") > 1000);
	assert_int_equal(system("pdftotext -layout " OUT "/compare.pdf " OUT
	                        "/compare.txt 2>/dev/null"),
	                 0);
	{
		char *txt = cli_slurp(OUT "/compare.txt");

		assert_non_null(txt);
		assert_non_null(strstr(txt, "screw.wear[0].clearance"));
		assert_non_null(strstr(txt, "0.4 mm"));
		assert_non_null(strstr(txt, "worn"));
		assert_non_null(strstr(txt, "throughput"));
		assert_non_null(strstr(txt, "2024-01-02"));
		free(txt);
	}
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(common_corners_and_centre_are_safe_for_both),
	    cmocka_unit_test(common_window_is_contained_in_each_case),
	    cmocka_unit_test(worn_screw_shows_less_output_and_another_window),
	    cmocka_unit_test(studies_whose_sweeps_differ_are_refused),
	    cmocka_unit_test(two_resins_at_their_own_set_points_are_compared),
	    cmocka_unit_test(maps_and_pdf_are_written),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
