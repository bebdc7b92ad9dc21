/* test_solids.c - Darnell-Mol solids conveying.
 *
 * Check values: Darnell & Mol, SPE J. 12 (1956) 20, in the form of Tadmor &
 * Klein, Engineering Principles of Plasticating Extrusion (1970), ch. 8;
 * the numbers were recomputed in double precision from those equations for a
 * 63.5 mm square-pitch screw (e = 6.35 mm, H = 9.4 mm, 60 rpm, bulk density
 * 500 kg/m3; inputs chosen for the check, not a published data set). */
#include "testutil.h"

#include <string.h>

#include "ow_solids.h"

#define PI  OW_PI
#define DEG (PI / 180.0)

/* 63.5 mm square pitch, e = 6.35 mm (land 0.1 D, common practice) */
static struct ow_screw screw_63(void)
{
	struct ow_screw s;

	ow_test_square_pitch_screw(&s, 9.4e-3);
	return s;
}

static struct ow_material resin(double fb, double fs)
{
	struct ow_material m;

	memset(&m, 0, sizeof m);
	m.bulk_density_kg_m3 = 500.0;
	m.friction_barrel = fb;
	m.friction_screw = fs;
	return m;
}

static void prepare(const struct ow_screw *sc, const struct ow_material *m,
                    struct ow_solids *s)
{
	struct ow_solids_in in = {sc, 9.4e-3, 1.0, m};

	assert_int_equal(ow_solids_prepare(&in, s, NULL), OW_OK);
}

/* Table rows: f_b, f_s, K, M, theta (deg), V_pl (m/s), G (kg/h).
 * Tadmor & Klein (1970) ch. 8 form of Darnell & Mol (1956), recomputed. */
static const double table[][7] = {
    {0.50, 0.00, 0.31831, 0.0, 72.3432, 0.05766, 148.1},
    {0.50, 0.25, 0.58604, 0.45997, 36.247, 0.04428, 113.7},
    {0.45, 0.25, 0.58604, 0.51108, 33.464, 0.04286, 110.1},
    {0.30, 0.30, 0.64635, 0.94369, 4.699, 0.01303, 33.5},
    {0.50, 0.50, 0.91528, 1.04959, -3.204, 0.0, 0.0},
};

static void conveying_angle_and_output_follow_darnell_mol_table(void **state)
{
	struct ow_screw sc = screw_63();
	size_t i;

	(void)state;
	for (i = 0; i < sizeof table / sizeof table[0]; i++) {
		struct ow_material m = resin(table[i][0], table[i][1]);
		struct ow_solids s;
		double theta;

		prepare(&sc, &m, &s);
		assert_rel(s.k, table[i][2], 2e-5);
		if (table[i][3] > 0.0)
			assert_rel(s.m1, table[i][3], 2e-5);
		else
			assert_abs(s.m1, 0.0, 1e-15);
		assert_int_equal(ow_solids_theta_free(&s, &theta, NULL), OW_OK);
		assert_abs(theta / DEG, table[i][4], 1e-3);
		if (table[i][6] > 0.0) {
			assert_rel(ow_solids_plug_speed(&s, theta), table[i][5],
			           1e-3);
			assert_rel(ow_solids_mass_flow(&s, theta) * 3600.0,
			           table[i][6], 1e-3);
		} else { /* theta < 0: the plug does not convey */
			assert_true(ow_solids_mass_flow(&s, theta) == 0.0);
			assert_true(ow_solids_max_flow(&s) == 0.0);
		}
	}
}

/* With f_s = 0 and no pressure rise K = tan(phi_b), M = 0, so
 * theta = 90 deg - phi_b exactly and V_pl = V_b sin(phi_b) cos(phi_b):
 * the barrel slips normal to the channel (Tadmor & Klein 1970, ch. 8,
 * limit derived analytically). */
static void frictionless_screw_gives_theta_ninety_minus_helix(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.0);
	struct ow_solids s;
	double theta, phi = atan(1.0 / PI), vb = PI * 63.5e-3;

	(void)state;
	prepare(&sc, &m, &s);
	assert_int_equal(ow_solids_theta_free(&s, &theta, NULL), OW_OK);
	assert_abs(theta, (PI / 2.0 - phi), 1e-12);
	assert_abs(theta / DEG, 72.3432, 1e-4); /* recomputed */
	assert_rel(ow_solids_plug_speed(&s, theta), vb * sin(phi) * cos(phi),
	           1e-12);
	assert_rel(ow_solids_slip_speed(&s, theta), vb * sin(phi), 1e-12);
}

/* A = pi H (D_b - H) - p e H / sin(phi_mean) = 1.4271e-3 m2 (Darnell & Mol
 * 1956 in the Tadmor & Klein 1970 form, recomputed). */
static void free_area_matches_darnell_mol_geometry(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids s;

	(void)state;
	prepare(&sc, &m, &s);
	assert_rel(s.area_m2, 1.4271e-3, 1e-4);
	assert_rel(s.barrel_speed_m_s, 0.19949, 1e-4); /* V_b = pi D_b N */
}

/* f_b = 0.5, f_s = 0.25: theta 2 deg below the zero-gradient angle gives
 * beta = 1.9915 1/m, P2/P1 = 8.04 over five turns (z_b = 1.0468 m)
 * (Tadmor & Klein 1970, ch. 8, recomputed). */
static void pressure_rises_exponentially_below_free_angle(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids s;
	double theta0, theta, back, zb, beta;

	(void)state;
	prepare(&sc, &m, &s);
	assert_int_equal(ow_solids_theta_free(&s, &theta0, NULL), OW_OK);
	theta = theta0 - 2.0 * DEG;
	assert_abs(theta / DEG, 34.247, 1e-3);
	beta = ow_solids_beta(&s, theta);
	assert_rel(beta, 1.9915, 1e-4);
	zb = 5.0 * PI * 63.5e-3 / cos(s.helix_rad); /* five turns at bore */
	assert_rel(zb, 1.0468, 1e-4);
	assert_rel(exp(beta * zb), 8.04, 1e-3);
	/* the angle equation with that rise returns the same angle */
	assert_int_equal(ow_solids_theta(&s, beta * zb, zb, &back, NULL),
	                 OW_OK);
	assert_abs(back, theta, 1e-12);
	assert_abs(ow_solids_beta(&s, theta0), 0.0, 1e-12);
}

static void theta_for_inverts_the_mass_flow(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids s;
	double g, theta;

	(void)state;
	prepare(&sc, &m, &s);
	for (g = 0.0; g < 0.04; g += 0.0037) { /* up to 144 kg/h */
		assert_int_equal(ow_solids_theta_for(&s, g, &theta, NULL),
		                 OW_OK);
		assert_abs(ow_solids_mass_flow(&s, theta), g, 1e-12);
	}
	/* the table's 33.5 kg/h row at f_b = f_s = 0.3 reversed */
	m = resin(0.3, 0.3);
	prepare(&sc, &m, &s);
	assert_int_equal(ow_solids_theta_for(&s, 33.475 / 3600.0, &theta, NULL),
	                 OW_OK);
	assert_abs(theta / DEG, 4.699, 2e-3);
}

/* The feed limit is the flow at the zero-gradient angle, 113.7 kg/h for
 * f_b = 0.5, f_s = 0.25 (Tadmor & Klein 1970 ch. 8, recomputed); above it
 * beta < 0 and the point is feed limited, below it the pressure rises. */
static void feed_limit_flags_flows_above_zero_gradient(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids s;
	struct ow_solids_out o;
	double gmax;

	(void)state;
	prepare(&sc, &m, &s);
	gmax = ow_solids_max_flow(&s);
	assert_rel(gmax * 3600.0, 113.7, 1e-3);
	assert_int_equal(ow_solids_eval(&s, 0.9 * gmax, &o, NULL), OW_OK);
	assert_false(o.feed_limited);
	assert_true(o.beta_1_m > 0.0);
	assert_true(o.max_flow_kg_s == gmax);
	assert_int_equal(ow_solids_eval(&s, 1.1 * gmax, &o, NULL), OW_OK);
	assert_true(o.feed_limited);
	assert_true(o.beta_1_m < 0.0);
	/* beyond the kinematic maximum: still a flag, not an error */
	assert_int_equal(ow_solids_eval(&s, 1.0, &o, NULL), OW_OK);
	assert_true(o.feed_limited);
	assert_abs(o.theta_rad, PI / 2.0, 1e-15);
	assert_int_equal(ow_solids_theta_for(&s, 1.0, &o.theta_rad, NULL),
	                 OW_ECOMPUTE);
}

/* Slip power f_b P W_b V_slip; a plug at rest slips at the full V_b. */
static void barrel_friction_power_uses_slip_speed(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids s;
	double theta = 30.0 * DEG, vpl, vsz, vslip;

	(void)state;
	prepare(&sc, &m, &s);
	/* independent form: barrel V_b minus plug V_pl / sin(phi_b)
	 * down-channel, by the law of cosines */
	vpl = ow_solids_plug_speed(&s, theta);
	vsz = vpl / sin(s.helix_rad);
	vslip = sqrt(s.barrel_speed_m_s * s.barrel_speed_m_s + vsz * vsz -
	             2.0 * s.barrel_speed_m_s * vsz * cos(s.helix_rad));
	assert_rel(ow_solids_slip_speed(&s, theta), vslip, 1e-12);
	assert_rel(ow_solids_barrel_power(&s, theta, 1e6),
	           0.5 * 1e6 * s.width_m * vslip, 1e-12);
	assert_rel(ow_solids_slip_speed(&s, 0.0), s.barrel_speed_m_s, 1e-15);
}

static void bad_inputs_are_rejected_with_the_field_named(void **state)
{
	struct ow_screw sc = screw_63();
	struct ow_material m = resin(0.5, 0.25);
	struct ow_solids_in in = {&sc, 40e-3, 1.0, &m};
	struct ow_solids s;
	struct ow_diag d = {""};

	(void)state;
	assert_int_equal(ow_solids_prepare(&in, &s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "feed depth"));
	in.depth_m = 9.4e-3;
	m.friction_barrel = 0.0;
	ow_diag_clear(&d);
	assert_int_equal(ow_solids_prepare(&in, &s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "friction_barrel"));
	m = resin(0.5, 4.0); /* flight force diverges */
	ow_diag_clear(&d);
	assert_int_equal(ow_solids_prepare(&in, &s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "friction_screw"));
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(
	        conveying_angle_and_output_follow_darnell_mol_table),
	    cmocka_unit_test(frictionless_screw_gives_theta_ninety_minus_helix),
	    cmocka_unit_test(free_area_matches_darnell_mol_geometry),
	    cmocka_unit_test(pressure_rises_exponentially_below_free_angle),
	    cmocka_unit_test(theta_for_inverts_the_mass_flow),
	    cmocka_unit_test(feed_limit_flags_flows_above_zero_gradient),
	    cmocka_unit_test(barrel_friction_power_uses_slip_speed),
	    cmocka_unit_test(bad_inputs_are_rejected_with_the_field_named),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
