/* cmd_compare.c - `opwin compare A.json B.json -o DIR`: sweep two studies
 * on one lattice, print both windows, the common window and what differs,
 * and write compare.json, compare.csv, the overlay map and compare.pdf. */
#include "cli.h"
#include "ow_compare.h"
#include "ow_report.h"

#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#define MAX_DIFFS 200

struct cmp_opts {
	struct cli_common c;
	const char *dir;
	const char *label[2];
	const char *date;
	int rpm_steps, axis_steps, refine;
	const char *revision, *prepared_by, *approved_by;
	int paper;
};

static void help(void)
{
	printf("usage: opwin compare A.json B.json [-o DIR] [--grid NxM] "
	       "[--refine K]\n"
	       "                    [--label-a TEXT] [--label-b TEXT] "
	       "[--date YYYY-MM-DD]\n"
	       "                    [--paper a4|letter] [--revision R] "
	       "[--prepared-by NAME]\n"
	       "                    [--approved-by NAME]\n"
	       "                    [--jobs N] [--units si|us] [--quiet]\n\n"
	       "Sweeps two studies that share their sweep axes (two resins "
	       "on one screw,\nor a new and a worn screw) on the same grid: "
	       "each case's window, the\ncommon window (safe in both), where "
	       "and why they differ, and both cases\nside by side at the "
	       "centres. Writes compare.json, compare.csv,\ncompare.png, "
	       "compare.svg and compare.pdf into DIR (default: "
	       "opwin-compare).\n\n"
	       "  -o DIR          output folder (created if missing)\n"
	       "  --grid NxM      N speeds x M barrel values (default: the "
	       "studies' sweep)\n"
	       "  --refine K      re-solve cells a window edge crosses, K "
	       "levels (0..4)\n"
	       "  --label-a TEXT  short name of case A on the map and in "
	       "tables (default A)\n"
	       "  --label-b TEXT  short name of case B (default B)\n"
	       "  --date D        date printed on the PDF (default: today)\n"
	       "  --paper P       a4 (default) or letter\n"
	       "  --revision R, --prepared-by NAME, --approved-by NAME\n"
	       "                  the PDF's title block (blank lines to "
	       "sign otherwise)\n"
	       "  --jobs N        threads (default: all cores)\n"
	       "  --quiet         no progress bar, no summary\n"
	       "exit codes: 0 ok (also for empty windows), 1 inputs rejected "
	       "(also sweeps\n            that differ), 2 usage, 3 computation "
	       "failed, 4 output not written\n");
}

/* ---- the printed summary ---- */

#define SHOW(dim, si)                                                          \
	ow_display_value(o->c.units, dim, si), ow_display_label(o->c.units, dim)

/* Columns of UTF-8 text ("°C" is two bytes, one column). */
static int columns(const char *s)
{
	int n = 0;

	for (; *s; s++)
		n += ((unsigned char)*s & 0xC0) != 0x80;
	return n;
}

/* s left- (width > 0) or right-aligned (width < 0) in |width| columns. */
static void cell(const char *s, int width)
{
	int pad = abs(width) - columns(s);

	if (width < 0)
		printf("%*s", pad > 0 ? pad : 0, "");
	printf("%s", s);
	if (width > 0)
		printf("%*s", pad > 0 ? pad : 0, "");
}

/* Bounds as the reports print them: rounded towards the inside. */
static void print_window(const char *name, const struct ow_window *w,
                         const struct cmp_opts *o)
{
	enum ow_unit_system u = o->c.units;
	char rpm[64], set[64], c[2][32];

	printf("  ");
	cell(name, 9);
	if (w->empty) {
		printf("no safe point in the swept range\n");
		return;
	}
	ow_compare_format_range(rpm, sizeof rpm, w->rpm_min, w->rpm_max,
	                        OW_REPORT_RPM_DECIMALS);
	ow_compare_format_range(
	    set, sizeof set,
	    ow_display_value(u, OW_DIM_TEMPERATURE, w->set_min_K),
	    ow_display_value(u, OW_DIM_TEMPERATURE, w->set_max_K),
	    OW_REPORT_TEMP_DECIMALS);
	ow_report_format_bound(c[0], sizeof c[0], w->centre.rpm,
	                       OW_REPORT_RPM_DECIMALS, OW_ROUND_NEAREST);
	ow_report_format_bound(
	    c[1], sizeof c[1],
	    ow_display_value(u, OW_DIM_TEMPERATURE, w->centre_set_K),
	    OW_REPORT_TEMP_DECIMALS + 1, OW_ROUND_NEAREST);
	printf("%s rpm, %s %s;  centre %s rpm at %s %s;  %.0f %% of the map "
	       "safe\n",
	       rpm, set, ow_display_label(u, OW_DIM_TEMPERATURE), c[0], c[1],
	       ow_display_label(u, OW_DIM_TEMPERATURE),
	       100.0 * w->safe_fraction);
}

static void print_limits(const char *lead, const int *counts)
{
	int c, any = 0;

	printf("%s", lead);
	for (c = 0; c < OW_CK_COUNT; c++)
		if (counts[c]) {
			printf("%s %s (%s): %d points", any ? ";" : "",
			       ow_check_text((enum ow_check)c),
			       ow_check_key((enum ow_check)c), counts[c]);
			any = 1;
		}
	printf("%s\n", any ? "" : " none");
}

static void print_row(const struct ow_compare *cmp,
                      const struct ow_cmp_point *p, int i,
                      const struct cmp_opts *o)
{
	const char *unit = ow_compare_figure_unit(i, o->c.units);
	int dec = ow_compare_figure_decimals(i, o->c.units), k;
	char buf[64];
	double v[2];

	for (k = 0; k < 2; k++)
		v[k] = ow_compare_figure_shown(cmp->study[k], &p->pt[k], i,
		                               o->c.units);
	snprintf(buf, sizeof buf, "%s%s%s", ow_compare_figure_text(i),
	         *unit ? ", " : "", unit);
	printf("  ");
	cell(buf, 40);
	for (k = 0; k < 2; k++) {
		snprintf(buf, sizeof buf, "%.*f", dec, v[k]);
		cell(buf, -12);
	}
	snprintf(buf, sizeof buf, "%+.*f", dec, v[1] - v[0]);
	cell(buf, -12);
	printf("\n");
}

/* The same point as an earlier table: say so instead of repeating it. */
static int same_as_earlier(const struct ow_compare *cmp, enum ow_cmp_at at)
{
	int k;

	for (k = 0; k < (int)at; k++)
		if (cmp->at[k].valid && cmp->at[k].rpm == cmp->at[at].rpm &&
		    cmp->at[k].axis == cmp->at[at].axis)
			return k;
	return -1;
}

static void print_point(const struct ow_compare *cmp, enum ow_cmp_at at,
                        const struct cmp_opts *o)
{
	const struct ow_cmp_point *p = &cmp->at[at];
	char diff[64];
	int i, k = same_as_earlier(cmp, at);

	if (!p->valid)
		return;
	if (k >= 0) {
		printf("\nThe %s is the %s.\n", ow_compare_at_text(at),
		       ow_compare_at_text((enum ow_cmp_at)k));
		return;
	}
	printf("\nAt the %s: %.1f rpm, %.1f %s", ow_compare_at_text(at), p->rpm,
	       SHOW(OW_DIM_TEMPERATURE, p->set_ref_K[0]));
	if (cmp->by_shift)
		printf(" (%s at %.1f %s)", o->label[1],
		       SHOW(OW_DIM_TEMPERATURE, p->set_ref_K[1]));
	printf("\n  ");
	snprintf(diff, sizeof diff, "%s − %s", o->label[1], o->label[0]);
	cell("", 40);
	cell(o->label[0], -12);
	cell(o->label[1], -12);
	cell(diff, -12);
	printf("\n");
	for (i = 0; i < ow_compare_n_figures(); i++)
		print_row(cmp, p, i, o);
	printf("  ");
	cell("verdict", 40);
	cell(p->v[0].bits ? "UNSAFE" : "safe", -12);
	cell(p->v[1].bits ? "UNSAFE" : "safe", -12);
	printf("\n");
}

static void print_inputs(const struct ow_compare *cmp, const struct cmp_opts *o)
{
	struct ow_input_diff *e = malloc(sizeof *e * MAX_DIFFS);
	int n, i;

	if (!e)
		return;
	n = ow_compare_inputs(cmp->study[0], cmp->study[1], o->c.units, e,
	                      MAX_DIFFS);
	printf("\nInputs that differ (%d):\n", n);
	for (i = 0; i < n && i < 12; i++)
		printf("  %-36s %s -> %s\n", e[i].field, e[i].a, e[i].b);
	if (n > 12)
		printf("  ... and %d more (compare.json, compare.pdf)\n",
		       n - 12);
	free(e);
}

static void print_summary(const struct ow_compare *cmp,
                          const struct cmp_opts *o)
{
	int k;

	for (k = 0; k < 2; k++)
		if (strcmp(o->label[k], k ? "B" : "A"))
			printf("%s (%s): %s\n", k ? "B" : "A", o->label[k],
			       cmp->study[k]->title);
		else
			printf("%s: %s\n", o->label[k], cmp->study[k]->title);
	printf("\nRecommended windows (screw speed, reference zone "
	       "set-point)\n");
	print_window(o->label[0], cmp->map[0]->window, o);
	print_window(o->label[1], cmp->map[1]->window, o);
	print_window("common", cmp->common[0], o);
	{
		char how[320];

		printf("Barrel set-points: %s%s\n",
		       ow_compare_alignment(cmp, o->c.units, how, sizeof how),
		       cmp->by_shift ? "; the common window and the points "
		                       "below give A's set-points"
		                     : "");
	}
	printf("\nGrid points: safe in both %d, only in %s %d, only in %s %d, "
	       "in neither %d\n",
	       cmp->count[OW_CMP_BOTH], o->label[0], cmp->count[OW_CMP_A_ONLY],
	       o->label[1], cmp->count[OW_CMP_B_ONLY],
	       cmp->count[OW_CMP_NEITHER]);
	printf("Limits binding %s:", o->label[0]);
	print_limits("", cmp->map[0]->window->fail_count);
	printf("Limits binding %s:", o->label[1]);
	print_limits("", cmp->map[1]->window->fail_count);
	if (cmp->count[OW_CMP_A_ONLY]) {
		printf("Where only %s is safe, %s fails:", o->label[0],
		       o->label[1]);
		print_limits("", cmp->lost[OW_CMP_A]);
	}
	if (cmp->count[OW_CMP_B_ONLY]) {
		printf("Where only %s is safe, %s fails:", o->label[1],
		       o->label[0]);
		print_limits("", cmp->lost[OW_CMP_B]);
	}
	print_point(cmp, OW_CMP_AT_COMMON, o);
	print_point(cmp, OW_CMP_AT_A, o);
	print_point(cmp, OW_CMP_AT_B, o);
	print_inputs(cmp, o);
}

/* ---- outputs ---- */

static int write_outputs(const struct ow_compare *cmp, const struct cmp_opts *o)
{
	struct ow_compare_draw_options dopt;
	struct ow_diag d = {{0}};
	enum ow_status st;

	ow_compare_draw_default(&dopt);
	dopt.units = o->c.units;
	dopt.label[0] = o->label[0];
	dopt.label[1] = o->label[1];
	dopt.date = o->date;
	dopt.revision = o->revision;
	dopt.prepared_by = o->prepared_by;
	dopt.approved_by = o->approved_by;
	dopt.paper = o->paper;
	st = ow_compare_save(cmp, &dopt, o->dir, &d);
	return st == OW_OK ? CLI_OK : cli_fail("compare", st, &d);
}

static int run(const struct ow_study *a, const struct ow_study *b,
               const struct cmp_opts *o)
{
	struct ow_sweep_config cfg;
	struct ow_compare *cmp = NULL;
	struct ow_diag d = {{0}};
	struct cli_progress pr;
	enum ow_status st;
	int rc;

	ow_sweep_default(&cfg);
	cli_progress_start(&pr, "A, then B");
	cfg.jobs = o->c.jobs;
	cfg.refine = o->refine;
	cfg.rpm_steps = o->rpm_steps;
	cfg.axis_steps = o->axis_steps;
	if (!o->c.quiet && isatty(STDERR_FILENO)) {
		cfg.progress = cli_progress_show;
		cfg.progress_ctx = &pr;
	}
	st = ow_compare_run(a, b, &cfg, &cmp, &d);
	if (st != OW_OK)
		return cli_fail("compare", st, &d);
	rc = cli_make_dir("compare", o->dir);
	if (!rc)
		rc = write_outputs(cmp, o);
	if (!rc && !o->c.quiet) {
		print_summary(cmp, o);
		printf("\nwritten to %s/ (compare.json, compare.csv, "
		       "compare.png, compare.svg, compare.pdf)\n",
		       o->dir);
	}
	ow_compare_destroy(cmp);
	return rc;
}

/* Options; returns -1 to go on, or the exit code. */
static int parse(int argc, char **argv, struct cmp_opts *o)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"output", required_argument, NULL, 'o'},
	    {"grid", required_argument, NULL, 'g'},
	    {"refine", required_argument, NULL, 'r'},
	    {"label-a", required_argument, NULL, 'A'},
	    {"label-b", required_argument, NULL, 'B'},
	    {"date", required_argument, NULL, 'D'},
	    {"paper", required_argument, NULL, 'p'},
	    {"revision", required_argument, NULL, 'R'},
	    {"prepared-by", required_argument, NULL, 'P'},
	    {"approved-by", required_argument, NULL, 'Y'},
	    {NULL, 0, NULL, 0},
	};
	char *end;
	long k;
	int id, rc;

	optind = 1;
	while ((id = getopt_long(argc, argv, "ho:q", opts, NULL)) != -1) {
		switch (id) {
		case 'h':
			help();
			return CLI_OK;
		case 'V':
			cli_version();
			return CLI_OK;
		case 'o':
			o->dir = optarg;
			break;
		case 'A':
			o->label[0] = optarg;
			break;
		case 'B':
			o->label[1] = optarg;
			break;
		case 'R':
			o->revision = optarg;
			break;
		case 'P':
			o->prepared_by = optarg;
			break;
		case 'Y':
			o->approved_by = optarg;
			break;
		case 'p': {
			enum ow_paper p;

			if (ow_report_paper_parse(optarg, &p))
				return cli_usage_error("compare",
				                       "--paper takes "
				                       "a4 or letter");
			o->paper = (int)p;
			break;
		}
		case 'g':
			if (cli_parse_grid(optarg, &o->rpm_steps,
			                   &o->axis_steps))
				return cli_usage_error("compare",
				                       "--grid takes "
				                       "NxM, 2..1000 each");
			break;
		case 'r':
			k = strtol(optarg, &end, 10);
			if (*end || !*optarg || k < 0 || k > 4)
				return cli_usage_error("compare",
				                       "--refine takes 0..4");
			o->refine = (int)k;
			break;
		case 'D':
			if (!cli_valid_date(optarg))
				return cli_usage_error("compare",
				                       "--date takes "
				                       "YYYY-MM-DD");
			o->date = optarg;
			break;
		default:
			if ((rc = cli_common_option("compare", &o->c, id,
			                            optarg)))
				return rc;
		}
	}
	if (optind != argc - 2)
		return cli_usage_error("compare", "expects two studies: "
		                                  "A.json B.json");
	return -1;
}

int cmd_compare(int argc, char **argv)
{
	struct cmp_opts o = {{OW_SYS_SI, 0, 0},
	                     "opwin-compare",
	                     {"A", "B"},
	                     NULL,
	                     0,
	                     0,
	                     0,
	                     NULL,
	                     NULL,
	                     NULL,
	                     0};
	struct ow_units *u = NULL; /* one unit database for both */
	struct ow_study *s[2] = {NULL, NULL};
	char date[16];
	int rc = parse(argc, argv, &o), k;

	if (rc >= 0)
		return rc;
	if (!o.date) {
		cli_today(date, sizeof date);
		o.date = date;
	}
	rc = CLI_OK;
	for (k = 0; k < 2 && !rc; k++)
		rc = cli_load_study("compare", argv[optind + k], &u, &s[k]);
	if (!rc)
		rc = run(s[0], s[1], &o);
	for (k = 0; k < 2; k++)
		free(s[k]);
	ow_units_destroy(u);
	return rc;
}
