/* solver.c - one operating point: the screw-die match and the figures.
 *
 * The pressure the screw builds at its tip falls as the throughput G rises,
 * while the die (plus screen pack) needs more: find G with
 *   f(G) = P_tip(G) - [dP_die(G, T_bulk(G)) + dP_screen] = 0
 * by secant steps until the root is bracketed, then the Illinois variant of
 * regula falsi (Dowell & Jarratt, BIT 11 (1971) 168), a safeguarded root
 * finder that keeps the bracket. A start from neighbouring points (a
 * predicted G and the slope of f there) makes the second trial one Newton
 * step; along a sweep row most points then need two marches. */
#include "solver_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "ow_die.h"
#include "ow_const.h"

#define MAX_MARCHES 60
#define G_RTOL      2e-5 /* relative throughput tolerance (bracket width) */
#define G_STEP_TOL  2e-5 /* ... and of the Newton step f/k left to take */
#define P_ATOL      1e3  /* Pa: pressure mismatch accepted ... */
#define P_RTOL      1e-4 /* ... or this share of the die's need */
/* Cold start at this share of the metering drag flow: the matched outputs
 * of the demo and every fixture study lie at 0.9-1.03 of it over 20-120
 * rpm (a barrier screw down to 0.6), so the march count drops from about
 * 6 to 4 per point against a start at one half. */
#define G_START      0.95
#define G_PROBE      1.05 /* second trial: a 5 % step gives the first secant */
#define G_NEWTON_MAX 1.5  /* largest factor of a Newton second trial */
#define K_DRIFT      1.3  /* largest change of the handed-on slope per point */
/* Named in the notes above this share of the drive power (the residual
 * the energy book is held to is 1 %). */
#define UNHEATED_NOTE 1e-3

enum ow_status ow_solver_create(const struct ow_study *s,
                                struct ow_solver **out, struct ow_diag *d)
{
	const struct ow_numerics *nm = &s->line.numerics;
	struct ow_solver *sv = calloc(1, sizeof *sv);
	double len = ow_screw_length(&s->screw);
	enum ow_status st = OW_ENOMEM;
	int bands;

	*out = NULL;
	if (!sv)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	sv->s = s;
	sv->n_steps =
	    (int)ceil(len / s->screw.lead_m * nm->stations_per_turn - 1e-9);
	if (sv->n_steps < 4)
		sv->n_steps = 4;
	sv->dx_m = len / sv->n_steps;
	sv->rows = calloc((size_t)sv->n_steps + 1, sizeof *sv->rows);
	if (!sv->rows) {
		ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	bands = (nm->depth_nodes - 1) / 2;
	st = ow_melt_create(nm->depth_nodes, bands < 2 ? 2 : bands, &sv->melt,
	                    d);
	if (st == OW_OK)
		st = ow_melt_create(nm->depth_nodes, bands < 2 ? 2 : bands,
		                    &sv->melt_save, d);
	if (st != OW_OK)
		goto fail;
	sv->tol = nm->tol_scale > 0.0 ? nm->tol_scale : 1.0;
	ow_melt_tolerance(sv->melt, sv->tol);
	ow_melt_tolerance(sv->melt_save, sv->tol);
	*out = sv;
	return OW_OK;
fail:
	ow_solver_destroy(sv);
	return st;
}

void ow_solver_destroy(struct ow_solver *sv)
{
	if (!sv)
		return;
	ow_melt_destroy(sv->melt);
	ow_melt_destroy(sv->melt_save);
	free(sv->rows);
	free(sv);
}

const struct ow_profile_row *ow_solver_profile(const struct ow_solver *sv,
                                               int *n_rows)
{
	*n_rows = sv->n_rows;
	return sv->rows;
}

/* One evaluation of the match function. */
struct eval {
	double g, f, need;
	struct march m;
	enum ow_status st;
};

/* The match so far: marches done and the last two trials (index 1 the
 * latest), whose secant is the slope handed on to neighbouring points. */
struct match {
	int n;
	double g[2], f[2];
	double k0; /* slope of f known from the start (< 0), or 0 */
};

static void evaluate(struct ow_solver *sv, double g, struct eval *e,
                     struct match *mt)
{
	const struct ow_study *s = sv->s;
	double dp = 0.0;

	e->g = g;
	mt->n++;
	e->st = ow_solver_march(sv, g, &e->m);
	if (e->st == OW_OK)
		e->st = ow_die_pressure(&s->line.die, &s->resin, g, e->m.bulk_K,
		                        &dp, &sv->diag);
	/* die_factor: a calibrated die that needs more or less than ideal */
	e->need = dp * s->line.die_factor + s->line.screen_pressure_Pa;
	e->f = e->st == OW_OK ? e->m.tip_Pa - e->need : NAN;
	mt->g[0] = mt->g[1];
	mt->f[0] = mt->f[1];
	mt->g[1] = g;
	mt->f[1] = e->f;
}

/* Secant slope of the last two trials; fallback when there is none. */
static double match_slope(const struct match *mt, double fallback)
{
	double k;

	if (mt->n < 2 || mt->g[1] == mt->g[0])
		return fallback;
	k = (mt->f[1] - mt->f[0]) / (mt->g[1] - mt->g[0]);
	return isfinite(k) && k < 0.0 ? k : fallback;
}

/* Drag-flow capacity of the last conveying section, kg/s: a scale for G. */
static double drag_scale(const struct ow_solver *sv)
{
	const struct ow_screw *sc = &sv->s->screw;
	double phi = ow_screw_helix(sc, sc->diameter_m);
	double vbz = OW_PI * sc->diameter_m * sv->rev_s * cos(phi);

	return sv->s->resin.melt_density_kg_m3 * sc->flights * vbz *
	       ow_screw_width(sc, sc->diameter_m) * ow_screw_meter_depth(sc) /
	       2.0;
}

/* The slope handed on to the next point: this match's last secant, kept
 * within a factor K_DRIFT of the slope it started from. A secant whose
 * trials straddle a jump of f (f is continuous only piecewise: a station
 * changing its stage moves the tip pressure by a step) is far too steep;
 * the clamp keeps such a slope from spreading, while a slope that truly
 * changes along a row follows within a few points. */
static double handed_slope(const struct match *mt)
{
	double k = match_slope(mt, mt->k0);

	if (mt->k0 < 0.0)
		k = fmin(fmax(k, mt->k0 * K_DRIFT), mt->k0 / K_DRIFT);
	return k;
}

/* Converged when the mismatch is within P_ATOL or P_RTOL of the die's
 * need, or when the Newton step f/k still to take moves G by less than
 * G_STEP_TOL of it (k: the secant of this match's last two trials; on the
 * first trial the start's slope). f is steep: on the demo a 1 % change
 * of G moves the tip pressure by a third of the die's need. G, and every
 * figure that varies with G at an elasticity of order one, is then known
 * far better than the tip pressure of the march, so the discharge
 * pressure is taken from the die's side (figures()). */
static int done(const struct ow_solver *sv, const struct eval *e,
                const struct match *mt)
{
	double k = match_slope(mt, mt->k0);

	return fabs(e->f) < sv->tol * fmax(P_ATOL, P_RTOL * e->need) ||
	       (k < 0.0 && fabs(e->f / k) < sv->tol * G_STEP_TOL * e->g);
}

/* The second trial: one Newton step from a with a known slope of f (a
 * neighbour's), kept within a factor G_NEWTON_MAX; without one, a probe
 * G_PROBE downhill. */
static double second_trial(const struct eval *a, double slope)
{
	double g = a->g - a->f / slope;

	if (!(isfinite(slope) && slope < 0.0 && isfinite(g) && g != a->g))
		return a->f > 0.0 ? a->g * G_PROBE : a->g / G_PROBE;
	return fmin(fmax(g, a->g / G_NEWTON_MAX), a->g * G_NEWTON_MAX);
}

/* Secant steps from a guess until f changes sign (lo: f > 0, hi: f < 0),
 * each step kept within a factor of 3 and in the downhill direction. */
static int bracket(struct ow_solver *sv, const struct ow_solver_start *s0,
                   struct eval *lo, struct eval *hi, struct eval *best,
                   struct match *mt)
{
	struct eval a, b;

	evaluate(sv, s0->g_kg_s, &a, mt);
	if (a.st != OW_OK)
		return -1;
	*best = a;
	if (done(sv, &a, mt))
		return 1;
	evaluate(sv, second_trial(&a, s0->slope), &b, mt);
	while (b.st == OW_OK && !done(sv, &b, mt) &&
	       (a.f > 0.0) == (b.f > 0.0) && mt->n < MAX_MARCHES / 2) {
		double g = b.g - b.f * (b.g - a.g) / (b.f - a.f);
		double up = b.f > 0.0 ? 1.0 : -1.0;

		if (!isfinite(g) || (g - b.g) * up <= 0.0)
			g = up > 0.0 ? b.g * 1.5 : b.g / 1.5;
		g = fmin(fmax(g, b.g / 3.0), b.g * 3.0);
		a = b;
		evaluate(sv, g, &b, mt);
	}
	if (b.st != OW_OK)
		return -1;
	*best = b;
	if (done(sv, &b, mt))
		return 1;
	if ((a.f > 0.0) == (b.f > 0.0))
		return -1;
	*lo = a.f > 0.0 ? a : b;
	*hi = a.f > 0.0 ? b : a;
	return 0;
}

/* Illinois regula falsi inside [lo, hi]; *best gets the last iterate. */
static int refine(struct ow_solver *sv, struct eval *lo, struct eval *hi,
                  struct eval *best, struct match *mt)
{
	double flo = lo->f, fhi = hi->f;
	int side = 0;

	while (mt->n < MAX_MARCHES) {
		double g = (lo->g * fhi - hi->g * flo) / (fhi - flo);

		evaluate(sv, g, best, mt);
		if (best->st != OW_OK)
			return 0;
		if (done(sv, best, mt) ||
		    hi->g - lo->g < sv->tol * G_RTOL * best->g)
			return 1;
		if (best->f > 0.0) {
			*lo = *best;
			flo = best->f;
			if (side == 1)
				fhi *= 0.5;
			side = 1;
		} else {
			*hi = *best;
			fhi = best->f;
			if (side == -1)
				flo *= 0.5;
			side = -1;
		}
	}
	return 0;
}

/* Each zone's demand, the control temperature it ran at, and the largest
 * share of a zone's heating or cooling power the point needs. */
static void zone_figures(const struct ow_line *l, const struct march *m,
                         struct ow_point *pt)
{
	int i;

	pt->zone_load = 0.0;
	for (i = 0; i < l->n_zones; i++) {
		const struct ow_zone *z = &l->zones[i];
		double need = m->zone_demand_W[i];
		double cap = need > 0.0 ? z->heating_W : z->cooling_W;

		pt->zone_demand_W[i] = need;
		pt->zone_control_K[i] = m->ctrl_K[i];
		if (need != 0.0 && !isnan(cap))
			pt->zone_load =
			    fmax(pt->zone_load,
			         cap > 0.0 ? fabs(need) / cap : INFINITY);
	}
	pt->zone_floating = m->zone_floating;
	for (i = 0; i < l->n_zones; i++)
		pt->zone_slope_W_K[i] =
		    m->zone_floating & (1u << i) ? m->zone_k[i] : 0.0;
	if (m->zone_floating)
		pt->flags |= OW_FLAG_ZONE_FLOAT;
}

/* Fill the figures of point *pt from the final march. */
static void figures(const struct ow_solver *sv, const struct eval *e,
                    struct ow_point *pt)
{
	const struct ow_study *s = sv->s;
	const struct ow_material *mt = &s->resin;
	double tf = s->line.feed_temp_K, g = e->g;
	double h_out, in;
	int tip_max;

	pt->output_kg_s = g;
	/* At the match the tip pressure is the die's need; the march's own
	 * tip value carries the residual f, the need only f's share through
	 * G, far smaller (see done()). A maximum upstream stays the march's. */
	tip_max = !(e->m.max_Pa > e->m.tip_Pa && e->m.max_Pa > e->need);
	pt->discharge_pressure_Pa = e->need;
	pt->max_pressure_Pa = tip_max ? e->need : e->m.max_Pa;
	pt->max_pressure_at_m =
	    tip_max ? ow_screw_length(&s->screw) : e->m.max_at_m;
	pt->discharge_bulk_K = e->m.bulk_K;
	pt->discharge_peak_K = e->m.peak_tip_K;
	pt->peak_K = e->m.peak_K;
	pt->peak_at_m = e->m.peak_at_m;
	pt->unmelt_frac = e->m.unmelt;
	pt->melt_start_m = e->m.melt_start_m;
	pt->melt_complete_m = e->m.melt_done_m;
	pt->max_sbr = e->m.max_sbr;
	pt->max_sbr_at_m = e->m.max_sbr_at_m;
	pt->plug_ratio = e->m.plug_ratio;
	pt->plugging_at_m = e->m.plug_at_m;
	pt->power_W = e->m.power_W;
	pt->torque_Nm = e->m.power_W / (2.0 * OW_PI * sv->rev_s);
	pt->sec_J_kg = g > 0.0 ? e->m.power_W / g : NAN;
	pt->barrel_heat_W = e->m.barrel_W;
	memcpy(pt->zone_heat_W, e->m.zone_W, sizeof pt->zone_heat_W);
	zone_figures(&s->line, &e->m, pt);
	pt->residence_s = g > 0.0 ? e->m.hold_kg / g : NAN;
	pt->feed_capacity_kg_s = e->m.feed_cap_kg_s;
	pt->flags |= e->m.flags;
	/* energy book: drive + barrel + root = G (h_out - h_feed) + sum Q dP */
	h_out = (1.0 - e->m.unmelt) *
	        (ow_material_enthalpy(mt, e->m.bulk_K, tf) -
	         ow_material_enthalpy(mt, tf, tf)); /* solids leave at tf */
	in = e->m.power_W + e->m.barrel_W + e->m.root_W;
	pt->root_heat_W = e->m.root_W;
	pt->enthalpy_rise_W = g * h_out;
	pt->flow_work_W = e->m.flow_work_W;
	pt->energy_residual = (in - g * h_out - e->m.flow_work_W) /
	                      (fabs(e->m.power_W) > 0.0 ? e->m.power_W : 1.0);
	pt->unheated_melt_W = e->m.unheated_W;
	if (e->m.unheated_W > UNHEATED_NOTE * fabs(e->m.power_W))
		pt->flags |= OW_FLAG_UNHEATED_MELT;
}

static enum ow_status check_run(const struct ow_solver *sv, double rpm,
                                const double *set_K, struct ow_diag *d)
{
	int i;

	if (!(isfinite(rpm) && rpm > 0.0 && rpm < 5000.0))
		return ow_diag_set(d, OW_EARG,
		                   "screw speed %g rpm must be positive", rpm);
	for (i = 0; set_K && i < sv->s->line.n_zones; i++)
		if (!(isfinite(set_K[i]) && set_K[i] > 200.0 &&
		      set_K[i] < 900.0))
			return ow_diag_set(d, OW_EARG,
			                   "zone %d set-point %g K is not a "
			                   "plausible temperature",
			                   i + 1, set_K[i]);
	return OW_OK;
}

/* Zones a neighbour floated start their first march as if the march
 * before had floated them there (zone_from_last in solver_march.c): a
 * control point and a slope, but no throughput to predict along. */
static void start_zones(struct ow_solver *sv, const struct ow_solver_start *s0)
{
	int i;

	for (i = 0; i < sv->s->line.n_zones; i++) {
		double t = s0->zone_K[i], k = s0->zone_slope_W_K[i];

		if (s0->zone_side[i] == 0 || !(k > 0.0 && isfinite(k)) ||
		    !(t > 200.0 && t < 900.0))
			continue;
		sv->last_side[i] = s0->zone_side[i] > 0 ? 1 : -1;
		sv->last_ctrl_K[i] = t;
		sv->zone_slope[i] = k;
	}
}

void ow_solver_start_from(const struct ow_point *pt,
                          struct ow_solver_start *out)
{
	int z;

	memset(out, 0, sizeof *out);
	if (pt->flags & OW_FLAG_NOT_CONVERGED)
		return;
	out->g_kg_s = pt->output_kg_s;
	out->slope = pt->match_slope;
	for (z = 0; z < OW_MAX_ZONES; z++) {
		if (!(pt->zone_floating & (1u << z)) ||
		    !(pt->zone_slope_W_K[z] > 0.0))
			continue;
		out->zone_side[z] = pt->zone_demand_W[z] > 0.0 ? 1 : -1;
		out->zone_K[z] = pt->zone_control_K[z];
		out->zone_slope_W_K[z] = pt->zone_slope_W_K[z];
	}
}

enum ow_status ow_solver_run(struct ow_solver *sv, double rpm,
                             const double *set_K, double warm_kg_s,
                             struct ow_point *out, struct ow_diag *d)
{
	struct ow_solver_start s0 = {.g_kg_s = warm_kg_s};

	return ow_solver_run_from(sv, rpm, set_K, &s0, out, d);
}

enum ow_status ow_solver_run_from(struct ow_solver *sv, double rpm,
                                  const double *set_K,
                                  const struct ow_solver_start *start,
                                  struct ow_point *out, struct ow_diag *d)
{
	const struct ow_line *l = &sv->s->line;
	struct eval lo = {0}, hi = {0}, best = {0};
	struct ow_solver_start s0 = {.g_kg_s = 0.0};
	struct match mt = {0, {0.0, 0.0}, {0.0, 0.0}, 0.0};
	int i, ok, rc;
	enum ow_status st = check_run(sv, rpm, set_K, d);

	if (st != OW_OK)
		return st;
	memset(out, 0, sizeof *out);
	ow_diag_clear(&sv->diag);
	sv->rev_s = rpm / 60.0;
	for (i = 0; i < l->n_zones; i++) {
		sv->set_K[i] = set_K ? set_K[i] : l->zones[i].set_K;
		sv->zone_slope[i] = 0.0; /* learnt afresh: a point depends
		                            on nothing solved before it */
		sv->last_side[i] = sv->last2_side[i] = 0;
		sv->last_ctrl_K[i] = sv->last2_ctrl_K[i] = sv->set_K[i];
		sv->last_g[i] = sv->last2_g[i] = 0.0;
		sv->last_k[i] = sv->last2_k[i] = 0.0;
	}
	sv->zone_slope_m = 0.0;
	out->rpm = rpm;
	memcpy(out->set_K, sv->set_K, sizeof out->set_K);
	if (start) {
		s0 = *start;
		start_zones(sv, start);
	}
	if (!(isfinite(s0.g_kg_s) && s0.g_kg_s > 0.0))
		s0.g_kg_s = G_START * drag_scale(sv);
	mt.k0 = isfinite(s0.slope) && s0.slope < 0.0 ? s0.slope : 0.0;
	sv->record = 1; /* every march records: the last one is kept */
	rc = bracket(sv, &s0, &lo, &hi, &best, &mt);
	ok = rc == 1 || (rc == 0 && refine(sv, &lo, &hi, &best, &mt));
	if (!ok) {
		out->flags |= OW_FLAG_NOT_CONVERGED;
		if (!(best.g > 0.0))
			best.g = 0.5 * drag_scale(sv);
		evaluate(sv, best.g, &best, &mt); /* its profile */
		if (best.st != OW_OK)
			out->flags |= OW_FLAG_NOT_CONVERGED;
	}
	sv->record = 0;
	out->n_iter = mt.n;
	out->match_slope = ok ? handed_slope(&mt) : 0.0;
	figures(sv, &best, out);
	return OW_OK;
}
