/* common.c - option handling, study loading and error reporting shared by
 * the subcommands. */
#include "cli.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

int cli_exit_code(enum ow_status st)
{
	switch (st) {
	case OW_OK:
		return CLI_OK;
	case OW_EINPUT:
		return CLI_INPUT;
	case OW_EARG:
		return CLI_USAGE;
	case OW_EIO:
		return CLI_OUTPUT;
	default:
		return CLI_COMPUTE;
	}
}

int cli_fail(const char *cmd, enum ow_status st, const struct ow_diag *d)
{
	fprintf(stderr, "opwin %s: %s\n", cmd,
		d && d->msg[0] ? d->msg : ow_strerror(st));
	return cli_exit_code(st);
}

int cli_usage_error(const char *cmd, const char *msg)
{
	fprintf(stderr, "opwin %s: %s\nTry 'opwin %s --help'.\n", cmd, msg,
		cmd);
	return CLI_USAGE;
}

void cli_version(void)
{
	printf("opwin %s\n", OW_VERSION);
}

int cli_common_option(const char *cmd, struct cli_common *c, int id,
		      const char *arg)
{
	char *end = NULL;
	long j;

	switch (id) {
	case 'u':
		if (ow_unit_system_parse(arg, &c->units) != OW_OK)
			return cli_usage_error(cmd, "--units takes si or us");
		return 0;
	case 'j':
		j = strtol(arg, &end, 10);
		if (!*arg || *end || j < 0 || j > 1024)
			return cli_usage_error(cmd, "--jobs takes a count "
						    "0..1024 (0: all cores)");
		c->jobs = (int)j;
		return 0;
	case 'q':
		c->quiet = 1;
		return 0;
	default:
		return cli_usage_error(cmd, "unknown option");
	}
}

int cli_load_study(const char *cmd, const char *path, struct ow_units **u,
		   struct ow_study **study)
{
	struct ow_diag d = {{0}};
	enum ow_status st;

	*study = NULL;
	st = ow_units_create(u, &d);
	if (st != OW_OK)
		return cli_fail(cmd, st, &d);
	*study = calloc(1, sizeof **study);
	if (!*study) {
		ow_units_destroy(*u);
		*u = NULL;
		return cli_fail(cmd, OW_ENOMEM, NULL);
	}
	st = ow_config_load_study(*u, path, *study, &d);
	if (st != OW_OK) {
		free(*study);
		*study = NULL;
		ow_units_destroy(*u);
		*u = NULL;
		return cli_fail(cmd, st, &d);
	}
	return CLI_OK;
}
