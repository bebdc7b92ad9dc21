/* melt.c - the melt-conveying workspace and one station step: flight-edge
 * substitution, leakage, velocity solve, bands, energy step, bookkeeping. */
#include "melt_impl.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

static void cells_at(struct melt_cells *cs, double *mem, size_t nc)
{
	cs->lnv = mem;
	cs->phi = mem + nc;
	cs->lu = mem + 2 * nc;
	cs->ltau = mem + 3 * nc;
	cs->tau2 = mem + 4 * nc;
	cs->nloc = mem + 5 * nc;
	cs->h2 = mem + 6 * nc;
}

enum ow_status ow_melt_create(int depth_nodes, int bands,
                              struct ow_melt_ws **out, struct ow_diag *d)
{
	struct ow_melt_ws *ws = NULL;
	size_t nn = (size_t)depth_nodes, nc, nb = (size_t)bands;

	if (!out)
		return ow_diag_set(d, OW_EARG, "melt: no output pointer");
	*out = NULL;
	if (depth_nodes < 5 || depth_nodes > 100000)
		return ow_diag_set(d, OW_EARG,
		                   "melt: depth_nodes = %d: must lie in "
		                   "5..100000",
		                   depth_nodes);
	if (bands < 2 || bands > 10000)
		return ow_diag_set(d, OW_EARG,
		                   "melt: bands = %d: must lie in 2..10000",
		                   bands);
	nc = nn - 1;
	ws = calloc(1, sizeof *ws);
	if (!ws)
		goto fail;
	ws->nn = depth_nodes;
	ws->nc = depth_nodes - 1;
	ws->nb = bands;
	ws->cell_mem = calloc(16 * nc, sizeof(double));
	ws->cell_band = calloc(nc, sizeof(int));
	ws->y = calloc(8 * nn, sizeof(double));
	ws->t = calloc(13 * nb, sizeof(double));
	ws->seg_lo = calloc(4 * nb, sizeof(double));
	ws->seg_band = calloc(2 * nb, sizeof(int));
	if (!ws->cell_mem || !ws->cell_band || !ws->y || !ws->t ||
	    !ws->seg_lo || !ws->seg_band)
		goto fail;
	cells_at(&ws->cur, ws->cell_mem, nc);
	cells_at(&ws->trial, ws->cell_mem + 7 * nc, nc);
	ws->tc = ws->cell_mem + 14 * nc;
	ws->lat = ws->cell_mem + 15 * nc;
	ws->uz = ws->y + nn;
	ws->ux = ws->y + 2 * nn;
	ws->gd = ws->y + 3 * nn;
	ws->dis = ws->y + 4 * nn;
	ws->eta = ws->y + 5 * nn;
	ws->tn = ws->y + 6 * nn;
	ws->psi = ws->y + 7 * nn;
	ws->w = ws->t + nb;
	ws->dk = ws->t + 2 * nb;
	ws->gnext = ws->t + 3 * nb;
	ws->gb = ws->t + 4 * nb;
	ws->gr = ws->t + 5 * nb;
	ws->tri = ws->t + 6 * nb;  /* 2 nb */
	ws->legs = ws->t + 8 * nb; /* 4 nb */
	ws->level = ws->t + 12 * nb;
	for (size_t k = 0; k < nb; k++) {
		/* stream-function levels of the band edges, s_k = cos^2(pi
		 * (k + 1) / (2K)), the outermost at the walls (0) */
		double c = cos(OW_PI * (double)(k + 1) / (2.0 * (double)nb));

		ws->level[k] = k + 1 == nb ? 0.0 : c * c;
	}
	ws->seg_hi = ws->seg_lo + 2 * nb;
	ws->hcache = -1.0;
	ws->tol = 1.0;
	*out = ws;
	return OW_OK;
fail:
	ow_melt_destroy(ws);
	return ow_diag_set(d, OW_ENOMEM, "melt: out of memory for %d nodes",
	                   depth_nodes);
}

void ow_melt_destroy(struct ow_melt_ws *ws)
{
	if (!ws)
		return;
	free(ws->cell_mem);
	free(ws->cell_band);
	free(ws->y);
	free(ws->t);
	free(ws->seg_lo);
	free(ws->seg_band);
	free(ws);
}

void ow_melt_tolerance(struct ow_melt_ws *ws, double scale)
{
	if (scale > 0.0)
		ws->tol = scale;
}

void ow_melt_reset(struct ow_melt_ws *ws, double temp_K)
{
	for (int b = 0; b < ws->nb; b++)
		ws->t[b] = temp_K;
	for (int j = 0; j < ws->nn; j++)
		ws->tn[j] = temp_K;
	ws->bulk = temp_K;
	ws->warm = 0;
	ws->have_profile = 0;
}

void ow_melt_mix(struct ow_melt_ws *ws, double frac, double temp_K)
{
	for (int b = 0; b < ws->nb; b++)
		ws->t[b] += frac * (temp_K - ws->t[b]);
	for (int j = 0; j < ws->nn; j++)
		ws->tn[j] += frac * (temp_K - ws->tn[j]);
	ws->bulk += frac * (temp_K - ws->bulk);
}

void ow_melt_heat(struct ow_melt_ws *ws, double dT_K)
{
	for (int b = 0; b < ws->nb; b++)
		ws->t[b] += dT_K;
	for (int j = 0; j < ws->nn; j++)
		ws->tn[j] += dT_K;
	ws->bulk += dT_K;
}

void ow_melt_mixer_land(double q_m3_s, double n_lands, double length_m,
                        double gap_m, double land_width_m, double vb_m_s,
                        double visc_Pa_s, struct ow_mixer_land *out)
{
	double g = gap_m, e = land_width_m, mu = visc_Pa_s, len;
	double g3 = g * g * g, q, grad;

	if (!(g > 0.0 && e > 0.0 && length_m > 0.0 && n_lands > 0.0 &&
	      mu > 0.0)) {
		out->dp_Pa = out->heat_W = out->power_W = NAN;
		out->shear_1_s = NAN;
		return;
	}
	len = n_lands * length_m;
	q = q_m3_s / len;
	out->dp_Pa = 12.0 * mu * e * (0.5 * vb_m_s * g - q) / g3;
	grad = out->dp_Pa / e;
	out->heat_W =
	    len * e *
	    (mu * vb_m_s * vb_m_s / g + g3 * grad * grad / (12.0 * mu));
	out->power_W = out->heat_W + q_m3_s * out->dp_Pa;
	out->shear_1_s = fabs(vb_m_s) / g;
}

void ow_melt_copy(struct ow_melt_ws *dst, const struct ow_melt_ws *src)
{
	struct ow_melt_ws keep = *dst;
	size_t nc = (size_t)src->nc, nn = (size_t)src->nn;
	size_t nb = (size_t)src->nb;

	memcpy(dst->cell_mem, src->cell_mem, 16 * nc * sizeof(double));
	memcpy(dst->cell_band, src->cell_band, nc * sizeof(int));
	memcpy(dst->y, src->y, 8 * nn * sizeof(double));
	memcpy(dst->t, src->t, 13 * nb * sizeof(double));
	memcpy(dst->seg_lo, src->seg_lo, 4 * nb * sizeof(double));
	memcpy(dst->seg_band, src->seg_band, 2 * nb * sizeof(int));
	*dst = *src;         /* the scalars ... */
	dst->cur = keep.cur; /* ... but dst's own arrays */
	dst->trial = keep.trial;
	dst->cell_mem = keep.cell_mem;
	dst->tc = keep.tc;
	dst->lat = keep.lat;
	dst->cell_band = keep.cell_band;
	dst->y = keep.y;
	dst->uz = keep.uz;
	dst->ux = keep.ux;
	dst->gd = keep.gd;
	dst->dis = keep.dis;
	dst->eta = keep.eta;
	dst->tn = keep.tn;
	dst->psi = keep.psi;
	dst->t = keep.t;
	dst->w = keep.w;
	dst->dk = keep.dk;
	dst->gnext = keep.gnext;
	dst->gb = keep.gb;
	dst->gr = keep.gr;
	dst->tri = keep.tri;
	dst->legs = keep.legs;
	dst->level = keep.level;
	dst->seg_lo = keep.seg_lo;
	dst->seg_hi = keep.seg_hi;
	dst->seg_band = keep.seg_band;
}

double ow_melt_bulk(const struct ow_melt_ws *ws)
{
	return ws->bulk;
}

double ow_melt_peak(const struct ow_melt_ws *ws)
{
	double pk = ws->t[0];

	for (int b = 1; b < ws->nb; b++)
		pk = fmax(pk, ws->t[b]);
	return pk;
}

static int bad(double x)
{
	return !isfinite(x);
}

static enum ow_status check_cond(const struct ow_melt_ws *ws,
                                 const struct ow_melt_cond *c, double dz,
                                 struct ow_diag *d)
{
	const char *f = NULL;
	double v = 0.0;

	if (!c || !c->mat)
		return ow_diag_set(d, OW_EARG, "melt: no conditions or resin");
	if (!(c->depth_m > 0.0) || bad(c->depth_m))
		f = "depth_m", v = c->depth_m;
	else if (!(c->width_m > 0.0) || bad(c->width_m))
		f = "width_m", v = c->width_m;
	else if (bad(c->vbz_m_s))
		f = "vbz_m_s", v = c->vbz_m_s;
	else if (!(c->vbx_m_s >= 0.0) || bad(c->vbx_m_s))
		f = "vbx_m_s (must be >= 0)", v = c->vbx_m_s;
	else if (bad(c->vb_m_s))
		f = "vb_m_s", v = c->vb_m_s;
	else if (bad(c->vol_flow_m3_s))
		f = "vol_flow_m3_s", v = c->vol_flow_m3_s;
	else if (!(c->barrel_K > 0.0) || bad(c->barrel_K))
		f = "barrel_K", v = c->barrel_K;
	else if (!c->root_adiabatic && (!(c->root_K > 0.0) || bad(c->root_K)))
		f = "root_K", v = c->root_K;
	else if (!(c->clearance_m >= 0.0) || bad(c->clearance_m))
		f = "clearance_m", v = c->clearance_m;
	else if (c->clearance_m > 0.0 && !(c->flight_width_m > 0.0))
		f = "flight_width_m", v = c->flight_width_m;
	else if (!(dz >= 0.0) || bad(dz))
		f = "dz_m", v = dz;
	else if (!(ws->bulk > 0.0))
		f = "band temperature (call ow_melt_reset first)", v = ws->bulk;
	if (f)
		return ow_diag_set(d, OW_EARG, "melt: %s = %g: out of range", f,
		                   v);
	if (dz > 0.0 && !(c->vol_flow_m3_s > 0.0))
		return ow_diag_set(d, OW_ECOMPUTE,
		                   "melt: cannot march the temperature with a "
		                   "net flow of %g m3/s",
		                   c->vol_flow_m3_s);
	return OW_OK;
}

/* Flight edges by the Newtonian-exact substitution V_bz F_d/F_p and flow
 * Q/(W F_p) (Tadmor & Klein 1970, ch. 7). */
static void station_geometry(struct ow_melt_ws *ws,
                             const struct ow_melt_cond *c,
                             struct melt_station *st)
{
	double h = c->depth_m / c->width_m;

	memset(st, 0, sizeof *st);
	st->mat = c->mat;
	ow_viscosity_log_init(&c->mat->visc, &st->vlog);
	st->H = c->depth_m;
	st->W = c->width_m;
	if (c->infinite_width) {
		st->fd = st->fp = 1.0;
	} else {
		if (h != ws->hcache) { /* tapers change h; metering does not */
			ws->hcache = h;
			ws->fdcache = ow_melt_shape_fd(h);
			ws->fpcache = ow_melt_shape_fp(h);
		}
		st->fd = ws->fdcache;
		st->fp = ws->fpcache;
	}
	st->vz = c->vbz_m_s * st->fd / st->fp;
	st->vx = c->vbx_m_s;
	st->tol = ws->tol;
}

/* Leakage over the flight (Tadmor & Klein 1970, ch. 7): Q_L = L_b q_f with
 * q_f = V_bx delta/2 + delta^3 (dP/dx W + dP/dz L_b)/(12 mu_f e); mu_f at
 * the clearance shear rate V_b/delta and the mean of the barrel and the
 * outer band temperatures. Linear in the gradients: stored as coefficients
 * so the velocity solve carries it exactly. */
static void station_leak(const struct ow_melt_ws *ws,
                         const struct ow_melt_cond *c, struct melt_station *st)
{
	double delta = c->clearance_m, e = c->flight_width_m;
	double lb = c->leak_bypass_m, tf, mu;

	if (!(delta > 0.0) || !(lb > 0.0))
		return;
	tf = 0.5 * (c->barrel_K + ws->t[ws->nb - 1]);
	mu = ow_viscosity_eval(&c->mat->visc, fabs(c->vb_m_s) / delta, tf);
	st->leak_byp = lb;
	st->leak_coef = delta * delta * delta / (12.0 * mu * e);
	st->ql0 = lb * c->vbx_m_s * delta / 2.0;
	st->lz = lb * lb * st->leak_coef / (st->H * st->W * st->fp);
	st->lx = lb * st->leak_coef / (st->H * st->fp);
	st->leak_heat = ow_melt_leak_heat(c->vb_m_s, delta, mu, e) *
	                c->leak_flight_len_per_z;
}

/* Power, dissipation and the identity power = dissipation + Q G. */
static void bookkeeping(const struct ow_melt_ws *ws,
                        const struct melt_station *st,
                        const struct ow_melt_cond *c, struct ow_melt_out *o)
{
	const double *p = ws->p;
	double G = p[1] / st->H, dis = 0.0;

	o->dpdz_Pa_m = G;
	o->dpdx_Pa_m = p[3] / st->H;
	o->tau_barrel_z_Pa = p[0] + p[1];
	o->tau_barrel_x_Pa = p[2] + p[3];
	o->leak_flow_m3_s =
	    st->ql0 + (st->lz * p[1] + st->lx * p[3]) * st->W * st->fp;
	o->channel_flow_m3_s = c->vol_flow_m3_s + o->leak_flow_m3_s;
	o->power_W_m = st->W * (st->fp * o->tau_barrel_z_Pa * st->vz +
	                        o->tau_barrel_x_Pa * st->vx) +
	               st->leak_heat;
	for (int b = 0; b < ws->nb; b++)
		dis += ws->dk[b];
	o->dissipation_W_m = dis * st->W;
	o->max_shear_1_s = 0.0;
	for (int j = 0; j < ws->nn; j++) {
		double yh = (double)j / (double)ws->nc;
		double tz = p[0] + p[1] * yh, tx = p[2] + p[3] * yh;
		double tau = sqrt(tz * tz + tx * tx); /* no overflow at Pa */

		if (j > 0)
			o->max_shear_1_s =
			    fmax(o->max_shear_1_s, tau * ws->cur.phi[j - 1]);
		if (j < ws->nc)
			o->max_shear_1_s =
			    fmax(o->max_shear_1_s, tau * ws->cur.phi[j]);
	}
	o->fd = st->fd;
	o->fp = st->fp;
	o->circulating = ws->circ;
}

enum ow_status ow_melt_step(struct ow_melt_ws *ws, const struct ow_melt_cond *c,
                            double dz_m, struct ow_melt_out *out,
                            struct ow_diag *d)
{
	struct melt_station st;
	struct ow_melt_out o;
	enum ow_status rc;

	if (!ws || !out)
		return ow_diag_set(d, OW_EARG, "melt: no workspace or output");
	rc = check_cond(ws, c, dz_m, d);
	if (rc != OW_OK)
		return rc;
	memset(&o, 0, sizeof o);
	station_geometry(ws, c, &st);
	station_leak(ws, c, &st);
	st.qz = (c->vol_flow_m3_s + st.ql0) / (st.W * st.fp);
	ow_melt_cell_temps(ws);
	rc = ow_melt_solve_velocity(ws, &st, &o.iterations, d);
	if (rc != OW_OK)
		return rc;
	ws->H = st.H;
	ws->fp = st.fp;
	ow_melt_build_bands(ws, &st, c);
	if (dz_m > 0.0)
		o.q_floor_used = ow_melt_advance(ws, &st, c, dz_m);
	ow_melt_wall_heat(ws, c, &o.barrel_heat_W_m, &o.root_heat_W_m);
	bookkeeping(ws, &st, c, &o);
	o.bulk_K = ws->bulk;
	o.peak_K = ow_melt_peak(ws);
	*out = o;
	return OW_OK;
}

void ow_melt_profile(const struct ow_melt_ws *ws, struct ow_melt_profile *p)
{
	p->nodes = ws->nn;
	p->y_m = ws->y;
	p->uz_m_s = ws->uz;
	p->ux_m_s = ws->ux;
	p->shear_1_s = ws->gd;
	p->dissip_W_m3 = ws->dis;
	p->visc_Pa_s = ws->eta;
	p->temp_K = ws->tn;
}

int ow_melt_bands(const struct ow_melt_ws *ws)
{
	return ws->nb;
}

void ow_melt_band_legs(const struct ow_melt_ws *ws, int k, double legs[4])
{
	memcpy(legs, ws->legs + 4 * k, 4 * sizeof(double));
}

double ow_melt_band_temp(const struct ow_melt_ws *ws, int k)
{
	return ws->t[k];
}

enum ow_status ow_melt_partner(const struct ow_melt_ws *ws, double y_m,
                               double *partner_m)
{
	double s;

	if (!ws->have_profile || !ws->circ)
		return OW_ECOMPUTE;
	s = ow_melt_psi_at(ws, y_m) / ws->psistar;
	if (s < 0.0)
		s = 0.0;
	*partner_m = ow_melt_level_depth(ws, s, y_m < ws->ystar);
	return OW_OK;
}
