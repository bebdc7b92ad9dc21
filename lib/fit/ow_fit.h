/* ow_fit.h - fit a resin's melt viscosity model and its temperature shift to
 * lab data (viscosity against shear rate at several temperatures), and write
 * the result as the `viscosity` block of a resin file.
 *
 * The fit minimises the squared residuals of log10 viscosity over every
 * point at once (model and shift jointly) with GSL's trust-region
 * Levenberg-Marquardt solver; the model evaluated is ow_viscosity_eval, the
 * very function the solver uses, so fitted parameters mean the same thing
 * everywhere. Oscillatory data are accepted through the Cox-Merz rule
 * (Cox & Merz, J. Polym. Sci. 28 (1958) 619): complex viscosity at angular
 * frequency w is taken as steady-shear viscosity at shear rate w. */
#ifndef OW_FIT_H
#define OW_FIT_H

#include <stddef.h>

#include "ow_material.h"
#include "ow_status.h"
#include "ow_units.h"

#define OW_FIT_MAX_PARAMS 6
#define OW_FIT_MAX_TEMPS  32
#define OW_FIT_MAX_WARN   12
#define OW_FIT_WARN_LEN   240
#define OW_FIT_N_MODELS   3
#define OW_FIT_ANY_MODEL  (-1)

/* One measurement. */
struct ow_fit_point {
	double temp_K;
	double shear_rate_1_s; /* or angular frequency, rad/s (Cox-Merz) */
	double viscosity_Pa_s; /* steady-shear or complex viscosity */
	int line;              /* line in the data file, 0 when not read */
};

struct ow_fit_data {
	char source[256]; /* data file name as given, for messages */
	size_t n;
	struct ow_fit_point *points; /* n points (owned) */
	int cox_merz;                /* 1: the rates are angular frequencies */
};

/* An empty data set of n points (all zero) for the caller to fill; source
 * names it in messages. Free with ow_fit_data_destroy. */
enum ow_status ow_fit_data_create(size_t n, const char *source,
                                  struct ow_fit_data **out, struct ow_diag *d);

/* Read a lab table. Header columns (any order, other columns ignored):
 *   temperature_<unit>        degC, degF, K
 *   shear_rate_<unit>         1/s; or angular_frequency_<unit> (rad/s),
 *                             or shear_rate_rad/s: Cox-Merz data
 *   viscosity_<unit>          Pa s, Pa.s, kPa s, ...; or
 *                             complex_viscosity_<unit>
 * Every value must be positive (temperatures above 0 K). Errors are
 * OW_EINPUT with "<file>: line <n>[, column <k> (<name>)]: ..." in d. */
enum ow_status ow_fit_data_read(const struct ow_units *u, const char *path,
                                struct ow_fit_data **out, struct ow_diag *d);

/* The same from text in memory; name is used in messages. */
enum ow_status ow_fit_data_parse(const struct ow_units *u, const char *text,
                                 size_t len, const char *name,
                                 struct ow_fit_data **out, struct ow_diag *d);

/* NULL-safe. */
void ow_fit_data_destroy(struct ow_fit_data *data);

struct ow_fit_options {
	int model; /* enum ow_visc_model, or OW_FIT_ANY_MODEL:
	              fit each and recommend one */
	enum ow_shift_type shift;
	double ref_temp_K; /* NAN: the middle data temperature (the
	                      lower middle one for an even count) */
};

/* Any model, Arrhenius shift, reference at the middle data temperature. */
struct ow_fit_options ow_fit_options_default(void);

/* One fitted parameter, in SI (consistency Pa s^n, zero_shear Pa s,
 * critical_stress Pa, time_constant s, activation_energy J/mol, c2 K). */
struct ow_fit_param {
	const char *key; /* resin-file key: "zero_shear", "index", ... */
	double value;
	double std_error; /* INFINITY when the data do not determine it */
	double rel_error; /* std_error / |value| */
};

/* Residuals r = log10(eta_fit / eta_data) of the points at one
 * temperature. */
struct ow_fit_temp {
	double temp_K; /* mean of the points' temperatures */
	int n_points;
	double min_rate_1_s, max_rate_1_s;
	double mean_log10; /* bias: > 0 means the fit lies above */
	double rms_log10;
	double max_abs_log10;
};

/* One model fitted to the data. */
struct ow_fit_result {
	enum ow_status status;     /* OW_OK, or why this model has no fit */
	char message[OW_DIAG_LEN]; /* the reason when status != OW_OK */
	struct ow_viscosity visc;  /* the fitted model, ready for the solver */
	int n_params;
	struct ow_fit_param params[OW_FIT_MAX_PARAMS];
	double corr[OW_FIT_MAX_PARAMS][OW_FIT_MAX_PARAMS]; /* correlations */
	size_t n_points;
	double rss_log10; /* sum of squared log10 residuals */
	double rms_log10; /* sqrt(rss / n_points) */
	double aic, bic;  /* information criteria on log residuals */
	int converged;    /* 0: iteration limit reached */
	int n_temps;
	struct ow_fit_temp temps[OW_FIT_MAX_TEMPS];
	int n_warnings;
	char warnings[OW_FIT_MAX_WARN][OW_FIT_WARN_LEN];
};

/* Everything `opwin fit` reports. */
struct ow_fit_report {
	struct ow_fit_options opts;
	double ref_temp_K;                 /* the reference temperature used */
	double min_rate_1_s, max_rate_1_s; /* of the data */
	int n_temps;
	double temps_K[OW_FIT_MAX_TEMPS]; /* distinct data temperatures */
	int n_fits;
	struct ow_fit_result fits[OW_FIT_N_MODELS];
	int best;       /* index into fits of the recommendation */
	char why[1024]; /* criterion and reason for the choice */
	int n_warnings; /* warnings about the data as a whole */
	char warnings[OW_FIT_MAX_WARN][OW_FIT_WARN_LEN];
};

/* Fit opts->model (or each model) with opts->shift to data. Data that cannot
 * support the fit (fewer than 2 temperatures, fewer points than parameters
 * + 2) are OW_EINPUT naming the file and lines. When no model could be
 * fitted the result is OW_ECOMPUTE with the reason. Warnings (shear-rate
 * coverage, poorly determined parameters) are in the report. Thread-safe
 * apart from GSL's process-wide error handler, which this call switches off
 * (GSL's default aborts the process). */
enum ow_status ow_fit_run(const struct ow_fit_data *data,
                          const struct ow_fit_options *opts,
                          struct ow_fit_report *out, struct ow_diag *d);

/* Name of a model as written in resin files ("carreau-yasuda"), and back
 * (OW_EARG for an unknown name). Likewise for shifts ("arrhenius"). */
const char *ow_fit_model_name(enum ow_visc_model m);
enum ow_status ow_fit_model_parse(const char *s, enum ow_visc_model *out);
const char *ow_fit_shift_name(enum ow_shift_type s);
enum ow_status ow_fit_shift_parse(const char *s, enum ow_shift_type *out);

/* The resin-file text {"notes": notes, "viscosity": {...}} (notes omitted
 * when NULL) with every dimensional value a string with its SI unit. The
 * caller frees *text with free(). */
enum ow_status ow_fit_block_text(const struct ow_viscosity *v,
                                 const char *notes, char **text,
                                 struct ow_diag *d);

/* Write that text to path atomically (a temporary file in the same folder,
 * renamed when complete). OW_EIO when it cannot be written. */
enum ow_status ow_fit_write_block(const struct ow_viscosity *v,
                                  const char *notes, const char *path,
                                  struct ow_diag *d);

/* Replace (or add, last) the `viscosity` block of the resin file at path,
 * atomically, every other byte of the file as the user wrote it (layout,
 * key order, sources). OW_EINPUT when the file is missing, not one JSON
 * object, or not a resin file (a key a resin does not have, e.g. a
 * study's, or no "name"): nothing is written then. OW_EIO when it cannot
 * be rewritten. */
enum ow_status ow_fit_merge_into(const struct ow_viscosity *v, const char *path,
                                 struct ow_diag *d);

/* Draw the data points and the fitted curve per temperature on log-log axes
 * into a PNG at path (atomically), temperatures labelled in sys's unit.
 * Uses DejaVu Sans (fonts-dejavu-core); OW_EIO when the font is missing or
 * the file cannot be written. */
enum ow_status ow_fit_plot_png(const struct ow_fit_data *data,
                               const struct ow_fit_result *fit,
                               enum ow_unit_system sys, const char *path,
                               struct ow_diag *d);

#endif
