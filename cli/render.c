/* render.c - what `opwin map` and `opwin report` share: the report's
 * options (paper, revision, signatures, date, current point); reading a
 * value typed on the command line with or without its unit. */
#include "cli.h"

#include <stdio.h>
#include <string.h>

enum ow_status cli_read_value(const struct ow_units *u, const char *text,
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

void cli_note_value(const char *cmd, const char *option, const char *text,
                    enum ow_dim dim, enum ow_unit_system study, double si)
{
	double x;
	int bare = ow_units_parse_number(text, &x, NULL) == OW_OK;
	enum ow_unit_system other = study == OW_SYS_US ? OW_SYS_SI : OW_SYS_US;

	fprintf(stderr, "opwin %s: %s %s read as %g %s (%g %s)%s\n", cmd,
	        option, text, ow_display_value(study, dim, si),
	        ow_display_label(study, dim), ow_display_value(other, dim, si),
	        ow_display_label(other, dim),
	        bare ? study == OW_SYS_US
	                   ? ": a bare number is in the study's own "
	                     "units, US"
	                   : ": a bare number is in the study's own "
	                     "units, SI"
	             : "");
}

void cli_render_init(struct cli_render *r)
{
	memset(r, 0, sizeof *r);
	ow_report_default(&r->rep);
	cli_today(r->today, sizeof r->today);
	r->rep.date = r->today;
}

int cli_render_option(const char *cmd, struct cli_render *r, int id,
                      const char *arg)
{
	size_t n = arg ? strlen(arg) : 0;

	if (arg && ow_io_utf8_check(arg, n) != n && strchr("pRPADC", id))
		return cli_usage_error(cmd,
		                       "an option's text is not UTF-8: "
		                       "it would be printed in the report");
	switch (id) {
	case 'p':
		if (ow_report_paper_parse(arg, &r->rep.paper))
			return cli_usage_error(cmd,
			                       "--paper takes a4 or letter");
		return 0;
	case 'R':
		r->rep.revision = arg;
		return 0;
	case 'P':
		r->rep.prepared_by = arg;
		return 0;
	case 'A':
		r->rep.approved_by = arg;
		return 0;
	case 'D':
		if (!cli_valid_date(arg))
			return cli_usage_error(cmd, "--date takes YYYY-MM-DD");
		r->rep.date = arg;
		return 0;
	case 'C':
		r->current = arg;
		return 0;
	default:
		return -1;
	}
}

int cli_render_current(const char *cmd, const struct ow_units *u,
                       struct cli_render *r, enum ow_unit_system sys,
                       enum ow_unit_system study)
{
	char buf[128], *comma;
	struct ow_diag d = {{0}};
	enum ow_status st;

	r->rep.units = sys;
	if (!r->current)
		return CLI_OK;
	snprintf(buf, sizeof buf, "%s", r->current);
	comma = strchr(buf, ',');
	if (!comma)
		return cli_usage_error(cmd, "--current takes RPM,SET (e.g. "
		                            "60,205)");
	*comma = '\0';
	st = cli_read_value(u, buf, OW_DIM_ROT_SPEED, study,
	                    &r->rep.current_rpm, &d);
	if (st == OW_OK)
		st = cli_read_value(u, comma + 1, OW_DIM_TEMPERATURE, study,
		                    &r->rep.current_set_K, &d);
	if (st != OW_OK)
		return cli_usage_error(cmd, d.msg);
	cli_note_value(cmd, "--current set-point", comma + 1,
	               OW_DIM_TEMPERATURE, study, r->rep.current_set_K);
	r->rep.has_current = 1;
	return CLI_OK;
}
