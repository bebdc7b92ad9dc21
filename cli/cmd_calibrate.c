/* cmd_calibrate.c - `opwin calibrate STUDY.json READINGS.csv`: fit model
 * factors to a line's logged readings; print the fit and the residuals,
 * write the calibrated study and the residual plot. */
#include "cli.h"

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MAX_SD 8

struct cal_args {
	struct cli_common c;
	const char *study, *readings, *out, *plot, *free;
	int n_sd;
	const char *sd[MAX_SD]; /* "QUANTITY=VALUE" */
};

static void help(void)
{
	printf("usage: opwin calibrate STUDY.json READINGS.csv [-o "
	       "calibrated.json]\n"
	       "                 [--free NAME[,NAME...]] [--sd "
	       "QUANTITY=VALUE]...\n"
	       "                 [--plot residuals.png|.svg] [--units si|us] "
	       "[--jobs N] [--quiet]\n\n"
	       "Fits model factors so that the model reproduces what the line "
	       "showed, by\nweighted least squares, and writes the study with "
	       "the factors in its\n`calibration` block (opwin map uses them "
	       "as they stand).\n\n"
	       "READINGS.csv: a header line, then one row per logged steady "
	       "setting; columns\n"
	       "  screw_speed_rpm             required\n"
	       "  zone1_degC, zone2_degC ...  set-points (empty or missing: "
	       "the study's own)\n"
	       "  output_kg/h, head_pressure_MPa, melt_temp_degC, "
	       "drive_power_kW, torque_N m\n"
	       "                              any of them (other units as "
	       "everywhere; empty:\n"
	       "                              not read)\n"
	       "  notes                       text, ignored by the fit\n\n"
	       "  --free NAMES   factors to fit (default: the study's "
	       "calibration.free):\n"
	       "                 viscosity_scale  the resin's melt viscosity\n"
	       "                 friction         both pellet friction "
	       "coefficients\n"
	       "                 die_factor       the pressure the die needs\n"
	       "                 heat_transfer    the barrel zones' wall "
	       "heat-transfer coefficients\n"
	       "  --sd Q=V       a reading's uncertainty, relative ('2%%') or "
	       "with its unit\n"
	       "                 ('0.5 MPa', '3 K'); Q: output, head_pressure, "
	       "melt_temp,\n"
	       "                 drive_power, torque (defaults printed)\n"
	       "  -o FILE        write the calibrated study\n"
	       "  --plot FILE    modelled against measured values (PNG or "
	       "SVG)\n"
	       "exit codes: 0 ok, 1 inputs rejected or readings that cannot "
	       "determine the\nfactors, 2 usage, 3 computation failed, "
	       "4 output not written\n");
}

/* ---- printing ---------------------------------------------------------- */

static const char *const labels[OW_CQ_COUNT] = {
    "output", "head pressure", "melt temperature", "drive power", "torque"};

static double shown(enum ow_unit_system sys, enum ow_calib_qty q, double si)
{
	return ow_display_value(sys, ow_calib_qty_dim(q), si);
}

/* A difference of quantity q in display units. */
static double shown_diff(enum ow_unit_system sys, enum ow_calib_qty q,
                         double si)
{
	if (q == OW_CQ_MELT)
		return ow_display_value(sys, OW_DIM_TEMP_DIFF, si);
	return shown(sys, q, si) - shown(sys, q, 0.0);
}

static const char *unit_of(enum ow_unit_system sys, enum ow_calib_qty q)
{
	return ow_display_label(sys, ow_calib_qty_dim(q));
}

static void print_sd(const struct ow_calib_options *o, enum ow_unit_system sys)
{
	int q;

	printf("uncertainties:");
	for (q = 0; q < OW_CQ_COUNT; q++) {
		enum ow_calib_qty e = (enum ow_calib_qty)q;

		if (!isnan(o->sd_rel[q]))
			printf(" %s %.3g %%", labels[q], 100 * o->sd_rel[q]);
		else
			printf(" %s %.3g %s", labels[q],
			       shown_diff(sys, e, o->sd_abs[q]),
			       e == OW_CQ_MELT
			           ? ow_display_label(sys, OW_DIM_TEMP_DIFF)
			           : unit_of(sys, e));
		printf("%s", q + 1 < OW_CQ_COUNT ? "," : "\n");
	}
}

static void print_factors(const struct ow_calib_result *r)
{
	int k, l;

	printf("\n%-17s %10s %12s   %s\n", "factor", "value", "std. error",
	       "bounds");
	for (k = 0; k < r->n_free; k++) {
		const struct ow_calib_factor *f = ow_calib_factor(r->ids[k]);

		printf("%-17s %10.4f %12.4f   %g..%g\n", f->name,
		       r->value[r->ids[k]], r->std_error[r->ids[k]], f->lo,
		       f->hi);
	}
	if (r->n_free < 2)
		return;
	printf("\ncorrelation\n%-17s", "");
	for (k = 0; k < r->n_free; k++)
		printf(" %16s", ow_calib_factor(r->ids[k])->name);
	printf("\n");
	for (k = 0; k < r->n_free; k++) {
		printf("%-17s", ow_calib_factor(r->ids[k])->name);
		for (l = 0; l < r->n_free; l++)
			printf(" %16.3f", r->corr[k][l]);
		printf("\n");
	}
}

static void print_residuals(const struct ow_calib_result *r,
                            enum ow_unit_system sys)
{
	int i;

	printf("\n%5s %7s  %-24s %11s %11s %11s %8s\n", "line", "rpm",
	       "quantity", "measured", "modelled", "residual", "in sd");
	for (i = 0; i < r->n_resid; i++) {
		const struct ow_calib_resid *e = &r->resid[i];
		char what[48];

		snprintf(what, sizeof what, "%s (%s)", labels[e->qty],
		         unit_of(sys, e->qty));
		printf("%5d %7.1f  %-24s %11.4g %11.4g %+11.3g %+8.2f\n",
		       e->line, e->rpm, what, shown(sys, e->qty, e->measured),
		       shown(sys, e->qty, e->modelled),
		       shown_diff(sys, e->qty, e->modelled - e->measured),
		       ow_calib_resid_sd(e));
	}
}

static void print_fit(const struct cal_args *a, const struct ow_study *s,
                      const struct ow_readings *rd,
                      const struct ow_calib_options *o,
                      const struct ow_calib_result *r)
{
	printf("calibration of \"%s\" to %s: %zu readings, %d measured "
	       "values\n",
	       s->title, a->readings, rd->n, r->n_resid);
	print_sd(o, a->c.units);
	if (r->n_free == 0)
		printf("\nNo factor is free (--free NAME, or calibration.free "
		       "in the study): nothing to fit, the model is "
		       "unchanged. The study's own model against the "
		       "readings:\n");
	else
		print_factors(r);
	printf("\nchi-square %.2f for %d degrees of freedom", r->chi2, r->dof);
	if (r->n_free > 0)
		printf(" (%.2f at the study's own factors)%s", r->chi2_start,
		       r->err_scale > 1.0 ? "; standard errors scaled by "
		                            "sqrt(chi-square/dof)"
		                          : "");
	printf("\n");
	print_residuals(r, a->c.units);
	if (r->n_free > 0)
		printf("\n%d iterations, %d point solves\n", r->iterations,
		       r->solves);
}

/* ---- options ----------------------------------------------------------- */

static int parse_free(const char *cmd, const char *list, unsigned *mask)
{
	char buf[256], *tok, *save = NULL;
	int k;

	*mask = 0;
	snprintf(buf, sizeof buf, "%s", list);
	for (tok = strtok_r(buf, ",", &save); tok;
	     tok = strtok_r(NULL, ",", &save)) {
		k = ow_calib_factor_find(tok);
		if (k < 0)
			return cli_usage_error(cmd,
			                       "--free takes "
			                       "viscosity_scale, friction, "
			                       "die_factor, heat_transfer "
			                       "(comma-separated)");
		*mask |= 1u << k;
	}
	return 0;
}

static int parse_sd(const struct ow_units *u, const char *spec,
                    struct ow_calib_options *o)
{
	const char *eq = strchr(spec, '=');
	struct ow_diag d = {{0}};
	enum ow_dim dim;
	double v = NAN;
	int q, rel;

	for (q = 0; eq && q < OW_CQ_COUNT; q++)
		if (strlen(ow_calib_qty_name((enum ow_calib_qty)q)) ==
		        (size_t)(eq - spec) &&
		    !strncmp(spec, ow_calib_qty_name((enum ow_calib_qty)q),
		             (size_t)(eq - spec)))
			break;
	if (!eq || q == OW_CQ_COUNT)
		return cli_usage_error("calibrate",
		                       "--sd takes QUANTITY=VALUE "
		                       "with QUANTITY one of output, "
		                       "head_pressure, melt_temp, drive_power, "
		                       "torque");
	rel = strchr(eq, '%') != NULL;
	dim = rel ? OW_DIM_NONE : ow_calib_qty_dim((enum ow_calib_qty)q);
	if (dim == OW_DIM_TEMPERATURE)
		dim = OW_DIM_TEMP_DIFF;
	if (ow_units_parse(u, eq + 1, dim, 0.0, &v, &d) != OW_OK || !(v > 0))
		return cli_usage_error("calibrate",
		                       "--sd: the value must be "
		                       "a positive percentage ('2%') or a "
		                       "quantity with its unit ('0.5 MPa')");
	o->sd_rel[q] = rel ? v : NAN;
	o->sd_abs[q] = rel ? NAN : v;
	return 0;
}

/* ---- run --------------------------------------------------------------- */

static int write_outputs(const struct cal_args *a, const struct ow_study *s,
                         const struct ow_calib_options *o,
                         const struct ow_calib_result *r)
{
	struct ow_diag d = {{0}};
	enum ow_status st = OW_OK;
	char *text = NULL, title[320];

	if (a->plot) {
		snprintf(title, sizeof title, "Calibration of %.120s to %.150s",
		         s->title, a->readings);
		st = ow_calib_plot(r->resid, r->n_resid, a->c.units, title,
		                   a->plot, &d);
		if (st == OW_OK && !a->c.quiet)
			printf("plot: %s\n", a->plot);
	}
	if (st == OW_OK && a->out && r->n_free == 0 && !a->c.quiet)
		printf("%s not written: nothing changed\n", a->out);
	if (st == OW_OK && a->out && r->n_free > 0) {
		st = ow_calib_study_text(s, o, r, a->readings, a->out, &text,
		                         &d);
		if (st == OW_OK)
			st = ow_io_write_file(a->out, text, strlen(text), &d);
		if (st == OW_OK && !a->c.quiet)
			printf("calibrated study: %s\n", a->out);
	}
	free(text);
	return st == OW_OK ? CLI_OK : cli_fail("calibrate", st, &d);
}

static int run(const struct cal_args *a)
{
	struct ow_units *u = NULL;
	struct ow_study *s = NULL;
	struct ow_readings *rd = NULL;
	struct ow_calib_result *r = malloc(sizeof *r);
	struct ow_calib_options o;
	struct ow_diag d = {{0}};
	enum ow_status st;
	int rc = cli_load_study("calibrate", a->study, &u, &s), k;

	if (rc || !r)
		goto done;
	ow_calib_options_from(&s->calib, &o);
	o.jobs = a->c.jobs;
	if (a->free && (rc = parse_free("calibrate", a->free, &o.free_mask)))
		goto done;
	for (k = 0; k < a->n_sd; k++)
		if ((rc = parse_sd(u, a->sd[k], &o)))
			goto done;
	st = ow_calib_readings_read(u, a->readings, s->line.n_zones, &rd, &d);
	if (st == OW_OK)
		st = ow_calib_run(s, rd, &o, r, &d);
	if (st != OW_OK) {
		if (r->n_resid > 0 && !a->c.quiet) { /* what was refused */
			printf("refused; the readings against the model at "
			       "the factors reached:\n");
			print_residuals(r, a->c.units);
		}
		rc = cli_fail("calibrate", st, &d);
		goto done;
	}
	if (!a->c.quiet)
		print_fit(a, s, rd, &o, r);
	rc = write_outputs(a, s, &o, r);
done:
	if (!r && !rc)
		rc = cli_fail("calibrate", OW_ENOMEM, NULL);
	free(r);
	free(rd);
	free(s);
	ow_units_destroy(u);
	return rc;
}

static int option(void *ctx, int id, const char *arg)
{
	struct cal_args *a = ctx;

	switch (id) {
	case 'o':
		a->out = arg;
		return 0;
	case 'p':
		a->plot = arg;
		return 0;
	case 'F':
		a->free = arg;
		return 0;
	case 'S':
		if (a->n_sd == MAX_SD)
			return cli_usage_error("calibrate", "too many --sd");
		a->sd[a->n_sd++] = arg;
		return 0;
	default:
		return CLI_NOT_MINE;
	}
}

int cmd_calibrate(int argc, char **argv)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"output", required_argument, NULL, 'o'},
	    {"plot", required_argument, NULL, 'p'},
	    {"free", required_argument, NULL, 'F'},
	    {"sd", required_argument, NULL, 'S'},
	    {NULL, 0, NULL, 0},
	};
	static const struct cli_spec spec = {
	    "calibrate",
	    opts,
	    "ho:q",
	    help,
	    option,
	    2,
	    "expects STUDY.json and READINGS.csv"};
	struct cal_args a;
	char **args;
	int rc;

	memset(&a, 0, sizeof a);
	a.c.units = OW_SYS_SI;
	rc = cli_options(&spec, argc, argv, &a, &a.c, &args);
	if (rc != CLI_GO_ON)
		return rc;
	a.study = args[0];
	a.readings = args[1];
	return run(&a);
}
