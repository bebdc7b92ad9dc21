/* cmd_report.c - `opwin report DIR`: draw the maps and report.pdf again
 * from a saved map folder (opwin map -o DIR), without solving, e.g. with
 * another paper size, unit system, revision or signatures. */
#include "cli.h"

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>

#include "ow_map.h"
#include "ow_mapdir.h"

static void help(void)
{
	printf("usage: opwin report DIR [--paper a4|letter] [--units si|us]\n"
	       "                  [--revision R] [--prepared-by NAME] "
	       "[--approved-by NAME]\n"
	       "                  [--date YYYY-MM-DD] [--current RPM,SET]\n\n"
	       "Draws the maps and report.pdf again from the map folder DIR "
	       "written by\n`opwin map STUDY.json -o DIR`, without solving "
	       "any point.\n\n"
	       "  --units U          si (default) or us: units people "
	       "read\n" CLI_RENDER_HELP
	       "DIR must be whole as `opwin map` wrote it (its manifest.json "
	       "lists every\nfile's size and checksum); it is replaced whole "
	       "once the drawings are done.\n\n"
	       "exit codes: 0 ok, 1 DIR missing, not a map folder or changed "
	       "since, 2 usage,\n            4 output could not be written\n");
}

static int parse(int argc, char **argv, struct cli_common *c,
                 struct cli_render *r, const char **dir)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    CLI_RENDER_LONGOPTS,
	    {NULL, 0, NULL, 0},
	};
	int id, rc;

	optind = 1;
	while ((id = getopt_long(argc, argv, "hq", opts, NULL)) != -1) {
		if (id == 'h' || id == 'V') {
			id == 'h' ? help() : cli_version();
			return -1;
		}
		rc = cli_render_option("report", r, id, optarg);
		if (rc < 0)
			rc = cli_common_option("report", c, id, optarg);
		if (rc)
			return rc;
	}
	if (optind != argc - 1)
		return cli_usage_error("report", "expected one map folder DIR");
	*dir = argv[optind];
	return CLI_OK;
}

/* The previous report.pdf of dir (another revision, perhaps already
 * signed) is kept in the new folder as report-previous-<its time>.pdf
 * rather than lost; says so on stderr. */
static int keep_previous_report(const char *dir, const char *tmp)
{
	char from[OW_PATH_LEN + 32], to[OW_PATH_LEN + 96], stamp[32];
	struct stat sb;
	struct tm tm;
	FILE *in, *out;
	char buf[65536];
	size_t n;
	int ok = 1;

	snprintf(from, sizeof from, "%s/report.pdf", dir);
	if (stat(from, &sb) != 0 || !S_ISREG(sb.st_mode))
		return CLI_OK;
	gmtime_r(&sb.st_mtime, &tm);
	strftime(stamp, sizeof stamp, "%Y-%m-%d-%H%M%S", &tm);
	snprintf(to, sizeof to, "%s/report-previous-%s.pdf", tmp, stamp);
	in = fopen(from, "rb");
	out = in ? fopen(to, "wbx") : NULL;
	while (in && out && ok && (n = fread(buf, 1, sizeof buf, in)) > 0)
		ok = fwrite(buf, 1, n, out) == n;
	ok = ok && in && out && !ferror(in);
	if (in)
		fclose(in);
	if (out && fclose(out) != 0)
		ok = 0;
	if (!ok) {
		fprintf(stderr,
		        "opwin report: %s: cannot keep the previous "
		        "report as %s\n",
		        from, to);
		return CLI_OUTPUT;
	}
	fprintf(stderr,
	        "opwin report: the previous report.pdf is kept as "
	        "report-previous-%s.pdf\n",
	        stamp);
	return CLI_OK;
}

/* The drawings are made in a copy of the folder's data that then
 * replaces the folder whole, so an interrupted report leaves it as it was
 * and its manifest always matches. */
static int render_folder(const struct ow_map *m, const struct cli_render *r,
                         const char *dir)
{
	struct cli_outdir od;
	struct ow_diag d = {{0}};
	enum ow_status st;
	int rc = cli_outdir_begin("report", &od, dir);

	if (!rc) {
		st = ow_mapdir_copy_data(dir, od.tmp, &d);
		rc = st == OW_OK ? keep_previous_report(dir, od.tmp)
		                 : cli_fail("report", st, &d);
		if (!rc) {
			st = ow_map_draw(m, &r->rep, r->jobs, od.tmp, &d);
			if (st != OW_OK)
				rc = cli_fail("report", st, &d);
		}
	}
	return cli_outdir_finish("report", &od, rc);
}

static int redraw(const struct ow_units *u, const char *dir,
                  const struct cli_common *c, struct cli_render *r)
{
	struct ow_map *m = NULL;
	struct ow_diag d = {{0}};
	enum ow_status st = ow_map_load(u, dir, &m, &d);
	int rc;

	rc = st != OW_OK ? cli_fail("report", st, &d)
	                 : cli_render_current("report", u, r, c->units,
	                                      m->study->own_units);
	r->jobs = c->jobs;
	if (!rc)
		rc = render_folder(m, r, dir);
	if (!rc && !c->quiet)
		printf("written to %s/ (maps, report.pdf)\n", dir);
	ow_map_destroy(m);
	return rc;
}

int cmd_report(int argc, char **argv)
{
	struct cli_common c = {OW_SYS_SI, 0, 0};
	struct cli_render r;
	struct ow_units *u = NULL;
	struct ow_diag d = {{0}};
	const char *dir = NULL;
	enum ow_status st;
	int rc;

	cli_render_init(&r);
	rc = parse(argc, argv, &c, &r, &dir);
	if (rc)
		return rc < 0 ? CLI_OK : rc;
	st = ow_units_create(&u, &d);
	rc = st == OW_OK ? redraw(u, dir, &c, &r) : cli_fail("report", st, &d);
	ow_units_destroy(u);
	return rc;
}
