/* ow_line.h - the extrusion line around the screw: feed, barrel zones, screw
 * root, die, screen pack, the line's limits, the sweep axes and the solver's
 * resolution. Plain value structs in SI (temperatures in K). */
#ifndef OW_LINE_H
#define OW_LINE_H

#include "ow_status.h"

#define OW_MAX_ZONES 16

struct ow_zone {
	double to_m;   /* axial end of the zone (zones are contiguous from 0) */
	double set_K;  /* barrel set-point */
};

enum ow_die_type {
	OW_DIE_CIRCLE,   /* diameter_m, length_m */
	OW_DIE_SLIT,     /* width_m, gap_m, length_m */
	OW_DIE_ANNULUS,  /* outer_diameter_m, inner_diameter_m, length_m */
	OW_DIE_MEASURED, /* pressure_Pa at output_kg_s and temp_K */
};

struct ow_die {
	enum ow_die_type type;
	double diameter_m, length_m;
	double width_m, gap_m;
	double outer_diameter_m, inner_diameter_m;
	double pressure_Pa, output_kg_s, temp_K; /* measured point */
};

/* A limit is active when its value is finite; NAN means "not set". */
struct ow_limits {
	double peak_temp_K;     /* max melt temperature anywhere (across depth) */
	double unmelt_frac;     /* max unmelted mass fraction at discharge, - */
	double pressure_Pa;     /* max pressure anywhere on the screw */
	double power_W;         /* max drive power */
	double torque_Nm;       /* max drive torque */
	double min_melt_temp_K; /* min bulk melt temperature at discharge */
	double min_output_kg_s;
	double max_output_kg_s;
	double max_sbr;         /* max solid bed ratio anywhere, - */
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
	int stations_per_turn; /* down-channel steps per screw turn */
	int depth_nodes;       /* nodes across the channel depth */
	double feed_pressure_Pa; /* plug pressure under a flood-fed hopper */
};

struct ow_line {
	double feed_temp_K;
	int n_zones;
	struct ow_zone zones[OW_MAX_ZONES];
	int root_adiabatic;       /* 1: screw root adiabatic; 0: root_temp_K */
	double root_temp_K;
	struct ow_die die;
	double screen_pressure_Pa; /* constant screen-pack/adapter drop */
	double die_factor;         /* multiplies the die's pressure need
				      (calibration; 1 = the ideal die) */
	struct ow_limits limits;
	struct ow_axes axes;
	struct ow_numerics numerics;
};

/* Defaults: no limits set (all NAN), adiabatic root, 25 degC feed, numerics
 * at their proven defaults, 0.01 MPa feed pressure, die factor 1. */
void ow_line_default(struct ow_line *l);

/* Barrel set-point at axial position x_m (the zone that holds x). */
double ow_line_barrel_temp(const struct ow_line *l, double x_m);

/* Zone set-points after applying barrel-axis value v in the line's mode
 * (K absolute, or K difference for shift); writes l->n_zones values. */
void ow_line_apply_axis(const struct ow_line *l, double v, double *set_K);

/* The axis's reference zone (mode zone: that zone; set: zones_from... the
 * common value; shift: the last zone), 0-based. */
int ow_line_reference_zone(const struct ow_line *l);

/* Consistency of the line with a screw of length screw_len_m: zones
 * ordered and covering the screw, die dimensions positive, sweep ranges
 * ordered with 2..1000 steps, limits in range. */
enum ow_status ow_line_validate(const struct ow_line *l, double screw_len_m,
				struct ow_diag *d);

#endif
