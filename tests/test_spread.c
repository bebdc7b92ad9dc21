/* test_spread.c - the sampled sweep across a spread of inputs: the share
 * of safe samples against a closed form, the robust window against the
 * nominal one as the spread widens, repeatability, and the loader's
 * messages for a bad spread block. */
#include "testutil.h"
#include "clirun.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "opwin.h"
#include "ow_spread.h"

#define ROD "tests/data/newtonian-rod-spread.json"

struct run {
	struct ow_grid *g, *robust;
	struct ow_window *w, *rw;
	struct ow_spread_result *r;
};

static void run(const struct ow_study *s, int nr, int na, int samples,
                struct run *x)
{
	struct ow_sweep_config sc;
	struct ow_spread_config pc;
	struct ow_diag d = {{0}};

	ow_sweep_default(&sc);
	sc.jobs = 2;
	sc.rpm_steps = nr;
	sc.axis_steps = na;
	ow_spread_config_default(&pc);
	pc.jobs = 2;
	pc.samples = samples;
	assert_int_equal(ow_sweep_run(s, &sc, &x->g, &d), OW_OK);
	assert_int_equal(ow_window_extract(s, x->g, &x->w, &d), OW_OK);
	if (ow_spread_run(s, x->g, &pc, &x->r, &d) != OW_OK)
		fail_msg("%s", d.msg);
	assert_int_equal(ow_spread_robust_grid(x->g, x->r, &x->robust, &d),
	                 OW_OK);
	assert_int_equal(ow_window_extract(s, x->robust, &x->rw, &d), OW_OK);
	ow_spread_clip_window(x->rw, x->w);
}

static void run_free(struct run *x)
{
	ow_window_destroy(x->w);
	ow_window_destroy(x->rw);
	ow_grid_destroy(x->g);
	ow_grid_destroy(x->robust);
	ow_spread_result_destroy(x->r);
}

/* Melt-fed Newtonian rod line, viscosity scale s uniform on 0.8..1.2:
 * the head pressure is s mu Q_d / (K + B) (Tadmor & Klein 1970 screw
 * characteristic with the Hagen-Poiseuille die; 1.8615e7 Pa at 60 rpm and
 * mu = 1000 Pa s, proportional to the speed), so a point is safe under
 * the 25 MPa limit for s <= s* = 25e6 / P(N) and the probability is
 * (s* - 0.8) / 0.4 clipped to 0..1. Sampling error: a Latin hypercube of
 * n samples in one dimension puts one sample in each 1/n stratum, so the
 * safe count is floor(n p) or ceil(n p): |share - p| <= 1/n (McKay,
 * Beckman & Conover 1979). n = 40 here. */
static void newtonian_share_matches_the_closed_form_probability(void **st)
{
	struct ow_study *s = ow_test_study(ROD);
	struct run x = {0};
	int ir, ia;
	(void)st;
	run(s, 0, 0, 0, &x);
	assert_int_equal(x.r->samples, 40);
	for (ia = 0; ia < x.g->n_axis; ia++)
		for (ir = 0; ir < x.g->n_rpm; ir++) {
			const struct ow_grid_point *gp =
			    ow_grid_at(x.g, ir, ia);
			double p_head = 1.8615e7 * gp->rpm / 60.0;
			double p = (25e6 / p_head - 0.8) / 0.4;

			p = p < 0.0 ? 0.0 : (p > 1.0 ? 1.0 : p);
			assert_abs(x.r->pts[ia * x.g->n_rpm + ir].share, p,
			           1.0 / 40.0 + 1e-9);
		}
	run_free(&x);
	free(s);
}

/* Set every input of the study's spread to width scale * its own. */
static void scale_spread(struct ow_study *s, const struct ow_spread *base,
                         double scale)
{
	int i;

	s->spread = *base;
	for (i = 0; i < s->spread.n; i++) {
		struct ow_spread_input *in = &s->spread.in[i];

		if (in->normal) {
			in->hi *= scale;
		} else {
			in->lo = in->nominal + scale * (in->lo - in->nominal);
			in->hi = in->nominal + scale * (in->hi - in->nominal);
		}
	}
}

static void assert_inside(const struct ow_window *in,
                          const struct ow_window *out)
{
	if (in->empty)
		return;
	assert_false(out->empty);
	assert_true(in->rpm_min >= out->rpm_min && in->rpm_max <= out->rpm_max);
	assert_true(in->set_min_K >= out->set_min_K &&
	            in->set_max_K <= out->set_max_K);
	assert_true(in->safe_fraction <= out->safe_fraction);
}

static double area(const struct ow_window *w)
{
	return w->empty
	           ? 0.0
	           : (w->rpm_max - w->rpm_min) * (w->set_max_K - w->set_min_K);
}

/* Every point safe on robust grid a is safe on b. */
static void assert_nested(const struct ow_grid *a, const struct ow_grid *b)
{
	int i;

	for (i = 0; i < a->n_rpm * a->n_axis; i++)
		assert_true(a->pts[i].v.bits != 0 || b->pts[i].v.bits == 0);
}

/* A spread of zero width is the nominal study: every sample is the
 * nominal point, so the robust window is the nominal one, field for
 * field. As the spread widens (the same unit samples stretched: a wider
 * uniform range holds the narrower one, and these margins move
 * monotonically with the inputs) the robust window stays inside the
 * nominal one, the robust safe set inside that of every narrower spread,
 * and the robust rectangle's area does not grow (the largest rectangle of
 * a smaller set; its shape may trade speed for set-point). Two fixtures:
 * the melt-fed line and the single-flight HDPE line. */
static void robust_window_shrinks_as_the_spread_widens(void **st)
{
	static const char *const studies[] = {"fixtures/studies/melt-fed.json",
	                                      "fixtures/studies/hdpe-sf.json"};
	static const double widths[] = {0.0, 0.5, 1.0, 2.0};
	struct ow_units *u = NULL;
	size_t f, k;
	(void)st;
	assert_int_equal(ow_units_create(&u, NULL), OW_OK);

	for (f = 0; f < 2; f++) {
		struct ow_study *s = ow_test_study(studies[f]);
		struct ow_diag d = {{0}};
		struct ow_spread base;
		struct run prev = {0};

		assert_int_equal(ow_config_spread_text(
		                     u,
		                     "{\"viscosity_scale\": {\"plus_minus\": "
		                     "\"10 %\"}, \"melting_point\": "
		                     "{\"plus_minus\": \"3 K\"}}",
		                     "test", s, &d),
		                 OW_OK);
		base = s->spread;
		for (k = 0; k < sizeof widths / sizeof *widths; k++) {
			struct run x = {0};

			scale_spread(s, &base, widths[k]);
			run(s, 6, 4, 8, &x);
			assert_inside(x.rw, x.w);
			if (k == 0) {
				assert_int_equal(x.rw->empty, x.w->empty);
				assert_true(x.rw->rpm_min == x.w->rpm_min &&
				            x.rw->rpm_max == x.w->rpm_max &&
				            x.rw->set_min_K == x.w->set_min_K &&
				            x.rw->set_max_K == x.w->set_max_K &&
				            x.rw->safe_fraction ==
				                x.w->safe_fraction);
				assert_int_equal(x.r->solves, 0);
			} else {
				assert_nested(x.robust, prev.robust);
				assert_true(area(x.rw) <= area(prev.rw) + 1e-9);
			}
			run_free(&prev);
			prev = x;
		}
		run_free(&prev);
		free(s);
	}
	ow_units_destroy(u);
}

/* The same seed gives the same files, byte for byte, whatever the thread
 * count; another seed draws other samples. */
static void same_seed_gives_the_same_files_for_any_jobs(void **st)
{
	static const char *const files[] = {"grid.csv", "window.json"};
	const char *spec = "--spread 'viscosity_scale=0.8..1.2,"
	                   "feed_temperature=+-5 K' --samples 6 --grid 5x3";
	char args[512], a[256], b[256];
	struct cli_result r;
	size_t i;
	int j;
	(void)st;
	for (j = 1; j <= 3; j++) {
		snprintf(args, sizeof args,
		         "map tests/data/map-fast.json -o %s/spread-%d --quiet "
		         "--jobs %d --seed %d %s",
		         OW_TEST_OUT, j, j == 3 ? 1 : j, j == 3 ? 99 : 5, spec);
		cli_run(args, &r);
		if (r.code)
			fprintf(stderr, "%s\n", r.err);
		assert_int_equal(r.code, 0);
		cli_result_free(&r);
	}
	for (i = 0; i < 2; i++) {
		char *x, *y, *z;

		snprintf(a, sizeof a, "%s/spread-1/%s", OW_TEST_OUT, files[i]);
		snprintf(b, sizeof b, "%s/spread-2/%s", OW_TEST_OUT, files[i]);
		x = cli_slurp(a);
		y = cli_slurp(b);
		snprintf(b, sizeof b, "%s/spread-3/%s", OW_TEST_OUT, files[i]);
		z = cli_slurp(b);
		assert_non_null(x);
		assert_non_null(y);
		assert_non_null(z);
		assert_string_equal(x, y);
		if (i == 1) /* the seed is recorded, and moves the samples */
			assert_string_not_equal(x, z);
		free(x);
		free(y);
		free(z);
	}
}

/* The output contract (README, "The window across a spread of inputs"):
 * robust_window carries every key of the nominal window's bounds, the
 * spread record its seed and counts, grid.csv a safe_share in 0..1 on
 * every row, and the share map is written. */
static void spread_outputs_follow_the_contract(void **st)
{
	static const char *const keys[] = {
	    "empty",           "rpm_min",         "rpm_max",       "set_min_C",
	    "set_max_C",       "axis_min",        "axis_max",      "centre",
	    "output_kg_h_min", "output_kg_h_max", "safe_fraction", "zones",
	    "binding",         "boundaries"};
	char path[256], *csv, *line;
	const char *c0;
	cJSON *w, *rw, *sp;
	size_t k;
	int col = -1, i, rows = 0;
	(void)st;
	snprintf(path, sizeof path, "%s/spread-1/window.json", OW_TEST_OUT);
	w = cli_read_json(path);
	assert_non_null(w);
	rw = cJSON_GetObjectItem(w, "robust_window");
	sp = cJSON_GetObjectItem(w, "spread");
	assert_non_null(rw);
	assert_non_null(sp);
	for (k = 0; k < sizeof keys / sizeof *keys; k++) {
		if (!cJSON_GetObjectItem(rw, keys[k]))
			fail_msg("robust_window lacks %s", keys[k]);
		assert_non_null(cJSON_GetObjectItem(w, keys[k]));
	}
	assert_abs(cli_json_num(sp, "seed"), 5, 0);
	assert_abs(cli_json_num(sp, "samples"), 6, 0);
	assert_true(cli_json_num(sp, "solves") > 0);
	cJSON_Delete(w);
	snprintf(path, sizeof path, "%s/spread-1/grid.csv", OW_TEST_OUT);
	csv = cli_slurp(path);
	assert_non_null(csv);
	line = strchr(csv, '\n');
	assert_non_null(line);
	*line = '\0';
	for (i = 0, c0 = csv; c0;
	     i++, c0 = strchr(c0, ',') ? strchr(c0, ',') + 1 : NULL)
		if (!strncmp(c0, "safe_share", 10) &&
		    (c0[10] == ',' || c0[10] == '\0'))
			col = i;
	assert_true(col >= 0);
	for (; line && line[1]; line = strchr(line + 1, '\n')) {
		const char *c = line + 1;
		double v;

		for (i = 0; i < col; i++)
			c = strchr(c, ',') + 1;
		v = strtod(c, NULL);
		assert_true(v >= 0.0 && v <= 1.0);
		rows++;
	}
	assert_int_equal(rows, 15); /* 5 x 3 grid */
	free(csv);
	snprintf(path, sizeof path, "%s/spread-1/map-safe-share.png",
	         OW_TEST_OUT);
	csv = cli_slurp(path);
	assert_non_null(csv);
	free(csv);
}

/* `opwin report DIR` draws a spread map folder again from its
 * spread.json: the share map comes back, the data files stay as they
 * were. */
static void report_redraws_the_spread_from_the_folder(void **st)
{
	char args[256], path[256], *before, *after, *png;
	struct cli_result r;
	(void)st;
	snprintf(path, sizeof path, "%s/spread-2/window.json", OW_TEST_OUT);
	before = cli_slurp(path);
	snprintf(args, sizeof args, "report %s/spread-2 --quiet", OW_TEST_OUT);
	cli_run(args, &r);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	after = cli_slurp(path);
	assert_non_null(before);
	assert_non_null(after);
	assert_string_equal(before, after);
	snprintf(path, sizeof path, "%s/spread-2/map-safe-share.png",
	         OW_TEST_OUT);
	png = cli_slurp(path);
	assert_non_null(png);
	free(png);
	free(before);
	free(after);
}

/* A bad spread block is rejected naming the source and the JSON path. */
static void bad_spread_block_names_file_and_path(void **st)
{
	static const struct {
		const char *json, *want;
	} cases[] = {
	    {"{\"viscosity_scale\": {\"from\": 1.2, \"to\": 0.8}}",
	     "test: spread.viscosity_scale: to: expected >= from"},
	    {"{\"melting_point\": {\"plus_minus\": \"3 K\", \"sd\": "
	     "\"1 K\"}}",
	     "test: spread.melting_point: expected one of"},
	    {"{\"clearance\": {\"from\": \"0 mm\", \"to\": \"9 mm\"}}",
	     "test: spread.clearance: at its upper end"},
	    {"{\"viscosity\": {\"plus_minus\": 0.1}}", "test: spread"},
	    {"{\"samples\": 1}", "test: spread.samples"},
	};
	struct ow_units *u = NULL;
	struct ow_study *s = ow_test_study("fixtures/studies/hdpe-sf.json");
	size_t i;
	(void)st;
	assert_int_equal(ow_units_create(&u, NULL), OW_OK);

	for (i = 0; i < sizeof cases / sizeof *cases; i++) {
		struct ow_diag d = {{0}};

		assert_int_equal(
		    ow_config_spread_text(u, cases[i].json, "test", s, &d),
		    OW_EINPUT);
		if (!strstr(d.msg, cases[i].want))
			fail_msg("'%s' lacks '%s'", d.msg, cases[i].want);
	}
	ow_units_destroy(u);
	free(s);
}

/* A calibrated factor with a standard error varies as a normal multiplier
 * of sd std_error / value about 1; an explicit range on the same input
 * replaces it. The truncated normal's median is its mean and its ends
 * are +-3 sd (Johnson, Kotz & Balakrishnan 1994, ch. 13). */
static void calibrated_factors_vary_within_their_standard_errors(void **st)
{
	struct ow_calibration c;
	struct ow_spread sp;
	double lo, hi;
	(void)st;
	ow_calib_default(&c);
	c.present = 1;
	c.value[OW_CF_VISCOSITY] = 1.25;
	c.std_error[OW_CF_VISCOSITY] = 0.05;
	c.value[OW_CF_DIE] = 0.8;
	c.std_error[OW_CF_DIE] = 0.04;
	ow_spread_default(&sp);
	ow_spread_add_calib(&sp, &c);
	assert_int_equal(sp.n, 2);
	assert_string_equal(sp.in[0].name, "calibration.viscosity_scale");
	assert_true(sp.in[0].normal);
	assert_abs(sp.in[0].hi, 0.04, 1e-15);
	assert_abs(ow_spread_value(&sp.in[1], 0.5), 1.0, 1e-12);
	ow_spread_extent(&sp.in[1], &lo, &hi);
	assert_abs(lo, 1.0 - 3 * 0.05, 1e-12);
	assert_abs(hi, 1.0 + 3 * 0.05, 1e-12);
	assert_abs(ow_spread_value(&sp.in[1], 1e-12), lo, 1e-9);

	ow_spread_default(&sp); /* an explicit viscosity range first */
	sp.n = 1;
	sp.in[0].kind = OW_SK_VISCOSITY;
	sp.in[0].factor = OW_CF_VISCOSITY;
	ow_spread_add_calib(&sp, &c);
	assert_int_equal(sp.n, 2);
	assert_string_equal(sp.in[1].name, "calibration.die_factor");
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(
	        newtonian_share_matches_the_closed_form_probability),
	    cmocka_unit_test(robust_window_shrinks_as_the_spread_widens),
	    cmocka_unit_test(same_seed_gives_the_same_files_for_any_jobs),
	    cmocka_unit_test(spread_outputs_follow_the_contract),
	    cmocka_unit_test(report_redraws_the_spread_from_the_folder),
	    cmocka_unit_test(bad_spread_block_names_file_and_path),
	    cmocka_unit_test(
	        calibrated_factors_vary_within_their_standard_errors),
	};
	return cmocka_run_group_tests(tests, ow_test_units_setup,
	                              ow_test_units_teardown);
}
