/* ow_units.h - quantities with units to SI (over UDUNITS-2), and the display
 * unit systems people read (SI: mm, degC, MPa, kg/h; US: in, degF, psi, lb/h).
 *
 * UDUNITS-2 is not thread-safe: create one ow_units, parse every input to SI
 * before any parallel region, then only the display helpers (pure functions,
 * no UDUNITS) are used from threads. */
#ifndef OW_UNITS_H
#define OW_UNITS_H

#include "ow_status.h"

/* What a value measures; each kind has one SI unit. */
enum ow_dim {
	OW_DIM_NONE,          /* dimensionless; "%" allowed (-> fraction) */
	OW_DIM_LENGTH,        /* m; "D" allowed when a diameter is known */
	OW_DIM_TEMPERATURE,   /* K, absolute (degC, degF, K) */
	OW_DIM_TEMP_DIFF,     /* K, a difference ("+18 degF" = 10 K) */
	OW_DIM_PRESSURE,      /* Pa (also stresses) */
	OW_DIM_MASS_FLOW,     /* kg/s */
	OW_DIM_ROT_SPEED,     /* rev/min (rpm); the one non-SI internal unit */
	OW_DIM_DENSITY,       /* kg/m3 */
	OW_DIM_SPECIFIC_HEAT, /* J/(kg K) */
	OW_DIM_CONDUCTIVITY,  /* W/(m K) */
	OW_DIM_SPECIFIC_ENERGY, /* J/kg */
	OW_DIM_MOLAR_ENERGY,    /* J/mol */
	OW_DIM_VISCOSITY,       /* Pa s */
	OW_DIM_TIME,            /* s */
	OW_DIM_POWER,           /* W */
	OW_DIM_TORQUE,          /* N m */
	OW_DIM_SHEAR_RATE,      /* 1/s */
	OW_DIM_CONSISTENCY,   /* Pa s^n: "<pressure unit> s^n" or "Pa s^0.4" */
	OW_DIM_HEAT_TRANSFER, /* W/(m2 K), a heat-transfer coefficient */
	OW_DIM_COUNT
};

struct ow_units;

/* A unit reader in *out. The UDUNITS-2 database (error messages
 * silenced) is read once, at the first unit that needs it: the commonest
 * units ("mm", "degC", "degF", "in", "MPa", "kJ/(kg K)", "rpm" ...) convert
 * by their exact factors without it. Unit texts are rewritten before
 * UDUNITS sees them: rpm = revolutions per minute (a turn counts 1, so
 * "1 Hz" = 60 rpm and "6.283185 rad/s" = 60 rpm), thou = mil, Wh/kWh =
 * W h, hp = 745.69987158227 W exactly. OW_ENOMEM only; a database that
 * cannot be read is OW_EIO from the parse that needed it. Free with
 * ow_units_destroy. */
enum ow_status ow_units_create(struct ow_units **out, struct ow_diag *d);
void ow_units_destroy(struct ow_units *u);

/* Parse "63.5 mm", "200 degC", "5000 psi", "8 D" into SI units of dim.
 * diameter_m > 0 enables the "D" length unit. The number is split off first
 * (locale-independent), the unit must convert to dim. A text without a unit
 * ("200") is accepted only for OW_DIM_NONE (JSON numbers meaning SI are the
 * caller's business); "%" there gives a fraction. Temperatures take degC,
 * degF, °C, °F, K, degR; OW_DIM_TEMP_DIFF converts cv(x) - cv(0).
 * Errors are OW_EINPUT with "\"<text>\": <problem>; expected a <kind>
 * such as ..." in d (without file/path: the caller prefixes those);
 * OW_EARG for NULL arguments. Not thread-safe (UDUNITS-2). */
enum ow_status ow_units_parse(const struct ow_units *u, const char *text,
                              enum ow_dim dim, double diameter_m, double *si,
                              struct ow_diag *d);

/* Convert number x given in unit text `unit` ("degF", "psi") to SI of dim.
 * Same rules and errors as ow_units_parse ("D" is refused: no diameter). */
enum ow_status ow_units_convert(const struct ow_units *u, double x,
                                const char *unit, enum ow_dim dim, double *si,
                                struct ow_diag *d);

/* Read text (trimmed) as one finite decimal number, '.' as the decimal
 * point whatever the locale. OW_EINPUT for "", "nan", "1e999", "2 mm". */
enum ow_status ow_units_parse_number(const char *text, double *x,
                                     struct ow_diag *d);

/* The power of s written in a power-law consistency text ("20000 Pa
 * s^0.41" -> 0.41, "8 kPa s" -> 1): 1 and *power set, or 0 when the power
 * is the symbol n (or the text is not a consistency). Lets a reader check
 * that the power matches the model's index. Pure text; thread-safe. */
int ow_units_consistency_power(const char *text, double *power);

/* A human name of a dimension with an example ("a length such as 63.5 mm"). */
const char *ow_dim_expect(enum ow_dim dim);

enum ow_unit_system { OW_SYS_SI, OW_SYS_US };

/* Parse "si" or "us" (also "SI", "US"); OW_EARG otherwise. */
enum ow_status ow_unit_system_parse(const char *s, enum ow_unit_system *out);

/* Display: value in SI -> number in the system's unit for dim, and that
 * unit's label ("mm", "°C", "MPa", "kg/h" / "in", "°F", "psi", "lb/h").
 * Pure, thread-safe. Lengths: mm / in; small lengths (clearance): use
 * OW_DIM_LENGTH too (callers choose decimals). Temperature differences:
 * K / °F (1 K = 1.8 °F). Labels are UTF-8 ("kg/m³", "N·m", "lbf·ft",
 * "BTU/(lb·°F)", "hp·h/lb"); "" for OW_DIM_NONE. Unknown sys or dim:
 * NAN and "". Factors: NIST SP 811 (2008) Appendix B. */
double ow_display_value(enum ow_unit_system sys, enum ow_dim dim, double si);
const char *ow_display_label(enum ow_unit_system sys, enum ow_dim dim);

/* The inverse of ow_display_value: a number in the system's unit for dim
 * -> SI. NAN for an unknown system or dim. Pure, thread-safe. Every label
 * also parses back with ow_units_parse ("12.5 psi", "1.2 BTU/(lb·°F)"). */
double ow_display_to_si(enum ow_unit_system sys, enum ow_dim dim, double shown);

#endif
