/* ow_calib.h - calibrating the model to a line: a few named model factors
 * (each multiplies one model input; 1 = off), the readings a plant logs
 * (screw speed, set-points, output, head pressure, melt temperature, drive
 * load), and the weighted least-squares fit of the factors to them.
 *
 * The factors are plain study inputs (the study's `calibration` block): the
 * loader applies them to the study it returns, so a calibrated study needs
 * nothing but its own file. Each factor is one entry of a table: its name,
 * its bounds, and how it is applied to a study.
 *
 * The fit minimises sum_i ((model_i - measured_i) / sd_i)^2 over the free
 * factors (unknowns ln f, so every factor stays positive) with GSL's
 * trust-region Levenberg-Marquardt solver; each model value is a point solve
 * of ow_solver_run at the reading's screw speed and set-points. */
#ifndef OW_CALIB_H
#define OW_CALIB_H

#include <stddef.h>

#include "ow_calib_factor.h"
#include "ow_line.h"
#include "ow_status.h"
#include "ow_units.h"

struct ow_study; /* ow_study.h */

/* ---- readings --------------------------------------------------------- */

/* One logged steady setting. */
struct ow_reading {
	int line; /* line of the file */
	double rpm;
	int n_set; /* zones with a set-point given */
	int set_given[OW_MAX_ZONES];
	double set_K[OW_MAX_ZONES];
	double value[OW_CQ_COUNT]; /* measured, SI; NAN when not read */
	char notes[128];
};

struct ow_readings {
	char source[OW_CALIB_SOURCE_LEN]; /* file name as given */
	size_t n;
	struct ow_reading r[OW_CALIB_MAX_READINGS];
	char unit[OW_CQ_COUNT][32]; /* the unit each column was read in */
};

/* Read a readings table (CSV with units in the header). Columns:
 * screw_speed_rpm (required); zone1_degC, zone2_degC, ... (optional; an
 * empty cell or a missing column keeps the study's set-point); any of
 * output_<mass flow unit>, head_pressure_<pressure unit>,
 * melt_temp_<temperature unit>, drive_power_<power unit>,
 * torque_<torque unit> (an empty cell: not read); `notes` (text). Zones
 * beyond n_zones and rows with no quantity are rejected. Errors are
 * OW_EINPUT "<file>: line <n>[, column <k> (<name>)]: ...". The caller
 * owns *out (free()). */
enum ow_status ow_calib_readings_read(const struct ow_units *u,
                                      const char *path, int n_zones,
                                      struct ow_readings **out,
                                      struct ow_diag *d);
enum ow_status ow_calib_readings_parse(const struct ow_units *u,
                                       const char *text, size_t len,
                                       const char *name, int n_zones,
                                       struct ow_readings **out,
                                       struct ow_diag *d);

/* ---- the fit ----------------------------------------------------------- */

struct ow_calib_options {
	unsigned free_mask;         /* bit k: factor k is fitted */
	double sd_abs[OW_CQ_COUNT]; /* uncertainties (see ow_calibration) */
	double sd_rel[OW_CQ_COUNT];
	int jobs; /* threads for the readings, 0: all */
};

struct ow_calib_result {
	int n_free;
	int ids[OW_CF_COUNT];          /* the free factors, table order */
	double value[OW_CF_COUNT];     /* every factor after the fit */
	double std_error[OW_CF_COUNT]; /* of the free ones (else NAN) */
	double corr[OW_CF_COUNT][OW_CF_COUNT]; /* free ones, ids order */
	double chi2;       /* sum of squared weighted residuals */
	int dof;           /* residuals - free factors */
	double err_scale;  /* max(1, sqrt(chi2/dof)), applied */
	double chi2_start; /* at the study's own factors */
	int n_resid;
	struct ow_calib_resid resid[OW_CALIB_MAX_RESID];
	int iterations;
	int solves; /* point solves done */
};

/* Fit the free factors of study s (as loaded: its own factors applied and
 * recorded in s->calib) to readings r. With no factor free, the result
 * holds the residuals at the study's own factors and is OW_OK.
 * Refusals (OW_EINPUT, the message says what and which factor to fix):
 * fewer residuals than free factors; a reading the model cannot reach
 * (named by its line); a factor no reading moves (singular Jacobian); a
 * factor at its bound; readings that contradict each other or the model
 * (chi-square beyond its 0.1 % point, the worst residuals named). A
 * reading the solver cannot match is OW_ECOMPUTE naming its line. */
enum ow_status ow_calib_run(const struct ow_study *s,
                            const struct ow_readings *r,
                            const struct ow_calib_options *o,
                            struct ow_calib_result *out, struct ow_diag *d);

/* Options from the study's calibration block (free factors, uncertainties). */
void ow_calib_options_from(const struct ow_calibration *c,
                           struct ow_calib_options *o);

/* ---- output ------------------------------------------------------------ */

/* The text of the calibrated study: the study file at s->path with its
 * `calibration` block replaced by the fit (factor values, standard errors,
 * the readings file name as source, the free factors, the uncertainties,
 * the fit record), and the paths to the screw and resin files rewritten
 * relative to the folder of out_path. The caller frees *text. */
enum ow_status ow_calib_study_text(const struct ow_study *s,
                                   const struct ow_calib_options *o,
                                   const struct ow_calib_result *res,
                                   const char *readings_name,
                                   const char *out_path, char **text,
                                   struct ow_diag *d);

#endif
