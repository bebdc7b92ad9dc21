/* calib.c - weighted nonlinear least-squares fit of the model factors to a
 * line's readings, with standard errors, correlations and the refusals
 * that keep an undetermined fit from being written. */
#include "ow_calib.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_multifit_nlinear.h>
#include <math.h>
#include <omp.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_study.h"
#include "ow_solver.h"

#define MAX_ITER   60
#define FD_STEP    0.01  /* difference step in ln f (1 %) */
#define PENALTY    1e3   /* residual (sd) of a reading that failed */
#define FLAT_SD    1e-3  /* |dr/d ln f| below this: no reading moves f */
#define COLLINEAR  0.999 /* |correlation| at which two factors merge */
#define BOUND_LN   0.01  /* within 1 % of a bound: at the bound */
#define CHI2_ALPHA 1e-3  /* consistency test level */

/* One measured value the fit compares. */
struct entry {
	int reading;
	enum ow_calib_qty qty;
	double measured, sd;
};

struct job {
	const struct ow_readings *r;
	struct ow_study *base;     /* the study with every factor at 1 */
	struct ow_study *work;     /* base with the trial factors applied */
	double fixed[OW_CF_COUNT]; /* factor values (free ones: start) */
	int p, ids[OW_CF_COUNT];
	size_t n; /* entries */
	struct entry e[OW_CALIB_MAX_RESID];
	struct ow_point *pts;   /* one per reading, the last solve */
	double *warm;           /* 1: pts[i] holds a converged solve of
	                           reading i to start from */
	int have;               /* cx, cr hold the last residuals asked */
	double cx[OW_CF_COUNT]; /* ... for these unknowns */
	double *cr;             /* n residuals */
	int threads, solves;
	int strict;        /* 1: a failed solve stops the fit (at the
	                      study's own factors); 0: a trial point
	                      the solver rejects costs PENALTY */
	enum ow_status st; /* first hard failure of an evaluation */
	struct ow_diag diag;
};

void ow_calib_options_from(const struct ow_calibration *c,
                           struct ow_calib_options *o)
{
	memset(o, 0, sizeof *o);
	o->free_mask = c->free_mask;
	memcpy(o->sd_abs, c->sd_abs, sizeof o->sd_abs);
	memcpy(o->sd_rel, c->sd_rel, sizeof o->sd_rel);
}

static double model_value(const struct ow_point *pt, enum ow_calib_qty q)
{
	switch (q) {
	case OW_CQ_OUTPUT:
		return pt->output_kg_s;
	case OW_CQ_PRESSURE:
		return pt->discharge_pressure_Pa;
	case OW_CQ_MELT:
		return pt->discharge_bulk_K;
	case OW_CQ_POWER:
		return pt->power_W;
	default:
		return pt->torque_Nm;
	}
}

/* Zone set-points of reading i: its own where given, the study's else. */
static void reading_set(const struct ow_study *s, const struct ow_reading *rd,
                        double *set_K)
{
	int z;

	for (z = 0; z < s->line.n_zones; z++)
		set_K[z] =
		    rd->set_given[z] ? rd->set_K[z] : s->line.zones[z].set_K;
}

/* Solve every reading of j on study j->work, each started from its last
 * converged solve (throughput, match slope, floating zones), on
 * j->threads threads (one solver each). */
static void solve_all(struct job *j)
{
	int n = (int)j->r->n, i;

#pragma omp parallel num_threads(j->threads)
	{
		struct ow_solver *sv = NULL;
		struct ow_diag dd = {{0}};
		enum ow_status st = ow_solver_create(j->work, &sv, &dd);

#pragma omp for schedule(dynamic)
		for (i = 0; i < n; i++) {
			double set_K[OW_MAX_ZONES];
			struct ow_solver_start s0 = {.g_kg_s = 0.0};

			reading_set(j->work, &j->r->r[i], set_K);
			if (j->warm[i] > 0.0)
				ow_solver_start_from(&j->pts[i], &s0);
			if (st == OW_OK)
				st = ow_solver_run_from(sv, j->r->r[i].rpm,
				                        set_K, &s0, &j->pts[i],
				                        &dd);
			if (st == OW_OK &&
			    !(j->pts[i].flags & OW_FLAG_NOT_CONVERGED))
				j->warm[i] = 1.0;
			else if (st != OW_OK)
				j->pts[i].flags |= OW_FLAG_NOT_CONVERGED;
		}
#pragma omp critical
		if (st != OW_OK && j->strict && j->st == OW_OK) {
			j->st = st;
			j->diag = dd;
		}
		ow_solver_destroy(sv);
	}
	j->solves += n;
}

static double clamp_ln(int k, double x)
{
	const struct ow_calib_factor *f = ow_calib_factor(k);
	double lo = log(f->lo), hi = log(f->hi);

	return x < lo ? lo : x > hi ? hi : x;
}

/* Factor values for unknowns x (ln f of the free factors, kept inside
 * their bounds). */
static void factors_at(const struct job *j, const double *x, double *f)
{
	int k;

	memcpy(f, j->fixed, sizeof j->fixed);
	for (k = 0; k < j->p; k++)
		f[j->ids[k]] = exp(clamp_ln(j->ids[k], x[k]));
}

/* Weighted residuals r_e = (model - measured) / sd at unknowns x. */
static void residuals(struct job *j, const double *x, double *r)
{
	double f[OW_CF_COUNT];
	size_t e;

	factors_at(j, x, f);
	memcpy(j->work, j->base, sizeof *j->work);
	ow_calib_apply(j->work, f);
	solve_all(j);
	for (e = 0; e < j->n; e++) {
		const struct entry *en = &j->e[e];
		const struct ow_point *pt = &j->pts[en->reading];

		r[e] = pt->flags & OW_FLAG_NOT_CONVERGED
		           ? PENALTY
		           : (model_value(pt, en->qty) - en->measured) / en->sd;
	}
}

/* The residuals at x, remembered: the solver asks for the point it has
 * just evaluated again (start, Jacobian), and a repeat costs no solve. */
static void residuals_kept(struct job *j, const double *x, double *r)
{
	size_t bytes = (size_t)j->p * sizeof *x;

	if (j->have && !memcmp(x, j->cx, bytes)) {
		memcpy(r, j->cr, j->n * sizeof *r);
		return;
	}
	residuals(j, x, r);
	memcpy(j->cx, x, bytes);
	memcpy(j->cr, r, j->n * sizeof *r);
	j->have = 1;
}

static int gsl_f(const gsl_vector *x, void *params, gsl_vector *f)
{
	struct job *j = params;

	residuals_kept(j, gsl_vector_const_ptr(x, 0), gsl_vector_ptr(f, 0));
	return j->st == OW_OK ? GSL_SUCCESS : GSL_EFAILED;
}

/* dr/d ln f by differences of step FD_STEP: central (error O(h^2)) when
 * central, else forward from the remembered residuals at x (O(h), 1 %
 * here: enough to steer the iteration). The point solves converge to a
 * relative 2e-5 in output, far below what the step moves. */
static int jacobian(struct job *j, const double *x, gsl_matrix *J, int central)
{
	double xs[OW_CF_COUNT], *rp = malloc(2 * j->n * sizeof *rp);
	size_t e;
	int k;

	if (!rp)
		return GSL_ENOMEM;
	if (!central)
		residuals_kept(j, x, rp + j->n);
	for (k = 0; k < j->p; k++) {
		memcpy(xs, x, (size_t)j->p * sizeof *xs);
		xs[k] += FD_STEP;
		residuals(j, xs, rp);
		if (central) {
			xs[k] -= 2 * FD_STEP;
			residuals(j, xs, rp + j->n);
		}
		for (e = 0; e < j->n; e++)
			gsl_matrix_set(J, e, (size_t)k,
			               (rp[e] - rp[j->n + e]) /
			                   ((central ? 2 : 1) * FD_STEP));
	}
	free(rp);
	return j->st == OW_OK ? GSL_SUCCESS : GSL_EFAILED;
}

static int gsl_df(const gsl_vector *x, void *params, gsl_matrix *J)
{
	return jacobian(params, gsl_vector_const_ptr(x, 0), J, 0);
}

static double sd_of(const struct ow_calib_options *o, enum ow_calib_qty q,
                    double measured)
{
	return isnan(o->sd_rel[q]) ? o->sd_abs[q] : o->sd_rel[q] * measured;
}

/* The entries: every measured value of every reading. */
static void make_entries(struct job *j, const struct ow_calib_options *o)
{
	size_t i;
	int q;

	for (i = 0; i < j->r->n; i++)
		for (q = 0; q < OW_CQ_COUNT; q++) {
			double v = j->r->r[i].value[q];

			if (isnan(v))
				continue;
			j->e[j->n].reading = (int)i;
			j->e[j->n].qty = (enum ow_calib_qty)q;
			j->e[j->n].measured = v;
			j->e[j->n].sd = sd_of(o, (enum ow_calib_qty)q, v);
			j->n++;
		}
}

/* "viscosity_scale, die_factor" */
static void free_names(const struct job *j, char *buf, size_t len)
{
	size_t used = 0;
	int k;

	buf[0] = '\0';
	for (k = 0; k < j->p && used < len; k++)
		used += (size_t)snprintf(buf + used, len - used, "%s%s",
		                         k ? ", " : "",
		                         ow_calib_factor(j->ids[k])->name);
}

/* Readings no factor can bring the model to: a melt colder than both
 * the feed and every barrel set-point of its setting. */
static enum ow_status check_reachable(const struct job *j, struct ow_diag *d)
{
	const struct ow_study *s = j->base;
	double set_K[OW_MAX_ZONES], cold;
	size_t i;
	int z;

	for (i = 0; i < j->r->n; i++) {
		const struct ow_reading *rd = &j->r->r[i];
		double t = rd->value[OW_CQ_MELT];

		reading_set(s, rd, set_K);
		cold = s->line.feed_temp_K;
		for (z = 0; z < s->line.n_zones; z++)
			cold = fmin(cold, set_K[z]);
		if (!isnan(t) && t < cold)
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: line %d: melt temperature "
			                   "%.1f degC is below both the feed "
			                   "(%.1f degC) and the coldest "
			                   "set-point of the setting: no "
			                   "factor lets the model reach it "
			                   "(check the reading and its unit)",
			                   j->r->source, rd->line,
			                   t - OW_ZERO_C_K,
			                   s->line.feed_temp_K - OW_ZERO_C_K);
	}
	return OW_OK;
}

/* The first solve, at the study's own factors: every reading must be a
 * point the solver can match. */
static enum ow_status check_solvable(struct job *j, double *r,
                                     struct ow_diag *d)
{
	double x[OW_CF_COUNT];
	size_t i;
	int k;

	for (k = 0; k < j->p; k++)
		x[k] = log(j->fixed[j->ids[k]]);
	j->strict = 1;
	residuals_kept(j, x, r);
	j->strict = 0;
	if (j->st != OW_OK)
		return ow_diag_set(d, j->st, "%s", j->diag.msg);
	for (i = 0; i < j->r->n; i++)
		if (j->pts[i].flags & OW_FLAG_NOT_CONVERGED)
			return ow_diag_set(d, OW_ECOMPUTE,
			                   "%s: line %d: the model finds no "
			                   "operating point at %.4g rpm "
			                   "(screw and die do not match): "
			                   "this reading cannot be fitted",
			                   j->r->source, j->r->r[i].line,
			                   j->r->r[i].rpm);
	return OW_OK;
}

/* Trust-region Levenberg-Marquardt (More, Lecture Notes in Math. 630
 * (1978) 105; GSL manual, "Nonlinear Least-Squares Fitting") from the
 * study's own factors; x receives the end point. */
static enum ow_status minimise(struct job *j, double *x, int *iters,
                               struct ow_diag *d)
{
	gsl_multifit_nlinear_parameters fp =
	    gsl_multifit_nlinear_default_parameters();
	gsl_multifit_nlinear_fdf fdf;
	gsl_multifit_nlinear_workspace *w;
	gsl_vector_view v0 = gsl_vector_view_array(x, (size_t)j->p);
	int info = 0, k;

	fp.trs = gsl_multifit_nlinear_trs_lm;
	memset(&fdf, 0, sizeof fdf);
	fdf.f = gsl_f;
	fdf.df = gsl_df;
	fdf.n = j->n;
	fdf.p = (size_t)j->p;
	fdf.params = j;
	w = gsl_multifit_nlinear_alloc(gsl_multifit_nlinear_trust, &fp, fdf.n,
	                               fdf.p);
	if (!w)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (gsl_multifit_nlinear_init(&v0.vector, &fdf, w) == GSL_SUCCESS)
		gsl_multifit_nlinear_driver(MAX_ITER, 1e-5, 1e-8, 1e-10, NULL,
		                            NULL, &info, w);
	for (k = 0; k < j->p; k++)
		x[k] = clamp_ln(j->ids[k],
		                gsl_vector_get(gsl_multifit_nlinear_position(w),
		                               (size_t)k));
	*iters = (int)gsl_multifit_nlinear_niter(w);
	gsl_multifit_nlinear_free(w);
	if (j->st != OW_OK)
		return ow_diag_set(d, j->st, "%s", j->diag.msg);
	return OW_OK;
}

/* A factor no residual depends on, or two the readings cannot tell
 * apart: the readings do not determine the free factors. */
static enum ow_status check_determined(const struct job *j, const gsl_matrix *J,
                                       const struct ow_calib_result *res,
                                       struct ow_diag *d)
{
	int k, l;
	size_t e;

	for (k = 0; k < j->p; k++) {
		double m = 0.0;

		for (e = 0; e < j->n; e++)
			m = fmax(m, fabs(gsl_matrix_get(J, e, (size_t)k)));
		if (m * 0.1 < FLAT_SD)
			return ow_diag_set(
			    d, OW_EINPUT,
			    "%s: the readings do not determine "
			    "%s: changing it by 10 %% moves no "
			    "modelled value by more than %.2g "
			    "standard deviations; fix %s (leave "
			    "it off) or add readings it moves",
			    j->r->source, ow_calib_factor(j->ids[k])->name,
			    m * 0.1, ow_calib_factor(j->ids[k])->name);
	}
	for (k = 0; k < j->p; k++)
		for (l = k + 1; l < j->p; l++)
			if (!(fabs(res->corr[k][l]) < COLLINEAR))
				return ow_diag_set(
				    d, OW_EINPUT,
				    "%s: the readings cannot tell %s from "
				    "%s (correlation %.4f): they fix only "
				    "a combination of the two; fix %s or "
				    "add readings of another quantity",
				    j->r->source,
				    ow_calib_factor(j->ids[k])->name,
				    ow_calib_factor(j->ids[l])->name,
				    res->corr[k][l],
				    ow_calib_factor(j->ids[l])->name);
	return OW_OK;
}

/* Covariance of the fitted ln f: (J^T J)^-1 for residuals weighted by
 * their stated uncertainties, scaled by max(1, chi2/dof) when the scatter
 * exceeds them (Bates & Watts, Nonlinear Regression Analysis and Its
 * Applications, Wiley 1988, sec. 2.3; GSL manual, "Nonlinear
 * Least-Squares Fitting", Examples); by the delta method
 * se(f) = f se(ln f). */
static enum ow_status errors(struct job *j, const double *x,
                             struct ow_calib_result *res, struct ow_diag *d)
{
	gsl_matrix *J = gsl_matrix_alloc(j->n, (size_t)j->p);
	gsl_matrix *cov = gsl_matrix_alloc((size_t)j->p, (size_t)j->p);
	double sd[OW_CF_COUNT];
	enum ow_status st = OW_ENOMEM;
	int k, l;

	if (!J || !cov) {
		ow_diag_set(d, st, "out of memory");
		goto fail;
	}
	if (jacobian(j, x, J, 1) != GSL_SUCCESS) {
		st =
		    ow_diag_set(d, j->st ? j->st : OW_ENOMEM, "%s",
		                j->diag.msg[0] ? j->diag.msg : "out of memory");
		goto fail;
	}
	gsl_multifit_nlinear_covar(J, 1e-12, cov);
	res->err_scale =
	    res->dof > 0 ? fmax(1.0, sqrt(res->chi2 / res->dof)) : 1.0;
	for (k = 0; k < j->p; k++) {
		double var = gsl_matrix_get(cov, (size_t)k, (size_t)k);

		sd[k] = var > 0 && isfinite(var) ? sqrt(var) : INFINITY;
		res->std_error[j->ids[k]] =
		    res->value[j->ids[k]] * sd[k] * res->err_scale;
	}
	for (k = 0; k < j->p; k++)
		for (l = 0; l < j->p; l++)
			res->corr[k][l] =
			    isfinite(sd[k]) && isfinite(sd[l])
			        ? gsl_matrix_get(cov, (size_t)k, (size_t)l) /
			              (sd[k] * sd[l])
			        : (k == l ? 1.0 : NAN);
	st = check_determined(j, J, res, d);
fail:
	gsl_matrix_free(J);
	gsl_matrix_free(cov);
	return st;
}

/* A fitted factor at (within 1 % of) its bound stands in for something
 * the model lacks, or the readings push it out of range. */
static enum ow_status check_bounds(const struct job *j, const double *x,
                                   struct ow_diag *d)
{
	int k;

	for (k = 0; k < j->p; k++) {
		const struct ow_calib_factor *f = ow_calib_factor(j->ids[k]);

		if (x[k] - log(f->lo) < BOUND_LN ||
		    log(f->hi) - x[k] < BOUND_LN)
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: %s reached its bound (%g..%g): "
			                   "the readings push it beyond what "
			                   "it can stand for; fix %s (leave "
			                   "it off) and check the readings",
			                   j->r->source, f->name, f->lo, f->hi,
			                   f->name);
	}
	return OW_OK;
}

/* chi2 beyond its upper CHI2_ALPHA point for dof degrees of freedom
 * (Press et al., Numerical Recipes, 3rd ed., 2007, sec. 15.1): the
 * readings contradict each other or the model; name the worst. */
static enum ow_status check_consistent(const struct job *j,
                                       const struct ow_calib_result *res,
                                       struct ow_diag *d)
{
	int worst[2] = {-1, -1}, i, k;
	char what[2][96];

	if (res->dof < 1 || gsl_cdf_chisq_Q(res->chi2, res->dof) >= CHI2_ALPHA)
		return OW_OK;
	for (i = 0; i < res->n_resid; i++) {
		double a = fabs(ow_calib_resid_sd(&res->resid[i]));

		if (worst[0] < 0 ||
		    a > fabs(ow_calib_resid_sd(&res->resid[worst[0]]))) {
			worst[1] = worst[0];
			worst[0] = i;
		} else if (worst[1] < 0 ||
		           a > fabs(ow_calib_resid_sd(&res->resid[worst[1]])))
			worst[1] = i;
	}
	for (k = 0; k < 2; k++) {
		const struct ow_calib_resid *e = &res->resid[worst[k]];

		if (worst[k] < 0) {
			what[k][0] = '\0';
			continue;
		}
		snprintf(what[k], sizeof what[k], "%sline %d %s (%+.1f sd)",
		         k ? ", " : "", e->line, ow_calib_qty_name(e->qty),
		         ow_calib_resid_sd(e));
	}
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: the readings contradict each other or the "
	                   "model: chi-square %.1f for %d degrees of freedom "
	                   "(chance below %.1g); worst: %s%s; check those "
	                   "readings, or free another factor",
	                   j->r->source, res->chi2, res->dof, CHI2_ALPHA,
	                   what[0], what[1]);
}

/* The residuals at x into res (solving once more there). */
static void fill_resid(struct job *j, const double *x, double *r,
                       struct ow_calib_result *res)
{
	size_t e;

	residuals(j, x, r);
	res->chi2 = 0.0;
	res->n_resid = (int)j->n;
	for (e = 0; e < j->n; e++) {
		const struct entry *en = &j->e[e];
		const struct ow_reading *rd = &j->r->r[en->reading];
		struct ow_calib_resid *o = &res->resid[e];

		o->line = rd->line;
		o->rpm = rd->rpm;
		o->qty = en->qty;
		o->measured = en->measured;
		o->modelled = model_value(&j->pts[en->reading], en->qty);
		o->sd = en->sd;
		res->chi2 += r[e] * r[e];
	}
}

static enum ow_status job_init(struct job *j, const struct ow_study *s,
                               const struct ow_readings *r,
                               const struct ow_calib_options *o,
                               struct ow_diag *d)
{
	double inv[OW_CF_COUNT];
	int k;

	memset(j, 0, sizeof *j);
	j->r = r;
	j->threads = o->jobs > 0 ? o->jobs : omp_get_max_threads();
	j->base = malloc(sizeof *j->base);
	j->work = malloc(sizeof *j->work);
	j->pts = calloc(r->n ? r->n : 1, sizeof *j->pts);
	j->warm = calloc(r->n ? r->n : 1, sizeof *j->warm);
	j->cr = calloc(OW_CALIB_MAX_RESID, sizeof *j->cr);
	if (!j->base || !j->work || !j->pts || !j->warm || !j->cr)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	memcpy(j->base, s, sizeof *s);
	for (k = 0; k < OW_CF_COUNT; k++) {
		inv[k] = 1.0 / s->calib.value[k]; /* back to the bare model */
		j->fixed[k] = s->calib.value[k];
		if (o->free_mask & (1u << k))
			j->ids[j->p++] = k;
	}
	ow_calib_apply(j->base, inv);
	make_entries(j, o);
	return OW_OK;
}

static void job_free(struct job *j)
{
	free(j->base);
	free(j->work);
	free(j->pts);
	free(j->warm);
	free(j->cr);
}

static enum ow_status fit(struct job *j, struct ow_calib_result *out, double *r,
                          struct ow_diag *d)
{
	double x[OW_CF_COUNT];
	char names[160];
	enum ow_status st;
	int k;

	free_names(j, names, sizeof names);
	if (j->p > 0 && j->n < (size_t)j->p)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: %zu measured value%s cannot determine "
		                   "%d free factors (%s): fix %s or add "
		                   "readings",
		                   j->r->source, j->n, j->n == 1 ? "" : "s",
		                   j->p, names,
		                   ow_calib_factor(j->ids[j->p - 1])->name);
	st = check_reachable(j, d);
	if (st == OW_OK)
		st = check_solvable(j, r, d);
	if (st != OW_OK)
		return st;
	for (k = 0, out->chi2_start = 0; k < (int)j->n; k++)
		out->chi2_start += r[k] * r[k];
	for (k = 0; k < j->p; k++)
		x[k] = log(j->fixed[j->ids[k]]);
	if (j->p > 0)
		st = minimise(j, x, &out->iterations, d);
	if (st != OW_OK)
		return st;
	factors_at(j, x, out->value);
	fill_resid(j, x, r, out);
	out->dof = (int)j->n - j->p;
	if (j->p == 0)
		return OW_OK;
	st = errors(j, x, out, d);
	if (st == OW_OK)
		st = check_consistent(j, out, d);
	return st == OW_OK ? check_bounds(j, x, d) : st;
}

enum ow_status ow_calib_run(const struct ow_study *s,
                            const struct ow_readings *r,
                            const struct ow_calib_options *o,
                            struct ow_calib_result *out, struct ow_diag *d)
{
	struct job *j = malloc(sizeof *j);
	double *res = NULL;
	enum ow_status st;
	int k;

	gsl_set_error_handler_off(); /* GSL's default handler aborts */
	memset(out, 0, sizeof *out);
	if (!j)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	st = job_init(j, s, r, o, d);
	res = malloc((j->n ? j->n : 1) * sizeof *res);
	if (st == OW_OK && !res)
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	out->n_free = j->p;
	memcpy(out->ids, j->ids, sizeof out->ids);
	for (k = 0; k < OW_CF_COUNT; k++)
		out->std_error[k] = NAN;
	if (st == OW_OK)
		st = fit(j, out, res, d);
	out->solves = j->solves;
	free(res);
	job_free(j);
	free(j);
	return st;
}
