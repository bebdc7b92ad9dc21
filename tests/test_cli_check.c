/* test_cli_check.c - end-to-end: `opwin check` on fixtures, the demo in two
 * unit systems, and the bad-input corpus through the command line. */
#include "testutil.h"
#include "clirun.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

static cJSON *check_json(const char *study)
{
	char args[512];

	snprintf(args, sizeof args, "check --json %s", study);
	return cli_run_json(args);
}

/* Same numbers in both trees, to rel 1e-9. */
static void same_numbers(const cJSON *a, const cJSON *b)
{
	const cJSON *x, *y;

	if (cJSON_IsNumber(a)) {
		assert_true(cJSON_IsNumber(b));
		assert_rel(a->valuedouble, b->valuedouble, 1e-9);
		return;
	}
	if (!cJSON_IsObject(a) && !cJSON_IsArray(a))
		return;
	assert_int_equal(cJSON_GetArraySize(a), cJSON_GetArraySize(b));
	for (x = a->child, y = b->child; x && y; x = x->next, y = y->next)
		same_numbers(x, y);
}

/* The demo line written in US units and in SI gives the same figures. */
static void check_demo_same_in_us_and_si_units(void **state)
{
	cJSON *si = check_json("demo/study-si.json");
	cJSON *us = check_json("demo/study-us.json");
	(void)state;
	same_numbers(si, us);
	cJSON_Delete(si);
	cJSON_Delete(us);
}

/* Contract keys of `check --json`; geometry of the square-pitch demo screw:
 * helix angle arctan(1/pi) = 17.6568 deg (Tadmor & Gogos 2006, ch. 9). */
static void check_json_has_contract_keys(void **state)
{
	cJSON *j = check_json("fixtures/studies/hdpe-sf.json");
	const cJSON *secs = cJSON_GetObjectItem(j, "sections");
	const cJSON *s0;
	(void)state;
	assert_abs(cli_json_num(j, "length_D"), 30.0, 1e-9);
	assert_abs(cli_json_num(j, "helix_angle_deg"), 17.6568, 1e-4);
	assert_true(cli_json_num(j, "compression_ratio") > 2.5);
	assert_true(cJSON_IsArray(secs));
	s0 = cJSON_GetArrayItem(secs, 0);
	assert_string_equal(cJSON_GetObjectItem(s0, "type")->valuestring,
	                    "feed");
	assert_abs(cli_json_num(s0, "start_D"), 0.0, 1e-12);
	assert_true(cli_json_num(s0, "depth_start_mm") > 0.0);
	(void)cli_json_num(s0, "end_D");
	(void)cli_json_num(s0, "depth_end_mm");
	assert_true(cJSON_IsArray(cJSON_GetObjectItem(j, "warnings")));
	cJSON_Delete(j);
}

/* Common-practice warnings reach the output: abrupt compression, wear. */
static void check_warns_on_abrupt_and_worn_screws(void **state)
{
	cJSON *a = check_json("fixtures/studies/hdpe-abrupt.json");
	cJSON *w = check_json("fixtures/studies/hdpe-worn.json");
	char *ta = cJSON_PrintUnformatted(cJSON_GetObjectItem(a, "warnings"));
	char *tw = cJSON_PrintUnformatted(cJSON_GetObjectItem(w, "warnings"));
	(void)state;
	assert_non_null(strstr(ta, "abrupt_compression"));
	assert_non_null(strstr(tw, "worn"));
	free(ta);
	free(tw);
	cJSON_Delete(a);
	cJSON_Delete(w);
}

/* Every case of the corpus: exit 1, message names the file and the JSON
 * path, and no output file is left behind. */
static void bad_inputs_are_rejected_with_file_and_path(void **state)
{
	FILE *f = fopen("tests/bad/MANIFEST", "r");
	char line[1024];
	int cases = 0;
	(void)state;
	assert_non_null(f);
	while (fgets(line, sizeof line, f)) {
		char *file = strtok(line, "\t\n"), *path, *text;
		char args[1400], out[] = OW_TEST_OUT "/bad-profile.csv";
		struct cli_result r;

		if (!file || file[0] == '#')
			continue;
		path = strtok(NULL, "\t\n");
		text = strtok(NULL, "\t\n");
		unlink(out);
		snprintf(args, sizeof args,
		         "point tests/bad/%s --rpm 60 --profile %s", file, out);
		cli_run(args, &r);
		if (r.code != 1 || !strstr(r.err, file) ||
		    (strcmp(path, "-") && !strstr(r.err, path)) ||
		    !strstr(r.err, text))
			fprintf(stderr, "case %s: code %d: %s", file, r.code,
			        r.err);
		assert_int_equal(r.code, 1);
		assert_non_null(strstr(r.err, file));
		if (strcmp(path, "-"))
			assert_non_null(strstr(r.err, path));
		assert_non_null(strstr(r.err, text));
		assert_int_not_equal(access(out, F_OK), 0);
		cli_result_free(&r);
		cases++;
	}
	fclose(f);
	assert_true(cases >= 30);
}

static void usage_errors_exit_two(void **state)
{
	struct cli_result r;
	(void)state;
	cli_run("check", &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
	cli_run("frobnicate", &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
	cli_run("help check", &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "usage: opwin check"));
	cli_result_free(&r);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(check_demo_same_in_us_and_si_units),
	    cmocka_unit_test(check_json_has_contract_keys),
	    cmocka_unit_test(check_warns_on_abrupt_and_worn_screws),
	    cmocka_unit_test(bad_inputs_are_rejected_with_file_and_path),
	    cmocka_unit_test(usage_errors_exit_two),
	};
	return cmocka_run_group_tests(tests, NULL, NULL);
}
