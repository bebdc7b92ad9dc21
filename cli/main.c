/* main.c - the opwin command: dispatch to a subcommand. */
#include "cli.h"

#include <stdio.h>
#include <string.h>

static int cmd_help(int argc, char **argv);

/* Sorted by name. */
static const struct cli_command commands[] = {
    {"calibrate", cmd_calibrate, "fit model factors to line readings"},
    {"check", cmd_check, "validate inputs; print derived screw data"},
    {"compare", cmd_compare, "two studies on one grid, common window"},
    {"fit", cmd_fit, "fit a viscosity model to lab data"},
    {"help", cmd_help, "help on a command: opwin help COMMAND"},
    {"map", cmd_map, "sweep, classify, window, maps and report"},
    {"point", cmd_point, "solve one operating point"},
    {"report", cmd_report, "redraw maps and report from a map folder"},
};

#define N_COMMANDS (sizeof commands / sizeof commands[0])

static const struct cli_command *find(const char *name)
{
	size_t i;

	for (i = 0; i < N_COMMANDS; i++)
		if (strcmp(commands[i].name, name) == 0)
			return &commands[i];
	return NULL;
}

static void usage(FILE *f)
{
	size_t i;

	fprintf(f, "usage: opwin COMMAND [options] ...\n\n"
	           "Maps the safe operating window of a single-screw "
	           "extruder.\n\ncommands:\n");
	for (i = 0; i < N_COMMANDS; i++)
		fprintf(f, "  %-9s %s\n", commands[i].name,
		        commands[i].summary);
	fprintf(f, "\ncommon options: --units si|us, --jobs N, --quiet, "
	           "--help, --version\n");
}

/* `opwin help X` is `opwin X --help`. */
static int cmd_help(int argc, char **argv)
{
	const struct cli_command *c;
	char help[] = "--help";
	char *args[3];

	if (argc < 2) {
		usage(stdout);
		return CLI_OK;
	}
	c = find(argv[1]);
	if (!c || c->run == cmd_help)
		return cli_usage_error("help", "no such command");
	args[0] = argv[1];
	args[1] = help;
	args[2] = NULL;
	return c->run(2, args);
}

int main(int argc, char **argv)
{
	const struct cli_command *c;

	if (argc < 2) {
		usage(stderr);
		return CLI_USAGE;
	}
	if (!strcmp(argv[1], "--version")) {
		cli_version();
		return CLI_OK;
	}
	if (!strcmp(argv[1], "--help") || !strcmp(argv[1], "-h")) {
		usage(stdout);
		return CLI_OK;
	}
	c = find(argv[1]);
	if (!c) {
		fprintf(stderr, "opwin: unknown command '%s'\n", argv[1]);
		usage(stderr);
		return CLI_USAGE;
	}
	return c->run(argc - 1, argv + 1);
}
