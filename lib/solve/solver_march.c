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

#include "ow_const.h"

enum phase { PH_SOLIDS, PH_MELTING, PH_MELT };

/* Everything that stays fixed along one march. */
struct ctx {
	struct ow_solver *sv;
	const struct ow_screw *sc;
	const struct ow_material *mat;
	const struct ow_line *ln;
	double g; /* throughput of one channel, kg/s */
	int p;    /* flights */
	double vb, vbz, vbx, phi, width, sinphi;
	struct march *m;
	struct ow_visc_log vlog;      /* the resin's viscosity in log form */
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
	double shear;          /* max shear rate at this station */
	struct ow_delay delay; /* the plug heating up ahead of melting */
	double delay_J_kg;     /* heat into the plug so far per kg of it */
	int delay_done; /* the film reached the clearance: melting next */
	int zone;       /* the zone whose steps are being marched */
	double film_m, film_mu, film_vj2; /* last melt film: thickness,
	                                     viscosity, slip speed^2 */
};

/* The march's state at a zone's start, to march the zone again. */
struct snap {
	struct ctx c;
	struct march m;
};

double ow_solver_barrel(const struct ow_solver *sv, double x_m)
{
	return ow_line_barrel_temp(&sv->s->line, sv->ctrl_K, x_m);
}

/* Heat-transfer coefficient from the control point to the bore at x,
 * with the study's factor; 0 for an ideal wall. */
static double wall_h(const struct ctx *c, double x)
{
	double h = c->ln->zones[ow_line_zone_at(c->ln, x)].wall_h_W_m2K;

	return h > 0.0 ? h * c->ln->heat_transfer_factor : 0.0;
}

/* Book heat from the barrel (all channels) to the zone being marched. */
static void book_barrel(struct ctx *c, double x, double w)
{
	(void)x;
	c->m->barrel_W += w;
	c->m->zone_W[c->zone] += w;
}

/* A pressure below zero cannot exist in melt: the channel cannot run full
 * there (starved or partly filled), so the full-channel model no longer
 * holds and the point is flagged, once the bed is gone. Beside a solid bed
 * a melt pool that needs such a pressure runs partly filled while the bed
 * carries the load (the plug's own pressure is not modelled): the normal
 * start of melting, most of all where it begins in a taper, not a starved
 * channel. */
static void note_pressure(struct ctx *c, double x)
{
	if (c->P < 0.0 && c->ph == PH_MELT)
		c->m->flags |= OW_FLAG_PARTIAL_FILL;
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
static void melt_cond(const struct ctx *c, double x, double depth, double width,
                      double q_m3_s, struct ow_melt_cond *mc)
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
	mc->wall_h_W_m2K = wall_h(c, x);
	mc->root_adiabatic = c->ln->root_adiabatic;
	mc->root_K = c->ln->root_temp_K;
	mc->clearance_m = ow_screw_clearance(c->sc, x);
	mc->flight_width_m = c->sc->flight_width_m;
	mc->leak_bypass_m = OW_PI * c->sc->diameter_m * cos(c->phi) / c->p;
	mc->leak_flight_len_per_z = 1.0;
}

/* The plug's delay zone over one step of dz (ow_delay.h): the plug slides
 * at V_sz = G / (rho_s H W), so the step is dz / V_sz of contact under the
 * zone's wall (control temperature and coefficient to the bore). Heat
 * into the plug and its film per unit contact area becomes heat flows over
 * the step's contact area W dz. *done gets the share of the step after
 * which the film reached the clearance (-1: not yet). */
static enum ow_status step_delay(struct ctx *c, double x, double dz,
                                 double *done)
{
	double h = ow_screw_depth(c->sc, x);
	double v = ow_melting_bed_speed(c->mat, c->g, h, c->width);
	double slip =
	    sqrt(c->vb * c->vb + v * v - 2.0 * c->vb * v * cos(c->phi));
	double rate = v * c->width * c->p, dt = v > 0.0 ? dz / v : 0.0;
	struct ow_delay_out o;
	enum ow_status st;

	*done = -1.0;
	if (!(dt > 0.0))
		return ow_diag_set(&c->sv->diag, OW_ECOMPUTE,
		                   "delay zone at "
		                   "%.3f m: no plug speed",
		                   x);
	st = ow_delay_advance(&c->delay, ow_solver_barrel(c->sv, x),
	                      wall_h(c, x), slip, ow_screw_clearance(c->sc, x),
	                      dt, &o, &c->sv->diag);
	if (st != OW_OK)
		return st;
	c->m->power_W += o.dissip_J_m2 * rate;
	book_barrel(c, x, (o.heat_J_m2 - o.dissip_J_m2) * rate);
	c->delay_J_kg += o.heat_J_m2 * rate / (c->g * c->p);
	c->film_peak_K = o.peak_K;
	if (o.done_s >= 0.0)
		*done = o.done_s / dt;
	return OW_OK;
}

/* Solids conveying over one step (Darnell & Mol 1956): the plug must carry
 * the demanded rate G, which needs G below the section's zero-gradient
 * capacity (feed_limited otherwise). Its constant-friction exponential
 * pressure build-up P1 exp(beta z) is steep enough to reach absurd
 * pressures over a few diameters, so the extruder is taken as melt
 * controlled: the plug passes G at the feed pressure and the melt sections
 * build the pressure (the usual case for smooth-barrel screws, Tadmor &
 * Gogos 2006 ch. 9). The barrel friction work is drive power that heats
 * the barrel wall (held at its temperature). The plug heats up meanwhile
 * (step_delay); *now is set when the delay zone ended at the step's start,
 * so that melting takes this step. */
static enum ow_status step_solids(struct ctx *c, double x, double dz, int *now)
{
	struct ow_solids_in in = {c->sc, ow_screw_depth(c->sc, x), c->sv->rev_s,
	                          c->mat};
	struct ow_solids so;
	struct ow_solids_out o;
	double w, done;
	enum ow_status st = step_delay(c, x, dz, &done);

	*now = done == 0.0;
	if (done >= 0.0) {
		c->delay_done = 1;
		c->m->melt_start_m = x + done * dz * c->sinphi;
	}
	if (st != OW_OK || *now)
		return st;
	st = ow_solids_prepare(&in, &so, &c->sv->diag);

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

/* Tadmor melting takes over from the delay zone: the film melt is the
 * first pool, and the bed enters with the heat the plug took up (its mean
 * temperature as the bed's T_s, which keeps the energy book exact). The
 * delay zone's heat is counted per kg of plug as it went in (the heat per
 * unit of contact area times the contact area swept per kg there), so a
 * channel that grew shallower since (fewer kg per m^2 of contact) hands
 * over the heat that went in, not more. (The heat per unit area is the
 * conduction solution of Carslaw & Jaeger, Conduction of Heat in Solids,
 * 2nd ed. 1959, sections 2.4 and 2.7; the plug sliding under the barrel
 * as in Tadmor & Klein, Engineering Principles of Plasticating Extrusion,
 * 1970.) */
static void start_melting(struct ctx *c, double x)
{
	struct split sp;
	double f, bed_K, melt_K;

	channel_split(c, x, &sp);
	ow_delay_bed(&c->delay, sp.bed_h,
	             c->delay_J_kg * c->mat->solid_density_kg_m3 * sp.bed_h, &f,
	             &bed_K, &melt_K);
	c->ph = PH_MELTING;
	c->X = sp.bed_w * (1.0 - f);
	c->vsz = ow_melting_bed_speed(c->mat, c->g, sp.bed_h, sp.bed_w);
	c->solid_flow = c->g * (1.0 - f);
	c->melt_in.solid_temp_K = bed_K;
	c->pool_K = melt_K;
	ow_melt_reset(c->sv->melt, c->pool_K);
	c->film_peak_K = NAN;
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

/* A channel carrying melt: its depth and width, and the speed at which one
 * side wall slides down-channel (the solid bed beside a pool; 0: none). */
struct chan {
	double h, w, side;
};

/* Solve the melt of flow q in channel ch at axial x; the band temperatures
 * advance over dz (0: the pressure gradient only). */
static enum ow_status chan_solve(struct ctx *c, double x, double dz,
                                 const struct chan *ch, double q,
                                 struct ow_melt_out *o)
{
	struct ow_melt_cond mc;

	melt_cond(c, x, ch->h, ch->w, q, &mc);
	if (ch->side > 0.0)
		mc.vbz_m_s += ow_melt_side_drag_speed(ch->h, ch->w, ch->side);
	return ow_melt_step(c->sv->melt, &mc, dz, o, &c->sv->diag);
}

/* Melt channel, melt pool or one of a barrier's channels over one step:
 * flow q_m3_s carried in channel ch. The bands advance over share dz, the
 * share of the melt this channel carries; power and heat are booked over dz
 * (share 1: the whole melt). */
static enum ow_status step_pool(struct ctx *c, double x, double dz,
                                const struct chan *ch, double q, double share,
                                struct ow_melt_out *o)
{
	enum ow_status st = chan_solve(c, x, share * dz, ch, q, o);

	if (st != OW_OK)
		return st;
	c->m->power_W += o->power_W_m * dz * c->p;
	c->m->root_W += o->root_heat_W_m * dz * c->p;
	book_barrel(c, x, o->barrel_heat_W_m * dz * c->p);
	if (o->q_floor_used)
		c->m->flags |= OW_FLAG_BACKFLOW;
	if (o->max_shear_1_s > c->shear)
		c->shear = o->max_shear_1_s;
	return OW_OK;
}

/* Pressure gradient mismatch of a barrier's two channels when the solids
 * channel carries q1 of the melt flow q: G_1(q1) - G_2(q - q1), falling as
 * q1 rises. Temperatures untouched. */
static enum ow_status split_gap(struct ctx *c, double x,
                                const struct chan ch[2], double q, double q1,
                                double *gap)
{
	struct ow_melt_out o1, o2;
	enum ow_status st = chan_solve(c, x, 0.0, &ch[0], q1, &o1);

	if (st == OW_OK)
		st = chan_solve(c, x, 0.0, &ch[1], q - q1, &o2);
	*gap = o1.dpdz_Pa_m - o2.dpdz_Pa_m;
	return st;
}

#define SPLIT_TOL   1e-6 /* gradient mismatch relative to the larger one */
#define SPLIT_MAXIT 60

/* The share of the melt flow q the solids channel carries when both
 * channels of a barrier section, side by side under the barrel, run at one
 * pressure gradient: parallel conduits split the flow by their drag and
 * pressure-flow conductances (Tadmor & Klein 1970, ch. 7, applied to each
 * channel). Illinois regula falsi (Dowell & Jarratt, BIT 11 (1971) 168) on
 * q1 in [0, q]; a channel whose gradient cannot be matched even with all
 * or none of the flow gets all or none of it. */
static enum ow_status split_flow(struct ctx *c, double x,
                                 const struct chan ch[2], double q, double *q1)
{
	double lo = 0.0, hi = q, flo, fhi, f, g1, g2;
	int it, side = 0;
	enum ow_status st = split_gap(c, x, ch, q, lo, &flo);

	if (st == OW_OK)
		st = split_gap(c, x, ch, q, hi, &fhi);
	*q1 = flo <= 0.0 ? 0.0 : q;
	if (st != OW_OK || flo <= 0.0 || fhi >= 0.0)
		return st;
	for (it = 0; it < SPLIT_MAXIT; it++) {
		*q1 = (lo * fhi - hi * flo) / (fhi - flo);
		st = split_gap(c, x, ch, q, *q1, &f);
		if (st != OW_OK)
			return st;
		g1 = fabs(flo), g2 = fabs(fhi);
		if (fabs(f) <= SPLIT_TOL * fmax(g1, g2) || f == 0.0)
			break;
		if (f > 0.0) {
			lo = *q1, flo = f;
			if (side == 1)
				fhi *= 0.5;
			side = 1;
		} else {
			hi = *q1, fhi = f;
			if (side == -1)
				flo *= 0.5;
			side = -1;
		}
	}
	return OW_OK;
}

/* Melt flow q over one step of a barrier section. The solids channel holds
 * the bed and, beside it, a pool (the whole channel once the bed is gone);
 * the melt channel beyond the barrier flight. Both carry melt at one
 * pressure gradient (split_flow); the bands advance in each channel over
 * its share of the step, so the band state is the flow-weighted mix of the
 * two. *mo gets the flow-weighted gradient (the flow work of both) and the
 * larger shear rate. A pool beside the bed narrower than it is deep
 * carries none. */
static enum ow_status step_barrier(struct ctx *c, double x, double dz,
                                   const struct split *sb, double bed_w,
                                   double q, struct ow_melt_out *mo)
{
	struct chan ch[2] = {
	    {sb->bed_h, sb->bed_w - bed_w, bed_w > 0.0 ? c->vsz : 0.0},
	    {sb->melt_h, sb->melt_w, 0.0}};
	struct ow_melt_out o;
	double q1 = 0.0, qs[2], g = 0.0;
	enum ow_status st = OW_OK;
	int k;

	if (!(bed_w > 0.0 && ch[0].w < ch[0].h))
		st = split_flow(c, x, ch, q, &q1);
	qs[0] = q1;
	qs[1] = q - q1;
	memset(mo, 0, sizeof *mo);
	for (k = 0; k < 2 && st == OW_OK; k++) {
		if (!(qs[k] > 0.0))
			continue;
		st = step_pool(c, x, dz, &ch[k], qs[k], qs[k] / q, &o);
		g += o.dpdz_Pa_m * qs[k] / q;
		mo->max_shear_1_s = fmax(mo->max_shear_1_s, o.max_shear_1_s);
	}
	mo->dpdz_Pa_m = g;
	return st;
}

/* The melt of one melting step: in a barrier section see step_barrier;
 * otherwise the pool beside the bed, a channel of its own width W - X
 * whose side wall, the bed, slides at V_sz (Tadmor & Klein 1970, ch. 9,
 * convey the pool at width W - X). A pool narrower than it is deep is not
 * yet a channel of its own: the bed filling the channel carries the
 * pressure as the plug did (no build-up) and the pool melt stays at the
 * melting point it entered with; an engineering choice, not from a source.
 * *mo is zero then. */
static enum ow_status step_melt_of_bed(struct ctx *c, double x, double dz,
                                       const struct split *sb, double bed_w,
                                       double q, struct ow_melt_out *mo)
{
	struct chan pool = {sb->bed_h, sb->bed_w - bed_w, c->vsz};

	if (sb->barrier)
		return step_barrier(c, x, dz, sb, bed_w, q, mo);
	memset(mo, 0, sizeof *mo);
	if (pool.w < pool.h)
		return OW_OK;
	return step_pool(c, x, dz, &pool, q, 1.0, mo);
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
	double heat =
	    mt->solid_cp_J_kgK * (mt->melt_temp_K - c->melt_in.solid_temp_K) +
	    mt->fusion_J_kg; /* the bed enters at its T_s */
	double free_kg_s = o->melted_kg_s - o->bed_heat_W / heat;

	if (free_kg_s > 0.0)
		c->m->unheated_W += free_kg_s * heat * c->p;
}

/* Plugging as the trade reads it, where the channel holding the bed gets
 * shallower: the solid bed ratio there, and Tadmor's plugging number, the
 * bed's width demand over its melting. With s = X/W, A = -dH/dz and
 * psi_t = Phi / (rho_s V_sz sqrt(W)), the bed mass balance gives
 * d sqrt(s)/dz = (A sqrt(s) - psi_t) / (2H) (Tadmor & Klein 1970, ch. 9),
 * so the bed widens as it is squeezed when A sqrt(s) / psi_t > 1; for a
 * bed filling the channel that is Tadmor's criterion psi_t <= A. */
static void note_compression(struct ctx *c, const struct split *sa,
                             const struct split *sb, double dz,
                             const struct ow_melting_step_out *o, double x)
{
	double taper = (sa->bed_h - sb->bed_h) / dz, psi, r;

	if (!(taper > 0.0) || !(o->bed_width_m > 0.0))
		return;
	if (o->sbr > c->m->max_sbr) {
		c->m->max_sbr = o->sbr;
		c->m->max_sbr_at_m = x;
	}
	psi = ow_melting_psi_taper(o->film.phi, c->mat->solid_density_kg_m3,
	                           c->vsz, sb->bed_w);
	r = taper * sqrt(o->sbr) / psi;
	if (psi > 0.0 && r > c->m->plug_ratio)
		c->m->plug_ratio = r;
}

/* Inner-surface temperature over the melt film at x: the film takes
 * q = (k/delta)(T_w - T_m) - mu V_j^2/(2 delta) per unit area (Tadmor
 * 1966), the wall passes q = h (T_c - T_w) from the control point, so
 *   T_w = (T_c + a T_m + mu V_j^2/(2 delta h)) / (1 + a),  a = k/(delta h)
 * with the film of the last step (it changes slowly along the bed). */
static double film_wall(const struct ctx *c, double x)
{
	double tc = ow_solver_barrel(c->sv, x), h = wall_h(c, x);
	double d = c->film_m, a;

	if (!(h > 0.0) || !(d > 0.0) || !(tc > c->mat->melt_temp_K))
		return tc;
	a = c->mat->melt_k_W_mK / (d * h);
	return (tc + a * c->mat->melt_temp_K +
	        c->film_mu * c->film_vj2 / (2.0 * d * h)) /
	       (1.0 + a);
}

/* A bed carrying at most this share of the channel's throughput at a
 * step's end has melted: its latent heat is below 1e-9 of the melting
 * heat, far inside the energy book's own residual, and it would otherwise
 * cost a whole melting step of its own. */
#define BED_END_RTOL 1e-9

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
	double melt_before = c->g - c->solid_flow, q;
	enum ow_status st;

	channel_split(c, x, &sa);
	channel_split(c, x + dx, &sb);
	fit_bed(c, &sa);
	in->bed_speed_m_s = c->vsz;
	a = (struct ow_melting_station){sa.bed_h, sa.bed_w, film_wall(c, x)};
	b = (struct ow_melting_station){sb.bed_h, sb.bed_w,
	                                film_wall(c, x + dx)};
	if (sb.barrier && sb.bed_w < c->X)
		b.width_m = c->X; /* the barrier reshapes the bed, not plugs */
	st = ow_melting_step(in, &a, &b, dz, c->X, &o, &c->sv->diag);
	if (st != OW_OK)
		return st;
	if (o.melted_at_m < 0.0 && o.solid_flow_kg_s <= BED_END_RTOL * c->g) {
		/* a bed left with a negligible share of the throughput
		 * melts at the step's end, not over a whole next step */
		o.melted_kg_s += o.solid_flow_kg_s;
		o.solid_flow_kg_s = 0.0;
		o.bed_width_m = 0.0;
		o.melted_at_m = dz;
	}
	mix_into_pool(c, melt_before, o.melted_kg_s, mt->melt_temp_K);
	if (o.plugged)
		book_unheated(c, &o);
	c->solid_flow = o.solid_flow_kg_s;
	q = (c->g - c->solid_flow) / mt->melt_density_kg_m3;
	st = step_melt_of_bed(c, x + 0.5 * dx, dz, &sb, o.bed_width_m, q, &mo);
	if (st != OW_OK)
		return st;
	/* film: dissipation + pressure work on the bed; heat from barrel */
	c->m->power_W +=
	    (o.dissipation_W +
	     c->solid_flow / mt->solid_density_kg_m3 * mo.dpdz_Pa_m * dz) *
	    c->p;
	c->m->flow_work_W += (c->solid_flow / mt->solid_density_kg_m3 + q) *
	                     mo.dpdz_Pa_m * dz * c->p;
	book_barrel(c, x, o.barrel_heat_W * c->p);
	c->P += mo.dpdz_Pa_m * dz;
	c->X = o.bed_width_m;
	c->film_peak_K = o.film.peak_temp_K;
	c->film_m = o.film.film_m;
	c->film_mu = o.film.visc_Pa_s;
	c->film_vj2 = o.film.slip_speed_m_s * o.film.slip_speed_m_s;
	if (o.plugged) {
		c->m->flags |= OW_FLAG_PLUGGING;
		if (isnan(c->m->plug_at_m))
			c->m->plug_at_m = x + dx;
	}
	note_compression(c, &sa, &sb, dz, &o, x + dx);
	if (o.melted_at_m >= 0.0) {
		c->ph = PH_MELT;
		c->solid_flow = 0.0;
		c->m->melt_done_m = x + o.melted_at_m * c->sinphi;
	}
	return OW_OK;
}

/* Melt conveying over one step of a conveying section; in a barrier
 * section both channels carry the melt (step_barrier). */
static enum ow_status step_melt(struct ctx *c, double x, double dx, double dz)
{
	struct ow_melt_out mo;
	struct split sp;
	double q = c->g / c->mat->melt_density_kg_m3, xm = x + 0.5 * dx;
	struct chan ch = {ow_screw_depth(c->sc, xm), c->width, 0.0};
	enum ow_status st;

	channel_split(c, xm, &sp);
	st = sp.barrier ? step_barrier(c, xm, dz, &sp, 0.0, q, &mo)
	                : step_pool(c, xm, dz, &ch, q, 1.0, &mo);
	if (st != OW_OK)
		return st;
	c->m->flow_work_W += q * mo.dpdz_Pa_m * dz * c->p;
	c->P += mo.dpdz_Pa_m * dz;
	return OW_OK;
}

/* A mixing section as a fluted barrier mixer: the melt crosses the
 * section's barrier lands (axial, as long as the section, as wide as the
 * screw's flight land) through its gap, dragged across by the barrel; the
 * land flow, pressure change and shear heating are those of
 * ow_melt_mixer_land. The heat of the lands goes into the melt, which
 * exchanges heat with the barrel as in any section (ow_melt_mixer_step).
 * Over one step the share dx/L of the section applies. */
static enum ow_status step_mixer(struct ctx *c, const struct ow_section *sec,
                                 double x, double dx, double dz)
{
	const struct ow_material *mt = c->mat;
	double e = c->sc->flight_width_m, share = dx / sec->length_m;
	double q = c->g * c->p / mt->melt_density_kg_m3; /* whole screw */
	double mu = ow_viscosity_eval(&mt->visc, c->vb / sec->gap_m,
	                              ow_melt_bulk(c->sv->melt));
	struct ow_mixer_land land;
	struct ow_melt_cond mc;
	struct ow_melt_out mo;
	enum ow_status st;

	if (e <= 0.0)
		e = 0.1 * c->sc->diameter_m; /* land about 0.1 D: common
		                                practice */
	ow_melt_mixer_land(q, sec->lands, sec->length_m, sec->gap_m, e, c->vb,
	                   mu, &land);
	if (!isfinite(land.heat_W))
		return ow_diag_set(&c->sv->diag, OW_ECOMPUTE,
		                   "mixer at %.3f m: viscosity not finite", x);
	melt_cond(c, x + 0.5 * dx, sec->depth_m, c->width,
	          c->g / mt->melt_density_kg_m3, &mc);
	st = ow_melt_mixer_step(c->sv->melt, &mc, dz,
	                        land.heat_W * share / (c->p * dz), &mo,
	                        &c->sv->diag);
	if (st != OW_OK)
		return st;
	c->m->power_W += land.power_W * share;
	c->m->flow_work_W += q * land.dp_Pa * share;
	c->m->root_W += mo.root_heat_W_m * dz * c->p;
	book_barrel(c, x, mo.barrel_heat_W_m * dz * c->p);
	c->P += land.dp_Pa * share;
	if (land.shear_1_s > c->shear)
		c->shear = land.shear_1_s;
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
	r->pressure_Pa = c->P < 0.0 ? NAN : c->P; /* no pressure below 0 */
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
		if (isfinite(c->film_peak_K)) /* the delay zone's film */
			note_peak(c, c->film_peak_K, x);
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
	if (c->ph == PH_SOLIDS && c->delay_done)
		start_melting(c, x);
	if (c->ph == PH_SOLIDS) {
		int now;
		enum ow_status st = step_solids(c, x, dz, &now);

		if (st != OW_OK || !now)
			return st;
		start_melting(c, x);
	}
	if (sec->type == OW_SEC_MIXER && c->ph == PH_MELT)
		return step_mixer(c, sec, x, dx, dz);
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
	memset(m, 0, sizeof *m);
	m->melt_start_m = m->melt_done_m = m->plug_at_m = NAN;
	m->max_sbr_at_m = NAN;
	m->feed_cap_kg_s = NAN;
	m->max_Pa = c->P;
	m->peak_K = -INFINITY;
	for (int z = 0; z < c->ln->n_zones; z++)
		m->ctrl_K[z] = sv->ctrl_K[z] = sv->set_K[z];
	if (c->ln->feed_temp_K > c->mat->melt_temp_K) { /* melt-fed */
		c->ph = PH_MELT;
		ow_melt_reset(sv->melt, c->ln->feed_temp_K);
		m->melt_start_m = m->melt_done_m = 0.0;
	} else {
		c->ph = PH_SOLIDS;
		c->solid_flow = c->g;
		ow_melt_reset(sv->melt, c->mat->melt_temp_K);
		ow_delay_start(&c->delay, c->mat, c->ln->feed_temp_K);
	}
}

static void finish(struct ctx *c, struct march *m)
{
	m->tip_Pa = c->P;
	m->unmelt = c->solid_flow / c->g;
	m->bulk_K =
	    c->ph == PH_SOLIDS ? c->ln->feed_temp_K : ow_melt_bulk(c->sv->melt);
	m->peak_tip_K =
	    c->ph == PH_SOLIDS ? c->ln->feed_temp_K : ow_melt_peak(c->sv->melt);
	if (!isfinite(m->peak_K))
		m->peak_K = m->bulk_K;
	if (c->ph == PH_SOLIDS)
		m->flags |= OW_FLAG_NO_MELTING;
}

/* Steps i in [from, to): one step, its temperatures, its profile row. */
static enum ow_status march_steps(struct ctx *c, int from, int to)
{
	double dx = c->sv->dx_m;
	enum ow_status st = OW_OK;
	int i;

	for (i = from; i < to && st == OW_OK; i++) {
		st = one_step(c, i * dx, dx);
		after_step(c, (i + 1) * dx, dx);
		record(c, i + 1, (i + 1) * dx);
	}
	return st;
}

static void save(struct ctx *c, struct snap *s)
{
	s->c = *c;
	s->m = *c->m;
	ow_melt_copy(c->sv->melt_save, c->sv->melt);
}

static void restore(struct ctx *c, const struct snap *s)
{
	*c = s->c;
	*c->m = s->m;
	ow_melt_copy(c->sv->melt, c->sv->melt_save);
}

/* The heat zone z can give (target) when it needs q_W to hold its
 * set-point: q_W itself, or its heating or cooling power. */
static double zone_target(const struct ow_zone *z, double q_W)
{
	if (q_W > z->heating_W)
		return z->heating_W;
	if (q_W < -z->cooling_W)
		return -z->cooling_W;
	return q_W;
}

/* Stop rule of a floating zone: its heat within ZONE_TOL_W or ZONE_RTOL of
 * its power, or the last secant step below ZONE_DT_K. The zone's heat is
 * nearly linear in its control temperature (Q = h A (T_c - T_bore), the
 * bore following T_c by a small share), so secant steps converge
 * superlinearly and a tolerance far below the match's own (P_RTOL 1e-4)
 * costs about one zone march more than a loose one: the match function
 * then carries no trace of where the zone iteration happened to stop. */
#define ZONE_TOL_W  1e-2
#define ZONE_RTOL   1e-5
#define ZONE_DT_K   1e-9
#define ZONE_MAXIT  12
#define ZONE_STEP_K 100.0 /* largest change of a control point per try */
#define ZONE_LO_K   250.0 /* range a control point may float in */
#define ZONE_HI_K   850.0

/* March zone z's steps (from..to) from its start state s0 with its control
 * point at t_K; returns the zone's heat through *q_W. */
static enum ow_status zone_try(struct ctx *c, const struct snap *s0, int z,
                               int from, int to, double t_K, double *q_W)
{
	enum ow_status st;

	restore(c, s0);
	c->zone = z;
	c->sv->ctrl_K[z] = t_K;
	st = march_steps(c, from, to);
	*q_W = c->m->zone_W[z];
	return st;
}

/* Secant iteration on zone z's control temperature for heat target from
 * (t0, q0) and a first step t1. Returns 1 when converged (the zone's
 * steps marched at the root, its slope in *k), 0 when the zone's heat does
 * not follow its wall, -1 when a march failed (*st). */
static int zone_secant(struct ctx *c, const struct snap *s0, int z, int from,
                       int to, double target, double t0, double q0, double t1,
                       double *k, enum ow_status *st)
{
	double tol = c->sv->tol * fmax(ZONE_TOL_W, ZONE_RTOL * fabs(target));
	double q1;
	int it;

	for (it = 0; it < ZONE_MAXIT; it++) {
		double t2;

		*st = zone_try(c, s0, z, from, to, t1, &q1);
		if (*st != OW_OK)
			return -1;
		if (fabs(q1 - target) <= tol || fabs(t1 - t0) < ZONE_DT_K)
			return 1;
		if (fabs(q1 - q0) < 1e-9 * (fabs(q0) + 1.0))
			return 0;
		*k = (q1 - q0) / (t1 - t0);
		t2 = t1 - (q1 - target) / *k;
		t2 = fmin(fmax(t2, t1 - ZONE_STEP_K), t1 + ZONE_STEP_K);
		t0 = t1;
		q0 = q1;
		t1 = fmin(fmax(t2, ZONE_LO_K), ZONE_HI_K);
	}
	return 1; /* the closest try of a slowly converging zone */
}

/* The first secant step from (t0, q0) towards target: with the slope k
 * this solve has learnt for the zone, a Newton step; else 10 K. */
static double zone_first_step(double t0, double q0, double target, double k)
{
	if (k > 0.0)
		return t0 +
		       fmin(fmax((target - q0) / k, -ZONE_STEP_K), ZONE_STEP_K);
	return t0 + (target > q0 ? 10.0 : -10.0);
}

/* A zone that floated in the previous march of this solve floats again
 * near the same control temperature: start there, not at the set-point.
 * Converged on the floating side of the set-point (below it when short of
 * heating, above when short of cooling; the zone's heat rises with its
 * control temperature), the zone floats and its demand at the set-point
 * is the heat extrapolated along the secant slope, Q(T_set) = P + k (T_set
 * - T_c). Returns 1 when that holds, 0 to solve the zone from its set-point. */
static int zone_from_last(struct ctx *c, const struct snap *s0, int z, int from,
                          int to, enum ow_status *st)
{
	struct ow_solver *sv = c->sv;
	const struct ow_zone *zn = &c->ln->zones[z];
	double t0 = sv->last_ctrl_K[z], set = sv->set_K[z],
	       k = sv->zone_slope[z];
	double dg = sv->last_g[z] - sv->last2_g[z],
	       target = sv->last_side[z] > 0 ? zn->heating_W : -zn->cooling_W;
	double q0;
	int rc;

	if (sv->last_side[z] == 0 || !(k > 0.0) || !isfinite(target))
		return 0;
	/* the control point is smooth in G: predict it linearly from the
	 * last two marches when they floated this zone too */
	if (sv->last2_side[z] == sv->last_side[z] && dg != 0.0 &&
	    sv->last_g[z] > 0.0 && sv->last2_g[z] > 0.0) {
		double dk = (sv->last_k[z] - sv->last2_k[z]) / dg *
		            (c->g - sv->last_g[z]);

		t0 += fmin(fmax((sv->last_ctrl_K[z] - sv->last2_ctrl_K[z]) /
		                    dg * (c->g - sv->last_g[z]),
		                -ZONE_STEP_K),
		           ZONE_STEP_K);
		if (sv->last2_k[z] > 0.0) /* the slope likewise */
			k = fmin(fmax(k + dk, 0.5 * k), 2.0 * k);
	}
	*st = zone_try(c, s0, z, from, to, t0, &q0);
	if (*st != OW_OK)
		return 0;
	if (fabs(q0 - target) <=
	    sv->tol * fmax(ZONE_TOL_W, ZONE_RTOL * fabs(target)))
		rc = 1;
	else
		rc = zone_secant(c, s0, z, from, to, target, t0, q0,
		                 zone_first_step(t0, q0, target, k), &k, st);
	if (rc != 1 ||
	    (target > 0.0 ? sv->ctrl_K[z] >= set : sv->ctrl_K[z] <= set))
		return 0;
	sv->zone_slope[z] = k;
	sv->zone_slope_m = k / ((to - from) * sv->dx_m);
	c->m->zone_demand_W[z] = target + k * (set - sv->ctrl_K[z]);
	return 1;
}

/* March the steps of zone z (from..to) with its control point at the
 * set-point. A zone that needs more heating or cooling than it has cannot
 * hold it: its control point floats to the temperature at which the
 * zone's heat equals its power (secant steps on the control temperature,
 * marching the zone again from its start: downstream zones do not act
 * upstream in the march). A zone that floated in the previous march of
 * the same solve starts from the control temperature it floated to, so
 * the marches near the match take one or two zone marches; what a march
 * returns depends only on its inputs to within the zone tolerance. */
static enum ow_status run_zone(struct ctx *c, int z, int from, int to)
{
	struct ow_solver *sv = c->sv;
	const struct ow_zone *zn = &c->ln->zones[z];
	double t0 = sv->set_K[z], q0, need, target, k = sv->zone_slope[z];
	struct snap s0;
	enum ow_status st = OW_OK;
	int rc, side0;

	save(c, &s0);
	side0 = sv->last_side[z];
	if (zone_from_last(c, &s0, z, from, to, &st)) {
		c->m->zone_floating |= 1u << z;
		need = c->m->zone_demand_W[z];
		goto done;
	}
	st = zone_try(c, &s0, z, from, to, t0, &q0);
	need = q0;
	target = zone_target(zn, q0);
	sv->last_side[z] = 0;
	if (st != OW_OK || target == q0 || !isfinite(target))
		goto done;
	if (!(k > 0.0)) /* the zones are alike per length of barrel */
		k = sv->zone_slope_m * (to - from) * sv->dx_m;
	rc = zone_secant(c, &s0, z, from, to, target, t0, q0,
	                 zone_first_step(t0, q0, target, k), &k, &st);
	if (rc == 0) {
		/* the zone's heat does not follow its wall (friction on the
		 * solid plug only): no temperature it can hold; report it
		 * at its set-point, flagged */
		st = zone_try(c, &s0, z, from, to, t0, &q0);
	} else if (rc == 1) {
		sv->zone_slope[z] = k;
		sv->zone_slope_m = k / ((to - from) * sv->dx_m);
		sv->last_side[z] = target > 0.0 ? 1 : -1;
	}
	c->m->zone_floating |= 1u << z;
done:
	c->m->zone_demand_W[z] = need;
	sv->last2_side[z] = side0;
	sv->last2_ctrl_K[z] = sv->last_ctrl_K[z];
	sv->last2_g[z] = sv->last_g[z];
	sv->last2_k[z] = sv->last_k[z];
	sv->last_k[z] = sv->zone_slope[z];
	sv->last_ctrl_K[z] = sv->ctrl_K[z];
	sv->last_g[z] = c->g;
	c->m->ctrl_K[z] = sv->ctrl_K[z];
	c->m->zone_k[z] = sv->last_side[z] != 0 ? sv->zone_slope[z] : 0.0;
	return st;
}

enum ow_status ow_solver_march(struct ow_solver *sv, double g_kg_s,
                               struct march *m)
{
	const struct ow_line *l = &sv->s->line;
	struct ctx c;
	int z, from = 0;
	enum ow_status st = OW_OK;

	init_ctx(&c, sv, g_kg_s, m);
	if (c.ph == PH_SOLIDS)
		st = check_feed(&c);
	sv->n_rows = 0;
	record(&c, 0, 0.0);
	for (z = 0; z < l->n_zones && st == OW_OK; z++) {
		int to = from;

		/* the zone's steps: those whose middle lies in it */
		while (to < sv->n_steps &&
		       (z == l->n_zones - 1 ||
		        (to + 0.5) * sv->dx_m < l->zones[z].to_m))
			to++;
		if (to > from)
			st = run_zone(&c, z, from, to);
		from = to;
	}
	finish(&c, m);
	return st;
}
