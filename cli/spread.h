/* spread.h - `opwin map` across a spread of inputs: the --spread,
 * --samples, --seed and --level options, the sampled sweep after the
 * nominal one, its additions to grid.csv and window.json, and its lines in
 * the summary. */
#ifndef CLI_SPREAD_H
#define CLI_SPREAD_H

#include <getopt.h>

#include "opwin.h"
#include "ow_spread.h"
#include "ow_spread_out.h"

enum { CLI_SP_SPREAD = 0x300, CLI_SP_SAMPLES, CLI_SP_SEED, CLI_SP_LEVEL };

#define CLI_SPREAD_LONGOPTS                                              \
	{"spread", required_argument, NULL, CLI_SP_SPREAD},              \
	{"samples", required_argument, NULL, CLI_SP_SAMPLES},            \
	{"seed", required_argument, NULL, CLI_SP_SEED},                  \
	{"level", required_argument, NULL, CLI_SP_LEVEL}

#define CLI_SPREAD_HELP                                                  \
	"  --spread SPEC  solve every point across a spread of inputs: "  \
	"the study's\n                spread block as JSON, or "         \
	"name=FROM..TO, name=+-W,\n                name=sd W joined by " \
	"commas (names: viscosity_scale,\n                "              \
	"melting_point, feed_temperature, clearance,\n"                   \
	"                barrel_heat_factor); replaces the study's block\n" \
	"  --samples N   samples per point (default 16)\n"                \
	"  --seed S      seed of the samples (printed; default the "      \
	"study's)\n"                                                     \
	"  --level P     share of safe samples the robust window needs "  \
	"(default 95 %%)\n"

struct cli_spread {
	const char *spec;             /* --spread, NULL: none */
	struct ow_spread_config cfg;
	struct ow_spread_result *r;   /* after the run */
	struct ow_grid *robust;
	struct ow_window *w;
	const char *cmd;              /* "map" or "report", for messages */
	int save;                     /* write spread.json beside the maps */
};

void cli_spread_init(struct cli_spread *sp);
void cli_spread_free(struct cli_spread *sp);

/* Handle one option (id from getopt_long): 0 done, -1 not ours, else the
 * exit code after printing why. */
int cli_spread_option(struct cli_spread *sp, int id, const char *arg);

/* After loading: apply --spread to s. Exit code. */
int cli_spread_load(const struct ow_units *u, struct cli_spread *sp,
		    struct ow_study *s);

/* When s has a spread: sample grid g, build the robust grid and window
 * (clipped to the nominal window).
 * Exit code (0 also when there is no spread). */
int cli_spread_run(const struct ow_study *s, const struct ow_grid *g,
		   const struct ow_window *nominal, int jobs, int quiet,
		   struct cli_spread *sp);

/* Replace *text (grid.csv / window.json of the nominal run) with the
 * spread's version; no change without a spread run. */
enum ow_status cli_spread_grid(const struct ow_study *s,
			       const struct ow_grid *g,
			       const struct cli_spread *sp, char **text,
			       struct ow_diag *d);
enum ow_status cli_spread_window(const struct ow_study *s,
				 const struct cli_spread *sp, char **text,
				 struct ow_diag *d);

/* map-safe-share.png/.svg into dir, and spread.json when sp->save
 * (nothing without a spread run); w the nominal window. Exit code. */
int cli_spread_files(const struct ow_study *s, const struct ow_grid *g,
		     const struct ow_window *w, const struct cli_spread *sp,
		     enum ow_unit_system units, const char *dir);

/* `opwin report DIR`: the spread of map folder dir (its spread.json, when
 * there is one) into s->spread and sp, with the robust grid and window.
 * Exit code. */
int cli_spread_reload(struct ow_study *s, const struct ow_grid *g,
		      const struct ow_window *nominal, const char *dir,
		      struct cli_spread *sp);

/* Summary lines (nothing without a spread run). */
void cli_spread_print(const struct ow_study *s, const struct ow_window *nominal,
		      const struct cli_spread *sp, enum ow_unit_system units);

#endif
