/* cmd_map.c - `opwin map STUDY.json -o DIR`: sweep the grid, classify,
 * extract the window, write grid.csv, window.json, the maps and the
 * report, and print the recommended window. */
#include "cli.h"
#include "ow_map.h"
#include "spread.h"

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

struct map_opts {
	struct cli_common c;
	const char *dir;
	int rpm_steps, axis_steps, refine;
	struct cli_render r;
	struct cli_spread sp;
};

static void help(void)
{
	printf(
	    "usage: opwin map STUDY.json [-o DIR] [--grid NxM] [--refine K]\n"
	    "                [--jobs N] [--units si|us] [--quiet]\n"
	    "                [--paper a4|letter] [--revision R] "
	    "[--prepared-by NAME]\n"
	    "                [--approved-by NAME] [--date YYYY-MM-DD] "
	    "[--current RPM,SET]\n"
	    "                [--spread SPEC] [--samples N] [--seed S] "
	    "[--level P]\n\n"
	    "Sweeps screw speed x barrel set-point, classifies every point "
	    "against the\nstudy's limits, extracts the recommended window "
	    "and writes grid.csv,\nwindow.json, the maps and report.pdf "
	    "into DIR (default: opwin-map).\n\n"
	    "  -o DIR        output folder, written whole: a previous map "
	    "folder there\n                is replaced once the new one "
	    "is complete\n"
	    "  --grid NxM    N speeds x M barrel values (default: the "
	    "study's sweep)\n"
	    "  --refine K    re-solve cells a boundary crosses, K levels "
	    "of halving (0..4)\n"
	    "  --jobs N      threads (default: all cores)\n"
	    "  --quiet       no progress bar, no summary\n"
	    "  --units si|us units of the maps, report and "
	    "summary\n" CLI_RENDER_HELP CLI_SPREAD_HELP
	    "exit codes: 0 ok (also for an empty window), 1 inputs "
	    "rejected, 2 usage,\n            3 computation failed, 4 "
	    "output could not be written\n");
}

#define SHOW(dim, si)                                                          \
	ow_display_value(o->c.units, dim, si), ow_display_label(o->c.units, dim)

static void print_empty(const struct ow_window *w)
{
	enum ow_check order[OW_CK_COUNT];
	int n = ow_window_binding(w, order), i;

	printf("No safe operating point in the swept range.\n"
	       "Limits that exclude the most points:\n");
	for (i = 0; i < n && i < 4; i++)
		printf("  %s (%s): %d points\n", ow_check_failure(order[i]),
		       ow_check_key(order[i]), w->fail_count[order[i]]);
}

/* "lo - hi unit" in the display system; bounds (inward = 1) rounded
 * towards the inside of the range as the report prints them, so a bound
 * written down stays safe; expected ranges to the nearest. */
static void range(const struct map_opts *o, enum ow_dim dim, double lo,
                  double hi, int decimals, int inward)
{
	char a[32], b[32];

	ow_report_format_bound(a, sizeof a,
	                       ow_display_value(o->c.units, dim, lo), decimals,
	                       inward ? OW_ROUND_UP : OW_ROUND_NEAREST);
	ow_report_format_bound(b, sizeof b,
	                       ow_display_value(o->c.units, dim, hi), decimals,
	                       inward ? OW_ROUND_DOWN : OW_ROUND_NEAREST);
	printf("%s - %s %s", a, b, ow_display_label(o->c.units, dim));
}

/* What sets one bound and how finely it is located, under its range. */
static void print_setter(const struct map_opts *o, const struct ow_window *w,
                         enum ow_window_side side, const char *end)
{
	const struct ow_window_bound *b = &w->bound[side];
	int rpm = side == OW_WB_RPM_MIN || side == OW_WB_RPM_MAX;
	char why[160];

	ow_window_setter_text(b->check, why, sizeof why);
	printf("      %s bound: %s", end, why);
	if (b->check != OW_WINDOW_SWEEP_EDGE) {
		if (rpm)
			printf(" (located within %g rpm)", b->resolution);
		else
			printf(" (located within %g %s)",
			       ow_display_value(o->c.units, OW_DIM_TEMP_DIFF,
			                        b->resolution),
			       ow_display_label(o->c.units, OW_DIM_TEMP_DIFF));
	}
	printf("\n");
}

static void print_window(const struct ow_study *s, const struct ow_grid *g,
                         const struct ow_window *w, const struct map_opts *o)
{
	int z, ref = ow_line_reference_zone(&s->line);

	printf("%s\n", s->title);
	if (w->empty) {
		print_empty(w);
		return;
	}
	printf("Recommended window (bounds on whole rpm and whole degrees, "
	       "rounded inwards)\n"
	       "  screw speed       ");
	range(o, OW_DIM_ROT_SPEED, w->rpm_min, w->rpm_max,
	      OW_REPORT_RPM_DECIMALS, 1);
	printf("\n");
	print_setter(o, w, OW_WB_RPM_MIN, "lower");
	print_setter(o, w, OW_WB_RPM_MAX, "upper");
	for (z = 0; z < s->line.n_zones; z++) {
		printf("  zone %-2d set-point ", z + 1);
		range(o, OW_DIM_TEMPERATURE, w->zone_min_K[z], w->zone_max_K[z],
		      OW_REPORT_TEMP_DECIMALS, 1);
		printf("%s\n", z == ref ? "  (the map's set-point axis)" : "");
		if (z == ref) {
			print_setter(o, w, OW_WB_SET_MIN, "lower");
			print_setter(o, w, OW_WB_SET_MAX, "upper");
		}
	}
	printf("  centre point      %.0f rpm at %.1f %s\n", w->centre.rpm,
	       SHOW(OW_DIM_TEMPERATURE, w->centre_set_K));
	printf("  expected output   ");
	range(o, OW_DIM_MASS_FLOW, w->output_min_kg_s, w->output_max_kg_s, 1,
	      0);
	printf("\n  melt temperature  ");
	range(o, OW_DIM_TEMPERATURE, w->melt_min_K, w->melt_max_K, 0, 0);
	printf(" bulk at discharge, hottest peak %.1f %s\n",
	       SHOW(OW_DIM_TEMPERATURE, w->peak_max_K));
	printf("  safe share of the map %.0f %%, %d points solved\n",
	       100.0 * w->safe_fraction, g->solves);
	if (w->at_sweep_edge)
		printf("NOTE: %s\n", OW_WINDOW_SWEEP_EDGE_NOTE);
}

/* The whole folder or nothing: the outputs go into a sibling temporary
 * folder that replaces o->dir only once everything is written. */
static int write_folder(const struct ow_map *m, const struct map_opts *o)
{
	struct cli_outdir od;
	struct ow_diag d = {{0}};
	enum ow_status st;
	int rc = cli_outdir_begin("map", &od, o->dir);

	if (!rc) {
		st = ow_map_save(m, &o->r.rep, o->c.jobs, od.tmp, &d);
		if (st != OW_OK)
			rc = cli_fail("map", st, &d);
	}
	return cli_outdir_finish("map", &od, rc);
}

/* Progress bars of the sweep and then of the spread's samples. */
struct stages {
	struct cli_progress sweep, spread;
};

static void sweep_progress(void *ctx, int done, int total)
{
	struct stages *p = ctx;

	cli_progress_show(&p->sweep, done, total);
	if (done >= total) /* the spread's clock starts as the sweep ends */
		cli_progress_start(&p->spread, "spread");
}

static void spread_progress(void *ctx, int done, int total)
{
	struct stages *p = ctx;

	cli_progress_show(&p->spread, done, total);
}

static int run(const struct ow_study *s, struct map_opts *o)
{
	struct ow_map_config cfg;
	struct stages pr;
	struct ow_map *m = NULL;
	struct ow_diag d = {{0}};
	enum ow_status st;
	int rc;

	ow_map_default(&cfg);
	cfg.sweep.jobs = o->c.jobs;
	cfg.sweep.refine = o->refine;
	cfg.sweep.rpm_steps = o->rpm_steps;
	cfg.sweep.axis_steps = o->axis_steps;
	cfg.spread = o->sp.cfg;
	cfg.spread.jobs = o->c.jobs;
	cli_progress_start(&pr.sweep, "map");
	cli_progress_start(&pr.spread, "spread");
	if (!o->c.quiet && isatty(STDERR_FILENO)) {
		cfg.sweep.progress = sweep_progress;
		cfg.sweep.progress_ctx = &pr;
		cfg.spread.progress = spread_progress;
		cfg.spread.progress_ctx = &pr;
	}
	st = ow_map_run(s, &cfg, &m, &d);
	if (st != OW_OK)
		return cli_fail("map", st, &d);
	rc = write_folder(m, o);
	if (!rc && !o->c.quiet) {
		print_window(s, m->grid, m->window, o);
		cli_spread_print(m, o->c.units);
		printf("written to %s/ (grid.csv, window.json, maps, "
		       "report.pdf)\n",
		       o->dir);
	}
	ow_map_destroy(m);
	return rc;
}

int cmd_map(int argc, char **argv)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    CLI_RENDER_LONGOPTS,
	    {"output", required_argument, NULL, 'o'},
	    {"grid", required_argument, NULL, 'g'},
	    {"refine", required_argument, NULL, 'r'},
	    CLI_SPREAD_LONGOPTS,
	    {NULL, 0, NULL, 0},
	};
	struct map_opts o = {.c = {OW_SYS_SI, 0, 0}, .dir = "opwin-map"};
	struct ow_units *u = NULL;
	struct ow_study *s = NULL;
	char *end;
	int id, rc;

	cli_render_init(&o.r);
	cli_spread_init(&o.sp);
	optind = 1;
	while ((id = getopt_long(argc, argv, "ho:q", opts, NULL)) != -1) {
		if (id == 'h' || id == 'V') {
			id == 'h' ? help() : cli_version();
			return CLI_OK;
		}
		if (id == 'o') {
			o.dir = optarg;
		} else if (id == 'g') {
			if (cli_parse_grid(optarg, &o.rpm_steps, &o.axis_steps))
				return cli_usage_error("map",
				                       "--grid takes NxM, "
				                       "2..1000 each");
		} else if (id == 'r') {
			long k = strtol(optarg, &end, 10);

			if (*end || !*optarg || k < 0 || k > 4)
				return cli_usage_error("map",
				                       "--refine takes 0..4");
			o.refine = (int)k;
		} else if ((rc = cli_spread_option(&o.sp, id, optarg)) >= 0) {
			if (rc)
				return rc;
		} else if ((rc = cli_render_option("map", &o.r, id, optarg))) {
			if (rc > 0 ||
			    (rc = cli_common_option("map", &o.c, id, optarg)))
				return rc;
		}
	}
	if (optind != argc - 1)
		return cli_usage_error("map", "expects one STUDY.json");
	if ((rc = cli_load_study("map", argv[optind], &u, &s)))
		return rc;
	rc = cli_spread_load(u, &o.sp, s);
	if (!rc)
		rc =
		    cli_render_current("map", u, &o.r, o.c.units, s->own_units);
	if (!rc)
		rc = cli_outdir_check("map", o.dir);
	if (!rc)
		rc = run(s, &o);
	free(s);
	ow_units_destroy(u);
	return rc;
}
