/* melt_flow.c - melt flow in the unwound screw channel: shape factors, the
 * exact power-law drag/pressure flow, leakage, and the velocity profiles
 * across the depth of a generalised Newtonian melt at one station. */
#include "melt_impl.h"

#include <math.h>
#include <string.h>

/* sum_{i odd} i^-3 = (7/8) zeta(3) and sum_{i odd} i^-5 = (31/32) zeta(5) */
#define SUM_ODD_INV3 1.0517997902646450
#define SUM_ODD_INV5 1.0045237627951396
#define MAX_NEWTON   100
/* Scaled wall-speed and flow residuals left by the Newton iteration on
 * the stresses. The linear solve after it meets the four conditions
 * exactly for the viscosities found, so what is left is a viscosity off
 * its stress by about this share: on the demo's 41x5 rows the figures
 * move by at most 4e-6 (relative) and 3e-4 K against a solve with every
 * tolerance 1000 times tighter (1e-4 moves them by 9e-5). */
#define TOL_NEWTON 1e-5

/* ---- shape factors ------------------------------------------------------ */

/* sum_{i odd} i^-p (1 - tanh(i x)) for a whole p: the part of the series
 * still missing from the closed sum of i^-p; decays like exp(-2 i x).
 * exp(-2 i x) runs as a product (a few ulp over the terms that count),
 * i^-p as a product of i. */
static double tanh_deficit(int p, double x)
{
	double sum = 0.0, e1 = exp(-2.0 * x), e2 = e1 * e1, e = e1;
	int i, k;

	for (i = 1; i < 100000; i += 2, e *= e2) {
		double ip = 1.0, term;

		for (k = 0; k < p; k++)
			ip *= (double)i;
		term = 2.0 * e / (1.0 + e) / ip;
		sum += term;
		if (term < 1e-18 * (sum + 1e-300) || (double)i * x > 40.0)
			break;
	}
	return sum;
}

/* Rowell & Finlayson (1922) drag factor, Tadmor & Klein (1970) ch. 7:
 * F_d = (16/(pi^3 h)) sum_{odd} tanh(i pi h/2)/i^3. For h <= 1 the series of
 * the same solution expanded across the depth converges faster:
 * F_d = 1 - (16 h/pi^3) sum_{odd} tanh(i pi/(2h))/i^3 (both give 1/2 at
 * h = 1; derived by separation of variables in the other direction). */
double ow_melt_shape_fd(double h)
{
	if (!(h > 0.0) || !isfinite(h))
		return NAN;
	if (h <= 1.0)
		return 1.0 -
		       16.0 * h / (OW_PI * OW_PI * OW_PI) *
		           (SUM_ODD_INV3 - tanh_deficit(3, OW_PI / (2.0 * h)));
	return 16.0 / (OW_PI * OW_PI * OW_PI * h) *
	       (SUM_ODD_INV3 - tanh_deficit(3, OW_PI * h / 2.0));
}

/* Rowell & Finlayson (1922) pressure factor, Tadmor & Klein (1970) ch. 7:
 * F_p = 1 - (192 h/pi^5) sum_{odd} tanh(i pi/(2h))/i^5. */
double ow_melt_shape_fp(double h)
{
	if (!(h > 0.0) || !isfinite(h))
		return NAN;
	return 1.0 - 192.0 * h / (OW_PI * OW_PI * OW_PI * OW_PI * OW_PI) *
	                 (SUM_ODD_INV5 - tanh_deficit(5, OW_PI / (2.0 * h)));
}

/* A side wall of the channel (height H) sliding down-channel at V_s drags
 * Q_s = F_d(W/H) V_s H W/2: the Rowell & Finlayson (1922) drag solution
 * with the roles of width and depth exchanged (Tadmor & Klein 1970, ch. 7,
 * for the barrel's share). Newtonian flows superpose, so the side wall
 * counts as an extra barrel speed V_s F_d(W/H)/F_d(H/W). */
double ow_melt_side_drag_speed(double depth_m, double width_m,
                               double wall_speed_m_s)
{
	double h = depth_m / width_m;

	return wall_speed_m_s * ow_melt_shape_fd(1.0 / h) / ow_melt_shape_fd(h);
}

/* ---- power-law drag + pressure flow ----------------------------------- */

/* 8-point Gauss-Legendre rule on [-1, 1] (Abramowitz & Stegun, Handbook
 * of Mathematical Functions, 1964, table 25.4). */
static const double gl_x[4] = {0.1834346424956498, 0.5255324099163290,
                               0.7966664774136267, 0.9602898564975363};
static const double gl_w[4] = {0.3626837833783620, 0.3137066458778873,
                               0.2223810344533745, 0.1012285362903763};

static double spow(double t, double e)
{
	return t < 0.0 ? -pow(-t, e) : pow(t, e);
}

/* Wall speed u(1) and flow qhat for root stress t0: integrals of
 * du/dxi = sign(tau)|tau|^s, tau = t0 + lambda xi (Tadmor & Klein 1970,
 * ch. 7, power-law channel flow). Closed forms with F(t) = |t|^(s+1)/(s+1)
 * and Gf(t) = sign(t)|t|^(s+2)/((s+1)(s+2)); Gauss-Legendre for small
 * |lambda| where the closed forms cancel (tau keeps its sign there). */
static void powerlaw_integrals(double s, double lambda, double t0, double *wall,
                               double *qhat)
{
	if (fabs(lambda) >= 0.05) {
		double t1 = t0 + lambda;
		double f0 = pow(fabs(t0), s + 1.0) / (s + 1.0);
		double f1 = pow(fabs(t1), s + 1.0) / (s + 1.0);
		double k = (s + 1.0) * (s + 2.0);
		double g0 = spow(t0, s + 2.0) / k, g1 = spow(t1, s + 2.0) / k;

		*wall = (f1 - f0) / lambda;
		*qhat = ((g1 - g0) / lambda - f0) / lambda;
		return;
	}
	*wall = *qhat = 0.0;
	for (int i = 0; i < 8; i++) {
		double xi = 0.5 * (1.0 + (i < 4 ? -gl_x[i] : gl_x[i - 4]));
		double w = 0.5 * gl_w[i < 4 ? i : i - 4];
		double g = spow(t0 + lambda * xi, s);

		*wall += w * g;
		*qhat += w * (1.0 - xi) * g;
	}
}

/* Exact combined drag and pressure flow of a power-law fluid, Tadmor &
 * Klein (1970) ch. 7 in dimensionless form: tau = t0 + lambda xi,
 * u(1) = 1 fixes t0 (monotone: bisection on [min(1, 1-L), max(1, 1-L)]). */
enum ow_status ow_melt_powerlaw_qhat(double n, double lambda, double *qhat,
                                     double *tau0hat)
{
	double s, lo, hi, wall, q = 0.0;
	int it;

	if (!(n > 0.0 && n <= 1.5) || !isfinite(lambda))
		return OW_EARG;
	s = 1.0 / n;
	lo = fmin(1.0, 1.0 - lambda);
	hi = fmax(1.0, 1.0 - lambda);
	for (it = 0; it < 200 && hi - lo > 1e-16 * fmax(1.0, fabs(hi)); it++) {
		double mid = 0.5 * (lo + hi);

		powerlaw_integrals(s, lambda, mid, &wall, &q);
		if (wall < 1.0)
			lo = mid;
		else
			hi = mid;
	}
	powerlaw_integrals(s, lambda, 0.5 * (lo + hi), &wall, &q);
	if (qhat)
		*qhat = q;
	if (tau0hat)
		*tau0hat = 0.5 * (lo + hi);
	return OW_OK;
}

/* ---- leakage ------------------------------------------------------------ */

/* q_f = V_bx delta/2 + delta^3 dP_land/(12 mu_f e): drag across the land plus
 * lubrication pressure flow through the gap (Tadmor & Klein 1970, ch. 7). */
double ow_melt_leak_flux(double vbx, double delta, double dp_land, double mu_f,
                         double e)
{
	if (!(delta > 0.0))
		return 0.0;
	return vbx * delta / 2.0 +
	       delta * delta * delta * dp_land / (12.0 * mu_f * e);
}

/* Couette heating in the clearance, mu_f (V_b/delta)^2 per volume over the
 * gap delta and the land e (Bird, Stewart & Lightfoot 2002, section 10.4). */
double ow_melt_leak_heat(double vb, double delta, double mu_f, double e)
{
	if (!(delta > 0.0))
		return 0.0;
	return mu_f * (vb / delta) * (vb / delta) * delta * e;
}

/* n = 1 + d ln(eta)/d ln(gdot), central difference of width 2e-3 in
 * ln gdot (the shift factor cancels). */
double ow_melt_local_index(const struct ow_viscosity *v, double gdot,
                           double temp_K)
{
	const double eps = 1e-3;
	double at = ow_viscosity_shift(v, temp_K);
	double up = ow_viscosity_ref(v, at * gdot * exp(eps));
	double dn = ow_viscosity_ref(v, at * gdot * exp(-eps));

	return 1.0 + (log(up) - log(dn)) / (2.0 * eps);
}

/* ---- the station: linear part -------------------------------------------
 *
 * Lubrication equations across the depth (Tadmor & Klein 1970, ch. 7):
 * d/dy(eta du/dy) = dP/dz and likewise for x, so each shear stress is linear,
 * tau = a + beta y/H, and u' = tau/eta. The depth is split into nc equal
 * cells with one viscosity each; inside a cell u is then exactly quadratic,
 * so wall speed, flow, stream function and dissipation are exact integrals
 * of the discrete profile and the power identity tau(H) V = G q + dissip
 * holds to round-off. Conditions: u_z(H) = V_z, int u_z = q_z (+ leakage),
 * u_x(H) = V_x, int u_x = 0. Unknowns p = (a_z, beta_z, a_x, beta_x). */

static double vscale(const struct melt_station *st)
{
	return fmax(fmax(fabs(st->vz), fabs(st->vx)), fabs(st->qz) / st->H);
}

/* The 4x4 linear system F p = rhs for given cell fluidities phi = 1/eta,
 * rows scaled by the velocity scale vs (rows 0, 2) and vs H (rows 1, 3). */
static void build_linear(const struct ow_melt_ws *ws,
                         const struct melt_station *st, const double *phi,
                         double F[4][4], double rhs[4])
{
	double hh = 1.0 / (double)ws->nc, H = st->H, vs = vscale(st);
	double s0 = 0.0, s1 = 0.0, t0 = 0.0, t1 = 0.0;

	for (int c = 0; c < ws->nc; c++) {
		double m = ((double)c + 0.5) * hh;

		s0 += phi[c] * hh;
		s1 += phi[c] * hh * m;
		t0 += phi[c] * hh * (1.0 - m);
		t1 += phi[c] * hh * (m - m * m - hh * hh / 12.0);
	}
	memset(F, 0, sizeof(double) * 16);
	F[0][0] = H * s0 / vs;
	F[0][1] = H * s1 / vs;
	F[1][0] = H * t0 / vs;
	F[1][1] = (H * t1 - st->lz / H) / vs;
	F[1][3] = -st->lx / (H * vs);
	F[2][2] = H * s0 / vs;
	F[2][3] = H * s1 / vs;
	F[3][2] = H * t0 / vs;
	F[3][3] = H * t1 / vs;
	rhs[0] = st->vz / vs;
	rhs[1] = st->qz / (vs * H);
	rhs[2] = st->vx / vs;
	rhs[3] = 0.0;
}

/* Gaussian elimination with partial pivoting; A and b are destroyed.
 * Returns -1 when A is singular. */
static int solve4(double A[4][4], double b[4], double x[4])
{
	for (int k = 0; k < 4; k++) {
		int piv = k;

		for (int i = k + 1; i < 4; i++)
			if (fabs(A[i][k]) > fabs(A[piv][k]))
				piv = i;
		if (!(fabs(A[piv][k]) > 0.0) || !isfinite(A[piv][k]))
			return -1;
		if (piv != k) {
			for (int j = 0; j < 4; j++) {
				double t = A[k][j];

				A[k][j] = A[piv][j];
				A[piv][j] = t;
			}
			double t = b[k];
			b[k] = b[piv];
			b[piv] = t;
		}
		for (int i = k + 1; i < 4; i++) {
			double f = A[i][k] / A[k][k];

			for (int j = k; j < 4; j++)
				A[i][j] -= f * A[k][j];
			b[i] -= f * b[k];
		}
	}
	for (int k = 3; k >= 0; k--) {
		double s = b[k];

		for (int j = k + 1; j < 4; j++)
			s -= A[k][j] * x[j];
		x[k] = s / A[k][k];
	}
	return 0;
}

static int solve_p(const struct ow_melt_ws *ws, const struct melt_station *st,
                   const double *phi, double p[4])
{
	double F[4][4], rhs[4];

	build_linear(ws, st, phi, F, rhs);
	return solve4(F, rhs, p);
}

/* ---- the station: Newton iteration on the stresses ---------------------
 *
 * For given stresses p, each cell's viscosity follows from its stress
 * alone once the temperature shift is taken out (time-temperature
 * superposition, Dealy & Wissbrun 1990, ch. 2): the reduced shear rate
 * r = aT gdot solves r eta_ref(r) = |tau|, in logs with u = ln r
 *   h(u) = u + ln eta_ref(u) - ln|tau| = 0,
 * whose slope dh/du is the local power-law index n_c > 0, and then
 * ln eta = ln aT + ln|tau| - u. h is increasing and concave for all three
 * models, so Newton from any start converges; started from the last
 * solution moved along its tangent, u + d ln|tau| / n_c, it needs one or
 * two steps. The four conditions C(p) = F(eta(p)) p - rhs = 0 are then
 * solved by Newton in p, with the Jacobian from implicit differentiation:
 * dL_c/dp = ((n_c - 1)/n_c) d ln|tau_c|/dp. Working in p keeps the map
 * smooth where a stress changes sign inside the channel (the viscosity of a
 * power law diverges there but its shear rate does not). A backtracking
 * line search on |C|^2 keeps the cold start safe. */

#define MAX_CELL_NEWTON 100
#define CELL_TOL        1e-9  /* error in u (ln rate) left by the last step */
#define CELL_SKIP_TOL   1e-10 /* error in u of a prediction taken as is */
#define CELL_MAX_STEP   20.0
#define SERIES_MAX      1e-2 /* |x| below which ln(1+x), e^-x go by series */

/* ln(1 + x) and e^-x for |x| <= SERIES_MAX: the terms left out are below
 * x^6/6 < 2e-13 and x^6/720 < 2e-15, far below CELL_TOL. */
static double log1p_small(double x)
{
	return x * (1.0 - x * (0.5 - x * (1.0 / 3.0 - x * (0.25 - x / 5.0))));
}

static double expm_small(double x)
{
	return 1.0 - x * (1.0 - x * (0.5 - x * (1.0 / 6.0 -
	                                        x * (1.0 / 24.0 - x / 120.0))));
}

/* h2 = d n / du = d2 ln eta_ref / d(ln gdot)^2 from the slope s = k b sig:
 * b s (1 - sig) for the softplus forms, 0 for a power law. */
static double cell_curvature(const struct ow_visc_log *lv, double s)
{
	if (lv->model == OW_VISC_POWER_LAW || lv->k == 0.0)
		return 0.0;
	return lv->b * s * (1.0 - s / (lv->k * lv->b));
}

/* Newton on h(u) = u + ln eta_ref(u) - lt from *u; on return *u is the
 * root, *n the slope there and *h2 its derivative. The error left by a
 * step du is about curv du^2 / (2 n) (curv bounds |h2|), so the last step
 * is accepted without evaluating again; not across the kink of the rate
 * clamp. */
static int cell_solve(const struct ow_visc_log *lv, double tol, double lt,
                      double *u, double *n, double *h2)
{
	double x = *u;

	for (int it = 0; it < MAX_CELL_NEWTON; it++) {
		double s, h = x + ow_viscosity_log_ref(lv, x, &s) - lt;
		double nl = 1.0 + s, dx = -h / nl, xn;

		if (!isfinite(h))
			return -1;
		dx = fmax(-CELL_MAX_STEP, fmin(CELL_MAX_STEP, dx));
		xn = x + dx;
		if (lv->curv * dx * dx <= 2.0 * CELL_TOL * tol * nl &&
		    (xn < lv->ln_gmin) == (x < lv->ln_gmin)) {
			*u = xn;
			*n = nl;
			*h2 = cell_curvature(lv, s);
			return 0;
		}
		x = xn;
	}
	return -1;
}

/* One cell at a new stress, from its solution in f: with D the change of
 * ln|tau| and e = D/n, the root moves by d = e - (h2/2n) e^2 to second
 * order, leaving about (h3/6 + h2^2/(2n)) |e|^3 / n (h3 bounds the third
 * derivative, 0.0963 |k b^3|); below CELL_SKIP_TOL that is the answer,
 * else Newton polishes it. */
static int cell_move(const struct ow_visc_log *lv, double tol,
                     const struct melt_cells *f, int c, double lt, double *u,
                     double *n, double *h2)
{
	double n0 = f->nloc[c], e = (lt - f->ltau[c]) / n0;
	double d = e - f->h2[c] / (2.0 * n0) * e * e;
	double h3 = 0.0963 * fabs(lv->k * lv->b * lv->b * lv->b);
	double err = (h3 / 6.0 + f->h2[c] * f->h2[c] / (2.0 * n0)) *
	             fabs(e * e * e) / n0;

	*u = f->lu[c] + d;
	if (!isfinite(*u)) {
		*u = lt;
	} else if (err <= CELL_SKIP_TOL * tol &&
	           (*u < lv->ln_gmin) == (f->lu[c] < lv->ln_gmin)) {
		*n = n0 + f->h2[c] * d;
		*h2 = f->h2[c];
		return 0;
	}
	return cell_solve(lv, tol, lt, u, n, h2);
}

/* Viscosities of all cells for stresses p, started from the solution in
 * from, into to (to may be from). ln|tau| and exp(-ln eta) go by series
 * where they change little. -1 for a viscosity not finite. */
static int cell_viscosities(const struct ow_melt_ws *ws,
                            const struct melt_station *st, const double p[4],
                            const struct melt_cells *from,
                            struct melt_cells *to)
{
	const struct ow_visc_log *lv = &st->vlog;
	double hh = 1.0 / (double)ws->nc;

	for (int c = 0; c < ws->nc; c++) {
		double m = ((double)c + 0.5) * hh;
		double tz = p[0] + p[1] * m, tx = p[2] + p[3] * m;
		double tau2 = tz * tz + tx * tx, r = tau2 / from->tau2[c] - 1.0;
		double lt, u, n, h2, L, dL;

		if (tau2 > 0.0) {
			lt = fabs(r) <= SERIES_MAX
			         ? from->ltau[c] + 0.5 * log1p_small(r)
			         : 0.5 * log(tau2);
			if (cell_move(lv, st->tol, from, c, lt, &u, &n, &h2) !=
			    0)
				return -1;
		} else { /* no stress: the rate clamp's viscosity */
			u = lv->ln_gmin;
			lt = u + ow_viscosity_log_ref(lv, u, NULL);
			n = 1.0;
			h2 = 0.0;
		}
		L = ws->lat[c] + lt - u;
		if (!isfinite(L))
			return -1;
		dL = L - from->lnv[c];
		to->phi[c] = fabs(dL) <= SERIES_MAX
		                 ? from->phi[c] * expm_small(dL)
		                 : exp(-L);
		to->lu[c] = u;
		to->ltau[c] = lt;
		to->tau2[c] = tau2;
		to->nloc[c] = n > 0.02 ? n : 0.02;
		to->h2[c] = h2;
		to->lnv[c] = L;
	}
	return 0;
}

/* Scaled condition residuals C = F p - rhs and their squared norm. */
static double conditions(const struct ow_melt_ws *ws,
                         const struct melt_station *st, const double *phi,
                         const double p[4], double C[4])
{
	double F[4][4], rhs[4], sum = 0.0;

	build_linear(ws, st, phi, F, rhs);
	for (int i = 0; i < 4; i++) {
		C[i] = -rhs[i];
		for (int k = 0; k < 4; k++)
			C[i] += F[i][k] * p[k];
		sum += C[i] * C[i];
	}
	return sum;
}

/* Newton step dp = -J^-1 C, J = F + sum_c (dC/dL_c)(dL_c/dp). */
static int newton_step(const struct ow_melt_ws *ws,
                       const struct melt_station *st, const double p[4],
                       const double C[4], double dp[4])
{
	double hh = 1.0 / (double)ws->nc, H = st->H, vs = vscale(st);
	double J[4][4], r[4];

	build_linear(ws, st, ws->cur.phi, J, r);
	for (int i = 0; i < 4; i++)
		r[i] = -C[i];
	for (int c = 0; c < ws->nc; c++) {
		double m = ((double)c + 0.5) * hh, phi = ws->cur.phi[c];
		double tz = p[0] + p[1] * m, tx = p[2] + p[3] * m;
		double tau2 = tz * tz + tx * tx, n = ws->cur.nloc[c];
		double v0 = hh * (1.0 - m),
		       v1 = hh * (m - m * m - hh * hh / 12.0);
		double E[4], f;

		if (!(tau2 > 0.0))
			continue;
		E[0] = -H * phi * hh * tz / vs; /* dC/dL_c */
		E[1] = -H * phi * (p[0] * v0 + p[1] * v1) / vs;
		E[2] = -H * phi * hh * tx / vs;
		E[3] = -H * phi * (p[2] * v0 + p[3] * v1) / vs;
		f = (n - 1.0) / (n * tau2); /* dL_c/dp = f tau . dtau/dp */
		for (int i = 0; i < 4; i++) {
			J[i][0] += E[i] * f * tz;
			J[i][1] += E[i] * f * tz * m;
			J[i][2] += E[i] * f * tx;
			J[i][3] += E[i] * f * tx * m;
		}
	}
	return solve4(J, r, dp);
}

/* Backtracking along dp until |C|^2 falls; the accepted point is left in
 * p, ws->cur, C and *merit. */
static int line_search(struct ow_melt_ws *ws, const struct melt_station *st,
                       double p[4], const double dp[4], double C[4],
                       double *merit)
{
	double lam = 1.0, pt[4], Ct[4], mt;

	for (int tries = 0; tries < 40; tries++, lam *= 0.5) {
		for (int k = 0; k < 4; k++)
			pt[k] = p[k] + lam * dp[k];
		if (cell_viscosities(ws, st, pt, &ws->cur, &ws->trial) != 0)
			continue;
		mt = conditions(ws, st, ws->trial.phi, pt, Ct);
		if (mt < (1.0 - 1e-4 * lam) * *merit) {
			struct melt_cells t = ws->cur;

			ws->cur = ws->trial;
			ws->trial = t;
			memcpy(p, pt, sizeof pt);
			memcpy(C, Ct, sizeof Ct);
			*merit = mt;
			return 0;
		}
	}
	return -1;
}

/* Cold start: viscosity and local index at the nominal shear rate. */
static int cold_start(struct ow_melt_ws *ws, const struct melt_station *st)
{
	double g = hypot(st->vz, st->vx) / st->H;
	struct melt_cells *cs = &ws->cur;

	if (!(g > 0.0))
		g = fabs(st->qz) / (st->H * st->H);
	for (int c = 0; c < ws->nc; c++) {
		double s, u = ws->lat[c] + log(g);
		double f = ow_viscosity_log_ref(&st->vlog, u, &s);

		cs->lnv[c] = ws->lat[c] + f;
		if (!isfinite(cs->lnv[c]))
			return -1;
		cs->phi[c] = exp(-cs->lnv[c]);
		cs->lu[c] = u;
		cs->ltau[c] = u + f; /* the stress this rate belongs to */
		cs->tau2[c] = exp(2.0 * cs->ltau[c]);
		cs->nloc[c] = 1.0 + s > 0.02 ? 1.0 + s : 0.02;
		cs->h2[c] = cell_curvature(&st->vlog, s);
	}
	return 0;
}

/* Cold start followed by the stresses for those viscosities and the
 * viscosities for those stresses. -1 for a viscosity not finite. */
static int start_cold(struct ow_melt_ws *ws, const struct melt_station *st)
{
	if (cold_start(ws, st) != 0 || solve_p(ws, st, ws->cur.phi, ws->p) != 0)
		return -1;
	return cell_viscosities(ws, st, ws->p, &ws->cur, &ws->cur);
}

/* Node profiles from the converged cells. */
static void fill_profile(struct ow_melt_ws *ws, const struct melt_station *st)
{
	double hh = 1.0 / (double)ws->nc, H = st->H;
	const double *p = ws->p, *ph = ws->cur.phi;

	ws->uz[0] = ws->ux[0] = 0.0;
	for (int c = 0; c < ws->nc; c++) {
		double m = ((double)c + 0.5) * hh;

		ws->uz[c + 1] = ws->uz[c] + ph[c] * H * hh * (p[0] + p[1] * m);
		ws->ux[c + 1] = ws->ux[c] + ph[c] * H * hh * (p[2] + p[3] * m);
	}
	for (int j = 0; j < ws->nn; j++) {
		double yh = (double)j * hh, phi = 0.0;
		double tz = p[0] + p[1] * yh, tx = p[2] + p[3] * yh;
		int k = 0;

		if (j > 0)
			phi += ph[j - 1], k++;
		if (j < ws->nc)
			phi += ph[j], k++;
		phi /= (double)k;
		ws->y[j] = yh * H;
		ws->gd[j] = phi * sqrt(tz * tz + tx * tx);
		ws->dis[j] = phi * (tz * tz + tx * tx);
		ws->eta[j] = 1.0 / phi;
	}
}

static double max_abs4(const double C[4])
{
	return fmax(fmax(fabs(C[0]), fabs(C[1])), fmax(fabs(C[2]), fabs(C[3])));
}

/* Newton in p from ws->p and ws->cur (the viscosities for those stresses)
 * until the conditions hold to TOL_NEWTON; -1 (residual in *res) when a
 * step finds no descent or MAX_NEWTON steps do not do. */
static int newton(struct ow_melt_ws *ws, const struct melt_station *st,
                  int *iterations, double *res)
{
	double C[4], dp[4], merit;
	int it;

	merit = conditions(ws, st, ws->cur.phi, ws->p, C);
	for (it = 0; max_abs4(C) > TOL_NEWTON * st->tol; it++) {
		if (it == MAX_NEWTON || newton_step(ws, st, ws->p, C, dp) ||
		    line_search(ws, st, ws->p, dp, C, &merit)) {
			*res = max_abs4(C);
			return -1;
		}
	}
	*iterations = it;
	return 0;
}

enum ow_status ow_melt_solve_velocity(struct ow_melt_ws *ws,
                                      const struct melt_station *st,
                                      int *iterations, struct ow_diag *d)
{
	double res = 0.0;
	int rc;

	*iterations = 0;
	for (int c = 0; c < ws->nc; c++) {
		double la = ow_viscosity_log_shift(&st->mat->visc, ws->tc[c]);

		if (!isfinite(la))
			goto bad_visc;
		if (ws->warm && la != ws->lat[c]) { /* same stress, new T */
			double dl = la - ws->lat[c];

			ws->cur.lnv[c] += dl;
			ws->cur.phi[c] = fabs(dl) <= SERIES_MAX
			                     ? ws->cur.phi[c] * expm_small(dl)
			                     : exp(-ws->cur.lnv[c]);
		}
		ws->lat[c] = la;
	}
	if (!(vscale(st) > 0.0)) { /* nothing moves: no stress */
		if (!ws->warm && cold_start(ws, st) != 0)
			goto bad_visc;
		memset(ws->p, 0, sizeof ws->p);
		fill_profile(ws, st);
		return OW_OK;
	}
	if (!ws->warm && start_cold(ws, st) != 0)
		goto bad_visc;
	if (ws->warm) /* the stresses the cells were solved for */
		memcpy(ws->p, ws->pcells, sizeof ws->p);
	rc = newton(ws, st, iterations, &res);
	if (rc != 0 && ws->warm) { /* the last station misled: start afresh */
		if (start_cold(ws, st) != 0)
			goto bad_visc;
		rc = newton(ws, st, iterations, &res);
	}
	if (rc != 0) {
		ws->warm = 0;
		return ow_diag_set(d, OW_ENOCONV,
		                   "melt: velocity profile did not converge "
		                   "(H = %g m, residual %g)",
		                   st->H, res);
	}
	memcpy(ws->pcells, ws->p, sizeof ws->p);
	if (solve_p(ws, st, ws->cur.phi, ws->p) != 0) /* conditions exactly */
		goto bad_visc;
	ws->warm = 1;
	fill_profile(ws, st);
	return OW_OK;
bad_visc:
	ws->warm = 0;
	return ow_diag_set(d, OW_ECOMPUTE,
	                   "melt: viscosity not finite at the station "
	                   "(temperature %g K)",
	                   ws->tc[0]);
}

/* ---- exact integrals of the discrete profile -------------------------- */

void ow_melt_seg_integrals(const struct ow_melt_ws *ws, double y0, double y1,
                           double *q, double *heat)
{
	double hh = 1.0 / (double)ws->nc, H = ws->H, a0 = y0 / H, a1 = y1 / H;
	const double *p = ws->p;
	int c0 = (int)floor(a0 / hh), c1 = (int)floor(a1 / hh);

	*q = *heat = 0.0;
	if (c0 < 0)
		c0 = 0;
	if (c1 > ws->nc - 1)
		c1 = ws->nc - 1;
	for (int c = c0; c <= c1; c++) {
		double yc = (double)c * hh, phi = ws->cur.phi[c];
		double t0 = fmax(a0 - yc, 0.0), t1 = fmin(a1 - yc, hh);
		double tz = p[0] + p[1] * yc, tx = p[2] + p[3] * yc;
		double d1 = t1 - t0, d2 = t1 * t1 - t0 * t0;
		double d3 = t1 * t1 * t1 - t0 * t0 * t0;

		if (!(t1 > t0))
			continue;
		*q += H * (ws->uz[c] * d1 +
		           phi * H * (tz * d2 / 2.0 + p[1] * d3 / 6.0));
		*heat +=
		    H * phi *
		    (ws->fp * (tz * tz * d1 + tz * p[1] * d2 +
		               p[1] * p[1] * d3 / 3.0) +
		     (tx * tx * d1 + tx * p[3] * d2 + p[3] * p[3] * d3 / 3.0));
	}
}

double ow_melt_psi_ux(const struct ow_melt_ws *ws, double y, double *ux)
{
	double hh = 1.0 / (double)ws->nc, H = ws->H, a = y / H, t, yc, phi, tx;
	int c = (int)floor(a / hh);

	if (c < 0)
		c = 0;
	if (c > ws->nc - 1)
		c = ws->nc - 1;
	yc = (double)c * hh;
	t = a - yc;
	phi = ws->cur.phi[c];
	tx = ws->p[2] + ws->p[3] * yc;
	if (ux)
		*ux = ws->ux[c] + phi * H * (tx * t + ws->p[3] * t * t / 2.0);
	return ws->psi[c] +
	       H * (ws->ux[c] * t +
	            phi * H * (tx * t * t / 2.0 + ws->p[3] * t * t * t / 6.0));
}

double ow_melt_psi_at(const struct ow_melt_ws *ws, double y)
{
	return ow_melt_psi_ux(ws, y, NULL);
}
