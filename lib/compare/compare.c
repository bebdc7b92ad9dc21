/* compare.c - two studies on one lattice: axes check, combined verdicts,
 * the three windows, per-point classes and the figures at the centres. */
#include "ow_compare.h"

#include "ow_results.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define C_OF_K(k) ((k)-OW_ZERO_C_K)

/* ---- axes ---------------------------------------------------------------- */

static int same(double x, double y)
{
	return fabs(x - y) <= 1e-9 * fmax(1.0, fmax(fabs(x), fabs(y)));
}

static const char *mode_name(enum ow_axis_mode m)
{
	return m == OW_AXIS_SET ? "set"
	                        : (m == OW_AXIS_ZONE ? "zone" : "shift");
}

/* "<A> and <B>: <field> differs (A: <va>, B: <vb>): <why>". */
static enum ow_status axes_differ(const struct ow_study *a,
                                  const struct ow_study *b, const char *field,
                                  const char *va, const char *vb,
                                  struct ow_diag *d)
{
	return ow_diag_set(d, OW_EINPUT,
	                   "%s and %s: %s differs (A: %s, B: %s): compare "
	                   "solves both studies on one lattice, so their "
	                   "sweeps must be equal: give both studies the same "
	                   "sweep (to compare resins at their own set-points, "
	                   "use sweep.barrel.mode \"shift\" in both)",
	                   a->path, b->path, field, va, vb);
}

static enum ow_status num_field(const struct ow_study *a,
                                const struct ow_study *b, const char *field,
                                double x, double y, const char *unit,
                                struct ow_diag *d)
{
	char va[48], vb[48];

	if (same(x, y))
		return OW_OK;
	snprintf(va, sizeof va, "%.6g%s%s", x, *unit ? " " : "", unit);
	snprintf(vb, sizeof vb, "%.6g%s%s", y, *unit ? " " : "", unit);
	return axes_differ(a, b, field, va, vb, d);
}

/* Do the reference zone's absolute set-points differ at the ends of the
 * axis? (Only with mode shift, which adds to each study's own zones.) */
static int references_differ(const struct ow_study *a, const struct ow_study *b)
{
	const struct ow_axes *x = &a->line.axes;

	return !same(ow_line_axis_ref_K(&a->line, x->axis_from),
	             ow_line_axis_ref_K(&b->line, x->axis_from)) ||
	       !same(ow_line_axis_ref_K(&a->line, x->axis_to),
	             ow_line_axis_ref_K(&b->line, x->axis_to));
}

char *ow_compare_alignment(const struct ow_compare *cmp,
                           enum ow_unit_system sys, char *buf, size_t n)
{
	const struct ow_study *a = cmp->study[0], *b = cmp->study[1];
	int za = ow_line_reference_zone(&a->line);
	int zb = ow_line_reference_zone(&b->line);
	const char *u = ow_display_label(sys, OW_DIM_TEMPERATURE);

	if (!cmp->by_shift) {
		snprintf(buf, n, "both cases at the same barrel set-points");
		return buf;
	}
	snprintf(
	    buf, n,
	    "each case at its own barrel set-points, every zone shifted "
	    "by the same amount (A: zone %d at %.0f %s, B: zone %d at "
	    "%.0f %s before the shift)",
	    za + 1,
	    ow_display_value(sys, OW_DIM_TEMPERATURE, a->line.zones[za].set_K),
	    u, zb + 1,
	    ow_display_value(sys, OW_DIM_TEMPERATURE, b->line.zones[zb].set_K),
	    u);
	return buf;
}

static enum ow_status barrel_axis(const struct ow_study *a,
                                  const struct ow_study *b, int steps,
                                  struct ow_diag *d)
{
	const struct ow_axes *x = &a->line.axes, *y = &b->line.axes;
	const char *u = x->mode == OW_AXIS_SHIFT ? "K" : "K (absolute)";
	enum ow_status st = OW_OK;

	if (x->mode != y->mode)
		return axes_differ(a, b, "sweep.barrel.mode",
		                   mode_name(x->mode), mode_name(y->mode), d);
	st = num_field(a, b, "sweep.barrel.from", x->axis_from, y->axis_from, u,
	               d);
	if (st == OW_OK)
		st = num_field(a, b, "sweep.barrel.to", x->axis_to, y->axis_to,
		               u, d);
	if (st == OW_OK && steps)
		st = num_field(a, b, "sweep.barrel.steps", x->axis_steps,
		               y->axis_steps, "", d);
	if (st == OW_OK && x->mode == OW_AXIS_SET)
		st = num_field(a, b, "sweep.barrel.zones_from",
		               x->zones_from + 1, y->zones_from + 1, "", d);
	if (st == OW_OK && x->mode == OW_AXIS_ZONE)
		st = num_field(a, b, "sweep.barrel.zone", x->zone + 1,
		               y->zone + 1, "", d);
	return st;
}

enum ow_status ow_compare_check_axes(const struct ow_study *a,
                                     const struct ow_study *b,
                                     const struct ow_sweep_config *c,
                                     struct ow_diag *d)
{
	const struct ow_axes *x, *y;
	enum ow_status st;

	if (!a || !b)
		return ow_diag_set(d, OW_EARG, "compare: no study");
	x = &a->line.axes;
	y = &b->line.axes;
	if (x->rpm_steps < 2 || y->rpm_steps < 2)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: sweep: the study has no "
		                   "sweep (sweep.rpm and sweep.barrel)",
		                   x->rpm_steps < 2 ? a->path : b->path);
	st = num_field(a, b, "sweep.rpm.from", x->rpm_from, y->rpm_from, "rpm",
	               d);
	if (st == OW_OK)
		st = num_field(a, b, "sweep.rpm.to", x->rpm_to, y->rpm_to,
		               "rpm", d);
	if (st == OW_OK && !(c && c->rpm_steps > 0))
		st = num_field(a, b, "sweep.rpm.steps", x->rpm_steps,
		               y->rpm_steps, "", d);
	if (st == OW_OK)
		st = barrel_axis(a, b, !(c && c->axis_steps > 0), d);
	return st;
}

/* ---- the combined lattice ---------------------------------------------- */

/* Unsafe if unsafe in A or in B: bits OR-ed; margins min-ed (fmin keeps
 * the one that is set when the other study sets no such limit). */
static void combine_point(const struct ow_grid_point *p,
                          const struct ow_grid_point *q, int take_b,
                          struct ow_grid_point *out)
{
	int c;

	*out = *p;
	if (take_b)
		out->pt = q->pt;
	out->solved = p->solved == 1 && q->solved == 1;
	out->v.bits = p->v.bits | q->v.bits;
	for (c = 0; c < OW_CK_LIMITS; c++)
		out->v.margin[c] = fmin(p->v.margin[c], q->v.margin[c]);
}

enum ow_status ow_compare_combine(const struct ow_grid *a,
                                  const struct ow_grid *b, int take_b,
                                  struct ow_grid **out, struct ow_diag *d)
{
	struct ow_grid *g;
	int i, n;

	*out = NULL;
	if (!a || !b || a->n_rpm != b->n_rpm || a->n_axis != b->n_axis ||
	    a->stride != b->stride)
		return ow_diag_set(d, OW_EARG,
		                   "compare: the two lattices "
		                   "differ in size");
	n = a->n_rpm * a->n_axis;
	g = calloc(1, sizeof *g);
	if (g)
		g->pts = malloc(sizeof *g->pts * (size_t)n);
	if (!g || !g->pts) {
		ow_grid_destroy(g);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	g->n_rpm = a->n_rpm;
	g->n_axis = a->n_axis;
	g->stride = a->stride;
	for (i = 0; i < n; i++) {
		combine_point(&a->pts[i], &b->pts[i], take_b, &g->pts[i]);
		g->solves += g->pts[i].solved;
	}
	*out = g;
	return OW_OK;
}

/* A limit is set when finite (ow_line.h): take other's where s has none. */
static void merge_limit(double *mine, double theirs)
{
	if (!isfinite(*mine))
		*mine = theirs;
}

struct ow_study *ow_compare_merged_study(const struct ow_study *s,
                                         const struct ow_study *other)
{
	struct ow_study *m = malloc(sizeof *m);
	struct ow_limits *l;
	const struct ow_limits *o = &other->line.limits;

	if (!m)
		return NULL;
	*m = *s;
	l = &m->line.limits;
	merge_limit(&l->peak_temp_K, o->peak_temp_K);
	merge_limit(&l->unmelt_frac, o->unmelt_frac);
	merge_limit(&l->pressure_Pa, o->pressure_Pa);
	merge_limit(&l->power_W, o->power_W);
	merge_limit(&l->torque_Nm, o->torque_Nm);
	merge_limit(&l->min_melt_temp_K, o->min_melt_temp_K);
	merge_limit(&l->min_output_kg_s, o->min_output_kg_s);
	merge_limit(&l->max_output_kg_s, o->max_output_kg_s);
	merge_limit(&l->max_sbr, o->max_sbr);
	return m;
}

/* ---- classes and the limits behind them ---------------------------------- */

enum ow_cmp_class ow_compare_class_at(const struct ow_compare *cmp, int ir,
                                      int ia)
{
	return (enum ow_cmp_class)cmp->cls[ia * cmp->n_rpm + ir];
}

static void classify_points(struct ow_compare *cmp)
{
	int i, c, k, n = cmp->n_rpm * cmp->n_axis;

	for (i = 0; i < n; i++) {
		unsigned bits[2] = {cmp->map[0]->grid->pts[i].v.bits,
		                    cmp->map[1]->grid->pts[i].v.bits};
		int cls = (bits[0] == 0) | (bits[1] == 0) << 1;

		cmp->cls[i] = (unsigned char)cls;
		cmp->count[cls]++;
		for (k = 0; k < 2; k++) {
			if (cls != (k ? OW_CMP_B_ONLY : OW_CMP_A_ONLY))
				continue;
			for (c = 0; c < OW_CK_COUNT; c++)
				cmp->lost[k][c] += (bits[1 - k] >> c) & 1u;
		}
	}
}

/* ---- both cases at the centres ------------------------------------------- */

static const char *const at_keys[OW_CMP_AT_COUNT] = {"common_centre",
                                                     "a_centre", "b_centre"};
static const char *const at_texts[OW_CMP_AT_COUNT] = {
    "centre of the common window", "centre of A's window",
    "centre of B's window"};

const char *ow_compare_at_key(enum ow_cmp_at at)
{
	return (int)at >= 0 && at < OW_CMP_AT_COUNT ? at_keys[at] : "?";
}

const char *ow_compare_at_text(enum ow_cmp_at at)
{
	return (int)at >= 0 && at < OW_CMP_AT_COUNT ? at_texts[at] : "?";
}

/* Solve each case alone at (rpm, axis), cold-started as `opwin point`
 * does, so the figures are what a single run there gives. */
static enum ow_status solve_at(struct ow_compare *cmp, struct ow_solver **sv,
                               const struct ow_window *w,
                               struct ow_cmp_point *p, struct ow_diag *d)
{
	double set_K[OW_MAX_ZONES];
	int k;

	memset(p, 0, sizeof *p);
	if (w->empty)
		return OW_OK;
	p->valid = 1;
	p->rpm = w->centre.rpm;
	p->axis = w->centre.axis;
	for (k = 0; k < 2; k++) {
		const struct ow_study *s = cmp->study[k];
		enum ow_status st;

		ow_line_apply_axis(&s->line, p->axis, set_K);
		p->set_ref_K[k] = ow_line_axis_ref_K(&s->line, p->axis);
		st = ow_solver_run(sv[k], p->rpm, set_K, 0.0, &p->pt[k], d);
		if (st != OW_OK)
			return st;
		ow_classify(&p->pt[k], &s->line.limits,
		            ow_screw_length(&s->screw), &p->v[k]);
	}
	return OW_OK;
}

static enum ow_status solve_centres(struct ow_compare *cmp, struct ow_diag *d)
{
	struct ow_solver *sv[2] = {NULL, NULL};
	const struct ow_window *w[OW_CMP_AT_COUNT] = {
	    cmp->common[0], cmp->map[0]->window, cmp->map[1]->window};
	enum ow_status st = OW_OK;
	int k;

	for (k = 0; k < 2 && st == OW_OK; k++)
		st = ow_solver_create(cmp->study[k], &sv[k], d);
	for (k = 0; k < OW_CMP_AT_COUNT && st == OW_OK; k++)
		st = solve_at(cmp, sv, w[k], &cmp->at[k], d);
	ow_solver_destroy(sv[0]);
	ow_solver_destroy(sv[1]);
	return st;
}

/* ---- the whole comparison ------------------------------------------------ */

void ow_compare_destroy(struct ow_compare *cmp)
{
	int k;

	if (!cmp)
		return;
	for (k = 0; k < 2; k++) {
		ow_map_destroy(cmp->map[k]);
		ow_window_destroy(cmp->common[k]);
		ow_grid_destroy(cmp->common_grid[k]);
	}
	free(cmp->cls);
	free(cmp);
}

/* The common window of case k: the combined lattice with k's figures,
 * judged by the union of both studies' limits. */
static enum ow_status common_window(struct ow_compare *cmp, int k,
                                    struct ow_diag *d)
{
	struct ow_study *m =
	    ow_compare_merged_study(cmp->study[k], cmp->study[1 - k]);
	enum ow_status st;

	if (!m)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	st = ow_compare_combine(cmp->map[0]->grid, cmp->map[1]->grid, k,
	                        &cmp->common_grid[k], d);
	if (st == OW_OK)
		st = ow_window_extract(m, cmp->common_grid[k], &cmp->common[k],
		                       d);
	free(m);
	return st;
}

/* Progress of the two sweeps as one: A's points first, then B's (B's
 * count taken as A's until B reports its own). */
struct progress2 {
	const struct ow_sweep_config *user;
	int k, offset, total_a;
};

static void progress2(void *ctx, int done, int total)
{
	struct progress2 *p = ctx;

	if (p->k == 0) {
		p->total_a = total;
		p->user->progress(p->user->progress_ctx, done, 2 * total);
	} else {
		p->user->progress(p->user->progress_ctx, p->offset + done,
		                  p->offset + total);
	}
}

/* Each case's map: its lattice and window (the centres are solved for
 * both cases together, solve_centres). */
static enum ow_status map_both(struct ow_compare *cmp,
                               const struct ow_sweep_config *c,
                               struct ow_diag *d)
{
	struct ow_map_config each;
	struct progress2 pr = {c, 0, 0, 0};
	enum ow_status st = OW_OK;
	int k;

	ow_map_default(&each);
	each.sweep = *c;
	each.centre = 0;
	each.spread_run = 0;
	if (c->progress) {
		each.sweep.progress = progress2;
		each.sweep.progress_ctx = &pr;
	}
	for (k = 0; k < 2 && st == OW_OK; k++) {
		pr.k = k;
		st = ow_map_run(cmp->study[k], &each, &cmp->map[k], d);
		pr.offset = pr.total_a;
	}
	return st;
}

enum ow_status ow_compare_run(const struct ow_study *a,
                              const struct ow_study *b,
                              const struct ow_sweep_config *c,
                              struct ow_compare **out, struct ow_diag *d)
{
	struct ow_compare *cmp = NULL;
	enum ow_status st;
	int k;

	*out = NULL;
	st = ow_compare_check_axes(a, b, c, d);
	if (st != OW_OK)
		return st;
	cmp = calloc(1, sizeof *cmp);
	if (!cmp)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	cmp->study[0] = a;
	cmp->study[1] = b;
	cmp->by_shift = references_differ(a, b);
	st = map_both(cmp, c, d);
	for (k = 0; k < 2 && st == OW_OK; k++)
		st = common_window(cmp, k, d);
	if (st != OW_OK)
		goto fail;
	cmp->n_rpm = cmp->map[0]->grid->n_rpm;
	cmp->n_axis = cmp->map[0]->grid->n_axis;
	cmp->cls = malloc((size_t)cmp->n_rpm * (size_t)cmp->n_axis);
	if (!cmp->cls) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	classify_points(cmp);
	st = solve_centres(cmp, d);
	if (st != OW_OK)
		goto fail;
	*out = cmp;
	return OW_OK;
fail:
	ow_compare_destroy(cmp);
	return st;
}

/* ---- the figures compared ------------------------------------------------ */

struct cmp_figure {
	const char *key; /* ow_results_figure_key */
	const char *text;
	enum ow_dim dim;
};

static const struct cmp_figure figures[] = {
    {"output_kg_h", "throughput", OW_DIM_MASS_FLOW},
    {"discharge_pressure_MPa", "discharge pressure", OW_DIM_PRESSURE},
    {"max_pressure_MPa", "highest pressure on the screw", OW_DIM_PRESSURE},
    {"discharge_bulk_temp_C", "bulk melt temperature at discharge",
     OW_DIM_TEMPERATURE},
    {"peak_temp_C", "peak melt temperature", OW_DIM_TEMPERATURE},
    {"unmelt_fraction", "unmelted fraction at discharge", OW_DIM_NONE},
    {"power_kW", "drive power", OW_DIM_POWER},
    {"sec_kWh_kg", "specific energy (drive)", OW_DIM_SPECIFIC_ENERGY},
};

#define N_FIGURES ((int)(sizeof figures / sizeof figures[0]))

int ow_compare_n_figures(void)
{
	return N_FIGURES;
}

int ow_compare_figure_index(int i)
{
	int j;

	if (i < 0 || i >= N_FIGURES)
		return -1;
	for (j = 0; j < ow_results_n_figures(); j++)
		if (!strcmp(ow_results_figure_key(j), figures[i].key))
			return j;
	return -1;
}

const char *ow_compare_figure_text(int i)
{
	return i >= 0 && i < N_FIGURES ? figures[i].text : "?";
}

enum ow_dim ow_compare_figure_dim(int i)
{
	return i >= 0 && i < N_FIGURES ? figures[i].dim : OW_DIM_NONE;
}

/* The figure in SI from the point's fields (the results module prints its
 * output keys in their own units: convert those back to SI first). */
static double figure_si(const struct ow_study *s, const struct ow_point *pt,
                        int i)
{
	double v = ow_results_figure(s, pt, ow_compare_figure_index(i));

	switch (figures[i].dim) {
	case OW_DIM_MASS_FLOW:
		return v / 3600.0;
	case OW_DIM_PRESSURE:
		return v * 1e6;
	case OW_DIM_TEMPERATURE:
		return v + OW_ZERO_C_K;
	case OW_DIM_POWER:
		return v * 1e3;
	case OW_DIM_SPECIFIC_ENERGY:
		return v * 3.6e6;
	default:
		return v;
	}
}

/* The unmelted fraction is read as a percentage. */
static int percent(int i)
{
	return figures[i].dim == OW_DIM_NONE;
}

double ow_compare_figure_shown(const struct ow_study *s,
                               const struct ow_point *pt, int i,
                               enum ow_unit_system sys)
{
	double si;

	if (i < 0 || i >= N_FIGURES)
		return NAN;
	si = figure_si(s, pt, i);
	return percent(i) ? 100.0 * si
	                  : ow_display_value(sys, figures[i].dim, si);
}

const char *ow_compare_figure_unit(int i, enum ow_unit_system sys)
{
	if (i < 0 || i >= N_FIGURES)
		return "";
	return percent(i) ? "%" : ow_display_label(sys, figures[i].dim);
}

int ow_compare_figure_decimals(int i, enum ow_unit_system sys)
{
	switch (ow_compare_figure_dim(i)) {
	case OW_DIM_MASS_FLOW:
		return 1;
	case OW_DIM_PRESSURE:
		return sys == OW_SYS_US ? 0 : 2;
	case OW_DIM_TEMPERATURE:
		return 1;
	case OW_DIM_POWER:
		return 2;
	case OW_DIM_SPECIFIC_ENERGY:
		return 4;
	default:
		return 2;
	}
}
