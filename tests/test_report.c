/* test_report.c - the PDF report read back with poppler (pdfinfo, pdffonts,
 * pdftotext): pages and their footers, embedded fonts, the window's bounds
 * as printed numbers, the cautions, paper sizes, an empty window, failure
 * without leftovers; and `opwin report DIR` end to end on a saved map
 * folder. The data are real: the demo line swept on a small grid. */
#include "testutil.h"
#include "clirun.h"

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
	struct ow_units *u;
	struct ow_study *s;
	struct ow_grid *g;
	struct ow_window *w;
	struct ow_point centre;
	struct ow_profile_row *rows;
	int n_rows;
	char dir[64];
	char pdf[96]; /* the A4 SI report with a current point */
	char *text;   /* its pdftotext, whitespace runs made one space */
};

/* Output of a shell command (malloc'd); its exit status in *rc. */
static char *run(const char *cmd, int *rc)
{
	FILE *p = popen(cmd, "r");
	size_t n = 0, cap = 1 << 16;
	char *buf = malloc(cap);
	size_t got;

	assert_non_null(p);
	assert_non_null(buf);
	while ((got = fread(buf + n, 1, cap - 1 - n, p)) > 0) {
		n += got;
		if (n + 1 == cap) {
			cap *= 2;
			buf = realloc(buf, cap);
			assert_non_null(buf);
		}
	}
	buf[n] = '\0';
	*rc = pclose(p);
	return buf;
}

/* Whitespace runs (newlines from table cells) -> one space. */
static void squeeze(char *s)
{
	char *o = s;
	int space = 0;

	for (; *s; s++) {
		if (*s == ' ' || *s == '\n' || *s == '\t' || *s == '\f') {
			space = 1;
			continue;
		}
		if (space && o != s)
			*o++ = ' ';
		space = 0;
		*o++ = *s;
	}
	*o = '\0';
}

static char *pdf_text(const char *pdf)
{
	char cmd[256], *t;
	int rc;

	snprintf(cmd, sizeof cmd, "pdftotext -q '%s' - 2>/dev/null", pdf);
	t = run(cmd, &rc);
	assert_int_equal(rc, 0);
	squeeze(t);
	return t;
}

static int pdf_pages(const char *pdf, char *size, size_t n)
{
	char cmd[256], *out, *p;
	int rc, pages = -1;

	snprintf(cmd, sizeof cmd, "pdfinfo '%s' 2>/dev/null", pdf);
	out = run(cmd, &rc);
	assert_int_equal(rc, 0);
	p = strstr(out, "Pages:");
	assert_non_null(p);
	pages = atoi(p + 6);
	p = strstr(out, "Page size:");
	assert_non_null(p);
	snprintf(size, n, "%.*s", (int)strcspn(p + 10, "\n"), p + 10);
	squeeze(size);
	free(out);
	return pages;
}

static void centre_profile(struct fx *f)
{
	double set_K[OW_MAX_ZONES];
	struct ow_solver *sv = NULL;
	const struct ow_profile_row *r;

	assert_int_equal(ow_solver_create(f->s, &sv, NULL), OW_OK);
	ow_line_apply_axis(&f->s->line, f->w->centre.axis, set_K);
	assert_int_equal(
	    ow_solver_run(sv, f->w->centre.rpm, set_K, 0.0, &f->centre, NULL),
	    OW_OK);
	r = ow_solver_profile(sv, &f->n_rows);
	f->rows = malloc(sizeof *r * (size_t)f->n_rows);
	assert_non_null(f->rows);
	memcpy(f->rows, r, sizeof *r * (size_t)f->n_rows);
	ow_solver_destroy(sv);
}

static void options(const struct fx *f, struct ow_report_options *o)
{
	ow_report_default(o);
	o->date = "2026-03-14";
	o->revision = "C-7";
	o->prepared_by = "A. Engineer";
	o->centre_point = &f->centre;
	o->profile = f->rows;
	o->n_profile = f->n_rows;
}

static void write_report(const struct fx *f, const struct ow_report_options *o,
                         const char *path)
{
	struct ow_diag d = {{0}};
	enum ow_status st = ow_report_write(f->s, f->g, f->w, o, path, &d);

	if (st != OW_OK)
		fprintf(stderr, "%s\n", d.msg);
	assert_int_equal(st, OW_OK);
}

static int setup(void **state)
{
	struct fx *f = calloc(1, sizeof *f);
	struct ow_report_options o;
	struct ow_sweep_config c;
	struct ow_diag d = {{0}};

	assert_non_null(f);
	f->s = calloc(1, sizeof *f->s);
	assert_int_equal(ow_units_create(&f->u, &d), OW_OK);
	assert_int_equal(
	    ow_config_load_study(f->u, "demo/study-si.json", f->s, &d), OW_OK);
	ow_sweep_default(&c);
	c.rpm_steps = 9;
	c.axis_steps = 7;
	assert_int_equal(ow_sweep_run(f->s, &c, &f->g, &d), OW_OK);
	assert_int_equal(ow_window_extract(f->s, f->g, &f->w, &d), OW_OK);
	assert_false(f->w->empty); /* the demo line has a window */
	centre_profile(f);
	strcpy(f->dir, "/tmp/test_report.XXXXXX");
	assert_non_null(mkdtemp(f->dir));
	snprintf(f->pdf, sizeof f->pdf, "%s/report.pdf", f->dir);
	options(f, &o);
	o.has_current = 1;
	o.current_rpm = f->w->centre.rpm;
	o.current_set_K = f->w->centre_set_K;
	write_report(f, &o, f->pdf);
	f->text = pdf_text(f->pdf);
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
	free(f->rows);
	ow_window_destroy(f->w);
	ow_grid_destroy(f->g);
	free(f->s);
	ow_units_destroy(f->u);
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
	int pages = pdf_pages(f->pdf, size, sizeof size), k;

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
	         f->s->input_crc);
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
	out = run(cmd, &rc);
	assert_int_equal(rc, 0);
	/* pdffonts: name, type, encoding, then the "emb" column yes/no */
	for (line = strtok(out, "\n"); line; line = strtok(NULL, "\n")) {
		if (!strstr(line, "TrueType") && !strstr(line, "Type 1") &&
		    !strstr(line, "Type 3"))
			continue;
		fonts++;
		squeeze(line);
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
	int ref = ow_line_reference_zone(&f->s->line);
	cJSON *w;

	assert_int_equal(ow_results_window_json(f->s, f->g, f->w, &json, NULL),
	                 OW_OK);
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

	contains(f->text, f->s->screw.name);
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

	pdf_pages(f->pdf, size, sizeof size);
	/* ISO 216: 210 x 297 mm = 595.276 x 841.89 pt */
	assert_non_null(strstr(size, "595.276 x 841.89 pts (A4)"));
	options(f, &o);
	o.paper = OW_PAPER_LETTER;
	o.units = OW_SYS_US;
	snprintf(path, sizeof path, "%s/letter.pdf", f->dir);
	write_report(f, &o, path);
	pdf_pages(path, size, sizeof size);
	/* ANSI letter: 8.5 x 11 in = 612 x 792 pt */
	assert_non_null(strstr(size, "612 x 792 pts (letter)"));
}

static void report_is_the_same_bytes_for_the_same_inputs(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	char a[128], b[128], cmd[300];

	options(f, &o);
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

	options(f, &o);
	snprintf(path, sizeof path, "%s/missing/report.pdf", f->dir);
	assert_int_equal(ow_report_write(f->s, f->g, f->w, &o, path, &d),
	                 OW_EIO);
	assert_non_null(strstr(d.msg, path));
	snprintf(path, sizeof path, "%s/missing", f->dir);
	assert_int_equal(access(path, F_OK), -1);
}

static void report_refuses_a_malformed_date(void **state)
{
	const struct fx *f = *state;
	struct ow_report_options o;
	char path[128];

	options(f, &o);
	o.date = "14/03/2026";
	snprintf(path, sizeof path, "%s/dated.pdf", f->dir);
	assert_int_equal(ow_report_write(f->s, f->g, f->w, &o, path, NULL),
	                 OW_EARG);
	assert_int_equal(access(path, F_OK), -1);
}

/* Limits no point can meet: every lattice point fails the peak melt
 * temperature, and page 1 says so. */
static void report_says_plainly_when_no_point_is_safe(void **state)
{
	const struct fx *f = *state;
	struct ow_study *s = malloc(sizeof *s);
	struct ow_grid g = *f->g;
	struct ow_window *w = NULL;
	struct ow_report_options o;
	char path[128], *text;
	int i;

	*s = *f->s;
	s->line.limits.peak_temp_K = 300.15; /* 27 degC: nothing passes */
	g.pts = malloc(sizeof *g.pts * (size_t)(g.n_rpm * g.n_axis));
	for (i = 0; i < g.n_rpm * g.n_axis; i++) {
		g.pts[i] = f->g->pts[i];
		ow_classify(&g.pts[i].pt, &s->line.limits,
		            ow_screw_length(&s->screw), &g.pts[i].v);
	}
	assert_int_equal(ow_window_extract(s, &g, &w, NULL), OW_OK);
	assert_true(w->empty);
	ow_report_default(&o);
	o.date = "2026-03-14";
	snprintf(path, sizeof path, "%s/empty.pdf", f->dir);
	assert_int_equal(ow_report_write(s, &g, w, &o, path, NULL), OW_OK);
	text = pdf_text(path);
	contains(text, "No safe operating point exists in the swept range.");
	/* the binding limit first, with every point failing it */
	snprintf(path, sizeof path, "peak melt temperature ≤ 27 °C %d 100 %%",
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
	assert_int_equal(
	    ow_mapdir_save(f->s, f->g, &f->centre, f->rows, f->n_rows, dir, &d),
	    OW_OK);
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
	         "--current 60,400",
	         dir);
	cli_run(args, &r);
	if (r.code)
		fprintf(stderr, "%s", r.err);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	snprintf(path, sizeof path, "%s/report.pdf", dir);
	assert_true(pdf_pages(path, size, sizeof size) >= 7);
	assert_non_null(strstr(size, "(letter)"));
	text = pdf_text(path);
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
