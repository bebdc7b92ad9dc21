/* test_melting.c - Tadmor contiguous solids melting.
 *
 * Worked example: Tadmor, Polym. Eng. Sci. 6 (1966) 185, and Tadmor & Klein,
 * Engineering Principles of Plasticating Extrusion (1970), ch. 9, applied to
 * a 63.5 mm square-pitch screw at 60 rpm and 50 kg/h with an LDPE property
 * set (rho_s 915, rho_m 780 kg/m3, k_m 0.18 W/(m K), C_s 2300 J/(kg K),
 * lambda 130 kJ/kg, T_m 110 C, T_s 25 C, T_b 180 C, film viscosity
 * 100 Pa s; from memory of the data set Tadmor & Klein used, not verified).
 * Every number below was recomputed in double precision from the published
 * equations (closed forms of Tadmor & Klein 1970, ch. 9). */
#include "testutil.h"

#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>

#include "ow_melting.h"

#define C2K(c) ((c) + 273.15)
#define H1     9.4e-3
#define H2     3.2e-3

static double helix(void)
{
	return atan(1.0 / OW_PI); /* square pitch at the bore */
}

static double width(void)
{
	return 0.0635 * cos(helix()) - 0.00635; /* W_b = L_s cos phi - e */
}

static double taper_length(double turns_axial_d)
{
	return turns_axial_d * 0.0635 / sin(helix()); /* down-channel */
}

static struct ow_material ldpe(void)
{
	struct ow_material m;

	memset(&m, 0, sizeof m);
	m.solid_density_kg_m3 = 915.0;
	m.melt_density_kg_m3 = 780.0;
	m.melt_k_W_mK = 0.18;
	m.solid_cp_J_kgK = 2300.0;
	m.fusion_J_kg = 130e3;
	m.melt_temp_K = C2K(110.0);
	return m;
}

static struct ow_melting_in example_in(const struct ow_material *m)
{
	struct ow_melting_in in;

	memset(&in, 0, sizeof in);
	in.mat = m;
	in.barrel_speed_m_s = OW_PI * 0.0635 * 1.0; /* 60 rpm */
	in.helix_rad = helix();
	in.bed_speed_m_s = ow_melting_bed_speed(m, 50.0 / 3600.0, H1, width());
	in.solid_temp_K = C2K(25.0);
	in.film_visc_Pa_s = 100.0;
	return in;
}

/* Geometry along the march: a taper of down-channel length zt from H1 to
 * H2 (zt = 0: constant H1), then constant H2; barrel temperature tb(z). */
struct course {
	double zt;
	double (*tb)(double z);
	double (*w)(double z);
};

static double tb_180(double z)
{
	(void)z;
	return C2K(180.0);
}

static double w_const(double z)
{
	(void)z;
	return width();
}

static struct ow_melting_station station(const struct course *c, double z)
{
	struct ow_melting_station s;

	s.depth_m = c->zt <= 0.0 ? H1
	            : z < c->zt  ? H1 - (H1 - H2) * z / c->zt
	                         : H2;
	s.width_m = c->w ? c->w(z) : width();
	s.barrel_temp_K = c->tb ? c->tb(z) : C2K(180.0);
	return s;
}

/* March n steps of dz from the bed filling the channel; returns X/W at the
 * end, the position where the bed vanished (or -1) and any plugging. */
static double march(const struct ow_melting_in *in, const struct course *c,
                    double dz, int n, double *gone_at, int *plugged)
{
	struct ow_melting_step_out o;
	double x = width(), z = 0.0, sbr = 1.0;
	int i;

	*gone_at = -1.0;
	*plugged = 0;
	for (i = 0; i < n; i++, z += dz) {
		struct ow_melting_station a = station(c, z);
		struct ow_melting_station b = station(c, z + dz);

		assert_int_equal(ow_melting_step(in, &a, &b, dz, x, &o, NULL),
		                 OW_OK);
		*plugged |= o.plugged;
		if (o.melted_at_m >= 0.0 && *gone_at < 0.0)
			*gone_at = z + o.melted_at_m;
		x = o.bed_width_m;
		sbr = o.sbr;
	}
	return sbr;
}

/* W, V_sz, V_j, Phi, delta(X = W) of the worked example (Tadmor & Klein
 * 1970, ch. 9; recomputed). The printed Phi 0.031937 differs from the
 * recomputed 0.0319355 by 5e-5 relative; psi_c = 0.53511, printed to five
 * digits, agrees with the recomputed Phi. */
static void film_reproduces_tadmor_worked_example(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	double vbx = in.barrel_speed_m_s * sin(in.helix_rad);

	(void)state;
	assert_rel(width(), 54.16e-3, 1e-4);
	assert_rel(vbx, 0.06051, 1e-4);
	assert_rel(in.bed_speed_m_s, 0.02982, 2e-4);
	assert_int_equal(ow_melting_film(&in, C2K(180.0), width(), &f, NULL),
	                 OW_OK);
	assert_rel(f.slip_speed_m_s, 0.17132, 1e-4);
	assert_rel(f.phi, 0.031937, 1e-4);
	assert_rel(f.film_m, 0.315e-3, 2e-3);
	/* omega = rho_m V_bx delta / 2 (Tadmor 1966: the film drained by the
	 * barrel's cross-channel speed) is Phi sqrt(X) */
	assert_rel(f.melt_rate_kg_sm, 780.0 * vbx * f.film_m / 2.0, 1e-12);
	assert_rel(f.melt_rate_kg_sm, f.phi * sqrt(width()), 1e-12);
}

/* Constant depth: X/W = (1 - psi_c z/2)^2, psi_c = 0.53511 1/m,
 * Z_T = 3.7376 m, X/W(1 m) = 0.53648 (Tadmor & Klein 1970, ch. 9,
 * recomputed); the march is exact here (sqrt(X) falls linearly). */
static void melting_solid_bed_follows_tadmor_constant_depth(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	struct course c = {0.0, tb_180, w_const};
	double psi, gone, sbr;
	int plugged;

	(void)state;
	ow_melting_film(&in, C2K(180.0), width(), &f, NULL);
	psi = ow_melting_psi_const(f.phi, 915.0, in.bed_speed_m_s, H1, width());
	assert_rel(psi, 0.53511, 1e-4);
	assert_rel(ow_melting_length_const(psi, 1.0), 3.7376, 1e-4);
	assert_rel(ow_melting_sbr_const(psi, 1.0, 1.0), 0.53648, 1e-4);
	sbr = march(&in, &c, 0.01, 100, &gone, &plugged);
	assert_rel(sbr, ow_melting_sbr_const(psi, 1.0, 1.0), 1e-10);
	assert_false(plugged);
	assert_true(gone < 0.0);
	sbr = march(&in, &c, 0.01, 400, &gone, &plugged);
	assert_abs(sbr, 0.0, 0.0);
	assert_rel(gone, 2.0 / psi, 1e-9);
}

/* Linear taper, 8 D axial from 9.4 to 3.2 mm: A = 3.70187e-3,
 * psi_t = 5.02999e-3, psi_t/A = 1.3588; X/W = 0.918580, 0.806347 at 0.5 and
 * 1.0 m, 0.55334 at the taper's end (1.6748 m); the taper formula's
 * Z_T = 2.3622 m lies beyond it (Tadmor & Klein 1970, ch. 9, recomputed). */
static void melting_solid_bed_follows_tadmor_linear_taper(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	double zt = taper_length(8.0), a = (H1 - H2) / zt, psi, gone;
	struct course c = {zt, tb_180, w_const};
	int plugged, n = 200;

	(void)state;
	ow_melting_film(&in, C2K(180.0), width(), &f, NULL);
	psi = ow_melting_psi_taper(f.phi, 915.0, in.bed_speed_m_s, width());
	assert_rel(zt, 1.6748, 1e-4);
	assert_rel(a, 3.70187e-3, 1e-5);
	assert_rel(psi, 5.02999e-3, 1e-4);
	assert_rel(psi / a, 1.3588, 1e-4);
	assert_false(ow_melting_taper_plugs(psi, a));
	assert_abs(ow_melting_sbr_taper(psi, a, 1.0, H1, 0.5), 0.918580, 2e-6);
	assert_abs(ow_melting_sbr_taper(psi, a, 1.0, H1, 1.0), 0.806347, 2e-6);
	assert_abs(ow_melting_sbr_taper(psi, a, 1.0, H1, zt), 0.55334, 1e-5);
	assert_rel(ow_melting_length_taper(psi, a, 1.0, H1), 2.3622, 1e-4);
	/* the march over the taper (stations every zt/200) */
	assert_rel(march(&in, &c, zt / n, n / 4, &gone, &plugged),
	           ow_melting_sbr_taper(psi, a, 1.0, H1, zt / 4), 1e-8);
	assert_rel(march(&in, &c, zt / n, n, &gone, &plugged),
	           ow_melting_sbr_taper(psi, a, 1.0, H1, zt), 1e-8);
	assert_false(plugged);
}

/* Taper then metering at H2: 0.9465 m more, 2.6213 m in all (Tadmor & Klein
 * 1970, ch. 9 closed forms chained, recomputed), by formula and march. */
static void melting_completes_in_metering_after_taper(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	double zt = taper_length(8.0), a = (H1 - H2) / zt, pt, pc, sbr, gone;
	struct course c = {zt, tb_180, w_const};
	int plugged;

	(void)state;
	ow_melting_film(&in, C2K(180.0), width(), &f, NULL);
	pt = ow_melting_psi_taper(f.phi, 915.0, in.bed_speed_m_s, width());
	pc = ow_melting_psi_const(f.phi, 915.0, in.bed_speed_m_s, H2, width());
	sbr = ow_melting_sbr_taper(pt, a, 1.0, H1, zt);
	assert_rel(ow_melting_length_const(pc, sbr), 0.9465, 1e-4);
	assert_rel(zt + ow_melting_length_const(pc, sbr), 2.6213, 1e-4);
	/* same step size through the metering section, to 3 m */
	march(&in, &c, zt / 200.0, 358, &gone, &plugged);
	assert_rel(gone, 2.6213, 1e-4);
	assert_rel(gone, zt + ow_melting_length_const(pc, sbr), 1e-8);
}

/* At 15 kg/h the bed vanishes inside the 8 D taper: the march finds the
 * point the taper formula Z_T = (H1/psi_t)(2 - A/psi_t) gives (Tadmor &
 * Klein 1970, ch. 9), even with coarse steps. */
static void bed_vanishes_inside_taper_where_closed_form_says(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	double zt = taper_length(8.0), a = (H1 - H2) / zt, pt, zm, gone;
	struct course c = {zt, tb_180, w_const};
	int plugged;

	(void)state;
	in.bed_speed_m_s = ow_melting_bed_speed(&m, 15.0 / 3600.0, H1, width());
	ow_melting_film(&in, C2K(180.0), width(), &f, NULL);
	pt = ow_melting_psi_taper(f.phi, 915.0, in.bed_speed_m_s, width());
	zm = ow_melting_length_taper(pt, a, 1.0, H1);
	assert_true(zm < 0.8 * zt); /* well inside the taper */
	march(&in, &c, zt / 10.0, 10, &gone, &plugged);
	assert_rel(gone, zm, 1e-6);
	march(&in, &c, zt / 80.0, 80, &gone, &plugged);
	assert_rel(gone, zm, 1e-9);
}

/* T_b = 160..240 C: Phi = 0.02755, 0.03194, 0.03579, 0.03927, 0.04246 and
 * the taper formula's Z_T = 2.4845, 2.3622, 2.2400, 2.1300, 2.0331 m
 * (Tadmor & Klein 1970, ch. 9, recomputed). */
static void melting_rate_grows_slowly_with_barrel_temperature(void **state)
{
	static const double row[][3] = {
	    {160.0, 0.02755, 2.4845}, {180.0, 0.03194, 2.3622},
	    {200.0, 0.03579, 2.2400}, {220.0, 0.03927, 2.1300},
	    {240.0, 0.04246, 2.0331},
	};
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	double a = (H1 - H2) / taper_length(8.0);
	size_t i;

	(void)state;
	for (i = 0; i < sizeof row / sizeof row[0]; i++) {
		struct ow_melting_film f;
		double pt;

		assert_int_equal(
		    ow_melting_film(&in, C2K(row[i][0]), width(), &f, NULL),
		    OW_OK);
		assert_rel(f.phi, row[i][1], 2e-4);
		pt = ow_melting_psi_taper(f.phi, 915.0, in.bed_speed_m_s,
		                          width());
		assert_rel(ow_melting_length_taper(pt, a, 1.0, H1), row[i][2],
		           1e-4);
	}
}

/* psi_t <= A: the channel compresses faster than the bed melts and the bed
 * jams (Tadmor & Klein 1970, ch. 9). A 4 D taper (A = 7.404e-3 > psi_t)
 * plugs at once; the 8 D taper (A = 3.702e-3) does not. */
static void steep_taper_plugs_and_gentle_taper_does_not(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	struct ow_melting_step_out o;
	double zt = taper_length(4.0), a = (H1 - H2) / zt, pt, gone;
	struct course steep = {zt, tb_180, w_const};
	struct course gentle = {taper_length(8.0), tb_180, w_const};
	struct ow_melting_station s0 = station(&steep, 0.0);
	struct ow_melting_station s1 = station(&steep, zt / 100.0);
	int plugged;

	(void)state;
	ow_melting_film(&in, C2K(180.0), width(), &f, NULL);
	pt = ow_melting_psi_taper(f.phi, 915.0, in.bed_speed_m_s, width());
	assert_true(ow_melting_taper_plugs(pt, a));
	assert_true(ow_melting_sbr_taper(pt, a, 1.0, H1, 0.1) > 1.0);
	assert_true(isinf(ow_melting_length_taper(pt, a, 1.0, H1)));
	assert_int_equal(
	    ow_melting_step(&in, &s0, &s1, zt / 100.0, width(), &o, NULL),
	    OW_OK);
	assert_true(o.plugged);
	assert_abs(o.sbr, 1.0, 0.0); /* held at the channel width */
	march(&in, &steep, zt / 100.0, 50, &gone, &plugged);
	assert_true(plugged);
	march(&in, &gentle, gentle.zt / 100.0, 100, &gone, &plugged);
	assert_false(plugged);
}

/* Barrier-type section: the bed's room (solids-channel width) narrows
 * along z. SBR is X over that width; a channel narrowing faster than the
 * bed melts holds X at W and flags plugging. */
static double w_barrier(double z)
{
	return width() * (1.0 - 0.5 * z); /* to half the width over 1 m */
}

static void sbr_counts_against_solids_channel_width(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_step_out o;
	struct course c = {0.0, tb_180, w_barrier};
	struct ow_melting_station a = station(&c, 0.2), b = station(&c, 0.21);
	double x = 0.5 * width(), gone, sbr;
	int plugged;

	(void)state;
	assert_int_equal(ow_melting_step(&in, &a, &b, 0.01, x, &o, NULL),
	                 OW_OK);
	assert_false(o.plugged);
	assert_rel(o.sbr, o.bed_width_m / b.width_m, 1e-15);
	sbr = march(&in, &c, 0.01, 100, &gone, &plugged);
	assert_true(plugged); /* 1 - 0.5 z narrows faster than X shrinks */
	assert_abs(sbr, 1.0, 0.0);
}

/* Barrel at or below the melting point: no conduction-fed film, no
 * melting; the bed keeps its width at constant depth. */
static void cold_barrel_does_not_melt(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_station a = {H1, 54e-3, C2K(100.0)};
	struct ow_melting_station b = {H1, 54e-3, C2K(105.0)};
	struct ow_melting_step_out o;

	(void)state;
	assert_int_equal(ow_melting_step(&in, &a, &b, 0.05, 0.03, &o, NULL),
	                 OW_OK);
	assert_abs(o.bed_width_m, 0.03, 1e-15);
	assert_abs(o.film.phi, 0.0, 0.0);
	assert_abs(o.melted_kg_s, 0.0, 1e-18);
}

/* Couette film with walls at T_m and T_b and heating mu V^2:
 * T = T_m + (T_b - T_m) xi + (mu V^2/2k) xi (1 - xi) (Bird, Stewart &
 * Lightfoot 2002, section 10.4). Equal walls, mu = 1000 Pa s, V = 0.2 m/s,
 * k = 0.2 W/(m K): 25 K above the walls at mid-film. Unequal walls: the
 * maximum of the sampled profile. */
static void film_peak_matches_couette_heating_profile(void **state)
{
	static const double dts[] = {-40.0, -10.0, 0.0, 10.0, 24.0, 40.0};
	size_t i;
	int j;

	(void)state;
	assert_abs(ow_melting_film_peak(400.0, 400.0, 1000.0, 0.2, 0.2), 425.0,
	           1e-12);
	for (i = 0; i < sizeof dts / sizeof dts[0]; i++) {
		double tmax = -INFINITY, b = 1000.0 * 0.04 / 0.4;

		for (j = 0; j <= 100000; j++) {
			double xi = j / 100000.0;
			double t = 400.0 + dts[i] * xi + b * xi * (1.0 - xi);

			tmax = t > tmax ? t : tmax;
		}
		assert_abs(ow_melting_film_peak(400.0, 400.0 + dts[i], 1000.0,
		                                0.2, 0.2),
		           tmax, 1e-6);
	}
}

/* Film energy: barrel heat + dissipation = heat into the bed
 * = omega [C_s (T_m - T_s) + lambda] (the film balance of Tadmor 1966);
 * over a step the bed heat equals the melted mass times that heat. */
static void film_energy_balances_heat_into_bed(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	struct ow_melting_step_out o;
	struct ow_melting_station a = {H1, width(), C2K(180.0)};
	double heat = 2300.0 * 85.0 + 130e3, x = 0.6 * width();
	double vb = in.barrel_speed_m_s, vs = in.bed_speed_m_s;

	(void)state;
	ow_melting_film(&in, C2K(180.0), x, &f, NULL);
	assert_rel(f.barrel_heat_W_m + f.dissipation_W_m, f.bed_heat_W_m,
	           1e-12);
	assert_rel(f.bed_heat_W_m, f.melt_rate_kg_sm * heat, 1e-12);
	/* drive - dissipation = shear work pushing the bed down-channel */
	assert_rel(f.drive_power_W_m - f.dissipation_W_m,
	           x * 100.0 * vs * (vb * cos(in.helix_rad) - vs) / f.film_m,
	           1e-9);
	assert_int_equal(ow_melting_step(&in, &a, &a, 0.2, x, &o, NULL), OW_OK);
	assert_rel(o.bed_heat_W, o.melted_kg_s * heat, 1e-10);
	assert_rel(o.barrel_heat_W + o.dissipation_W, o.bed_heat_W, 1e-12);
}

/* With the resin's model the film viscosity is consistent with the film it
 * makes: mu = eta(V_j/delta, (T_b + T_m)/2). Power law m = 6000 Pa s^n,
 * n = 0.39 at 160 C, Arrhenius 50 kJ/mol: an illustrative LDPE-like set
 * (indicative textbook-type values, from memory). */
static void model_film_viscosity_is_self_consistent(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_film f;
	double tf = 0.5 * (C2K(200.0) + C2K(110.0));

	(void)state;
	m.visc.model = OW_VISC_POWER_LAW;
	m.visc.consistency_Pa_sn = 6000.0;
	m.visc.index = 0.39;
	m.visc.ref_temp_K = C2K(160.0);
	m.visc.shift = OW_SHIFT_ARRHENIUS;
	m.visc.activation_J_mol = 50e3;
	in.film_visc_Pa_s = 0.0;
	assert_int_equal(ow_melting_film(&in, C2K(200.0), 0.03, &f, NULL),
	                 OW_OK);
	assert_rel(f.visc_Pa_s,
	           ow_viscosity_eval(&m.visc, f.slip_speed_m_s / f.film_m, tf),
	           1e-10);
	in.film_visc_Pa_s = f.visc_Pa_s; /* fixed at that value: same film */
	{
		struct ow_melting_film g;

		ow_melting_film(&in, C2K(200.0), 0.03, &g, NULL);
		assert_rel(g.film_m, f.film_m, 1e-12);
		assert_rel(g.phi, f.phi, 1e-12);
	}
}

/* Independent reference: the bed ODE d(rho_s V_sz H X)/dz = -Phi(X,z)
 * sqrt(X) integrated in X with GSL's adaptive rk8pd, for a barrel
 * temperature varying along z and a Carreau-Yasuda film (eta0 = 5000 Pa s,
 * lambda = 0.5 s, n = 0.35, a = 2 at 200 C, Arrhenius 40 kJ/mol: the
 * illustrative check sets for these forms, not a real grade), so Phi
 * changes along z and with X. */
struct ref_ctx {
	const struct ow_melting_in *in;
	const struct course *c;
};

static double tb_wave(double z)
{
	return C2K(150.0 + 60.0 * sin(OW_PI * z / 3.0));
}

static int ref_rhs(double z, const double y[], double dydz[], void *p)
{
	const struct ref_ctx *r = p;
	struct ow_melting_station s = station(r->c, z);
	struct ow_melting_film f;
	double dh = z < r->c->zt ? -(H1 - H2) / r->c->zt : 0.0;
	double flux = r->in->mat->solid_density_kg_m3 * r->in->bed_speed_m_s;

	if (ow_melting_film(r->in, s.barrel_temp_K, y[0], &f, NULL) != OW_OK)
		return GSL_EBADFUNC;
	dydz[0] = (-f.melt_rate_kg_sm / flux - dh * y[0]) / s.depth_m;
	return GSL_SUCCESS;
}

static void march_agrees_with_gsl_rk8pd_for_variable_properties(void **st)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct course c = {taper_length(8.0), tb_wave, w_const};
	struct ref_ctx r = {&in, &c};
	gsl_odeiv2_system sys = {ref_rhs, NULL, 1, &r};
	gsl_odeiv2_driver *drv;
	double y[1] = {width()}, z = 0.0, dz = 0.01, gone;
	int k, plugged, checked = 0;

	(void)st;
	m.visc.model = OW_VISC_CARREAU_YASUDA;
	m.visc.zero_shear_Pa_s = 5000.0;
	m.visc.time_constant_s = 0.5;
	m.visc.index = 0.35;
	m.visc.a = 2.0;
	m.visc.ref_temp_K = C2K(200.0);
	m.visc.shift = OW_SHIFT_ARRHENIUS;
	m.visc.activation_J_mol = 40e3;
	in.film_visc_Pa_s = 0.0;
	gsl_set_error_handler_off();
	drv = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, 1e-5,
	                                    1e-12, 1e-12);
	assert_non_null(drv);
	for (k = 1; k <= 10; k++) { /* compare every 0.2 m to 2 m */
		double zk = 0.2 * k, sbr;

		assert_int_equal(gsl_odeiv2_driver_apply(drv, &z, zk, y),
		                 GSL_SUCCESS);
		sbr = march(&in, &c, dz, 20 * k, &gone, &plugged);
		if (y[0] / width() < 0.02)
			break; /* sqrt(X) singular near X = 0 for the reference
			        */
		assert_rel(sbr, y[0] / width(), 1e-3);
		checked++;
	}
	gsl_odeiv2_driver_free(drv);
	assert_true(checked >= 5);
}

/* The log-space film iteration (ln eta from ow_viscosity_log_ref, Newton
 * on ln delta) solves the same fixed point as the direct one (secant on
 * ow_viscosity_eval): film, Phi and peak agree to round-off for the three
 * viscosity forms and both shifts (illustrative parameter sets, not real
 * grades), across bed widths down to a vanishing bed and barrel
 * temperatures from just above T_m. A whole march agrees as well. */
static void check_log_film(struct ow_melting_in *in,
                           const struct ow_visc_log *lv)
{
	static const double tb_c[] = {111.0, 150.0, 200.0, 260.0};
	static const double xw[] = {1.0, 0.5, 1e-2, 1e-6, 0.0};
	struct ow_melting_film a, b;
	size_t i, j;

	for (i = 0; i < sizeof tb_c / sizeof tb_c[0]; i++)
		for (j = 0; j < sizeof xw / sizeof xw[0]; j++) {
			double x = xw[j] * width();

			in->visc_log = NULL;
			assert_int_equal(
			    ow_melting_film(in, C2K(tb_c[i]), x, &a, NULL),
			    OW_OK);
			in->visc_log = lv;
			assert_int_equal(
			    ow_melting_film(in, C2K(tb_c[i]), x, &b, NULL),
			    OW_OK);
			assert_rel(b.visc_Pa_s, a.visc_Pa_s, 1e-10);
			assert_rel(b.film_m, a.film_m, 1e-10);
			assert_rel(b.phi, a.phi, 1e-10);
			assert_rel(b.melt_rate_kg_sm, a.melt_rate_kg_sm, 1e-10);
			assert_abs(b.peak_temp_K, a.peak_temp_K, 1e-9);
			assert_rel(b.dissipation_W_m + 1.0,
			           a.dissipation_W_m + 1.0, 1e-10);
		}
}

static void log_viscosity_path_gives_the_same_film(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_visc_log lv;
	struct course c = {taper_length(8.0), tb_wave, w_const};
	double gone_a, gone_b, sbr_a, sbr_b;
	int plug_a, plug_b;

	(void)state;
	in.film_visc_Pa_s = 0.0;
	m.visc.ref_temp_K = C2K(200.0);
	m.visc.index = 0.35;
	m.visc.model = OW_VISC_CARREAU_YASUDA;
	m.visc.zero_shear_Pa_s = 5000.0;
	m.visc.time_constant_s = 0.5;
	m.visc.a = 2.0;
	m.visc.shift = OW_SHIFT_ARRHENIUS;
	m.visc.activation_J_mol = 40e3;
	ow_viscosity_log_init(&m.visc, &lv);
	check_log_film(&in, &lv);
	in.visc_log = NULL;
	sbr_a = march(&in, &c, 0.01, 300, &gone_a, &plug_a);
	in.visc_log = &lv;
	sbr_b = march(&in, &c, 0.01, 300, &gone_b, &plug_b);
	assert_abs(sbr_b, sbr_a, 1e-10);
	assert_abs(gone_b, gone_a, 1e-9);
	assert_int_equal(plug_b, plug_a);
	m.visc.model = OW_VISC_CROSS;
	m.visc.critical_stress_Pa = 3e4;
	m.visc.shift = OW_SHIFT_WLF;
	m.visc.wlf_c1 = 4.0;
	m.visc.wlf_c2_K = 200.0;
	ow_viscosity_log_init(&m.visc, &lv);
	check_log_film(&in, &lv);
	m.visc.model = OW_VISC_POWER_LAW;
	m.visc.consistency_Pa_sn = 8000.0;
	ow_viscosity_log_init(&m.visc, &lv);
	check_log_film(&in, &lv);
}

static void bad_steps_are_rejected(void **state)
{
	struct ow_material m = ldpe();
	struct ow_melting_in in = example_in(&m);
	struct ow_melting_station a = {H1, width(), C2K(180.0)};
	struct ow_melting_step_out o;
	struct ow_diag d = {""};

	(void)state;
	assert_int_equal(ow_melting_step(&in, &a, &a, 0.0, 0.01, &o, &d),
	                 OW_EARG);
	assert_non_null(strstr(d.msg, "step"));
	in.solid_temp_K = C2K(120.0); /* above T_m */
	ow_diag_clear(&d);
	assert_int_equal(ow_melting_step(&in, &a, &a, 0.01, 0.01, &o, &d),
	                 OW_EINPUT);
	assert_non_null(strstr(d.msg, "melting point"));
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(film_reproduces_tadmor_worked_example),
	    cmocka_unit_test(melting_solid_bed_follows_tadmor_constant_depth),
	    cmocka_unit_test(melting_solid_bed_follows_tadmor_linear_taper),
	    cmocka_unit_test(melting_completes_in_metering_after_taper),
	    cmocka_unit_test(bed_vanishes_inside_taper_where_closed_form_says),
	    cmocka_unit_test(melting_rate_grows_slowly_with_barrel_temperature),
	    cmocka_unit_test(steep_taper_plugs_and_gentle_taper_does_not),
	    cmocka_unit_test(sbr_counts_against_solids_channel_width),
	    cmocka_unit_test(cold_barrel_does_not_melt),
	    cmocka_unit_test(film_peak_matches_couette_heating_profile),
	    cmocka_unit_test(film_energy_balances_heat_into_bed),
	    cmocka_unit_test(model_film_viscosity_is_self_consistent),
	    cmocka_unit_test(
	        march_agrees_with_gsl_rk8pd_for_variable_properties),
	    cmocka_unit_test(log_viscosity_path_gives_the_same_film),
	    cmocka_unit_test(bad_steps_are_rejected),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
