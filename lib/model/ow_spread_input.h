/* ow_spread_input.h - the study's spread block: the inputs a line does
 * not control, each varied over a range (uniform) or with a standard
 * deviation (normal, truncated at 3 sd), how a value moves the study, and
 * the Latin hypercube the samples are drawn from (McKay, Beckman &
 * Conover 1979). The sampled sweep over them is ow_spread.h. */
#ifndef OW_SPREAD_INPUT_H
#define OW_SPREAD_INPUT_H

#include "ow_calib_factor.h"
#include "ow_status.h"

struct ow_study; /* ow_study.h */

/* The inputs a spread may vary. */
enum ow_spread_kind {
	OW_SK_VISCOSITY, /* viscosity_scale: multiplier on the viscosity */
	OW_SK_MELTING,   /* melting_point: shift of the melting point, K */
	OW_SK_FEED_TEMP, /* feed_temperature: shift of the feed, K */
	OW_SK_CLEARANCE, /* clearance: new radial flight clearance, m */
	OW_SK_HEAT,      /* barrel_heat_factor: multiplier on the walls */
	OW_SK_CALIB,     /* a calibrated factor within its standard error */
	OW_SK_COUNT
};

#define OW_SPREAD_MAX_INPUTS      (OW_SK_COUNT + OW_CF_COUNT)
#define OW_SPREAD_DEFAULT_SAMPLES 16
#define OW_SPREAD_MAX_SAMPLES     1024
#define OW_SPREAD_DEFAULT_LEVEL   0.95
#define OW_SPREAD_DEFAULT_SEED    20261204u

/* One varied input. Its value is a multiplier (viscosity, heat, calib),
 * a shift in K (melting, feed) or an absolute clearance in m. */
struct ow_spread_input {
	enum ow_spread_kind kind;
	int factor; /* calibration factor id (viscosity, heat, calib) or
	               -1 */
	int normal; /* 0: uniform on lo..hi; 1: normal, mean lo, sd hi,
	               truncated at 3 sd */
	double lo, hi;
	double nominal; /* the value that leaves the study as it is */
	char name[48];  /* "viscosity_scale", "calibration.die_factor" */
};

struct ow_spread {
	int present; /* the study has the block (or --spread gave one) */
	int n;
	struct ow_spread_input in[OW_SPREAD_MAX_INPUTS];
	int samples; /* per sampled point */
	unsigned long seed;
	double level;     /* share of safe samples the robust window needs */
	int calib_errors; /* add the calibrated factors' standard errors */
};

/* No inputs, default samples, seed and level. */
void ow_spread_default(struct ow_spread *sp);

/* Name of kind k as a key of the block. */
const char *ow_spread_kind_name(enum ow_spread_kind k);

/* The lowest and highest value input in can take. */
void ow_spread_extent(const struct ow_spread_input *in, double *lo, double *hi);

/* Value of input in at unit coordinate u in (0, 1) (inverse CDF). */
double ow_spread_value(const struct ow_spread_input *in, double u);

/* Move input in of study s from its nominal to value v (s is a copy of
 * the nominal study). */
void ow_spread_apply(struct ow_study *s, const struct ow_spread_input *in,
                     double v);

/* Add the calibrated factors with a standard error as normal inputs (when
 * sp->calib_errors and s->calib has them); the loader calls this. */
void ow_spread_add_calib(struct ow_spread *sp, const struct ow_calibration *c);

/* Latin hypercube of n samples in d dimensions for lattice point index
 * `point` of a run seeded with seed: u[i * d + k] in (0, 1). The same
 * arguments give the same numbers on every machine and thread. */
void ow_spread_lhs(unsigned long seed, long point, int n, int d, double *u);

#endif
