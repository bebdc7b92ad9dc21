/* screw.c - screw geometry along the axis (unwound-channel forms of Tadmor &
 * Klein 1970 and Tadmor & Gogos 2006, ch. 9). */
#include "ow_screw.h"
#include "ow_const.h"

#include <math.h>
#include <stddef.h>

static const char *const section_names[] = {"feed", "taper", "metering",
                                            "barrier", "mixer"};

const char *ow_section_name(enum ow_section_type t)
{
	if ((int)t < 0 || t > OW_SEC_MIXER)
		return "?";
	return section_names[t];
}

/* tan(phi) = L_s / (pi D): the lead is the same at every radius, so the
 * helix steepens toward the root. */
double ow_screw_helix(const struct ow_screw *s, double dia_m)
{
	return atan(s->lead_m / (OW_PI * dia_m));
}

/* W = (L_s / p) cos(phi) - e, with e the land width normal to the flight. */
double ow_screw_width(const struct ow_screw *s, double dia_m)
{
	return s->lead_m / s->flights * cos(ow_screw_helix(s, dia_m)) -
	       s->flight_width_m;
}

double ow_screw_length(const struct ow_screw *s)
{
	return s->n_sections ? s->sections[s->n_sections - 1].end_m : 0.0;
}

double ow_screw_ld(const struct ow_screw *s)
{
	return ow_screw_length(s) / s->diameter_m;
}

int ow_screw_section_at(const struct ow_screw *s, double x_m)
{
	int i;

	for (i = 0; i < s->n_sections - 1; i++)
		if (x_m < s->sections[i].end_m)
			return i;
	return s->n_sections - 1;
}

/* Depth along a section: constant, or linear from depth_start to depth. */
static double section_depth(const struct ow_section *sec, double x_m)
{
	double f;

	if (sec->type == OW_SEC_MIXER)
		return sec->gap_m;
	if (sec->length_m <= 0.0)
		return sec->depth_m;
	f = (x_m - sec->start_m) / sec->length_m;
	f = f < 0.0 ? 0.0 : (f > 1.0 ? 1.0 : f);
	return sec->depth_start_m + (sec->depth_m - sec->depth_start_m) * f;
}

double ow_screw_depth(const struct ow_screw *s, double x_m)
{
	return section_depth(&s->sections[ow_screw_section_at(s, x_m)], x_m);
}

double ow_screw_clearance(const struct ow_screw *s, double x_m)
{
	double c = s->clearance_m;
	int i;

	for (i = 0; i < s->n_wear; i++)
		if (x_m >= s->wear[i].from_m && x_m <= s->wear[i].to_m &&
		    s->wear[i].clearance_m > c)
			c = s->wear[i].clearance_m;
	return c;
}

static int conveying(enum ow_section_type t)
{
	return t != OW_SEC_MIXER;
}

double ow_screw_feed_depth(const struct ow_screw *s)
{
	return s->sections[0].depth_start_m;
}

double ow_screw_meter_depth(const struct ow_screw *s)
{
	int i;

	for (i = s->n_sections - 1; i > 0; i--)
		if (conveying(s->sections[i].type))
			return s->sections[i].depth_m;
	return s->sections[0].depth_m;
}

double ow_screw_compression_depth(const struct ow_screw *s)
{
	return ow_screw_feed_depth(s) / ow_screw_meter_depth(s);
}

/* The annulus between root and bore has area pi H (D_b - H). */
double ow_screw_compression_area(const struct ow_screw *s)
{
	double hf = ow_screw_feed_depth(s), hm = ow_screw_meter_depth(s);
	double d = s->diameter_m;

	return hf * (d - hf) / (hm * (d - hm));
}

double ow_screw_free_area(const struct ow_screw *s, double x_m)
{
	double h = ow_screw_depth(s, x_m), d = s->diameter_m;
	double phim = ow_screw_helix(s, d - h);

	return OW_PI * h * (d - h) -
	       s->flights * s->flight_width_m * h / sin(phim);
}

static double last_depth(const struct ow_screw *s, int i)
{
	while (--i >= 0)
		if (conveying(s->sections[i].type))
			return s->sections[i].depth_m;
	return NAN;
}

static int bad_len(double x, double hi)
{
	return !isfinite(x) || x <= 0.0 || x >= hi;
}

static enum ow_status check_barrier(const struct ow_section *sec, int i,
                                    double radius, struct ow_diag *d)
{
	const struct {
		const char *key;
		double v;
	} depths[] = {{"solids_depth_start", sec->solids_depth_start_m},
	              {"solids_depth_end", sec->solids_depth_end_m},
	              {"melt_depth_start", sec->melt_depth_start_m},
	              {"melt_depth_end", sec->melt_depth_end_m}};
	size_t k;

	for (k = 0; k < 4; k++)
		if (bad_len(depths[k].v, radius))
			return ow_diag_set(d, OW_EINPUT,
			                   "sections[%d].%s: %g mm must be a "
			                   "positive depth below the screw "
			                   "radius",
			                   i, depths[k].key, depths[k].v * 1e3);
	if (!(sec->melt_share_start >= 0.0 && sec->melt_share_start < 0.9) ||
	    !(sec->melt_share_end > 0.0 && sec->melt_share_end < 0.9))
		return ow_diag_set(d, OW_EINPUT,
		                   "sections[%d].melt_share_start/end: %g, %g "
		                   "must lie in 0..0.9 (end above 0)",
		                   i, sec->melt_share_start,
		                   sec->melt_share_end);
	if (bad_len(sec->barrier_clearance_m, sec->solids_depth_start_m))
		return ow_diag_set(d, OW_EINPUT,
		                   "sections[%d].barrier_clearance: %g mm must "
		                   "be positive and below the channel depth",
		                   i, sec->barrier_clearance_m * 1e3);
	return OW_OK;
}

/* Derive start/end/depth_start of one section and check its own values. */
int ow_screw_default_lands(double diameter_m)
{
	double n = floor(OW_PI * diameter_m / 0.025 + 0.5);

	return n < 2.0 ? 2 : (n > 64.0 ? 64 : (int)n);
}

static enum ow_status prepare_section(struct ow_screw *s, int i, double x,
                                      struct ow_diag *d)
{
	struct ow_section *sec = &s->sections[i];
	double radius = 0.5 * s->diameter_m;

	if (!(isfinite(sec->length_m) && sec->length_m > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "sections[%d].length: %g mm must be a "
		                   "positive length",
		                   i, sec->length_m * 1e3);
	sec->start_m = x;
	sec->end_m = x + sec->length_m;
	if (sec->type == OW_SEC_MIXER) {
		if (bad_len(sec->gap_m, radius))
			return ow_diag_set(d, OW_EINPUT,
			                   "sections[%d].gap: %g mm must be a "
			                   "positive gap below the radius",
			                   i, sec->gap_m * 1e3);
		sec->depth_m = sec->depth_start_m = last_depth(s, i);
		sec->lands_given = sec->lands > 0;
		if (!sec->lands_given)
			sec->lands = ow_screw_default_lands(s->diameter_m);
		if (i == 0)
			return ow_diag_set(d, OW_EINPUT,
			                   "sections[0].type: a mixer cannot "
			                   "be the first section");
		return OW_OK;
	}
	if (sec->type == OW_SEC_BARRIER) {
		sec->depth_start_m = sec->solids_depth_start_m;
		sec->depth_m = sec->solids_depth_end_m;
		return check_barrier(sec, i, radius, d);
	}
	if (bad_len(sec->depth_m, radius))
		return ow_diag_set(
		    d, OW_EINPUT,
		    "sections[%d].depth: %g mm must be a positive "
		    "depth below the screw radius %g mm",
		    i, sec->depth_m * 1e3, radius * 1e3);
	sec->depth_start_m = sec->depth_m;
	if (sec->type == OW_SEC_TAPER) {
		if (i == 0)
			return ow_diag_set(d, OW_EINPUT,
			                   "sections[0].type: a taper needs a "
			                   "section before it to start from");
		sec->depth_start_m = last_depth(s, i);
	}
	return OW_OK;
}

static enum ow_status check_clearances(const struct ow_screw *s,
                                       struct ow_diag *d)
{
	int i;

	for (i = 0; i < s->n_sections; i++) {
		const struct ow_section *sec = &s->sections[i];
		double h = fmin(sec->depth_start_m, sec->depth_m);
		double c = fmax(ow_screw_clearance(s, sec->start_m),
		                ow_screw_clearance(s, sec->end_m));

		if (sec->type == OW_SEC_MIXER)
			continue;
		if (c >= h)
			return ow_diag_set(
			    d, OW_EINPUT,
			    "clearance: %g mm must be below the "
			    "channel depth %g mm of sections[%d]",
			    c * 1e3, h * 1e3, i);
	}
	return OW_OK;
}

static enum ow_status check_wear(const struct ow_screw *s, struct ow_diag *d)
{
	double len = ow_screw_length(s);
	int i;

	for (i = 0; i < s->n_wear; i++) {
		const struct ow_wear *w = &s->wear[i];

		if (!(w->from_m >= 0.0 && w->to_m > w->from_m &&
		      w->to_m <= len * (1.0 + 1e-9)))
			return ow_diag_set(d, OW_EINPUT,
			                   "wear[%d]: from %g mm to %g mm must "
			                   "be an increasing range inside the "
			                   "screw (0..%g mm)",
			                   i, w->from_m * 1e3, w->to_m * 1e3,
			                   len * 1e3);
		if (!(isfinite(w->clearance_m) && w->clearance_m >= 0.0))
			return ow_diag_set(
			    d, OW_EINPUT,
			    "wear[%d].clearance: %g mm must be a "
			    "length >= 0",
			    i, w->clearance_m * 1e3);
	}
	return OW_OK;
}

static enum ow_status check_body(const struct ow_screw *s, struct ow_diag *d)
{
	if (!(isfinite(s->diameter_m) && s->diameter_m >= 5e-3 &&
	      s->diameter_m <= 1.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "diameter: %g mm must lie in 5..1000 mm",
		                   s->diameter_m * 1e3);
	if (!(isfinite(s->lead_m) && s->lead_m > 0.1 * s->diameter_m &&
	      s->lead_m < 5.0 * s->diameter_m))
		return ow_diag_set(d, OW_EINPUT,
		                   "lead: %g mm must lie between 0.1 D and 5 D",
		                   s->lead_m * 1e3);
	if (s->flights < 1 || s->flights > 4)
		return ow_diag_set(d, OW_EINPUT, "flights: %d must be 1..4",
		                   s->flights);
	if (!(isfinite(s->flight_width_m) && s->flight_width_m >= 0.0) ||
	    ow_screw_width(s, s->diameter_m) <= 0.0)
		return ow_diag_set(d, OW_EINPUT,
		                   "flight_width: %g mm must be >= 0 and leave "
		                   "a channel between the flights (lead %g mm, "
		                   "%d flight(s))",
		                   s->flight_width_m * 1e3, s->lead_m * 1e3,
		                   s->flights);
	if (!(isfinite(s->clearance_m) && s->clearance_m >= 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "clearance: %g mm must be a length >= 0",
		                   s->clearance_m * 1e3);
	if (s->n_sections < 1 || s->n_sections > OW_MAX_SECTIONS)
		return ow_diag_set(d, OW_EINPUT,
		                   "sections: %d sections; expected 1..%d",
		                   s->n_sections, OW_MAX_SECTIONS);
	return OW_OK;
}

enum ow_status ow_screw_prepare(struct ow_screw *s, struct ow_diag *d)
{
	enum ow_status st = check_body(s, d);
	double x = 0.0;
	int i;

	for (i = 0; st == OW_OK && i < s->n_sections; i++) {
		st = prepare_section(s, i, x, d);
		x = s->sections[i].end_m;
	}
	if (st == OW_OK &&
	    ow_screw_width(s, s->diameter_m - 2.0 * ow_screw_feed_depth(s)) <=
	        0.0)
		st = ow_diag_set(d, OW_EINPUT,
		                 "flight_width: %g mm leaves no channel at the "
		                 "root of the feed section",
		                 s->flight_width_m * 1e3);
	if (st == OW_OK)
		st = check_wear(s, d);
	if (st == OW_OK)
		st = check_clearances(s, d);
	return st;
}
