/* compare_inputs.c - the input fields that differ between two studies,
 * field by field over the loaded structs, each value written with its unit
 * in the reader's system. Two values are the same when they print the same
 * to six significant digits (what the reader could tell apart). */
#include "ow_compare.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define ABSENT "—" /* a field the study does not have */

struct diffs {
	const struct ow_study *s[2];
	enum ow_unit_system sys;
	struct ow_input_diff *out;
	int max, n;
	int all; /* every field, not only those that differ */
};

static void add(struct diffs *x, const char *field, const char *va,
                const char *vb)
{
	struct ow_input_diff *e;

	if (!x->all && !strcmp(va, vb))
		return;
	if (!strcmp(va, ABSENT) && !strcmp(vb, ABSENT))
		return; /* a field neither study has */
	if (x->n < x->max) {
		e = &x->out[x->n];
		snprintf(e->field, sizeof e->field, "%s", field);
		snprintf(e->a, sizeof e->a, "%s", va);
		snprintf(e->b, sizeof e->b, "%s", vb);
	}
	x->n++;
}

/* A value of dim in the reader's units; NAN: a limit or value not set. */
static void fmt_qty(const struct diffs *x, enum ow_dim dim, double si,
                    char *buf, size_t n)
{
	const char *u = ow_display_label(x->sys, dim);

	if (isnan(si))
		snprintf(buf, n, "not set");
	else
		snprintf(buf, n, "%.6g%s%s", ow_display_value(x->sys, dim, si),
		         *u ? " " : "", u);
}

/* A quantity present in a (has[0]) and/or b (has[1]). */
static void qty(struct diffs *x, const char *field, enum ow_dim dim,
                const int *has, double va, double vb)
{
	char a[80] = ABSENT, b[80] = ABSENT;

	if (has[0])
		fmt_qty(x, dim, va, a, sizeof a);
	if (has[1])
		fmt_qty(x, dim, vb, b, sizeof b);
	add(x, field, a, b);
}

static void qty2(struct diffs *x, const char *field, enum ow_dim dim, double va,
                 double vb)
{
	static const int both[2] = {1, 1};

	qty(x, field, dim, both, va, vb);
}

/* A position along the screw, in diameters of each study's own screw. */
static void along(struct diffs *x, const char *field, const int *has,
                  double va_m, double vb_m)
{
	char a[80] = ABSENT, b[80] = ABSENT;

	if (has[0])
		snprintf(a, sizeof a, "%.6g D",
		         va_m / x->s[0]->screw.diameter_m);
	if (has[1])
		snprintf(b, sizeof b, "%.6g D",
		         vb_m / x->s[1]->screw.diameter_m);
	add(x, field, a, b);
}

static void text(struct diffs *x, const char *field, const int *has,
                 const char *va, const char *vb)
{
	add(x, field, has[0] ? va : ABSENT, has[1] ? vb : ABSENT);
}

static void count(struct diffs *x, const char *field, int va, int vb)
{
	char a[24], b[24];

	snprintf(a, sizeof a, "%d", va);
	snprintf(b, sizeof b, "%d", vb);
	add(x, field, a, b);
}

/* ---- screw ---- */

/* "screw.sections[i].name" into f (96 bytes). */
static const char *sec_field(char *f, int i, const char *name)
{
	snprintf(f, 96, "screw.sections[%d].%s", i, name);
	return f;
}

static void section(struct diffs *x, int i)
{
	const struct ow_section *sa = &x->s[0]->screw.sections[i];
	const struct ow_section *sb = &x->s[1]->screw.sections[i];
	int in[2] = {i < x->s[0]->screw.n_sections,
	             i < x->s[1]->screw.n_sections};
	int mix[2] = {in[0] && sa->type == OW_SEC_MIXER,
	              in[1] && sb->type == OW_SEC_MIXER};
	int bar[2] = {in[0] && sa->type == OW_SEC_BARRIER,
	              in[1] && sb->type == OW_SEC_BARRIER};
	int deep[2] = {in[0] && !mix[0] && !bar[0],
	               in[1] && !mix[1] && !bar[1]};
	char f[96];

	text(x, sec_field(f, i, "type"), in, ow_section_name(sa->type),
	     ow_section_name(sb->type));
	along(x, sec_field(f, i, "length"), in, sa->length_m, sb->length_m);
	qty(x, sec_field(f, i, "depth"), OW_DIM_LENGTH, deep, sa->depth_m,
	    sb->depth_m);
	qty(x, sec_field(f, i, "gap"), OW_DIM_LENGTH, mix, sa->gap_m,
	    sb->gap_m);
	qty(x, sec_field(f, i, "solids_depth_start"), OW_DIM_LENGTH, bar,
	    sa->solids_depth_start_m, sb->solids_depth_start_m);
	qty(x, sec_field(f, i, "solids_depth_end"), OW_DIM_LENGTH, bar,
	    sa->solids_depth_end_m, sb->solids_depth_end_m);
	qty(x, sec_field(f, i, "melt_depth_start"), OW_DIM_LENGTH, bar,
	    sa->melt_depth_start_m, sb->melt_depth_start_m);
	qty(x, sec_field(f, i, "melt_depth_end"), OW_DIM_LENGTH, bar,
	    sa->melt_depth_end_m, sb->melt_depth_end_m);
	qty(x, sec_field(f, i, "melt_share_start"), OW_DIM_NONE, bar,
	    sa->melt_share_start, sb->melt_share_start);
	qty(x, sec_field(f, i, "melt_share_end"), OW_DIM_NONE, bar,
	    sa->melt_share_end, sb->melt_share_end);
	qty(x, sec_field(f, i, "barrier_clearance"), OW_DIM_LENGTH, bar,
	    sa->barrier_clearance_m, sb->barrier_clearance_m);
}

static void wear(struct diffs *x, int i)
{
	const struct ow_wear *wa = &x->s[0]->screw.wear[i];
	const struct ow_wear *wb = &x->s[1]->screw.wear[i];
	int in[2] = {i < x->s[0]->screw.n_wear, i < x->s[1]->screw.n_wear};
	char f[96];

	snprintf(f, sizeof f, "screw.wear[%d].from", i);
	along(x, f, in, wa->from_m, wb->from_m);
	snprintf(f, sizeof f, "screw.wear[%d].to", i);
	along(x, f, in, wa->to_m, wb->to_m);
	snprintf(f, sizeof f, "screw.wear[%d].clearance", i);
	qty(x, f, OW_DIM_LENGTH, in, wa->clearance_m, wb->clearance_m);
}

static int imax(int a, int b)
{
	return a > b ? a : b;
}

static void screw(struct diffs *x)
{
	const struct ow_screw *a = &x->s[0]->screw, *b = &x->s[1]->screw;
	static const int both[2] = {1, 1};
	int i;

	text(x, "screw.name", both, a->name, b->name);
	qty2(x, "screw.diameter", OW_DIM_LENGTH, a->diameter_m, b->diameter_m);
	qty2(x, "screw.lead", OW_DIM_LENGTH, a->lead_m, b->lead_m);
	count(x, "screw.flights", a->flights, b->flights);
	qty2(x, "screw.flight_width", OW_DIM_LENGTH, a->flight_width_m,
	     b->flight_width_m);
	qty2(x, "screw.clearance", OW_DIM_LENGTH, a->clearance_m,
	     b->clearance_m);
	for (i = 0; i < imax(a->n_sections, b->n_sections); i++)
		section(x, i);
	for (i = 0; i < imax(a->n_wear, b->n_wear); i++)
		wear(x, i);
}

/* ---- resin ---- */

static const char *model_name(enum ow_visc_model m)
{
	return m == OW_VISC_POWER_LAW
	           ? "power-law"
	           : (m == OW_VISC_CROSS ? "cross" : "carreau-yasuda");
}

static void viscosity(struct diffs *x)
{
	const struct ow_viscosity *a = &x->s[0]->resin.visc;
	const struct ow_viscosity *b = &x->s[1]->resin.visc;
	static const int both[2] = {1, 1};
	int pl[2] = {a->model == OW_VISC_POWER_LAW,
	             b->model == OW_VISC_POWER_LAW};
	int cr[2] = {a->model == OW_VISC_CROSS, b->model == OW_VISC_CROSS};
	int cy[2] = {a->model == OW_VISC_CARREAU_YASUDA,
	             b->model == OW_VISC_CARREAU_YASUDA};
	int eta0[2] = {!pl[0], !pl[1]};
	int ar[2] = {a->shift == OW_SHIFT_ARRHENIUS,
	             b->shift == OW_SHIFT_ARRHENIUS};
	int wlf[2] = {!ar[0], !ar[1]};

	text(x, "resin.viscosity.model", both, model_name(a->model),
	     model_name(b->model));
	qty(x, "resin.viscosity.consistency", OW_DIM_CONSISTENCY, pl,
	    a->consistency_Pa_sn, b->consistency_Pa_sn);
	qty2(x, "resin.viscosity.index", OW_DIM_NONE, a->index, b->index);
	qty(x, "resin.viscosity.zero_shear", OW_DIM_VISCOSITY, eta0,
	    a->zero_shear_Pa_s, b->zero_shear_Pa_s);
	qty(x, "resin.viscosity.critical_stress", OW_DIM_PRESSURE, cr,
	    a->critical_stress_Pa, b->critical_stress_Pa);
	qty(x, "resin.viscosity.time_constant", OW_DIM_TIME, cy,
	    a->time_constant_s, b->time_constant_s);
	qty(x, "resin.viscosity.a", OW_DIM_NONE, cy, a->a, b->a);
	qty2(x, "resin.viscosity.reference_temperature", OW_DIM_TEMPERATURE,
	     a->ref_temp_K, b->ref_temp_K);
	text(x, "resin.viscosity.shift.type", both, ar[0] ? "arrhenius" : "wlf",
	     ar[1] ? "arrhenius" : "wlf");
	qty(x, "resin.viscosity.shift.activation_energy", OW_DIM_MOLAR_ENERGY,
	    ar, a->activation_J_mol, b->activation_J_mol);
	qty(x, "resin.viscosity.shift.c1", OW_DIM_NONE, wlf, a->wlf_c1,
	    b->wlf_c1);
	qty(x, "resin.viscosity.shift.c2", OW_DIM_TEMP_DIFF, wlf, a->wlf_c2_K,
	    b->wlf_c2_K);
}

/* Heats of fusion read in kJ/kg or BTU/lb (1 BTU/lb = 2.326 kJ/kg
 * exactly, International Table BTU: NIST SP 811 (2008) B.8), not in the
 * kWh/kg or hp h/lb of specific drive energies. */
static void fusion(struct diffs *x, double va, double vb)
{
	int us = x->sys == OW_SYS_US;
	double f = us ? 2326.0 : 1e3;
	char a[80], b[80];

	snprintf(a, sizeof a, "%.6g %s", va / f, us ? "BTU/lb" : "kJ/kg");
	snprintf(b, sizeof b, "%.6g %s", vb / f, us ? "BTU/lb" : "kJ/kg");
	add(x, "resin.heat_of_fusion", a, b);
}

static void resin(struct diffs *x)
{
	const struct ow_material *a = &x->s[0]->resin, *b = &x->s[1]->resin;
	static const int both[2] = {1, 1};

	text(x, "resin.name", both, a->name, b->name);
	qty2(x, "resin.solid_density", OW_DIM_DENSITY, a->solid_density_kg_m3,
	     b->solid_density_kg_m3);
	qty2(x, "resin.bulk_density", OW_DIM_DENSITY, a->bulk_density_kg_m3,
	     b->bulk_density_kg_m3);
	qty2(x, "resin.melt_density", OW_DIM_DENSITY, a->melt_density_kg_m3,
	     b->melt_density_kg_m3);
	qty2(x, "resin.solid_heat_capacity", OW_DIM_SPECIFIC_HEAT,
	     a->solid_cp_J_kgK, b->solid_cp_J_kgK);
	qty2(x, "resin.melt_heat_capacity", OW_DIM_SPECIFIC_HEAT,
	     a->melt_cp_J_kgK, b->melt_cp_J_kgK);
	qty2(x, "resin.solid_conductivity", OW_DIM_CONDUCTIVITY,
	     a->solid_k_W_mK, b->solid_k_W_mK);
	qty2(x, "resin.melt_conductivity", OW_DIM_CONDUCTIVITY, a->melt_k_W_mK,
	     b->melt_k_W_mK);
	qty2(x, "resin.melting_point", OW_DIM_TEMPERATURE, a->melt_temp_K,
	     b->melt_temp_K);
	fusion(x, a->fusion_J_kg, b->fusion_J_kg);
	qty2(x, "resin.friction_barrel", OW_DIM_NONE, a->friction_barrel,
	     b->friction_barrel);
	qty2(x, "resin.friction_screw", OW_DIM_NONE, a->friction_screw,
	     b->friction_screw);
	viscosity(x);
}

/* ---- line ---- */

static void zones(struct diffs *x)
{
	const struct ow_line *a = &x->s[0]->line, *b = &x->s[1]->line;
	int i;
	char f[96];

	for (i = 0; i < imax(a->n_zones, b->n_zones); i++) {
		int in[2] = {i < a->n_zones, i < b->n_zones};

		snprintf(f, sizeof f, "barrel.zones[%d].to", i);
		along(x, f, in, a->zones[i].to_m, b->zones[i].to_m);
		snprintf(f, sizeof f, "barrel.zones[%d].set", i);
		qty(x, f, OW_DIM_TEMPERATURE, in, a->zones[i].set_K,
		    b->zones[i].set_K);
	}
	text(x, "barrel.screw_root", (const int[2]){1, 1},
	     a->root_adiabatic ? "adiabatic" : "held",
	     b->root_adiabatic ? "adiabatic" : "held");
	qty(x, "barrel.screw_root_temperature", OW_DIM_TEMPERATURE,
	    (const int[2]){!a->root_adiabatic, !b->root_adiabatic},
	    a->root_temp_K, b->root_temp_K);
}

static void die(struct diffs *x)
{
	const struct ow_die *a = &x->s[0]->line.die, *b = &x->s[1]->line.die;
	const struct ow_die_field *f = ow_die_fields();
	char field[48];
	int i;

	text(x, "die.type", (const int[2]){1, 1}, ow_die_type_name(a->type),
	     ow_die_type_name(b->type));
	for (i = 0; i < OW_DIE_FIELDS; i++) {
		snprintf(field, sizeof field, "die.%s", f[i].key);
		qty(x, field, f[i].dim,
		    (const int[2]){ow_die_has(a->type, &f[i]),
		                   ow_die_has(b->type, &f[i])},
		    ow_die_value(a, &f[i]), ow_die_value(b, &f[i]));
	}
}

static void limits(struct diffs *x)
{
	const struct ow_limits *a = &x->s[0]->line.limits;
	const struct ow_limits *b = &x->s[1]->line.limits;

	qty2(x, "limits.peak_temp", OW_DIM_TEMPERATURE, a->peak_temp_K,
	     b->peak_temp_K);
	qty2(x, "limits.unmelt", OW_DIM_NONE, a->unmelt_frac, b->unmelt_frac);
	qty2(x, "limits.pressure", OW_DIM_PRESSURE, a->pressure_Pa,
	     b->pressure_Pa);
	qty2(x, "limits.power", OW_DIM_POWER, a->power_W, b->power_W);
	qty2(x, "limits.torque", OW_DIM_TORQUE, a->torque_Nm, b->torque_Nm);
	qty2(x, "limits.min_melt_temp", OW_DIM_TEMPERATURE, a->min_melt_temp_K,
	     b->min_melt_temp_K);
	qty2(x, "limits.min_output", OW_DIM_MASS_FLOW, a->min_output_kg_s,
	     b->min_output_kg_s);
	qty2(x, "limits.max_output", OW_DIM_MASS_FLOW, a->max_output_kg_s,
	     b->max_output_kg_s);
	qty2(x, "limits.max_sbr", OW_DIM_NONE, a->max_sbr, b->max_sbr);
}

static void line(struct diffs *x)
{
	const struct ow_line *a = &x->s[0]->line, *b = &x->s[1]->line;

	qty2(x, "feed.temperature", OW_DIM_TEMPERATURE, a->feed_temp_K,
	     b->feed_temp_K);
	qty2(x, "feed.pressure", OW_DIM_PRESSURE, a->numerics.feed_pressure_Pa,
	     b->numerics.feed_pressure_Pa);
	count(x, "barrel.zones (count)", a->n_zones, b->n_zones);
	zones(x);
	die(x);
	qty2(x, "screen_pack.pressure_drop", OW_DIM_PRESSURE,
	     a->screen_pressure_Pa, b->screen_pressure_Pa);
	limits(x);
	count(x, "numerics.stations_per_turn", a->numerics.stations_per_turn,
	      b->numerics.stations_per_turn);
	count(x, "numerics.depth_nodes", a->numerics.depth_nodes,
	      b->numerics.depth_nodes);
}

int ow_compare_fields(const struct ow_study *a, const struct ow_study *b,
                      enum ow_unit_system sys, int all,
                      struct ow_input_diff *out, int max)
{
	struct diffs x = {{a, b}, sys, out, max, 0, all};

	text(&x, "title", (const int[2]){1, 1}, a->title, b->title);
	screw(&x);
	resin(&x);
	line(&x);
	return x.n;
}

int ow_compare_inputs(const struct ow_study *a, const struct ow_study *b,
                      enum ow_unit_system sys, struct ow_input_diff *out,
                      int max)
{
	return ow_compare_fields(a, b, sys, 0, out, max);
}
