/* test_calib.c - calibrating the model to line readings: recovery of known
 * factors from readings the model itself made (with noise), the factors
 * as plain study inputs, the readings reader, and the refusals. */
#include "testutil.h"

#include <gsl/gsl_randist.h>
#include <limits.h>
#include <gsl/gsl_rng.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <unistd.h>

#include "clirun.h"
#include "ow_calib.h"
#include "ow_config.h"
#include "ow_solver.h"

#define FAST "tests/data/map-fast.json"
#define HDPE "fixtures/studies/hdpe-sf.json"

static struct ow_units *ow_test_units; /* the readings' units */

static int setup(void **state)
{
	if (ow_units_create(&ow_test_units, NULL) != OW_OK)
		return -1;
	return ow_test_units_setup(state);
}

static int teardown(void **state)
{
	ow_units_destroy(ow_test_units);
	return ow_test_units_teardown(state);
}

/* One setting of a generated readings file. */
struct setting {
	double rpm, shift_K;
};

static const struct setting six[6] = {{40, -10}, {60, 0},  {80, 10},
                                      {100, 0},  {60, 20}, {90, -5}};

/* Readings "measured" on the model with factors f applied: each quantity
 * of mask solved at the settings, times (1 + noise) for output, pressure
 * and power, plus noise * 100 K for the melt temperature; noise drawn
 * from a Gaussian of standard deviation rel (GSL, seed fixed). */
static char *make_readings(const struct ow_study *s0, const double *f,
                           const struct setting *set, int n, unsigned mask,
                           double rel, unsigned long seed)
{
	struct ow_study *s = malloc(sizeof *s);
	struct ow_solver *sv = NULL;
	gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
	size_t cap = 8192, len = 0;
	char *t = malloc(cap);
	int i, z;

	assert_non_null(s);
	memcpy(s, s0, sizeof *s);
	ow_calib_apply(s, f);
	gsl_rng_set(rng, seed);
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	len += (size_t)snprintf(t + len, cap - len, "screw_speed_rpm");
	for (z = 0; z < s->line.n_zones; z++)
		len +=
		    (size_t)snprintf(t + len, cap - len, ",zone%d_degC", z + 1);
	len += (size_t)snprintf(t + len, cap - len, "%s%s%s%s,notes\n",
	                        mask & 1 ? ",output_kg/h" : "",
	                        mask & 2 ? ",head_pressure_MPa" : "",
	                        mask & 4 ? ",melt_temp_degC" : "",
	                        mask & 8 ? ",drive_power_kW" : "");
	for (i = 0; i < n; i++) {
		double set_K[OW_MAX_ZONES];
		struct ow_point pt;

		for (z = 0; z < s->line.n_zones; z++)
			set_K[z] = s->line.zones[z].set_K + set[i].shift_K;
		assert_int_equal(
		    ow_solver_run(sv, set[i].rpm, set_K, 0, &pt, NULL), OW_OK);
		assert_false(pt.flags & OW_FLAG_NOT_CONVERGED);
		len += (size_t)snprintf(t + len, cap - len, "%g", set[i].rpm);
		for (z = 0; z < s->line.n_zones; z++)
			len += (size_t)snprintf(t + len, cap - len, ",%.2f",
			                        set_K[z] - OW_ZERO_C_K);
		if (mask & 1)
			len += (size_t)snprintf(
			    t + len, cap - len, ",%.4f",
			    pt.output_kg_s * 3600 *
			        (1 + gsl_ran_gaussian(rng, rel)));
		if (mask & 2)
			len += (size_t)snprintf(
			    t + len, cap - len, ",%.4f",
			    pt.discharge_pressure_Pa * 1e-6 *
			        (1 + gsl_ran_gaussian(rng, rel)));
		if (mask & 4)
			len += (size_t)snprintf(
			    t + len, cap - len, ",%.3f",
			    pt.discharge_bulk_K - OW_ZERO_C_K +
			        100 * gsl_ran_gaussian(rng, rel));
		if (mask & 8)
			len += (size_t)snprintf(
			    t + len, cap - len, ",%.4f",
			    pt.power_W * 1e-3 *
			        (1 + gsl_ran_gaussian(rng, rel)));
		len += (size_t)snprintf(t + len, cap - len, ",generated\n");
	}
	ow_solver_destroy(sv);
	gsl_rng_free(rng);
	free(s);
	return t;
}

static struct ow_calib_options options(unsigned free_mask, double rel)
{
	struct ow_calib_options o;
	struct ow_calibration c;
	int q;

	ow_calib_default(&c);
	ow_calib_options_from(&c, &o);
	o.free_mask = free_mask;
	for (q = 0; q < OW_CQ_COUNT; q++) {
		o.sd_rel[q] = q == OW_CQ_MELT ? NAN : rel;
		o.sd_abs[q] = q == OW_CQ_MELT ? 100 * rel : NAN;
	}
	return o;
}

/* Fit the free factors to readings generated with truth; each within 2
 * standard errors of the truth. */
static void recover(const char *study, const double *truth, unsigned mask,
                    unsigned qty)
{
	struct ow_study *s = ow_test_study(study);
	struct ow_readings *r = NULL;
	struct ow_calib_result *res = malloc(sizeof *res);
	struct ow_calib_options o = options(mask, 0.02); /* noise 1.5 % */
	struct ow_diag d = {{0}};
	char *text = make_readings(s, truth, six, 6, qty, 0.015, 7);
	enum ow_status st;
	int k;

	assert_int_equal(ow_calib_readings_parse(ow_test_units, text,
	                                         strlen(text), "gen.csv",
	                                         s->line.n_zones, &r, &d),
	                 OW_OK);
	st = ow_calib_run(s, r, &o, res, &d);
	if (st != OW_OK)
		fail_msg("%s: %s", study, d.msg);
	for (k = 0; k < OW_CF_COUNT; k++) {
		if (!(mask & (1u << k)))
			continue;
		printf("    %s %s: true %.3f fitted %.4f +- %.4f (chi2 %.1f, "
		       "%d solves)\n",
		       study, ow_calib_factor(k)->name, truth[k], res->value[k],
		       res->std_error[k], res->chi2, res->solves);
		assert_true(fabs(res->value[k] - truth[k]) <
		            2 * res->std_error[k]);
	}
	free(text);
	free(r);
	free(res);
	free(s);
}

static void recovers_viscosity_die_and_heat_transfer_on_melt_fed(void **state)
{
	const double truth[OW_CF_COUNT] = {1.25, 1.0, 0.8, 0.6};

	(void)state;
	recover("fixtures/studies/melt-fed.json", truth,
	        (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE) |
	            (1u << OW_CF_HEAT),
	        15);
}

static void
recovers_viscosity_die_and_heat_transfer_on_plasticating(void **state)
{
	const double truth[OW_CF_COUNT] = {1.25, 1.0, 0.8, 0.6};

	(void)state;
	recover("fixtures/studies/hdpe-sf.json", truth,
	        (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE) |
	            (1u << OW_CF_HEAT),
	        15);
}

static void recovers_viscosity_and_die_on_barrier(void **state)
{
	const double truth[OW_CF_COUNT] = {0.8, 1.0, 1.3, 1.0};

	/* heat_transfer left out here: on this screw at these settings the
	 * modelled output steps by 0.3 % where a zone reaches its heating
	 * power and floats, and the fit stops on such a step */
	(void)state;
	recover("fixtures/studies/hdpe-barrier.json", truth,
	        (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE), 15);
}

/* Fit with free_mask to readings text on study path; returns the status
 * and the message in d. */
static enum ow_status fit_text(const char *path, const char *text,
                               unsigned free_mask, struct ow_calib_result *res,
                               struct ow_diag *d)
{
	struct ow_study *s = ow_test_study(path);
	struct ow_readings *r = NULL;
	struct ow_calib_options o;
	enum ow_status st;

	ow_calib_options_from(&s->calib, &o);
	o.free_mask = free_mask;
	st = ow_calib_readings_parse(ow_test_units, text, strlen(text),
	                             "line.csv", s->line.n_zones, &r, d);
	if (st == OW_OK)
		st = ow_calib_run(s, r, &o, res, d);
	free(r);
	free(s);
	return st;
}

static void expect_refusal(const char *path, const char *text,
                           unsigned free_mask, const char *says)
{
	struct ow_calib_result *res = malloc(sizeof *res);
	struct ow_diag d = {{0}};

	assert_int_equal(fit_text(path, text, free_mask, res, &d), OW_EINPUT);
	if (!strstr(d.msg, says))
		fail_msg("expected \"%s\" in: %s", says, d.msg);
	free(res);
}

/* With no factor free the fit changes nothing: every factor stays 1 and
 * the modelled values are the plain solver's at the study's set-points. */
static void no_free_factor_changes_nothing(void **state)
{
	const char *text = "screw_speed_rpm,output_kg/h\n60,40\n";
	struct ow_calib_result *res = malloc(sizeof *res);
	struct ow_study *s = ow_test_study(HDPE);
	struct ow_solver *sv = NULL;
	struct ow_diag d = {{0}};
	struct ow_point pt;
	int k;

	(void)state;
	assert_int_equal(fit_text(HDPE, text, 0, res, &d), OW_OK);
	assert_int_equal(res->n_free, 0);
	for (k = 0; k < OW_CF_COUNT; k++)
		assert_true(res->value[k] == 1.0);
	assert_int_equal(ow_solver_create(s, &sv, NULL), OW_OK);
	assert_int_equal(ow_solver_run(sv, 60, NULL, 0, &pt, NULL), OW_OK);
	assert_rel(res->resid[0].modelled, pt.output_kg_s, 1e-4);
	ow_solver_destroy(sv);
	free(s);
	free(res);
}

/* One measured value cannot fix two factors. */
static void fewer_values_than_factors_are_refused(void **state)
{
	(void)state;
	expect_refusal(HDPE, "screw_speed_rpm,output_kg/h\n60,40\n",
	               (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE),
	               "cannot determine 2 free factors");
}

/* The plug is taken as melt-controlled, so output and pressure do not
 * depend on the pellet friction: readings of them cannot fix it. */
static void a_factor_no_reading_moves_is_refused(void **state)
{
	(void)state;
	expect_refusal(FAST,
	               "screw_speed_rpm,output_kg/h,head_pressure_MPa\n"
	               "40,30,8\n80,60,10\n",
	               1u << OW_CF_FRICTION, "do not determine friction");
}

/* Output alone cannot fix the viscosity of a power-law melt fed into a
 * short metering screw: pressure flow in the screw and flow through the
 * die both scale as (dp / m)^(1/n), so scaling m everywhere leaves the
 * matched output where it was (Tadmor & Gogos 2006, ch. 9, screw and die
 * characteristics) but for the small change in viscous heating. */
static void output_alone_cannot_fix_the_viscosity(void **state)
{
	(void)state;
	expect_refusal(FAST,
	               "screw_speed_rpm,output_kg/h\n40,30\n60,45\n80,60\n",
	               (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE),
	               "do not determine viscosity_scale");
}

/* The same setting logged twice with outputs 40 % apart. */
static void contradictory_readings_are_refused(void **state)
{
	(void)state;
	expect_refusal(FAST,
	               "screw_speed_rpm,output_kg/h,head_pressure_MPa\n"
	               "60,30,9\n60,42,9\n60,30,9.2\n",
	               (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE),
	               "contradict");
}

/* A melt colder than the feed and every set-point names its line. */
static void an_unreachable_reading_is_named(void **state)
{
	(void)state;
	expect_refusal(HDPE,
	               "screw_speed_rpm,melt_temp_degC,notes\n"
	               "60,225,ok\n80,20,thermocouple off\n",
	               1u << OW_CF_VISCOSITY, "line.csv: line 3: melt");
}

/* Units in the header as everywhere else; notes kept; an empty cell is
 * a value not read; zones beyond the study's and unknown columns are
 * rejected with their column. 1 psi = 6894.757 Pa, 1 lb = 0.45359237 kg
 * (NIST SP 811, 2008, appendix B). */
static void readings_are_read_in_their_units(void **state)
{
	const char *text =
	    "screw_speed_rpm,zone5_degF,output_lb/h,head_pressure_psi,"
	    "notes\n60,392,100,1000,first shift\n80,,,1200,\n";
	struct ow_readings *r = NULL;
	struct ow_diag d = {{0}};

	(void)state;
	assert_int_equal(ow_calib_readings_parse(ow_test_units, text,
	                                         strlen(text), "r.csv", 5, &r,
	                                         &d),
	                 OW_OK);
	assert_int_equal((int)r->n, 2);
	assert_rel(r->r[0].set_K[4], 473.15, 1e-9);
	assert_true(r->r[0].set_given[4] && !r->r[1].set_given[4]);
	assert_false(r->r[0].set_given[0]);
	assert_rel(r->r[0].value[OW_CQ_OUTPUT], 100 * 0.45359237 / 3600, 1e-9);
	assert_rel(r->r[1].value[OW_CQ_PRESSURE], 1200 * 6894.757, 1e-6);
	assert_true(isnan(r->r[1].value[OW_CQ_OUTPUT]));
	assert_string_equal(r->r[0].notes, "first shift");
	assert_int_equal(r->r[1].line, 3);
	free(r);
	assert_int_equal(ow_calib_readings_parse(ow_test_units, text,
	                                         strlen(text), "r.csv", 4, &r,
	                                         &d),
	                 OW_EINPUT);
	assert_non_null(strstr(d.msg, "column 2 (zone5_degF)"));
	text = "screw_speed_rpm,output_kg/h,speed_m/s\n60,40,1\n";
	memset(&d, 0, sizeof d); /* a diag keeps its first message */
	assert_int_equal(ow_calib_readings_parse(ow_test_units, text,
	                                         strlen(text), "r.csv", 4, &r,
	                                         &d),
	                 OW_EINPUT);
	assert_non_null(strstr(d.msg, "column 3 (speed_m/s): unknown column"));
}

/* Write text to dir/name; the path into out. */
static void put(const char *dir, const char *name, const char *text, char *out,
                size_t n)
{
	FILE *f;

	snprintf(out, n, "%s/%s", dir, name);
	f = fopen(out, "w");
	assert_non_null(f);
	fputs(text, f);
	fclose(f);
}

/* The study with a hand-written calibration block of the given values. */
static char *hand_study(double visc, double die)
{
	cJSON *doc = cli_read_json(FAST), *b = cJSON_CreateObject();
	char *text;

	cJSON_AddNumberToObject(b, "viscosity_scale", visc);
	cJSON_AddNumberToObject(b, "die_factor", die);
	cJSON_AddItemToObject(doc, "calibration", b);
	text = cJSON_Print(doc);
	cJSON_Delete(doc);
	return text;
}

static double factor_of(const cJSON *study, const char *name)
{
	const cJSON *c = cJSON_GetObjectItem(study, "calibration");

	return cli_json_num(cJSON_GetObjectItem(c, name), "value");
}

/* Calibrating the calibrated study again to the same readings starts
 * from its factors and ends where the first fit did. */
static void recalibrate(const char *cal, const char *csv, const char *dir,
                        const cJSON *first)
{
	char args[512], again[96];
	struct cli_result r;
	cJSON *doc;

	snprintf(again, sizeof again, "%s/again.json", dir);
	snprintf(args, sizeof args, "calibrate %s %s -o %s --quiet", cal, csv,
	         again);
	cli_run(args, &r);
	if (r.code != 0)
		fail_msg("calibrate again: %s", r.err);
	cli_result_free(&r);
	doc = cli_read_json(again);
	assert_rel(factor_of(doc, "viscosity_scale"),
	           factor_of(first, "viscosity_scale"), 2e-3);
	assert_rel(factor_of(doc, "die_factor"), factor_of(first, "die_factor"),
	           2e-3);
	cJSON_Delete(doc);
}

/* `opwin calibrate` writes the factors into the study and nothing else:
 * a map of the calibrated study equals a map of the study with the same
 * factors typed into its calibration block by hand. */
static void map_of_calibrated_study_equals_hand_edited(void **state)
{
	const double truth[OW_CF_COUNT] = {1.3, 1.0, 0.7, 1.0};
	struct ow_study *s = ow_test_study(FAST);
	char dir[] = OW_TEST_OUT "/calib-XXXXXX", csv[96], cal[96], hand[96],
	     args[512], *text, *a, *b;
	struct cli_result r;
	cJSON *doc;

	(void)state;
	assert_non_null(mkdtemp(dir));
	text = make_readings(s, truth, six, 6, 3, 0.01, 11);
	put(dir, "line.csv", text, csv, sizeof csv);
	free(text);
	snprintf(cal, sizeof cal, "%s/cal.json", dir);
	snprintf(args, sizeof args,
	         "calibrate %s %s --free "
	         "viscosity_scale,die_factor -o %s --plot %s/res.svg",
	         FAST, csv, cal, dir);
	cli_run(args, &r);
	if (r.code != 0)
		fail_msg("calibrate: %s", r.err);
	assert_non_null(strstr(r.out, "viscosity_scale"));
	cli_result_free(&r);
	doc = cli_read_json(cal);
	text = hand_study(factor_of(doc, "viscosity_scale"),
	                  factor_of(doc, "die_factor"));
	recalibrate(cal, csv, dir, doc);
	cJSON_Delete(doc);
	put(dir, "hand.json", text, hand, sizeof hand);
	free(text);
	snprintf(args, sizeof args,
	         "map %s -o %s/m1 --grid 5x4 --quiet && "
	         "%s map %s -o %s/m2 --grid 5x4 --quiet",
	         cal, dir, cli_binary(), hand, dir);
	cli_run(args, &r);
	assert_int_equal(r.code, 0);
	cli_result_free(&r);
	snprintf(args, sizeof args, "%s/m1/grid.csv", dir);
	a = cli_slurp(args);
	snprintf(args, sizeof args, "%s/m2/grid.csv", dir);
	b = cli_slurp(args);
	assert_non_null(a);
	assert_non_null(b);
	assert_string_equal(a, b);
	free(a);
	free(b);
	snprintf(args, sizeof args, "rm -rf %s", dir);
	assert_int_equal(system(args), 0);
	free(s);
}

/* calibration.heat_transfer multiplies barrel.heat_transfer_factor: 0.6
 * in the one is the same model as 0.6 in the other, point for point. */
static void heat_transfer_factor_is_the_barrel_multiplier(void **state)
{
	char dir[] = OW_TEST_OUT "/calib-XXXXXX", a[96], b[96], args[400];
	char screw[PATH_MAX], resin[PATH_MAX];
	cJSON *doc = cli_read_json(HDPE), *pa, *pb;
	cJSON *c = cJSON_CreateObject();
	char *text;

	(void)state;
	assert_non_null(mkdtemp(dir));
	assert_non_null(realpath("fixtures/screws/sf-63-3to1.json", screw));
	assert_non_null(realpath("fixtures/resins/hdpe-pipe.json", resin));
	cJSON_ReplaceItemInObject(doc, "screw", cJSON_CreateString(screw));
	cJSON_ReplaceItemInObject(doc, "resin", cJSON_CreateString(resin));
	cJSON_AddNumberToObject(c, "heat_transfer", 0.6);
	cJSON_AddItemToObject(doc, "calibration", c);
	text = cJSON_Print(doc);
	put(dir, "a.json", text, a, sizeof a);
	free(text);
	cJSON_DeleteItemFromObject(doc, "calibration");
	cJSON_AddNumberToObject(cJSON_GetObjectItem(doc, "barrel"),
	                        "heat_transfer_factor", 0.6);
	text = cJSON_Print(doc);
	put(dir, "b.json", text, b, sizeof b);
	free(text);
	cJSON_Delete(doc);
	snprintf(args, sizeof args, "point %s --rpm 70 --json", a);
	pa = cli_run_json(args);
	snprintf(args, sizeof args, "point %s --rpm 70 --json", b);
	pb = cli_run_json(args);
	assert_true(cli_json_num(pa, "output_kg_h") ==
	            cli_json_num(pb, "output_kg_h"));
	assert_true(cli_json_num(pa, "discharge_bulk_temp_C") ==
	            cli_json_num(pb, "discharge_bulk_temp_C"));
	assert_true(cli_json_num(pa, "barrel_heat_kW") ==
	            cli_json_num(pb, "barrel_heat_kW"));
	cJSON_Delete(pa);
	cJSON_Delete(pb);
	snprintf(args, sizeof args, "rm -rf %s", dir);
	assert_int_equal(system(args), 0);
}

/* All factors off: exit 0, the message says nothing changed and no file
 * is written. */
static void calibrate_with_nothing_free_says_so(void **state)
{
	char dir[] = OW_TEST_OUT "/calib-XXXXXX", csv[96], args[400];
	struct cli_result r;

	(void)state;
	assert_non_null(mkdtemp(dir));
	put(dir, "line.csv", "screw_speed_rpm,output_kg/h\n60,40\n", csv,
	    sizeof csv);
	snprintf(args, sizeof args, "calibrate %s %s -o %s/out.json", FAST, csv,
	         dir);
	cli_run(args, &r);
	assert_int_equal(r.code, 0);
	assert_non_null(strstr(r.out, "nothing to fit, the model is "
	                              "unchanged"));
	assert_non_null(strstr(r.out, "not written: nothing changed"));
	cli_result_free(&r);
	snprintf(args, sizeof args, "%s/out.json", dir);
	assert_int_equal(access(args, F_OK), -1);
	snprintf(args, sizeof args, "rm -rf %s", dir);
	assert_int_equal(system(args), 0);
}

/* A factor outside its bounds in the calibration block is an input error
 * naming its JSON path. */
static void calibration_block_is_checked(void **state)
{
	char dir[] = OW_TEST_OUT "/calib-XXXXXX", path[96], args[300];
	char *text = hand_study(9.0, 1.0);
	struct cli_result r;

	(void)state;
	assert_non_null(mkdtemp(dir));
	put(dir, "bad.json", text, path, sizeof path);
	free(text);
	snprintf(args, sizeof args, "check %s", path);
	cli_run(args, &r);
	assert_int_equal(r.code, 1);
	assert_non_null(strstr(r.err, "calibration.viscosity_scale: 9: "
	                              "expected a factor in 0.2..5"));
	cli_result_free(&r);
	snprintf(args, sizeof args, "rm -rf %s", dir);
	assert_int_equal(system(args), 0);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(
	        recovers_viscosity_die_and_heat_transfer_on_melt_fed),
	    cmocka_unit_test(
	        recovers_viscosity_die_and_heat_transfer_on_plasticating),
	    cmocka_unit_test(recovers_viscosity_and_die_on_barrier),
	    cmocka_unit_test(no_free_factor_changes_nothing),
	    cmocka_unit_test(fewer_values_than_factors_are_refused),
	    cmocka_unit_test(a_factor_no_reading_moves_is_refused),
	    cmocka_unit_test(output_alone_cannot_fix_the_viscosity),
	    cmocka_unit_test(contradictory_readings_are_refused),
	    cmocka_unit_test(an_unreachable_reading_is_named),
	    cmocka_unit_test(readings_are_read_in_their_units),
	    cmocka_unit_test(map_of_calibrated_study_equals_hand_edited),
	    cmocka_unit_test(heat_transfer_factor_is_the_barrel_multiplier),
	    cmocka_unit_test(calibrate_with_nothing_free_says_so),
	    cmocka_unit_test(calibration_block_is_checked),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
