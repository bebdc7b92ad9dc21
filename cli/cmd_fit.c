/* cmd_fit.c - `opwin fit DATA.csv`: fit a viscosity model and its
 * temperature shift to lab data; print the fit, write the resin block. */
#include "cli.h"

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_fit.h"

struct fit_args {
	struct cli_common c;
	struct ow_fit_options opts;
	const char *data, *out, *into, *plot;
};

static void help(void)
{
	printf("usage: opwin fit DATA.csv [--model cross|carreau-yasuda|"
	       "power-law]\n"
	       "                 [--shift arrhenius|wlf] [-o resin.json] "
	       "[--into resin.json]\n"
	       "                 [--plot fit.png] [--units si|us] [--quiet]\n\n"
	       "Fits a melt viscosity model and its temperature shift to lab "
	       "data by least\nsquares on log10 viscosity, and writes the "
	       "`viscosity` block of a resin file.\n\n"
	       "DATA.csv: a header line, then one row per measurement; "
	       "columns (any order)\n"
	       "  temperature_degC   (or _degF, _K)\n"
	       "  shear_rate_1/s     (or angular_frequency_rad/s: Cox-Merz "
	       "data)\n"
	       "  viscosity_Pa s     (or _Pa.s, _kPa s; complex_viscosity_... "
	       "for |eta*|)\n\n"
	       "  --model M      fit one model; without it every model is "
	       "fitted and the\n"
	       "                 one with the lowest BIC is recommended and "
	       "written\n"
	       "  --shift S      temperature shift (default arrhenius; wlf "
	       "needs 3 temperatures)\n"
	       "  -o FILE        write {\"viscosity\": ...} to FILE (default: "
	       "standard output)\n"
	       "  --into FILE    replace the viscosity block of an existing "
	       "resin file\n"
	       "                 (the rest of it kept as written; any other "
	       "file is refused)\n"
	       "  --plot FILE    draw data and fitted curves into a PNG\n"
	       "  --units si|us  units for people (the resin block is always "
	       "SI)\n"
	       "  --quiet        print no summary\n"
	       "exit codes: 0 ok, 1 data rejected, 2 usage, 3 fit failed, "
	       "4 output not written\n");
}

/* Print s left-aligned in width columns, counting UTF-8 characters (°, ·,
 * ±, ⁿ take one column but several bytes). */
static void pad(FILE *f, const char *s, int width)
{
	int n = 0;
	const char *p;

	for (p = s; *p; p++)
		n += ((unsigned char)*p & 0xC0) != 0x80;
	fputs(s, f);
	for (; n < width; n++)
		fputc(' ', f);
}

/* "value ± error unit" with the error to two significant digits. */
static void fmt_pm(char *buf, size_t len, double v, double se, const char *unit)
{
	int dec;

	if (!isfinite(se) || se > 10.0 * fabs(v)) {
		snprintf(buf, len, "%.4g %s (not determined by the data)", v,
		         unit);
		return;
	}
	dec = se > 0 ? 1 - (int)floor(log10(se)) : 4;
	dec = dec < 0 ? 0 : dec > 8 ? 8 : dec;
	snprintf(buf, len, "%.*f ± %.*f %s", dec, v, dec, se, unit);
}

/* A parameter in the units people read: label, scale to display. */
static void param_display(const char *key, enum ow_unit_system sys,
                          const char **label, const char **unit, double *scale,
                          double *offset)
{
	*scale = 1.0;
	*offset = 0.0;
	*unit = "";
	if (!strcmp(key, "zero_shear")) {
		*label = "zero-shear viscosity";
		*unit = "Pa·s";
	} else if (!strcmp(key, "consistency")) {
		*label = "consistency m";
		*unit = "Pa·sⁿ";
	} else if (!strcmp(key, "index")) {
		*label = "power-law index n";
	} else if (!strcmp(key, "critical_stress")) {
		*label = "critical stress";
		*unit = sys == OW_SYS_US ? "psi" : "kPa";
		*scale = sys == OW_SYS_US
		             ? ow_display_value(sys, OW_DIM_PRESSURE, 1.0)
		             : 1e-3;
	} else if (!strcmp(key, "time_constant")) {
		*label = "time constant";
		*unit = "s";
	} else if (!strcmp(key, "a")) {
		*label = "Yasuda a";
	} else if (!strcmp(key, "activation_energy")) {
		*label = "activation energy";
		*unit = "kJ/mol";
		*scale = 1e-3;
	} else if (!strcmp(key, "c1")) {
		*label = "WLF c1";
	} else {
		*label = "WLF c2";
		*unit = ow_display_label(sys, OW_DIM_TEMP_DIFF);
		*scale = ow_display_value(sys, OW_DIM_TEMP_DIFF, 1.0);
	}
}

static void print_params(FILE *f, const struct ow_fit_result *r,
                         enum ow_unit_system sys)
{
	char buf[160];
	int k;

	for (k = 0; k < r->n_params; k++) {
		const struct ow_fit_param *p = &r->params[k];
		const char *label, *unit;
		double s, o;

		param_display(p->key, sys, &label, &unit, &s, &o);
		fmt_pm(buf, sizeof buf, p->value * s + o, p->std_error * s,
		       unit);
		fprintf(f, "  %-22s ", label);
		pad(f, buf, 34);
		if (isfinite(p->rel_error) && p->rel_error < 10.0)
			fprintf(f, " (%.1f %%)", 100.0 * p->rel_error);
		fputc('\n', f);
	}
	fprintf(f,
	        "  RMS error %.4f in log10 viscosity (about %.1f %%), "
	        "BIC %.1f, AIC %.1f\n",
	        r->rms_log10, 100.0 * (pow(10.0, r->rms_log10) - 1.0), r->bic,
	        r->aic);
}

/* A temperature in the units people read, without a needless ".0". */
static void fmt_temp(char *buf, size_t len, double T_K, enum ow_unit_system sys,
                     int unit)
{
	double t = ow_display_value(sys, OW_DIM_TEMPERATURE, T_K);

	snprintf(buf, len, "%.*f%s%s", fabs(t - round(t)) < 0.05 ? 0 : 1, t,
	         unit ? " " : "",
	         unit ? ow_display_label(sys, OW_DIM_TEMPERATURE) : "");
}

static void print_residuals(FILE *f, const struct ow_fit_result *r,
                            enum ow_unit_system sys)
{
	int k;

	fprintf(f,
	        "  residuals log10(fit/data) by temperature:\n"
	        "    %-12s %6s  %-20s %8s %8s %8s\n",
	        "temperature", "points", "shear rate (1/s)", "mean", "RMS",
	        "max");
	for (k = 0; k < r->n_temps; k++) {
		const struct ow_fit_temp *t = &r->temps[k];
		char temp[32], rates[40];

		fmt_temp(temp, sizeof temp, t->temp_K, sys, 1);
		snprintf(rates, sizeof rates, "%g .. %g", t->min_rate_1_s,
		         t->max_rate_1_s);
		fputs("    ", f);
		pad(f, temp, 12);
		fprintf(f, " %6d  %-20s %+8.4f %8.4f %8.4f\n", t->n_points,
		        rates, t->mean_log10, t->rms_log10, t->max_abs_log10);
	}
}

static void print_data(FILE *f, const struct ow_fit_data *data,
                       const struct ow_fit_report *rep, enum ow_unit_system sys)
{
	const char *tl = ow_display_label(sys, OW_DIM_TEMPERATURE);
	char t[32];
	int k;

	fprintf(f, "data    %s: %zu points at %d temperatures (", data->source,
	        data->n, rep->n_temps);
	for (k = 0; k < rep->n_temps; k++) {
		fmt_temp(t, sizeof t, rep->temps_K[k], sys, 0);
		fprintf(f, "%s%s", k ? ", " : "", t);
	}
	fprintf(f, " %s),\n        shear rate %g .. %g 1/s\n", tl,
	        rep->min_rate_1_s, rep->max_rate_1_s);
	if (data->cox_merz)
		fprintf(f, "        oscillatory data: complex viscosity at "
		           "angular frequency w taken as\n        "
		           "steady-shear viscosity at shear rate w (Cox-Merz "
		           "rule)\n");
	fmt_temp(t, sizeof t, rep->ref_temp_K, sys, 1);
	fprintf(f,
	        "fit     least squares on log10 viscosity, model and %s "
	        "shift together;\n        reference temperature %s%s\n",
	        rep->opts.shift == OW_SHIFT_WLF ? "WLF" : "Arrhenius", t,
	        isfinite(rep->opts.ref_temp_K) ? ""
	                                       : " (the middle data "
	                                         "temperature)");
}

static void print_warnings(FILE *f, const struct ow_fit_report *rep)
{
	const struct ow_fit_result *b = &rep->fits[rep->best];
	int k, n = rep->n_warnings + b->n_warnings;

	if (n == 0) {
		fprintf(f, "\nno warnings\n");
		return;
	}
	fprintf(f, "\nwarnings\n");
	for (k = 0; k < rep->n_warnings; k++)
		fprintf(f, "  - %s\n", rep->warnings[k]);
	for (k = 0; k < b->n_warnings; k++)
		fprintf(f, "  - %s\n", b->warnings[k]);
}

static void print_summary(FILE *f, const struct ow_fit_data *data,
                          const struct ow_fit_report *rep,
                          enum ow_unit_system sys)
{
	int i, k;

	print_data(f, data, rep, sys);
	for (i = 0; i < rep->n_fits; i++) {
		const struct ow_fit_result *r = &rep->fits[i];
		const char *name = ow_fit_model_name(r->visc.model);

		if (r->status != OW_OK) {
			fprintf(f, "\n%s: not fitted: %s\n", name, r->message);
			continue;
		}
		fprintf(f, "\n%s (%d parameters)%s\n", name, r->n_params,
		        i == rep->best && rep->n_fits > 1 ? ": recommended"
		                                          : "");
		print_params(f, r, sys);
		if (i == rep->best)
			print_residuals(f, r, sys);
		for (k = 0; i != rep->best && k < r->n_warnings; k++)
			fprintf(f, "  warning: %s\n", r->warnings[k]);
	}
	if (rep->n_fits > 1)
		fprintf(f, "\nchoice  %s\n", rep->why);
	print_warnings(f, rep);
}

/* Write the block where asked; a merged resin file is loaded back to show
 * it is ready for `opwin check`. */
static int write_outputs(const struct fit_args *a, struct ow_units *u,
                         const struct ow_fit_data *data,
                         const struct ow_fit_report *rep, FILE *info)
{
	const struct ow_fit_result *b = &rep->fits[rep->best];
	struct ow_diag d = {{0}}, why = {{0}};
	struct ow_material m;
	char notes[600], *text = NULL;
	enum ow_status st = OW_OK;

	snprintf(notes, sizeof notes,
	         "viscosity fitted by opwin fit to %s: "
	         "%s model, %s shift, RMS error %.4f in log10 viscosity",
	         data->source, ow_fit_model_name(b->visc.model),
	         ow_fit_shift_name(b->visc.shift), b->rms_log10);
	if (!a->out && !a->into) {
		st = ow_fit_block_text(&b->visc, notes, &text, &d);
		if (st == OW_OK)
			fputs(text, stdout);
		free(text);
	}
	if (st == OW_OK && a->out &&
	    (st = ow_fit_write_block(&b->visc, notes, a->out, &d)) == OW_OK &&
	    info)
		fprintf(info, "\nwrote %s (the viscosity block)\n", a->out);
	if (st == OW_OK && a->into &&
	    (st = ow_fit_merge_into(&b->visc, a->into, &d)) == OW_OK && info) {
		fprintf(info, "\nmerged the viscosity block into %s\n",
		        a->into);
		if (ow_config_load_resin(u, a->into, &m, &why) != OW_OK)
			fprintf(info,
			        "  but that file does not load as a "
			        "resin yet: %s\n",
			        why.msg);
	}
	if (st == OW_OK && a->plot &&
	    (st = ow_fit_plot_png(data, b, a->c.units, a->plot, &d)) == OW_OK &&
	    info)
		fprintf(info, "drew %s\n", a->plot);
	return st == OW_OK ? CLI_OK : cli_fail("fit", st, &d);
}

static int run(const struct fit_args *a)
{
	struct ow_units *u = NULL;
	struct ow_fit_data *data = NULL;
	struct ow_fit_report *rep = calloc(1, sizeof *rep);
	struct ow_diag d = {{0}};
	enum ow_status st = rep ? ow_units_create(&u, &d) : OW_ENOMEM;
	FILE *info = a->out || a->into ? stdout : stderr;
	int rc;

	if (st == OW_OK)
		st = ow_fit_data_read(u, a->data, &data, &d);
	if (st == OW_OK)
		st = ow_fit_run(data, &a->opts, rep, &d);
	if (st != OW_OK) {
		rc = cli_fail("fit", st, &d);
		goto done;
	}
	if (!a->c.quiet)
		print_summary(info, data, rep, a->c.units);
	rc = write_outputs(a, u, data, rep, a->c.quiet ? NULL : info);
done:
	ow_fit_data_destroy(data);
	ow_units_destroy(u);
	free(rep);
	return rc;
}

static int option(void *ctx, int id, const char *arg)
{
	struct fit_args *a = ctx;
	enum ow_visc_model m;

	switch (id) {
	case 'm':
		if (ow_fit_model_parse(arg, &m) != OW_OK)
			return cli_usage_error("fit",
			                       "--model takes cross, "
			                       "carreau-yasuda or power-law");
		a->opts.model = (int)m;
		return 0;
	case 's':
		if (ow_fit_shift_parse(arg, &a->opts.shift) != OW_OK)
			return cli_usage_error("fit", "--shift takes arrhenius "
			                              "or wlf");
		return 0;
	case 'o':
		a->out = arg;
		return 0;
	case 'I':
		a->into = arg;
		return 0;
	case 'p':
		a->plot = arg;
		return 0;
	default:
		return CLI_NOT_MINE;
	}
}

int cmd_fit(int argc, char **argv)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"model", required_argument, NULL, 'm'},
	    {"shift", required_argument, NULL, 's'},
	    {"output", required_argument, NULL, 'o'},
	    {"into", required_argument, NULL, 'I'},
	    {"plot", required_argument, NULL, 'p'},
	    {NULL, 0, NULL, 0},
	};
	static const struct cli_spec spec = {
	    "fit", opts, "ho:q", help, option, 1, "expects one DATA.csv"};
	struct fit_args a;
	char **args;
	int rc;

	memset(&a, 0, sizeof a);
	a.c.units = OW_SYS_SI;
	a.opts = ow_fit_options_default();
	rc = cli_options(&spec, argc, argv, &a, &a.c, &args);
	if (rc != CLI_GO_ON)
		return rc;
	a.data = args[0];
	return run(&a);
}
