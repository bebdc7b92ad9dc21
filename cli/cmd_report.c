/* cmd_report.c - `opwin report DIR`: draw the maps and report.pdf again
 * from a saved map folder (opwin map -o DIR), without solving, e.g. with
 * another paper size, unit system, revision or signatures. */
#include "cli.h"

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "ow_mapdir.h"
#include "ow_maps.h"
#include "ow_report.h"
#include "ow_sweep.h"
#include "ow_window.h"

struct report_opts {
	struct cli_common c;
	struct ow_report_options r;
	const char *current; /* "rpm,set" */
	char today[16];
};

static void help(void)
{
	printf("usage: opwin report DIR [--paper a4|letter] [--units si|us]\n"
	       "                  [--revision R] [--prepared-by NAME] "
	       "[--approved-by NAME]\n"
	       "                  [--date YYYY-MM-DD] [--current RPM,SET]\n\n"
	       "Draws the maps and report.pdf again from the map folder DIR "
	       "written by\n`opwin map STUDY.json -o DIR`, without solving "
	       "any point.\n\n"
	       "  --paper P          a4 (default) or letter\n"
	       "  --units U          si (default) or us: units people read\n"
	       "  --revision R       revision text in the title block\n"
	       "  --prepared-by NAME, --approved-by NAME\n"
	       "                     names in the title block (blank lines "
	       "to sign otherwise)\n"
	       "  --date YYYY-MM-DD  date of the report (default: today)\n"
	       "  --current RPM,SET  the line's current point: screw speed "
	       "and the set-point\n"
	       "                     of the map's axis zone (°C, or °F with "
	       "--units us, or\n"
	       "                     with a unit: 60,205degC)\n"
	       "exit codes: 0 ok, 1 DIR missing or not a map folder, 2 "
	       "usage,\n            4 output could not be written\n");
}

static int valid_date(const char *s)
{
	int y, m, d, n = 0;

	return strlen(s) == 10 &&
	       sscanf(s, "%4d-%2d-%2d%n", &y, &m, &d, &n) == 3 && n == 10 &&
	       m >= 1 && m <= 12 && d >= 1 && d <= 31;
}

/* A number in the display system, or a text with its unit. */
static enum ow_status read_value(const struct ow_units *u, const char *text,
                                 enum ow_dim dim, enum ow_unit_system sys,
                                 double *si, struct ow_diag *d)
{
	double x;

	if (ow_units_parse_number(text, &x, NULL) == OW_OK) {
		*si = ow_display_to_si(sys, dim, x);
		return OW_OK;
	}
	return ow_units_parse(u, text, dim, 0.0, si, d);
}

/* --current RPM,SET -> the options' current point. */
static int parse_current(const struct ow_units *u, struct report_opts *o)
{
	char buf[128], *comma;
	struct ow_diag d = {{0}};
	enum ow_status st;

	if (!o->current)
		return CLI_OK;
	snprintf(buf, sizeof buf, "%s", o->current);
	comma = strchr(buf, ',');
	if (!comma)
		return cli_usage_error("report", "--current takes RPM,SET "
		                                 "(e.g. 60,205)");
	*comma = '\0';
	st = read_value(u, buf, OW_DIM_ROT_SPEED, o->c.units, &o->r.current_rpm,
	                &d);
	if (st == OW_OK)
		st = read_value(u, comma + 1, OW_DIM_TEMPERATURE, o->c.units,
		                &o->r.current_set_K, &d);
	if (st != OW_OK)
		return cli_usage_error("report", d.msg);
	o->r.has_current = 1;
	return CLI_OK;
}

static int parse(int argc, char **argv, struct report_opts *o, const char **dir)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"paper", required_argument, NULL, 'p'},
	    {"revision", required_argument, NULL, 'R'},
	    {"prepared-by", required_argument, NULL, 'P'},
	    {"approved-by", required_argument, NULL, 'A'},
	    {"date", required_argument, NULL, 'D'},
	    {"current", required_argument, NULL, 'C'},
	    {NULL, 0, NULL, 0},
	};
	int id, rc;

	optind = 1;
	while ((id = getopt_long(argc, argv, "hq", opts, NULL)) != -1) {
		if (id == 'h' || id == 'V') {
			id == 'h' ? help() : cli_version();
			return -1;
		}
		if (id == 'p') {
			if (ow_report_paper_parse(optarg, &o->r.paper))
				return cli_usage_error("report",
				                       "--paper takes "
				                       "a4 or letter");
		} else if (id == 'R' || id == 'P' || id == 'A') {
			*(id == 'R'   ? &o->r.revision
			  : id == 'P' ? &o->r.prepared_by
			              : &o->r.approved_by) = optarg;
		} else if (id == 'D') {
			if (!valid_date(optarg))
				return cli_usage_error("report", "--date takes "
				                                 "YYYY-MM-DD");
			o->r.date = optarg;
		} else if (id == 'C') {
			o->current = optarg;
		} else if ((rc = cli_common_option("report", &o->c, id,
		                                   optarg)) != 0) {
			return rc;
		}
	}
	if (optind != argc - 1)
		return cli_usage_error("report", "expected one map folder DIR");
	*dir = argv[optind];
	return CLI_OK;
}

/* Maps and report into dir. */
static int render(const struct ow_study *s, const struct ow_grid *g,
                  const struct report_opts *o, const char *dir)
{
	struct ow_maps_options mo;
	struct ow_window *w = NULL;
	struct ow_diag d = {{0}};
	char path[OW_PATH_LEN + 16];
	enum ow_status st = ow_window_extract(s, g, &w, &d);

	ow_maps_default(&mo);
	mo.units = o->c.units;
	mo.has_current = o->r.has_current;
	mo.current_rpm = o->r.current_rpm;
	mo.current_set_K = o->r.current_set_K;
	mo.profile = o->r.profile;
	mo.n_profile = o->r.n_profile;
	if (st == OW_OK)
		st = ow_maps_write_all(s, g, w, &mo, dir, &d);
	snprintf(path, sizeof path, "%s/report.pdf", dir);
	if (st == OW_OK)
		st = ow_report_write(s, g, w, &o->r, path, &d);
	ow_window_destroy(w);
	if (st != OW_OK)
		return cli_fail("report", st, &d);
	if (!o->c.quiet)
		printf("written to %s/ (maps, report.pdf)\n", dir);
	return CLI_OK;
}

int cmd_report(int argc, char **argv)
{
	struct report_opts o;
	struct ow_units *u = NULL;
	struct ow_study *s = NULL;
	struct ow_grid *g = NULL;
	struct ow_mapdir_centre centre;
	struct ow_diag d = {{0}};
	const char *dir = NULL;
	time_t now = time(NULL);
	enum ow_status st;
	int rc;

	memset(&o, 0, sizeof o);
	memset(&centre, 0, sizeof centre);
	ow_report_default(&o.r);
	strftime(o.today, sizeof o.today, "%Y-%m-%d", localtime(&now));
	o.r.date = o.today;
	rc = parse(argc, argv, &o, &dir);
	if (rc)
		return rc < 0 ? CLI_OK : rc;
	o.r.units = o.c.units;
	st = ow_units_create(&u, &d);
	s = calloc(1, sizeof *s);
	if (st == OW_OK && !s)
		st = ow_diag_set(&d, OW_ENOMEM, "out of memory");
	if (st == OW_OK)
		st = ow_mapdir_load(u, dir, s, &g, &centre, &d);
	if (st == OW_OK && centre.valid) {
		o.r.centre_point = &centre.pt;
		o.r.profile = centre.rows;
		o.r.n_profile = centre.n_rows;
	}
	rc = st != OW_OK ? cli_fail("report", st, &d) : parse_current(u, &o);
	if (!rc)
		rc = render(s, g, &o, dir);
	ow_mapdir_centre_free(&centre);
	ow_grid_destroy(g);
	free(s);
	ow_units_destroy(u);
	return rc;
}
