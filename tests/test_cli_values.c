/* test_cli_values.c - end-to-end: the README's commands run as written,
 * values on the command line are read in the study's own units, and a
 * current point off the map is said to be off it. */
#include "testutil.h"
#include "clirun.h"
#include "pdfutil.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define FAST "tests/data/map-fast.json" /* 20..140 rpm, 200 degC -30..+30 K */

/* `opwin map FAST` on a small grid into build/tests/<dir>, which must
 * succeed; extra options appended. */
static void small_map(const char *dir, const char *extra)
{
	struct cli_result r;
	char args[256];

	snprintf(args, sizeof args,
	         "map " FAST
	         " -o build/tests/%s --quiet --jobs 2 --grid 6x5 %s",
	         dir, extra);
	cli_run(args, &r);
	if (r.code != 0)
		fprintf(stderr, "%s\n", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
}

/* Every `build/opwin ...` line of the README's sh blocks, run in order
 * from an empty folder that sees build/, demo/ and fixtures/ (so out/ does
 * not exist before the first command writes into it). The `make` lines are
 * what runs this test. */
static void readme_commands_run_as_written(void **state)
{
	char *readme = cli_slurp("README.md"), *line, *save = NULL;
	char cwd[1024], dir[] = "/tmp/opwin-readme-XXXXXX", cmd[4096];
	int in_sh = 0, n = 0, rc;

	(void)state;
	assert_non_null(readme);
	assert_non_null(getcwd(cwd, sizeof cwd));
	assert_non_null(mkdtemp(dir));
	snprintf(cmd, sizeof cmd,
	         "ln -s '%s/build' '%s/demo' '%s/fixtures' '%s/'", cwd, cwd,
	         cwd, dir);
	assert_int_equal(system(cmd), 0);
	for (line = strtok_r(readme, "\n", &save); line;
	     line = strtok_r(NULL, "\n", &save)) {
		if (!strncmp(line, "```", 3)) {
			in_sh = !in_sh && !strcmp(line, "```sh");
			continue;
		}
		if (!in_sh || strncmp(line, "build/opwin ", 12))
			continue;
		/* as written; the newline ends a trailing comment */
		snprintf(cmd, sizeof cmd, "cd '%s' && ( %s", dir, line);
		while (line[strlen(line) - 1] == '\\' &&
		       (line = strtok_r(NULL, "\n", &save)) != NULL) {
			strncat(cmd, "\n", sizeof cmd - strlen(cmd) - 1);
			strncat(cmd, line, sizeof cmd - strlen(cmd) - 1);
		}
		strncat(cmd, "\n) >/dev/null 2>&1",
		        sizeof cmd - strlen(cmd) - 1);
		line = cmd + strlen(dir) + 9; /* for the message */
		rc = system(cmd);
		if (rc != 0)
			fprintf(stderr, "README command failed (%d): %s\n", rc,
			        line);
		assert_int_equal(rc, 0);
		n++;
	}
	assert_true(n >= 5);
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
	assert_int_equal(system(cmd), 0);
	free(readme);
}

/* The demo's two studies describe one line, one in SI, one in US units:
 * a bare --set is read in each study's own units, so 10 on the SI study
 * and 18 on the US study are the same shift (10 K = 18 degF, by the
 * definition of the Fahrenheit degree, NIST SP 811, 2008, B.8), and so is
 * "10 K" given with its unit, whatever --units says. */
static void a_bare_set_is_read_in_the_study_units(void **state)
{
	cJSON *si = cli_run_json("point demo/study-si.json --rpm 60 --set 10 "
	                         "--json --units us");
	cJSON *us = cli_run_json("point demo/study-us.json --rpm 60 --set 18 "
	                         "--json");
	cJSON *unit = cli_run_json("point demo/study-us.json --rpm 60 --set "
	                           "'10 K' --json");
	struct cli_result r;

	(void)state;
	assert_rel(cli_json_num(us, "output_kg_h"),
	           cli_json_num(si, "output_kg_h"), 1e-3);
	assert_rel(cli_json_num(us, "discharge_bulk_temp_C"),
	           cli_json_num(si, "discharge_bulk_temp_C"), 1e-3);
	assert_rel(cli_json_num(unit, "discharge_bulk_temp_C"),
	           cli_json_num(us, "discharge_bulk_temp_C"), 1e-9);
	cli_run("point demo/study-us.json --rpm 60 --set 18", &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.err, "read as 18 °F (10 K)"));
	assert_non_null(strstr(r.err, "study's own units, US"));
	cli_result_free(&r);
	cJSON_Delete(si);
	cJSON_Delete(us);
	cJSON_Delete(unit);
}

/* A current point beyond the swept speeds gets no verdict borrowed from
 * the nearest mapped point: the report says it is off the map. */
static void a_current_point_off_the_map_is_said_so(void **state)
{
	struct cli_result r;
	char *text;

	(void)state;
	small_map("values-off", "--current 200,200");
	text = ow_test_pdf_text("build/tests/values-off/report.pdf");
	assert_non_null(strstr(text, "outside the swept range"));
	assert_null(strstr(text, "passes every limit there"));
	free(text);
	cli_run("report build/tests/values-off --current 30,200", &r);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	text = ow_test_pdf_text("build/tests/values-off/report.pdf");
	assert_null(strstr(text, "outside the swept range"));
	free(text);
	/* the report drawn by map is kept, not overwritten */
	{
		int rc;

		text = ow_test_run("ls build/tests/values-off | grep -c "
		                   "'^report-previous-.*\\.pdf$'",
		                   &rc);
		assert_true(atoi(text) >= 1);
		free(text);
	}
}

/* Every key of window.json and every column of grid.csv and points-si.csv
 * is named in the README (zone columns as zone_N_...). */
static void every_written_key_is_in_the_readme(void **state)
{
	char *readme = cli_slurp("README.md"), *text, *h, *tok, *save = NULL;
	static const char *const csvs[] = {"grid.csv", "points-si.csv"};
	cJSON *w;
	const cJSON *e, *o;
	char key[160], path[128];
	size_t k;

	(void)state;
	small_map("values-keys", "");
	w = cli_read_json("build/tests/values-keys/window.json");
	for (e = w->child; e; e = e->next) {
		snprintf(key, sizeof key, "`%s`", e->string);
		if (!strstr(readme, key))
			fail_msg("window.json key %s is not in README", key);
		o = cJSON_IsArray(e) ? e->child : e;
		if (cJSON_IsObject(o) && strcmp(e->string, "boundaries"))
			for (o = o->child; o; o = o->next) {
				snprintf(key, sizeof key, "`%s`", o->string);
				if (!strstr(readme, key))
					fail_msg("window.json %s.%s is not in "
					         "README",
					         e->string, o->string);
			}
	}
	cJSON_Delete(w);
	for (k = 0; k < 2; k++) {
		snprintf(path, sizeof path, "build/tests/values-keys/%s",
		         csvs[k]);
		text = cli_slurp(path);
		assert_non_null(text);
		h = strtok_r(text, "\n", &save);
		for (tok = strtok_r(h, ",", &save); tok;
		     tok = strtok_r(NULL, ",", &save)) {
			char *digit = strpbrk(tok, "0123456789");

			if (digit) /* zone_2_demand_kW -> zone_N_demand_kW */
				*digit = 'N';
			snprintf(key, sizeof key, "`%s`", tok);
			if (!strstr(readme, key) && strncmp(tok, "margin_", 7))
				fail_msg("%s column %s is not in README",
				         csvs[k], key);
		}
		free(text);
	}
	free(readme);
}

/* check shows the die, the limits (one phrasing) and the sweep. */
static void check_shows_die_limits_and_sweep(void **state)
{
	struct cli_result r;

	(void)state;
	cli_run("check demo/study-si.json", &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "die     type annulus, outer diameter "
	                              "40.64 mm"));
	assert_non_null(strstr(r.out, "limits  peak melt temperature at most "
	                              "240 °C"));
	assert_non_null(strstr(r.out, "sweep   screw speed 20 to 120 rpm"));
	cli_result_free(&r);
	cli_run("point demo/study-us.json --rpm 50 --units us", &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "lbf·ft"));
	assert_non_null(strstr(r.out, "hp·h/lb"));
	cli_result_free(&r);
}

/* The report's text layer reads back whole: no complaint from poppler
 * about the fonts' ToUnicode maps, and a non-ASCII unit ("°C") found. */
static void report_text_can_be_searched(void **state)
{
	char *text;
	int rc;

	(void)state;
	small_map("values-pdf", "");
	text = ow_test_run("pdftotext build/tests/values-pdf/report.pdf - "
	                   "2>&1",
	                   &rc);
	assert_int_equal(rc, 0);
	assert_null(strstr(text, "Invalid"));
	assert_null(strstr(text, "Syntax"));
	assert_non_null(strstr(text, "°C"));
	free(text);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(a_bare_set_is_read_in_the_study_units),
	    cmocka_unit_test(a_current_point_off_the_map_is_said_so),
	    cmocka_unit_test(check_shows_die_limits_and_sweep),
	    cmocka_unit_test(report_text_can_be_searched),
	    cmocka_unit_test(every_written_key_is_in_the_readme),
	    cmocka_unit_test(readme_commands_run_as_written),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
