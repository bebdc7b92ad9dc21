/* test_melt.c - melt conveying: shape factors, exact power-law channel
 * flow, leakage, the depth-resolved station solver and its energy bands.
 *
 * Check values were recomputed in double precision from the published
 * equations named beside each check; where the inputs were chosen for the
 * check (not a published data set) the comment says so. GSL quadrature
 * serves as an independent reference where a closed form is not at hand. */
#include "testutil.h"

#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>

#include "ow_melt.h"

#define PI   OW_PI
#define T200 473.15 /* 200 degC */

/* ---- fixtures ----------------------------------------------------------- */

/* A power-law resin without temperature shift (E = 0): m, n. Melt data are
 * round numbers chosen for the checks. */
static struct ow_material power_law(double m, double n)
{
	return ow_test_power_law_melt(m, n, 760.0);
}

/* A shear-thinning, temperature-sensitive resin (Carreau-Yasuda with an
 * Arrhenius shift; parameters of the demo order, chosen for the checks). */
static struct ow_material carreau(void)
{
	struct ow_material r = power_law(1.0, 0.4);

	r.melt_cp_J_kgK = 2600.0;
	r.melt_k_W_mK = 0.25;
	r.visc.model = OW_VISC_CARREAU_YASUDA;
	r.visc.zero_shear_Pa_s = 9000.0;
	r.visc.time_constant_s = 0.8;
	r.visc.a = 0.7;
	r.visc.ref_temp_K = 463.15;
	r.visc.activation_J_mol = 28e3;
	return r;
}

/* Worked metering example: D_b = L_s = 63.5 mm, e = 6.35 mm, H = 3.175 mm,
 * L = 8 D, 60 rpm (inputs chosen for the check; Tadmor & Klein 1970 ch. 7
 * kinematics: V_b = pi D N, V_bz = V_b cos phi, V_bx = V_b sin phi). */
#define EX_D 0.0635
#define EX_H 0.003175
static double ex_phi(void)
{
	return atan(1.0 / PI);
}
static double ex_width(void)
{
	return EX_D * cos(ex_phi()) - 0.00635;
}
static double ex_length(void)
{
	return 8.0 * EX_D / sin(ex_phi());
}

static struct ow_melt_cond metering(const struct ow_material *m)
{
	struct ow_melt_cond c;
	double vb = PI * EX_D;

	memset(&c, 0, sizeof c);
	c.mat = m;
	c.depth_m = EX_H;
	c.width_m = ex_width();
	c.vbz_m_s = vb * cos(ex_phi());
	c.vbx_m_s = vb * sin(ex_phi());
	c.vb_m_s = vb;
	c.barrel_K = T200;
	c.root_adiabatic = 1;
	return c;
}

/* Plane Couette cell: H = 3 mm, moving wall 0.2 m/s, no cross flow. */
static struct ow_melt_cond couette(const struct ow_material *m)
{
	struct ow_melt_cond c;

	memset(&c, 0, sizeof c);
	c.mat = m;
	c.depth_m = 0.003;
	c.width_m = 0.05;
	c.infinite_width = 1;
	c.vbz_m_s = 0.2;
	c.vb_m_s = 0.2;
	c.vol_flow_m3_s = 0.2 * 0.05 * 0.003 / 2.0; /* pure drag */
	c.barrel_K = T200;
	c.root_K = T200;
	return c;
}

static struct ow_melt_ws *workspace(int nodes, int bands, double temp_K)
{
	struct ow_melt_ws *ws = NULL;

	assert_int_equal(ow_melt_create(nodes, bands, &ws, NULL), OW_OK);
	ow_melt_reset(ws, temp_K);
	return ws;
}

static struct ow_melt_out station(struct ow_melt_ws *ws,
                                  const struct ow_melt_cond *c, double dz)
{
	struct ow_melt_out o;
	struct ow_diag d = {""};

	if (ow_melt_step(ws, c, dz, &o, &d) != OW_OK)
		fail_msg("ow_melt_step: %s", d.msg);
	return o;
}

/* ---- shape factors ----------------------------------------------------- */

/* Rowell & Finlayson (1922) series as used by Tadmor & Klein (1970) ch. 7;
 * table values recomputed with 200+ terms. */
static void shape_factors_follow_rowell_finlayson_series(void **state)
{
	/* F_d at H/W = 0.01 and 0.05: the series converged (1e5 terms);
	 * a 200-term sum still misses about 8e-5 and 1.6e-5 there (the
	 * tail of sum i^-3), as the small-h slope below confirms. */
	static const double t[][3] = {
	    {0.01, 0.99457, 0.99370}, {0.05, 0.97286, 0.96849},
	    {0.10, 0.94572, 0.93698}, {0.20, 0.89145, 0.87395},
	    {0.30, 0.83718, 0.81094}, {0.50, 0.72958, 0.68605},
	    {1.00, 0.50000, 0.42173},
	};
	(void)state;
	for (size_t i = 0; i < sizeof t / sizeof t[0]; i++) {
		assert_abs(ow_melt_shape_fd(t[i][0]), t[i][1], 6e-6);
		assert_abs(ow_melt_shape_fp(t[i][0]), t[i][2], 6e-6);
	}
	/* F_d(1) = 1/2 exactly (symmetry of the square duct) */
	assert_abs(ow_melt_shape_fd(1.0), 0.5, 1e-12);
}

/* Small-H/W slopes: 1 - F_d ~ (16/pi^3)(7/8)zeta(3) h = 0.54275 h and
 * 1 - F_p ~ (192/pi^5)(31/32)zeta(5) h = 0.630249 h (Tadmor & Klein 1970
 * series, limit recomputed); F_d is continuous where the code switches
 * between its two series at h = 1. */
static void shape_factors_tend_to_one_for_shallow_channels(void **state)
{
	double h = 1e-4;

	(void)state;
	assert_rel((1.0 - ow_melt_shape_fd(h)) / h, 0.542754, 1e-4);
	assert_rel((1.0 - ow_melt_shape_fp(h)) / h, 0.630249, 1e-5);
	assert_abs(ow_melt_shape_fd(1.0 - 1e-9), ow_melt_shape_fd(1.0 + 1e-9),
	           1e-9);
	assert_true(isnan(ow_melt_shape_fd(0.0)));
	assert_true(isnan(ow_melt_shape_fp(-1.0)));
}

/* ---- power-law drag + pressure flow --------------------------------- */

/* Exact combined drag/pressure flow of a power-law fluid (Tadmor & Klein
 * 1970 ch. 7 problem in dimensionless form; table recomputed, verified by
 * an independent shooting method): rows n, qhat at Lambda = 0, 1, 2, 4, 6,
 * and Lambda at closed discharge. */
static const double pl_table[][7] = {
    {1.00, 0.50000, 0.41667, 0.33333, 0.16667, 0.00000, 6.00000},
    {0.75, 0.50000, 0.39008, 0.29007, 0.09063, -0.16793, 4.74406},
    {0.50, 0.50000, 0.34043, 0.22646, -0.05947, -0.65250, 3.71934},
    {0.30, 0.50000, 0.25958, 0.15332, -0.50145, -3.16565, 3.02202},
};
static const double pl_lambda[5] = {0.0, 1.0, 2.0, 4.0, 6.0};

static void powerlaw_flow_matches_exact_table(void **state)
{
	double q, t0;

	(void)state;
	for (size_t i = 0; i < 4; i++) {
		double n = pl_table[i][0];

		for (int j = 0; j < 5; j++) {
			assert_int_equal(
			    ow_melt_powerlaw_qhat(n, pl_lambda[j], &q, NULL),
			    OW_OK);
			assert_abs(q, pl_table[i][1 + j], 6e-6);
			/* reflection q(-L) = 1 - q(L) (same source) */
			ow_melt_powerlaw_qhat(n, -pl_lambda[j], &q, &t0);
			assert_abs(q, 1.0 - pl_table[i][1 + j], 6e-6);
		}
		ow_melt_powerlaw_qhat(n, pl_table[i][6], &q, NULL);
		assert_abs(q, 0.0, 1e-5); /* closed discharge */
	}
	ow_melt_powerlaw_qhat(0.5, 2.0, NULL, &t0);
	assert_abs(t0, -0.18227, 6e-6);
	assert_int_equal(ow_melt_powerlaw_qhat(0.0, 1.0, &q, NULL), OW_EARG);
}

/* Newtonian limit qhat = 1/2 - Lambda/12 (Tadmor & Klein 1970 ch. 7),
 * also across the switch between closed form and quadrature near 0. */
static void powerlaw_flow_reduces_to_newtonian_line(void **state)
{
	static const double lam[] = {-3.0, -0.0499, -1e-6,  0.0,
	                             1e-6, 0.0499,  0.0501, 7.5};
	(void)state;
	for (size_t i = 0; i < sizeof lam / sizeof lam[0]; i++) {
		double q;

		ow_melt_powerlaw_qhat(1.0, lam[i], &q, NULL);
		assert_abs(q, 0.5 - lam[i] / 12.0, 1e-12);
	}
}

struct pl_par {
	double s, t0, lam, weight; /* weight: 0 wall speed, 1 flow */
};

static double pl_integrand(double xi, void *p)
{
	const struct pl_par *a = p;
	double tau = a->t0 + a->lam * xi;
	double g = tau < 0.0 ? -pow(-tau, a->s) : pow(tau, a->s);

	return a->weight > 0.0 ? (1.0 - xi) * g : g;
}

/* The closed form checked by GSL quadrature of du/dxi = sign|tau|^(1/n):
 * u(1) = 1 and qhat = int (1 - xi) du/dxi (integration by parts). */
static void powerlaw_flow_agrees_with_gsl_quadrature(void **state)
{
	gsl_integration_workspace *w = gsl_integration_workspace_alloc(1000);
	gsl_function f = {pl_integrand, NULL};
	double lam[] = {-5.0, 0.5, 2.0, 3.5};

	(void)state;
	gsl_set_error_handler_off();
	for (size_t i = 0; i < 4; i++) {
		struct pl_par p = {1.0 / 0.4, 0.0, lam[i], 0.0};
		double q, val, err;

		ow_melt_powerlaw_qhat(0.4, lam[i], &q, &p.t0);
		f.params = &p;
		gsl_integration_qags(&f, 0, 1, 1e-13, 1e-12, 1000, w, &val,
		                     &err);
		assert_abs(val, 1.0, 1e-10);
		p.weight = 1.0;
		gsl_integration_qags(&f, 0, 1, 1e-13, 1e-12, 1000, w, &val,
		                     &err);
		assert_abs(val, q, 1e-10);
	}
	gsl_integration_workspace_free(w);
}

/* ---- station solver: Newtonian metering example ----------------------- */

/* Q(dP) of the metering example with flight edges (Tadmor & Klein 1970,
 * ch. 7: Q = F_d V_bz W H/2 - F_p W H^3 dP/(12 mu Z)), recomputed: rows
 * Q (m3/s), dP over the section (Pa). */
static void station_reproduces_newtonian_screw_characteristic(void **state)
{
	static const double t[][2] = {
	    {1.540825e-5, 5e6},
	    {1.4992942e-5, 1e7},
	    {1.416233e-5, 2e7},
	    {0.0, 1.9051e8}, /* closed discharge */
	};
	struct ow_material m = power_law(1000.0, 1.0); /* mu = 1000 Pa s */
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, T200);
	struct ow_melt_out o;

	(void)state;
	c.vol_flow_m3_s = 1.582355e-5; /* Q_d: open discharge */
	o = station(ws, &c, 0.0);
	assert_abs(o.dpdz_Pa_m * ex_length(), 0.0, 1e-4 * 1e7);
	assert_abs(o.fd, 0.96818, 6e-6);
	assert_abs(o.fp, 0.96305, 6e-6);
	/* cross-channel rise 6 mu V_bx W / H^2 = 1.9505e6 Pa (same source) */
	assert_rel(o.dpdx_Pa_m * ex_width(), 1.9505e6, 1e-4);
	for (size_t i = 0; i < sizeof t / sizeof t[0]; i++) {
		c.vol_flow_m3_s = t[i][0];
		o = station(ws, &c, 0.0);
		assert_rel(o.dpdz_Pa_m * ex_length(), t[i][1], 1e-4);
	}
	ow_melt_destroy(ws);
}

/* Power identity P_w = Q dP + dissipation and the values of the example
 * with F_d = F_p = 1 at dP = 10 MPa (Tadmor & Klein 1970 ch. 7, recomputed):
 * P_w = 1614.18 W, Q dP = 154.81 W, dissipation = 1459.37 W. */
static void station_power_splits_into_flow_work_and_dissipation(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, T200);
	struct ow_melt_out o;
	double z = ex_length(), qdp;

	(void)state;
	c.infinite_width = 1;
	c.vol_flow_m3_s = 1.548111e-5;
	o = station(ws, &c, 0.0);
	qdp = c.vol_flow_m3_s * o.dpdz_Pa_m * z;
	assert_rel(o.dpdz_Pa_m * z, 1e7, 1e-4);
	assert_rel(o.power_W_m * z, 1614.18, 1e-4);
	assert_rel(qdp, 154.81, 1e-4);
	assert_rel(o.dissipation_W_m * z, 1459.37, 1e-4);
	assert_rel(o.power_W_m, o.dissipation_W_m + qdp / z, 1e-12);
	ow_melt_destroy(ws);
}

/* ---- station solver: power-law resin -------------------------------- */

/* The depth-resolved solver for a power-law resin against the exact
 * table above (201 nodes: discretisation error about 5e-5). */
static void station_reproduces_powerlaw_table(void **state)
{
	(void)state;
	for (size_t i = 1; i < 4; i++) {
		double n = pl_table[i][0], H = 0.003, V = 0.2, W = 0.05;
		struct ow_material m = power_law(1e4, n);
		struct ow_melt_cond c = couette(&m);
		struct ow_melt_ws *ws = workspace(201, 20, T200);
		double lam[] = {1.0, 2.0, 4.0, -2.0, pl_table[i][6]};

		for (int j = 0; j < 5; j++) {
			double q, got;
			struct ow_melt_out o;

			ow_melt_powerlaw_qhat(n, lam[j], &q, NULL);
			c.vol_flow_m3_s = q * W * H * V;
			o = station(ws, &c, 0.0);
			got = o.dpdz_Pa_m * pow(H, n + 1.0) / (1e4 * pow(V, n));
			assert_rel(got, lam[j], 1.5e-4);
		}
		ow_melt_destroy(ws);
	}
}

/* Identity power = dissipation + Q dP/dz holds for a shear-thinning,
 * temperature-dependent resin with cross flow and leakage (discrete
 * identity of the lubrication equations, Tadmor & Klein 1970 ch. 7). */
static void
station_power_identity_holds_with_cross_flow_and_leakage(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, 455.0);
	double q[] = {1.2e-5, 1.9e-5, 0.3e-5};

	(void)state;
	c.clearance_m = 2e-4;
	c.flight_width_m = 0.00635;
	c.leak_bypass_m = PI * EX_D * cos(ex_phi());
	c.leak_flight_len_per_z = 1.0;
	for (int i = 0; i < 3; i++) {
		struct ow_melt_out o;

		c.vol_flow_m3_s = q[i];
		o = station(ws, &c, 0.01);
		assert_rel(o.power_W_m, o.dissipation_W_m + q[i] * o.dpdz_Pa_m,
		           1e-10);
		assert_rel(o.channel_flow_m3_s, q[i] + o.leak_flow_m3_s, 1e-12);
		assert_true(o.leak_flow_m3_s > 0.0);
	}
	ow_melt_destroy(ws);
}

/* ---- GSL reference for the flight edges ------------------------------ */

struct duct {
	double W, H, V, G, mu;
};

/* cosh(k pi (x - W/2)/H) / cosh(k pi W/(2H)) without overflow */
static double edge_ratio(const struct duct *d, double k, double x)
{
	double dist = fmin(x, d->W - x), a = k * PI / d->H;

	return exp(-a * dist) * (1.0 + exp(-2.0 * a * (d->W / 2.0 - dist))) /
	       (1.0 + exp(-a * d->W));
}

/* Flow per unit width through the column at x of the rectangular channel
 * with a moving lid and a pressure gradient. The velocity by separation of
 * variables (the Rowell & Finlayson 1922 solution; Tadmor & Klein 1970
 * ch. 7) is, with r_k(x) the edge ratio above,
 *   drag     u = V y/H + sum_k (2V(-1)^k/(k pi)) sin(k pi y/H) r_k(x)
 *   pressure u = -(G/2mu)[y(H-y) - sum_{k odd} 8H^2/(k pi)^3
 *                sin(k pi y/H) r_k(x)];
 * integrated over y term by term (int sin = 2H/(k pi) for odd k, 0 for
 * even k). GSL then integrates these columns across the width. */
static double duct_column(double x, void *p)
{
	const struct duct *d = p;
	double H = d->H, qd = d->V * H / 2.0, qp = H * H * H / 6.0;

	for (int k = 1; k < 400000; k += 2) {
		double r = edge_ratio(d, (double)k, x), kp = (double)k * PI;

		qd -= 2.0 * d->V / kp * (2.0 * H / kp) * r;
		qp -= 8.0 * H * H / (kp * kp * kp) * (2.0 * H / kp) * r;
		if (r < 1e-17)
			break;
	}
	return qd - d->G / (2.0 * d->mu) * qp;
}

/* Flow through the channel cross-section, integrated across the width by
 * GSL, for the gradient the solver returned, equals the flow the solver
 * was given (an independent check of F_d, F_p and the substitution). */
static void station_flow_matches_gsl_integral_over_the_channel(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, T200);
	gsl_integration_workspace *w = gsl_integration_workspace_alloc(500);
	struct duct d = {ex_width(), EX_H, c.vbz_m_s, 0.0, 1000.0};
	gsl_function f = {duct_column, &d};
	double q[] = {1.4992942e-5, 0.8e-5}, val, err;

	(void)state;
	gsl_set_error_handler_off();
	for (int i = 0; i < 2; i++) {
		c.vol_flow_m3_s = q[i];
		d.G = station(ws, &c, 0.0).dpdz_Pa_m;
		gsl_integration_qags(&f, 0.0, d.W, 1e-15, 1e-10, 500, w, &val,
		                     &err);
		assert_rel(val, q[i], 1e-7);
	}
	gsl_integration_workspace_free(w);
	ow_melt_destroy(ws);
}

/* ---- leakage ---------------------------------------------------------- */

/* Leakage q_f = V_bx delta/2 + delta^3 dP/(12 mu e) (Tadmor & Klein 1970
 * ch. 7): vanishes with the clearance, drag part ~ delta, pressure part ~
 * delta^3; heating mu V^2 e/delta. Drag leak of the metering example over
 * pi D cos(phi): 3.652e-7 m3/s (recomputed). */
static void leakage_scales_with_the_clearance(void **state)
{
	double vbx = PI * EX_D * sin(ex_phi()), e = 0.00635, mu = 1000.0;
	double d = 6.35e-5, drag, pres;

	(void)state;
	assert_abs(ow_melt_leak_flux(vbx, 0.0, 1e7, mu, e), 0.0, 0.0);
	assert_abs(ow_melt_leak_flux(vbx, 1e-9, 1e7, mu, e), 0.0, 1e-10);
	drag = ow_melt_leak_flux(vbx, d, 0.0, mu, e);
	assert_rel(ow_melt_leak_flux(vbx, 2 * d, 0.0, mu, e), 2.0 * drag,
	           1e-14);
	pres = ow_melt_leak_flux(0.0, d, 1e7, mu, e);
	assert_rel(ow_melt_leak_flux(0.0, 2 * d, 1e7, mu, e), 8.0 * pres,
	           1e-14);
	assert_rel(ow_melt_leak_flux(vbx, d, 1e7, mu, e), drag + pres, 1e-14);
	assert_rel(drag * PI * EX_D * cos(ex_phi()), 3.652e-7, 2e-4);
	assert_rel(ow_melt_leak_heat(0.2, 2 * d, mu, e),
	           0.5 * ow_melt_leak_heat(0.2, d, mu, e), 1e-14);
	assert_abs(ow_melt_leak_heat(0.2, 0.0, mu, e), 0.0, 0.0);
}

/* In the station, the leak flow follows the same formula with the
 * pressure difference across the flight from the solved gradients, and
 * vanishes with the clearance. */
static void station_leak_flow_uses_the_solved_gradients(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, T200);
	double lb = PI * EX_D * cos(ex_phi()), mu_f;
	struct ow_melt_out o;

	(void)state;
	c.vol_flow_m3_s = 1.4e-5;
	c.flight_width_m = 0.00635;
	c.leak_bypass_m = lb;
	c.leak_flight_len_per_z = 1.0;
	c.clearance_m = 1e-4;
	o = station(ws, &c, 0.0);
	mu_f = 1000.0; /* Newtonian: any clearance shear rate */
	assert_rel(
	    o.leak_flow_m3_s,
	    lb * ow_melt_leak_flux(c.vbx_m_s, 1e-4,
	                           o.dpdx_Pa_m * c.width_m + o.dpdz_Pa_m * lb,
	                           mu_f, 0.00635),
	    1e-12);
	c.clearance_m = 1e-7;
	o = station(ws, &c, 0.0);
	assert_abs(o.leak_flow_m3_s, 0.0, 1e-3 * c.vol_flow_m3_s);
	ow_melt_destroy(ws);
}

/* Leakage with a shear-thinning, temperature-dependent melt (the
 * Carreau-Yasuda resin above): the flight clearance is sheared at
 * V_b/delta and sits between the barrel and the outer melt band, so its
 * viscosity is the resin's at that shear rate and at the mean of the two
 * temperatures. By hand, bands at 455 K under a barrel at 473.15 K:
 * T_f = 464.075 K, a_T = exp[(E/R)(1/T_f - 1/T_ref)] (Arrhenius; R =
 * 8.314462618 J/(mol K), CODATA 2018), gdot = pi D N/delta = 1994.9 1/s,
 * mu_f = a_T eta0 [1 + (lambda a_T gdot)^a]^((n-1)/a) (Carreau-Yasuda,
 * Bird, Armstrong & Hassager, Dynamics of Polymeric Liquids vol. 1, 2nd
 * ed. 1987, with time-temperature superposition); the leak flow is then
 * L_b [V_bx delta/2 + delta^3 (dP/dx W + dP/dz L_b)/(12 mu_f e)] with the
 * station's own gradients (Tadmor & Klein 1970 ch. 7). */
static void leak_uses_viscosity_at_clearance_temperature_and_shear(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, 455.0);
	double lb = PI * EX_D * cos(ex_phi()), d = 1e-4, e = 0.00635;
	double tf = 0.5 * (T200 + 455.0), gd = PI * EX_D / d;
	double at = exp(28e3 / 8.314462618 * (1.0 / tf - 1.0 / 463.15));
	double mu =
	    at * 9000.0 * pow(1.0 + pow(0.8 * at * gd, 0.7), (0.4 - 1.0) / 0.7);
	struct ow_melt_out o;

	(void)state;
	assert_rel(gd, 1994.9, 1e-4);
	c.vol_flow_m3_s = 1.2e-5;
	c.flight_width_m = e;
	c.leak_bypass_m = lb;
	c.leak_flight_len_per_z = 1.0;
	c.clearance_m = d;
	o = station(ws, &c, 0.0);
	assert_rel(
	    o.leak_flow_m3_s,
	    lb * (c.vbx_m_s * d / 2.0 +
	          d * d * d * (o.dpdx_Pa_m * c.width_m + o.dpdz_Pa_m * lb) /
	              (12.0 * mu * e)),
	    1e-9);
	/* the clearance heating at the same viscosity: mu_f (V_b/delta)^2
	 * delta e per flight length (Bird, Stewart & Lightfoot 2002 section
	 * 10.4), in the power beside the channel's barrel-wall work */
	assert_rel(ow_melt_leak_heat(c.vb_m_s, d, mu, e), mu * gd * gd * d * e,
	           1e-12);
	ow_melt_destroy(ws);
}

/* ---- temperature across the depth ----------------------------------- */

static struct ow_melt_out march_to_steady(struct ow_melt_ws *ws,
                                          const struct ow_melt_cond *c)
{
	struct ow_melt_out o;

	for (int i = 0; i < 4; i++) /* implicit: a huge step is steady */
		o = station(ws, c, 1e6);
	return o;
}

/* Plane Couette heating between walls at T_w: dT_max = mu V^2/(8k) =
 * 25.000 K at mid-depth; one wall adiabatic: mu V^2/(2k) = 100.000 K at
 * that wall (Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. 2002,
 * section 10.4; mu = 1000 Pa s, V = 0.2 m/s, k = 0.2 W/(m K)). */
static void bands_reproduce_couette_heating(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = couette(&m);
	struct ow_melt_ws *ws = workspace(41, 40, T200);
	struct ow_melt_profile p;
	struct ow_melt_out o;

	(void)state;
	o = march_to_steady(ws, &c);
	assert_false(o.circulating);
	assert_rel(o.peak_K - T200, 25.000, 1e-3);
	ow_melt_profile(ws, &p);
	assert_rel(p.temp_K[20] - T200, 25.000, 1e-3); /* y = H/2 */
	assert_abs(p.temp_K[0], p.temp_K[40], 1e-9);   /* symmetric */
	c.root_adiabatic = 1;
	o = march_to_steady(ws, &c);
	assert_rel(o.peak_K - T200, 100.000, 1e-3);
	assert_rel(ow_melt_band_temp(ws, 0) - T200, 100.000, 1e-3); /* root */
	/* all heat leaves through the barrel */
	assert_rel(-o.barrel_heat_W_m, o.dissipation_W_m, 1e-9);
	ow_melt_destroy(ws);
}

/* Power-law Couette: uniform dissipation m (V/H)^(n+1), dT_max =
 * m (V/H)^(n+1) H^2/(8k) = 20.118 K for m = 1e4 Pa s^n, n = 0.4, H = 3 mm
 * (Bird, Stewart & Lightfoot 2002, section 10.4 with a power-law source,
 * recomputed). */
static void bands_reproduce_powerlaw_couette_heating(void **state)
{
	struct ow_material m = power_law(1e4, 0.4);
	struct ow_melt_cond c = couette(&m);
	struct ow_melt_ws *ws = workspace(41, 40, T200);

	(void)state;
	assert_rel(march_to_steady(ws, &c).peak_K - T200, 20.118, 1e-3);
	ow_melt_destroy(ws);
}

/* Every step closes the energy balance rho c_p Q d(bulk) = (dissipation +
 * barrel + root heat) dz exactly (first law for the flowing melt, Bird,
 * Stewart & Lightfoot 2002 ch. 11), with circulation, leakage, a root at
 * a set temperature and a changing depth. */
static void bands_conserve_energy_step_by_step(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, 440.0);
	double prev = 440.0, dz = 0.0105, rc;

	(void)state;
	c.clearance_m = 2e-4;
	c.flight_width_m = 0.00635;
	c.leak_bypass_m = PI * EX_D * cos(ex_phi());
	c.leak_flight_len_per_z = 1.0;
	c.vol_flow_m3_s = 40.0 / 3600.0 / 760.0;
	c.root_adiabatic = 0;
	c.root_K = 470.0;
	rc = m.melt_density_kg_m3 * m.melt_cp_J_kgK * c.vol_flow_m3_s;
	for (int i = 0; i < 150; i++) {
		struct ow_melt_out o;

		c.depth_m = EX_H * (1.3 - 0.3 * (double)i / 150.0);
		o = station(ws, &c, dz);
		assert_true(o.circulating);
		assert_abs(rc * (o.bulk_K - prev) / dz,
		           o.dissipation_W_m + o.barrel_heat_W_m +
		               o.root_heat_W_m,
		           1e-9 * o.dissipation_W_m);
		assert_rel(o.bulk_K, ow_melt_bulk(ws), 1e-15);
		assert_true(o.peak_K >= o.bulk_K);
		prev = o.bulk_K;
	}
	ow_melt_destroy(ws);
}

/* With dz = 0 the station only solves: temperatures stay put. */
static void zero_step_leaves_temperatures_alone(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, 450.0);
	struct ow_melt_out o;

	(void)state;
	c.vol_flow_m3_s = 1.2e-5;
	o = station(ws, &c, 0.05);
	o = station(ws, &c, 0.0);
	assert_rel(o.bulk_K, ow_melt_bulk(ws), 1e-15);
	assert_rel(station(ws, &c, 0.0).peak_K, o.peak_K, 1e-15);
	ow_melt_destroy(ws);
}

/* Melt joining the channel mixes in proportion to the band flows, and
 * uniform heating raises every band: the flow-weighted bulk follows the
 * enthalpy balance of the two streams (first law, constant c_p), and the
 * next step's energy closure starts from the mixed bulk. */
static void mixing_and_uniform_heating_keep_the_enthalpy_flux(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, 450.0);
	struct ow_melt_out o;
	double before, peak, rc, dz = 0.02;

	(void)state;
	c.vol_flow_m3_s = 1.2e-5;
	for (int i = 0; i < 20; i++)
		station(ws, &c, dz);
	before = ow_melt_bulk(ws);
	peak = ow_melt_peak(ws);
	ow_melt_mix(ws, 0.25, 430.0);
	assert_rel(ow_melt_bulk(ws), 0.75 * before + 0.25 * 430.0, 1e-14);
	assert_rel(ow_melt_peak(ws), 0.75 * peak + 0.25 * 430.0, 1e-14);
	ow_melt_heat(ws, 3.0);
	assert_rel(ow_melt_bulk(ws), 0.75 * before + 0.25 * 430.0 + 3.0, 1e-14);
	before = ow_melt_bulk(ws);
	o = station(ws, &c, dz);
	rc = m.melt_density_kg_m3 * m.melt_cp_J_kgK * c.vol_flow_m3_s;
	assert_abs(rc * (o.bulk_K - before) / dz,
	           o.dissipation_W_m + o.barrel_heat_W_m,
	           1e-9 * o.dissipation_W_m);
	ow_melt_destroy(ws);
}

/* ---- streamline bands ------------------------------------------------- */

/* Streamline pairing in the Newtonian metering channel: xi_c = [(1 - xi) +
 * sqrt((1 - xi)(1 + 3 xi))]/2 (from psi ~ xi^3 - xi^2, Mohr, Saxton &
 * Jepson 1957 analysis; Pinto & Tadmor 1970 use it for residence times):
 * 0.7 -> 0.63218, 0.8 -> 0.51231, 0.9 -> 0.35414 (recomputed); unchanged by
 * a pressure gradient because the cross flow decouples. */
static void bands_pair_layers_on_one_streamline(void **state)
{
	static const double t[][2] = {
	    {0.7, 0.63218}, {0.8, 0.51231}, {0.9, 0.35414}};
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 20, T200);
	double q[] = {1.582355e-5, 1.2e-5};

	(void)state;
	c.infinite_width = 1;
	for (int k = 0; k < 2; k++) {
		c.vol_flow_m3_s = q[k];
		assert_true(station(ws, &c, 0.0).circulating);
		for (int i = 0; i < 3; i++) {
			double yc, y;

			assert_int_equal(
			    ow_melt_partner(ws, t[i][0] * EX_H, &yc), OW_OK);
			assert_abs(yc / EX_H, t[i][1], 6e-6);
			ow_melt_partner(ws, yc, &y); /* and back */
			assert_abs(y / EX_H, t[i][0], 1e-9);
		}
	}
	ow_melt_destroy(ws);
}

/* Band legs: each band boundary below the centre pairs with the one above
 * (equal xi^2 (1 - xi)), legs tile the depth, the centre is at 2/3 (same
 * sources as above). */
static void band_legs_tile_the_depth_on_streamlines(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(41, 12, T200);
	double l[4], prev[4];

	(void)state;
	c.infinite_width = 1;
	c.vol_flow_m3_s = 1.582355e-5;
	station(ws, &c, 0.0);
	ow_melt_band_legs(ws, 0, l);
	assert_abs(l[1] / EX_H, 2.0 / 3.0, 1e-9);
	assert_abs(l[2] / EX_H, 2.0 / 3.0, 1e-9);
	for (int k = 0; k < ow_melt_bands(ws); k++) {
		double a, b;

		ow_melt_band_legs(ws, k, l);
		a = l[0] / EX_H;
		b = l[3] / EX_H;
		assert_abs(a * a * (1.0 - a), b * b * (1.0 - b), 1e-12);
		assert_true(l[0] < l[1] && l[2] < l[3]);
		if (k > 0) {
			assert_abs(l[1], prev[0], 1e-15);
			assert_abs(l[2], prev[3], 1e-15);
		}
		memcpy(prev, l, sizeof l);
	}
	assert_abs(l[0], 0.0, 1e-15);
	assert_abs(l[3], EX_H, 1e-15);
	ow_melt_destroy(ws);
}

/* ---- resolution and failures ---------------------------------------- */

/* The default resolution (41 nodes, 20 bands) is within 0.5 K (peak,
 * bulk) and 0.5 % (pressure rise) of twice that resolution over a metering
 * march (the resolution criterion of the solver's design). */
static double march(int nodes, int bands, struct ow_melt_out *last)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(nodes, bands, 450.0);
	double dp = 0.0, dz = ex_length() / 160.0;

	c.vbz_m_s *= 1.5; /* 90 rpm */
	c.vbx_m_s *= 1.5;
	c.vb_m_s *= 1.5;
	c.vol_flow_m3_s = 50.0 / 3600.0 / 760.0;
	for (int i = 0; i < 160; i++) {
		*last = station(ws, &c, dz);
		dp += last->dpdz_Pa_m * dz;
	}
	ow_melt_destroy(ws);
	return dp;
}

static void default_resolution_is_converged(void **state)
{
	struct ow_melt_out a, b;
	double dpa = march(41, 20, &a), dpb = march(81, 40, &b);

	(void)state;
	assert_rel(dpa, dpb, 5e-3);
	assert_abs(a.peak_K, b.peak_K, 0.5);
	assert_abs(a.bulk_K, b.bulk_K, 0.5);
}

/* Bad conditions are named, a viscosity that cannot be evaluated returns
 * a status (never aborts), and a failed step leaves the bands alone. */
static void failures_return_a_status(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = NULL;
	struct ow_melt_out o;
	struct ow_diag d = {""};

	(void)state;
	assert_int_equal(ow_melt_create(3, 20, &ws, &d), OW_EARG);
	assert_null(ws);
	ow_melt_destroy(NULL);
	ws = workspace(41, 20, 450.0);
	c.vol_flow_m3_s = 1e-5;
	c.depth_m = -1.0;
	ow_diag_clear(&d);
	assert_int_equal(ow_melt_step(ws, &c, 0.0, &o, &d), OW_EARG);
	assert_non_null(strstr(d.msg, "depth_m"));
	c.depth_m = EX_H;
	c.vol_flow_m3_s = 0.0;
	assert_int_equal(ow_melt_step(ws, &c, 0.01, &o, NULL), OW_ECOMPUTE);
	c.vol_flow_m3_s = 1e-5;
	m.visc.shift = OW_SHIFT_WLF; /* singular below T_ref - C2 */
	m.visc.wlf_c1 = 17.44;
	m.visc.wlf_c2_K = 51.6;
	m.visc.ref_temp_K = 600.0;
	assert_int_equal(ow_melt_step(ws, &c, 0.01, &o, NULL), OW_ECOMPUTE);
	assert_rel(ow_melt_bulk(ws), 450.0, 1e-15);
	assert_rel(ow_melt_peak(ws), 450.0, 1e-15);
	ow_melt_destroy(ws);
}

/* ---- fluted mixer and barrel wall -------------------------------------- */

/* Plane Couette-Poiseuille flow across a 1 mm gap under a wall at V with
 * pressure gradient G = dP/e (mu = 500 Pa s): u(y) = V y/g - G y (g - y)
 * /(2 mu) (Bird, Stewart & Lightfoot 2002, ch. 2, parallel plates, one
 * moving); its flow rate and dissipation mu u'^2 integrated by GSL QAGS. */
struct land_gap {
	double V, G, g, mu;
	int heat;
};

static double land_integrand(double y, void *p)
{
	const struct land_gap *l = p;
	double du = l->V / l->g - l->G * (l->g - 2.0 * y) / (2.0 * l->mu);

	if (l->heat)
		return l->mu * du * du;
	return l->V * y / l->g - l->G * y * (l->g - y) / (2.0 * l->mu);
}

static void land_agrees_with_gsl_over_the_gap(const struct ow_mixer_land *o,
                                              double Q, double nL, double V)
{
	gsl_integration_workspace *w = gsl_integration_workspace_alloc(100);
	struct land_gap l = {V, o->dp_Pa / 6.35e-3, 1e-3, 500.0, 0};
	gsl_function f = {land_integrand, &l};
	double q, heat, err;

	gsl_integration_qags(&f, 0.0, 1e-3, 0.0, 1e-12, 100, w, &q, &err);
	l.heat = 1;
	gsl_integration_qags(&f, 0.0, 1e-3, 0.0, 1e-12, 100, w, &heat, &err);
	gsl_integration_workspace_free(w);
	assert_rel(q * nL, Q, 1e-9);
	assert_rel(heat * 6.35e-3 * nL, o->heat_W, 1e-9);
}

/* Barrier-land flow of a fluted mixer, 8 lands of 0.127 m, gap 1 mm, land
 * 6.35 mm, barrel at 0.26599 m/s (80 rpm on 63.5 mm), mu = 500 Pa s
 * (inputs chosen for the check). Per unit land length the gap is plane
 * Couette-Poiseuille flow q = V g/2 - g^3 dP/(12 mu e) (Tadmor & Gogos
 * 2006, ch. 10; Rauwendaal, Polymer Extrusion, barrier flight flow); values
 * recomputed. */
static void mixer_land_follows_couette_poiseuille_land_flow(void **state)
{
	const double V = PI * 0.0635 * 80.0 / 60.0, nL = 8.0 * 0.127;
	struct ow_mixer_land o;

	(void)state;
	/* pure drag: no pressure change, Couette heating mu V^2/g per unit
	 * land area (Bird, Stewart & Lightfoot 2002, section 10.4) */
	ow_melt_mixer_land(V * 1e-3 / 2.0 * nL, 8.0, 0.127, 1e-3, 6.35e-3, V,
	                   500.0, &o);
	assert_abs(o.dp_Pa, 0.0, 1e-6);
	assert_rel(o.heat_W, 228.22441722, 1e-9);
	assert_rel(o.power_W, o.heat_W, 1e-12);
	assert_rel(o.shear_1_s, V / 1e-3, 1e-12);
	/* barrel at rest: plane slit flow Q = nL g^3 dP/(12 mu e) backward
	 * (BSL ch. 2, flow between parallel plates), all of the pressure
	 * work dissipated */
	ow_melt_mixer_land(2e-5, 8.0, 0.127, 1e-3, 6.35e-3, 0.0, 500.0, &o);
	assert_rel(o.dp_Pa, -7.5e5, 1e-12);
	assert_rel(o.heat_W, 15.0, 1e-12);
	assert_abs(o.power_W, 0.0, 1e-9);
	/* both at once, at the flow of the demo line near 60 kg/h */
	ow_melt_mixer_land(2.2e-5, 8.0, 0.127, 1e-3, 6.35e-3, V, 500.0, &o);
	assert_rel(o.dp_Pa, 4.242074791e6, 1e-9);
	assert_rel(o.heat_W, 708.09637808, 1e-9);
	assert_rel(o.power_W, 801.42202348, 1e-9);
	land_agrees_with_gsl_over_the_gap(&o, 2.2e-5, nL, V);
	ow_melt_mixer_land(2.2e-5, 8.0, 0.127, 0.0, 6.35e-3, V, 500.0, &o);
	assert_true(isnan(o.dp_Pa) && isnan(o.heat_W));
}

/* Couette cell with the root adiabatic and the barrel reached through a
 * wall of h = 2000 W/(m2 K) from a control point at T_w: all the heat
 * mu V^2/H leaves through the wall, so the root sits at T_w + mu V^2/(H h)
 * + mu V^2/(2k) = 106.667 K above T_w (Bird, Stewart & Lightfoot 2002,
 * section 10.4 with Newton's law of cooling at the wall, section 10.1;
 * mu = 1000 Pa s, V = 0.2 m/s, k = 0.2 W/(m K), H = 3 mm). */
static void finite_wall_adds_its_resistance_to_the_couette_rise(void **state)
{
	struct ow_material m = power_law(1000.0, 1.0);
	struct ow_melt_cond c = couette(&m);
	struct ow_melt_ws *ws = workspace(41, 40, T200);
	struct ow_melt_out o;

	(void)state;
	c.root_adiabatic = 1;
	c.wall_h_W_m2K = 2000.0;
	o = march_to_steady(ws, &c);
	assert_rel(o.peak_K - T200, 100.0 + 40.0 / 0.003 / 2000.0, 1e-3);
	assert_rel(-o.barrel_heat_W_m, o.dissipation_W_m, 1e-9);
	ow_melt_destroy(ws);
}

/* A mixer step closes rho c_p Q d(bulk) = (heat + barrel + root) dz
 * exactly (first law, Bird, Stewart & Lightfoot 2002 ch. 11), warms every
 * band alike when the wall is at the melt's temperature, and loses heat to
 * a colder barrel, less through a finite wall. */
static void mixer_step_keeps_the_energy_book_with_the_barrel(void **state)
{
	struct ow_material m = carreau();
	struct ow_melt_cond c = metering(&m);
	struct ow_melt_ws *ws = workspace(21, 10, 500.0);
	struct ow_melt_ws *cp = workspace(21, 10, 500.0);
	struct ow_melt_out o, oh;
	double dz = 0.02, heat = 3000.0, rc, b0;

	(void)state;
	c.vol_flow_m3_s = 40.0 / 3600.0 / 760.0;
	c.barrel_K = 500.0;
	rc = m.melt_density_kg_m3 * m.melt_cp_J_kgK * c.vol_flow_m3_s;
	station(ws, &c, 0.0); /* the layout of a conveying station */
	ow_melt_copy(cp, ws);
	b0 = ow_melt_bulk(ws);
	assert_int_equal(ow_melt_mixer_step(ws, &c, dz, heat, &o, NULL), OW_OK);
	assert_rel(rc * (o.bulk_K - b0) / dz,
	           o.dissipation_W_m + o.barrel_heat_W_m + o.root_heat_W_m,
	           1e-9);
	assert_true(o.barrel_heat_W_m < 0.0); /* melt now above the wall */
	assert_rel(o.peak_K - 500.0, o.bulk_K - 500.0, 0.5);
	c.barrel_K = 470.0;
	ow_melt_copy(ws, cp);
	assert_int_equal(ow_melt_mixer_step(ws, &c, dz, heat, &o, NULL), OW_OK);
	c.wall_h_W_m2K = 500.0;
	ow_melt_copy(ws, cp);
	assert_int_equal(ow_melt_mixer_step(ws, &c, dz, heat, &oh, NULL),
	                 OW_OK);
	assert_true(o.barrel_heat_W_m < oh.barrel_heat_W_m);
	assert_true(oh.barrel_heat_W_m < 0.0);
	assert_rel(rc * (oh.bulk_K - b0) / dz,
	           oh.dissipation_W_m + oh.barrel_heat_W_m, 1e-9);
	ow_melt_destroy(ws);
	ow_melt_destroy(cp);
}

/* ---- viscous heating with cross-channel circulation ------------------- */

/* Kinematics of a pure-drag Newtonian channel with circulation:
 * u_z = V_bz xi, u_x = V_bx xi (3 xi - 2) (Tadmor & Klein 1970, ch. 7). */
struct circ_case {
	double mu, k, H, vbz, vbx;
};

/* Partner level on the same cross-channel streamline, xi^2 (1 - xi) =
 * xi_c^2 (1 - xi_c) (Mohr, Saxton & Jepson 1957, as reduced in the check
 * of the band pairing above). */
static double partner_of(double xi)
{
	return 0.5 * ((1.0 - xi) + sqrt((1.0 - xi) * (1.0 + 3.0 * xi)));
}

/* Dissipation mu (u_z'^2 + u_x'^2) integrated over [a, b] in xi, times H:
 * heat per unit wall area, W/m^2. */
static double circ_heat(const struct circ_case *c, double a, double b)
{
	double m = c->mu / (c->H * c->H), vx2 = c->vbx * c->vbx;
	double fa = c->vbz * c->vbz * a + vx2 * pow(6.0 * a - 2.0, 3) / 18.0;
	double fb = c->vbz * c->vbz * b + vx2 * pow(6.0 * b - 2.0, 3) / 18.0;

	return c->H * m * (fb - fa);
}

/* d(T_centre - T_w)/d xi_u: the heat made inside the streamline through
 * xi_u leaves by conduction across both of its legs, in the ratio of the
 * stream-function slopes |u_x| there. */
static double circ_integrand(double xu, void *p)
{
	const struct circ_case *c = p;
	double xc = partner_of(xu);
	double au = fabs(xu * (3.0 * xu - 2.0)),
	       ac = fabs(xc * (3.0 * xc - 2.0));

	if (!(au + ac > 0.0))
		return 0.0;
	return circ_heat(c, xc, xu) * c->H / c->k * au / (au + ac);
}

/* Viscous heating in a circulating channel between walls at one
 * temperature, against the limit the bands stand for: when circulation is
 * fast against conduction (cross-channel Peclet number V_bx H/alpha of
 * order 1e3 here) the temperature is uniform on each closed streamline,
 * and a heat balance on the fluid inside the streamline through xi_u gives
 *   T_c - T_w = int_{2/3}^{1} Q(xi_u) (H/k) |u_x(xi_u)| /
 *               (|u_x(xi_u)| + |u_x(xi_c)|) d xi_u,
 *   Q = H int_{xi_c}^{xi_u} mu (u_z'^2 + u_x'^2) d xi
 * (Bird, Stewart & Lightfoot 2002, section 10.4 energy balance, on the
 * streamlines of Mohr, Saxton & Jepson 1957; integrated with GSL QAGS).
 * With mu = 1000 Pa s, k = 0.2 W/(m K), H = 3.175 mm and the barrel of a
 * 63.5 mm square-pitch screw at 40 and 100 rpm the limit is 0.9151 of the
 * plane Couette rise mu V_b^2/(8k): circulation adds the cross-channel
 * dissipation 3 mu V_bx^2/H but carries heat across the depth, so the
 * centre runs cooler than in plane Couette flow. The default resolution
 * (21 nodes, 10 bands) must be within 1 % of the limit; without
 * circulation it reproduces mu V^2/(8k) itself to 1 %. */
static void circulating_couette_peak_matches_the_streamline_limit(void **st)
{
	struct ow_material m = power_law(1000.0, 1.0);
	gsl_integration_workspace *w = gsl_integration_workspace_alloc(1000);
	double rpm[] = {40.0, 100.0}, phi = ex_phi();

	(void)st;
	for (int i = 0; i < 2; i++) {
		double vb = PI * EX_D * rpm[i] / 60.0, ref, err, bsl;
		struct circ_case cc = {1000.0, 0.2, EX_H, vb * cos(phi),
		                       vb * sin(phi)};
		gsl_function f = {circ_integrand, &cc};
		struct ow_melt_cond c = couette(&m);
		struct ow_melt_ws *ws = workspace(21, 10, T200);
		struct ow_melt_out o;

		gsl_integration_qags(&f, 2.0 / 3.0, 1.0, 1e-12, 1e-10, 1000, w,
		                     &ref, &err);
		bsl = 1000.0 * vb * vb / (8.0 * 0.2);
		assert_rel(ref / bsl, 0.91515, 1e-4);
		c.depth_m = EX_H;
		c.vbz_m_s = cc.vbz;
		c.vbx_m_s = cc.vbx;
		c.vb_m_s = vb;
		c.vol_flow_m3_s = cc.vbz * c.width_m * EX_H / 2.0;
		c.root_adiabatic = 0;
		o = march_to_steady(ws, &c);
		assert_true(o.circulating);
		assert_rel(o.peak_K - T200, ref, 0.01);
		c.vbz_m_s = vb; /* the same barrel without circulation */
		c.vbx_m_s = 0.0;
		c.vol_flow_m3_s = vb * c.width_m * EX_H / 2.0;
		ow_melt_reset(ws, T200);
		o = march_to_steady(ws, &c);
		assert_false(o.circulating);
		assert_rel(o.peak_K - T200, bsl, 0.01);
		ow_melt_destroy(ws);
	}
	gsl_integration_workspace_free(w);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(shape_factors_follow_rowell_finlayson_series),
	    cmocka_unit_test(shape_factors_tend_to_one_for_shallow_channels),
	    cmocka_unit_test(powerlaw_flow_matches_exact_table),
	    cmocka_unit_test(powerlaw_flow_reduces_to_newtonian_line),
	    cmocka_unit_test(powerlaw_flow_agrees_with_gsl_quadrature),
	    cmocka_unit_test(station_reproduces_newtonian_screw_characteristic),
	    cmocka_unit_test(
	        station_power_splits_into_flow_work_and_dissipation),
	    cmocka_unit_test(station_reproduces_powerlaw_table),
	    cmocka_unit_test(
	        station_power_identity_holds_with_cross_flow_and_leakage),
	    cmocka_unit_test(
	        station_flow_matches_gsl_integral_over_the_channel),
	    cmocka_unit_test(leakage_scales_with_the_clearance),
	    cmocka_unit_test(station_leak_flow_uses_the_solved_gradients),
	    cmocka_unit_test(
	        leak_uses_viscosity_at_clearance_temperature_and_shear),
	    cmocka_unit_test(bands_reproduce_couette_heating),
	    cmocka_unit_test(bands_reproduce_powerlaw_couette_heating),
	    cmocka_unit_test(bands_conserve_energy_step_by_step),
	    cmocka_unit_test(zero_step_leaves_temperatures_alone),
	    cmocka_unit_test(mixing_and_uniform_heating_keep_the_enthalpy_flux),
	    cmocka_unit_test(bands_pair_layers_on_one_streamline),
	    cmocka_unit_test(band_legs_tile_the_depth_on_streamlines),
	    cmocka_unit_test(default_resolution_is_converged),
	    cmocka_unit_test(failures_return_a_status),
	    cmocka_unit_test(mixer_land_follows_couette_poiseuille_land_flow),
	    cmocka_unit_test(
	        finite_wall_adds_its_resistance_to_the_couette_rise),
	    cmocka_unit_test(mixer_step_keeps_the_energy_book_with_the_barrel),
	    cmocka_unit_test(
	        circulating_couette_peak_matches_the_streamline_limit),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
