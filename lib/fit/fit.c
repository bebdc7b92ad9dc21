/* fit.c - nonlinear least-squares fit of a viscosity model and its
 * temperature shift to lab data, with standard errors and a model choice. */
#include "ow_fit.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_multifit_nlinear.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define LN10       2.30258509299404568402
#define TEMP_TOL_K 0.5  /* points closer than this share a temperature */
#define RESID_CAP  10.0 /* decades: stands in for an undefined residual */
#define MAX_ITER   400
#define POOR_REL   0.5    /* relative standard error called "poor" */
#define POOR_CORR  0.99   /* correlation called "poor" */
#define RATE_LO    10.0   /* 1/s: channel and die shear rates, roughly */
#define RATE_HI    1000.0 /* 10..1000 1/s (common practice) */
#define MAX_STARTS 32

/* How one unknown x maps to SI: LINEAR v = scale x; LOG v = 10^x;
 * BOUNDED v = 10^(l0 + (l1 - l0) s(x)), s the logistic function, which keeps
 * v inside (10^l0, 10^l1): the range a resin file accepts, for parameters
 * the data may leave undetermined (WLF c2 when the shift is nearly
 * Arrhenius, the Yasuda a with no transition in the data). */
enum pkind { LINEAR, LOG, BOUNDED };

struct pdef {
	const char *key;
	enum pkind kind;
	double scale;  /* LINEAR */
	double l0, l1; /* BOUNDED: log10 of the bounds */
};

static const struct pdef defs_power[] = {{"consistency", LOG, 1, 0, 0},
                                         {"index", LINEAR, 1, 0, 0}};
static const struct pdef defs_cross[] = {{"zero_shear", LOG, 1, 0, 0},
                                         {"index", LINEAR, 1, 0, 0},
                                         {"critical_stress", LOG, 1, 0, 0}};
static const struct pdef defs_cy[] = {
    {"zero_shear", LOG, 1, 0, 0},
    {"index", LINEAR, 1, 0, 0},
    {"time_constant", LOG, 1, 0, 0},
    {"a", BOUNDED, 1, -1.30103, 1.0}}; /* 0.05 .. 10 */
static const struct pdef defs_arrhenius[] = {
    {"activation_energy", LINEAR, 1e3, 0, 0}}; /* x in kJ/mol */
static const struct pdef defs_wlf[] = {
    {"c1", LINEAR, 1, 0, 0}, {"c2", BOUNDED, 1, 0.0, 3.0}}; /* 1..1000 K */

/* One fit: the data, the model and shift, the reference temperature. */
struct job {
	const struct ow_fit_data *data;
	enum ow_visc_model model;
	enum ow_shift_type shift;
	double ref_K;
	int n_model, p; /* unknowns of the model, of model + shift */
	const struct pdef *defs[OW_FIT_MAX_PARAMS];
	double *scratch; /* n residuals (owned by the caller of job_init) */
};

/* Starting values drawn from the data at the reference temperature. */
struct guess {
	double eta_max;         /* highest viscosity there, Pa s */
	double eta_hi, rate_hi; /* the point at the highest shear rate */
	double n;               /* local power-law index at high rates */
	double m;               /* power-law consistency, Pa s^n */
	double t_min_K;         /* coldest data temperature */
};

const char *ow_fit_model_name(enum ow_visc_model m)
{
	switch (m) {
	case OW_VISC_POWER_LAW:
		return "power-law";
	case OW_VISC_CROSS:
		return "cross";
	case OW_VISC_CARREAU_YASUDA:
		return "carreau-yasuda";
	}
	return "?";
}

enum ow_status ow_fit_model_parse(const char *s, enum ow_visc_model *out)
{
	static const enum ow_visc_model all[] = {
	    OW_VISC_POWER_LAW, OW_VISC_CROSS, OW_VISC_CARREAU_YASUDA};
	size_t i;

	for (i = 0; i < sizeof all / sizeof all[0]; i++)
		if (strcmp(s, ow_fit_model_name(all[i])) == 0) {
			*out = all[i];
			return OW_OK;
		}
	return OW_EARG;
}

const char *ow_fit_shift_name(enum ow_shift_type s)
{
	return s == OW_SHIFT_WLF ? "wlf" : "arrhenius";
}

enum ow_status ow_fit_shift_parse(const char *s, enum ow_shift_type *out)
{
	if (strcmp(s, "arrhenius") == 0)
		*out = OW_SHIFT_ARRHENIUS;
	else if (strcmp(s, "wlf") == 0)
		*out = OW_SHIFT_WLF;
	else
		return OW_EARG;
	return OW_OK;
}

struct ow_fit_options ow_fit_options_default(void)
{
	struct ow_fit_options o;

	o.model = OW_FIT_ANY_MODEL;
	o.shift = OW_SHIFT_ARRHENIUS;
	o.ref_temp_K = NAN;
	return o;
}

static void job_init(struct job *j, const struct ow_fit_data *data,
                     enum ow_visc_model model, enum ow_shift_type shift,
                     double ref_K)
{
	const struct pdef *m = defs_cy, *s = defs_arrhenius;
	int nm = 4, ns = 1, i;

	if (model == OW_VISC_POWER_LAW) {
		m = defs_power;
		nm = 2;
	} else if (model == OW_VISC_CROSS) {
		m = defs_cross;
		nm = 3;
	}
	if (shift == OW_SHIFT_WLF) {
		s = defs_wlf;
		ns = 2;
	}
	memset(j, 0, sizeof *j);
	j->data = data;
	j->model = model;
	j->shift = shift;
	j->ref_K = ref_K;
	j->n_model = nm;
	j->p = nm + ns;
	for (i = 0; i < nm; i++)
		j->defs[i] = &m[i];
	for (i = 0; i < ns; i++)
		j->defs[nm + i] = &s[i];
}

static double clamp(double x, double lo, double hi)
{
	return x < lo ? lo : x > hi ? hi : x;
}

static double logistic(double x)
{
	return 1.0 / (1.0 + exp(-x));
}

static double to_si(const struct pdef *p, double x)
{
	switch (p->kind) {
	case LOG:
		return pow(10.0, x);
	case BOUNDED:
		return pow(10.0, p->l0 + (p->l1 - p->l0) * logistic(x));
	default:
		return p->scale * x;
	}
}

/* The inverse of to_si, for starting values (kept inside the bounds). */
static double from_si(const struct pdef *p, double v)
{
	double s;

	switch (p->kind) {
	case LOG:
		return log10(v);
	case BOUNDED:
		s = clamp((log10(v) - p->l0) / (p->l1 - p->l0), 0.02, 0.98);
		return log(s / (1.0 - s));
	default:
		return v / p->scale;
	}
}

/* dv/dx, for the delta method. */
static double dsi_dx(const struct pdef *p, double x)
{
	double s = logistic(x);

	switch (p->kind) {
	case LOG:
		return pow(10.0, x) * LN10;
	case BOUNDED:
		return to_si(p, x) * LN10 * (p->l1 - p->l0) * s * (1.0 - s);
	default:
		return p->scale;
	}
}

/* The unknowns x -> the model the solver evaluates. Order: model unknowns
 * (defs_*), then shift unknowns. */
static void unpack(const struct job *j, const double *x, struct ow_viscosity *v)
{
	double si[OW_FIT_MAX_PARAMS] = {0};
	int i, k = j->n_model;

	for (i = 0; i < j->p; i++)
		si[i] = to_si(j->defs[i], x[i]);
	memset(v, 0, sizeof *v);
	v->model = j->model;
	v->shift = j->shift;
	v->ref_temp_K = j->ref_K;
	v->index = si[1];
	if (j->model == OW_VISC_POWER_LAW) {
		v->consistency_Pa_sn = si[0];
	} else {
		v->zero_shear_Pa_s = si[0];
		if (j->model == OW_VISC_CROSS) {
			v->critical_stress_Pa = si[2];
		} else {
			v->time_constant_s = si[2];
			v->a = si[3];
		}
	}
	if (j->shift == OW_SHIFT_ARRHENIUS) {
		v->activation_J_mol = si[k];
	} else {
		v->wlf_c1 = si[k];
		v->wlf_c2_K = si[k + 1];
	}
}

/* Residual r_i = log10 eta(gdot_i, T_i; x) - log10 eta_i: least squares on
 * log viscosity weighs every decade alike, as multiplicative (percentage)
 * measurement errors call for (Dealy & Wissbrun 1990, ch. 2). */
static void residuals_at(const struct job *j, const double *x, double *r)
{
	struct ow_viscosity v;
	size_t i;

	unpack(j, x, &v);
	for (i = 0; i < j->data->n; i++) {
		const struct ow_fit_point *pt = &j->data->points[i];
		double e =
		    ow_viscosity_eval(&v, pt->shear_rate_1_s, pt->temp_K);
		double ri = log10(e) - log10(pt->viscosity_Pa_s);

		if (!isfinite(ri) || ri > RESID_CAP)
			ri = RESID_CAP; /* singular shift or overflow */
		else if (ri < -RESID_CAP)
			ri = -RESID_CAP;
		r[i] = ri;
	}
}

static int gsl_residuals(const gsl_vector *x, void *params, gsl_vector *f)
{
	const struct job *j = params;
	double xs[OW_FIT_MAX_PARAMS];
	int i;

	for (i = 0; i < j->p; i++)
		xs[i] = gsl_vector_get(x, (size_t)i);
	residuals_at(j, xs, j->scratch);
	for (i = 0; i < (int)j->data->n; i++)
		gsl_vector_set(f, (size_t)i, j->scratch[i]);
	return GSL_SUCCESS;
}

static double sum_sq(const double *r, size_t n)
{
	double s = 0.0;
	size_t i;

	for (i = 0; i < n; i++)
		s += r[i] * r[i];
	return s;
}

/* Minimise the sum of squared residuals from x0 with GSL's trust-region
 * Levenberg-Marquardt method (More, Lecture Notes in Math. 630 (1978) 105;
 * GSL manual, "Nonlinear Least-Squares Fitting"), central-difference
 * Jacobian. Returns the sum of squares at the end point in *rss, or
 * INFINITY when the run failed. */
static void solve(const struct job *j, const double *x0, double *x, double *rss,
                  int *converged)
{
	gsl_multifit_nlinear_parameters fp =
	    gsl_multifit_nlinear_default_parameters();
	gsl_multifit_nlinear_fdf fdf;
	gsl_multifit_nlinear_workspace *w;
	gsl_vector_const_view v0 =
	    gsl_vector_const_view_array(x0, (size_t)j->p);
	int info = 0, status, i;

	*rss = INFINITY;
	*converged = 0;
	fp.trs = gsl_multifit_nlinear_trs_lm;
	fp.fdtype = GSL_MULTIFIT_NLINEAR_CTRDIFF;
	memset(&fdf, 0, sizeof fdf);
	fdf.f = gsl_residuals;
	fdf.n = j->data->n;
	fdf.p = (size_t)j->p;
	fdf.params = (void *)j;
	w = gsl_multifit_nlinear_alloc(gsl_multifit_nlinear_trust, &fp, fdf.n,
	                               fdf.p);
	if (!w)
		return;
	if (gsl_multifit_nlinear_init(&v0.vector, &fdf, w) == GSL_SUCCESS) {
		status = gsl_multifit_nlinear_driver(
		    MAX_ITER, 1e-10, 1e-10, 1e-14, NULL, NULL, &info, w);
		/* ENOPROG: no step lowers the cost any more, i.e. at rest */
		*converged = status == GSL_SUCCESS || status == GSL_ENOPROG;
		for (i = 0; i < j->p; i++)
			x[i] = gsl_vector_get(gsl_multifit_nlinear_position(w),
			                      (size_t)i);
		residuals_at(j, x, j->scratch);
		*rss = sum_sq(j->scratch, j->data->n);
		if (!isfinite(*rss))
			*rss = INFINITY;
	}
	gsl_multifit_nlinear_free(w);
}

/* Least-squares slope of log10 eta on log10 rate over points [lo, hi) of an
 * index list; returns 0 when the rates do not spread. */
static double log_slope(const struct ow_fit_data *data, const size_t *idx,
                        size_t lo, size_t hi, double *intercept)
{
	double sx = 0, sy = 0, sxx = 0, sxy = 0, m = (double)(hi - lo), den;
	size_t i;

	for (i = lo; i < hi; i++) {
		double xx = log10(data->points[idx[i]].shear_rate_1_s);
		double yy = log10(data->points[idx[i]].viscosity_Pa_s);

		sx += xx;
		sy += yy;
		sxx += xx * xx;
		sxy += xx * yy;
	}
	den = m * sxx - sx * sx;
	if (m < 2 || den <= 1e-12 * m * m) {
		*intercept = m > 0 ? sy / m : 0.0;
		return 0.0;
	}
	*intercept = (sy * sxx - sx * sxy) / den;
	return (m * sxy - sx * sy) / den;
}

struct rate_index {
	double rate;
	size_t i;
};

static int by_rate(const void *a, const void *b)
{
	double x = ((const struct rate_index *)a)->rate;
	double y = ((const struct rate_index *)b)->rate;

	return (x > y) - (x < y);
}

/* Starting values from the points at the reference temperature (all points
 * when fewer than 2 lie there), sorted by rate. */
static enum ow_status make_guess(const struct ow_fit_data *data, double ref_K,
                                 struct guess *g)
{
	struct rate_index *ri = malloc(data->n * sizeof *ri);
	size_t *idx = malloc(data->n * sizeof *idx), m = 0, i;
	double b, slope;
	int all = 0;

	if (!ri || !idx) {
		free(ri);
		free(idx);
		return OW_ENOMEM;
	}
	g->t_min_K = INFINITY;
	for (i = 0; i < data->n; i++)
		g->t_min_K = fmin(g->t_min_K, data->points[i].temp_K);
again:
	for (i = 0, m = 0; i < data->n; i++)
		if (all || fabs(data->points[i].temp_K - ref_K) <= TEMP_TOL_K) {
			ri[m].rate = data->points[i].shear_rate_1_s;
			ri[m++].i = i;
		}
	if (m < 2 && !all) {
		all = 1;
		goto again;
	}
	qsort(ri, m, sizeof *ri, by_rate);
	g->eta_max = 0.0;
	for (i = 0; i < m; i++) {
		idx[i] = ri[i].i;
		g->eta_max =
		    fmax(g->eta_max, data->points[idx[i]].viscosity_Pa_s);
	}
	g->eta_hi = data->points[idx[m - 1]].viscosity_Pa_s;
	g->rate_hi = data->points[idx[m - 1]].shear_rate_1_s;
	slope = log_slope(data, idx, m > 3 ? m / 2 : 0, m, &b);
	g->n = slope == 0.0 ? 0.5 : clamp(1.0 + slope, 0.15, 0.85);
	slope = log_slope(data, idx, 0, m, &b);
	g->m = pow(10.0, b);
	if (slope == 0.0 || 1.0 + slope < 0.1 || 1.0 + slope > 0.95)
		g->m = g->eta_hi / pow(g->rate_hi, g->n - 1.0);
	free(ri);
	free(idx);
	return OW_OK;
}

/* The model's unknowns for one start; eta0 = f * (highest viscosity). The
 * Cross critical stress and the Carreau-Yasuda time constant put the
 * model's high-rate asymptote eta0 (eta0 gdot / tau*)^(n-1), resp.
 * eta0 (lambda gdot)^(n-1), through the highest-rate point. */
static void model_start(const struct job *j, const struct guess *g, double f,
                        double a, double *x)
{
	double eta0 = f * g->eta_max, n = g->n;
	double ratio = fmax(eta0 / g->eta_hi, 1.05);

	if (j->model == OW_VISC_POWER_LAW) {
		x[0] = log10(g->m);
		x[1] = clamp(1.0 + log10(g->eta_hi / g->m) / log10(g->rate_hi),
		             0.1, 0.95);
		if (!isfinite(x[1]) || g->rate_hi == 1.0)
			x[1] = n;
		return;
	}
	x[0] = log10(eta0);
	x[1] = n;
	if (j->model == OW_VISC_CROSS) {
		x[2] = log10(eta0 * g->rate_hi /
		             pow(ratio - 1.0, 1.0 / (1.0 - n)));
	} else {
		x[2] = log10(pow(ratio, 1.0 / (1.0 - n)) / g->rate_hi);
		x[3] = from_si(j->defs[3], a);
	}
}

/* The shift's unknowns for one start, from a trial activation energy E
 * (J/mol). WLF gets the same slope of log10 aT at Tref: c1 / c2 =
 * E / (R Tref^2 ln 10); with c2 = Tref the WLF form is exactly the
 * Arrhenius one (Ferry, Viscoelastic Properties of Polymers, 3rd ed. 1980,
 * ch. 11). */
static void shift_start(const struct job *j, const struct guess *g, double E,
                        int variant, double *x)
{
	double tr = j->ref_K, c2;

	if (j->shift == OW_SHIFT_ARRHENIUS) {
		x[0] = E / 1e3;
		return;
	}
	c2 = variant ? fmax(0.35 * tr, 1.5 * (tr - g->t_min_K) + 10.0) : tr;
	x[0] = c2 * E / (OW_GAS_CONSTANT * tr * tr * LN10);
	x[1] = from_si(j->defs[j->n_model + 1], c2);
}

/* A small grid of starts: the model's surface has more than one valley
 * (eta0 against lambda or tau*), and LM finds the nearest. */
static int make_starts(const struct job *j, const struct guess *g,
                       double (*x)[OW_FIT_MAX_PARAMS])
{
	static const double fs[] = {1.2, 4.0}, as[] = {0.7, 2.0},
	                    Es[] = {25e3, 50e3, 100e3};
	int nf = j->model == OW_VISC_POWER_LAW ? 1 : 2;
	int na = j->model == OW_VISC_CARREAU_YASUDA ? 2 : 1;
	int nv = j->shift == OW_SHIFT_WLF ? 2 : 1, n = 0, f, a, e, v;

	for (f = 0; f < nf; f++)
		for (a = 0; a < na; a++)
			for (e = 0; e < 3; e++)
				for (v = 0; v < nv && n < MAX_STARTS; v++) {
					model_start(j, g, fs[f], as[a], x[n]);
					shift_start(j, g, Es[e], v,
					            x[n] + j->n_model);
					n++;
				}
	return n;
}

/* Distinct temperatures: points within TEMP_TOL_K of a group's first
 * (coldest) member share it; group of each point in of[]. */
struct groups {
	int n;
	double T[OW_FIT_MAX_TEMPS];
	int *of;
};

static int by_temp(const void *a, const void *b)
{
	double x = ((const struct rate_index *)a)->rate;
	double y = ((const struct rate_index *)b)->rate;

	return (x > y) - (x < y);
}

static enum ow_status make_groups(const struct ow_fit_data *data,
                                  struct groups *g, struct ow_diag *d)
{
	struct rate_index *t = malloc(data->n * sizeof *t);
	double first = 0, sum = 0;
	int count = 0;
	size_t i;

	g->n = 0;
	g->of = malloc(data->n * sizeof *g->of);
	if (!t || !g->of) {
		free(t);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	for (i = 0; i < data->n; i++) {
		t[i].rate = data->points[i].temp_K; /* sort key: temperature */
		t[i].i = i;
	}
	qsort(t, data->n, sizeof *t, by_temp);
	for (i = 0; i < data->n; i++) {
		if (i == 0 || t[i].rate - first > TEMP_TOL_K) {
			if (g->n == OW_FIT_MAX_TEMPS) {
				free(t);
				return ow_diag_set(d, OW_EINPUT,
				                   "%s: more than %d distinct "
				                   "temperatures",
				                   data->source,
				                   OW_FIT_MAX_TEMPS);
			}
			first = t[i].rate;
			sum = 0;
			count = 0;
			g->n++;
		}
		sum += t[i].rate;
		g->T[g->n - 1] = sum / ++count;
		g->of[t[i].i] = g->n - 1;
	}
	free(t);
	return OW_OK;
}

static void add_warning(char (*w)[OW_FIT_WARN_LEN], int *n, const char *fmt,
                        ...) __attribute__((format(printf, 3, 4)));

static void add_warning(char (*w)[OW_FIT_WARN_LEN], int *n, const char *fmt,
                        ...)
{
	va_list ap;

	if (*n >= OW_FIT_MAX_WARN)
		return;
	va_start(ap, fmt);
	vsnprintf(w[*n], OW_FIT_WARN_LEN, fmt, ap);
	va_end(ap);
	(*n)++;
}

/* Central-difference Jacobian of the residuals at x, into J (n x p). */
static void jacobian(const struct job *j, const double *x, gsl_matrix *J,
                     double *rp, double *rm)
{
	double xs[OW_FIT_MAX_PARAMS], h;
	size_t i;
	int k;

	for (k = 0; k < j->p; k++) {
		memcpy(xs, x, (size_t)j->p * sizeof *xs);
		h = 1e-6 * fmax(1.0, fabs(x[k]));
		xs[k] = x[k] + h;
		residuals_at(j, xs, rp);
		xs[k] = x[k] - h;
		residuals_at(j, xs, rm);
		for (i = 0; i < j->data->n; i++)
			gsl_matrix_set(J, i, (size_t)k,
			               (rp[i] - rm[i]) / (2 * h));
	}
}

/* Standard errors from the linearised model: cov(x) = s^2 (J^T J)^-1 with
 * s^2 = RSS / (N - p) (Bates & Watts, Nonlinear Regression Analysis and Its
 * Applications, Wiley 1988, sec. 2.3); mapped to SI by the delta method
 * (log10 unknowns: se(v) = v ln10 se(x)). A direction the data do not
 * determine (rank-deficient J) gets an infinite error. */
static enum ow_status std_errors(const struct job *j, const double *x,
                                 struct ow_fit_result *r)
{
	size_t n = j->data->n, p = (size_t)j->p, k, l;
	gsl_matrix *J = gsl_matrix_alloc(n, p), *cov = gsl_matrix_alloc(p, p);
	double *buf = malloc(2 * n * sizeof *buf), s2, sd[OW_FIT_MAX_PARAMS];
	enum ow_status st = OW_ENOMEM;

	if (!J || !cov || !buf)
		goto fail;
	jacobian(j, x, J, buf, buf + n);
	gsl_multifit_nlinear_covar(J, 1e-10, cov);
	s2 = r->rss_log10 / (double)(n - p);
	for (k = 0; k < p; k++) {
		struct ow_fit_param *q = &r->params[k];
		double var = s2 * gsl_matrix_get(cov, k, k);

		sd[k] = var > 0 && isfinite(var) ? sqrt(var) : INFINITY;
		q->key = j->defs[k]->key;
		q->value = to_si(j->defs[k], x[k]);
		q->std_error = isfinite(sd[k])
		                   ? fabs(dsi_dx(j->defs[k], x[k])) * sd[k]
		                   : INFINITY;
		q->rel_error =
		    q->value != 0 ? q->std_error / fabs(q->value) : INFINITY;
	}
	for (k = 0; k < p; k++)
		for (l = 0; l < p; l++)
			r->corr[k][l] = isfinite(sd[k]) && isfinite(sd[l])
			                    ? s2 * gsl_matrix_get(cov, k, l) /
			                          (sd[k] * sd[l])
			                    : 0.0;
	r->n_params = j->p;
	st = OW_OK;
fail:
	gsl_matrix_free(J);
	gsl_matrix_free(cov);
	free(buf);
	return st;
}

/* Residual statistics per temperature group, and the overall figures:
 * AIC = N ln(RSS/N) + 2k (Akaike, IEEE Trans. Autom. Control 19 (1974)
 * 716), BIC = N ln(RSS/N) + k ln N (Schwarz, Ann. Statist. 6 (1978) 461),
 * for Gaussian errors in log10 viscosity with k fitted parameters. */
static void residual_stats(const struct job *j, const double *x,
                           const struct groups *g, struct ow_fit_result *r)
{
	size_t i, n = j->data->n;
	double N = (double)n, rss;
	int k;

	residuals_at(j, x, j->scratch);
	rss = sum_sq(j->scratch, n);
	r->n_points = n;
	r->rss_log10 = rss;
	r->rms_log10 = sqrt(rss / N);
	rss = fmax(rss, 1e-300); /* noise-free data: keep ln finite */
	r->aic = N * log(rss / N) + 2.0 * j->p;
	r->bic = N * log(rss / N) + j->p * log(N);
	r->n_temps = g->n;
	for (k = 0; k < g->n; k++) {
		struct ow_fit_temp *t = &r->temps[k];

		memset(t, 0, sizeof *t);
		t->temp_K = g->T[k];
		t->min_rate_1_s = INFINITY;
	}
	for (i = 0; i < n; i++) {
		struct ow_fit_temp *t = &r->temps[g->of[i]];
		double e = j->scratch[i],
		       rate = j->data->points[i].shear_rate_1_s;

		t->n_points++;
		t->mean_log10 += e;
		t->rms_log10 += e * e;
		t->max_abs_log10 = fmax(t->max_abs_log10, fabs(e));
		t->min_rate_1_s = fmin(t->min_rate_1_s, rate);
		t->max_rate_1_s = fmax(t->max_rate_1_s, rate);
	}
	for (k = 0; k < g->n; k++) {
		struct ow_fit_temp *t = &r->temps[k];

		t->mean_log10 /= t->n_points;
		t->rms_log10 = sqrt(t->rms_log10 / t->n_points);
	}
}

/* "file: lines 2..37" (or just the file when the points were not read). */
static void where(const struct ow_fit_data *data, char *buf, size_t len)
{
	int lo = 0, hi = 0;
	size_t i;

	for (i = 0; i < data->n; i++) {
		int l = data->points[i].line;

		if (l > 0 && (lo == 0 || l < lo))
			lo = l;
		if (l > hi)
			hi = l;
	}
	if (lo > 0 && lo == hi)
		snprintf(buf, len, "%s: line %d", data->source, lo);
	else if (lo > 0)
		snprintf(buf, len, "%s: lines %d..%d", data->source, lo, hi);
	else
		snprintf(buf, len, "%s", data->source);
}

/* WLF aT is infinite at T = Tref - c2: say where when that lies within
 * 100 K below the coldest data (the melting zone runs that cold). */
static void wlf_warning(const struct job *j, struct ow_fit_result *r)
{
	double t_min = INFINITY, t_sing = j->ref_K - r->visc.wlf_c2_K;
	size_t i;

	if (j->shift != OW_SHIFT_WLF)
		return;
	for (i = 0; i < j->data->n; i++)
		t_min = fmin(t_min, j->data->points[i].temp_K);
	if (t_sing > t_min - 100.0)
		add_warning(r->warnings, &r->n_warnings,
		            "%s: the WLF shift is singular at %.1f K "
		            "(%.1f degC, Tref - c2), %.0f K below the coldest "
		            "data: viscosities there are extrapolated far",
		            ow_fit_model_name(j->model), t_sing,
		            t_sing - OW_ZERO_C_K, t_min - t_sing);
}

/* Why parameter k is poorly determined, in words. */
static void poor_warning(const struct job *j, const double *x, int k,
                         struct ow_fit_result *r)
{
	const char *name = ow_fit_model_name(j->model);
	const struct ow_fit_param *q = &r->params[k];
	const struct pdef *p = j->defs[k];
	double s = logistic(x[k]);

	if (p->kind == BOUNDED && (s < 0.01 || s > 0.99))
		add_warning(r->warnings, &r->n_warnings,
		            "%s: %s = %.4g sits at the edge of its range "
		            "%.3g..%.3g: the data do not determine it",
		            name, q->key, q->value, pow(10.0, p->l0),
		            pow(10.0, p->l1));
	else if (!(q->rel_error <= 10.0))
		add_warning(r->warnings, &r->n_warnings,
		            "%s: %s is not determined by the data (standard "
		            "error above 1000 %% of its value)",
		            name, q->key);
	else
		add_warning(r->warnings, &r->n_warnings,
		            "%s: %s is poorly determined (standard error "
		            "%.0f %% of its value, above %.0f %%): the data "
		            "do not pin it down",
		            name, q->key, 100.0 * q->rel_error,
		            100.0 * POOR_REL);
}

static void fit_warnings(const struct job *j, const double *x,
                         struct ow_fit_result *r)
{
	const char *name = ow_fit_model_name(j->model);
	int k, l;

	wlf_warning(j, r);
	if (!r->converged)
		add_warning(r->warnings, &r->n_warnings,
		            "%s: the iteration limit was reached before "
		            "convergence: this may not be the best fit",
		            name);
	for (k = 0; k < r->n_params; k++)
		if (!(r->params[k].rel_error <= POOR_REL))
			poor_warning(j, x, k, r);
	for (k = 0; k < r->n_params; k++)
		for (l = k + 1; l < r->n_params; l++)
			if (fabs(r->corr[k][l]) > POOR_CORR)
				add_warning(r->warnings, &r->n_warnings,
				            "%s: %s and %s are correlated "
				            "(%.4f, above %.2f): the data fix "
				            "a combination of the two, not "
				            "each one",
				            name, r->params[k].key,
				            r->params[l].key, r->corr[k][l],
				            POOR_CORR);
}

/* Best of all starts, then errors, statistics and warnings. */
static void fit_best(const struct job *j, const struct guess *g,
                     const struct groups *grp, struct ow_fit_result *r)
{
	double starts[MAX_STARTS][OW_FIT_MAX_PARAMS], x[OW_FIT_MAX_PARAMS],
	    best[OW_FIT_MAX_PARAMS], rss, best_rss = INFINITY;
	int n = make_starts(j, g, starts), s, conv, i;
	struct ow_diag why = {{0}};

	for (s = 0; s < n; s++) {
		solve(j, starts[s], x, &rss, &conv);
		if (rss < best_rss) {
			best_rss = rss;
			r->converged = conv;
			for (i = 0; i < j->p; i++)
				best[i] = x[i];
		}
	}
	if (!isfinite(best_rss)) {
		r->status = OW_ECOMPUTE;
		snprintf(r->message, sizeof r->message,
		         "%s: the fit failed "
		         "from every starting point",
		         ow_fit_model_name(j->model));
		return;
	}
	unpack(j, best, &r->visc);
	residual_stats(j, best, grp, r);
	if (std_errors(j, best, r) != OW_OK) {
		r->status = OW_ENOMEM;
		snprintf(r->message, sizeof r->message, "out of memory");
		return;
	}
	fit_warnings(j, best, r);
	r->status = ow_viscosity_validate(&r->visc, "viscosity", &why);
	if (r->status != OW_OK)
		snprintf(
		    r->message, sizeof r->message,
		    "%s: the best fit "
		    "lies outside the range a resin file accepts (%.300s): "
		    "the model does not describe these data",
		    ow_fit_model_name(j->model), why.msg);
}

static void fit_one(const struct ow_fit_data *data, enum ow_visc_model model,
                    enum ow_shift_type shift, double ref_K,
                    const struct guess *g, const struct groups *grp,
                    struct ow_fit_result *r)
{
	struct job j;
	char loc[300];

	memset(r, 0, sizeof *r);
	job_init(&j, data, model, shift, ref_K);
	r->visc.model = model;
	if (data->n < (size_t)j.p + 2) {
		where(data, loc, sizeof loc);
		r->status = OW_EINPUT;
		snprintf(r->message, sizeof r->message,
		         "%s: %zu points are too few to fit %s with the %s "
		         "shift (%d parameters): at least %d are needed",
		         loc, data->n, ow_fit_model_name(model),
		         ow_fit_shift_name(shift), j.p, j.p + 2);
		return;
	}
	j.scratch = malloc(data->n * sizeof *j.scratch);
	if (!j.scratch) {
		r->status = OW_ENOMEM;
		snprintf(r->message, sizeof r->message, "out of memory");
		return;
	}
	fit_best(&j, g, grp, r);
	free(j.scratch);
}

/* Lowest BIC among the fits that succeeded. BIC rather than AIC: its
 * penalty ln N per parameter exceeds AIC's 2 once N > 7, so an extra
 * parameter must buy a clearly better fit, and the simpler model
 * extrapolates more safely beyond the measured shear rates; BIC also picks
 * the true model as N grows (Schwarz 1978). */
static void recommend(struct ow_fit_report *rep)
{
	char others[256] = "";
	size_t len = 0;
	int i, best = -1;

	for (i = 0; i < rep->n_fits; i++)
		if (rep->fits[i].status == OW_OK &&
		    (best < 0 || rep->fits[i].bic < rep->fits[best].bic))
			best = i;
	rep->best = best;
	if (best < 0)
		return;
	for (i = 0; i < rep->n_fits; i++) {
		const struct ow_fit_result *f = &rep->fits[i];

		if (i == best || len >= sizeof others)
			continue;
		if (f->status == OW_OK)
			len += (size_t)snprintf(
			    others + len, sizeof others - len, "%s%s %.1f",
			    len ? ", " : "", ow_fit_model_name(f->visc.model),
			    f->bic);
		else
			len +=
			    (size_t)snprintf(others + len, sizeof others - len,
			                     "%s%s not fitted", len ? ", " : "",
			                     ow_fit_model_name(f->visc.model));
	}
	snprintf(rep->why, sizeof rep->why,
	         "%s has the lowest BIC, %.1f (%s%s%s). BIC = N ln(RSS/N) + "
	         "k ln N on the log10 residuals (Schwarz 1978) charges "
	         "ln N = %.2f per parameter, more than AIC's 2, so a model "
	         "with more parameters must fit clearly better to win: the "
	         "simpler model extrapolates more safely.",
	         ow_fit_model_name(rep->fits[best].visc.model),
	         rep->fits[best].bic, len ? "others: " : "", others,
	         len ? "" : "the only model fitted",
	         log((double)rep->fits[best].n_points));
}

/* Checks on the data as a whole: enough temperatures for the shift, and
 * the shear-rate coverage. */
static enum ow_status check_data(const struct ow_fit_data *data,
                                 const struct groups *g,
                                 struct ow_fit_report *rep, struct ow_diag *d)
{
	int need = rep->opts.shift == OW_SHIFT_WLF ? 3 : 2;
	char loc[300];
	size_t i;

	where(data, loc, sizeof loc);
	if (g->n < need)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: the points lie at %d temperature%s "
		                   "(%.2f K = %.2f degC%s): the %s shift needs "
		                   "at least %d%s",
		                   loc, g->n, g->n == 1 ? "" : "s", g->T[0],
		                   g->T[0] - OW_ZERO_C_K,
		                   g->n > 1 ? ", ..." : "",
		                   ow_fit_shift_name(rep->opts.shift), need,
		                   need == 3 ? " (two constants, c1 and c2, "
		                               "need three shift factors; try "
		                               "--shift arrhenius)"
		                             : "");
	rep->min_rate_1_s = INFINITY;
	for (i = 0; i < data->n; i++) {
		rep->min_rate_1_s =
		    fmin(rep->min_rate_1_s, data->points[i].shear_rate_1_s);
		rep->max_rate_1_s =
		    fmax(rep->max_rate_1_s, data->points[i].shear_rate_1_s);
	}
	if (rep->min_rate_1_s > RATE_LO || rep->max_rate_1_s < RATE_HI)
		add_warning(rep->warnings, &rep->n_warnings,
		            "the data cover %.3g..%.3g 1/s, not the whole of "
		            "%g..%g 1/s that screw channels and dies see "
		            "(common practice): outside the data the model "
		            "is extrapolated",
		            rep->min_rate_1_s, rep->max_rate_1_s, RATE_LO,
		            RATE_HI);
	return OW_OK;
}

/* With one model asked, its failure is the answer; with all, the run fails
 * only when none could be fitted (input errors win: they say what to fix). */
static enum ow_status outcome(const struct ow_fit_report *rep,
                              struct ow_diag *d)
{
	int i;

	if (rep->best >= 0)
		return OW_OK;
	for (i = rep->n_fits - 1; i >= 0; i--)
		if (rep->fits[i].status == OW_EINPUT)
			return ow_diag_set(d, OW_EINPUT, "%s",
			                   rep->fits[i].message);
	for (i = 0; i < rep->n_fits; i++)
		if (rep->fits[i].status != OW_OK)
			return ow_diag_set(d,
			                   rep->fits[i].status == OW_ENOMEM
			                       ? OW_ENOMEM
			                       : OW_ECOMPUTE,
			                   "%s", rep->fits[i].message);
	return ow_diag_set(d, OW_ECOMPUTE, "no model could be fitted");
}

enum ow_status ow_fit_run(const struct ow_fit_data *data,
                          const struct ow_fit_options *opts,
                          struct ow_fit_report *out, struct ow_diag *d)
{
	static const enum ow_visc_model order[OW_FIT_N_MODELS] = {
	    OW_VISC_CARREAU_YASUDA, OW_VISC_CROSS, OW_VISC_POWER_LAW};
	struct groups g = {0, {0}, NULL};
	struct guess guess;
	enum ow_status st;
	int i;

	gsl_set_error_handler_off(); /* GSL's default handler aborts */
	memset(out, 0, sizeof *out);
	out->opts = *opts;
	out->best = -1;
	if (data->n == 0)
		return ow_diag_set(d, OW_EINPUT, "%s: no data points",
		                   data->source);
	st = make_groups(data, &g, d);
	if (st == OW_OK)
		st = check_data(data, &g, out, d);
	if (st != OW_OK)
		goto fail;
	out->n_temps = g.n;
	memcpy(out->temps_K, g.T, sizeof g.T);
	out->ref_temp_K =
	    isfinite(opts->ref_temp_K) ? opts->ref_temp_K : g.T[(g.n - 1) / 2];
	st = make_guess(data, out->ref_temp_K, &guess);
	if (st != OW_OK) {
		ow_diag_set(d, st, "out of memory");
		goto fail;
	}
	for (i = 0; i < OW_FIT_N_MODELS; i++)
		if (opts->model == OW_FIT_ANY_MODEL ||
		    opts->model == (int)order[i])
			fit_one(data, order[i], opts->shift, out->ref_temp_K,
			        &guess, &g, &out->fits[out->n_fits++]);
	recommend(out);
	st = outcome(out, d);
fail:
	free(g.of);
	return st;
}
