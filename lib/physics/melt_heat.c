/* melt_heat.c - temperature across the channel depth with cross-channel
 * circulation: streamline bands, their flows, heating and conduction, and
 * the implicit down-channel step of the band temperatures.
 *
 * A fluid element circulating in the channel alternates between an upper
 * layer (above the level y* where u_x = 0) and its partner lower layer on
 * the same streamline, psi(y) = int_0^y u_x ds = const (Mohr, Saxton &
 * Jepson, Ind. Eng. Chem., 1957; pairing used for residence times by
 * Pinto & Tadmor, Polym. Eng. Sci. 10 (1970) 279). Bands of the normalised
 * stream function psi/psi(y*) therefore carry one temperature each; band 0
 * surrounds y*, the last band touches root and barrel. In depth order the
 * legs run root | lower K-1 ... lower 0 | y* | upper 0 ... upper K-1 |
 * barrel, so conduction couples only neighbouring bands and one tridiagonal
 * system per station advances them:
 *   rho c_p w_k dT_k/dz = sum of conduction through the band's interfaces
 *                         + heating of both legs
 * (the energy equation of Bird, Stewart & Lightfoot, Transport Phenomena,
 * 2nd ed. 2002, ch. 10-11, for fully developed flow with conduction across
 * the depth only). Without circulation (V_bx = 0) the bands are plain depth
 * layers; with equal wall temperatures the steady state is then the Couette
 * heating profile of BSL section 10.4. */
#include "melt_impl.h"

#include <math.h>
#include <string.h>

#define FLOOR_SHARE 1e-3 /* smallest band flow, share of the mean */

/* ---- stream function, centre of circulation ------------------------- */

static void stream_nodes(struct ow_melt_ws *ws)
{
	double hh = 1.0 / (double)ws->nc, H = ws->H;

	ws->psi[0] = 0.0;
	for (int c = 0; c < ws->nc; c++) {
		double phi = ws->cur.phi[c], yc = (double)c * hh;
		double tx = ws->p[2] + ws->p[3] * yc;

		ws->psi[c + 1] =
		    ws->psi[c] +
		    H * (ws->ux[c] * hh + phi * H *
		                              (tx * hh * hh / 2.0 +
		                               ws->p[3] * hh * hh * hh / 6.0));
	}
}

/* Zero of u_x inside cell c (u = u_c + phi H (tau_c t + beta t^2/2)) nearest
 * its start; -1 when there is none in [0, hh]. */
static double ux_zero(const struct ow_melt_ws *ws, int c)
{
	double hh = 1.0 / (double)ws->nc, H = ws->H, phi = ws->cur.phi[c];
	double A = phi * H * ws->p[3] / 2.0;
	double B = phi * H * (ws->p[2] + ws->p[3] * (double)c * hh);
	double C0 = ws->ux[c], r[2];
	int nr = 0;

	if (fabs(A) < 1e-300) {
		if (fabs(B) > 0.0)
			r[nr++] = -C0 / B;
	} else {
		double disc = B * B - 4.0 * A * C0;

		if (disc >= 0.0) {
			/* stable quadratic roots (Press et al., Numerical
			 * Recipes, 3rd ed. 2007, section 5.6) */
			double q = -0.5 * (B + copysign(sqrt(disc), B));

			r[nr++] = q / A;
			if (q != 0.0)
				r[nr++] = C0 / q;
		}
	}
	for (int i = 0; i < nr; i++)
		if (r[i] >= 0.0 && r[i] <= hh)
			return r[i];
	return -1.0;
}

/* y* = where |psi| is largest (u_x = 0 there), and psi(y*). */
static void find_centre(struct ow_melt_ws *ws)
{
	double hh = 1.0 / (double)ws->nc;
	int jb = 0;

	for (int j = 1; j < ws->nn; j++)
		if (fabs(ws->psi[j]) > fabs(ws->psi[jb]))
			jb = j;
	ws->ystar = ws->y[jb];
	ws->psistar = ws->psi[jb];
	for (int c = jb - 1; c <= jb; c++) {
		double t, y, ps;

		if (c < 0 || c >= ws->nc || (t = ux_zero(ws, c)) < 0.0)
			continue;
		y = ((double)c * hh + t) * ws->H;
		ps = ow_melt_psi_at(ws, y);
		if (fabs(ps) > fabs(ws->psistar)) {
			ws->ystar = y;
			ws->psistar = ps;
		}
	}
}

#define LEVEL_TOL 1e-12 /* depth error left, share of H */

/* Solve psi(y)/psi* = s for y in [ya, yb] (inside one cell) where the left
 * side runs from fa to fb (bracketing s): Newton on the cell's exact cubic
 * psi = psi_c + H (u_c t + phi H (tau_c t^2/2 + beta t^3/6)), t = y/H - y_c
 * (slope H u_x), falling back to bisection when a step leaves the bracket.
 * A Newton step dt leaves an error of about |F''/(2 F')| dt^2, so the last
 * one is taken without evaluating again. */
static double level_in(const struct ow_melt_ws *ws, double s, double ya,
                       double yb, double fa, double fb)
{
	double hh = 1.0 / (double)ws->nc, H = ws->H;
	/* F = psi - s psi* increases with t where up > 0 */
	double up = (fb > fa) == (ws->psistar > 0.0) ? 1.0 : -1.0;
	int c = (int)floor(0.5 * (ya + yb) / H / hh);
	double yc, a1, a2, a3, b2, F0, ta, tb, t;

	fa -= s;
	fb -= s;
	if (fa == 0.0)
		return ya;
	if (fb == 0.0)
		return yb;
	c = c < 0 ? 0 : (c > ws->nc - 1 ? ws->nc - 1 : c);
	yc = (double)c * hh;
	/* F(t) = F0 + a1 t + a2 t^2 + a3 t^3 */
	F0 = ws->psi[c] - s * ws->psistar;
	a1 = H * ws->ux[c];
	b2 = ws->cur.phi[c] * H * H;
	a2 = b2 * (ws->p[2] + ws->p[3] * yc) / 2.0;
	a3 = b2 * ws->p[3] / 6.0;
	ta = ya / H - yc;
	tb = yb / H - yc;
	t = ta - fa * (tb - ta) / (fb - fa);
	for (int it = 0; it < 60; it++) {
		double F = F0 + t * (a1 + t * (a2 + t * a3));
		double d1 = a1 + t * (2.0 * a2 + 3.0 * a3 * t);
		double d2 = 2.0 * a2 + 6.0 * a3 * t, tn;

		if (F == 0.0)
			return (yc + t) * H;
		if (F * up > 0.0) /* past the root */
			tb = t;
		else
			ta = t;
		tn = d1 != 0.0 ? t - F / d1 : 0.5 * (ta + tb);
		if (tn > ta && tn < tb &&
		    fabs(d2) * (tn - t) * (tn - t) < 2.0 * LEVEL_TOL * fabs(d1))
			return (yc + tn) * H;
		if (fabs(tn - t) < LEVEL_TOL)
			return (yc + tn) * H;
		if (!(tn > ta && tn < tb))
			tn = 0.5 * (ta + tb);
		t = tn;
	}
	return (yc + t) * H;
}

/* First depth, walking from the root (upper = 0) or the barrel (upper = 1)
 * toward y*, where psi/psi* reaches s (0 <= s <= 1). */
double ow_melt_level_depth(const struct ow_melt_ws *ws, double s, int upper)
{
	double prev_y = upper ? ws->H : 0.0, prev_f = 0.0;
	int j = upper ? ws->nn - 1 : 0, step = upper ? -1 : 1;

	if (s <= 0.0)
		return prev_y;
	if (s >= 1.0)
		return ws->ystar;
	for (j += step; j >= 0 && j < ws->nn; j += step) {
		double y = ws->y[j], f = ws->psi[j] / ws->psistar;

		if (upper ? y <= ws->ystar : y >= ws->ystar)
			break;
		if (f >= s)
			return upper ? level_in(ws, s, y, prev_y, f, prev_f)
			             : level_in(ws, s, prev_y, y, prev_f, f);
		prev_y = y;
		prev_f = f;
	}
	return upper ? level_in(ws, s, ws->ystar, prev_y, 1.0, prev_f)
	             : level_in(ws, s, prev_y, ws->ystar, prev_f, 1.0);
}

/* ---- band layout ------------------------------------------------------ */

/* Levels s_k = cos^2(pi k / (2K)) (ws->level): legs of even thickness both
 * where psi is quadratic (at y* and at a no-slip root) and finer at the barrel,
 * where most heat crosses. */
static void layout_circulating(struct ow_melt_ws *ws)
{
	int K = ws->nb;
	double lo_prev = ws->ystar; /* both legs of band 0 start at y* */
	double hi_prev = lo_prev;

	for (int k = 0; k < K; k++) {
		double s = ws->level[k];
		double *lg = ws->legs + 4 * k;

		lg[0] = ow_melt_level_depth(ws, s, 0);
		lg[1] = lo_prev;
		lg[2] = hi_prev;
		lg[3] = ow_melt_level_depth(ws, s, 1);
		lo_prev = lg[0];
		hi_prev = lg[3];
	}
	ws->nseg = 2 * K;
	for (int k = 0; k < K; k++) { /* depth order: lower K-1 .. lower 0 */
		int i = K - 1 - k;

		ws->seg_lo[k] = ws->legs[4 * i];
		ws->seg_hi[k] = ws->legs[4 * i + 1];
		ws->seg_band[k] = i;
		ws->seg_lo[K + k] = ws->legs[4 * k + 2];
		ws->seg_hi[K + k] = ws->legs[4 * k + 3];
		ws->seg_band[K + k] = k;
	}
}

static void layout_layers(struct ow_melt_ws *ws)
{
	int K = ws->nb;

	ws->nseg = K;
	for (int k = 0; k < K; k++) {
		double *lg = ws->legs + 4 * k;

		lg[0] = ws->H * (double)k / (double)K;
		lg[1] = ws->H * (double)(k + 1) / (double)K;
		lg[2] = lg[3] = lg[1];
		ws->seg_lo[k] = lg[0];
		ws->seg_hi[k] = lg[1];
		ws->seg_band[k] = k;
	}
}

/* A conductance g in series with the barrel wall's h (h = 0: ideal wall):
 * resistances add, 1/(1/g + 1/h). */
static double with_wall(double g, double h)
{
	return h > 0.0 ? g * h / (g + h) : g;
}

/* Finite-volume conductances between leg centres (half a leg to a wall);
 * the barrel side in series with the wall's heat-transfer coefficient. */
static void conductances(struct ow_melt_ws *ws, const struct ow_melt_cond *c)
{
	double k = c->mat->melt_k_W_mK, dmin = 1e-9 * ws->H;
	int K = ws->nb;

	for (int b = 0; b < K; b++)
		ws->gnext[b] = ws->gb[b] = ws->gr[b] = 0.0;
	for (int b = 0; b + 1 < K; b++) {
		const double *l0 = ws->legs + 4 * b, *l1 = ws->legs + 4 * b + 4;
		double dl = 0.5 * (l0[0] + l0[1]) - 0.5 * (l1[0] + l1[1]);
		double du = 0.5 * (l1[2] + l1[3]) - 0.5 * (l0[2] + l0[3]);

		if (ws->circ)
			ws->gnext[b] = k / fmax(dl, dmin) + k / fmax(du, dmin);
		else
			ws->gnext[b] = k / fmax(-dl, dmin);
	}
	if (ws->circ) {
		const double *lg = ws->legs + 4 * (K - 1);

		ws->gb[K - 1] =
		    with_wall(k / fmax(ws->H - 0.5 * (lg[2] + lg[3]), dmin),
		              c->wall_h_W_m2K);
		if (!c->root_adiabatic)
			ws->gr[K - 1] = k / fmax(0.5 * (lg[0] + lg[1]), dmin);
	} else {
		ws->gb[K - 1] = with_wall(
		    k / fmax(0.5 * ws->H / (double)K, dmin), c->wall_h_W_m2K);
		if (!c->root_adiabatic)
			ws->gr[0] = k / fmax(0.5 * ws->H / (double)K, dmin);
	}
}

/* Mean of the cell temperatures over [y0, y1] (for a change of layout). */
static double cell_mean(const struct ow_melt_ws *ws, double y0, double y1)
{
	double hh = ws->H / (double)ws->nc, sum = 0.0, len = 0.0;

	for (int c = 0; c < ws->nc; c++) {
		double a = fmax(y0, (double)c * hh);
		double b = fmin(y1, (double)(c + 1) * hh);

		if (b > a) {
			sum += (b - a) * ws->tc[c];
			len += b - a;
		}
	}
	if (len > 0.0)
		return sum / len;
	return ws
	    ->tc[(int)fmin((double)(ws->nc - 1), floor(0.5 * (y0 + y1) / hh))];
}

/* Length-weighted mean of the cell temperatures over a band's legs. */
static double band_mean(const struct ow_melt_ws *ws, const double *lg)
{
	double l0 = lg[1] - lg[0], l1 = lg[3] - lg[2];

	if (!(l0 + l1 > 0.0))
		return cell_mean(ws, lg[0], lg[1]);
	return (l0 * cell_mean(ws, lg[0], lg[1]) +
	        l1 * cell_mean(ws, lg[2], lg[3])) /
	       (l0 + l1);
}

/* Band and node maps from the segments. */
static void map_cells(struct ow_melt_ws *ws)
{
	double hh = ws->H / (double)ws->nc;
	int s = 0;

	for (int c = 0; c < ws->nc; c++) {
		double m = ((double)c + 0.5) * hh;

		while (s < ws->nseg - 1 && m > ws->seg_hi[s])
			s++;
		ws->cell_band[c] = ws->seg_band[s];
	}
	s = 0;
	for (int j = 0; j < ws->nn; j++) {
		while (s < ws->nseg - 1 && ws->y[j] > ws->seg_hi[s])
			s++;
		ws->tn[j] = ws->t[ws->seg_band[s]];
	}
}

void ow_melt_build_bands(struct ow_melt_ws *ws, const struct melt_station *st,
                         const struct ow_melt_cond *c)
{
	double scale = (fabs(st->vz) + fabs(st->vx)) * st->H;
	int was_circ = ws->circ, K = ws->nb;

	stream_nodes(ws);
	find_centre(ws);
	ws->circ = fabs(ws->psistar) > 1e-9 * scale && st->vx > 0.0;
	if (ws->circ)
		layout_circulating(ws);
	else
		layout_layers(ws);
	if (ws->have_profile && was_circ != ws->circ)
		for (int b = 0; b < K; b++) /* new layout: carry T by depth */
			ws->t[b] = band_mean(ws, ws->legs + 4 * b);
	for (int b = 0; b < K; b++)
		ws->w[b] = ws->dk[b] = 0.0;
	for (int s = 0; s < ws->nseg; s++) {
		double q, h;

		ow_melt_seg_integrals(ws, ws->seg_lo[s], ws->seg_hi[s], &q, &h);
		ws->w[ws->seg_band[s]] += st->fp * q;
		ws->dk[ws->seg_band[s]] += h;
	}
	/* clearance heating and the pressure work released by the leak flow
	 * (it falls back across dP/dz over the bypass) go to the band at the
	 * barrel */
	{
		double G = ws->p[1] / st->H;
		double ql = st->ql0 + (st->lz * ws->p[1] + st->lx * ws->p[3]) *
		                          st->W * st->fp;

		ws->dk[K - 1] += (st->leak_heat + G * ql) / st->W;
	}
	conductances(ws, c);
	map_cells(ws);
	ws->have_profile = 1;
}

/* ---- temperatures ----------------------------------------------------- */

void ow_melt_cell_temps(struct ow_melt_ws *ws)
{
	for (int c = 0; c < ws->nc; c++)
		ws->tc[c] =
		    ws->have_profile ? ws->t[ws->cell_band[c]] : ws->bulk;
}

/* Band flow weights: the channel's band flows scaled to carry the net flow
 * (leak flow recirculates over the flight), floored where not positive. */
static int weights(struct ow_melt_ws *ws, double qnet_per_w)
{
	double sum = 0.0, floor_w = FLOOR_SHARE * qnet_per_w / (double)ws->nb;
	int floored = 0;

	for (int b = 0; b < ws->nb; b++)
		sum += ws->w[b];
	for (int b = 0; b < ws->nb; b++) {
		if (sum > 0.0)
			ws->w[b] *= qnet_per_w / sum;
		if (!(ws->w[b] > floor_w)) {
			ws->w[b] = floor_w;
			floored = 1;
		}
	}
	sum = 0.0;
	for (int b = 0; b < ws->nb; b++)
		sum += ws->w[b];
	for (int b = 0; b < ws->nb; b++)
		ws->w[b] *= qnet_per_w / sum;
	return floored;
}

/* Implicit (backward Euler) step in z, Thomas algorithm. The band
 * temperatures are first shifted so that their flow-weighted mean with this
 * station's weights equals the bulk temperature carried from the last
 * station: enthalpy flux is conserved exactly when the band flows change. */
int ow_melt_advance(struct ow_melt_ws *ws, const struct melt_station *st,
                    const struct ow_melt_cond *c, double dz_m)
{
	const struct ow_material *m = c->mat;
	double rc = m->melt_density_kg_m3 * m->melt_cp_J_kgK / dz_m;
	double mean = 0.0, tr = c->root_adiabatic ? 0.0 : c->root_K;
	double *cp = ws->tri, *dp = ws->tri + ws->nb;
	int K = ws->nb, floored = weights(ws, c->vol_flow_m3_s / st->W);

	for (int b = 0; b < K; b++)
		mean += ws->w[b] * ws->t[b];
	mean /= c->vol_flow_m3_s / st->W;
	for (int b = 0; b < K; b++) {
		double lo = b > 0 ? ws->gnext[b - 1] : 0.0, up = ws->gnext[b];
		double a = rc * ws->w[b];
		double diag = a + lo + up + ws->gb[b] + ws->gr[b];
		double rhs = a * (ws->t[b] + ws->bulk - mean) +
		             ws->gb[b] * c->barrel_K + ws->gr[b] * tr +
		             ws->dk[b];

		/* forward sweep: row b is -lo T[b-1] + diag T[b] - up T[b+1] */
		if (b > 0) {
			diag -= lo * cp[b - 1];
			rhs += lo * dp[b - 1];
		}
		cp[b] = up / diag;
		dp[b] = rhs / diag;
	}
	ws->t[K - 1] = dp[K - 1];
	for (int b = K - 2; b >= 0; b--)
		ws->t[b] = dp[b] + cp[b] * ws->t[b + 1];
	mean = 0.0;
	for (int b = 0; b < K; b++)
		mean += ws->w[b] * ws->t[b];
	ws->bulk = mean / (c->vol_flow_m3_s / st->W);
	map_cells(ws);
	return floored;
}

void ow_melt_wall_heat(const struct ow_melt_ws *ws,
                       const struct ow_melt_cond *c, double *barrel_W_m,
                       double *root_W_m)
{
	double qb = 0.0, qr = 0.0;

	for (int b = 0; b < ws->nb; b++) {
		qb += ws->gb[b] * (c->barrel_K - ws->t[b]);
		if (!c->root_adiabatic)
			qr += ws->gr[b] * (c->root_K - ws->t[b]);
	}
	*barrel_W_m = qb * c->width_m;
	*root_W_m = qr * c->width_m;
}

/* The mixer step of ow_melt.h: the layout of the last station (or equal
 * layers), heat spread in proportion to the band flows, conductances for
 * this wall, and the implicit step of ow_melt_advance. */
enum ow_status ow_melt_mixer_step(struct ow_melt_ws *ws,
                                  const struct ow_melt_cond *c, double dz_m,
                                  double heat_W_m, struct ow_melt_out *out,
                                  struct ow_diag *d)
{
	struct melt_station st;
	double sum = 0.0;
	int K = ws->nb;

	if (!c || !c->mat || !(c->width_m > 0.0) || !(dz_m > 0.0) ||
	    !(c->vol_flow_m3_s > 0.0) || !isfinite(heat_W_m) ||
	    !(c->barrel_K > 0.0))
		return ow_diag_set(d, OW_EARG,
		                   "melt: mixer step needs a "
		                   "resin, width, flow, wall and dz > 0");
	memset(&st, 0, sizeof st);
	st.W = c->width_m;
	if (!ws->have_profile) {
		ws->H = c->depth_m;
		ws->circ = 0;
		layout_layers(ws);
		for (int b = 0; b < K; b++)
			ws->w[b] = 1.0;
		map_cells(ws);
		ws->have_profile = 1;
	}
	conductances(ws, c);
	for (int b = 0; b < K; b++)
		sum += fmax(ws->w[b], 0.0);
	for (int b = 0; b < K; b++)
		ws->dk[b] = sum > 0.0
		                ? heat_W_m / st.W * fmax(ws->w[b], 0.0) / sum
		                : heat_W_m / st.W / (double)K;
	memset(out, 0, sizeof *out);
	out->q_floor_used = ow_melt_advance(ws, &st, c, dz_m);
	ow_melt_wall_heat(ws, c, &out->barrel_heat_W_m, &out->root_heat_W_m);
	out->dissipation_W_m = heat_W_m;
	out->bulk_K = ws->bulk;
	out->peak_K = ow_melt_peak(ws);
	out->circulating = ws->circ;
	return OW_OK;
}
