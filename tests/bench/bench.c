/* bench.c - speed and memory figures for `make bench` (not a test: it
 * prints, it does not judge). On the demo at default resolution:
 *   - one operating point, cold (as `opwin point` solves it) and warm (as
 *     the sweep solves it: started from the two speeds before it);
 *   - the 41x41 map's sweep on 1 and 2 threads, marches per point;
 *   - the whole `opwin map` command (solve, draw, write) on 1 and 2
 *     threads, run as the built program;
 *   - the calibration of the demo's 6 readings with 2 free factors;
 *   - the 41x41 sweep across a 3-input spread at the default sample count,
 *     as a ratio to the nominal sweep;
 *   - the scale line: the sweep at 11x11 .. 81x81 on 2 threads, each in a
 *     process of its own so that its peak memory is its own.
 * Each target is printed with the measured figure, the target and their
 * ratio. Wall times depend on the machine and its load; the
 * instruction counts of `valgrind --tool=callgrind` do not. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#include "opwin.h"
#include "ow_solver.h"
#include "ow_sweep.h"

#define N_SPEEDS 21 /* 20 .. 120 rpm in steps of 5 */

static double now(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static int cmp(const void *a, const void *b)
{
	double x = *(const double *)a, y = *(const double *)b;

	return (x > y) - (x < y);
}

static void target(const char *what, double got, double goal, const char *unit,
                   int at_least)
{
	printf("  %-40s %8.3g %-2s target %s %-5.3g ratio %.2f%s\n", what, got,
	       unit, at_least ? ">=" : "<=", goal, got / goal,
	       (at_least ? got >= goal : got <= goal) ? "" : "  (not met)");
}

/* Median time and marches of one point at 20, 25, ... 120 rpm: cold, or
 * warm (each started from the two speeds before it, as along a row). */
static double bench_point(const struct ow_study *s, int warm, double *marches)
{
	struct ow_solver *sv = NULL;
	struct ow_point pt[N_SPEEDS];
	double t[N_SPEEDS];
	int i, n = 0;

	if (ow_solver_create(s, &sv, NULL) != OW_OK)
		return 0.0;
	for (i = 0; i < N_SPEEDS; i++) {
		const struct ow_point *prev[2] = {&pt[i > 0 ? i - 1 : 0],
		                                  &pt[i > 1 ? i - 2 : 0]};
		struct ow_solver_start s0;
		double t0 = now();

		ow_sweep_predict(prev, warm ? (i < 2 ? i : 2) : 0,
		                 20.0 + 5.0 * i, &s0);
		ow_solver_run_from(sv, 20.0 + 5.0 * i, NULL, &s0, &pt[i], NULL);
		t[i] = now() - t0;
		n += pt[i].n_iter;
	}
	ow_solver_destroy(sv);
	qsort(t, N_SPEEDS, sizeof t[0], cmp);
	*marches = (double)n / N_SPEEDS;
	return t[N_SPEEDS / 2];
}

static double marches_per_point(const struct ow_grid *g)
{
	long n = 0;
	int k;

	for (k = 0; k < g->n_rpm * g->n_axis; k++)
		if (g->pts[k].solved == 1)
			n += g->pts[k].pt.n_iter;
	return g->solves > 0 ? (double)n / g->solves : 0.0;
}

/* The sweep alone on an steps x steps grid: wall time, solves, marches. */
static double bench_sweep(const struct ow_study *s, int jobs, int steps,
                          int *solves, double *marches)
{
	struct ow_sweep_config c;
	struct ow_grid *g = NULL;
	double t0 = now(), dt;

	ow_sweep_default(&c);
	c.jobs = jobs;
	c.rpm_steps = c.axis_steps = steps;
	if (ow_sweep_run(s, &c, &g, NULL) != OW_OK)
		return 0.0;
	dt = now() - t0;
	*solves = g->solves;
	*marches = marches_per_point(g);
	ow_grid_destroy(g);
	return dt;
}

/* The demo's sweep (its own grid, 2 threads) across a 3-input spread at
 * the default sample count: viscosity +-10 %, melting point +-3 K, feed
 * temperature +-10 K. Returns (nominal + sampled) / nominal wall time. */
static double bench_spread(const struct ow_units *u, struct ow_study *s)
{
	static const char *const spec =
	    "{\"viscosity_scale\": {\"plus_minus\": \"10 %\"}, "
	    "\"melting_point\": {\"plus_minus\": \"3 K\"}, "
	    "\"feed_temperature\": {\"plus_minus\": \"10 K\"}}";
	struct ow_sweep_config c;
	struct ow_spread_config pc;
	struct ow_spread_result *r = NULL;
	struct ow_grid *g = NULL;
	struct ow_diag d = {{0}};
	double t0 = now(), t1, ratio = 0.0;

	ow_sweep_default(&c);
	c.jobs = 2;
	ow_spread_config_default(&pc);
	pc.jobs = 2;
	if (ow_config_spread_text(u, spec, "bench", s, &d) != OW_OK ||
	    ow_sweep_run(s, &c, &g, &d) != OW_OK) {
		fprintf(stderr, "bench: %s\n", d.msg);
		return 0.0;
	}
	t1 = now();
	if (ow_spread_run(s, g, &pc, &r, &d) == OW_OK) {
		ratio = (now() - t0) / (t1 - t0);
		printf("sweep 41x41 across a 3-input spread, %d samples: "
		       "%.1f s against %.1f s nominal (%.1fx), %d sample "
		       "solves, %d saved\n",
		       r->samples, now() - t0, t1 - t0, ratio, r->solves,
		       r->solves_saved);
	}
	ow_spread_result_destroy(r);
	ow_grid_destroy(g);
	return ratio;
}

/* The whole `opwin map` on the demo's own 41x41 grid: wall time. */
static double bench_command(const char *opwin, const char *study, int jobs)
{
	char cmd[1024];
	double t0 = now();

	snprintf(cmd, sizeof cmd,
	         "%s map %s -o build/bench-map --jobs %d --quiet "
	         "--date 2000-01-01",
	         opwin, study, jobs);
	if (system(cmd) != 0) {
		fprintf(stderr, "bench: failed: %s\n", cmd);
		return 0.0;
	}
	return now() - t0;
}

/* One scale point, in a fresh process of its own (bench --scale N
 * STUDY) so that its peak memory is its own: time, solves, peak. */
static int scale_point(const struct ow_study *s, int steps)
{
	struct rusage ru;
	double t, marches;
	int solves = 0;

	t = bench_sweep(s, 2, steps, &solves, &marches);
	getrusage(RUSAGE_SELF, &ru);
	printf("  %3dx%-3d %7.2f s %6d solves %6.0f us/solve %5.2f marches "
	       "per point, peak %.1f MB\n",
	       steps, steps, t, solves, solves > 0 ? 1e6 * t / solves : 0.0,
	       marches, (double)ru.ru_maxrss / 1024.0);
	return 0;
}

static void bench_scale(const char *self, const char *study, int steps)
{
	char n[16];
	pid_t pid;
	int status;

	snprintf(n, sizeof n, "%d", steps);
	fflush(stdout);
	pid = fork();
	if (pid == 0) { /* a fresh process: OpenMP does not survive fork */
		execl(self, self, "--scale", n, study, (char *)NULL);
		_exit(127);
	}
	if (pid > 0)
		waitpid(pid, &status, 0);
}

/* The demo calibration: 6 readings, viscosity_scale and die_factor. */
static void bench_calib(const struct ow_units *u, const struct ow_study *s,
                        const char *readings)
{
	struct ow_calib_result *r = malloc(sizeof *r);
	struct ow_readings *rd = NULL;
	struct ow_calib_options o;
	struct ow_diag d = {{0}};
	double t0;

	if (!r || ow_calib_readings_read(u, readings, s->line.n_zones, &rd,
	                                 &d) != OW_OK) {
		fprintf(stderr, "bench: %s\n", d.msg);
		free(r);
		return;
	}
	ow_calib_options_from(&s->calib, &o);
	o.free_mask = (1u << OW_CF_VISCOSITY) | (1u << OW_CF_DIE);
	t0 = now();
	if (ow_calib_run(s, rd, &o, r, &d) == OW_OK)
		printf("calibration, %zu readings and 2 factors: %.2f s, %d "
		       "iterations, %d point solves (target: seconds)\n",
		       rd->n, now() - t0, r->iterations, r->solves);
	else
		fprintf(stderr, "bench: %s\n", d.msg);
	free(rd);
	free(r);
}

int main(int argc, char **argv)
{
	int scaled = argc == 4 && strcmp(argv[1], "--scale") == 0;
	const char *path = scaled     ? argv[3]
	                   : argc > 1 ? argv[1]
	                              : "demo/study-si.json";
	const char *readings =
	    argc > 2 ? argv[2] : "demo/line/line3-readings.csv";
	const char *opwin = argc > 3 ? argv[3] : "build/opwin";
	struct ow_units *u = NULL;
	struct ow_study *s = calloc(1, sizeof *s);
	struct ow_diag d = {{0}};
	double cold, warm, mc, mw, t1, t2, c1, c2, m1, m2, sp;
	int n1, n2, k;
	static const int scale[] = {11, 21, 41, 81};

	if (!s || ow_units_create(&u, &d) != OW_OK ||
	    ow_config_load_study(u, path, s, &d) != OW_OK) {
		fprintf(stderr, "bench: %s\n", d.msg);
		return 1;
	}
	if (scaled)
		return scale_point(s, atoi(argv[2]));
	printf("bench: %s (wall times: the machine's load inflates them)\n",
	       path);
	cold = bench_point(s, 0, &mc);
	warm = bench_point(s, 1, &mw);
	printf("point solve, 20..120 rpm: cold median %.2f ms (%.2f marches), "
	       "warm median %.2f ms (%.2f marches)\n",
	       1e3 * cold, mc, 1e3 * warm, mw);
	t1 = bench_sweep(s, 1, 41, &n1, &m1);
	t2 = bench_sweep(s, 2, 41, &n2, &m2);
	printf("sweep 41x41: 1 thread %.2f s, 2 threads %.2f s (%.2fx), %d "
	       "solves, %.2f marches per point\n",
	       t1, t2, t2 > 0 ? t1 / t2 : 0.0, n2, m2);
	c1 = bench_command(opwin, path, 1);
	c2 = bench_command(opwin, path, 2);
	printf("opwin map 41x41 (solve, draw, write): 1 thread %.2f s, "
	       "2 threads %.2f s\n",
	       c1, c2);
	bench_calib(u, s, readings);
	sp = bench_spread(u, s);
	printf("targets (measured, target, ratio measured/target):\n");
	target("point solve, cold (median)", 1e3 * cold, 2.0, "ms", 0);
	target("point solve, warm (median)", 1e3 * warm, 1.0, "ms", 0);
	target("marches per point, demo 41x41 map", m2, 2.0, "", 0);
	target("opwin map 41x41 on 2 threads (wall)", c2, 2.5, "s", 0);
	if (c2 > 0.0)
		target("opwin map speed-up 1 -> 2 threads", c1 / c2, 1.85, "x",
		       1);
	if (sp > 0.0)
		target("sweep with a 3-input spread / nominal", sp, 8.0, "x",
		       0);
	printf("scale (sweep only, 2 threads; linear cost: constant "
	       "us/solve):\n");
	for (k = 0; k < (int)(sizeof scale / sizeof scale[0]); k++)
		bench_scale(argv[0], path, scale[k]);
	free(s);
	ow_units_destroy(u);
	return 0;
}
