/* test_delay.c - the delay zone ahead of melting: the plug's heating
 * against an independent finite-difference solution of the heat equation
 * (tridiagonal solves by GSL), the melt film against Neumann's exact
 * solution of melting (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd
 * ed. 1959, section 11.2), and the hand-over to the melting stage. */
#include "testutil.h"

#include <stdlib.h>
#include <string.h>

#include <gsl/gsl_linalg.h>
#include <gsl/gsl_vector.h>

#include "ow_delay.h"

#define C2K(c) ((c) + 273.15)

/* Solid data of a pipe-grade HDPE (the demo resin's values, typical of the
 * family; from memory), a Newtonian film melt. */
static struct ow_material hdpe(void)
{
	struct ow_material m;

	memset(&m, 0, sizeof m);
	m.solid_density_kg_m3 = 950.0;
	m.bulk_density_kg_m3 = 560.0;
	m.melt_density_kg_m3 = 760.0;
	m.solid_cp_J_kgK = 2300.0;
	m.melt_cp_J_kgK = 2700.0;
	m.solid_k_W_mK = 0.40;
	m.melt_k_W_mK = 0.27;
	m.melt_temp_K = C2K(130.0);
	m.fusion_J_kg = 200e3;
	m.visc.model = OW_VISC_POWER_LAW;
	m.visc.consistency_Pa_sn = 1000.0;
	m.visc.index = 1.0;
	m.visc.ref_temp_K = C2K(200.0);
	m.visc.shift = OW_SHIFT_ARRHENIUS;
	return m;
}

/* Reference: the heat equation rho c T_t = k T_yy on [0, L] (L many
 * penetration depths: semi-infinite), T = T_0 at t = 0, backward Euler on
 * a uniform grid, finite volumes (half cell at the surface); at y = 0
 * either T = T_c (h = 0) or -k T_y = h (T_c - T). The wall T_c(t) is
 * given by wall(). Returns the heat taken up, J/m^2; T[] gets the
 * profile on n nodes of spacing *dy. */
struct fd_run {
	const struct ow_material *m;
	double t0_K, h, t_end, L;
	double (*wall)(double t);
	int n, steps;
};

static double fd_solve(const struct fd_run *r, double *T, double *dy_out)
{
	int n = r->n, i, s;
	double rc = r->m->solid_density_kg_m3 * r->m->solid_cp_J_kgK;
	double k = r->m->solid_k_W_mK, dy = r->L / (n - 1);
	double dt = r->t_end / r->steps, heat = 0.0;
	gsl_vector *diag = gsl_vector_alloc((size_t)n);
	gsl_vector *up = gsl_vector_alloc((size_t)n - 1);
	gsl_vector *lo = gsl_vector_alloc((size_t)n - 1);
	gsl_vector *rhs = gsl_vector_alloc((size_t)n);
	gsl_vector *x = gsl_vector_alloc((size_t)n);

	for (i = 0; i < n; i++)
		T[i] = r->t0_K;
	for (s = 1; s <= r->steps; s++) {
		double tc = r->wall(s * dt), a = k * dt / (dy * dy);

		for (i = 0; i < n; i++) {
			double cap = (i == 0 || i == n - 1) ? 0.5 : 1.0;

			gsl_vector_set(
			    diag, (size_t)i,
			    cap + a * (i == 0 || i == n - 1 ? 1.0 : 2.0) / rc);
			gsl_vector_set(rhs, (size_t)i, cap * T[i]);
			if (i < n - 1) {
				gsl_vector_set(up, (size_t)i, -a / rc);
				gsl_vector_set(lo, (size_t)i, -a / rc);
			}
		}
		if (r->h > 0.0) { /* Robin: h (T_c - T_0) into the half cell */
			double b = r->h * dt / (rc * dy);

			gsl_vector_set(diag, 0, gsl_vector_get(diag, 0) + b);
			gsl_vector_set(rhs, 0, gsl_vector_get(rhs, 0) + b * tc);
		} else { /* Dirichlet */
			gsl_vector_set(diag, 0, 1.0);
			gsl_vector_set(up, 0, 0.0);
			gsl_vector_set(rhs, 0, tc);
		}
		gsl_linalg_solve_tridiag(diag, up, lo, rhs, x);
		for (i = 0; i < n; i++)
			T[i] = gsl_vector_get(x, (size_t)i);
	}
	for (i = 0; i < n; i++) /* heat held: finite volumes */
		heat += rc * (T[i] - r->t0_K) * dy *
		        (i == 0 || i == n - 1 ? 0.5 : 1.0);
	gsl_vector_free(diag);
	gsl_vector_free(up);
	gsl_vector_free(lo);
	gsl_vector_free(rhs);
	gsl_vector_free(x);
	*dy_out = dy;
	return heat;
}

/* A wall at 120 degC (below the melting point), stepping to 125 degC
 * after 20 s. */
static double wall_two_steps(double t)
{
	return t <= 20.0 ? C2K(120.0) : C2K(125.0);
}

/* Advance the plug in equal steps of dt up to t_end under wall(t) (taken
 * at each step's end, as the march does). */
static void run_plug(struct ow_delay *z, const struct fd_run *r, double h,
                     int steps)
{
	struct ow_delay_out o;
	double dt = r->t_end / steps;
	int s;

	for (s = 0; s < steps; s++)
		assert_int_equal(ow_delay_advance(z, r->wall((s + 1) * dt), h,
		                                  0.2, 1e-3, dt, &o, NULL),
		                 OW_OK);
}

/* Under an ideal wall the plug is a semi-infinite solid whose surface
 * steps to the wall temperature: T = T_0 + sum dT_k erfc(y / (2 sqrt(alpha
 * (t - t_k)))) (Carslaw & Jaeger section 2.4). Checked against the
 * finite-difference solution of the heat equation at several depths and
 * in its heat content, over two wall steps. */
static void plug_follows_the_erfc_solution_of_a_wall_step(void **st)
{
	struct ow_material m = hdpe();
	struct fd_run r = {&m,    C2K(25.0),      0.0,  40.0,
	                   0.012, wall_two_steps, 1201, 8000};
	double *T = malloc(sizeof *T * (size_t)r.n), dy, heat;
	double y[] = {0.0, 0.5e-3, 1e-3, 2e-3, 3e-3};
	struct ow_delay z;
	size_t i;
	(void)st;
	assert_non_null(T);
	heat = fd_solve(&r, T, &dy);
	ow_delay_start(&z, &m, r.t0_K);
	run_plug(&z, &r, 0.0, 40);
	for (i = 0; i < sizeof y / sizeof y[0]; i++)
		assert_abs(ow_delay_temp(&z, y[i]), T[(int)(y[i] / dy + 0.5)],
		           0.01);
	assert_abs(ow_delay_surface(&z), C2K(125.0), 1e-9);
	assert_rel(ow_delay_solid_heat(&z), heat, 2e-3);
	free(T);
}

/* Through a wall coefficient h the surface rises as T_0 + (T_c - T_0)
 * [1 - exp(beta^2) erfc(beta)], beta = h sqrt(alpha t)/k (Carslaw & Jaeger
 * section 2.7): checked against the finite-difference solution with the
 * same surface condition, surface, interior and heat content. */
static void plug_surface_rises_through_a_wall_coefficient(void **st)
{
	struct ow_material m = hdpe();
	struct fd_run r = {&m,    C2K(25.0),      500.0, 40.0,
	                   0.012, wall_two_steps, 1201,  8000};
	double *T = malloc(sizeof *T * (size_t)r.n), dy, heat;
	struct ow_delay z;
	(void)st;
	assert_non_null(T);
	heat = fd_solve(&r, T, &dy);
	ow_delay_start(&z, &m, r.t0_K);
	run_plug(&z, &r, 500.0, 40);
	assert_abs(ow_delay_surface(&z), T[0], 0.01);
	assert_true(ow_delay_surface(&z) < C2K(120.0)); /* not the wall's */
	assert_abs(ow_delay_temp(&z, 1e-3), T[(int)(1e-3 / dy + 0.5)], 0.01);
	assert_rel(ow_delay_solid_heat(&z), heat, 2e-3);
	free(T);
}

/* Neumann's one-phase melting (Carslaw & Jaeger section 11.2): a solid at
 * its melting point under a wall at T_m + dT melts to s = 2 lam sqrt(alpha_m
 * t) with lam exp(lam^2) erf(lam) = St / sqrt(pi), St = c_m dT / lambda.
 * With no viscous heating and no subcooling the film is exact to first
 * order in St; at St = 0.27 the second-order rest is below 0.5 %. */
static double neumann_lambda(double stefan)
{
	double lo = 0.0, hi = 2.0;
	int it;

	for (it = 0; it < 200; it++) {
		double mid = 0.5 * (lo + hi);

		if (mid * exp(mid * mid) * erf(mid) < stefan / sqrt(OW_PI))
			lo = mid;
		else
			hi = mid;
	}
	return 0.5 * (lo + hi);
}

static void film_grows_as_neumann_melting(void **st)
{
	struct ow_material m = hdpe();
	double dT = 20.0, stefan, lam, am, t = 0.0;
	struct ow_delay z;
	struct ow_delay_out o;
	int s;
	(void)st;
	m.melt_density_kg_m3 = m.solid_density_kg_m3; /* Neumann: one density */
	stefan = m.melt_cp_J_kgK * dT / m.fusion_J_kg;
	lam = neumann_lambda(stefan);
	am = m.melt_k_W_mK / (m.melt_density_kg_m3 * m.melt_cp_J_kgK);
	ow_delay_start(&z, &m, m.melt_temp_K); /* no subcooling */
	for (s = 0; s < 50; s++) {
		assert_int_equal(ow_delay_advance(&z, m.melt_temp_K + dT, 0.0,
		                                  0.0, 1.0, 0.1, &o, NULL),
		                 OW_OK);
		t += 0.1;
		assert_true(o.done_s < 0.0);
	}
	assert_rel(z.film_m, 2.0 * lam * sqrt(am * t), 5e-3);
}

/* The film reaching the flight clearance ends the delay zone within the
 * step; a hotter wall gets there sooner, and a plug already warm sooner
 * still (less heat drawn into the solid). */
static double time_to_clearance(double wall_K, double feed_K)
{
	struct ow_material m = hdpe();
	struct ow_delay z;
	struct ow_delay_out o;
	double t = 0.0;
	int s;

	ow_delay_start(&z, &m, feed_K);
	for (s = 0; s < 10000; s++) {
		assert_int_equal(ow_delay_advance(&z, wall_K, 0.0, 0.2, 0.3e-3,
		                                  0.01, &o, NULL),
		                 OW_OK);
		if (o.done_s >= 0.0)
			return t + o.done_s;
		t += 0.01;
	}
	fail_msg("the film never reached the clearance");
	return NAN;
}

static void film_reaches_the_clearance_sooner_when_hotter(void **st)
{
	double base = time_to_clearance(C2K(175.0), C2K(25.0));
	(void)st;
	assert_true(base > 0.0);
	assert_true(time_to_clearance(C2K(195.0), C2K(25.0)) < base);
	assert_true(time_to_clearance(C2K(175.0), C2K(60.0)) < base);
}

/* A plug from 25 degC under an ideal wall at 175 degC, 0.2 m/s slip, until
 * its film reaches a 0.3 mm clearance: returns the heat that went in,
 * J/m^2, and the film's dissipation in *diss. */
static double melt_to_the_clearance(const struct ow_material *m,
                                    struct ow_delay *z, double *diss)
{
	struct ow_delay_out o;
	double in = 0.0;
	int s;

	*diss = 0.0;
	ow_delay_start(z, m, C2K(25.0));
	for (s = 0; s < 400; s++) {
		assert_int_equal(ow_delay_advance(z, C2K(175.0), 0.0, 0.2,
		                                  0.3e-3, 0.005, &o, NULL),
		                 OW_OK);
		in += o.heat_J_m2;
		*diss += o.dissip_J_m2;
		if (o.done_s >= 0.0)
			break;
	}
	assert_true(o.done_s >= 0.0);
	return in;
}

/* Heat held per unit area by the plug handed over: film melt share f at
 * melt_K, the solid at bed_K, enthalpy from T_0 (c_s below T_m, lambda,
 * c_m above). */
static double held_heat(const struct ow_material *m, double H, double f,
                        double bed_K, double melt_K)
{
	return m->solid_density_kg_m3 * H *
	       (f * (m->solid_cp_J_kgK * (m->melt_temp_K - C2K(25.0)) +
	             m->fusion_J_kg +
	             m->melt_cp_J_kgK * (melt_K - m->melt_temp_K)) +
	        (1.0 - f) * m->solid_cp_J_kgK * (bed_K - C2K(25.0)));
}

/* The plug handed to melting keeps the heat it took up: film mass at the
 * film's mean temperature plus the solid at its mean temperature hold
 * exactly the heat conducted in and the latent heat of the film. */
static void hand_over_keeps_the_heat(void **st)
{
	struct ow_material m = hdpe();
	struct ow_delay z;
	double in, diss, H = 9.5e-3, f, bed_K, melt_K;
	(void)st;
	in = melt_to_the_clearance(&m, &z, &diss);
	assert_true(diss > 0.0);
	ow_delay_bed(&z, H, in, &f, &bed_K, &melt_K);
	assert_rel(held_heat(&m, H, f, bed_K, melt_K), in, 1e-9);
	assert_true(bed_K > C2K(25.0) && bed_K < m.melt_temp_K);
}

/* A bed handed over in a channel shallower than where its heat went in
 * (a taper) can hold more heat per kg than its solid takes below T_m:
 * more of it melts (the solid stays at T_m), and past a half share the
 * melt is hotter; the heat handed over is always the heat given. */
static void hand_over_of_more_heat_than_the_solid_holds(void **st)
{
	struct ow_material m = hdpe();
	struct ow_delay z;
	double H = 4e-3, f0, f, bed_K, melt_K, cap, q, diss;
	(void)st;
	melt_to_the_clearance(&m, &z, &diss);
	f0 = m.melt_density_kg_m3 * z.film_m / (m.solid_density_kg_m3 * H);
	/* all the solid at T_m: c_s (T_m - T_0) per kg */
	cap = m.solid_density_kg_m3 * H * m.solid_cp_J_kgK *
	      (m.melt_temp_K - C2K(25.0));
	q = 1.2 * cap;
	ow_delay_bed(&z, H, q, &f, &bed_K, &melt_K);
	assert_abs(bed_K, m.melt_temp_K, 1e-9);
	assert_true(f > f0 && f < 0.5);
	assert_rel(held_heat(&m, H, f, bed_K, melt_K), q, 1e-9);
	q = 5.0 * cap;
	ow_delay_bed(&z, H, q, &f, &bed_K, &melt_K);
	assert_abs(f, 0.5, 1e-12);
	assert_true(melt_K > z.film_K);
	assert_rel(held_heat(&m, H, f, bed_K, melt_K), q, 1e-9);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(plug_follows_the_erfc_solution_of_a_wall_step),
	    cmocka_unit_test(plug_surface_rises_through_a_wall_coefficient),
	    cmocka_unit_test(film_grows_as_neumann_melting),
	    cmocka_unit_test(film_reaches_the_clearance_sooner_when_hotter),
	    cmocka_unit_test(hand_over_keeps_the_heat),
	    cmocka_unit_test(hand_over_of_more_heat_than_the_solid_holds),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
