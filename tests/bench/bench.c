/* bench.c - speed and memory figures for `make bench` (not a test: it
 * prints, it does not judge). Median time of a cold operating-point solve
 * on the demo at default resolution; points per second of the demo map
 * with 1 and 2 threads; calibration time for the demo's 6 readings and 2
 * free factors; peak memory. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <time.h>

#include "opwin.h"
#include "ow_solver.h"
#include "ow_sweep.h"

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

static void bench_point(const struct ow_study *s)
{
	struct ow_solver *sv = NULL;
	struct ow_point pt;
	double t[21];
	int i, marches = 0;

	if (ow_solver_create(s, &sv, NULL) != OW_OK)
		return;
	for (i = 0; i < 21; i++) {
		double t0 = now();

		ow_solver_run(sv, 20.0 + 5.0 * i, NULL, 0.0, &pt, NULL);
		t[i] = now() - t0;
		marches += pt.n_iter;
	}
	qsort(t, 21, sizeof t[0], cmp);
	printf("point solve (cold, demo, default resolution): median %.1f ms, "
	       "min %.1f ms, max %.1f ms, %.1f marches per point "
	       "(target: <= 10 ms)\n", 1e3 * t[10], 1e3 * t[0], 1e3 * t[20],
	       marches / 21.0);
	ow_solver_destroy(sv);
}

static double bench_map(const struct ow_study *s, int jobs, int steps)
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
	printf("demo map %dx%d, %d thread(s): %.2f s, %.0f points/s\n", steps,
	       steps, jobs, dt, g->solves / dt);
	ow_grid_destroy(g);
	return dt;
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
	const char *path = argc > 1 ? argv[1] : "demo/study-si.json";
	const char *readings = argc > 2 ? argv[2]
					: "demo/line/line3-readings.csv";
	struct ow_units *u = NULL;
	struct ow_study *s = calloc(1, sizeof *s);
	struct ow_diag d = {{0}};
	struct rusage ru;
	double t1, t2;

	if (!s || ow_units_create(&u, &d) != OW_OK ||
	    ow_config_load_study(u, path, s, &d) != OW_OK) {
		fprintf(stderr, "bench: %s\n", d.msg);
		return 1;
	}
	bench_point(s);
	t1 = bench_map(s, 1, 41);
	t2 = bench_map(s, 2, 41);
	if (t1 > 0.0 && t2 > 0.0)
		printf("speed-up 1 -> 2 threads: %.2fx (target: >= 1.8x); "
		       "41x41 on 2 threads: %.1f s (target: <= 10 s)\n",
		       t1 / t2, t2);
	bench_calib(u, s, readings);
	getrusage(RUSAGE_SELF, &ru);
	printf("peak memory: %.1f MB\n", ru.ru_maxrss / 1024.0);
	free(s);
	ow_units_destroy(u);
	return 0;
}
