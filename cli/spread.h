/* spread.h - `opwin map` across a spread of inputs: the --spread,
 * --samples, --seed and --level options and the spread's lines in the
 * summary (the sampled sweep and its files are the map's: ow_map.h). */
#ifndef CLI_SPREAD_H
#define CLI_SPREAD_H

#include <getopt.h>

#include "opwin.h"
#include "ow_map.h"
#include "ow_spread.h"

enum { CLI_SP_SPREAD = 0x300, CLI_SP_SAMPLES, CLI_SP_SEED, CLI_SP_LEVEL };

#define CLI_SPREAD_LONGOPTS                                                    \
	{"spread", required_argument, NULL, CLI_SP_SPREAD},                    \
	    {"samples", required_argument, NULL, CLI_SP_SAMPLES},              \
	    {"seed", required_argument, NULL, CLI_SP_SEED},                    \
	{                                                                      \
		"level", required_argument, NULL, CLI_SP_LEVEL                 \
	}

#define CLI_SPREAD_HELP                                                        \
	"  --spread SPEC  solve every point across a spread of inputs: "       \
	"the study's\n                spread block as JSON, or "               \
	"name=FROM..TO, name=+-W,\n                name=sd W joined by "       \
	"commas (names: viscosity_scale,\n                "                    \
	"melting_point, feed_temperature, clearance,\n"                        \
	"                barrel_heat_factor); replaces the study's block\n"    \
	"  --samples N   samples per point (default 16)\n"                     \
	"  --seed S      seed of the samples (printed; default the "           \
	"study's)\n"                                                           \
	"  --level P     share of safe samples the robust window needs "       \
	"(default 95 %%)\n"

struct cli_spread {
	const char *spec;            /* --spread, NULL: none */
	struct ow_spread_config cfg; /* --samples, --seed, --level */
};

void cli_spread_init(struct cli_spread *sp);

/* Handle one option (id from getopt_long): 0 done, -1 not ours, else the
 * exit code after printing why. */
int cli_spread_option(struct cli_spread *sp, int id, const char *arg);

/* After loading: apply --spread to s. Exit code. */
int cli_spread_load(const struct ow_units *u, struct cli_spread *sp,
                    struct ow_study *s);

/* Summary lines of map m's spread (nothing without one). */
void cli_spread_print(const struct ow_map *m, enum ow_unit_system units);

#endif
