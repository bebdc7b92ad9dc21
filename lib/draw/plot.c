/* plot.c - the plot frame (layout, axes, nice ticks), number formatting,
 * colour maps, polylines, markers, hatched regions, legends and line
 * charts on an ow_canvas. Contours live in plot_contour.c. */
#include "ow_plot.h"
#include "ow_const.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define TICK_LEN 4.0 /* pt */

/* --- ticks and numbers ------------------------------------------------ */

static int count_ticks(double lo, double hi, double step)
{
	return (int)(ceil(hi / step - 1e-9) - floor(lo / step + 1e-9)) + 1;
}

/* Heckbert, "Nice numbers for graph labels", Graphics Gems (1990): steps
 * 1, 2, 5 x 10^k; the smallest that gives at most max_ticks ticks over
 * the range widened to whole steps. */
enum ow_status ow_plot_nice_ticks(double lo, double hi, int max_ticks,
                                  struct ow_ticks *t)
{
	static const double mant[3] = {1.0, 2.0, 5.0};
	double span = hi - lo, step = 0.0, first;
	int e, k, i;

	if (!t || !isfinite(lo) || !isfinite(hi) || !(span > 0.0) ||
	    !isfinite(span))
		return OW_EARG;
	if (max_ticks < 2)
		max_ticks = 2;
	if (max_ticks > OW_PLOT_MAX_TICKS)
		max_ticks = OW_PLOT_MAX_TICKS;
	e = (int)floor(log10(span / (double)max_ticks)) - 1;
	for (k = 0; k < 12 && step == 0.0; k++, e++)
		for (i = 0; i < 3; i++) {
			double s = mant[i] * pow(10.0, e);

			if (count_ticks(lo, hi, s) <= max_ticks) {
				step = s;
				break;
			}
		}
	if (step == 0.0)
		return OW_EARG;
	first = floor(lo / step + 1e-9);
	t->n = count_ticks(lo, hi, step);
	t->step = step;
	for (i = 0; i < t->n; i++) {
		double v = (first + (double)i) * step;

		t->v[i] = fabs(v) < 1e-9 * step ? 0.0 : v; /* no -0 */
	}
	t->decimals = step >= 1.0 ? 0 : (int)ceil(-log10(step) - 1e-9);
	if (step < 1.0 && fabs(step * pow(10.0, t->decimals) -
	                       round(step * pow(10.0, t->decimals))) > 1e-6)
		t->decimals++;
	return OW_OK;
}

char *ow_plot_format(char *buf, size_t n, double v, int decimals)
{
	char tmp[64], *p;
	const char *src = tmp;

	if (decimals < 0)
		decimals = 0;
	if (decimals > 12)
		decimals = 12;
	if (!isfinite(v)) {
		snprintf(buf, n, "–");
		return buf;
	}
	snprintf(tmp, sizeof tmp, "%.*f", decimals, v);
	for (p = tmp; *p; p++)
		if (*p == ',')
			*p = '.'; /* whatever the locale says */
	if (tmp[0] == '-') {
		/* "-0.0" is zero: drop the sign, else a true minus sign */
		int zero = strspn(tmp + 1, "0.") == strlen(tmp + 1);

		if (zero)
			src = tmp + 1;
		else {
			snprintf(buf, n, "\xe2\x88\x92%s", tmp + 1);
			return buf;
		}
	}
	snprintf(buf, n, "%s", src);
	return buf;
}

/* --- logarithmic axes ------------------------------------------------ */

/* 10^k, as exact as doubles allow (1/1000 rounds once, pow may not). */
static double decade(int k)
{
	return k >= 0 ? pow(10.0, (double)k) : 1.0 / pow(10.0, (double)-k);
}

/* The exponent k of the decade 10^k .. 10^(k+1) holding v > 0 (a value a
 * hair under 10^k, from rounding, counts as 10^k). */
static int decade_of(double v)
{
	return (int)floor(log10(v) + 1e-9);
}

static int inside(double v, double l0, double l1)
{
	double l = log10(v);

	return l >= l0 - 1e-9 && l <= l1 + 1e-9;
}

/* Base-10 logarithmic scale: v is placed at log10(v), so the decades
 * 10^k are equally spaced and m x 10^k (m = 2..9) lies log10(m) of a
 * decade above 10^k (the base-10 logarithmic scale as in Cleveland,
 * "The Elements of Graphing Data", 1985, on logarithms in graphs). */
enum ow_status ow_plot_log_ticks(double lo, double hi, int nice,
                                 struct ow_log_ticks *t)
{
	double l0, l1;
	int k, m, k0, k1;

	if (!t || !isfinite(lo) || !isfinite(hi) || !(lo > 0.0) || !(hi > lo))
		return OW_EARG;
	l0 = log10(lo);
	l1 = log10(hi);
	if (l1 - l0 > (double)OW_PLOT_MAX_TICKS)
		return OW_EARG;
	if (nice) {
		l0 = floor(l0 + 1e-9);
		l1 = ceil(l1 - 1e-9);
	}
	k0 = (int)ceil(l0 - 1e-9);
	k1 = (int)floor(l1 + 1e-9);
	if (k1 - k0 + 1 > OW_PLOT_MAX_TICKS)
		return OW_EARG;
	memset(t, 0, sizeof *t);
	t->plain = 1;
	for (k = k0; k <= k1; k++) {
		t->major[t->n_major++] = decade(k);
		if (k < -3 || k > 4)
			t->plain = 0;
	}
	if (l1 - l0 > 12.0)
		return OW_OK; /* minor ticks would run together */
	for (k = (int)floor(l0 + 1e-9); k <= k1; k++)
		for (m = 2; m <= 9; m++) {
			double v = (double)m * decade(k);

			if (inside(v, l0, l1) && t->n_minor < OW_PLOT_MAX_MINOR)
				t->minor[t->n_minor++] = v;
		}
	return OW_OK;
}

char *ow_plot_format_log(char *buf, size_t n, double v, int plain)
{
	int k;

	if (!isfinite(v) || !(v > 0.0)) {
		snprintf(buf, n, "–");
		return buf;
	}
	k = decade_of(v);
	if (fabs(v / decade(k) - 1.0) < 1e-6 && !plain && (k < -2 || k > 3)) {
		if (k < 0)
			snprintf(buf, n, "1e\xe2\x88\x92%d", -k);
		else
			snprintf(buf, n, "1e%d", k);
		return buf;
	}
	/* a decimal with the digits of m x 10^k: 0.02 has two */
	return ow_plot_format(buf, n, v, k < 0 ? -k : 0);
}

/* --- colour maps ------------------------------------------------------ */

/* Every 16th entry (0, 16, ..., 240) and the last (255) of the published
 * 256-entry tables, sRGB 0..1:
 * viridis: van der Walt & Smith, "mpl-colormaps" (2015), as listed in
 *   matplotlib's _cm_listed.py (_viridis_data);
 * cividis: Nunez, Anderton & Renslow, "Optimizing colormaps with
 *   consideration for color vision deficiency...", PLoS ONE 13(7)
 *   e0199239 (2018), as listed in matplotlib's _cm_listed.py. */
static const double viridis[17][3] = {
    {0.267004, 0.004874, 0.329415}, {0.282327, 0.094955, 0.417331},
    {0.278826, 0.175490, 0.483397}, {0.258965, 0.251537, 0.524736},
    {0.229739, 0.322361, 0.545706}, {0.199430, 0.387607, 0.554642},
    {0.172719, 0.448791, 0.557885}, {0.149039, 0.508051, 0.557250},
    {0.127568, 0.566949, 0.550556}, {0.120638, 0.625828, 0.533488},
    {0.157851, 0.683765, 0.501686}, {0.246070, 0.738910, 0.452024},
    {0.369214, 0.788888, 0.382914}, {0.515992, 0.831158, 0.294279},
    {0.678489, 0.863742, 0.189503}, {0.845561, 0.887322, 0.099702},
    {0.993248, 0.906157, 0.143936}};

static const double cividis[17][3] = {
    {0.000000, 0.135112, 0.304751}, {0.000000, 0.178802, 0.414764},
    {0.103401, 0.220406, 0.435790}, {0.195057, 0.264372, 0.425924},
    {0.263738, 0.307831, 0.422789}, {0.324250, 0.351289, 0.426250},
    {0.380830, 0.395164, 0.435653}, {0.435168, 0.439763, 0.451134},
    {0.488697, 0.485318, 0.471008}, {0.547840, 0.531895, 0.471704},
    {0.609105, 0.579816, 0.463638}, {0.671991, 0.629316, 0.448018},
    {0.736488, 0.680629, 0.424028}, {0.802667, 0.733978, 0.390153},
    {0.870717, 0.789572, 0.343333}, {0.941147, 0.847530, 0.275815},
    {0.995737, 0.909344, 0.217772}};

/* Table entry index of control point k (the last one is 255, not 256). */
static double entry(int k)
{
	return k == 16 ? 255.0 : 16.0 * (double)k;
}

struct ow_rgba ow_cmap_at(enum ow_cmap map, double t)
{
	const double(*tab)[3] = map == OW_CMAP_CIVIDIS ? cividis : viridis;
	double e = 255.0 * (isfinite(t) ? fmin(1.0, fmax(0.0, t)) : 0.0);
	int k = 0;
	double f;
	struct ow_rgba c;

	while (k < 15 && e > entry(k + 1))
		k++;
	f = (e - entry(k)) / (entry(k + 1) - entry(k));
	c.r = tab[k][0] + f * (tab[k + 1][0] - tab[k][0]);
	c.g = tab[k][1] + f * (tab[k + 1][1] - tab[k][1]);
	c.b = tab[k][2] + f * (tab[k + 1][2] - tab[k][2]);
	c.a = 1.0;
	return c;
}

/* --- frame ------------------------------------------------------------ */

static int auto_ticks(double len_pt, double per_tick_pt)
{
	int n = (int)floor(len_pt / per_tick_pt) + 1;

	return n < 3 ? 3 : n > 12 ? 12 : n;
}

static enum ow_status axis_ticks(const struct ow_plot_axis *a, double len,
                                 double per, struct ow_ticks *t, double *lo,
                                 double *hi)
{
	int max = a->max_ticks > 0 ? a->max_ticks : auto_ticks(len, per);

	if (ow_plot_nice_ticks(a->min, a->max, max, t) != OW_OK)
		return OW_EARG;
	*lo = a->nice ? t->v[0] : a->min;
	*hi = a->nice ? t->v[t->n - 1] : a->max;
	if (!a->nice) { /* keep only ticks inside the range */
		int i, m = 0;

		for (i = 0; i < t->n; i++)
			if (t->v[i] >= a->min - 1e-9 * t->step &&
			    t->v[i] <= a->max + 1e-9 * t->step)
				t->v[m++] = t->v[i];
		t->n = m;
	}
	return OW_OK;
}

/* Ticks m x 10^k inside [lo, hi] for the mantissas mant[0..nm). */
static void mantissa_ticks(double lo, double hi, const int *mant, int nm,
                           struct ow_ticks *t)
{
	double l0 = log10(lo), l1 = log10(hi);
	int i, k;

	t->n = 0;
	for (k = decade_of(lo); k <= decade_of(hi); k++)
		for (i = 0; i < nm; i++) {
			double v = (double)mant[i] * decade(k);

			if (inside(v, l0, l1) && t->n < OW_PLOT_MAX_TICKS)
				t->v[t->n++] = v;
		}
}

/* The labelled ticks of a log axis: the decades (every n-th when there
 * are more than max), or 1, 2, 5 x 10^k when fewer than two decades lie
 * inside the range, or every m x 10^k when even those are fewer than
 * two. */
static void log_labels(const struct ow_log_ticks *l, double lo, double hi,
                       int max, struct ow_ticks *t)
{
	static const int mant[3] = {1, 2, 5};
	static const int all[9] = {1, 2, 3, 4, 5, 6, 7, 8, 9};
	int i, every;

	memset(t, 0, sizeof *t);
	t->step = 10.0; /* a ratio on a log axis */
	if (l->n_major >= 2) {
		every = (l->n_major + max - 1) / max;
		for (i = 0; i < l->n_major; i += every)
			t->v[t->n++] = l->major[i];
		return;
	}
	mantissa_ticks(lo, hi, mant, 3, t);
	if (t->n < 2)
		mantissa_ticks(lo, hi, all, 9, t);
}

static enum ow_status log_axis(const struct ow_plot_axis *a, double len,
                               double per, struct ow_log_ticks *l,
                               struct ow_ticks *t, double *lo, double *hi)
{
	int max = a->max_ticks > 0 ? a->max_ticks : auto_ticks(len, per);

	if (ow_plot_log_ticks(a->min, a->max, a->nice, l) != OW_OK)
		return OW_EARG;
	*lo = a->nice ? l->major[0] : a->min;
	*hi = a->nice ? l->major[l->n_major - 1] : a->max;
	log_labels(l, *lo, *hi, max < 2 ? 2 : max, t);
	return OW_OK;
}

/* Tick label of v on the x (xaxis 1) or y axis of p. */
static char *tick_text(const struct ow_plot *p, int xaxis, double v, char *buf,
                       size_t n)
{
	const struct ow_ticks *t = xaxis ? &p->xt : &p->yt;

	if (xaxis ? p->xlog : p->ylog)
		return ow_plot_format_log(buf, n, v,
		                          xaxis ? p->xl.plain : p->yl.plain);
	return ow_plot_format(buf, n, v, t->decimals);
}

static double widest_label(const struct ow_plot *p, int xaxis)
{
	const struct ow_ticks *t = xaxis ? &p->xt : &p->yt;
	char buf[64];
	double w = 0.0;
	int i;

	ow_canvas_set_font(p->cv, p->font_pt, 0);
	for (i = 0; i < t->n; i++)
		w = fmax(
		    w, ow_canvas_text_width(p->cv, tick_text(p, xaxis, t->v[i],
		                                             buf, sizeof buf)));
	return w;
}

static enum ow_status any_axis(struct ow_plot *p, int xaxis, int log,
                               const struct ow_plot_axis *a, double len,
                               double per)
{
	if (xaxis) {
		p->xlog = log;
		return log ? log_axis(a, len, per, &p->xl, &p->xt, &p->x0,
		                      &p->x1)
		           : axis_ticks(a, len, per, &p->xt, &p->x0, &p->x1);
	}
	p->ylog = log;
	return log ? log_axis(a, len, per, &p->yl, &p->yt, &p->y0, &p->y1)
	           : axis_ticks(a, len, per, &p->yt, &p->y0, &p->y1);
}

enum ow_status ow_plot_init(struct ow_plot *p, struct ow_canvas *cv,
                            const struct ow_rect *box,
                            const struct ow_plot_axis *x,
                            const struct ow_plot_axis *y, double font_pt,
                            double right_pt)
{
	return ow_plot_init_log(p, cv, box, x, y, font_pt, right_pt, 0);
}

enum ow_status ow_plot_init_log(struct ow_plot *p, struct ow_canvas *cv,
                                const struct ow_rect *box,
                                const struct ow_plot_axis *x,
                                const struct ow_plot_axis *y, double font_pt,
                                double right_pt, int log_axes)
{
	double top, bottom, left, right, h, w;

	if (!p || !cv || !box || !x || !y || !(font_pt > 0.0) ||
	    !(x->max > x->min) || !(y->max > y->min))
		return OW_EARG;
	memset(p, 0, sizeof *p);
	p->cv = cv;
	p->font_pt = font_pt;
	p->ink = ow_rgb(0.12, 0.12, 0.12);
	top = 2.0 * font_pt;
	bottom = TICK_LEN + 3.2 * font_pt + (x->title ? 0.0 : -1.6 * font_pt);
	h = box->h - top - bottom;
	if (h < 3.0 * font_pt || any_axis(p, 0, (log_axes & OW_PLOT_LOG_Y) != 0,
	                                  y, h, 3.2 * font_pt) != OW_OK)
		return OW_EARG;
	left = TICK_LEN + 0.5 * font_pt + widest_label(p, 0) +
	       (y->title ? 1.9 * font_pt : 0.3 * font_pt);
	right = right_pt + 1.6 * font_pt;
	w = box->w - left - right;
	if (w < 4.0 * font_pt || any_axis(p, 1, (log_axes & OW_PLOT_LOG_X) != 0,
	                                  x, w, 5.0 * font_pt) != OW_OK)
		return OW_EARG;
	p->area.x = box->x + left;
	p->area.y = box->y + top;
	p->area.w = w;
	p->area.h = h;
	return OW_OK;
}

/* Where v lies between a (0) and b (1): linearly, or on a base-10
 * logarithmic scale (log10 v - log10 a) / (log10 b - log10 a). */
static double axis_frac(int log, double v, double a, double b)
{
	if (!log)
		return (v - a) / (b - a);
	if (!(v > 0.0))
		return NAN;
	return (log10(v) - log10(a)) / (log10(b) - log10(a));
}

double ow_plot_px(const struct ow_plot *p, double x)
{
	return p->area.x + axis_frac(p->xlog, x, p->x0, p->x1) * p->area.w;
}

double ow_plot_py(const struct ow_plot *p, double y)
{
	return p->area.y + p->area.h -
	       axis_frac(p->ylog, y, p->y0, p->y1) * p->area.h;
}

/* 1 when data point (x, y) has a place on the canvas. */
static int mappable(const struct ow_plot *p, double x, double y)
{
	return isfinite(ow_plot_px(p, x)) && isfinite(ow_plot_py(p, y));
}

void ow_plot_clip(const struct ow_plot *p)
{
	ow_canvas_save(p->cv);
	ow_canvas_clip_rect(p->cv, p->area.x, p->area.y, p->area.w, p->area.h);
}

static void grid_lines(const struct ow_plot *p, int xaxis, const double *v,
                       int n)
{
	int i;

	for (i = 0; i < n; i++) {
		if (xaxis) {
			double X = ow_plot_px(p, v[i]);

			ow_canvas_move_to(p->cv, X, p->area.y);
			ow_canvas_line_to(p->cv, X, p->area.y + p->area.h);
		} else {
			double Y = ow_plot_py(p, v[i]);

			ow_canvas_move_to(p->cv, p->area.x, Y);
			ow_canvas_line_to(p->cv, p->area.x + p->area.w, Y);
		}
	}
}

void ow_plot_grid(const struct ow_plot *p)
{
	struct ow_canvas *cv = p->cv;

	ow_canvas_save(cv);
	if (p->xlog || p->ylog) { /* fainter lines at the minor ticks */
		ow_canvas_set_colour(cv, ow_rgb(0.93, 0.93, 0.93));
		ow_canvas_set_line_width(cv, 0.4);
		if (p->xlog)
			grid_lines(p, 1, p->xl.minor, p->xl.n_minor);
		if (p->ylog)
			grid_lines(p, 0, p->yl.minor, p->yl.n_minor);
		ow_canvas_stroke(cv);
	}
	ow_canvas_set_colour(cv, ow_rgb(0.86, 0.86, 0.86));
	ow_canvas_set_line_width(cv, 0.5);
	if (p->xlog)
		grid_lines(p, 1, p->xl.major, p->xl.n_major);
	else
		grid_lines(p, 1, p->xt.v, p->xt.n);
	if (p->ylog)
		grid_lines(p, 0, p->yl.major, p->yl.n_major);
	else
		grid_lines(p, 0, p->yt.v, p->yt.n);
	ow_canvas_stroke(cv);
	ow_canvas_restore(cv);
}

/* Tick marks without labels at v[0..n) of length len outwards. */
static void tick_marks(const struct ow_plot *p, int xaxis, const double *v,
                       int n, double len)
{
	double bx = p->area.x, by = p->area.y + p->area.h;
	int i;

	for (i = 0; i < n; i++) {
		if (xaxis) {
			ow_canvas_move_to(p->cv, ow_plot_px(p, v[i]), by);
			ow_canvas_line_to(p->cv, ow_plot_px(p, v[i]), by + len);
		} else {
			ow_canvas_move_to(p->cv, bx, ow_plot_py(p, v[i]));
			ow_canvas_line_to(p->cv, bx - len, ow_plot_py(p, v[i]));
		}
	}
}

static void tick_labels(const struct ow_plot *p, int xaxis)
{
	struct ow_canvas *cv = p->cv;
	const struct ow_ticks *t = xaxis ? &p->xt : &p->yt;
	double bx = p->area.x, by = p->area.y + p->area.h;
	const struct ow_log_ticks *l = xaxis ? &p->xl : &p->yl;
	char buf[64];
	int i;

	if (xaxis ? p->xlog : p->ylog) { /* every decade, then the minors */
		tick_marks(p, xaxis, l->major, l->n_major, TICK_LEN);
		tick_marks(p, xaxis, l->minor, l->n_minor, 0.55 * TICK_LEN);
	}
	for (i = 0; i < t->n; i++) {
		tick_text(p, xaxis, t->v[i], buf, sizeof buf);
		if (xaxis) {
			double X = ow_plot_px(p, t->v[i]);

			ow_canvas_move_to(cv, X, by);
			ow_canvas_line_to(cv, X, by + TICK_LEN);
			if (!p->hide_x_labels)
				ow_canvas_text(
				    cv, X, by + TICK_LEN + 0.35 * p->font_pt,
				    buf, OW_ALIGN_CENTRE, OW_VALIGN_TOP, 0);
		} else {
			double Y = ow_plot_py(p, t->v[i]);

			ow_canvas_move_to(cv, bx, Y);
			ow_canvas_line_to(cv, bx - TICK_LEN, Y);
			ow_canvas_text(cv, bx - TICK_LEN - 0.3 * p->font_pt, Y,
			               buf, OW_ALIGN_RIGHT, OW_VALIGN_MIDDLE,
			               0);
		}
	}
	ow_canvas_stroke(cv);
}

void ow_plot_axes(const struct ow_plot *p, const struct ow_plot_axis *x,
                  const struct ow_plot_axis *y)
{
	struct ow_canvas *cv = p->cv;
	double f = p->font_pt;

	ow_canvas_save(cv);
	ow_canvas_set_colour(cv, p->ink);
	ow_canvas_set_line_width(cv, 0.8);
	ow_canvas_rect(cv, p->area.x, p->area.y, p->area.w, p->area.h);
	ow_canvas_stroke(cv);
	ow_canvas_set_font(cv, f, 0);
	tick_labels(p, 1);
	tick_labels(p, 0);
	if (x && x->title)
		ow_canvas_text(cv, p->area.x + 0.5 * p->area.w,
		               p->area.y + p->area.h + TICK_LEN + 1.7 * f,
		               x->title, OW_ALIGN_CENTRE, OW_VALIGN_TOP, 0);
	if (y && y->title) {
		double lw = widest_label(p, 0);

		ow_canvas_text(cv, p->area.x - TICK_LEN - 0.6 * f - lw,
		               p->area.y + 0.5 * p->area.h, y->title,
		               OW_ALIGN_CENTRE, OW_VALIGN_BOTTOM, 90);
	}
	ow_canvas_restore(cv);
}

/* --- lines, markers, regions ------------------------------------------ */

void ow_plot_set_dash(struct ow_canvas *cv, enum ow_dash_style d, double w)
{
	static const double dashed[] = {5.0, 3.0}, dotted[] = {1.2, 2.0},
	                    dashdot[] = {6.0, 2.5, 1.5, 2.5},
	                    longd[] = {10.0, 4.0};
	const double *pat = NULL;
	double s[4];
	int n = 0, i;

	switch (d) {
	case OW_DASH_SOLID:
		break;
	case OW_DASH_DASHED:
		pat = dashed, n = 2;
		break;
	case OW_DASH_DOTTED:
		pat = dotted, n = 2;
		break;
	case OW_DASH_DASH_DOT:
		pat = dashdot, n = 4;
		break;
	case OW_DASH_LONG:
		pat = longd, n = 2;
		break;
	}
	for (i = 0; i < n; i++)
		s[i] = pat[i] * fmax(1.0, w); /* heavier lines, longer dashes */
	ow_canvas_set_dash(cv, s, n);
}

struct ow_line_style ow_plot_series_style(int k)
{
	/* Okabe & Ito, "Color Universal Design" (2008): blue, vermillion,
	 * bluish green, reddish purple, orange, sky blue, black */
	static const double pal[7][3] = {
	    {0.000, 0.447, 0.698}, {0.835, 0.369, 0.000}, {0.000, 0.620, 0.451},
	    {0.800, 0.475, 0.655}, {0.902, 0.624, 0.000}, {0.337, 0.706, 0.914},
	    {0.000, 0.000, 0.000}};
	static const enum ow_dash_style dash[5] = {
	    OW_DASH_SOLID, OW_DASH_DASHED, OW_DASH_DOTTED, OW_DASH_DASH_DOT,
	    OW_DASH_LONG};
	static const enum ow_marker mark[6] = {
	    OW_MARK_NONE,     OW_MARK_CIRCLE,  OW_MARK_SQUARE,
	    OW_MARK_TRIANGLE, OW_MARK_DIAMOND, OW_MARK_CROSS};
	struct ow_line_style s;

	k = k < 0 ? 0 : k;
	s.colour = ow_rgb(pal[k % 7][0], pal[k % 7][1], pal[k % 7][2]);
	s.width_pt = 1.4;
	s.dash = dash[k % 5];
	s.marker = mark[k % 6];
	return s;
}

static void marker_path(struct ow_canvas *cv, double X, double Y,
                        enum ow_marker m, double size)
{
	double r = 0.5 * size;

	switch (m) {
	case OW_MARK_NONE:
		break;
	case OW_MARK_CIRCLE:
		ow_canvas_circle(cv, X, Y, r);
		break;
	case OW_MARK_SQUARE:
		ow_canvas_rect(cv, X - 0.85 * r, Y - 0.85 * r, 1.7 * r,
		               1.7 * r);
		break;
	case OW_MARK_TRIANGLE:
		ow_canvas_move_to(cv, X, Y - 1.1 * r);
		ow_canvas_line_to(cv, X + r, Y + 0.7 * r);
		ow_canvas_line_to(cv, X - r, Y + 0.7 * r);
		ow_canvas_close_path(cv);
		break;
	case OW_MARK_DIAMOND:
		ow_canvas_move_to(cv, X, Y - 1.15 * r);
		ow_canvas_line_to(cv, X + 0.9 * r, Y);
		ow_canvas_line_to(cv, X, Y + 1.15 * r);
		ow_canvas_line_to(cv, X - 0.9 * r, Y);
		ow_canvas_close_path(cv);
		break;
	case OW_MARK_CROSS:
		ow_canvas_move_to(cv, X - r, Y - r);
		ow_canvas_line_to(cv, X + r, Y + r);
		ow_canvas_move_to(cv, X - r, Y + r);
		ow_canvas_line_to(cv, X + r, Y - r);
		break;
	}
}

/* A marker at canvas point (X, Y): filled and edged (a cross: edged). */
static void marker_at(struct ow_canvas *cv, double X, double Y,
                      enum ow_marker m, double size, struct ow_rgba fill,
                      struct ow_rgba edge)
{
	if (m == OW_MARK_NONE)
		return;
	ow_canvas_save(cv);
	ow_canvas_set_dash(cv, NULL, 0);
	ow_canvas_set_line_width(cv, fmax(0.8, 0.12 * size));
	marker_path(cv, X, Y, m, size);
	if (m != OW_MARK_CROSS) {
		ow_canvas_set_colour(cv, fill);
		ow_canvas_fill_preserve(cv);
	}
	ow_canvas_set_colour(cv, edge);
	ow_canvas_stroke(cv);
	ow_canvas_restore(cv);
}

void ow_plot_marker(const struct ow_plot *p, double x, double y,
                    enum ow_marker m, double size_pt, struct ow_rgba fill,
                    struct ow_rgba edge)
{
	if (!isfinite(x) || !isfinite(y) || !mappable(p, x, y))
		return;
	marker_at(p->cv, ow_plot_px(p, x), ow_plot_py(p, y), m, size_pt, fill,
	          edge);
}

/* Markers along the drawn line every ~spacing points of its length, so
 * series stay apart in greyscale however dense their data. */
static void line_markers(const struct ow_plot *p, const struct ow_pt2 *pts,
                         int n, const struct ow_line_style *s, double spacing)
{
	double run = 0.5 * spacing, pX = 0, pY = 0;
	int i, have = 0;

	for (i = 0; i < n; i++) {
		double X, Y;

		if (!mappable(p, pts[i].x, pts[i].y)) {
			have = 0;
			continue;
		}
		X = ow_plot_px(p, pts[i].x);
		Y = ow_plot_py(p, pts[i].y);
		if (have)
			run += hypot(X - pX, Y - pY);
		if (run >= spacing && X >= p->area.x - 0.5 &&
		    X <= p->area.x + p->area.w + 0.5 && Y >= p->area.y - 0.5 &&
		    Y <= p->area.y + p->area.h + 0.5) {
			marker_at(p->cv, X, Y, s->marker,
			          2.2 + 2.8 * s->width_pt, ow_rgb(1, 1, 1),
			          s->colour);
			run = 0.0;
		}
		pX = X, pY = Y, have = 1;
	}
}

void ow_plot_polyline(const struct ow_plot *p, const struct ow_pt2 *pts, int n,
                      const struct ow_line_style *s)
{
	struct ow_canvas *cv = p->cv;
	int i, pen = 0;

	if (!pts || n < 1 || !s)
		return;
	ow_plot_clip(p);
	ow_canvas_set_colour(cv, s->colour);
	ow_canvas_set_line_width(cv, s->width_pt);
	ow_plot_set_dash(cv, s->dash, s->width_pt);
	for (i = 0; i < n; i++) {
		if (!mappable(p, pts[i].x, pts[i].y)) {
			pen = 0;
			continue;
		}
		if (pen)
			ow_canvas_line_to(cv, ow_plot_px(p, pts[i].x),
			                  ow_plot_py(p, pts[i].y));
		else
			ow_canvas_move_to(cv, ow_plot_px(p, pts[i].x),
			                  ow_plot_py(p, pts[i].y));
		pen = 1;
	}
	ow_canvas_stroke(cv);
	if (s->marker != OW_MARK_NONE)
		line_markers(p, pts, n, s, 9.0 * p->font_pt);
	ow_canvas_restore(cv);
}

void ow_plot_region(const struct ow_plot *p, const struct ow_pt2 *pts,
                    const int *counts, int n_rings, struct ow_rgba tint,
                    const struct ow_hatch *h)
{
	struct ow_canvas *cv = p->cv;
	int r, i, k = 0;

	if (!pts || !counts || n_rings < 1)
		return;
	ow_plot_clip(p);
	for (r = 0; r < n_rings; r++) {
		for (i = 0; i < counts[r]; i++, k++) {
			double X = ow_plot_px(p, pts[k].x);
			double Y = ow_plot_py(p, pts[k].y);

			if (!isfinite(X) || !isfinite(Y))
				continue; /* <= 0 on a log axis */
			if (i == 0)
				ow_canvas_move_to(cv, X, Y);
			else
				ow_canvas_line_to(cv, X, Y);
		}
		ow_canvas_close_path(cv);
	}
	if (tint.a > 0.0) {
		ow_canvas_set_colour(cv, tint);
		ow_canvas_fill_preserve(cv);
	}
	if (h)
		ow_canvas_hatch(cv, h);
	ow_canvas_new_path(cv);
	ow_canvas_restore(cv);
}

/* --- legends and line charts ------------------------------------------ */

#define SAMPLE_W(f) (2.6 * (f))

/* One entry's width: sample, gaps and its label. */
static double entry_w(struct ow_canvas *cv, const struct ow_legend_entry *e,
                      int n, double f)
{
	double tw = 0.0;
	int i;

	ow_canvas_set_font(cv, f, 0);
	for (i = 0; i < n; i++)
		tw = fmax(tw, ow_canvas_text_width(cv, e[i].label));
	return 0.6 * f + SAMPLE_W(f) + 0.6 * f + tw + 0.6 * f;
}

static int rows_of(int n, int cols)
{
	return (n + cols - 1) / cols;
}

void ow_plot_legend_grid_size(struct ow_canvas *cv,
                              const struct ow_legend_entry *e, int n,
                              double font_pt, int cols, double *w, double *h)
{
	cols = cols < 1 ? 1 : cols;
	*w = (double)cols * entry_w(cv, e, n, font_pt);
	*h = (double)rows_of(n, cols) * 1.45 * font_pt + 0.6 * font_pt;
}

void ow_plot_legend_size(struct ow_canvas *cv, const struct ow_legend_entry *e,
                         int n, double font_pt, double *w, double *h)
{
	ow_plot_legend_grid_size(cv, e, n, font_pt, 1, w, h);
}

static void legend_sample(struct ow_canvas *cv, double x, double y,
                          const struct ow_legend_entry *e, double f)
{
	double sw = SAMPLE_W(f);

	if (e->swatch) {
		ow_canvas_rect(cv, x, y - 0.45 * f, sw, 0.9 * f);
		ow_canvas_set_colour(cv, e->fill);
		ow_canvas_fill_preserve(cv);
		if (e->hatch)
			ow_canvas_hatch(cv, e->hatch);
		ow_canvas_rect(cv, x, y - 0.45 * f, sw, 0.9 * f);
	} else {
		ow_canvas_move_to(cv, x, y);
		ow_canvas_line_to(cv, x + sw, y);
	}
	ow_canvas_set_colour(cv, e->line.colour);
	ow_canvas_set_line_width(cv, e->line.width_pt);
	ow_plot_set_dash(cv, e->line.dash, e->line.width_pt);
	if (e->line.width_pt > 0.0)
		ow_canvas_stroke(cv);
	ow_canvas_new_path(cv);
	ow_canvas_set_dash(cv, NULL, 0);
	{
		enum ow_marker m =
		    e->marker != OW_MARK_NONE ? e->marker : e->line.marker;
		struct ow_rgba fill =
		    !e->swatch && e->fill.a > 0.0 ? e->fill : ow_rgb(1, 1, 1);

		marker_at(cv, x + 0.5 * sw, y, m,
		          fmax(7.0, 2.2 + 2.8 * e->line.width_pt), fill,
		          e->line.colour);
	}
}

void ow_plot_legend_grid(struct ow_canvas *cv, double x, double y,
                         const struct ow_legend_entry *e, int n, double font_pt,
                         int cols)
{
	double w, h, f = font_pt, cw;
	int i, rows;

	if (!e || n < 1)
		return;
	cols = cols < 1 ? 1 : cols;
	rows = rows_of(n, cols);
	cw = entry_w(cv, e, n, f);
	ow_plot_legend_grid_size(cv, e, n, f, cols, &w, &h);
	ow_canvas_save(cv);
	ow_canvas_rect(cv, x, y, w, h);
	ow_canvas_set_colour(cv, ow_rgba_with_alpha(ow_rgb(1, 1, 1), 0.92));
	ow_canvas_fill_preserve(cv);
	ow_canvas_set_colour(cv, ow_rgb(0.6, 0.6, 0.6));
	ow_canvas_set_line_width(cv, 0.5);
	ow_canvas_stroke(cv);
	for (i = 0; i < n; i++) { /* down the first column, then the next */
		double xx = x + (double)(i / rows) * cw;
		double yy = y + 0.3 * f + ((double)(i % rows) + 0.5) * 1.45 * f;

		ow_canvas_save(cv);
		legend_sample(cv, xx + 0.6 * f, yy, &e[i], f);
		ow_canvas_restore(cv);
		ow_canvas_set_colour(cv, ow_rgb(0.12, 0.12, 0.12));
		ow_canvas_set_font(cv, f, 0);
		ow_canvas_text(cv, xx + 1.2 * f + SAMPLE_W(f), yy, e[i].label,
		               OW_ALIGN_LEFT, OW_VALIGN_MIDDLE, 0);
	}
	ow_canvas_restore(cv);
}

void ow_plot_legend(struct ow_canvas *cv, double x, double y,
                    const struct ow_legend_entry *e, int n, double font_pt)
{
	ow_plot_legend_grid(cv, x, y, e, n, font_pt, 1);
}

int ow_plot_series_range(const struct ow_series *s, int n, int use_y,
                         double *lo, double *hi)
{
	int i, k, any = 0;

	*lo = INFINITY;
	*hi = -INFINITY;
	for (k = 0; k < n; k++)
		for (i = 0; i < s[k].n; i++) {
			double v = use_y ? s[k].y[i] : s[k].x[i];

			if (!isfinite(v))
				continue;
			*lo = fmin(*lo, v);
			*hi = fmax(*hi, v);
			any = 1;
		}
	return any;
}

/* Series k as points (x, y), NAN breaks kept. */
static void draw_series(const struct ow_plot *p, const struct ow_series *s)
{
	struct ow_pt2 buf[256];
	int i = 0;

	/* in chunks, overlapping by one point so the line is unbroken */
	while (i < s->n) {
		int m = 0, j;

		for (j = i; j < s->n && m < 256; j++, m++) {
			buf[m].x = s->x[j];
			buf[m].y = s->y[j];
		}
		ow_plot_polyline(p, buf, m, &s->style);
		if (j >= s->n)
			break;
		i = j - 1;
	}
}

void ow_plot_lines(const struct ow_plot *p, const struct ow_plot_axis *x,
                   const struct ow_plot_axis *y, const struct ow_series *s,
                   int n, int legend)
{
	struct ow_legend_entry e[16];
	int k, m = 0;

	ow_plot_grid(p);
	for (k = 0; k < n; k++)
		draw_series(p, &s[k]);
	ow_plot_axes(p, x, y);
	if (!legend)
		return;
	for (k = 0; k < n && m < 16; k++) {
		if (!s[k].name)
			continue;
		memset(&e[m], 0, sizeof e[m]);
		e[m].label = s[k].name;
		e[m].line = s[k].style;
		m++;
	}
	if (m > 0) {
		double w, h;

		ow_plot_legend_size(p->cv, e, m, 0.9 * p->font_pt, &w, &h);
		ow_plot_legend(
		    p->cv, p->area.x + p->area.w - w - 0.4 * p->font_pt,
		    p->area.y + 0.4 * p->font_pt, e, m, 0.9 * p->font_pt);
	}
}
