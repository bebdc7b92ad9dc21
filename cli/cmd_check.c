/* cmd_check.c - `opwin check STUDY.json`: validate the inputs and print the
 * derived screw data with common-practice warnings. */
#include "cli.h"
#include "ow_const.h"

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static void help(void)
{
	printf("usage: opwin check STUDY.json [--json] [--units si|us]\n\n"
	       "Reads the study and the screw and resin files it names, "
	       "checks every value\n(units, ranges, geometry) and prints "
	       "the derived screw data: sections,\nL/D, helix angle, "
	       "compression ratios, clearance, channel volume per turn,\n"
	       "and warnings drawn from common practice.\n\n"
	       "  --json         print the derived data as JSON (SI keys)\n"
	       "  --units si|us  units for people (default si)\n"
	       "exit codes: 0 ok, 1 inputs rejected, 2 usage\n");
}

static double disp(const struct cli_common *c, enum ow_dim dim, double si)
{
	return ow_display_value(c->units, dim, si);
}

static const char *lab(const struct cli_common *c, enum ow_dim dim)
{
	return ow_display_label(c->units, dim);
}

/* Free channel volume of the first turn: cm3, or in3 (1 in = 25.4 mm,
 * NIST SP 811). */
static double turn_volume(const struct ow_screw *s, const struct cli_common *c)
{
	double v = ow_screw_free_area(s, 0.0) * s->lead_m;

	return c->units == OW_SYS_US ? v / (0.0254 * 0.0254 * 0.0254) : v * 1e6;
}

static const char *vol_label(const struct cli_common *c)
{
	return c->units == OW_SYS_US ? "in³" : "cm³";
}

static void print_screw(const struct ow_screw *s, const struct cli_common *c)
{
	double D = s->diameter_m;
	int dp = c->units == OW_SYS_US ? 3 : 2, i;

	printf("screw   %s\n", s->name);
	printf("  diameter %.*f %s, lead %.*f %s, %d flight(s), L/D %.2f\n", dp,
	       disp(c, OW_DIM_LENGTH, D), lab(c, OW_DIM_LENGTH), dp,
	       disp(c, OW_DIM_LENGTH, s->lead_m), lab(c, OW_DIM_LENGTH),
	       s->flights, ow_screw_ld(s));
	printf("  helix angle %.4f deg at the barrel, channel width %.*f %s\n",
	       ow_screw_helix(s, D) * 180.0 / OW_PI, dp,
	       disp(c, OW_DIM_LENGTH, ow_screw_width(s, D)),
	       lab(c, OW_DIM_LENGTH));
	printf("  compression ratio %.3f (depth), %.3f (cross-section)\n",
	       ow_screw_compression_depth(s), ow_screw_compression_area(s));
	printf("  flight clearance %.*f %s (new), channel volume of the first "
	       "turn %.1f %s\n",
	       dp + 1, disp(c, OW_DIM_LENGTH, s->clearance_m),
	       lab(c, OW_DIM_LENGTH), turn_volume(s, c), vol_label(c));
	printf("\n  %-2s %-9s %7s %7s %9s %9s %9s\n", "#", "section", "from D",
	       "to D", "depth in", "depth out", "clearance");
	for (i = 0; i < s->n_sections; i++) {
		const struct ow_section *sec = &s->sections[i];
		int mix = sec->type == OW_SEC_MIXER;
		double mid = 0.5 * (sec->start_m + sec->end_m);

		printf(
		    "  %-2d %-9s %7.2f %7.2f %9.*f %9.*f %9.*f %s\n", i + 1,
		    ow_section_name(sec->type), sec->start_m / D,
		    sec->end_m / D, dp,
		    disp(c, OW_DIM_LENGTH,
		         mix ? sec->gap_m : sec->depth_start_m),
		    dp, disp(c, OW_DIM_LENGTH, mix ? sec->gap_m : sec->depth_m),
		    dp + 1, disp(c, OW_DIM_LENGTH, ow_screw_clearance(s, mid)),
		    lab(c, OW_DIM_LENGTH));
	}
}

/* The limits that are set, one phrasing per kind ("<quantity> at most
 * <value>"). */
static void print_limits(const struct ow_study *st, const struct cli_common *c)
{
	static const enum ow_dim dims[OW_CK_LIMITS] = {
	    OW_DIM_TEMPERATURE, OW_DIM_NONE,      OW_DIM_PRESSURE,
	    OW_DIM_POWER,       OW_DIM_TORQUE,    OW_DIM_TEMPERATURE,
	    OW_DIM_MASS_FLOW,   OW_DIM_MASS_FLOW, OW_DIM_NONE,
	    OW_DIM_NONE};
	int k, n = 0;

	for (k = 0; k < OW_CK_LIMITS; k++) {
		enum ow_check ck = (enum ow_check)k;
		double v = ow_check_limit(&st->line.limits, ck);
		int pct = ck == OW_CK_UNMELT || ck == OW_CK_ZONE_CONTROL;

		if (!isfinite(v))
			continue;
		printf("%s%s %s %.4g %s", n++ ? "; " : "limits  ",
		       ow_check_text(ck), ow_check_relation(ck),
		       pct ? 100.0 * v : disp(c, dims[k], v),
		       pct ? "%" : lab(c, dims[k]));
	}
	printf("%s", n ? "\n" : "limits  none set\n");
}

/* The sweep: screw speeds, and what the barrel axis does over which
 * range of the map-axis zone's set-point. */
static void print_sweep(const struct ow_study *st, const struct cli_common *c)
{
	const struct ow_axes *a = &st->line.axes;
	int z = ow_line_reference_zone(&st->line) + 1;
	enum ow_dim dim =
	    a->mode == OW_AXIS_SHIFT ? OW_DIM_TEMP_DIFF : OW_DIM_TEMPERATURE;
	const char *how = a->mode == OW_AXIS_SHIFT
	                      ? "every zone shifted by"
	                      : (a->mode == OW_AXIS_SET ? "zones from the "
	                                                  "given one set to"
	                                                : "one zone set to");

	if (a->rpm_steps < 2) {
		printf("sweep   none (point only)\n");
		return;
	}
	printf("sweep   screw speed %g to %g rpm in %d steps; %s %g to %g %s "
	       "in %d steps (zone %d at %.0f to %.0f %s)\n",
	       a->rpm_from, a->rpm_to, a->rpm_steps, how,
	       disp(c, dim, a->axis_from), disp(c, dim, a->axis_to),
	       lab(c, dim), a->axis_steps, z,
	       disp(c, OW_DIM_TEMPERATURE,
	            ow_line_axis_ref_K(&st->line, a->axis_from)),
	       disp(c, OW_DIM_TEMPERATURE,
	            ow_line_axis_ref_K(&st->line, a->axis_to)),
	       lab(c, OW_DIM_TEMPERATURE));
}

/* The study's fields under prefix (and under `also`), as the comparison
 * lists them: "name value, name value" with units, set ones only. */
static void print_group(const struct ow_study *st, const struct cli_common *c,
                        const char *lead, const char *prefix, const char *also)
{
	struct ow_input_diff f[160];
	int n = ow_compare_fields(st, st, c->units, 1, f, 160), i, k = 0;

	if (n > 160)
		n = 160;
	for (i = 0; i < n; i++) {
		const char *name = f[i].field;
		char words[96], *q;

		if (strncmp(name, prefix, strlen(prefix)) &&
		    !(also && !strncmp(name, also, strlen(also))))
			continue;
		if (!strcmp(f[i].a, "-") || !*f[i].a)
			continue;
		if (!strncmp(name, prefix, strlen(prefix)))
			name += strlen(prefix);
		/* outer_diameter -> outer diameter; a bounded copy (not
		 * snprintf: gcc cannot see that name stays inside field) */
		for (q = words; *name && q < words + sizeof words - 1; name++)
			*q++ = (*name == '_' || *name == '.') ? ' ' : *name;
		*q = '\0';
		printf("%s%s %s", k++ ? ", " : lead, words, f[i].a);
	}
	if (k)
		printf("\n");
}

static void print_line(const struct ow_study *st, const struct cli_common *c)
{
	const struct ow_line *l = &st->line;
	int i;

	printf("\nresin   %s (melting point %.1f %s)\n", st->resin.name,
	       disp(c, OW_DIM_TEMPERATURE, st->resin.melt_temp_K),
	       lab(c, OW_DIM_TEMPERATURE));
	printf("barrel  ");
	for (i = 0; i < l->n_zones; i++)
		printf("%s%.0f %s to %.1f D", i ? ", " : "",
		       disp(c, OW_DIM_TEMPERATURE, l->zones[i].set_K),
		       lab(c, OW_DIM_TEMPERATURE),
		       l->zones[i].to_m / st->screw.diameter_m);
	printf("\nfeed    %.0f %s\n",
	       disp(c, OW_DIM_TEMPERATURE, l->feed_temp_K),
	       lab(c, OW_DIM_TEMPERATURE));
	print_group(st, c, "die     ", "die.", "screen_pack");
	print_limits(st, c);
	print_sweep(st, c);
}

static void print_warnings(const struct ow_screw *s)
{
	struct ow_warning w[OW_MAX_WARNINGS];
	int n = ow_advise_screw(s, w, OW_MAX_WARNINGS), i;

	printf("\n%s\n", n ? "warnings:"
	                   : "no warnings from the rules of "
	                     "thumb");
	for (i = 0; i < n; i++)
		printf("  - %s\n", w[i].text);
}

static int run(const char *path, int json, const struct cli_common *c)
{
	struct ow_units *u = NULL;
	struct ow_study *st = NULL;
	struct ow_diag d = {{0}};
	int rc = cli_load_study("check", path, &u, &st);
	char *text = NULL;
	enum ow_status s;

	if (rc)
		return rc;
	if (json) {
		s = ow_results_check_json(st, &text, &d);
		if (s != OW_OK)
			rc = cli_fail("check", s, &d);
		else
			printf("%s\n", text);
		free(text);
	} else {
		printf("study   %s\n", st->title);
		print_screw(&st->screw, c);
		print_line(st, c);
		print_warnings(&st->screw);
	}
	free(st);
	ow_units_destroy(u);
	return rc;
}

static int option(void *ctx, int id, const char *arg)
{
	(void)arg;
	if (id != 'J')
		return CLI_NOT_MINE;
	*(int *)ctx = 1; /* --json */
	return 0;
}

int cmd_check(int argc, char **argv)
{
	static const struct option opts[] = {
	    CLI_COMMON_LONGOPTS,
	    {"json", no_argument, NULL, 'J'},
	    {NULL, 0, NULL, 0},
	};
	static const struct cli_spec spec = {
	    "check", opts, "hq", help, option, 1, "expects one STUDY.json"};
	struct cli_common c = {OW_SYS_SI, 0, 0};
	char **args;
	int json = 0, rc = cli_options(&spec, argc, argv, &json, &c, &args);

	return rc != CLI_GO_ON ? rc : run(args[0], json, &c);
}
