/* calib_factor.c - the calibration factors: one table entry each (name,
 * bounds, how it multiplies one input of a study), the quantities a line
 * reading may hold and their default uncertainties. */
#include "ow_calib_factor.h"

#include <math.h>
#include <string.h>

#include "ow_study.h"

/* Every rate and temperature alike: eta -> f eta. Power law: m -> f m.
 * Cross: eta0 -> f eta0 and tau* -> f tau* keep eta0 gdot / tau*, so
 * eta(gdot) -> f eta(gdot) exactly. Carreau-Yasuda: eta0 -> f eta0 (the
 * bracket holds no viscosity). */
static void apply_viscosity(struct ow_study *s, double f)
{
	struct ow_viscosity *v = &s->resin.visc;

	v->consistency_Pa_sn *= f;
	v->zero_shear_Pa_s *= f;
	v->critical_stress_Pa *= f;
}

/* One scale on both pellet friction coefficients: line readings (drive
 * load) see their combined effect on the solid plug, not each apart. */
static void apply_friction(struct ow_study *s, double f)
{
	s->resin.friction_barrel *= f;
	s->resin.friction_screw *= f;
}

static void apply_die(struct ow_study *s, double f)
{
	s->line.die_factor *= f;
}

/* The zones' wall coefficients between control point and bore, through
 * the line's one multiplier on all of them. */
static void apply_heat(struct ow_study *s, double f)
{
	s->line.heat_transfer_factor *= f;
}

static const struct ow_calib_factor table[OW_CF_COUNT] = {
    {"viscosity_scale",
     "multiplies the resin's melt viscosity at every shear rate and "
     "temperature",
     0.2, 5.0, apply_viscosity},
    {"friction",
     "multiplies both pellet friction coefficients (barrel and screw)", 0.25,
     4.0, apply_friction},
    {"die_factor", "multiplies the pressure the die needs", 0.2, 5.0,
     apply_die},
    {"heat_transfer",
     "multiplies every barrel zone's heat-transfer coefficient between "
     "its set-point and the bore",
     0.1, 10.0, apply_heat},
};

const struct ow_calib_factor *ow_calib_factor(int k)
{
	return k >= 0 && k < OW_CF_COUNT ? &table[k] : NULL;
}

int ow_calib_factor_find(const char *name)
{
	int k;

	for (k = 0; k < OW_CF_COUNT; k++)
		if (strcmp(table[k].name, name) == 0)
			return k;
	return -1;
}

/* Name, dimension and default uncertainty (absolute SI or relative) of
 * each quantity. The defaults are common practice for plant instruments:
 * a gravimetric or timed-sample output 2 %, a melt pressure transducer
 * 0.5 MPa, a melt thermocouple in the adapter 3 K, drive power and
 * torque from the drive 3 %. */
static const struct {
	const char *name;
	enum ow_dim dim;
	double sd_abs, sd_rel;
} quantities[OW_CQ_COUNT] = {
    {"output", OW_DIM_MASS_FLOW, NAN, 0.02},
    {"head_pressure", OW_DIM_PRESSURE, 0.5e6, NAN},
    {"melt_temp", OW_DIM_TEMPERATURE, 3.0, NAN},
    {"drive_power", OW_DIM_POWER, NAN, 0.03},
    {"torque", OW_DIM_TORQUE, NAN, 0.03},
};

const char *ow_calib_qty_name(enum ow_calib_qty q)
{
	return quantities[q].name;
}

enum ow_dim ow_calib_qty_dim(enum ow_calib_qty q)
{
	return quantities[q].dim;
}

void ow_calib_default_sd(enum ow_calib_qty q, double *sd_abs, double *sd_rel)
{
	*sd_abs = quantities[q].sd_abs;
	*sd_rel = quantities[q].sd_rel;
}

void ow_calib_default(struct ow_calibration *c)
{
	int k;

	memset(c, 0, sizeof *c);
	for (k = 0; k < OW_CF_COUNT; k++) {
		c->value[k] = 1.0;
		c->std_error[k] = NAN;
	}
	for (k = 0; k < OW_CQ_COUNT; k++)
		ow_calib_default_sd((enum ow_calib_qty)k, &c->sd_abs[k],
		                    &c->sd_rel[k]);
}

void ow_calib_apply(struct ow_study *s, const double *f)
{
	const double *v = f ? f : s->calib.value;
	double copy[OW_CF_COUNT];
	int k;

	memcpy(copy, v, sizeof copy); /* f may point into s */
	for (k = 0; k < OW_CF_COUNT; k++)
		if (copy[k] != 1.0)
			table[k].apply(s, copy[k]);
}

int ow_calib_active(const struct ow_calibration *c)
{
	int k;

	for (k = 0; k < OW_CF_COUNT; k++)
		if (c->value[k] != 1.0)
			return 1;
	return 0;
}

double ow_calib_resid_sd(const struct ow_calib_resid *e)
{
	return (e->modelled - e->measured) / e->sd;
}
