/* ow_line.h - the extrusion line around the screw: feed, barrel zones, screw
 * root, die, screen pack, the line's limits, the sweep axes and the solver's
 * resolution. Plain value structs in SI (temperatures in K). */
#ifndef OW_LINE_H
#define OW_LINE_H

#include <stddef.h>

#include "ow_status.h"
#include "ow_units.h"

#define OW_MAX_ZONES 16

/* A barrel zone is a controlled wall: its control point is held at the
 * set-point while the heat the zone must give the resin (or take from it)
 * stays within its heating and cooling power; the inner surface lies
 * behind a heat-transfer coefficient from the control point. NAN powers
 * are unlimited and a NAN or zero coefficient an ideal wall (what a line
 * built in code without ow_line_zone_defaults gets). */
struct ow_zone {
	double to_m;         /* axial end of the zone (contiguous from 0) */
	double set_K;        /* barrel set-point at the control point */
	double heating_W;    /* heater power */
	double cooling_W;    /* cooling power (a positive number) */
	double wall_h_W_m2K; /* control point -> inner surface, per m^2 of
	                        bore */
	unsigned defaulted;  /* OW_ZONE_DEF_* bits: values not in the file */
};

#define OW_ZONE_DEF_HEATING 0x1u
#define OW_ZONE_DEF_COOLING 0x2u
#define OW_ZONE_DEF_WALL    0x4u

/* Defaults of a zone's control, typical values from memory: heating
 * 50 kW per m^2 of bore (3.8 kW on a 6 D zone of a 63.5 mm barrel),
 * cooling 40 % of that, and 2000 W/(m^2 K) between control point and
 * bore (about 20 mm of steel, k about 40 W/(m K)). */
#define OW_ZONE_HEATING_W_M2  50e3
#define OW_ZONE_COOLING_SHARE 0.4
#define OW_ZONE_WALL_H        2000.0

/* The die types; which fields each has is said once, in the table of
 * ow_die_fields (line.c). */
enum ow_die_type {
	OW_DIE_CIRCLE,   /* diameter_m, length_m */
	OW_DIE_SLIT,     /* width_m, gap_m, length_m */
	OW_DIE_ANNULUS,  /* outer_diameter_m, inner_diameter_m, length_m */
	OW_DIE_MEASURED, /* pressure_Pa at output_kg_s and temp_K */
};
#define OW_DIE_TYPES (OW_DIE_MEASURED + 1)

struct ow_die {
	enum ow_die_type type;
	double diameter_m, length_m;
	double width_m, gap_m;
	double outer_diameter_m, inner_diameter_m;
	double pressure_Pa, output_kg_s, temp_K; /* measured point */
};

/* One input field of a die: the loader, the comparison of two studies and
 * the report's inputs page all walk this table. */
struct ow_die_field {
	const char *key;   /* in the study file's die block ("gap") */
	const char *label; /* in the report ("Gap") */
	enum ow_dim dim;   /* what its value is */
	size_t offset;     /* offsetof(struct ow_die, <field>), a double */
	unsigned types;    /* 1u << type for each die type that has it */
	int digits;        /* significant digits the report shows */
};

/* The OW_DIE_FIELDS die fields in file order (every field of a type is
 * required). Static storage. */
#define OW_DIE_FIELDS 9
const struct ow_die_field *ow_die_fields(void);

/* Does a die of type t have field f? */
int ow_die_has(enum ow_die_type t, const struct ow_die_field *f);

/* The value of field f of die d (SI). */
double ow_die_value(const struct ow_die *d, const struct ow_die_field *f);

/* Where field f of die d is stored, for the loader. */
double *ow_die_slot(struct ow_die *d, const struct ow_die_field *f);

/* The study file's word for die type t ("circle", "slit", "annulus",
 * "measured"); "?" out of range. */
const char *ow_die_type_name(enum ow_die_type t);

/* A limit is active when its value is finite; NAN means "not set". */
struct ow_limits {
	double peak_temp_K; /* max melt temperature anywhere (across depth) */
	double unmelt_frac; /* max unmelted mass fraction at discharge, - */
	double pressure_Pa; /* max pressure anywhere on the screw */
	double power_W;     /* max drive power */
	double torque_Nm;   /* max drive torque */
	double min_melt_temp_K; /* min bulk melt temperature at discharge */
	double min_output_kg_s;
	double max_output_kg_s;
	double max_sbr;   /* max solid bed ratio anywhere, - */
	double zone_load; /* max share of a zone's heating or cooling
	                     power a point may need, - (1: every zone
	                     holds its set-point; the default) */
};

enum ow_axis_mode {
	OW_AXIS_SHIFT, /* value (K difference) added to every heated zone */
	OW_AXIS_SET,   /* zones from zones_from on get the value (K) */
	OW_AXIS_ZONE,  /* only zone `zone` gets the value (K) */
};

struct ow_axes {
	double rpm_from, rpm_to; /* screw speed, rev/min */
	int rpm_steps;
	enum ow_axis_mode mode;
	double axis_from, axis_to; /* K (absolute for set/zone, difference
	                              for shift) */
	int axis_steps;
	int zones_from; /* set: first zone (0-based) that gets the value */
	int zone;       /* zone: the zone (0-based) that gets the value */
};

struct ow_numerics {
	int stations_per_turn;   /* down-channel steps per screw turn */
	int depth_nodes;         /* nodes across the channel depth */
	double feed_pressure_Pa; /* plug pressure under a flood-fed hopper */
	double tol_scale;        /* multiplies every iteration tolerance of
	                            the solver (match, zones, melt Newton);
	                            1 by default, far smaller to check the
	                            defaults against a tight solve (not read
	                            from files) */
};

struct ow_line {
	double feed_temp_K;
	int n_zones;
	struct ow_zone zones[OW_MAX_ZONES];
	int root_adiabatic; /* 1: screw root adiabatic; 0: root_temp_K */
	double root_temp_K;
	struct ow_die die;
	double screen_pressure_Pa; /* constant screen-pack/adapter drop */
	double die_factor;         /* multiplies the die's pressure need
	                              (calibration; 1 = the ideal die) */
	struct ow_limits limits;
	struct ow_axes axes;
	struct ow_numerics numerics;
	double heat_transfer_factor; /* multiplies every zone's wall_h (a
	                                calibration factor); default 1 */
};

/* Defaults: no limits set (all NAN), adiabatic root, 25 degC feed, numerics
 * at their proven defaults, 0.01 MPa feed pressure, die factor 1. */
void ow_line_default(struct ow_line *l);

/* Fill the zone control values a file left out (NAN) with the defaults
 * above for a barrel of bore diameter_m, marking them in `defaulted`. */
void ow_line_zone_defaults(struct ow_line *l, double diameter_m);

/* Zone (0-based) that holds axial position x_m. */
int ow_line_zone_at(const struct ow_line *l, double x_m);

/* Barrel temperature at axial position x_m: set_K[zone] of the zone that
 * holds x (set_K NULL: the line's own set-points, zones[].set_K). */
double ow_line_barrel_temp(const struct ow_line *l, const double *set_K,
                           double x_m);

/* Zone set-points after applying barrel-axis value v in the line's mode
 * (K absolute, or K difference for shift); writes l->n_zones values. This
 * and ow_line_axis_ref_K are the one place where an axis value becomes
 * set-points. */
void ow_line_apply_axis(const struct ow_line *l, double v, double *set_K);

/* Axis value -> the reference zone's absolute set-point (K): what maps,
 * windows and outputs show on their barrel axis. */
double ow_line_axis_ref_K(const struct ow_line *l, double axis_value);

/* The axis's reference zone (mode zone: that zone; set: zones_from... the
 * common value; shift: the last zone), 0-based. */
int ow_line_reference_zone(const struct ow_line *l);

/* Consistency of the line with a screw of length screw_len_m: zones
 * ordered and covering the screw, die dimensions positive, sweep ranges
 * ordered with 2..1000 steps, limits in range. */
enum ow_status ow_line_validate(const struct ow_line *l, double screw_len_m,
                                struct ow_diag *d);

#endif
