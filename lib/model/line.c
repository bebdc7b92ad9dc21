/* line.c - barrel zones, sweep axes, line defaults and consistency checks. */
#include "ow_line.h"
#include "ow_const.h"

#include <math.h>
#include <stddef.h>

#define D(f) offsetof(struct ow_die, f)
#define T(t) (1u << OW_DIE_##t)

/* Every field of every die type, in the order the file lists them. */
static const struct ow_die_field die_fields[] = {
    {"diameter", "Diameter", OW_DIM_LENGTH, D(diameter_m), T(CIRCLE), 4},
    {"width", "Width", OW_DIM_LENGTH, D(width_m), T(SLIT), 4},
    {"gap", "Gap", OW_DIM_LENGTH, D(gap_m), T(SLIT), 4},
    {"outer_diameter", "Outer diameter", OW_DIM_LENGTH, D(outer_diameter_m),
     T(ANNULUS), 5},
    {"inner_diameter", "Inner diameter", OW_DIM_LENGTH, D(inner_diameter_m),
     T(ANNULUS), 5},
    {"length", "Land length", OW_DIM_LENGTH, D(length_m),
     T(CIRCLE) | T(SLIT) | T(ANNULUS), 4},
    {"pressure", "Measured pressure", OW_DIM_PRESSURE, D(pressure_Pa),
     T(MEASURED), 4},
    {"output", "at throughput", OW_DIM_MASS_FLOW, D(output_kg_s), T(MEASURED),
     4},
    {"temperature", "and melt temperature", OW_DIM_TEMPERATURE, D(temp_K),
     T(MEASURED), 4},
};

#undef D
#undef T

_Static_assert(sizeof die_fields / sizeof die_fields[0] == OW_DIE_FIELDS,
               "OW_DIE_FIELDS counts the die fields");

const struct ow_die_field *ow_die_fields(void)
{
	return die_fields;
}

int ow_die_has(enum ow_die_type t, const struct ow_die_field *f)
{
	return (f->types >> t) & 1u;
}

double ow_die_value(const struct ow_die *d, const struct ow_die_field *f)
{
	return *(const double *)((const char *)d + f->offset);
}

double *ow_die_slot(struct ow_die *d, const struct ow_die_field *f)
{
	return (double *)((char *)d + f->offset);
}

const char *ow_die_type_name(enum ow_die_type t)
{
	static const char *const names[OW_DIE_TYPES] = {"circle", "slit",
	                                                "annulus", "measured"};

	return (unsigned)t < OW_DIE_TYPES ? names[t] : "?";
}

void ow_line_default(struct ow_line *l)
{
	*l = (struct ow_line){0};
	l->feed_temp_K = 298.15;
	l->root_adiabatic = 1;
	l->root_temp_K = NAN;
	l->die_factor = 1.0;
	l->limits = (struct ow_limits){NAN, NAN, NAN, NAN, NAN,
	                               NAN, NAN, NAN, NAN, 1.0};
	l->heat_transfer_factor = 1.0;
	for (int i = 0; i < OW_MAX_ZONES; i++) /* unlimited, ideal wall */
		l->zones[i].heating_W = l->zones[i].cooling_W =
		    l->zones[i].wall_h_W_m2K = NAN;
	l->axes.mode = OW_AXIS_SHIFT;
	l->numerics.stations_per_turn = 6; /* proven by test_solver */
	l->numerics.depth_nodes = 21;
	l->numerics.feed_pressure_Pa = 1e4; /* flood-fed hopper, small */
	l->numerics.tol_scale = 1.0;
}

int ow_line_zone_at(const struct ow_line *l, double x_m)
{
	int i;

	for (i = 0; i < l->n_zones - 1; i++)
		if (x_m < l->zones[i].to_m)
			return i;
	return l->n_zones - 1;
}

double ow_line_barrel_temp(const struct ow_line *l, const double *set_K,
                           double x_m)
{
	int z = ow_line_zone_at(l, x_m);

	return set_K ? set_K[z] : l->zones[z].set_K;
}

void ow_line_zone_defaults(struct ow_line *l, double diameter_m)
{
	int i;

	for (i = 0; i < l->n_zones && i < OW_MAX_ZONES; i++) {
		struct ow_zone *z = &l->zones[i];
		double len = z->to_m - (i ? l->zones[i - 1].to_m : 0.0);
		double heat = OW_ZONE_HEATING_W_M2 * OW_PI * diameter_m * len;

		if (isnan(z->heating_W)) {
			z->heating_W = heat;
			z->defaulted |= OW_ZONE_DEF_HEATING;
		}
		if (isnan(z->cooling_W)) {
			z->cooling_W = OW_ZONE_COOLING_SHARE * heat;
			z->defaulted |= OW_ZONE_DEF_COOLING;
		}
		if (isnan(z->wall_h_W_m2K)) {
			z->wall_h_W_m2K = OW_ZONE_WALL_H;
			z->defaulted |= OW_ZONE_DEF_WALL;
		}
	}
}

void ow_line_apply_axis(const struct ow_line *l, double v, double *set_K)
{
	int i;

	for (i = 0; i < l->n_zones; i++) {
		double t = l->zones[i].set_K;

		if (l->axes.mode == OW_AXIS_SHIFT)
			t += v;
		else if (l->axes.mode == OW_AXIS_SET && i >= l->axes.zones_from)
			t = v;
		else if (l->axes.mode == OW_AXIS_ZONE && i == l->axes.zone)
			t = v;
		set_K[i] = t;
	}
}

double ow_line_axis_ref_K(const struct ow_line *l, double axis_value)
{
	double set_K[OW_MAX_ZONES];

	ow_line_apply_axis(l, axis_value, set_K);
	return set_K[ow_line_reference_zone(l)];
}

int ow_line_reference_zone(const struct ow_line *l)
{
	if (l->axes.mode == OW_AXIS_ZONE)
		return l->axes.zone;
	if (l->axes.mode == OW_AXIS_SET)
		return l->n_zones -
		       1; /* every zone from zones_from: the last */
	return l->n_zones - 1;
}

static int bad_temp(double t)
{
	return !isfinite(t) || t < 200.0 || t > 800.0;
}

/* Zone control values: NAN (unlimited / ideal) or in range. */
static int bad_control(const struct ow_zone *z)
{
	return (!isnan(z->heating_W) &&
	        !(z->heating_W >= 0.0 && z->heating_W < 1e6)) ||
	       (!isnan(z->cooling_W) &&
	        !(z->cooling_W >= 0.0 && z->cooling_W < 1e6)) ||
	       (!isnan(z->wall_h_W_m2K) &&
	        !(z->wall_h_W_m2K > 0.0 && z->wall_h_W_m2K < 1e6));
}

static enum ow_status check_zones(const struct ow_line *l, double len,
                                  struct ow_diag *d)
{
	int i;

	if (l->n_zones < 1 || l->n_zones > OW_MAX_ZONES)
		return ow_diag_set(d, OW_EINPUT,
		                   "barrel.zones: %d zones; expected 1..%d",
		                   l->n_zones, OW_MAX_ZONES);
	for (i = 0; i < l->n_zones; i++) {
		double prev = i ? l->zones[i - 1].to_m : 0.0;

		if (!(isfinite(l->zones[i].to_m) && l->zones[i].to_m > prev))
			return ow_diag_set(
			    d, OW_EINPUT,
			    "barrel.zones[%d].to: %g mm must lie "
			    "beyond the previous zone's end "
			    "(%g mm)",
			    i, l->zones[i].to_m * 1e3, prev * 1e3);
		if (l->zones[i].to_m > len + 1e-6) /* "30 D" on a 24 D screw */
			return ow_diag_set(
			    d, OW_EINPUT,
			    "barrel.zones[%d].to: %g mm lies past "
			    "the end of the screw (%g mm); the "
			    "last zone ends at the screw's end",
			    i, l->zones[i].to_m * 1e3, len * 1e3);
		if (bad_temp(l->zones[i].set_K))
			return ow_diag_set(d, OW_EINPUT,
			                   "barrel.zones[%d].set: %g degC must "
			                   "lie in -73..527 degC",
			                   i, l->zones[i].set_K - OW_ZERO_C_K);
		if (bad_control(&l->zones[i]))
			return ow_diag_set(
			    d, OW_EINPUT,
			    "barrel.zones[%d]: heating_power and "
			    "cooling_power must be >= 0 and below "
			    "1 MW, heat_transfer > 0 and below "
			    "1e6 W/(m2 K)",
			    i);
	}
	if (!(isfinite(l->heat_transfer_factor) &&
	      l->heat_transfer_factor > 0.0 &&
	      l->heat_transfer_factor <= 100.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "barrel.heat_transfer_factor: %g must lie "
		                   "in (0, 100]",
		                   l->heat_transfer_factor);
	if (l->zones[l->n_zones - 1].to_m < len - 1e-6)
		return ow_diag_set(d, OW_EINPUT,
		                   "barrel.zones[%d].to: %g mm; the zones must "
		                   "cover the whole screw (%g mm)",
		                   l->n_zones - 1,
		                   l->zones[l->n_zones - 1].to_m * 1e3,
		                   len * 1e3);
	return OW_OK;
}

static int pos(double x)
{
	return isfinite(x) && x > 0.0;
}

static enum ow_status check_die(const struct ow_die *die, struct ow_diag *d)
{
	switch (die->type) {
	case OW_DIE_CIRCLE:
		if (!pos(die->diameter_m) || !pos(die->length_m))
			return ow_diag_set(d, OW_EINPUT,
			                   "die: diameter and length must be "
			                   "positive lengths");
		break;
	case OW_DIE_SLIT:
		if (!pos(die->width_m) || !pos(die->gap_m) ||
		    !pos(die->length_m) || die->gap_m >= die->width_m)
			return ow_diag_set(d, OW_EINPUT,
			                   "die: width, gap and length must be "
			                   "positive, the gap below the width");
		break;
	case OW_DIE_ANNULUS:
		if (!pos(die->outer_diameter_m) || !pos(die->length_m) ||
		    !pos(die->inner_diameter_m) ||
		    die->inner_diameter_m >= die->outer_diameter_m)
			return ow_diag_set(d, OW_EINPUT,
			                   "die.inner_diameter: %g mm must be "
			                   "positive and below outer_diameter "
			                   "%g mm",
			                   die->inner_diameter_m * 1e3,
			                   die->outer_diameter_m * 1e3);
		break;
	case OW_DIE_MEASURED:
		if (!pos(die->pressure_Pa) || !pos(die->output_kg_s) ||
		    bad_temp(die->temp_K))
			return ow_diag_set(d, OW_EINPUT,
			                   "die: measured pressure and output "
			                   "must be positive, the temperature "
			                   "plausible");
		break;
	}
	return OW_OK;
}

static enum ow_status check_limits(const struct ow_limits *m, struct ow_diag *d)
{
	const struct {
		const char *key;
		double v, hi;
	} lim[] = {{"peak_temp", m->peak_temp_K, 900.0},
	           {"unmelt", m->unmelt_frac, 1.0},
	           {"pressure", m->pressure_Pa, 1e9},
	           {"power", m->power_W, 1e8},
	           {"torque", m->torque_Nm, 1e8},
	           {"min_melt_temp", m->min_melt_temp_K, 900.0},
	           {"min_output", m->min_output_kg_s, 1e3},
	           {"max_output", m->max_output_kg_s, 1e3},
	           {"max_sbr", m->max_sbr, 1.0},
	           {"zone_control", m->zone_load, 1.0}};
	size_t i;

	for (i = 0; i < sizeof lim / sizeof lim[0]; i++)
		if (!isnan(lim[i].v) &&
		    !(isfinite(lim[i].v) && lim[i].v >= 0.0 &&
		      lim[i].v <= lim[i].hi))
			return ow_diag_set(d, OW_EINPUT,
			                   "limits.%s: %g is out of range "
			                   "(0..%g in SI units)",
			                   lim[i].key, lim[i].v, lim[i].hi);
	if (!isnan(m->min_output_kg_s) && !isnan(m->max_output_kg_s) &&
	    m->min_output_kg_s >= m->max_output_kg_s)
		return ow_diag_set(d, OW_EINPUT,
		                   "limits.min_output: must be below "
		                   "limits.max_output");
	return OW_OK;
}

static enum ow_status check_axes(const struct ow_line *l, struct ow_diag *d)
{
	const struct ow_axes *a = &l->axes;
	double tlo = a->mode == OW_AXIS_SHIFT ? -300.0 : 200.0;
	double thi = a->mode == OW_AXIS_SHIFT ? 300.0 : 800.0;

	if (a->rpm_steps == 0)
		return OW_OK; /* no sweep in this study */
	if (!(isfinite(a->rpm_from) && a->rpm_from > 0.0 &&
	      a->rpm_to > a->rpm_from && a->rpm_to <= 3000.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "sweep.rpm: from %g to %g rpm must be an "
		                   "increasing range of positive speeds",
		                   a->rpm_from, a->rpm_to);
	if (a->rpm_steps < 2 || a->rpm_steps > 1000)
		return ow_diag_set(d, OW_EINPUT,
		                   "sweep.rpm.steps: %d must be 2..1000",
		                   a->rpm_steps);
	if (!(isfinite(a->axis_from) && a->axis_to > a->axis_from &&
	      a->axis_from >= tlo && a->axis_to <= thi))
		return ow_diag_set(d, OW_EINPUT,
		                   "sweep.barrel: from %g K to %g K must be an "
		                   "increasing range within %g..%g K",
		                   a->axis_from, a->axis_to, tlo, thi);
	if (a->axis_steps < 2 || a->axis_steps > 1000)
		return ow_diag_set(d, OW_EINPUT,
		                   "sweep.barrel.steps: %d must be 2..1000",
		                   a->axis_steps);
	if (a->mode == OW_AXIS_SET &&
	    (a->zones_from < 0 || a->zones_from >= l->n_zones))
		return ow_diag_set(
		    d, OW_EINPUT,
		    "sweep.barrel.zones_from: %d must name a zone "
		    "1..%d",
		    a->zones_from + 1, l->n_zones);
	if (a->mode == OW_AXIS_ZONE && (a->zone < 0 || a->zone >= l->n_zones))
		return ow_diag_set(
		    d, OW_EINPUT,
		    "sweep.barrel.zone: %d must name a zone 1..%d", a->zone + 1,
		    l->n_zones);
	return OW_OK;
}

static enum ow_status check_feed(const struct ow_line *l, struct ow_diag *d)
{
	const struct ow_numerics *n = &l->numerics;

	if (bad_temp(l->feed_temp_K))
		return ow_diag_set(d, OW_EINPUT,
		                   "feed.temperature: %g degC must lie in "
		                   "-73..527 degC",
		                   l->feed_temp_K - OW_ZERO_C_K);
	if (!(isfinite(n->feed_pressure_Pa) && n->feed_pressure_Pa > 0.0 &&
	      n->feed_pressure_Pa < 1e8))
		return ow_diag_set(d, OW_EINPUT,
		                   "feed.pressure: %g Pa must be positive and "
		                   "below 100 MPa",
		                   n->feed_pressure_Pa);
	if (!l->root_adiabatic && bad_temp(l->root_temp_K))
		return ow_diag_set(d, OW_EINPUT,
		                   "barrel.screw_root: %g K is not a plausible "
		                   "temperature",
		                   l->root_temp_K);
	if (!(isfinite(l->screen_pressure_Pa) && l->screen_pressure_Pa >= 0.0 &&
	      l->screen_pressure_Pa < 1e8))
		return ow_diag_set(d, OW_EINPUT,
		                   "screen_pack.pressure_drop: %g Pa must be a "
		                   "pressure >= 0 and below 100 MPa",
		                   l->screen_pressure_Pa);
	if (n->stations_per_turn < 4 || n->stations_per_turn > 400)
		return ow_diag_set(d, OW_EINPUT,
		                   "numerics.stations_per_turn: %d must be "
		                   "4..400",
		                   n->stations_per_turn);
	if (n->depth_nodes < 9 || n->depth_nodes > 401)
		return ow_diag_set(d, OW_EINPUT,
		                   "numerics.depth_nodes: %d must be 9..401",
		                   n->depth_nodes);
	return OW_OK;
}

enum ow_status ow_line_validate(const struct ow_line *l, double screw_len_m,
                                struct ow_diag *d)
{
	enum ow_status st = check_zones(l, screw_len_m, d);

	if (st == OW_OK)
		st = check_feed(l, d);
	if (st == OW_OK)
		st = check_die(&l->die, d);
	if (st == OW_OK)
		st = check_limits(&l->limits, d);
	if (st == OW_OK)
		st = check_axes(l, d);
	return st;
}
