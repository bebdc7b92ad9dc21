/* config_spread.c - the study's `spread` block (README, "Spread") ->
 * struct ow_spread: each varied input with its range or standard
 * deviation, the sample count, the seed and the level of the robust
 * window. Every extreme of every input is applied to a copy of the study
 * and checked as the loader checks the study itself, so a sample can never
 * be an input the model rejects. */
#include "ow_config.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "json_in.h"
#include "ow_spread_input.h"

/* Dimension of a range end (absolute) and of a width (plus_minus, sd). */
static void dims(enum ow_spread_kind k, enum ow_dim *abs, enum ow_dim *wid)
{
	switch (k) {
	case OW_SK_MELTING:
	case OW_SK_FEED_TEMP:
		*abs = OW_DIM_TEMPERATURE;
		*wid = OW_DIM_TEMP_DIFF;
		break;
	case OW_SK_CLEARANCE:
		*abs = *wid = OW_DIM_LENGTH;
		break;
	default: /* multipliers; a width is a fraction ("15 %") */
		*abs = *wid = OW_DIM_NONE;
	}
}

/* The nominal of kind k in the units of its absolute range ends, and the
 * offset that turns such an end into the input's value. */
static double nominal_abs(const struct ow_study *s, enum ow_spread_kind k)
{
	switch (k) {
	case OW_SK_MELTING:
		return s->resin.melt_temp_K;
	case OW_SK_FEED_TEMP:
		return s->line.feed_temp_K;
	case OW_SK_CLEARANCE:
		return s->screw.clearance_m;
	default:
		return 1.0;
	}
}

static double value_nominal(const struct ow_study *s, enum ow_spread_kind k)
{
	return k == OW_SK_CLEARANCE ? s->screw.clearance_m
	       : (k == OW_SK_MELTING || k == OW_SK_FEED_TEMP) ? 0.0
	                                                      : 1.0;
}

/* {"from", "to"} | {"plus_minus"} | {"sd"} (exactly one form). */
static enum ow_status parse_input(const struct ow_jin *j, const cJSON *v,
                                  const char *path, const struct ow_study *s,
                                  enum ow_spread_kind k,
                                  struct ow_spread_input *in)
{
	static const char *const keys[] = {"from", "to",     "plus_minus",
	                                   "sd",   "source", NULL};
	double a = NAN, b = NAN, pm = NAN, sd = NAN, nom = nominal_abs(s, k);
	double shift = (k == OW_SK_CLEARANCE) ? 0.0 : nom;
	enum ow_dim da, dw;
	enum ow_status st = ow_jin_object(j, v, path);
	int forms;

	dims(k, &da, &dw);
	if (st == OW_OK)
		st = ow_jin_keys(j, v, path, keys);
	if (st == OW_OK)
		st = ow_jin_qty(j, v, path, "from", da, 0, &a);
	if (st == OW_OK)
		st = ow_jin_qty(j, v, path, "to", da, 0, &b);
	if (st == OW_OK)
		st = ow_jin_qty(j, v, path, "plus_minus", dw, 0, &pm);
	if (st == OW_OK)
		st = ow_jin_qty(j, v, path, "sd", dw, 0, &sd);
	if (st != OW_OK)
		return st;
	forms = (!isnan(a) || !isnan(b)) + !isnan(pm) + !isnan(sd);
	if (forms != 1 || isnan(a) != isnan(b))
		return ow_jin_fail(j, path,
		                   "expected one of {\"from\", \"to\"},"
		                   " {\"plus_minus\"} or {\"sd\"}");
	if (!isnan(pm) && !(pm >= 0.0))
		return ow_jin_fail(j, path, "plus_minus: expected >= 0");
	if (!isnan(sd) && !(sd >= 0.0))
		return ow_jin_fail(j, path, "sd: expected >= 0");
	if (!isnan(a) && !(b >= a))
		return ow_jin_fail(j, path, "to: expected >= from");
	in->kind = k;
	in->factor = k == OW_SK_VISCOSITY ? OW_CF_VISCOSITY
	             : k == OW_SK_HEAT    ? OW_CF_HEAT
	                                  : -1;
	in->nominal = value_nominal(s, k);
	in->normal = !isnan(sd);
	if (!isnan(a)) { /* absolute ends -> values */
		in->lo =
		    k == OW_SK_CLEARANCE || in->factor >= 0 ? a : a - shift;
		in->hi =
		    k == OW_SK_CLEARANCE || in->factor >= 0 ? b : b - shift;
	} else if (in->normal) {
		in->lo = in->nominal;
		in->hi = sd;
	} else {
		in->lo = in->nominal - pm;
		in->hi = in->nominal + pm;
	}
	snprintf(in->name, sizeof in->name, "%s", ow_spread_kind_name(k));
	return OW_OK;
}

/* Every extreme of input in applied to a copy of s must load. */
static enum ow_status check_extremes(const struct ow_jin *j, const char *path,
                                     const struct ow_study *s,
                                     const struct ow_spread_input *in,
                                     struct ow_study *tmp)
{
	struct ow_diag why = {{0}};
	double e[2];
	int i;

	ow_spread_extent(in, &e[0], &e[1]);
	for (i = 0; i < 2; i++) {
		enum ow_status st = OW_OK;

		if ((in->factor >= 0 || in->kind == OW_SK_CALIB) &&
		    !(e[i] > 0.0))
			return ow_jin_fail(j, path,
			                   "%g: expected a factor "
			                   "range above 0",
			                   e[i]);
		if (in->kind == OW_SK_CLEARANCE && !(e[i] >= 0.0))
			return ow_jin_fail(j, path,
			                   "%g m: expected a "
			                   "clearance range >= 0",
			                   e[i]);
		tmp->screw = s->screw;
		tmp->resin = s->resin;
		tmp->line = s->line;
		ow_spread_apply(tmp, in, e[i]);
		st = ow_material_validate(&tmp->resin, &why);
		if (st == OW_OK)
			st = ow_line_validate(
			    &tmp->line, ow_screw_length(&tmp->screw), &why);
		if (st == OW_OK)
			st = ow_screw_prepare(&tmp->screw, &why);
		if (st != OW_OK)
			return ow_jin_fail(j, path,
			                   "at its %s end the study "
			                   "is rejected: %s",
			                   i ? "upper" : "lower", why.msg);
	}
	return OW_OK;
}

static enum ow_status parse_settings(const struct ow_jin *j, const cJSON *b,
                                     const char *path, struct ow_spread *sp)
{
	const cJSON *v = ow_jin_get(b, "calibration_errors");
	char p[OW_JPATH_LEN];
	double seed = NAN;
	enum ow_status st;

	st = ow_jin_int(j, b, path, "samples", 2, OW_SPREAD_MAX_SAMPLES, 0,
	                &sp->samples);
	if (st == OW_OK)
		st = ow_jin_qty(j, b, path, "seed", OW_DIM_NONE, 0, &seed);
	if (st == OW_OK && !isnan(seed)) {
		if (!(seed >= 0 && seed < 4294967296.0 && seed == floor(seed)))
			return ow_jin_fail(j, ow_jin_key(p, path, "seed"),
			                   "expected an integer 0..4294967295");
		sp->seed = (unsigned long)seed;
	}
	if (st == OW_OK)
		st =
		    ow_jin_qty(j, b, path, "level", OW_DIM_NONE, 0, &sp->level);
	if (st == OW_OK && !(sp->level > 0.0 && sp->level <= 1.0))
		return ow_jin_fail(j, ow_jin_key(p, path, "level"),
		                   "expected a share in (0, 100 %%]");
	if (st == OW_OK && v) {
		if (!cJSON_IsBool(v))
			return ow_jin_fail(
			    j, ow_jin_key(p, path, "calibration_errors"),
			    "expected true or false");
		sp->calib_errors = cJSON_IsTrue(v);
	}
	return st;
}

static enum ow_status parse_block(const struct ow_jin *j, const cJSON *b,
                                  const char *path, struct ow_study *s)
{
	static const char *const keys[] = {"notes",
	                                   "samples",
	                                   "seed",
	                                   "level",
	                                   "calibration_errors",
	                                   "viscosity_scale",
	                                   "melting_point",
	                                   "feed_temperature",
	                                   "clearance",
	                                   "barrel_heat_factor",
	                                   NULL};
	struct ow_spread *sp = &s->spread;
	struct ow_study *tmp = NULL;
	char p[OW_JPATH_LEN];
	enum ow_status st = ow_jin_object(j, b, path);
	int k;

	ow_spread_default(sp);
	sp->present = 1;
	if (st == OW_OK)
		st = ow_jin_keys(j, b, path, keys);
	if (st == OW_OK)
		st = parse_settings(j, b, path, sp);
	if (st == OW_OK && !(tmp = malloc(sizeof *tmp)))
		st = ow_diag_set(j->d, OW_ENOMEM, "out of memory");
	for (k = 0; st == OW_OK && k < OW_SK_CALIB; k++) {
		const cJSON *v = ow_jin_get(b, ow_spread_kind_name(k));
		struct ow_spread_input *in = &sp->in[sp->n];

		if (!v)
			continue;
		ow_jin_key(p, path, ow_spread_kind_name(k));
		st = parse_input(j, v, p, s, (enum ow_spread_kind)k, in);
		if (st == OW_OK)
			st = check_extremes(j, p, s, in, tmp);
		sp->n += st == OW_OK;
	}
	free(tmp);
	if (st == OW_OK)
		ow_spread_add_calib(sp, &s->calib);
	return st;
}

enum ow_status ow_config_spread(const struct ow_jin *j, const cJSON *o,
                                struct ow_study *s)
{
	const cJSON *b = ow_jin_get(o, "spread");

	ow_spread_default(&s->spread);
	return b ? parse_block(j, b, "spread", s) : OW_OK;
}

enum ow_status ow_config_spread_text(const struct ow_units *u, const char *text,
                                     const char *name, struct ow_study *s,
                                     struct ow_diag *d)
{
	struct ow_jin j = {u, name, "", NULL, s->screw.diameter_m, d};
	cJSON *b = cJSON_Parse(text);
	enum ow_status st;

	if (!b)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: expected a JSON object "
		                   "(the study's spread block)",
		                   name);
	st = parse_block(&j, b, "spread", s);
	cJSON_Delete(b);
	return st;
}
