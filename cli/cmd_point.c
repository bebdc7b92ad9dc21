/* cmd_point.c - `opwin point STUDY.json --rpm R [--set X]`: solve one
 * operating point and report it as an engineer's note or as JSON. */
#include "cli.h"

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

struct point_opts {
	struct cli_common c;
	const char *rpm, *set, *profile;
	int json;
};

static void help(void)
{
	printf("usage: opwin point STUDY.json --rpm R [--set X] [--json]\n"
	       "                  [--profile FILE.csv] [--units si|us]\n\n"
	       "Solves one operating point: throughput matched to the die, "
	       "pressures,\nbulk and peak melt temperatures, melting, power, "
	       "and the limits it breaks.\n\n"
	       "  --rpm R          screw speed in rpm (a unit may be given)\n"
	       "  --set X          barrel axis value in the study's sweep "
	       "mode: a\n"
	       "                   temperature (set, zone) or a difference "
	       "(shift);\n"
	       "                   with a unit (\"10 K\", \"440 degF\") or "
	       "bare in the\n"
	       "                   study's own units (how it was read goes "
	       "to stderr);\n"
	       "                   omitted: the study's own set-points\n"
	       "  --profile FILE   write the axial profile (CSV)\n"
	       "  --json           print the figures as JSON (SI keys)\n"
	       "exit codes: 0 ok, 1 inputs rejected, 2 usage, 3 computation "
	       "failed,\n            4 output could not be written\n");
}

static void print_limit_lines(const struct ow_verdict *v)
{
	const char *names[OW_CK_COUNT];
	int n = ow_classify_names(v, names, OW_CK_COUNT), i;

	if (!n) {
		printf("verdict   inside every limit of the study\n");
		return;
	}
	printf("verdict   UNSAFE:");
	for (i = 0; i < OW_CK_COUNT; i++)
		if (v->bits & (1u << i))
			printf(" %s;", ow_check_failure((enum ow_check)i));
	printf("\n");
}

#define SHOW(dim, si)                                                          \
	ow_display_value(o->c.units, dim, si), ow_display_label(o->c.units, dim)

/* A line for each zone that cannot hold its set-point. */
static void print_zones(const struct ow_study *s, const struct ow_point *pt,
                        const struct point_opts *o)
{
	int i;

	for (i = 0; i < s->line.n_zones; i++) {
		const struct ow_zone *z = &s->line.zones[i];
		double need = pt->zone_demand_W[i];

		if (!(pt->zone_floating & (1u << i)))
			continue;
		printf("zone %-4d cannot hold set-point: needs %.2f %s of %s, "
		       "has %.2f %s; runs at %.1f %s\n",
		       i + 1, SHOW(OW_DIM_POWER, fabs(need)),
		       need < 0.0 ? "cooling" : "heating",
		       SHOW(OW_DIM_POWER,
		            need < 0.0 ? z->cooling_W : z->heating_W),
		       SHOW(OW_DIM_TEMPERATURE, pt->zone_control_K[i]));
	}
}

static void print_note(const struct ow_study *s, const struct ow_point *pt,
                       const struct ow_verdict *v, const struct point_opts *o)
{
	double D = s->screw.diameter_m;

	printf("point     %.1f rpm, last zone at %.1f %s  (%s)\n", pt->rpm,
	       SHOW(OW_DIM_TEMPERATURE, pt->set_K[s->line.n_zones - 1]),
	       s->title);
	printf("output    %.2f %s\n", SHOW(OW_DIM_MASS_FLOW, pt->output_kg_s));
	printf("pressure  %.2f %s at the tip (die + screen), max %.2f %s "
	       "at %.1f D\n",
	       SHOW(OW_DIM_PRESSURE, pt->discharge_pressure_Pa),
	       SHOW(OW_DIM_PRESSURE, pt->max_pressure_Pa),
	       pt->max_pressure_at_m / D);
	printf("melt      %.1f %s bulk at the tip, %.1f %s peak across the "
	       "depth there;\n          hottest %.1f %s at %.1f D\n",
	       SHOW(OW_DIM_TEMPERATURE, pt->discharge_bulk_K),
	       SHOW(OW_DIM_TEMPERATURE, pt->discharge_peak_K),
	       SHOW(OW_DIM_TEMPERATURE, pt->peak_K), pt->peak_at_m / D);
	if (isfinite(pt->melt_complete_m))
		printf("melting   from %.2f D, complete at %.1f D; solid bed "
		       "ratio in the transition %.2f, plugging number %.2f\n",
		       pt->melt_start_m / D, pt->melt_complete_m / D,
		       pt->max_sbr, pt->plug_ratio);
	else
		printf("melting   NOT complete: %.2f %% of the mass leaves "
		       "unmelted; solid bed ratio in the transition %.2f, "
		       "plugging number %.2f\n",
		       100.0 * pt->unmelt_frac, pt->max_sbr, pt->plug_ratio);
	printf("drive     %.2f %s, torque %.0f %s, specific energy %.4f "
	       "%s\n",
	       SHOW(OW_DIM_POWER, pt->power_W),
	       SHOW(OW_DIM_TORQUE, pt->torque_Nm),
	       SHOW(OW_DIM_SPECIFIC_ENERGY, pt->sec_J_kg));
	if (isfinite(pt->feed_capacity_kg_s))
		printf("feed      capacity %.1f %s (Darnell-Mol, no pressure "
		       "loss): %.0f %% used\n",
		       SHOW(OW_DIM_MASS_FLOW, pt->feed_capacity_kg_s),
		       100.0 * pt->output_kg_s / pt->feed_capacity_kg_s);
	printf("barrel    %+.2f %s net into the resin (negative: cooling)\n",
	       SHOW(OW_DIM_POWER, pt->barrel_heat_W));
	print_zones(s, pt, o);
	printf("energy    drive %.3f + barrel %+.3f + root %+.3f = enthalpy "
	       "rise %.3f + flow work %.3f %s\n",
	       ow_display_value(o->c.units, OW_DIM_POWER, pt->power_W),
	       ow_display_value(o->c.units, OW_DIM_POWER, pt->barrel_heat_W),
	       ow_display_value(o->c.units, OW_DIM_POWER, pt->root_heat_W),
	       ow_display_value(o->c.units, OW_DIM_POWER, pt->enthalpy_rise_W),
	       SHOW(OW_DIM_POWER, pt->flow_work_W));
	print_limit_lines(v);
	if (pt->flags & OW_FLAG_NOT_CONVERGED)
		printf("note      the screw-die match did not converge: "
		       "figures are the closest trial\n");
}

static int write_profile(const struct ow_study *s, const struct ow_solver *sv,
                         const char *path)
{
	struct ow_diag d = {{0}};
	const struct ow_profile_row *rows;
	int n;
	char *csv = NULL;
	enum ow_status st;

	rows = ow_solver_profile(sv, &n);
	st = ow_results_profile_csv(s, rows, n, &csv, &d);
	if (st == OW_OK)
		st = ow_io_write_file(path, csv, strlen(csv), &d);
	free(csv);
	return st == OW_OK ? CLI_OK : cli_fail("point", st, &d);
}

static int report(const struct ow_study *s, const struct ow_solver *sv,
                  const struct ow_point *pt, const struct point_opts *o)
{
	struct ow_verdict v;
	struct ow_diag d = {{0}};
	char *json = NULL;
	enum ow_status st;

	ow_classify(pt, &s->line.limits, ow_screw_length(&s->screw), &v);
	if (o->profile) {
		int rc = write_profile(s, sv, o->profile);

		if (rc)
			return rc;
	}
	if (!o->json) {
		print_note(s, pt, &v, o);
		return CLI_OK;
	}
	st = ow_results_point_json(s, pt, &v, &json, &d);
	if (st != OW_OK)
		return cli_fail("point", st, &d);
	printf("%s\n", json);
	free(json);
	return CLI_OK;
}

static int solve(const struct ow_units *u, const struct ow_study *s,
                 const struct point_opts *o)
{
	struct ow_diag d = {{0}};
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	double rpm, v, set_K[OW_MAX_ZONES];
	enum ow_status st;
	int rc;

	enum ow_dim dim = s->line.axes.mode == OW_AXIS_SHIFT
	                      ? OW_DIM_TEMP_DIFF
	                      : OW_DIM_TEMPERATURE;

	st =
	    cli_read_value(u, o->rpm, OW_DIM_ROT_SPEED, s->own_units, &rpm, &d);
	if (st == OW_OK && o->set)
		st = cli_read_value(u, o->set, dim, s->own_units, &v, &d);
	if (st != OW_OK)
		return cli_usage_error("point", d.msg);
	if (o->set)
		cli_note_value("point", "--set", o->set, dim, s->own_units, v);
	if (o->set)
		ow_line_apply_axis(&s->line, v, set_K);
	st = ow_solver_create(s, &sv, &d);
	if (st == OW_OK)
		st =
		    ow_solver_run(sv, rpm, o->set ? set_K : NULL, 0.0, &pt, &d);
	rc = st == OW_OK ? report(s, sv, &pt, o) : cli_fail("point", st, &d);
	ow_solver_destroy(sv);
	return rc;
}

static int option(void *ctx, int id, const char *arg)
{
	struct point_opts *o = ctx;

	switch (id) {
	case 'r':
		o->rpm = arg;
		return 0;
	case 's':
		o->set = arg;
		return 0;
	case 'p':
		o->profile = arg;
		return 0;
	case 'J':
		o->json = 1;
		return 0;
	default:
		return CLI_NOT_MINE;
	}
}

int cmd_point(int argc, char **argv)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"rpm", required_argument, NULL, 'r'},
	    {"set", required_argument, NULL, 's'},
	    {"profile", required_argument, NULL, 'p'},
	    {"json", no_argument, NULL, 'J'},
	    {NULL, 0, NULL, 0},
	};
	static const struct cli_spec spec = {
	    "point", opts, "hq", help, option, 1, "expects one STUDY.json"};
	struct point_opts o = {{OW_SYS_SI, 0, 0}, NULL, NULL, NULL, 0};
	struct ow_units *u = NULL;
	struct ow_study *s = NULL;
	char **args;
	int rc = cli_options(&spec, argc, argv, &o, &o.c, &args);

	if (rc != CLI_GO_ON)
		return rc;
	if (!o.rpm)
		return cli_usage_error("point", "--rpm is required");
	if ((rc = cli_load_study("point", args[0], &u, &s)))
		return rc;
	rc = solve(u, s, &o);
	free(s);
	ow_units_destroy(u);
	return rc;
}
