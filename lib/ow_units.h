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
	OW_DIM_MOLAR_ENERGY,  /* J/mol */
	OW_DIM_VISCOSITY,     /* Pa s */
	OW_DIM_TIME,          /* s */
	OW_DIM_POWER,         /* W */
	OW_DIM_TORQUE,        /* N m */
	OW_DIM_SHEAR_RATE,    /* 1/s */
	OW_DIM_CONSISTENCY,   /* Pa s^n: "<pressure unit> s^n" or "Pa s^0.4" */
	OW_DIM_COUNT
};

struct ow_units;

/* Load the UDUNITS-2 database (silenced, rpm remapped to revolutions per
 * minute, thou and Wh added). Free with ow_units_destroy. */
enum ow_status ow_units_create(struct ow_units **out, struct ow_diag *d);
void ow_units_destroy(struct ow_units *u);

/* Parse "63.5 mm", "200 degC", "5000 psi", "8 D" or a bare number (meaning
 * SI) into SI units of dim. diameter_m > 0 enables the "D" length unit.
 * The number is split off first (locale-independent), the unit must convert
 * to dim. Errors are OW_EINPUT with "expected a <kind> such as ..." in d
 * (without file/path: the caller prefixes those). */
enum ow_status ow_units_parse(const struct ow_units *u, const char *text,
			      enum ow_dim dim, double diameter_m, double *si,
			      struct ow_diag *d);

/* Convert number x given in unit text `unit` ("degF", "psi") to SI of dim. */
enum ow_status ow_units_convert(const struct ow_units *u, double x,
				const char *unit, enum ow_dim dim, double *si,
				struct ow_diag *d);

/* A human name of a dimension with an example ("a length such as 63.5 mm"). */
const char *ow_dim_expect(enum ow_dim dim);

enum ow_unit_system { OW_SYS_SI, OW_SYS_US };

/* Parse "si" or "us"; OW_EARG otherwise. */
enum ow_status ow_unit_system_parse(const char *s, enum ow_unit_system *out);

/* Display: value in SI -> number in the system's unit for dim, and that
 * unit's label ("mm", "°C", "MPa", "kg/h" / "in", "°F", "psi", "lb/h").
 * Pure, thread-safe. Lengths: mm / in; small lengths (clearance): use
 * OW_DIM_LENGTH too (callers choose decimals). */
double ow_display_value(enum ow_unit_system sys, enum ow_dim dim, double si);
const char *ow_display_label(enum ow_unit_system sys, enum ow_dim dim);

#endif
