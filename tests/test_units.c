/* test_units.c - quantities with units to SI, and the display systems.
 *
 * Conversion factors are those of NIST Special Publication 811 (2008),
 * "Guide for the Use of the International System of Units", Appendix B.8
 * (factors in alphabetical order) and B.9 (by kind of quantity); values
 * printed there to 7 figures are checked to that precision, exact factors
 * (inch, pound, and those defined from them) to 1e-9 relative. */
#include "testutil.h"

#include <locale.h>
#include <stdio.h>
#include <string.h>

#include "ow_units.h"

static struct ow_units *units; /* one database for the whole program */

static int load_units(void **state)
{
	(void)state;
	return ow_units_create(&units, NULL) == OW_OK ? 0 : -1;
}

static int free_units(void **state)
{
	(void)state;
	ow_units_destroy(units);
	units = NULL;
	return 0;
}

/* SI value of text as dim; fails the test on an error. */
static double si_of(const char *text, enum ow_dim dim, double diameter_m)
{
	struct ow_diag d = {""};
	double si = NAN;

	if (ow_units_parse(units, text, dim, diameter_m, &si, &d) != OW_OK)
		fail_msg("\"%s\" rejected: %s", text, d.msg);
	return si;
}

/* text must be rejected as dim with OW_EINPUT and a message holding want. */
static void rejected(const char *text, enum ow_dim dim, const char *want)
{
	struct ow_diag d = {""};
	double si = 12345.0;

	if (ow_units_parse(units, text, dim, 0.0, &si, &d) != OW_EINPUT)
		fail_msg("\"%s\" accepted as %g", text, si);
	if (!strstr(d.msg, want))
		fail_msg("message for \"%s\" lacks \"%s\": %s", text, want,
		         d.msg);
	assert_true(si == 12345.0); /* the output is left alone */
}

static void rpm_means_revolutions_per_minute(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.8: revolution per minute = 2 pi rad / 60 s;
	 * one revolution = 2 pi rad. The internal unit is rev/min. */
	assert_rel(si_of("60 rpm", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
	assert_rel(si_of("1 rev/s", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
	assert_rel(si_of("60 r/min", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
	assert_rel(si_of("60 rev/min", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
	assert_rel(si_of("1 Hz", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
	/* 6.283185 rad/s = 0.99999997 rev/s (2 pi rad per turn, recomputed) */
	assert_rel(si_of("6.283185 rad/s", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-6);
	assert_rel(si_of("360 degree/s", OW_DIM_ROT_SPEED, 0.0), 60.0, 1e-12);
}

static void fahrenheit_and_celsius_convert_with_their_offsets(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.9: T/K = (t/degF + 459.67)/1.8;
	 * 200 degF = 366.483 K (recomputed) */
	assert_rel(si_of("200 degF", OW_DIM_TEMPERATURE, 0.0), 366.483, 1e-6);
	assert_rel(si_of("200 °F", OW_DIM_TEMPERATURE, 0.0),
	           (200.0 + 459.67) / 1.8, 1e-12);
	/* NIST SP 811 (2008) B.9: T/K = t/degC + 273.15 */
	assert_rel(si_of("200 degC", OW_DIM_TEMPERATURE, 0.0), 473.15, 1e-12);
	assert_rel(si_of("200 °C", OW_DIM_TEMPERATURE, 0.0), 473.15, 1e-12);
	assert_rel(si_of("473.15 K", OW_DIM_TEMPERATURE, 0.0), 473.15, 1e-12);
	/* NIST SP 811 (2008) B.8: degree Rankine = 5/9 K */
	assert_rel(si_of("851.67 degR", OW_DIM_TEMPERATURE, 0.0), 473.15,
	           1e-12);
}

static void temperature_differences_drop_the_offset(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.9: a difference of 1 degF is 1/1.8 K, of
	 * 1 degC is 1 K: +18 degF = 10 K (recomputed) */
	assert_rel(si_of("+18 degF", OW_DIM_TEMP_DIFF, 0.0), 10.0, 1e-12);
	assert_rel(si_of("-20 K", OW_DIM_TEMP_DIFF, 0.0), -20.0, 1e-12);
	assert_rel(si_of("30 degC", OW_DIM_TEMP_DIFF, 0.0), 30.0, 1e-12);
	assert_rel(si_of("-9 °F", OW_DIM_TEMP_DIFF, 0.0), -5.0, 1e-12);
}

static void inches_thou_and_micrometres_are_lengths(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.8: 1 in = 0.0254 m exactly -> 7.62 mm */
	assert_rel(si_of("0.300 in", OW_DIM_LENGTH, 0.0), 0.00762, 1e-9);
	/* NIST SP 811 (2008) B.8: 1 mil (thou) = 2.54e-5 m exactly */
	assert_rel(si_of("1 thou", OW_DIM_LENGTH, 0.0), 25.4e-6, 1e-9);
	assert_rel(si_of("25.4 µm", OW_DIM_LENGTH, 0.0), 25.4e-6, 1e-9);
	assert_rel(si_of("63.5 mm", OW_DIM_LENGTH, 0.0), 0.0635, 1e-12);
}

static void diameters_need_the_screw_diameter(void **state)
{
	struct ow_diag d = {""};
	double si;

	(void)state;
	/* a length in diameters: 8 x 63.5 mm = 0.508 m (arithmetic) */
	assert_rel(si_of("8 D", OW_DIM_LENGTH, 0.0635), 0.508, 1e-12);
	assert_rel(si_of("8D", OW_DIM_LENGTH, 0.0635), 0.508, 1e-12);
	rejected("8 D", OW_DIM_LENGTH, "needs the screw diameter");
	assert_int_equal(
	    ow_units_convert(units, 8.0, "D", OW_DIM_LENGTH, &si, &d),
	    OW_EINPUT);
	/* "D" is a diameter only for lengths */
	rejected("8 D", OW_DIM_PRESSURE, "unknown unit");
}

static void pressures_and_flows_convert_from_trade_units(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.8: psi = 6.894757e3 Pa; 5000 psi = 34.4738 MPa
	 * (recomputed) */
	assert_rel(si_of("5000 psi", OW_DIM_PRESSURE, 0.0), 34.4738e6, 1e-6);
	/* exact: 1 psi = 0.45359237 kg x 9.80665 m/s2 / (0.0254 m)^2,
	 * NIST SP 811 (2008) B.8 (pound, standard gravity, inch) */
	assert_rel(si_of("1 psi", OW_DIM_PRESSURE, 0.0),
	           0.45359237 * 9.80665 / (0.0254 * 0.0254), 1e-9);
	assert_rel(si_of("350 bar", OW_DIM_PRESSURE, 0.0), 35e6, 1e-12);
	/* NIST SP 811 (2008) B.8: 1 lb = 0.45359237 kg; 800 lb/h =
	 * 0.100798 kg/s (recomputed; to half a unit of its last digit) */
	assert_rel(si_of("800 lb/h", OW_DIM_MASS_FLOW, 0.0), 0.100798, 5e-6);
	assert_rel(si_of("800 lbs/h", OW_DIM_MASS_FLOW, 0.0),
	           800.0 * 0.45359237 / 3600.0, 1e-9);
	assert_rel(si_of("50 kg/h", OW_DIM_MASS_FLOW, 0.0), 50.0 / 3600.0,
	           1e-12);
}

static void material_properties_take_compound_units(void **state)
{
	(void)state;
	/* SI prefixes (BIPM SI Brochure, 9th ed., 2019, table 7) */
	assert_rel(si_of("2.3 kJ/(kg K)", OW_DIM_SPECIFIC_HEAT, 0.0), 2300.0,
	           1e-12);
	assert_rel(si_of("28 kJ/mol", OW_DIM_MOLAR_ENERGY, 0.0), 28000.0,
	           1e-12);
	assert_rel(si_of("9000 Pa s", OW_DIM_VISCOSITY, 0.0), 9000.0, 1e-12);
	assert_rel(si_of("760 kg/m3", OW_DIM_DENSITY, 0.0), 760.0, 1e-12);
	assert_rel(si_of("0.18 W/(m K)", OW_DIM_CONDUCTIVITY, 0.0), 0.18,
	           1e-12);
	/* NIST SP 811 (2008) B.8: Btu_IT/(lb degF) = 4.1868e3 J/(kg K),
	 * exact; a degree in a compound unit is an interval */
	assert_rel(si_of("1 BTU/(lb degF)", OW_DIM_SPECIFIC_HEAT, 0.0), 4186.8,
	           1e-9);
	assert_rel(si_of("1 kJ/(kg degC)", OW_DIM_SPECIFIC_HEAT, 0.0), 1000.0,
	           1e-12);
	assert_rel(si_of("100 1/s", OW_DIM_SHEAR_RATE, 0.0), 100.0, 1e-12);
	assert_rel(si_of("2 min", OW_DIM_TIME, 0.0), 120.0, 1e-12);
}

static void kilowatt_hours_are_energies(void **state)
{
	(void)state;
	/* NIST SP 811 (2008) B.8: kW h = 3.6e6 J exactly: 0.2 kWh/kg =
	 * 720000 J/kg (recomputed) */
	assert_rel(si_of("0.2 kWh/kg", OW_DIM_SPECIFIC_ENERGY, 0.0), 720000.0,
	           1e-9);
	assert_rel(si_of("1 Wh/kg", OW_DIM_SPECIFIC_ENERGY, 0.0), 3600.0, 1e-9);
	/* torque and energy share a dimension: N m and J both accepted */
	assert_rel(si_of("4.8 kN m", OW_DIM_TORQUE, 0.0), 4800.0, 1e-12);
	assert_rel(si_of("1 kWh", OW_DIM_TORQUE, 0.0), 3.6e6, 1e-9);
	/* NIST SP 811 (2008) B.8: horsepower (550 ft lbf/s) = 745.69987... W;
	 * exact from ft = 0.3048 m and lbf = 4.4482216152605 N */
	assert_rel(si_of("1 hp", OW_DIM_POWER, 0.0),
	           550.0 * 0.3048 * 4.4482216152605, 1e-9);
	/* NIST SP 811 (2008) B.8: pound-force foot = 1.355818 N m */
	assert_rel(si_of("1 lbf ft", OW_DIM_TORQUE, 0.0), 1.355818, 1e-6);
}

static void percent_is_a_fraction(void **state)
{
	(void)state;
	/* per cent = 0.01 (BIPM SI Brochure, 9th ed., 2019, 5.4.7) */
	assert_rel(si_of("0.5 %", OW_DIM_NONE, 0.0), 0.005, 1e-12);
	assert_rel(si_of("45%", OW_DIM_NONE, 0.0), 0.45, 1e-12);
	assert_rel(si_of("0.45", OW_DIM_NONE, 0.0), 0.45, 1e-15);
	assert_rel(si_of("  -1.5e-3 ", OW_DIM_NONE, 0.0), -1.5e-3, 1e-15);
}

static void consistency_takes_a_pressure_times_seconds_to_the_n(void **state)
{
	(void)state;
	/* power law tau = K gdot^n (Ostwald 1925; de Waele 1923): K in
	 * Pa s^n; kPa = 1000 Pa (SI prefix) */
	assert_rel(si_of("20 kPa s^0.4", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	assert_rel(si_of("20000 Pa s^0.41", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	assert_rel(si_of("20 kPa s^n", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	assert_rel(si_of("20000 Pa.s^n", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	assert_rel(si_of("20000 Pa·sⁿ", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	assert_rel(si_of("20 kPa*s**(0.35)", OW_DIM_CONSISTENCY, 0.0), 20000.0,
	           1e-12);
	/* 1 psi = 6894.757293168 Pa (NIST SP 811 (2008) B.8, exact) */
	assert_rel(si_of("2 psi s^n", OW_DIM_CONSISTENCY, 0.0),
	           2.0 * 6894.757293168, 1e-9);
	rejected("20 kPa min^n", OW_DIM_CONSISTENCY, "must be seconds");
	rejected("20 kPa s^x", OW_DIM_CONSISTENCY, "power of s");
	rejected("20 kg s^n", OW_DIM_CONSISTENCY, "measures something else");
}

/* The power written in the unit, for checking it against the index. */
static void consistency_power_is_read_from_the_unit(void **state)
{
	double n = -1.0;

	(void)state;
	assert_int_equal(ow_units_consistency_power("20000 Pa s^0.41", &n), 1);
	assert_rel(n, 0.41, 1e-15);
	assert_int_equal(ow_units_consistency_power("20 kPa*s**(0.35)", &n), 1);
	assert_rel(n, 0.35, 1e-15);
	assert_int_equal(ow_units_consistency_power("8000 Pa s", &n), 1);
	assert_rel(n, 1.0, 1e-15); /* tau = K gdot: the first power */
	assert_int_equal(ow_units_consistency_power("20 kPa s^n", &n), 0);
	assert_int_equal(ow_units_consistency_power("20000 Pa·sⁿ", &n), 0);
}

/* A text filling the whole 256-byte buffer: every check stays inside it
 * (an ASan build reads past the end otherwise), and punctuation no unit
 * uses never reaches UDUNITS-2. */
static void a_text_as_long_as_the_buffer_is_read_within_it(void **state)
{
	char text[256];

	(void)state;
	memset(text, 'P', sizeof text - 1);
	memcpy(text, "8000 ", 5);
	text[sizeof text - 1] = '\0';
	rejected(text, OW_DIM_CONSISTENCY, "unknown unit");
	rejected(text, OW_DIM_LENGTH, "unknown unit");
	rejected("5 m @ x", OW_DIM_LENGTH, "unknown unit");
	rejected("5 mm!", OW_DIM_LENGTH, "unknown unit");
	rejected("5 m\xff", OW_DIM_LENGTH, "unknown unit");
}

static void inputs_without_a_unit_or_number_are_refused(void **state)
{
	(void)state;
	rejected("200", OW_DIM_LENGTH, "missing unit");
	rejected("", OW_DIM_LENGTH, "no value");
	rejected("   ", OW_DIM_LENGTH, "no value");
	rejected("mm", OW_DIM_LENGTH, "no number");
	rejected("63.5 mm junk", OW_DIM_LENGTH, "unknown unit");
	rejected("63.5 mm 2", OW_DIM_LENGTH, "a number inside the unit");
}

static void units_of_the_wrong_kind_say_what_was_expected(void **state)
{
	(void)state;
	rejected("12 furlongs/fortnight", OW_DIM_PRESSURE,
	         "expected a pressure such as \"35 MPa\" or \"5000 psi\"");
	rejected("63.5 kg", OW_DIM_LENGTH,
	         "expected a length such as \"63.5 mm\"");
	rejected("200 mm", OW_DIM_TEMPERATURE, "measures something else");
	rejected("1 K", OW_DIM_SPECIFIC_HEAT, "specific heat");
}

static void non_finite_numbers_are_refused(void **state)
{
	(void)state;
	rejected("nan mm", OW_DIM_LENGTH, "not a finite number");
	rejected("inf psi", OW_DIM_PRESSURE, "not a finite number");
	rejected("-Infinity K", OW_DIM_TEMPERATURE, "not a finite number");
	rejected("1e999 mm", OW_DIM_LENGTH, "not a finite number");
	rejected("1e306 km", OW_DIM_LENGTH, "out of range");
}

static void farad_and_coulomb_point_to_degf_and_degc(void **state)
{
	(void)state;
	rejected("200 F", OW_DIM_TEMPERATURE, "use degF (F is the farad)");
	rejected("200 C", OW_DIM_TEMPERATURE, "use degC");
	rejected("18 F", OW_DIM_TEMP_DIFF, "use degF");
	rejected("0.55 BTU/(lb F)", OW_DIM_SPECIFIC_HEAT, "use degF");
}

static void convert_applies_the_same_rules_to_a_number(void **state)
{
	struct ow_diag d = {""};
	double si = 0.0;

	(void)state;
	/* NIST SP 811 (2008) B.9; 200 degF = 366.483 K (recomputed) */
	assert_int_equal(ow_units_convert(units, 200.0, " degF ",
	                                  OW_DIM_TEMPERATURE, &si, &d),
	                 OW_OK);
	assert_rel(si, 366.483, 1e-6);
	assert_int_equal(
	    ow_units_convert(units, 1.0, "", OW_DIM_LENGTH, &si, &d),
	    OW_EINPUT);
	assert_non_null(strstr(d.msg, "missing unit"));
	assert_int_equal(
	    ow_units_convert(units, NAN, "mm", OW_DIM_LENGTH, &si, NULL),
	    OW_EINPUT);
	assert_int_equal(
	    ow_units_convert(units, 1.0, "mm", OW_DIM_COUNT, &si, NULL),
	    OW_EARG);
	assert_int_equal(
	    ow_units_parse(NULL, "1 mm", OW_DIM_LENGTH, 0.0, &si, NULL),
	    OW_EARG);
}

static int back_to_c_locale(void **state)
{
	(void)state;
	setlocale(LC_NUMERIC, "C");
	return 0;
}

static void plain_numbers_read_a_point_whatever_the_locale(void **state)
{
	double x = 0.0, hp, rad, lb = 0.0;
	struct ow_units *other = NULL;
	enum ow_status st;

	(void)state;
	assert_int_equal(ow_units_parse_number(" 0.45 ", &x, NULL), OW_OK);
	assert_rel(x, 0.45, 1e-15);
	assert_int_equal(ow_units_parse_number("2 mm", &x, NULL), OW_EINPUT);
	assert_int_equal(ow_units_parse_number("nan", &x, NULL), OW_EINPUT);
	assert_int_equal(ow_units_parse_number("1e999", &x, NULL), OW_EINPUT);
	assert_int_equal(ow_units_parse_number("", &x, NULL), OW_EINPUT);
	assert_int_equal(ow_units_parse_number("0,45", &x, NULL), OW_EINPUT);
	if (!setlocale(LC_NUMERIC, "de_DE.UTF-8") &&
	    !setlocale(LC_NUMERIC, "fr_FR.UTF-8"))
		skip(); /* no locale with a decimal comma installed */
	assert_int_equal(ow_units_parse_number("0.45", &x, NULL), OW_OK);
	/* UDUNITS-2 reads numbers with strtod: these hold numbers inside */
	hp = si_of("1.5 hp", OW_DIM_POWER, 0.0);
	rad = si_of("6.283185 rad/s", OW_DIM_ROT_SPEED, 0.0);
	/* and so does its database ("0.45359237 kg" for the pound) */
	assert_int_equal(ow_units_create(&other, NULL), OW_OK);
	st = ow_units_parse(other, "3600 lb/h", OW_DIM_MASS_FLOW, 0.0, &lb,
	                    NULL);
	ow_units_destroy(other);
	assert_int_equal(st, OW_OK);
	setlocale(LC_NUMERIC, "C");
	assert_rel(x, 0.45, 1e-15);
	/* NIST SP 811 (2008) B.8: hp = 550 ft lbf/s, ft = 0.3048 m */
	assert_rel(hp, 1.5 * 550.0 * 0.3048 * 4.4482216152605, 1e-9);
	assert_rel(rad, 60.0, 1e-6);       /* one turn = 2 pi rad */
	assert_rel(lb, 0.45359237, 1e-12); /* NIST SP 811 (2008) B.8 */
}

/* The commonest units convert by exact factors without the UDUNITS-2
 * database: each agrees with UDUNITS-2 itself, reached through a spelling
 * the shortcut does not know, and the inch and degF with NIST SP 811
 * (2008) B.8 (1 in = 0.0254 m exactly; T/K = (t/degF + 459.67) / 1.8). */
static void common_units_agree_with_udunits_and_nist(void **state)
{
	static const struct {
		const char *fast, *slow;
		enum ow_dim dim;
	} pair[] = {
	    {"3.5 in", "3.5 inch", OW_DIM_LENGTH},
	    {"63.5 mm", "63.5 millimeter", OW_DIM_LENGTH},
	    {"200 degC", "200 °C", OW_DIM_TEMPERATURE},
	    {"392 degF", "392 °F", OW_DIM_TEMPERATURE},
	    {"+18 degF", "+18 °F", OW_DIM_TEMP_DIFF},
	    {"-20 K", "-20 kelvin", OW_DIM_TEMP_DIFF},
	    {"35 MPa", "35 megapascal", OW_DIM_PRESSURE},
	    {"2.3 kJ/(kg K)", "2.3 kJ/kg/K", OW_DIM_SPECIFIC_HEAT},
	    {"0.25 W/(m K)", "0.25 W/m/K", OW_DIM_CONDUCTIVITY},
	    {"760 kg/m3", "760 kg/m^3", OW_DIM_DENSITY},
	    {"50 kg/h", "50 kg/hour", OW_DIM_MASS_FLOW},
	    {"28 kJ/mol", "28 kilojoule/mol", OW_DIM_MOLAR_ENERGY},
	    {"200 kJ/kg", "200 kilojoule/kg", OW_DIM_SPECIFIC_ENERGY},
	    {"9000 Pa s", "9000 Pa.s", OW_DIM_VISCOSITY},
	    {"30 kW", "30 kilowatt", OW_DIM_POWER},
	    {"4.8 kN m", "4.8 kilonewton m", OW_DIM_TORQUE},
	    {"0.5 %", "0.5 percent", OW_DIM_NONE},
	    {"2000 W/(m2 K)", "2000 W/m^2/K", OW_DIM_HEAT_TRANSFER},
	};
	size_t i;

	(void)state;
	for (i = 0; i < sizeof pair / sizeof pair[0]; i++) {
		double a = si_of(pair[i].fast, pair[i].dim, 0.0);
		double b = si_of(pair[i].slow, pair[i].dim, 0.0);

		if (fabs(a - b) > 1e-14 * fabs(b))
			fail_msg("\"%s\" = %.17g but \"%s\" = %.17g",
			         pair[i].fast, a, pair[i].slow, b);
	}
	assert_true(si_of("1 in", OW_DIM_LENGTH, 0.0) == 0.0254);
	assert_rel(si_of("392 degF", OW_DIM_TEMPERATURE, 0.0),
	           (392.0 + 459.67) / 1.8, 1e-15);
}

static void every_example_in_the_expectations_parses(void **state)
{
	char ex[128];
	const char *p, *q;
	int dim, n;

	(void)state;
	for (dim = 0; dim < OW_DIM_COUNT; dim++) {
		p = ow_dim_expect((enum ow_dim)dim);
		for (n = 0; (p = strchr(p, '"')) && (q = strchr(p + 1, '"'));
		     n++, p = q + 1) {
			snprintf(ex, sizeof ex, "%.*s", (int)(q - p - 1),
			         p + 1);
			assert_true(
			    isfinite(si_of(ex, (enum ow_dim)dim, 0.0635)));
		}
		assert_true(n >= 1);
	}
}

/* A representative SI value of each dimension (a 63.5 mm extruder). */
static const double sample_si[OW_DIM_COUNT] = {
    [OW_DIM_NONE] = 0.45,
    [OW_DIM_LENGTH] = 0.0635,
    [OW_DIM_TEMPERATURE] = 473.15,
    [OW_DIM_TEMP_DIFF] = 10.0,
    [OW_DIM_PRESSURE] = 35e6,
    [OW_DIM_MASS_FLOW] = 0.0139,
    [OW_DIM_ROT_SPEED] = 60.0,
    [OW_DIM_DENSITY] = 760.0,
    [OW_DIM_SPECIFIC_HEAT] = 2300.0,
    [OW_DIM_CONDUCTIVITY] = 0.18,
    [OW_DIM_SPECIFIC_ENERGY] = 720000.0,
    [OW_DIM_MOLAR_ENERGY] = 28000.0,
    [OW_DIM_VISCOSITY] = 9000.0,
    [OW_DIM_TIME] = 30.0,
    [OW_DIM_POWER] = 30000.0,
    [OW_DIM_TORQUE] = 4800.0,
    [OW_DIM_SHEAR_RATE] = 100.0,
    [OW_DIM_CONSISTENCY] = 20000.0,
    [OW_DIM_HEAT_TRANSFER] = 2000.0,
};

static void round_trip(enum ow_unit_system sys)
{
	char text[160];
	double shown, si;
	int dim;

	for (dim = 0; dim < OW_DIM_COUNT; dim++) {
		si = sample_si[dim];
		shown = ow_display_value(sys, (enum ow_dim)dim, si);
		assert_rel(ow_display_to_si(sys, (enum ow_dim)dim, shown), si,
		           1e-12);
		/* the label itself parses back to the same SI value */
		snprintf(text, sizeof text, "%.17g %s", shown,
		         ow_display_label(sys, (enum ow_dim)dim));
		assert_rel(si_of(text, (enum ow_dim)dim, 0.0), si, 1e-9);
	}
}

static void si_display_round_trips_through_its_labels(void **state)
{
	(void)state;
	round_trip(OW_SYS_SI);
	assert_string_equal(ow_display_label(OW_SYS_SI, OW_DIM_TEMPERATURE),
	                    "°C");
	assert_string_equal(ow_display_label(OW_SYS_SI, OW_DIM_DENSITY),
	                    "kg/m³");
	/* T/degC = T/K - 273.15 (NIST SP 811 (2008) B.9) */
	assert_rel(ow_display_value(OW_SYS_SI, OW_DIM_TEMPERATURE, 473.15),
	           200.0, 1e-12);
	assert_rel(ow_display_value(OW_SYS_SI, OW_DIM_MASS_FLOW, 0.0139), 50.04,
	           1e-12);
	assert_rel(ow_display_value(OW_SYS_SI, OW_DIM_PRESSURE, 35e6), 35.0,
	           1e-12);
}

static void us_display_uses_nist_factors(void **state)
{
	(void)state;
	round_trip(OW_SYS_US);
	/* NIST SP 811 (2008) B.8 / B.9, each 1 shown unit in SI: */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_LENGTH, 1.0), 0.0254,
	           1e-12); /* in, exact */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_PRESSURE, 1.0), 6894.757,
	           1e-6); /* psi = 6.894757e3 Pa */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_MASS_FLOW, 3600.0),
	           0.45359237, 1e-12); /* lb/h; lb exact */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_POWER, 1.0), 745.6999,
	           1e-6); /* hp = 7.456999e2 W */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_TORQUE, 1.0), 1.355818,
	           1e-6); /* lbf ft = 1.355818 N m */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_DENSITY, 1.0), 16.01846,
	           1e-6); /* lb/ft3 = 1.601846e1 kg/m3 */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_SPECIFIC_HEAT, 1.0),
	           4186.8, 1e-9); /* Btu_IT/(lb degF) = 4.1868e3, exact */
	assert_rel(ow_display_to_si(OW_SYS_US, OW_DIM_CONDUCTIVITY, 1.0),
	           1.730735, 1e-6); /* Btu_IT/(h ft degF) = 1.730735 W/(m K) */
	/* t/degF = 1.8 t/degC + 32 (B.9): 473.15 K = 392 degF */
	assert_rel(ow_display_value(OW_SYS_US, OW_DIM_TEMPERATURE, 473.15),
	           392.0, 1e-12);
	assert_rel(ow_display_value(OW_SYS_US, OW_DIM_TEMP_DIFF, 10.0), 18.0,
	           1e-12);
	assert_string_equal(ow_display_label(OW_SYS_US, OW_DIM_TEMPERATURE),
	                    "°F");
	assert_string_equal(ow_display_label(OW_SYS_US, OW_DIM_PRESSURE),
	                    "psi");
}

static void unit_systems_parse_by_name(void **state)
{
	enum ow_unit_system sys = OW_SYS_US;

	(void)state;
	assert_int_equal(ow_unit_system_parse("si", &sys), OW_OK);
	assert_int_equal(sys, OW_SYS_SI);
	assert_int_equal(ow_unit_system_parse("us", &sys), OW_OK);
	assert_int_equal(sys, OW_SYS_US);
	assert_int_equal(ow_unit_system_parse("imperial", &sys), OW_EARG);
	assert_true(isnan(
	    ow_display_value((enum ow_unit_system)7, OW_DIM_LENGTH, 1.0)));
	assert_string_equal(ow_display_label(OW_SYS_SI, OW_DIM_COUNT), "");
	ow_units_destroy(NULL); /* NULL-safe */
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(rpm_means_revolutions_per_minute),
	    cmocka_unit_test(fahrenheit_and_celsius_convert_with_their_offsets),
	    cmocka_unit_test(temperature_differences_drop_the_offset),
	    cmocka_unit_test(inches_thou_and_micrometres_are_lengths),
	    cmocka_unit_test(diameters_need_the_screw_diameter),
	    cmocka_unit_test(pressures_and_flows_convert_from_trade_units),
	    cmocka_unit_test(material_properties_take_compound_units),
	    cmocka_unit_test(kilowatt_hours_are_energies),
	    cmocka_unit_test(percent_is_a_fraction),
	    cmocka_unit_test(
	        consistency_takes_a_pressure_times_seconds_to_the_n),
	    cmocka_unit_test(consistency_power_is_read_from_the_unit),
	    cmocka_unit_test(a_text_as_long_as_the_buffer_is_read_within_it),
	    cmocka_unit_test(inputs_without_a_unit_or_number_are_refused),
	    cmocka_unit_test(units_of_the_wrong_kind_say_what_was_expected),
	    cmocka_unit_test(non_finite_numbers_are_refused),
	    cmocka_unit_test(farad_and_coulomb_point_to_degf_and_degc),
	    cmocka_unit_test(convert_applies_the_same_rules_to_a_number),
	    cmocka_unit_test_teardown(
	        plain_numbers_read_a_point_whatever_the_locale,
	        back_to_c_locale),
	    cmocka_unit_test(every_example_in_the_expectations_parses),
	    cmocka_unit_test(si_display_round_trips_through_its_labels),
	    cmocka_unit_test(us_display_uses_nist_factors),
	    cmocka_unit_test(unit_systems_parse_by_name),
	    cmocka_unit_test(common_units_agree_with_udunits_and_nist),
	};

	return cmocka_run_group_tests(tests, load_units, free_units);
}
