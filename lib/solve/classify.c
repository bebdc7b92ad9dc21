/* classify.c - limits -> status bits and signed margins per point.
 *
 * Margins are normalised so that they are comparable in size: relative to
 * the limit for pressures, powers, torques, outputs and ratios, and per
 * 50 K for temperatures. Only their sign and zero crossing matter for the
 * boundaries. */
#include "ow_classify.h"

#include <math.h>
#include <stddef.h>

#define TEMP_SCALE_K 50.0

static const char *const keys[] = {
#define OW_CHECK_KEY(id, key, text, kind) key,
    OW_CHECK_LIST(OW_CHECK_KEY)
#undef OW_CHECK_KEY
};

static const char *const texts[] = {
#define OW_CHECK_TEXT(id, key, text, kind) text,
    OW_CHECK_LIST(OW_CHECK_TEXT)
#undef OW_CHECK_TEXT
};

static const char *const failures[] = {
#define OW_CHECK_FAIL(id, key, text, kind) text OW_CK_FAIL_##kind,
    OW_CHECK_LIST(OW_CHECK_FAIL)
#undef OW_CHECK_FAIL
};

#define OW_CK_REL_MAX  "at most"
#define OW_CK_REL_MIN  "at least"
#define OW_CK_REL_FLAG NULL

static const char *const relations[] = {
#define OW_CHECK_REL(id, key, text, kind) OW_CK_REL_##kind,
    OW_CHECK_LIST(OW_CHECK_REL)
#undef OW_CHECK_REL
};

const char *ow_check_key(enum ow_check c)
{
	return c < OW_CK_COUNT ? keys[c] : "?";
}

int ow_classify_names(const struct ow_verdict *v, const char **names, int max)
{
	int c, n = 0;

	for (c = 0; c < OW_CK_COUNT; c++)
		if ((v->bits & (1u << c)) && n < max)
			names[n++] = ow_check_key((enum ow_check)c);
	return n;
}

const char *ow_check_text(enum ow_check c)
{
	return c < OW_CK_COUNT ? texts[c] : "?";
}

const char *ow_check_failure(enum ow_check c)
{
	return c < OW_CK_COUNT ? failures[c] : "?";
}

const char *ow_check_relation(enum ow_check c)
{
	return c < OW_CK_COUNT ? relations[c] : NULL;
}

double ow_check_limit(const struct ow_limits *l, enum ow_check c)
{
	switch (c) {
	case OW_CK_PEAK_TEMP:
		return l->peak_temp_K;
	case OW_CK_UNMELT:
		return l->unmelt_frac;
	case OW_CK_PRESSURE:
		return l->pressure_Pa;
	case OW_CK_POWER:
		return l->power_W;
	case OW_CK_TORQUE:
		return l->torque_Nm;
	case OW_CK_MIN_MELT_TEMP:
		return l->min_melt_temp_K;
	case OW_CK_MIN_OUTPUT:
		return l->min_output_kg_s;
	case OW_CK_MAX_OUTPUT:
		return l->max_output_kg_s;
	case OW_CK_MAX_SBR:
		return l->max_sbr;
	case OW_CK_ZONE_CONTROL:
		return l->zone_load;
	default:
		return NAN;
	}
}

int ow_check_active(const struct ow_limits *l, enum ow_check c)
{
	return c >= OW_CK_LIMITS || !isnan(ow_check_limit(l, c));
}

static double rel(double limit, double value, int upper)
{
	double s = fabs(limit) > 0.0 ? fabs(limit) : 1.0;

	return (upper ? limit - value : value - limit) / s;
}

/* Unmelt margin continuous through complete melting: while solids reach
 * the tip it is the shortfall to the limit; once the melt completes before
 * the tip it grows with the unused length of screw. */
static double unmelt_margin(const struct ow_point *pt, double limit, double len)
{
	double s = limit > 0.01 ? limit : 0.01;

	if (pt->unmelt_frac > 0.0 || !isfinite(pt->melt_complete_m))
		return (limit - pt->unmelt_frac) / s;
	return limit / s + (len - pt->melt_complete_m) / len;
}

static double margin_of(const struct ow_point *pt, enum ow_check c, double lim,
                        double len)
{
	switch (c) {
	case OW_CK_PEAK_TEMP:
		return (lim - pt->peak_K) / TEMP_SCALE_K;
	case OW_CK_UNMELT:
		return unmelt_margin(pt, lim, len);
	case OW_CK_PRESSURE:
		return rel(lim, pt->max_pressure_Pa, 1);
	case OW_CK_POWER:
		return rel(lim, pt->power_W, 1);
	case OW_CK_TORQUE:
		return rel(lim, pt->torque_Nm, 1);
	case OW_CK_MIN_MELT_TEMP:
		return (pt->discharge_bulk_K - lim) / TEMP_SCALE_K;
	case OW_CK_MIN_OUTPUT:
		return rel(lim, pt->output_kg_s, 0);
	case OW_CK_MAX_OUTPUT:
		return rel(lim, pt->output_kg_s, 1);
	case OW_CK_MAX_SBR:
		return rel(lim, pt->max_sbr, 1);
	case OW_CK_ZONE_CONTROL: /* share of a zone's power needed */
		return rel(lim, pt->zone_load, 1);
	default:
		return NAN;
	}
}

void ow_classify(const struct ow_point *pt, const struct ow_limits *lim,
                 double screw_len_m, struct ow_verdict *v)
{
	int c;

	v->bits = 0;
	for (c = 0; c < OW_CK_LIMITS; c++) {
		double l = ow_check_limit(lim, (enum ow_check)c);

		v->margin[c] =
		    isnan(l) ? NAN
		             : margin_of(pt, (enum ow_check)c, l, screw_len_m);
		/* NaN figures (a failed point) count as violations */
		if (!isnan(l) && !(v->margin[c] >= 0.0))
			v->bits |= 1u << c;
	}
	if (pt->flags & OW_FLAG_PLUGGING)
		v->bits |= 1u << OW_CK_PLUGGING;
	if (pt->flags & OW_FLAG_FEED_LIMITED)
		v->bits |= 1u << OW_CK_FEED;
	if (pt->flags & OW_FLAG_PARTIAL_FILL)
		v->bits |= 1u << OW_CK_PARTIAL_FILL;
	if (pt->flags & OW_FLAG_NOT_CONVERGED)
		v->bits |= 1u << OW_CK_NOCONV;
}
