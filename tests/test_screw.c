/* test_screw.c - screw geometry against published identities. */
#include "testutil.h"

#include <string.h>

#include "ow_advise.h"
#include "ow_screw.h"

static double deg(double rad)
{
	return rad * 180.0 / OW_PI;
}

/* Square pitch: tan(phi) = L_s/(pi D) = 1/pi -> 17.6568 deg (Tadmor &
 * Gogos 2006, ch. 9 geometry; "standard" screws quoted at 17.66 deg as
 * common practice). Widths W = L_s cos(phi) - e recomputed at barrel, mean
 * and root diameter for H = 9.4 mm. */
static void screw_helix_and_widths_follow_unwound_channel(void **state)
{
	struct ow_screw s;
	(void)state;
	ow_test_square_pitch_screw(&s, 0.0094);
	assert_abs(deg(ow_screw_helix(&s, 0.0635)), 17.6568, 1e-4);
	assert_abs(ow_screw_width(&s, 0.0635) * 1e3, 54.1585, 1e-4);
	assert_abs(deg(ow_screw_helix(&s, 0.0541)), 20.4865, 1e-4);
	assert_abs(ow_screw_width(&s, 0.0541) * 1e3, 53.1339, 1e-4);
	assert_abs(deg(ow_screw_helix(&s, 0.0447)), 24.3318, 1e-4);
	assert_abs(ow_screw_width(&s, 0.0447) * 1e3, 51.5096, 1e-4);
}

/* Identity pi D sin(phi) = L_s cos(phi) (Tadmor & Klein 1970): the width
 * from the circumference form equals the lead form at any diameter. */
static void screw_width_identity_holds_at_any_diameter(void **state)
{
	struct ow_screw s;
	double D;
	(void)state;
	ow_test_square_pitch_screw(&s, 0.005);
	for (D = 0.03; D <= 0.0635; D += 0.005) {
		double phi = ow_screw_helix(&s, D);
		assert_rel(ow_screw_width(&s, D),
		           OW_PI * D * sin(phi) - s.flight_width_m, 1e-12);
	}
}

/* Down-channel length Z = L / sin(phi): 24 D of the square-pitch screw is
 * 5.0245 m at the barrel, 0.20935 m per turn (recomputed from the identity
 * of Tadmor & Klein 1970). */
static void screw_down_channel_length_of_24_turns(void **state)
{
	struct ow_screw s;
	double phi;
	(void)state;
	ow_test_square_pitch_screw(&s, 0.005);
	phi = ow_screw_helix(&s, s.diameter_m);
	assert_abs(ow_screw_length(&s) / sin(phi), 5.0245, 1e-4);
	assert_abs(OW_PI * s.diameter_m / cos(phi), 0.20935, 1e-5);
}

static void three_section_screw(struct ow_screw *s, double taper_D)
{
	double D = 0.0635;
	ow_test_square_pitch_screw(s, 0.0094);
	s->n_sections = 3;
	s->sections[0] = (struct ow_section){
	    .type = OW_SEC_FEED, .length_m = 6 * D, .depth_m = 0.0094};
	s->sections[1] = (struct ow_section){
	    .type = OW_SEC_TAPER, .length_m = taper_D * D, .depth_m = 0.003175};
	s->sections[2] = (struct ow_section){.type = OW_SEC_METERING,
	                                     .length_m = (24 - taper_D) * D,
	                                     .depth_m = 0.003175};
	assert_int_equal(ow_screw_prepare(s, NULL), OW_OK);
}

/* Compression: depth ratio 9.4/3.175 = 2.9606, cross-section ratio
 * H_f(D-H_f)/(H_m(D-H_m)) = 2.6551 (Tadmor & Gogos 2006 ch. 9 definitions,
 * recomputed). Depth along a taper is linear. */
static void screw_compression_ratios_and_taper_depth(void **state)
{
	struct ow_screw s;
	double D = 0.0635;
	(void)state;
	three_section_screw(&s, 8);
	assert_abs(ow_screw_compression_depth(&s), 2.9606, 1e-4);
	assert_abs(ow_screw_compression_area(&s), 2.6551, 1e-4);
	assert_rel(ow_screw_depth(&s, 10 * D), 0.5 * (0.0094 + 0.003175),
	           1e-12);
	assert_rel(ow_screw_depth(&s, 3 * D), 0.0094, 1e-12);
	assert_rel(ow_screw_depth(&s, 20 * D), 0.003175, 1e-12);
	assert_rel(ow_screw_ld(&s), 30.0, 1e-12);
	assert_int_equal(ow_screw_section_at(&s, 7 * D), 1);
}

/* Free area of the feed channel, pi H (D - H) - e H / sin(phi_mean):
 * 1.4271e-3 m^2 for H = 9.4 mm (Darnell & Mol 1956 in the Tadmor-Klein
 * form, recomputed). */
static void screw_free_area_of_feed_channel(void **state)
{
	struct ow_screw s;
	(void)state;
	ow_test_square_pitch_screw(&s, 0.0094);
	assert_abs(ow_screw_free_area(&s, 0.01), 1.4271e-3, 1e-7);
}

static void screw_wear_raises_clearance_only_where_worn(void **state)
{
	struct ow_screw s;
	double D = 0.0635;
	(void)state;
	three_section_screw(&s, 8);
	s.n_wear = 1;
	s.wear[0] = (struct ow_wear){12 * D, 24 * D, 0.0005};
	assert_int_equal(ow_screw_prepare(&s, NULL), OW_OK);
	assert_rel(ow_screw_clearance(&s, 5 * D), 0.0000635, 1e-12);
	assert_rel(ow_screw_clearance(&s, 15 * D), 0.0005, 1e-12);
}

static void screw_rejects_impossible_geometry(void **state)
{
	struct ow_screw s;
	struct ow_diag d = {{0}};
	(void)state;
	three_section_screw(&s, 8);
	s.sections[2].depth_m = 0.04; /* deeper than the radius */
	assert_int_equal(ow_screw_prepare(&s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "sections[2].depth"));

	three_section_screw(&s, 8);
	ow_diag_clear(&d);
	s.clearance_m = 0.004; /* above the metering depth */
	assert_int_equal(ow_screw_prepare(&s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "clearance"));

	three_section_screw(&s, 8);
	ow_diag_clear(&d);
	s.flight_width_m = 0.07; /* wider than the lead */
	assert_int_equal(ow_screw_prepare(&s, &d), OW_EINPUT);
	assert_non_null(strstr(d.msg, "flight_width"));
}

static int has(const struct ow_warning *w, int n, const char *code)
{
	int i;
	for (i = 0; i < n; i++)
		if (!strcmp(w[i].code, code))
			return 1;
	return 0;
}

/* Rules of thumb (common practice): compression over less than 1 D; worn
 * above twice 0.001 D; feed depth 0.1..0.25 D. */
static void advise_flags_abrupt_compression_and_wear(void **state)
{
	struct ow_screw s;
	struct ow_warning w[OW_MAX_WARNINGS];
	int n;
	(void)state;
	three_section_screw(&s, 8);
	n = ow_advise_screw(&s, w, OW_MAX_WARNINGS);
	assert_false(has(w, n, "abrupt_compression"));
	assert_false(has(w, n, "worn"));
	three_section_screw(&s, 0.75);
	s.n_wear = 1;
	s.wear[0] = (struct ow_wear){0.2, 0.5, 0.0005};
	assert_int_equal(ow_screw_prepare(&s, NULL), OW_OK);
	n = ow_advise_screw(&s, w, OW_MAX_WARNINGS);
	assert_true(has(w, n, "abrupt_compression"));
	assert_true(has(w, n, "worn"));
	assert_non_null(strstr(w[0].text, "rule of thumb"));
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(screw_helix_and_widths_follow_unwound_channel),
	    cmocka_unit_test(screw_width_identity_holds_at_any_diameter),
	    cmocka_unit_test(screw_down_channel_length_of_24_turns),
	    cmocka_unit_test(screw_compression_ratios_and_taper_depth),
	    cmocka_unit_test(screw_free_area_of_feed_channel),
	    cmocka_unit_test(screw_wear_raises_clearance_only_where_worn),
	    cmocka_unit_test(screw_rejects_impossible_geometry),
	    cmocka_unit_test(advise_flags_abrupt_compression_and_wear),
	};
	return cmocka_run_group_tests(tests, NULL, NULL);
}
