/* ow_calib_factor.h - the model factors as study inputs: the table of
 * factors (each multiplies one model input; 1 = off), the quantities a
 * reading may hold, and the study's calibration block. The loader applies
 * the factors to the study it returns, so a calibrated study needs nothing
 * but its own file. The fit of the factors to a line's readings is
 * ow_calib.h. */
#ifndef OW_CALIB_FACTOR_H
#define OW_CALIB_FACTOR_H

#include "ow_status.h"
#include "ow_units.h"

struct ow_study; /* ow_study.h */

/* The factors, in table order. */
enum ow_calib_factor_id {
	OW_CF_VISCOSITY, /* viscosity_scale: the resin's melt viscosity */
	OW_CF_FRICTION,  /* friction: both pellet friction coefficients */
	OW_CF_DIE,       /* die_factor: the die's pressure requirement */
	OW_CF_HEAT,      /* heat_transfer: the barrel wall coefficients */
	OW_CF_COUNT
};

/* The quantities a reading may hold. */
enum ow_calib_qty {
	OW_CQ_OUTPUT,   /* output, kg/s */
	OW_CQ_PRESSURE, /* head pressure at the screw tip, Pa */
	OW_CQ_MELT,     /* bulk melt temperature at the tip, K */
	OW_CQ_POWER,    /* drive power, W */
	OW_CQ_TORQUE,   /* screw torque, N m */
	OW_CQ_COUNT
};

#define OW_CALIB_MAX_READINGS 64
#define OW_CALIB_MAX_RESID    (OW_CALIB_MAX_READINGS * OW_CQ_COUNT)
#define OW_CALIB_SOURCE_LEN   256

/* One factor of the table. */
struct ow_calib_factor {
	const char *name; /* key in the calibration block and for --free */
	const char *what; /* what it multiplies, for people */
	double lo, hi;    /* bounds of the fitted value */
	/* Multiply the study's input by f (f = 1 leaves it as it is). */
	void (*apply)(struct ow_study *s, double f);
};

/* One residual of a fit, as the report shows it (SI). */
struct ow_calib_resid {
	int line; /* line of the readings file */
	double rpm;
	enum ow_calib_qty qty;
	double measured, modelled, sd;
};

/* The study's calibration block (all factors 1 when it is absent). */
struct ow_calibration {
	int present;                   /* the study has the block */
	double value[OW_CF_COUNT];     /* factor values, 1 = off */
	double std_error[OW_CF_COUNT]; /* NAN when not known */
	char source[OW_CF_COUNT][OW_CALIB_SOURCE_LEN]; /* "" when none */
	unsigned free_mask;         /* bit k: fitted by default */
	double sd_abs[OW_CQ_COUNT]; /* stated uncertainties, SI; NAN: */
	double sd_rel[OW_CQ_COUNT]; /* relative ones (one of the two) */
	/* The fit that produced the values (written by calibrate), for the
	 * report: readings file, chi-square, degrees of freedom, the
	 * correlation of the fitted factors (in fit_ids order), residuals. */
	int has_fit;
	char fit_readings[OW_CALIB_SOURCE_LEN];
	double chi2;
	int dof;
	int n_fit;
	int fit_ids[OW_CF_COUNT];
	double corr[OW_CF_COUNT][OW_CF_COUNT];
	int n_resid;
	struct ow_calib_resid resid[OW_CALIB_MAX_RESID];
};

/* The factor k of the table (0 <= k < OW_CF_COUNT), and by name (-1 when
 * there is no such factor). */
const struct ow_calib_factor *ow_calib_factor(int k);
int ow_calib_factor_find(const char *name);

/* Names of the quantities as in the readings header and the calibration
 * block ("output", "head_pressure", "melt_temp", "drive_power", "torque"),
 * their dimension, and their default uncertainties (sd_abs SI or NAN,
 * sd_rel a fraction or NAN). */
const char *ow_calib_qty_name(enum ow_calib_qty q);
enum ow_dim ow_calib_qty_dim(enum ow_calib_qty q);
void ow_calib_default_sd(enum ow_calib_qty q, double *sd_abs, double *sd_rel);

/* No factors (all 1, no errors, nothing free), default uncertainties. */
void ow_calib_default(struct ow_calibration *c);

/* Apply factors f[OW_CF_COUNT] to s (each multiplies its input); f NULL:
 * s->calib.value. The loader does this once. */
void ow_calib_apply(struct ow_study *s, const double *f);

/* Any factor other than 1? */
int ow_calib_active(const struct ow_calibration *c);

/* Residual of one entry in standard deviations. */
double ow_calib_resid_sd(const struct ow_calib_resid *e);

#endif
