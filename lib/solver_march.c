/* solver_march.c - the march from hopper to tip at one trial throughput G:
 * solids conveying (Darnell & Mol 1956), melting (Tadmor 1966), melt
 * conveying (depth-resolved, lib/melt), mixers; pressures, temperatures and
 * the energy book along the way.
 *
 * Kinematics are those of the flat unwound channel at the barrel bore
 * (Tadmor & Klein 1970): V_b = pi D_b N, V_bz = V_b cos phi_b, V_bx =
 * V_b sin phi_b, channel width W(D_b), and an axial step dx is dz = dx /
 * sin phi_b down-channel. Everything is per channel (G/p); extensive results
 * are multiplied by the number of flights p. */
#include "solver_impl.h"

#include <math.h>
#include <string.h>

#define OW_PI 3.14159265358979323846
#define POOL_MIN_FRAC 1e-3 /* pool narrower than this share of W: use the
			      limit of its flow per width */

enum phase { PH_SOLIDS, PH_MELTING, PH_MELT };

/* Everything that stays fixed along one march. */
struct ctx {
	struct ow_solver *sv;
	const struct ow_screw *sc;
	const struct ow_material *mat;
	const struct ow_line *ln;
	double g;          /* throughput of one channel, kg/s */
	int p;             /* flights */
	double vb, vbz, vbx, phi, width, sinphi;
	struct march *m;
	struct ow_visc_log vlog;     /* the resin's viscosity in log form */
	struct ow_melting_in melt_in; /* all but the bed speed, set once */
	/* state */
	enum phase ph;
	double P;          /* pressure, Pa */
	double X;          /* bed width (melting), m */
	double vsz;        /* bed speed, m/s */
	double solid_flow; /* solid mass flow of one channel, kg/s */
	double pool_K;     /* melt bulk temperature */
	double pool_peak_K;
	double film_peak_K;
	double shear;      /* max shear rate at this station */
	double melt_from;  /* melting may start from here (axial, m) */
};

double ow_solver_barrel(const struct ow_solver *sv, double x_m)
{
	const struct ow_line *l = &sv->s->line;
	int i;

	for (i = 0; i < l->n_zones - 1; i++)
		if (x_m < l->zones[i].to_m)
			return sv->set_K[i];
	return sv->set_K[l->n_zones - 1];
}

static int zone_of(const struct ow_line *l, double x_m)
{
	int i;

	for (i = 0; i < l->n_zones - 1; i++)
		if (x_m < l->zones[i].to_m)
			return i;
	return l->n_zones - 1;
}

/* Book heat from the barrel at axial position x (all channels). */
static void book_barrel(struct ctx *c, double x, double w)
{
	c->m->barrel_W += w;
	c->m->zone_W[zone_of(c->ln, x)] += w;
}

static void note_pressure(struct ctx *c, double x)
{
	if (c->P > c->m->max_Pa) {
		c->m->max_Pa = c->P;
		c->m->max_at_m = x;
	}
}

static void note_peak(struct ctx *c, double t, double x)
{
	if (t > c->m->peak_K) {
		c->m->peak_K = t;
		c->m->peak_at_m = x;
	}
}

/* Fill the melt-conveying conditions of one channel at axial x. */
static void melt_cond(const struct ctx *c, double x, double depth,
		      double width, double q_m3_s, struct ow_melt_cond *mc)
{
	memset(mc, 0, sizeof *mc);
	mc->mat = c->mat;
	mc->depth_m = depth;
	mc->width_m = width;
	mc->vbz_m_s = c->vbz;
	mc->vbx_m_s = c->vbx;
	mc->vb_m_s = c->vb;
	mc->vol_flow_m3_s = q_m3_s;
	mc->barrel_K = ow_solver_barrel(c->sv, x);
	mc->root_adiabatic = c->ln->root_adiabatic;
	mc->root_K = c->ln->root_temp_K;
	mc->clearance_m = ow_screw_clearance(c->sc, x);
	mc->flight_width_m = c->sc->flight_width_m;
	mc->leak_bypass_m = OW_PI * c->sc->diameter_m * cos(c->phi) / c->p;
	mc->leak_flight_len_per_z = 1.0;
}

/* Solids conveying over one step (Darnell & Mol 1956): the plug must carry
 * the demanded rate G, which needs G below the section's zero-gradient
 * capacity (feed_limited otherwise). Its constant-friction exponential
 * pressure build-up P1 exp(beta z) is steep enough to reach absurd
 * pressures over a few diameters, so the extruder is taken as melt
 * controlled: the plug passes G at the feed pressure and the melt sections
 * build the pressure (the usual case for smooth-barrel screws, Tadmor &
 * Gogos 2006 ch. 9). The barrel friction work is drive power that heats
 * the barrel wall, since the plug's temperature is not tracked. */
static enum ow_status step_solids(struct ctx *c, double x, double dz)
{
	struct ow_solids_in in = {c->sc, ow_screw_depth(c->sc, x),
				  c->sv->rev_s, c->mat};
	struct ow_solids so;
	struct ow_solids_out o;
	double w;
	enum ow_status st = ow_solids_prepare(&in, &so, &c->sv->diag);

	if (st == OW_OK)
		st = ow_solids_eval(&so, c->g, &o, &c->sv->diag);
	if (st != OW_OK)
		return st;
	if (o.feed_limited)
		c->m->flags |= OW_FLAG_FEED_LIMITED;
	w = ow_solids_barrel_power(&so, o.theta_rad, c->P) * dz * c->p;
	c->m->power_W += w;
	book_barrel(c, x, -w);
	return OW_OK;
}

/* Width and depth of the channel that holds the bed and of the one that
 * carries the melt: one and the same, except in a barrier section. */
struct split {
	double bed_w, bed_h, melt_w, melt_h;
	int barrier;
};

static void channel_split(const struct ctx *c, double x, struct split *sp)
{
	const struct ow_section *sec =
		&c->sc->sections[ow_screw_section_at(c->sc, x)];
	double f, share;

	sp->bed_h = sp->melt_h = ow_screw_depth(c->sc, x);
	sp->bed_w = sp->melt_w = c->width;
	sp->barrier = sec->type == OW_SEC_BARRIER;
	if (!sp->barrier)
		return;
	f = (x - sec->start_m) / sec->length_m;
	f = f < 0.0 ? 0.0 : (f > 1.0 ? 1.0 : f);
	share = sec->melt_share_start +
		(sec->melt_share_end - sec->melt_share_start) * f;
	sp->bed_w = c->width * (1.0 - share);
	sp->melt_w = c->width * share;
	sp->melt_h = sec->melt_depth_start_m +
		     (sec->melt_depth_end_m - sec->melt_depth_start_m) * f;
}

/* Feed capacity of the first section (Darnell & Mol 1956): the rate it
 * conveys with no pressure loss along the plug. A demand above it means the
 * feed section cannot supply the rate, even where melting starts at once. */
static enum ow_status check_feed(struct ctx *c)
{
	struct ow_solids_in in = {c->sc, ow_screw_depth(c->sc, 0.0),
				  c->sv->rev_s, c->mat};
	struct ow_solids so;
	enum ow_status st = ow_solids_prepare(&in, &so, &c->sv->diag);

	if (st != OW_OK)
		return st;
	c->m->feed_cap_kg_s = ow_solids_max_flow(&so) * c->p;
	if (c->g * c->p > c->m->feed_cap_kg_s)
		c->m->flags |= OW_FLAG_FEED_LIMITED;
	return st;
}

static void start_melting(struct ctx *c, double x)
{
	struct split sp;

	channel_split(c, x, &sp);
	c->ph = PH_MELTING;
	c->X = sp.bed_w;
	c->vsz = ow_melting_bed_speed(c->mat, c->g, sp.bed_h, sp.bed_w);
	c->solid_flow = c->g;
	c->pool_K = c->mat->melt_temp_K;
	ow_melt_reset(c->sv->melt, c->pool_K);
	c->m->melt_start_m = x;
}

/* In a barrier section the bed fills the (narrowing) solids channel: a
 * bed wider than the channel is reshaped to its width and speeds up so its
 * mass flow is kept. */
static void fit_bed(struct ctx *c, const struct split *sp)
{
	if (!sp->barrier || c->X <= sp->bed_w)
		return;
	c->X = sp->bed_w;
	c->vsz = c->solid_flow /
		 (c->mat->solid_density_kg_m3 * sp->bed_h * sp->bed_w);
}

/* Melt pool (or barrier melt channel) over one step, with flow q_m3_s
 * carried at the channel's own width; scale is the share of the channel the
 * pool occupies (energy terms scale with it). */
static enum ow_status step_pool(struct ctx *c, double x, double dz,
				double depth, double width, double q,
				double scale, struct ow_melt_out *o)
{
	struct ow_melt_cond mc;
	enum ow_status st;

	melt_cond(c, x, depth, width, q, &mc);
	st = ow_melt_step(c->sv->melt, &mc, dz, o, &c->sv->diag);
	if (st != OW_OK)
		return st;
	c->m->power_W += o->power_W_m * dz * scale * c->p;
	c->m->root_W += o->root_heat_W_m * dz * scale * c->p;
	book_barrel(c, x, o->barrel_heat_W_m * dz * scale * c->p);
	if (o->q_floor_used)
		c->m->flags |= OW_FLAG_BACKFLOW;
	if (o->max_shear_1_s > c->shear)
		c->shear = o->max_shear_1_s;
	return OW_OK;
}

/* Melt flow of the pool per unit width, m^2/s: the melted mass spread over
 * the pool's width, or (pool still a sliver) its limit, the bed's own volume
 * flux per width at melt density. */
static double pool_flux(const struct ctx *c, double room, double melt_kg_s,
			double bed_h)
{
	const struct ow_material *mt = c->mat;

	if (room > POOL_MIN_FRAC * c->width)
		return melt_kg_s / mt->melt_density_kg_m3 / room;
	return c->vsz * bed_h * mt->solid_density_kg_m3 /
	       mt->melt_density_kg_m3;
}

/* Share of the modelled pool's energy terms that the melt carries: the
 * pool is solved as a channel carrying q_m3_s, its temperature rise is
 * (heat in) / (rho c_p q), and the melt mass flow carries that rise, so
 * the book takes (heat in) times (melt flow) / (rho q): room / W while
 * the pool has width, and no less once a held bed leaves it a sliver. */
static double pool_scale(const struct ctx *c, double q_m3_s)
{
	double melt_m3_s = (c->g - c->solid_flow) / c->mat->melt_density_kg_m3;

	return q_m3_s > 0.0 ? melt_m3_s / q_m3_s : 0.0;
}

/* Mix melt of mass dm_kg_s entering at temp_K into the pool of mass flow
 * before_kg_s: flow-weighted, so the pool's enthalpy flux is conserved. */
static void mix_into_pool(struct ctx *c, double before, double dm,
			  double temp_K)
{
	if (dm <= 0.0 || before + dm <= 0.0)
		return;
	ow_melt_mix(c->sv->melt, dm / (before + dm), temp_K);
}

/* A bed held at the channel width (plugging) gives up as melt the solids
 * the compression squeezes out of it. The film's heat into the bed melts
 * Q_bed / [C_s (T_m - T_s) + lambda] of them (Tadmor 1966); the rest joins
 * the pool at the melting point with no heat supplied for it, so the
 * energy book runs short by that heat: booked here, and named in the
 * point's notes. */
static void book_unheated(struct ctx *c, const struct ow_melting_step_out *o)
{
	const struct ow_material *mt = c->mat;
	double heat = mt->solid_cp_J_kgK *
			      (mt->melt_temp_K - c->ln->feed_temp_K) +
		      mt->fusion_J_kg;
	double free_kg_s = o->melted_kg_s - o->bed_heat_W / heat;

	if (free_kg_s > 0.0)
		c->m->unheated_W += free_kg_s * heat * c->p;
}

/* Melting over one step (Tadmor 1966): the bed melts into the pool (or the
 * barrier's melt channel), which conveys the melt and sets the pressure
 * gradient. The film's shear work beyond its dissipation is taken as
 * pushing the bed up the pressure gradient; friction of the bed on the
 * screw is neglected, as in Tadmor's model. */
static enum ow_status step_melting(struct ctx *c, double x, double dx,
				   double dz)
{
	const struct ow_material *mt = c->mat;
	struct ow_melting_in *in = &c->melt_in;
	struct ow_melting_station a, b;
	struct ow_melting_step_out o;
	struct ow_melt_out mo;
	struct split sa, sb;
	double melt_before = c->g - c->solid_flow, q, room, scale, pool_w;
	enum ow_status st;

	channel_split(c, x, &sa);
	channel_split(c, x + dx, &sb);
	fit_bed(c, &sa);
	in->bed_speed_m_s = c->vsz;
	a = (struct ow_melting_station){sa.bed_h, sa.bed_w,
					ow_solver_barrel(c->sv, x)};
	b = (struct ow_melting_station){sb.bed_h, sb.bed_w,
					ow_solver_barrel(c->sv, x + dx)};
	if (sb.barrier && sb.bed_w < c->X)
		b.width_m = c->X; /* the barrier reshapes the bed, not plugs */
	st = ow_melting_step(in, &a, &b, dz, c->X, &o, &c->sv->diag);
	if (st != OW_OK)
		return st;
	mix_into_pool(c, melt_before, o.melted_kg_s, mt->melt_temp_K);
	if (o.plugged)
		book_unheated(c, &o);
	c->solid_flow = o.solid_flow_kg_s;
	room = sb.barrier ? sb.melt_w : sb.bed_w - o.bed_width_m;
	q = pool_flux(c, room, c->g - c->solid_flow, sb.bed_h);
	pool_w = sb.barrier ? sb.melt_w : sb.bed_w; /* channel carrying melt */
	scale = pool_scale(c, q * pool_w);
	st = step_pool(c, x + 0.5 * dx, dz, sb.melt_h,
		       pool_w, q * pool_w, scale, &mo);
	if (st != OW_OK)
		return st;
	/* film: dissipation + pressure work on the bed; heat from barrel */
	c->m->power_W += (o.dissipation_W + c->solid_flow /
			  mt->solid_density_kg_m3 * mo.dpdz_Pa_m * dz) * c->p;
	c->m->flow_work_W += (c->solid_flow / mt->solid_density_kg_m3 +
			      q * pool_w * scale) *
			     mo.dpdz_Pa_m * dz * c->p;
	book_barrel(c, x, o.barrel_heat_W * c->p);
	c->P += mo.dpdz_Pa_m * dz;
	c->X = o.bed_width_m;
	c->film_peak_K = o.film.peak_temp_K;
	if (o.plugged) {
		c->m->flags |= OW_FLAG_PLUGGING;
		if (isnan(c->m->plug_at_m))
			c->m->plug_at_m = x + dx;
	}
	if (o.sbr > c->m->max_sbr) {
		c->m->max_sbr = o.sbr;
		c->m->max_sbr_at_m = x + dx;
	}
	if (o.melted_at_m >= 0.0) {
		c->ph = PH_MELT;
		c->solid_flow = 0.0;
		c->m->melt_done_m = x + o.melted_at_m * c->sinphi;
	}
	return OW_OK;
}

/* Melt conveying over one step of a conveying section. */
static enum ow_status step_melt(struct ctx *c, double x, double dx, double dz)
{
	struct ow_melt_out mo;
	double q = c->g / c->mat->melt_density_kg_m3;
	enum ow_status st = step_pool(c, x + 0.5 * dx, dz,
				      ow_screw_depth(c->sc, x + 0.5 * dx),
				      c->width, q, 1.0, &mo);

	if (st != OW_OK)
		return st;
	c->m->flow_work_W += q * mo.dpdz_Pa_m * dz * c->p;
	c->P += mo.dpdz_Pa_m * dz;
	return OW_OK;
}

/* A mixing section as a fluted barrier mixer: the melt crosses barrier
 * lands of width e_m (the screw's flight width) through the section's gap g
 * over a total land length n L (n lands along the section), dragged across
 * by the barrel. Per land area, plane Couette-Poiseuille flow (Tadmor &
 * Gogos 2006, ch. 6): flux q = V_b g/2 - g^3 dp/(12 mu e_m), so
 *   dp = 12 mu e_m (Q/(n L) - V_b g / 2) / g^3,
 * dissipation mu V_b^2/g + g^3 (dp/e_m)^2/(12 mu) per unit land area; all of
 * it heats the melt (short element: no barrel conduction). Over one step the
 * share dx/L of the section applies. */
static enum ow_status step_mixer(struct ctx *c, const struct ow_section *sec,
				 double x, double dx)
{
	const struct ow_material *mt = c->mat;
	double g = sec->gap_m, e = c->sc->flight_width_m;
	double lands = sec->lands > 0 ? sec->lands : 8.0;
	double len = lands * dx; /* land length in this step */
	double q = c->g * c->p / mt->melt_density_kg_m3; /* whole screw */
	double tb = ow_melt_bulk(c->sv->melt), mu, dp, diss, dT;

	if (e <= 0.0)
		e = 0.1 * c->sc->diameter_m; /* land about 0.1 D: common
						practice */
	mu = ow_viscosity_eval(&mt->visc, c->vb / g, tb);
	if (!isfinite(mu) || mu <= 0.0)
		return ow_diag_set(&c->sv->diag, OW_ECOMPUTE,
				   "mixer at %.3f m: viscosity not finite", x);
	/* pressure drop over the share of the section in this step */
	dp = 12.0 * mu * e * (q / (lands * sec->length_m) - 0.5 * c->vb * g) /
	     (g * g * g) * (dx / sec->length_m);
	diss = (mu * c->vb * c->vb / g +
		g * g * g * pow(dp / (dx / sec->length_m) / e, 2) /
			(12.0 * mu)) * e * len;
	dT = diss / (c->g * c->p * mt->melt_cp_J_kgK);
	ow_melt_heat(c->sv->melt, dT);
	c->m->power_W += diss - q * dp;
	c->m->flow_work_W -= q * dp;
	c->P -= dp;
	if (c->vb / g > c->shear)
		c->shear = c->vb / g;
	return OW_OK;
}

static void record(struct ctx *c, int i, double x)
{
	struct ow_profile_row *r;
	double bulk = ow_melt_bulk(c->sv->melt), peak;

	if (!c->sv->record)
		return;
	r = &c->sv->rows[i];
	peak = c->ph == PH_SOLIDS ? NAN : ow_melt_peak(c->sv->melt);
	if (c->ph == PH_MELTING && c->film_peak_K > peak)
		peak = c->film_peak_K;
	r->axial_m = x;
	r->depth_m = ow_screw_depth(c->sc, x);
	r->barrel_K = ow_solver_barrel(c->sv, x);
	r->pressure_Pa = c->P;
	r->bulk_K = c->ph == PH_SOLIDS ? NAN : bulk;
	r->peak_K = peak;
	r->sbr = c->ph == PH_MELTING ? c->X / c->width
		 : (c->ph == PH_SOLIDS ? 1.0 : 0.0);
	r->unmelt_frac = c->solid_flow / c->g;
	r->shear_max_1_s = c->shear;
	c->sv->n_rows = i + 1;
}

/* Temperatures and hold-up after a step ending at x. */
static void after_step(struct ctx *c, double x, double dx)
{
	double area = ow_screw_free_area(c->sc, x - 0.5 * dx) * dx;
	double rho;

	if (c->ph == PH_SOLIDS) {
		rho = c->mat->bulk_density_kg_m3;
	} else {
		double f = c->solid_flow / c->g;
		double t = ow_melt_peak(c->sv->melt);

		rho = f * c->mat->solid_density_kg_m3 +
		      (1.0 - f) * c->mat->melt_density_kg_m3;
		if (c->ph == PH_MELTING && c->film_peak_K > t)
			t = c->film_peak_K;
		note_peak(c, t, x);
	}
	c->m->hold_kg += rho * area;
	note_pressure(c, x);
}

static enum ow_status one_step(struct ctx *c, double x, double dx)
{
	const struct ow_section *sec =
		&c->sc->sections[ow_screw_section_at(c->sc, x + 0.5 * dx)];
	double dz = dx / c->sinphi;

	c->shear = 0.0;
	if (c->ph == PH_SOLIDS && x >= c->melt_from - 1e-9 &&
	    ow_solver_barrel(c->sv, x) > c->mat->melt_temp_K)
		start_melting(c, x);
	if (c->ph == PH_SOLIDS)
		return step_solids(c, x, dz);
	if (sec->type == OW_SEC_MIXER && c->ph == PH_MELT)
		return step_mixer(c, sec, x, dx);
	if (c->ph == PH_MELTING)
		return step_melting(c, x, dx, dz);
	return step_melt(c, x, dx, dz);
}

static void init_ctx(struct ctx *c, struct ow_solver *sv, double g,
		     struct march *m)
{
	const struct ow_screw *sc = &sv->s->screw;

	memset(c, 0, sizeof *c);
	c->sv = sv;
	c->sc = sc;
	c->mat = &sv->s->resin;
	c->ln = &sv->s->line;
	c->p = sc->flights;
	c->g = g / c->p;
	c->phi = ow_screw_helix(sc, sc->diameter_m);
	c->sinphi = sin(c->phi);
	c->vb = OW_PI * sc->diameter_m * sv->rev_s;
	c->vbz = c->vb * cos(c->phi);
	c->vbx = c->vb * c->sinphi;
	c->width = ow_screw_width(sc, sc->diameter_m);
	c->m = m;
	ow_viscosity_log_init(&c->mat->visc, &c->vlog);
	c->melt_in.mat = c->mat;
	c->melt_in.barrel_speed_m_s = c->vb;
	c->melt_in.helix_rad = c->phi;
	c->melt_in.solid_temp_K = c->ln->feed_temp_K;
	c->melt_in.film_visc_Pa_s = 0.0; /* the resin's model */
	c->melt_in.visc_log = &c->vlog;
	c->P = c->ln->numerics.feed_pressure_Pa;
	c->film_peak_K = NAN;
	/* Melting starts where the barrel is above the melting point; the
	 * delay zone is taken as zero (Tadmor & Klein 1970, ch. 9). */
	c->melt_from = 0.0;
	memset(m, 0, sizeof *m);
	m->melt_start_m = m->melt_done_m = m->plug_at_m = NAN;
	m->feed_cap_kg_s = NAN;
	m->max_Pa = c->P;
	m->peak_K = -INFINITY;
	if (c->ln->feed_temp_K > c->mat->melt_temp_K) { /* melt-fed */
		c->ph = PH_MELT;
		ow_melt_reset(sv->melt, c->ln->feed_temp_K);
		m->melt_start_m = m->melt_done_m = 0.0;
	} else {
		c->ph = PH_SOLIDS;
		c->solid_flow = c->g;
		ow_melt_reset(sv->melt, c->mat->melt_temp_K);
	}
}

static void finish(struct ctx *c, struct march *m)
{
	m->tip_Pa = c->P;
	m->unmelt = c->solid_flow / c->g;
	m->bulk_K = c->ph == PH_SOLIDS ? c->ln->feed_temp_K
				       : ow_melt_bulk(c->sv->melt);
	m->peak_tip_K = c->ph == PH_SOLIDS ? c->ln->feed_temp_K
					   : ow_melt_peak(c->sv->melt);
	if (!isfinite(m->peak_K))
		m->peak_K = m->bulk_K;
	if (c->ph == PH_SOLIDS)
		m->flags |= OW_FLAG_NO_MELTING;
}

enum ow_status ow_solver_march(struct ow_solver *sv, double g_kg_s,
			       struct march *m)
{
	struct ctx c;
	double x = 0.0;
	int i;
	enum ow_status st = OW_OK;

	init_ctx(&c, sv, g_kg_s, m);
	if (c.ph == PH_SOLIDS)
		st = check_feed(&c);
	sv->n_rows = 0;
	record(&c, 0, 0.0);
	for (i = 0; i < sv->n_steps && st == OW_OK; i++) {
		st = one_step(&c, x, sv->dx_m);
		x = (i + 1) * sv->dx_m;
		after_step(&c, x, sv->dx_m);
		record(&c, i + 1, x);
	}
	finish(&c, m);
	return st;
}
