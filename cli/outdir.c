/* outdir.c - a map folder written as a whole by `opwin map` and
 * `opwin report`: checked before any point is solved, written into a
 * sibling temporary folder, sealed with its manifest and put in place of
 * the previous folder in one rename. SIGINT, SIGTERM and SIGHUP while it
 * is written discard the temporary folder, then end the program as the
 * signal would have: the previous folder stays whole. */
#include "cli.h"

#include <signal.h>
#include <stdio.h>
#include <string.h>

#include "ow_mapdir.h"

static const int caught[] = {SIGINT, SIGTERM, SIGHUP};
#define N_CAUGHT ((int)(sizeof caught / sizeof caught[0]))

/* The one piece of process-wide state: which signal arrived while a
 * folder was being written (signals reach a process, not a call). */
static volatile sig_atomic_t pending_signal;

static void note_signal(int sig)
{
	pending_signal = sig;
}

int cli_outdir_check(const char *cmd, const char *dir)
{
	struct ow_diag d = {{0}};
	enum ow_status st;

	cli_make_parents(dir); /* -o out/demo with no out/ yet */
	st = ow_mapdir_check_target(dir, &d);
	return st == OW_OK ? CLI_OK : cli_fail(cmd, st, &d);
}

int cli_outdir_begin(const char *cmd, struct cli_outdir *o, const char *dir)
{
	struct ow_diag d = {{0}};
	struct sigaction sa;
	enum ow_status st;
	int k;

	memset(o, 0, sizeof *o);
	o->dir = dir;
	memset(&sa, 0, sizeof sa);
	sa.sa_handler = note_signal;
	sigemptyset(&sa.sa_mask);
	pending_signal = 0;
	for (k = 0; k < N_CAUGHT; k++) {
		sigaction(caught[k], &sa, &o->saved[k]);
		if (o->saved[k].sa_handler == SIG_IGN) /* e.g. under nohup */
			sigaction(caught[k], &o->saved[k], NULL);
	}
	st = ow_io_dir_check(dir, &d); /* again: things change while solving */
	if (st == OW_OK)
		st = ow_io_dir_begin(dir, o->tmp, sizeof o->tmp, &d);
	if (st != OW_OK) {
		o->tmp[0] = '\0';
		return cli_fail(cmd, st, &d);
	}
	return CLI_OK;
}

int cli_outdir_finish(const char *cmd, struct cli_outdir *o, int rc)
{
	struct ow_diag d = {{0}};
	char left[OW_PATH_LEN + 32];
	enum ow_status st = OW_OK;
	int k, sig, placed = 0;

	if (!rc && !pending_signal && o->tmp[0]) {
		st = ow_mapdir_seal(o->tmp, &d);
		if (st == OW_OK && !pending_signal)
			st = ow_mapdir_replace(o->tmp, o->dir, left,
			                       sizeof left, &d);
		if (st == OW_OK) {
			o->tmp[0] = '\0'; /* in place: tmp was the old one */
			placed = 1;
			if (left[0])
				fprintf(stderr,
				        "opwin %s: the previous %s "
				        "held files that could not be moved "
				        "or removed; they are in %s\n",
				        cmd, o->dir, left);
		}
		if (st != OW_OK)
			rc = cli_fail(cmd, st, &d);
	}
	if (o->tmp[0]) { /* not put in place: discard it whole */
		ow_io_dir_remove(o->tmp, NULL, NULL, NULL);
		if (rc)
			fprintf(stderr,
			        "opwin %s: %s: left as it was (the "
			        "outputs went into %s, now removed)\n",
			        cmd, o->dir, o->tmp);
	}
	/* a signal that came once the new folder was in place finds the
	 * run complete: nothing is undone, so the run ends normally */
	sig = placed ? 0 : pending_signal;
	for (k = 0; k < N_CAUGHT; k++)
		sigaction(caught[k], &o->saved[k], NULL);
	if (sig) /* end as the signal would have, now that nothing is left */
		raise(sig);
	return rc;
}
