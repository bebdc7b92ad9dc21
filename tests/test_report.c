/* test_report.c - the PDF report read back with poppler (pdfinfo, pdffonts,
 * pdftotext): pages and their footers, embedded fonts, the window's bounds
 * as printed numbers, the cautions, paper sizes, an empty window, failure
 * without leftovers; and `opwin report DIR` end to end on a saved map
 * folder. The data are real: the demo line swept on a small grid. */
#include "testutil.h"
#include "clirun.h"
#include "pdfutil.h"
#include "testmap.h"

#include <cjson/cJSON.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "opwin.h"
#include "ow_mapdir.h"
#include "ow_report.h"
#include "ow_sweep.h"
#include "ow_window.h"

struct fx {
	struct ow_test_map m;
	char dir[64];
	char pdf[96]; /* the A4 SI report with a current point */
	char *text;   /* its pdftotext, whitespace runs made one space */
};

static void options(struct ow_report_options *o)
{
	ow_report_default(o);
	o->date = "2026-03-14";
	o->revision = "C-7";
	o->prepared_by = "A. Engineer";
}

static void write_report(const struct fx *f, const struct ow_report_options *o,
                         const char *path)
{
	struct ow_diag d = {{0}};
	enum ow_status st = ow_report_write(&f->m.map, o, path, &d);

	if (st != OW_OK)
		fprintf(stderr, "%s\n", d.msg);
	assert_int_equal(st, OW_OK);
}

static int setup(void **state)
{
	struct fx *f = calloc(1, sizeof *f);
	struct ow_report_options o;

	assert_non_null(f);
	ow_test_map_make(&f->m, 9, 7, 0);
	strcpy(f->dir, "/tmp/test_report.XXXXXX");
	assert_non_null(mkdtemp(f->dir));
	snprintf(f->pdf, sizeof f->pdf, "%s/report.pdf", f->dir);
	options(&o);
	o.has_current = 1;
	o.current_rpm = f->m.w->centre.rpm;
	o.current_set_K = f->m.w->centre_set_K;
	write_report(f, &o, f->pdf);
	f->text = ow_test_pdf_text(f->pdf);
	*state = f;
	return 0;
}

static int teardown(void **state)
{
	struct fx *f = *state;
	char cmd[128];

	snprintf(cmd, sizeof cmd, "rm -rf '%s'", f->dir);
	assert_int_equal(system(cmd), 0);
	free(f->text);
	ow_test_map_free(&f->m);
	free(f);
	return 0;
}

static void contains(const char *text, const char *what)
{
	if (!strstr(text, what))
		fprintf(stderr, "not in the report text: \"%s\"\n", what);
	assert_non_null(strstr(text, what));
}

static void report_numbers_every_page_of_the_whole(void **state)
{
	const struct fx *f = *state;
	char size[64], want[64];
	int pages = ow_test_pdf_pages(f->pdf, size, sizeof size), k;

	/* page 1, three pages of maps, profiles, inputs, model basis */
	assert_true(pages >= 7);
	for (k = 1; k <= pages; k++) {
		snprintf(want, sizeof want, "page %d of %d", k, pages);
		contains(f->text, want);
	}
	snprintf(want, sizeof want, "page %d of", pages + 1);
	assert_null(strstr(f->text, want));
}

static void report_footer_traces_to_the_input_files(void **state)
{
	const struct fx *f = *state;
	char want[80], *p = f->text;
	int n = 0;

	snprintf(want, sizeof want, "2026-03-14 · inputs CRC-32 %08lX",
	         f->m.s->input_crc);
	while ((p = strstr(p, want)) != NULL) {
		n++;
		p++;
	}
	assert_true(n >= 7); /* on every page */
}

static void report_embeds_every_font(void **state)
{
	const struct fx *f = *state;
	char cmd[160], *out, *line;
	int rc, fonts = 0;

	snprintf(cmd, sizeof cmd, "pdffonts '%s' 2>/dev/null", f->pdf);
	out = ow_test_run(cmd, &rc);
	assert_int_equal(rc, 0);
	/* pdffonts: name, type, encoding, then the "emb" column yes/no */
	for (line = strtok(out, "\n"); line; line = strtok(NULL, "\n")) {
		if (!strstr(line, "TrueType") && !strstr(line, "Type 1") &&
		    !strstr(line, "Type 3"))
			continue;
		fonts++;
		ow_test_squeeze(line);
		assert_non_null(strstr(line, "DejaVuSans"));
		assert_non_null(strstr(line, "Identity-H yes"));
	}
	assert_int_equal(fonts, 2); /* regular and bold */
	free(out);
}

static void bound(const cJSON *w, const char *key, int decimals,
                  enum ow_round dir, char *out)
{
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(w, key);

	assert_true(cJSON_IsNumber(v));
	ow_report_format_bound(out, 32, v->valuedouble, decimals, dir);
}

/* The bounds of window.json, as the report prints them, in their row. */
static void report_prints_the_window_bounds_of_window_json(void **state)
{
	const struct fx *f = *state;
	char *json = NULL, lo[32], hi[32], row[200], zn[24];
	int ref = ow_line_reference_zone(&f->m.s->line);
	cJSON *w;

	assert_int_equal(
	    ow_results_window_json(f->m.s, f->m.g, f->m.w, &json, NULL), OW_OK);
	w = cJSON_Parse(json);
	assert_non_null(w);
	/* printed inwards: screw speed to 0.1 rpm, set-points to 1 degC */
	bound(w, "rpm_min", OW_REPORT_RPM_DECIMALS, OW_ROUND_UP, lo);
	bound(w, "rpm_max", OW_REPORT_RPM_DECIMALS, OW_ROUND_DOWN, hi);
	snprintf(row, sizeof row, "Screw speed %s %s rpm", lo, hi);
	contains(f->text, row);
	bound(w, "set_min_C", OW_REPORT_TEMP_DECIMALS, OW_ROUND_UP, lo);
	bound(w, "set_max_C", OW_REPORT_TEMP_DECIMALS, OW_ROUND_DOWN, hi);
	snprintf(zn, sizeof zn, "zone %d (", ref + 1);
	snprintf(row, sizeof row, "set-point, map axis %s %s °C", lo, hi);
	contains(f->text, row);
	contains(strstr(f->text, row) - 40, zn);
	cJSON_Delete(w);
	free(json);
}

static void report_rounds_bounds_towards_the_inside(void **state)
{
	char b[32];

	(void)state;
	assert_string_equal(
	    ow_report_format_bound(b, 32, 178.125, 0, OW_ROUND_DOWN), "178");
	assert_string_equal(
	    ow_report_format_bound(b, 32, 185.4, 0, OW_ROUND_UP), "186");
	assert_string_equal(
	    ow_report_format_bound(b, 32, 155.0, 0, OW_ROUND_UP), "155");
	/* representation error does not push a whole value up */
	assert_string_equal(
	    ow_report_format_bound(b, 32, 155.0000000001, 0, OW_ROUND_UP),
	    "155");
	assert_string_equal(
	    ow_report_format_bound(b, 32, 56.25, 1, OW_ROUND_DOWN), "56.2");
	assert_string_equal(
	    ow_report_format_bound(b, 32, 43.75, 1, OW_ROUND_NEAREST), "43.8");
	assert_string_equal(ow_report_format_bound(b, 32, 20.0, 1, OW_ROUND_UP),
	                    "20");
	assert_string_equal(
	    ow_report_format_bound(b, 32, -1.25, 1, OW_ROUND_DOWN),
	    "\xE2\x88\x92"
	    "1.3"); /* U+2212 minus */
}

static void report_carries_title_block_cautions_and_basis(void **state)
{
	const struct fx *f = *state;

	contains(f->text, f->m.s->screw.name);
	contains(f->text, "C-7");
	contains(f->text, "A. Engineer");
	contains(f->text, "Current operating point");
	/* the cautions, in the report's own words */
	contains(f->text, "Hot melt and pressure can injure.");
	contains(f->text, "Die and adapter bolts and clamps hold the whole "
	                  "head pressure");
	contains(f->text, "rating of the barrel's rupture disc");
	contains(f->text, "Verify every setting on the line.");
	contains(f->text, "Local codes and licensed practice govern.");
	contains(f->text, "not measurements");
	/* the published methods and what the model leaves out */
	contains(f->text, "Darnell & Mol (1956)");
	contains(f->text, "Tadmor (1966)");
	contains(f->text, "Tadmor & Klein (1970)");
	contains(f->text, "Tadmor & Gogos (2006)");
	contains(f->text, "Bird, Stewart & Lightfoot (2002)");
	contains(f->text, "Rowell & Finlayson (1922)");
	contains(f->text, "break-up of the solid bed");
	contains(f->text, "slip of the melt or the pellets at the walls");
	/* a resin value's source from the resin file */
	contains(f->text, "Brandrup, Immergut & Grulke");
}

static void report_comes_in_a4_and_letter(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	char path[128], size[64];

	ow_test_pdf_pages(f->pdf, size, sizeof size);
	/* ISO 216: 210 x 297 mm = 595.276 x 841.89 pt */
	assert_non_null(strstr(size, "595.276 x 841.89 pts (A4)"));
	options(&o);
	o.paper = OW_PAPER_LETTER;
	o.units = OW_SYS_US;
	snprintf(path, sizeof path, "%s/letter.pdf", f->dir);
	write_report(f, &o, path);
	ow_test_pdf_pages(path, size, sizeof size);
	/* ANSI letter: 8.5 x 11 in = 612 x 792 pt */
	assert_non_null(strstr(size, "612 x 792 pts (letter)"));
}

static void report_is_the_same_bytes_for_the_same_inputs(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	char a[128], b[128], cmd[300];

	options(&o);
	snprintf(a, sizeof a, "%s/a.pdf", f->dir);
	snprintf(b, sizeof b, "%s/b.pdf", f->dir);
	write_report(f, &o, a);
	write_report(f, &o, b);
	snprintf(cmd, sizeof cmd, "cmp -s '%s' '%s'", a, b);
	assert_int_equal(system(cmd), 0);
}

static void report_leaves_nothing_when_the_folder_is_missing(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	struct ow_diag d = {{0}};
	char path[128];

	options(&o);
	snprintf(path, sizeof path, "%s/missing/report.pdf", f->dir);
	assert_int_equal(ow_report_write(&f->m.map, &o, path, &d), OW_EIO);
	assert_non_null(strstr(d.msg, path));
	snprintf(path, sizeof path, "%s/missing", f->dir);
	assert_int_equal(access(path, F_OK), -1);
}

static void report_refuses_a_malformed_date(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	char path[128];

	options(&o);
	o.date = "14/03/2026";
	snprintf(path, sizeof path, "%s/dated.pdf", f->dir);
	assert_int_equal(ow_report_write(&f->m.map, &o, path, NULL), OW_EARG);
	assert_int_equal(access(path, F_OK), -1);
}

/* Limits no point can meet: every lattice point fails the peak melt
 * temperature, and page 1 says so. */
static void report_says_plainly_when_no_point_is_safe(void **state)
{
	const struct fx *f = *state;
	struct ow_study *s = malloc(sizeof *s);
	struct ow_grid g = *f->m.g;
	struct ow_window *w = NULL;
	struct ow_map m = {0};
	struct ow_report_options o;
	char path[128], *text;
	int i;

	*s = *f->m.s;
	s->line.limits.peak_temp_K = 300.15; /* 27 degC: nothing passes */
	g.pts = malloc(sizeof *g.pts * (size_t)(g.n_rpm * g.n_axis));
	for (i = 0; i < g.n_rpm * g.n_axis; i++) {
		g.pts[i] = f->m.g->pts[i];
		ow_classify(&g.pts[i].pt, &s->line.limits,
		            ow_screw_length(&s->screw), &g.pts[i].v);
	}
	assert_int_equal(ow_window_extract(s, &g, &w, NULL), OW_OK);
	assert_true(w->empty);
	ow_report_default(&o);
	o.date = "2026-03-14";
	snprintf(path, sizeof path, "%s/empty.pdf", f->dir);
	m.study = s, m.grid = &g, m.window = w;
	assert_int_equal(ow_report_write(&m, &o, path, NULL), OW_OK);
	text = ow_test_pdf_text(path);
	contains(text, "No safe operating point exists in the swept range.");
	/* the binding limit first, with every point failing it */
	snprintf(path, sizeof path,
	         "peak melt temperature at most 27 °C %d 100 %%",
	         g.n_rpm * g.n_axis);
	contains(text, path);
	contains(text, "Hot melt and pressure can injure.");
	free(text);
	ow_window_destroy(w);
	free(g.pts);
	free(s);
}

/* ---- opwin report DIR ------------------------------------------------ */

static void make_map_folder(const struct fx *f, char *dir, size_t n)
{
	struct ow_diag d = {{0}};

	snprintf(dir, n, "%s/map", f->dir);
	assert_int_equal(mkdir(dir, 0777), 0);
	assert_int_equal(ow_mapdir_save(f->m.s, f->m.g, &f->m.centre, f->m.rows,
	                                f->m.n_rows, dir, &d),
	                 OW_OK);
	assert_int_equal(ow_mapdir_seal(dir, &d), OW_OK);
}

static void cli_report_redraws_a_saved_map_folder(void **state)
{
	const struct fx *f = *state;
	struct cli_result r;
	char dir[96], args[256], path[128], size[64], *text;

	make_map_folder(f, dir, sizeof dir);
	snprintf(args, sizeof args,
	         "report '%s' --paper letter --units us "
	         "--date 2026-03-15 --revision D --approved-by 'Q. Lead' "
	         "--current '60,400 degF'",
	         dir);
	cli_run(args, &r);
	if (r.code)
		fprintf(stderr, "%s", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	snprintf(path, sizeof path, "%s/report.pdf", dir);
	assert_true(ow_test_pdf_pages(path, size, sizeof size) >= 7);
	assert_non_null(strstr(size, "(letter)"));
	text = ow_test_pdf_text(path);
	contains(text, "Q. Lead");
	contains(text, "°F"); /* --units us */
	contains(text, "Current operating point: 60 rpm with the map-axis "
	               "zone at 400 °F");
	free(text);
	snprintf(path, sizeof path, "%s/window.png", dir);
	assert_int_equal(access(path, F_OK), 0);
	snprintf(path, sizeof path, "%s/map-peak-temp.svg", dir);
	assert_int_equal(access(path, F_OK), 0);
}

static void cli_report_exit_codes(void **state)
{
	const struct fx *f = *state;
	struct cli_result r;
	char args[256];

	cli_run("report /tmp/no/such/map/folder", &r);
	assert_int_equal(r.code, 1); /* inputs rejected */
	assert_non_null(strstr(r.err, "no such folder"));
	cli_result_free(&r);
	cli_run("report demo", &r);
	assert_int_equal(r.code, 1);
	assert_non_null(strstr(r.err, "not a map folder"));
	cli_result_free(&r);
	cli_run("report", &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
	snprintf(args, sizeof args, "report '%s' --paper a5", f->dir);
	cli_run(args, &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
	snprintf(args, sizeof args, "report '%s' --date 2026-3-1", f->dir);
	cli_run(args, &r);
	assert_int_equal(r.code, 2);
	cli_result_free(&r);
	cli_run("help report", &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "--prepared-by"));
	cli_result_free(&r);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(report_numbers_every_page_of_the_whole),
	    cmocka_unit_test(report_footer_traces_to_the_input_files),
	    cmocka_unit_test(report_embeds_every_font),
	    cmocka_unit_test(report_prints_the_window_bounds_of_window_json),
	    cmocka_unit_test(report_rounds_bounds_towards_the_inside),
	    cmocka_unit_test(report_carries_title_block_cautions_and_basis),
	    cmocka_unit_test(report_comes_in_a4_and_letter),
	    cmocka_unit_test(report_is_the_same_bytes_for_the_same_inputs),
	    cmocka_unit_test(report_leaves_nothing_when_the_folder_is_missing),
	    cmocka_unit_test(report_refuses_a_malformed_date),
	    cmocka_unit_test(report_says_plainly_when_no_point_is_safe),
	    cmocka_unit_test(cli_report_redraws_a_saved_map_folder),
	    cmocka_unit_test(cli_report_exit_codes),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
