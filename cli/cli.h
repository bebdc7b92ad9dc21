/* cli.h - what the subcommands share: option defaults, loading a study,
 * reporting a failure with its exit code. The CLI reaches the library only
 * through lib/opwin.h. */
#ifndef OW_CLI_H
#define OW_CLI_H

#include <signal.h>
#include <stddef.h>
#include <time.h>

#include "opwin.h"
#include "ow_report.h"

/* Exit codes (README: 0 ok, 1 inputs, 2 usage, 3 compute, 4 output). */
enum {
	CLI_OK = 0,
	CLI_INPUT = 1,   /* inputs rejected */
	CLI_USAGE = 2,   /* usage error */
	CLI_COMPUTE = 3, /* computation failed */
	CLI_OUTPUT = 4,  /* output could not be written */
};

/* Options every command accepts. */
struct cli_common {
	enum ow_unit_system units;
	int jobs; /* 0: all cores */
	int quiet;
};

/* One subcommand: `int cmd_<name>(int argc, char **argv)`, argv[0] is the
 * command's name. */
struct cli_command {
	const char *name;
	int (*run)(int argc, char **argv);
	const char *summary;
};

int cmd_calibrate(int argc, char **argv);
int cmd_check(int argc, char **argv);
int cmd_compare(int argc, char **argv);
int cmd_point(int argc, char **argv);
int cmd_map(int argc, char **argv);
int cmd_fit(int argc, char **argv);
int cmd_report(int argc, char **argv);

/* Map a library status to the exit code. */
int cli_exit_code(enum ow_status st);

/* Print "opwin <cmd>: <message>" to stderr and return the exit code. */
int cli_fail(const char *cmd, enum ow_status st, const struct ow_diag *d);

/* Print a usage error with a hint to --help; returns CLI_USAGE. */
int cli_usage_error(const char *cmd, const char *msg);

/* Long options every command takes; put first in its option table. */
#define CLI_COMMON_LONGOPTS                                                    \
	{"units", required_argument, NULL, 'u'},                               \
	    {"jobs", required_argument, NULL, 'j'},                            \
	    {"quiet", no_argument, NULL, 'q'},                                 \
	    {"help", no_argument, NULL, 'h'},                                  \
	{                                                                      \
		"version", no_argument, NULL, 'V'                              \
	}

/* Print the version line (for --version). */
void cli_version(void);

struct option; /* <getopt.h> */

/* A subcommand's command line, for cli_options. */
struct cli_spec {
	const char *cmd;           /* "calibrate" */
	const struct option *opts; /* CLI_COMMON_LONGOPTS first, zeros last */
	const char *shorts;        /* getopt's short options ("ho:q") */
	void (*help)(void);        /* prints the command's help */
	/* One of the command's own options (id is getopt_long's value):
	 * 0 taken, an exit code after printing why, or CLI_NOT_MINE. */
	int (*option)(void *ctx, int id, const char *arg);
	int n_args;          /* operands the command needs */
	const char *expects; /* the usage error when they are not
	                        there ("expects one STUDY.json") */
};

#define CLI_GO_ON    (-1) /* cli_options: run the command */
#define CLI_NOT_MINE (-1) /* cli_spec.option: not one of the command's */

/* Read argv[1..] as sp says: --help and --version print and end the
 * command (CLI_OK); the options of CLI_COMMON_LONGOPTS fill *c; every other
 * option goes to sp->option(ctx, ...), and to cli_common_option when it
 * is not the command's. Then exactly sp->n_args operands must remain:
 * *args points at the first. Returns CLI_GO_ON when the command is to
 * run, else its exit code (CLI_USAGE after printing why). */
int cli_options(const struct cli_spec *sp, int argc, char **argv, void *ctx,
                struct cli_common *c, char ***args);

/* Handle one of the common long options (id is the getopt_long return
 * value: 'u' units, 'j' jobs, 'q' quiet). Returns 0, or CLI_USAGE after
 * printing why. */
int cli_common_option(const char *cmd, struct cli_common *c, int id,
                      const char *arg);

/* Load a study, with the units in *u (NULL: created here, so that a
 * command with two studies reads the unit database once); on failure print
 * and return the exit code (the caller then returns it; units created
 * here are gone again). On success *u and *study are owned by the caller:
 * ow_units_destroy(*u), free(*study). */
int cli_load_study(const char *cmd, const char *path, struct ow_units **u,
                   struct ow_study **study);

/* --grid NxM: 0, or -1 unless both are 2..1000. */
int cli_parse_grid(const char *s, int *n, int *m);

/* A YYYY-MM-DD date that exists in the Gregorian calendar (year 1..9999)? */
int cli_valid_date(const char *s);

/* Today as YYYY-MM-DD (UTC), or the day of SOURCE_DATE_EPOCH when set so
 * that reports can be reproduced byte for byte. */
void cli_today(char *buf, size_t n);

/* Make the output folder dir (one level) or say why not: CLI_OUTPUT. */
int cli_make_dir(const char *cmd, const char *dir);

/* mkdir -p of every missing parent of dir (not dir itself); failures are
 * left for the folder's own creation to report. */
void cli_make_parents(const char *dir);

/* A map folder written as a whole (outdir.c). */
struct cli_outdir {
	const char *dir;            /* where the folder goes */
	char tmp[OW_PATH_LEN + 32]; /* the folder being written */
	struct sigaction saved[3];  /* SIGINT, SIGTERM, SIGHUP before */
};

/* Before solving: can a map folder be written at dir (ow_mapdir.h,
 * ow_mapdir_check_target)? CLI_OK, or CLI_OUTPUT after printing why. */
int cli_outdir_check(const char *cmd, const char *dir);

/* Make the sibling temporary folder o->tmp for dir and note SIGINT,
 * SIGTERM and SIGHUP from now on. CLI_OK or CLI_OUTPUT. */
int cli_outdir_begin(const char *cmd, struct cli_outdir *o, const char *dir);

/* rc 0 and no signal noted: seal o->tmp and put it in place of o->dir.
 * Otherwise (or when that fails) discard o->tmp. Restores the signal
 * handling, then re-raises a noted signal. Returns rc, or CLI_OUTPUT. */
int cli_outdir_finish(const char *cmd, struct cli_outdir *o, int rc);

/* A progress bar on stderr for the sweep's callback. */
struct cli_progress {
	const char *name;
	struct timespec t0;
};
void cli_progress_start(struct cli_progress *p, const char *name);
void cli_progress_show(void *ctx, int done, int total);

/* A number in unit system sys (rpm; degC or degF; K or degF
 * differences): callers pass the study's own system, so a bare number
 * means what the study's file means; or a text with its unit ("10 K",
 * "440 degF"). */
enum ow_status cli_read_value(const struct ow_units *u, const char *text,
                              enum ow_dim dim, enum ow_unit_system sys,
                              double *si, struct ow_diag *d);

/* Tell on stderr how an option's value was read: "opwin point: --set 10
 * read as 10 K (18 degF): a bare number is in the study's own units, SI". */
void cli_note_value(const char *cmd, const char *option, const char *text,
                    enum ow_dim dim, enum ow_unit_system study, double si);

/* Options of the maps and the report (map and report commands). */
struct cli_render {
	struct ow_report_options rep;
	const char *current; /* "--current RPM,SET" as typed */
	char today[16];
	int jobs; /* threads drawing (--jobs; 0: all cores) */
};

#define CLI_RENDER_LONGOPTS                                                    \
	{"paper", required_argument, NULL, 'p'},                               \
	    {"revision", required_argument, NULL, 'R'},                        \
	    {"prepared-by", required_argument, NULL, 'P'},                     \
	    {"approved-by", required_argument, NULL, 'A'},                     \
	    {"date", required_argument, NULL, 'D'},                            \
	{                                                                      \
		"current", required_argument, NULL, 'C'                        \
	}

#define CLI_RENDER_HELP                                                        \
	"  --paper P          a4 (default) or letter\n"                        \
	"  --revision R       revision text in the title block\n"              \
	"  --prepared-by NAME, --approved-by NAME\n"                           \
	"                     names in the title block (blank lines to "       \
	"sign otherwise)\n"                                                    \
	"  --date YYYY-MM-DD  date of the report (default: today)\n"           \
	"  --current RPM,SET  the line's current point: screw speed and the "  \
	"set-point\n"                                                          \
	"                     of the map's axis zone, with a unit "            \
	"(60,\"205 degC\")\n"                                                  \
	"                     or bare in the study's own units\n"

/* Defaults: A4, today's date, no current point. */
void cli_render_init(struct cli_render *r);

/* Handle one of CLI_RENDER_LONGOPTS: 0 done, CLI_USAGE after printing
 * why, -1 not one of them. */
int cli_render_option(const char *cmd, struct cli_render *r, int id,
                      const char *arg);

/* Set the report's unit system sys and read --current (if given), a bare
 * number in the study's own system `study`, saying how it was read.
 * Returns 0 or CLI_USAGE. */
int cli_render_current(const char *cmd, const struct ow_units *u,
                       struct cli_render *r, enum ow_unit_system sys,
                       enum ow_unit_system study);

#endif
