/* advise.c - common-practice warnings about screw geometry. */
#include "ow_advise.h"

#include <stdio.h>
#include <string.h>

#define NEW_CLEARANCE_D 0.001 /* radial, per diameter: common practice */

struct sink {
	struct ow_warning *out;
	int n, max;
};

static void add(struct sink *k, const char *code, const char *text)
{
	if (k->n >= k->max)
		return;
	snprintf(k->out[k->n].code, sizeof k->out[k->n].code, "%s", code);
	snprintf(k->out[k->n].text, sizeof k->out[k->n].text,
	         "%s (rule of thumb, common practice)", text);
	k->n++;
}

/* A depth change between conveying sections happens over a taper or barrier
 * section's length, or abruptly (zero length) at a section boundary. */
static void check_compression(const struct ow_screw *s, struct sink *k)
{
	double D = s->diameter_m;
	char t[200];
	int i;

	for (i = 0; i < s->n_sections; i++) {
		const struct ow_section *sec = &s->sections[i];
		double dh = sec->depth_start_m - sec->depth_m;
		double len = sec->length_m;

		if (sec->type == OW_SEC_MIXER || sec->type == OW_SEC_FEED ||
		    sec->type == OW_SEC_METERING)
			continue;
		if (dh > 0.05 * sec->depth_start_m && len < D) {
			snprintf(t, sizeof t,
			         "sections[%d] (%s) compresses the channel "
			         "from %.2f to %.2f mm over %.2f D, less than "
			         "one diameter: risk of solid bed plugging",
			         i, ow_section_name(sec->type),
			         sec->depth_start_m * 1e3, sec->depth_m * 1e3,
			         len / D);
			add(k, "abrupt_compression", t);
		}
	}
	for (i = 1; i < s->n_sections; i++) {
		const struct ow_section *a = &s->sections[i - 1];
		const struct ow_section *b = &s->sections[i];

		if (a->type == OW_SEC_MIXER || b->type == OW_SEC_MIXER ||
		    b->type == OW_SEC_TAPER)
			continue;
		if (b->depth_start_m < 0.95 * a->depth_m) {
			snprintf(t, sizeof t,
			         "the depth steps from %.2f to %.2f mm at the "
			         "start of sections[%d] with no taper: "
			         "compression over less than one diameter",
			         a->depth_m * 1e3, b->depth_start_m * 1e3, i);
			add(k, "abrupt_compression", t);
		}
	}
}

static void check_clearance(const struct ow_screw *s, struct sink *k)
{
	double D = s->diameter_m, limit = 2.0 * NEW_CLEARANCE_D * D;
	char t[200];
	int i;

	if (s->clearance_m > limit) {
		snprintf(t, sizeof t,
		         "flight clearance %.3f mm is above twice the usual "
		         "new clearance of about 0.001 D (%.3f mm): worn",
		         s->clearance_m * 1e3, NEW_CLEARANCE_D * D * 1e3);
		add(k, "worn", t);
	}
	for (i = 0; i < s->n_wear; i++) {
		if (s->wear[i].clearance_m <= limit)
			continue;
		snprintf(t, sizeof t,
		         "wear[%d]: clearance %.3f mm from %.1f to %.1f D is "
		         "above twice the usual new clearance of about "
		         "0.001 D (%.3f mm): worn",
		         i, s->wear[i].clearance_m * 1e3, s->wear[i].from_m / D,
		         s->wear[i].to_m / D, NEW_CLEARANCE_D * D * 1e3);
		add(k, "worn", t);
	}
}

static void check_ratios(const struct ow_screw *s, struct sink *k)
{
	double D = s->diameter_m, hf = ow_screw_feed_depth(s);
	double cr = ow_screw_compression_depth(s);
	char t[200];

	if (hf < 0.1 * D || hf > 0.25 * D) {
		snprintf(t, sizeof t,
		         "feed depth %.2f mm is %.3f D, outside the usual "
		         "0.1..0.25 D",
		         hf * 1e3, hf / D);
		add(k, "feed_depth", t);
	}
	if (cr < 1.5 || cr > 4.5) {
		snprintf(t, sizeof t,
		         "depth compression ratio %.2f is outside the usual "
		         "1.5..4.5",
		         cr);
		add(k, "compression_ratio", t);
	}
}

/* A mixer whose file does not give its lands runs on the default. */
static void check_lands(const struct ow_screw *s, struct sink *k)
{
	char t[200];
	int i;

	for (i = 0; i < s->n_sections; i++) {
		const struct ow_section *sec = &s->sections[i];

		if (sec->type != OW_SEC_MIXER || sec->lands_given)
			continue;
		snprintf(t, sizeof t,
		         "sections[%d] (mixer) does not give its lands: %d "
		         "taken (one barrier land per 25 mm of barrel "
		         "circumference, common practice)",
		         i, sec->lands);
		add(k, "mixer_lands", t);
	}
}

int ow_advise_screw(const struct ow_screw *s, struct ow_warning *out, int max)
{
	struct sink k = {out, 0, max};

	check_lands(s, &k);
	check_compression(s, &k);
	check_clearance(s, &k);
	check_ratios(s, &k);
	return k.n;
}
