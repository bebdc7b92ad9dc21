/* test_die.c - die characteristics and the screw-die operating point.
 *
 * Check values were recomputed in double precision from the published
 * formulas named beside each check. */
#include "testutil.h"

#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_roots.h>

#include "ow_die.h"
#include "ow_melt.h"

#define PI   OW_PI
#define T200 473.15 /* 200 degC */
#define RHO  1000.0 /* melt density of the test resins: m3/s = t/s */

static struct ow_material power_law(double m, double n)
{
	return ow_test_power_law_melt(m, n, RHO);
}

/* Carreau-Yasuda with an Arrhenius shift (parameters chosen for the
 * checks, of the order of a pipe-grade polyethylene). */
static struct ow_material carreau(void)
{
	struct ow_material r = power_law(1.0, 0.4);

	r.visc.model = OW_VISC_CARREAU_YASUDA;
	r.visc.zero_shear_Pa_s = 9000.0;
	r.visc.time_constant_s = 0.8;
	r.visc.a = 0.7;
	r.visc.ref_temp_K = 463.15;
	r.visc.activation_J_mol = 28e3;
	return r;
}

static struct ow_die circle(double d_m, double len_m)
{
	struct ow_die d;

	memset(&d, 0, sizeof d);
	d.type = OW_DIE_CIRCLE;
	d.diameter_m = d_m;
	d.length_m = len_m;
	return d;
}

static double die_dp(const struct ow_die *die, const struct ow_material *m,
                     double q_m3_s, double temp_K)
{
	double dp = NAN;
	struct ow_diag d = {""};

	if (ow_die_pressure(die, m, q_m3_s * RHO, temp_K, &dp, &d) != OW_OK)
		fail_msg("ow_die_pressure: %s", d.msg);
	return dp;
}

/* ---- formulas ----------------------------------------------------------- */

/* Hagen-Poiseuille and plane Poiseuille (Bird, Stewart & Lightfoot,
 * Transport Phenomena, 2nd ed. 2002, ch. 2): R = 2.5 mm, L = 20 mm,
 * mu = 1000 Pa s, dp = 10 MPa -> 7.66990e-6 m3/s; slit W = 0.2 m,
 * h = 1.5 mm -> 2.8125e-5 m3/s; exact annulus over the slit approximation
 * (BSL section 2.4): kappa 0.5, 0.8, 0.9, 0.95 -> 1.00787, 1.00083, 1.00018,
 * 1.00004 (all recomputed). */
static void newtonian_formulas_match_check_values(void **state)
{
	static const double ann[][2] = {
	    {0.5, 1.00787}, {0.8, 1.00083}, {0.9, 1.00018}, {0.95, 1.00004}};
	(void)state;
	assert_rel(ow_die_newtonian_flow_circle(2.5e-3, 0.02, 1000, 1e7),
	           7.66990e-6, 1e-5);
	assert_rel(ow_die_newtonian_flow_slit(0.2, 1.5e-3, 0.02, 1000, 1e7, 0),
	           2.8125e-5, 1e-12);
	for (int i = 0; i < 4; i++)
		assert_abs(ow_die_annulus_factor(ann[i][0]), ann[i][1], 6e-6);
	/* an annulus with a vanishing core is the tube */
	assert_rel(ow_die_newtonian_flow_annulus(2.5e-3, 0.0, 0.02, 1000, 1e7),
	           7.66990e-6, 1e-5);
}

/* Power-law tube and slit (Bird, Armstrong & Hassager, Dynamics of
 * Polymeric Liquids vol. 1, 2nd ed. 1987, ch. 4): n = 0.5, m = 1e4 Pa s^n,
 * same pipe and dp -> 3.83495e-5 m3/s; slit -> 7.91016e-5 m3/s
 * (recomputed); inverting through the die gives back 10 MPa. */
static void powerlaw_formulas_match_and_invert(void **state)
{
	struct ow_material m = power_law(1e4, 0.5);
	struct ow_die d = circle(5e-3, 0.02);

	(void)state;
	assert_rel(ow_die_powerlaw_flow_circle(2.5e-3, 0.02, 1e4, 0.5, 1e7),
	           3.83495e-5, 1e-5);
	assert_rel(ow_die_powerlaw_flow_slit(0.2, 1.5e-3, 0.02, 1e4, 0.5, 1e7),
	           7.91016e-5, 1e-5);
	assert_rel(die_dp(&d, &m, 3.83495e-5, T200), 1e7, 1e-5);
	d.type = OW_DIE_SLIT;
	d.width_m = 0.2;
	d.gap_m = 1.5e-3;
	/* wide slit formula with the flow over F_p(h/W), Rowell & Finlayson
	 * (1922) finite-width factor */
	assert_rel(
	    die_dp(&d, &m, 7.91016e-5 * ow_melt_shape_fp(1.5e-3 / 0.2), T200),
	    1e7, 1e-5);
}

/* The die pressure of a Newtonian melt is exact for every shape: tube,
 * slit with the finite-width factor (either way round), and the annulus at
 * small and large radius ratios (BSL 2002 ch. 2). */
static void newtonian_die_pressure_is_exact(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_die d = circle(5e-3, 0.02);
	double kap[] = {0.3, 0.8}, q;

	(void)state;
	assert_rel(die_dp(&d, &m, 7.66990e-6, T200), 1e7, 1e-5);
	d.type = OW_DIE_SLIT;
	d.width_m = 0.05;
	d.gap_m = 2e-3;
	q = ow_die_newtonian_flow_slit(0.05, 2e-3, 0.02, 1000, 1e7, 1);
	assert_rel(die_dp(&d, &m, q, T200), 1e7, 1e-12);
	d.width_m = 2e-3; /* width and gap swapped */
	d.gap_m = 0.05;
	assert_rel(die_dp(&d, &m, q, T200), 1e7, 1e-12);
	d.type = OW_DIE_ANNULUS;
	for (int i = 0; i < 2; i++) {
		d.outer_diameter_m = 0.02;
		d.inner_diameter_m = 0.02 * kap[i];
		q = ow_die_newtonian_flow_annulus(0.01, 0.01 * kap[i], 0.02,
		                                  1000, 1e7);
		assert_rel(die_dp(&d, &m, q, T200), 1e7, 1e-10);
	}
}

/* ---- generalised Newtonian evaluation --------------------------------- */

/* Rao & Schumacher, Design Formulas for Plastics Engineers (Hanser),
 * eq. 1.32 worked example for an LDPE: eta = K exp(-beta T) gdot^(n-1),
 * K = 135990 N s^n/m^2, beta = 0.00863 1/degC, n = 0.3286, T = 200 degC,
 * gdot = 500 1/s -> 373.1 Pa s (printed). Our models have no exp(-beta T)
 * shift, so the resin is a power law at 200 degC with m = K exp(-beta 200);
 * a tube die run at a true wall shear rate of 500 1/s must then need
 * dp = (2L/R) 373.1 Pa s * 500 1/s. */
static void die_wall_viscosity_matches_rao_ldpe_example(void **state)
{
	double n = 0.3286, m0 = 135990.0 * exp(-0.00863 * 200.0);
	double eta = m0 * pow(500.0, n - 1.0), r = 2.5e-3, len = 0.02, g;
	struct ow_material m = power_law(m0, n);
	struct ow_die d = circle(2.0 * r, len);
	double q = 500.0 * PI * r * r * r * n / (3.0 * n + 1.0);

	(void)state;
	assert_abs(eta, 373.1, 0.05);
	assert_rel(ow_viscosity_eval(&m.visc, 500.0, T200), eta, 1e-12);
	assert_int_equal(
	    ow_die_wall_shear_rate(&d, &m, q * RHO, T200, &g, NULL), OW_OK);
	assert_rel(g, 500.0, 1e-9);
	assert_rel(die_dp(&d, &m, q, T200), 2.0 * len / r * 373.1 * 500.0,
	           2e-4);
}

/* For a Carreau-Yasuda resin the wall state is self-consistent: the true
 * wall rate is the Rabinowitsch value at the local index there (Bird,
 * Armstrong & Hassager 1987, ch. 4), and the wall stress gives dp. */
static void die_wall_state_is_self_consistent(void **state)
{
	struct ow_material m = carreau();
	struct ow_die d = circle(5e-3, 0.02);
	double r = 2.5e-3;

	(void)state;
	for (double q = 1e-8; q < 1e-4; q *= 10.0) {
		double g, dp = die_dp(&d, &m, q, T200), n;

		ow_die_wall_shear_rate(&d, &m, q * RHO, T200, &g, NULL);
		n = ow_melt_local_index(&m.visc, g, T200);
		assert_rel(
		    g, (3.0 * n + 1.0) / (4.0 * n) * 4.0 * q / (PI * r * r * r),
		    1e-8);
		assert_rel(dp,
		           2.0 * 0.02 * ow_viscosity_eval(&m.visc, g, T200) *
		               g / r,
		           1e-12);
	}
}

struct wr {
	const struct ow_viscosity *v;
	double temp_K;
};

/* gdot with eta(gdot) gdot = tau (bisection in ln gdot) */
static double rate_for_stress(const struct wr *w, double tau)
{
	double lo = log(1e-12), hi = log(1e9);

	for (int i = 0; i < 200; i++) {
		double mid = 0.5 * (lo + hi), g = exp(mid);

		if (ow_viscosity_eval(w->v, g, w->temp_K) * g < tau)
			lo = mid;
		else
			hi = mid;
	}
	return exp(0.5 * (lo + hi));
}

static double wr_integrand(double tau, void *p)
{
	return tau * tau * rate_for_stress(p, tau);
}

/* Against the exact tube flow of any generalised Newtonian fluid,
 * Q = (pi R^3/tau_w^3) int_0^tau_w tau^2 gdot(tau) dtau (Weissenberg-
 * Rabinowitsch; Bird, Armstrong & Hassager 1987, ch. 4), integrated by GSL:
 * the local-index evaluation is within 2.5 % for a Carreau-Yasuda resin
 * (it is exact only for a power law). */
static void die_flow_is_close_to_exact_generalised_newtonian_tube(void **st)
{
	struct ow_material m = carreau();
	struct ow_die d = circle(5e-3, 0.02);
	struct wr w = {&m.visc, T200};
	gsl_integration_workspace *ws = gsl_integration_workspace_alloc(1000);
	gsl_function f = {wr_integrand, &w};
	double r = 2.5e-3;

	(void)st;
	gsl_set_error_handler_off();
	for (double q = 1e-8; q < 1e-4; q *= 10.0) {
		double tw = die_dp(&d, &m, q, T200) * r / (2.0 * 0.02), val,
		       err;

		gsl_integration_qags(&f, 0.0, tw, 0.0, 1e-10, 1000, ws, &val,
		                     &err);
		assert_rel(PI * r * r * r / (tw * tw * tw) * val, q, 0.025);
	}
	gsl_integration_workspace_free(ws);
}

/* ---- measured die ------------------------------------------------------ */

static struct ow_die measured(double dp, double q, double temp_K)
{
	struct ow_die d;

	memset(&d, 0, sizeof d);
	d.type = OW_DIE_MEASURED;
	d.pressure_Pa = dp;
	d.output_kg_s = q * RHO;
	d.temp_K = temp_K;
	return d;
}

/* A measured die returns its measured pressure at its measured point, and
 * for a power-law resin scales as (Q/Q_m)^n (aT/aT_m)^n whatever the
 * equivalent capillary (the power-law die law, Bird, Armstrong & Hassager
 * 1987 ch. 4, with the shift aT of Dealy & Wissbrun, Melt Rheology, 1990). */
static void measured_die_scales_with_the_rheology(void **state)
{
	struct ow_material cy = carreau(), pl = power_law(2e4, 0.41);
	struct ow_die d = measured(12e6, 2e-5, 483.15);
	double at, atm;

	(void)state;
	assert_rel(die_dp(&d, &cy, 2e-5, 483.15), 12e6, 1e-12);
	d.diameter_m = 4e-3; /* with a given capillary diameter */
	assert_rel(die_dp(&d, &cy, 2e-5, 483.15), 12e6, 1e-12);
	pl.visc.activation_J_mol = 28e3;
	at = ow_viscosity_shift(&pl.visc, 503.15);
	atm = ow_viscosity_shift(&pl.visc, 483.15);
	for (int k = 0; k < 2; k++) {
		d.diameter_m = k ? 4e-3 : 0.0;
		assert_rel(die_dp(&d, &pl, 3e-5, 503.15),
		           12e6 * pow(1.5 * at / atm, 0.41), 1e-9);
	}
	/* rising flow needs more pressure, a hotter melt less */
	assert_true(die_dp(&d, &cy, 3e-5, 483.15) > 12e6);
	assert_true(die_dp(&d, &cy, 2e-5, 503.15) < 12e6);
}

/* ---- operating points -------------------------------------------------- */

struct match {
	struct ow_melt_ws *ws;
	struct ow_melt_cond c;
	const struct ow_die *die;
	double length_m; /* down-channel length of the metering section */
};

/* screw pressure rise minus die pressure drop at flow q */
static double mismatch(double q, void *p)
{
	struct match *mt = p;
	struct ow_melt_out o;

	mt->c.vol_flow_m3_s = q;
	if (ow_melt_step(mt->ws, &mt->c, 0.0, &o, NULL) != OW_OK)
		return NAN;
	return o.dpdz_Pa_m * mt->length_m - die_dp(mt->die, mt->c.mat, q, T200);
}

/* Brent's method (GSL) on [0, q_hi]; returns the matched flow. */
static double operating_flow(struct match *mt, double q_hi)
{
	gsl_root_fsolver *s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
	gsl_function f = {mismatch, mt};
	double q = 0.0;

	gsl_set_error_handler_off();
	gsl_root_fsolver_set(s, &f, 0.0, q_hi);
	for (int i = 0; i < 200; i++) {
		double lo, hi;

		gsl_root_fsolver_iterate(s);
		q = gsl_root_fsolver_root(s);
		lo = gsl_root_fsolver_x_lower(s);
		hi = gsl_root_fsolver_x_upper(s);
		if (gsl_root_test_interval(lo, hi, 0.0, 1e-13) == GSL_SUCCESS)
			break;
	}
	gsl_root_fsolver_free(s);
	return q;
}

/* Metering example (D = L_s = 63.5 mm, e = 6.35 mm, H = 3.175 mm, 8 D, 60
 * rpm, mu = 1000 Pa s; inputs chosen for the check) with a rod die R =
 * 2.5 mm, L = 20 mm: dP_op = mu Q_d/(K + B) = 1.8615e7 Pa, Q_op =
 * 1.42774e-5 m3/s, die wall shear rate 1163 1/s (Tadmor & Klein 1970
 * ch. 7 screw characteristic with shape factors; recomputed). */
static void operating_point_of_newtonian_screw_and_rod_die(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_die die = circle(5e-3, 0.02);
	double phi = atan(1.0 / PI), vb = PI * 0.0635, q, g;
	struct match mt;

	(void)state;
	memset(&mt, 0, sizeof mt);
	assert_int_equal(ow_melt_create(41, 20, &mt.ws, NULL), OW_OK);
	ow_melt_reset(mt.ws, T200);
	mt.c.mat = &m;
	mt.c.depth_m = 0.003175;
	mt.c.width_m = 0.0635 * cos(phi) - 0.00635;
	mt.c.vbz_m_s = vb * cos(phi);
	mt.c.vbx_m_s = vb * sin(phi);
	mt.c.vb_m_s = vb;
	mt.c.barrel_K = T200;
	mt.c.root_adiabatic = 1;
	mt.die = &die;
	mt.length_m = 8.0 * 0.0635 / sin(phi);
	q = operating_flow(&mt, 1.582355e-5);
	assert_rel(q, 1.42774e-5, 1e-4);
	assert_rel(die_dp(&die, &m, q, T200), 1.8615e7, 1e-4);
	ow_die_wall_shear_rate(&die, &m, q * RHO, T200, &g, NULL);
	assert_rel(g, 1163.0, 1e-3);
	ow_melt_destroy(mt.ws);
}

/* Groover's simplified extruder (F_d = F_p = 1, channel width pi D sin A,
 * no leakage): Q_d = pi^2 D^2 N d_c sin A cos A / 2, back flow
 * pi D d_c^3 sin^2 A p/(12 eta L), die K_s = pi D_d^4/(128 eta L_d)
 * (Groover, Fundamentals of Modern Manufacturing, Wiley, chapter on
 * shaping processes for plastics). Rows: D, N (rev/s), d_c, A (deg), L,
 * eta, die D_d, L_d, Q_max, p_max, operating p, Q. First row: the worked
 * example, inputs from memory, results recomputed; second row: an
 * end-of-chapter problem statement, results recomputed. */
static const double groover[][12] = {
    {0.075, 1.0, 0.006, 20.0, 1.9, 100.0, 0.0065, 0.020, 5.3528e-5, 20.50e6,
     2.1833e6, 4.7827e-5},
    {0.120, 1.0, 0.0065, 17.0, 2.8, 200.0, 0.0035, 0.0125, 1.29145e-4, 98.06e6,
     46.29e6, 6.81891e-5},
};

static void operating_points_of_groover_examples(void **state)
{
	(void)state;
	for (int i = 0; i < 2; i++) {
		const double *g = groover[i];
		struct ow_material m = power_law(g[5], 1.0);
		struct ow_die die = circle(g[6], g[7]);
		double A = g[3] * PI / 180.0, vb = PI * g[0] * g[1], q;
		struct ow_melt_out o;
		struct match mt;

		memset(&mt, 0, sizeof mt);
		assert_int_equal(ow_melt_create(41, 20, &mt.ws, NULL), OW_OK);
		ow_melt_reset(mt.ws, T200);
		mt.c.mat = &m;
		mt.c.depth_m = g[2];
		mt.c.width_m = PI * g[0] * sin(A);
		mt.c.infinite_width = 1;
		mt.c.vbz_m_s = vb * cos(A);
		mt.c.vbx_m_s = vb * sin(A);
		mt.c.vb_m_s = vb;
		mt.c.barrel_K = T200;
		mt.c.root_adiabatic = 1;
		mt.die = &die;
		mt.length_m = g[4] / sin(A);
		mt.c.vol_flow_m3_s = 0.0; /* closed discharge: p_max */
		assert_int_equal(ow_melt_step(mt.ws, &mt.c, 0.0, &o, NULL),
		                 OW_OK);
		assert_rel(o.dpdz_Pa_m * mt.length_m, g[9], 1e-3);
		mt.c.vol_flow_m3_s = g[8]; /* open discharge: Q_max */
		assert_int_equal(ow_melt_step(mt.ws, &mt.c, 0.0, &o, NULL),
		                 OW_OK);
		assert_abs(o.dpdz_Pa_m * mt.length_m, 0.0, 1e-3 * g[9]);
		q = operating_flow(&mt, g[8]);
		assert_rel(q, g[11], 1e-3);
		assert_rel(die_dp(&die, &m, q, T200), g[10], 1e-3);
		ow_melt_destroy(mt.ws);
	}
}

/* Groover worked example at a head pressure of 7 MPa: Q_x = Q_d - Q_b =
 * 5.3528e-5 - 1.8278e-5 = 3.5250e-5 m3/s (textbook prints 35.25e-6;
 * inputs from memory, recomputed). */
static void groover_screw_characteristic_at_seven_megapascal(void **state)
{
	const double *g = groover[0];
	struct ow_material m = power_law(g[5], 1.0);
	double A = g[3] * PI / 180.0, vb = PI * g[0] * g[1];
	struct ow_melt_ws *ws = NULL;
	struct ow_melt_cond c;
	struct ow_melt_out o;

	(void)state;
	assert_int_equal(ow_melt_create(41, 20, &ws, NULL), OW_OK);
	ow_melt_reset(ws, T200);
	memset(&c, 0, sizeof c);
	c.mat = &m;
	c.depth_m = g[2];
	c.width_m = PI * g[0] * sin(A);
	c.infinite_width = 1;
	c.vbz_m_s = vb * cos(A);
	c.vb_m_s = vb;
	c.barrel_K = T200;
	c.root_adiabatic = 1;
	c.vol_flow_m3_s = 3.5250e-5;
	assert_int_equal(ow_melt_step(ws, &c, 0.0, &o, NULL), OW_OK);
	assert_rel(o.dpdz_Pa_m * g[4] / sin(A), 7e6, 1e-3);
	ow_melt_destroy(ws);
}

/* ---- inputs ------------------------------------------------------------ */

static void bad_dies_are_rejected_and_flow_sign_is_kept(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_die d = circle(5e-3, 0.02);
	struct ow_diag diag = {""};
	double dp = 1.0;

	(void)state;
	assert_int_equal(ow_die_pressure(&d, &m, 0.0, T200, &dp, NULL), OW_OK);
	assert_abs(dp, 0.0, 0.0);
	assert_rel(die_dp(&d, &m, -7.66990e-6, T200), -1e7, 1e-5);
	d.type = OW_DIE_ANNULUS;
	d.outer_diameter_m = 0.02;
	d.inner_diameter_m = 0.03;
	assert_int_equal(ow_die_pressure(&d, &m, 1e-3, T200, &dp, &diag),
	                 OW_EINPUT);
	assert_non_null(strstr(diag.msg, "inner_diameter"));
	d = circle(5e-3, 0.0);
	assert_int_equal(ow_die_check(&d, NULL), OW_EINPUT);
	d = measured(0.0, 1e-5, T200);
	assert_int_equal(ow_die_check(&d, NULL), OW_EINPUT);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(newtonian_formulas_match_check_values),
	    cmocka_unit_test(powerlaw_formulas_match_and_invert),
	    cmocka_unit_test(newtonian_die_pressure_is_exact),
	    cmocka_unit_test(die_wall_viscosity_matches_rao_ldpe_example),
	    cmocka_unit_test(die_wall_state_is_self_consistent),
	    cmocka_unit_test(
	        die_flow_is_close_to_exact_generalised_newtonian_tube),
	    cmocka_unit_test(measured_die_scales_with_the_rheology),
	    cmocka_unit_test(operating_point_of_newtonian_screw_and_rod_die),
	    cmocka_unit_test(operating_points_of_groover_examples),
	    cmocka_unit_test(groover_screw_characteristic_at_seven_megapascal),
	    cmocka_unit_test(bad_dies_are_rejected_and_flow_sign_is_kept),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
