/* test_cli_faults.c - end-to-end: outputs that cannot be hijacked or
 * half-written, whatever goes wrong around them. The promises checked are
 * the README's ("an interrupted or failed run leaves the previous folder
 * as it was") on the POSIX semantics they rest on: open(2) with O_CREAT |
 * O_EXCL never follows a link, rename(2) replaces its target atomically,
 * SIGTERM's default action ends the process (POSIX.1-2017, signal.h). */
#include "testutil.h"
#include "clirun.h"

#include <dirent.h>
#include <errno.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#define FAST "tests/data/map-fast.json"
#define TOP  OW_TEST_OUT "/faults"

static void sh(const char *fmt, ...) __attribute__((format(printf, 1, 2)));
static void sh(const char *fmt, ...)
{
	char cmd[2048];
	va_list ap;

	va_start(ap, fmt);
	vsnprintf(cmd, sizeof cmd, fmt, ap);
	va_end(ap);
	if (system(cmd) != 0)
		fail_msg("shell step failed: %s", cmd);
}

static int setup(void **state)
{
	(void)state;
	sh("rm -rf '%s' && mkdir -p '%s'", TOP, TOP);
	return 0;
}

static int teardown(void **state)
{
	(void)state;
	sh("chmod -R u+w '%s' 2>/dev/null; rm -rf '%s'", TOP, TOP);
	return 0;
}

/* Run opwin, expect exit code want; the test fails with its stderr. */
static void expect(int want, const char *args, const char *words)
{
	struct cli_result r;

	cli_run(args, &r);
	if (r.code != want || (words && !strstr(r.err, words)))
		fail_msg("opwin %s: exit %d (want %d), stderr: %s", args,
		         r.code, want, r.err);
	cli_result_free(&r);
}

static int exists(const char *path)
{
	struct stat sb;

	return lstat(path, &sb) == 0;
}

/* Entries of TOP that are temporaries: names starting with '.'. */
static int temporaries(void)
{
	DIR *d = opendir(TOP);
	struct dirent *e;
	int n = 0;

	assert_non_null(d);
	while ((e = readdir(d)))
		n += e->d_name[0] == '.' && strcmp(e->d_name, ".") &&
		     strcmp(e->d_name, "..");
	closedir(d);
	return n;
}

/* A fresh map folder of FAST on a grid of n x n points. */
static void map_into(const char *dir, int n)
{
	char args[512];

	snprintf(args, sizeof args, "map %s -o %s --grid %dx%d --quiet", FAST,
	         dir, n, n);
	expect(0, args, NULL);
}

/* The folder verifies against its manifest (report reads it back). */
static void whole(const char *dir)
{
	char args[512];

	snprintf(args, sizeof args, "report %s --quiet", dir);
	expect(0, args, NULL);
}

static void holds(const char *path, const char *want)
{
	char *x = cli_slurp(path);

	assert_non_null(x);
	assert_string_equal(x, want);
	free(x);
}

static void same_text(const char *a, const char *b)
{
	char *x = cli_slurp(a), *y = cli_slurp(b);

	assert_non_null(x);
	assert_non_null(y);
	assert_string_equal(x, y);
	free(x);
	free(y);
}

/* ---- before solving --------------------------------------------------- */

static void output_folders_that_cannot_be_written_are_refused_first(void **s)
{
	(void)s;
	sh("printf x > %s/file && mkfifo %s/fifo && mkdir %s/notes && "
	   "printf keep > %s/notes/mine.txt && ln -s notes %s/link",
	   TOP, TOP, TOP, TOP, TOP);
	expect(4, "map " FAST " -o " TOP "/file/out --quiet", "not a folder");
	expect(4, "map " FAST " -o " TOP "/fifo --quiet", "not a folder");
	expect(4, "map " FAST " -o " TOP "/link --quiet", "symbolic link");
	expect(4, "map " FAST " -o " TOP "/notes --quiet", "not a map folder");
	expect(4, "map " FAST " -o . --quiet", "name the folder itself");
	assert_false(exists(TOP "/file/out"));
	holds(TOP "/notes/mine.txt", "keep");
	assert_int_equal(temporaries(), 0);
}

/* A folder the user may not write into. As root (CI) the permission bits
 * do not bind, so opwin then runs as the unprivileged user 65534. */
static void a_read_only_folder_is_refused_before_solving(void **s)
{
	char args[512];
	const char *as = "";

	(void)s;
	sh("mkdir %s/ro && chmod 555 %s/ro && chmod 755 %s", TOP, TOP, TOP);
	if (geteuid() == 0) {
		if (system("command -v setpriv >/dev/null") != 0)
			skip();
		as = "setpriv --reuid=65534 --regid=65534 --clear-groups ";
	}
	snprintf(args, sizeof args,
	         "%s%s map %s -o %s/ro/out --grid 3x3 --quiet 2>&1 | "
	         "grep -q 'cannot create the folder'",
	         as, cli_binary(), FAST, TOP);
	if (system(args) != 0)
		fail_msg("not refused with its reason: %s", args);
	assert_false(exists(TOP "/ro/out"));
}

static void a_study_without_sweep_leaves_no_folder(void **s)
{
	(void)s;
	sh("sed '/^  \"sweep\": {/,/^  },/d' %s > %s/nosweep.json", FAST, TOP);
	expect(0, "check " TOP "/nosweep.json", NULL); /* a valid study */
	expect(1, "map " TOP "/nosweep.json -o " TOP "/ns --quiet", "sweep");
	assert_false(exists(TOP "/ns"));
}

static void an_impossible_date_is_a_usage_error(void **s)
{
	(void)s;
	expect(2, "map " FAST " -o " TOP "/date --date 2024-02-31 --quiet",
	       "--date");
	expect(2, "map " FAST " -o " TOP "/date --date 2023-02-29 --quiet",
	       "--date");
	assert_false(exists(TOP "/date"));
}

/* ---- single files ----------------------------------------------------- */

static void a_planted_link_or_fifo_is_never_written_through(void **s)
{
	(void)s;
	sh("printf secret > %s/victim && ln -s victim %s/p.csv && "
	   "mkfifo %s/p.fifo",
	   TOP, TOP, TOP);
	expect(4, "point " FAST " --rpm 60 --profile " TOP "/p.csv",
	       "symbolic link");
	holds(TOP "/victim", "secret");
	/* nobody reads the FIFO: refused at once, never waited on */
	expect(4, "point " FAST " --rpm 60 --profile " TOP "/p.fifo", "FIFO");
	sh("test -p %s/p.fifo", TOP);
	/* a device is written in place, never replaced (ENOSPC here) */
	expect(4, "point " FAST " --rpm 60 --profile /dev/full", "/dev/full");
	sh("test -c /dev/full");
	assert_int_equal(temporaries(), 0);
}

static void a_link_planted_in_a_map_folder_is_not_followed(void **s)
{
	(void)s;
	map_into(TOP "/m", 3);
	sh("printf secret > %s/victim && rm %s/m/grid.csv && "
	   "ln -s ../victim %s/m/grid.csv",
	   TOP, TOP, TOP);
	map_into(TOP "/m", 3);
	sh("test -f %s/m/grid.csv && ! test -L %s/m/grid.csv", TOP, TOP);
	holds(TOP "/victim", "secret");
	whole(TOP "/m");
	assert_int_equal(temporaries(), 0);
}

/* ---- whole folders ---------------------------------------------------- */

/* A full disk, simulated by a file size limit (setrlimit RLIMIT_FSIZE)
 * with SIGXFSZ ignored, so writes fail with EFBIG as with ENOSPC. */
static void a_full_disk_leaves_the_previous_folder_whole(void **s)
{
	(void)s;
	map_into(TOP "/full", 3);
	sh("cp %s/full/manifest.json %s/before.json", TOP, TOP);
	sh("sh -c 'ulimit -f 16; trap \"\" XFSZ; exec %s map %s -o %s/full "
	   "--grid 7x7 --quiet' 2>%s/err; test $? = 4",
	   cli_binary(), FAST, TOP, TOP);
	same_text(TOP "/before.json", TOP "/full/manifest.json");
	whole(TOP "/full");
	assert_int_equal(temporaries(), 0);
}

static pid_t start_map(const char *dir, const char *grid)
{
	pid_t pid = fork();

	assert_true(pid >= 0);
	if (pid == 0) {
		execl(cli_binary(), "opwin", "map", FAST, "-o", dir, "--grid",
		      grid, "--quiet", (char *)NULL);
		_exit(127);
	}
	return pid;
}

/* Wait until the temporary folder of a run appears (the run is writing),
 * at most about a minute; 1 when it did. */
static int wait_for_writing(pid_t pid)
{
	int i, status;

	for (i = 0; i < 60000; i++) {
		if (temporaries() > 0)
			return 1;
		if (waitpid(pid, &status, WNOHANG) == pid)
			return 0; /* finished before it could be caught */
		usleep(1000);
	}
	kill(pid, SIGKILL); /* never began writing: give up on this run */
	waitpid(pid, &status, 0);
	return 0;
}

/* SIGTERM to a run: 1 when the signal ended it, 0 when it had finished
 * (exit 0) before the signal came. Either way no temporary is left. */
static int terminate(pid_t pid)
{
	int status;

	kill(pid, SIGTERM);
	assert_int_equal(waitpid(pid, &status, 0), pid);
	assert_int_equal(temporaries(), 0);
	if (WIFEXITED(status)) {
		assert_int_equal(WEXITSTATUS(status), 0);
		return 0;
	}
	assert_int_equal(WTERMSIG(status), SIGTERM);
	return 1;
}

static void sigterm_while_solving_leaves_the_previous_folder_whole(void **s)
{
	struct timespec nap = {0, 200000000};
	pid_t pid;

	(void)s;
	map_into(TOP "/sig", 3);
	sh("cp %s/sig/manifest.json %s/before.json", TOP, TOP);
	pid = start_map(TOP "/sig", "400x400"); /* minutes of solving */
	nanosleep(&nap, NULL);
	assert_int_equal(temporaries(), 0); /* nothing made while solving */
	assert_int_equal(terminate(pid), 1);
	same_text(TOP "/before.json", TOP "/sig/manifest.json");
	whole(TOP "/sig");
}

/* The run is caught while its temporary folder exists; a run that ends
 * before the signal arrives is simply tried again. */
static void sigterm_while_writing_leaves_the_previous_folder_whole(void **s)
{
	int tries, caught = 0;
	pid_t pid;

	(void)s;
	map_into(TOP "/sigw", 3);
	for (tries = 0; tries < 10 && !caught; tries++) {
		sh("cp %s/sigw/manifest.json %s/before.json", TOP, TOP);
		pid = start_map(TOP "/sigw", "9x9");
		caught = wait_for_writing(pid) && terminate(pid);
	}
	assert_true(caught);
	same_text(TOP "/before.json", TOP "/sigw/manifest.json");
	whole(TOP "/sigw");
}

static void two_runs_into_one_folder_leave_one_whole_run(void **s)
{
	pid_t a, b;
	int st;
	cJSON *lat;
	char *grid;
	int rows = 0;
	const char *p;

	(void)s;
	a = start_map(TOP "/two", "5x5");
	b = start_map(TOP "/two", "8x6");
	assert_int_equal(waitpid(a, &st, 0), a);
	assert_true(WIFEXITED(st) && WEXITSTATUS(st) == 0);
	assert_int_equal(waitpid(b, &st, 0), b);
	assert_true(WIFEXITED(st) && WEXITSTATUS(st) == 0);
	whole(TOP "/two");
	/* grid.csv and points-si.json come from the same run */
	lat = cli_read_json(TOP "/two/points-si.json");
	grid = cli_slurp(TOP "/two/grid.csv");
	assert_non_null(grid);
	for (p = grid; (p = strchr(p, '\n')); p++)
		rows++;
	assert_int_equal(rows - 1, (int)(cli_json_num(lat, "n_rpm") *
	                                 cli_json_num(lat, "n_axis")));
	free(grid);
	cJSON_Delete(lat);
	assert_int_equal(temporaries(), 0);
}

static void report_refuses_a_folder_changed_since_written(void **s)
{
	(void)s;
	map_into(TOP "/chg/", 3); /* a trailing slash as typed */
	sh("printf keep > %s/chg/mine.txt", TOP);
	whole(TOP "/chg"); /* a file of the user's own does not matter */
	map_into(TOP "/chg", 3);
	sh("test -f %s/chg/mine.txt", TOP); /* and moves into the new one */
	sh("printf 1 >> %s/chg/grid.csv", TOP);
	expect(1, "report " TOP "/chg --quiet", "grid.csv");
	map_into(TOP "/chg", 3);
	sh("rm %s/chg/window.png", TOP);
	expect(1, "report " TOP "/chg --quiet", "window.png is missing");
	sh("rm %s/chg/manifest.json", TOP);
	expect(1, "report " TOP "/chg --quiet", "manifest.json is missing");
}

/* ---- fit -------------------------------------------------------------- */

static void fit_into_rewrites_only_a_resin_file(void **s)
{
	(void)s;
	sh("cp %s %s/study.json && cp %s/study.json %s/study.orig", FAST, TOP,
	   TOP, TOP);
	expect(1,
	       "fit tests/bad/lab/base.csv --into " TOP "/study.json "
	       "--quiet",
	       "not a key of a resin file");
	same_text(TOP "/study.json", TOP "/study.orig");
	expect(1, "fit " TOP " --quiet", "is a folder");
}

/* tests/bad/lab/MANIFEST: <file> <line L, column C> <text>. */
static void every_lab_table_case_is_refused_at_its_cell(void **s)
{
	FILE *m = fopen("tests/bad/lab/MANIFEST", "r");
	char line[512], args[512];
	int n = 0;

	(void)s;
	assert_non_null(m);
	while (fgets(line, sizeof line, m)) {
		char *file = strtok(line, "\t"), *where = strtok(NULL, "\t"),
		     *want = strtok(NULL, "\t\n");
		struct cli_result r;

		if (line[0] == '#' || line[0] == '\n')
			continue;
		assert_non_null(want);
		snprintf(args, sizeof args,
		         "fit tests/bad/lab/%s --model power-law --quiet",
		         file);
		cli_run(args, &r);
		if (r.code != 1 || !strstr(r.err, where) ||
		    !strstr(r.err, want))
			fail_msg("%s: exit %d, \"%s\" should name \"%s\" and "
			         "say \"%s\"",
			         file, r.code, r.err, where, want);
		cli_result_free(&r);
		n++;
	}
	fclose(m);
	assert_true(n >= 4);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(
	        output_folders_that_cannot_be_written_are_refused_first),
	    cmocka_unit_test(a_read_only_folder_is_refused_before_solving),
	    cmocka_unit_test(a_study_without_sweep_leaves_no_folder),
	    cmocka_unit_test(an_impossible_date_is_a_usage_error),
	    cmocka_unit_test(a_planted_link_or_fifo_is_never_written_through),
	    cmocka_unit_test(a_link_planted_in_a_map_folder_is_not_followed),
	    cmocka_unit_test(a_full_disk_leaves_the_previous_folder_whole),
	    cmocka_unit_test(
	        sigterm_while_solving_leaves_the_previous_folder_whole),
	    cmocka_unit_test(
	        sigterm_while_writing_leaves_the_previous_folder_whole),
	    cmocka_unit_test(two_runs_into_one_folder_leave_one_whole_run),
	    cmocka_unit_test(report_refuses_a_folder_changed_since_written),
	    cmocka_unit_test(fit_into_rewrites_only_a_resin_file),
	    cmocka_unit_test(every_lab_table_case_is_refused_at_its_cell),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
