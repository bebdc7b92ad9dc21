/* spread.c - the varied inputs: names, extents, the inverse distribution
 * functions, how a value moves a copy of the study, and the Latin
 * hypercube each grid point draws its samples from. */
#include "ow_spread_input.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include <gsl/gsl_cdf.h>

#include "ow_study.h"

#define TRUNC_SD 3.0 /* normal inputs are cut at +-3 sd */
#define CALIB_MAX_REL                                                          \
	0.3 /* a calibrated factor's relative error used at                    \
	       most: keeps 1 - 3 sd above 0 */

static const char *const kind_names[OW_SK_COUNT] = {
    "viscosity_scale", "melting_point",      "feed_temperature",
    "clearance",       "barrel_heat_factor", "calibration"};

void ow_spread_default(struct ow_spread *sp)
{
	memset(sp, 0, sizeof *sp);
	sp->samples = OW_SPREAD_DEFAULT_SAMPLES;
	sp->seed = OW_SPREAD_DEFAULT_SEED;
	sp->level = OW_SPREAD_DEFAULT_LEVEL;
	sp->calib_errors = 1;
}

const char *ow_spread_kind_name(enum ow_spread_kind k)
{
	return k >= 0 && k < OW_SK_COUNT ? kind_names[k] : "?";
}

void ow_spread_extent(const struct ow_spread_input *in, double *lo, double *hi)
{
	*lo = in->normal ? in->lo - TRUNC_SD * in->hi : in->lo;
	*hi = in->normal ? in->lo + TRUNC_SD * in->hi : in->hi;
}

/* Uniform: lo + u (hi - lo). Normal: mean + sd Phi^-1(u') with u' mapped
 * into (Phi(-3), Phi(3)), the truncated normal's inverse CDF (Johnson,
 * Kotz & Balakrishnan 1994, ch. 13, sec. 10.1). */
double ow_spread_value(const struct ow_spread_input *in, double u)
{
	double a, b;

	if (!in->normal)
		return in->lo + u * (in->hi - in->lo);
	if (in->hi == 0.0)
		return in->lo;
	a = gsl_cdf_ugaussian_P(-TRUNC_SD);
	b = gsl_cdf_ugaussian_P(TRUNC_SD);
	return in->lo + in->hi * gsl_cdf_ugaussian_Pinv(a + u * (b - a));
}

void ow_spread_apply(struct ow_study *s, const struct ow_spread_input *in,
                     double v)
{
	switch (in->kind) {
	case OW_SK_MELTING:
		s->resin.melt_temp_K += v;
		break;
	case OW_SK_FEED_TEMP:
		s->line.feed_temp_K += v;
		break;
	case OW_SK_CLEARANCE: /* wear entries wider than v stay */
		s->screw.clearance_m = v;
		break;
	default: /* a factor of the calibration table */
		ow_calib_factor(in->factor)->apply(s, v);
	}
}

/* A calibrated factor k whose standard error is known varies as a normal
 * multiplier on its calibrated value: mean 1, sd std_error / value. An
 * explicit range on the same input takes its place. */
void ow_spread_add_calib(struct ow_spread *sp, const struct ow_calibration *c)
{
	int k, i, taken;

	if (!sp->calib_errors || !c->present)
		return;
	for (k = 0; k < OW_CF_COUNT && sp->n < OW_SPREAD_MAX_INPUTS; k++) {
		double rel = c->std_error[k] / c->value[k];
		struct ow_spread_input *in = &sp->in[sp->n];

		for (i = 0, taken = 0; i < sp->n; i++)
			taken |= sp->in[i].factor == k;
		if (taken || !(rel > 0.0))
			continue;
		memset(in, 0, sizeof *in);
		in->kind = OW_SK_CALIB;
		in->factor = k;
		in->normal = 1;
		in->lo = in->nominal = 1.0;
		in->hi = rel < CALIB_MAX_REL ? rel : CALIB_MAX_REL;
		snprintf(in->name, sizeof in->name, "calibration.%s",
		         ow_calib_factor(k)->name);
		sp->n++;
	}
}

/* splitmix64 (Steele, Lea & Flood 2014): a counter-based generator, so
 * each grid point's stream depends on the seed and its index only. */
static unsigned long long mix(unsigned long long *x)
{
	unsigned long long z = (*x += 0x9E3779B97F4A7C15ull);

	z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
	z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
	return z ^ (z >> 31);
}

static double unit(unsigned long long *x)
{
	return ((double)(mix(x) >> 11) + 0.5) * 0x1.0p-53; /* in (0, 1) */
}

/* Latin hypercube (McKay, Beckman & Conover 1979): in each dimension the
 * n samples take one each of the n equal strata, in a random order (a
 * Fisher-Yates shuffle), at a random place inside their stratum. */
void ow_spread_lhs(unsigned long seed, long point, int n, int d, double *u)
{
	unsigned long long x =
	    ((unsigned long long)seed << 32) ^ (unsigned long long)point;
	int i, k, j;

	mix(&x);
	for (k = 0; k < d; k++) {
		for (i = 0; i < n; i++)
			u[i * d + k] = i;
		for (i = n - 1; i > 0; i--) {
			double t;

			j = (int)(mix(&x) % (unsigned long long)(i + 1));
			t = u[i * d + k];
			u[i * d + k] = u[j * d + k];
			u[j * d + k] = t;
		}
		for (i = 0; i < n; i++)
			u[i * d + k] = (u[i * d + k] + unit(&x)) / n;
	}
}
