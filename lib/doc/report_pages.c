/* report_pages.c - the chart pages of the report: the figure maps two to a
 * page, each with a caption that says what it shows and its limit, and
 * the axial profiles at the centre point. The charts themselves are drawn
 * by lib/maps on the page's canvas. */
#include "report_impl.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#define MAP_ASPECT (OW_MAPS_WIDTH_PT / OW_MAPS_HEIGHT_PT)
#define CAPTION_PT 8.0

/* What each map shows, and the check whose limit it carries. */
static const struct {
	const char *says;
	int check; /* -1: none */
} captions[OW_MAP_COUNT] = {
    [OW_MAP_PEAK_TEMP] = {"Hottest melt anywhere along the screw, across "
                          "the channel depth and in the melt film: where "
                          "the resin degrades first.",
                          OW_CK_PEAK_TEMP},
    [OW_MAP_UNMELT] = {"Share of the resin still solid at the screw tip. "
                       "Unmelted pellets reach the die and show as "
                       "defects.",
                       OW_CK_UNMELT},
    [OW_MAP_PRESSURE] = {"Highest pressure anywhere on the screw (it can "
                         "peak upstream of the tip). Keep it well below "
                         "the barrel's rupture-disc rating.",
                         OW_CK_PRESSURE},
    [OW_MAP_OUTPUT] = {"Throughput at which the pressure the screw builds "
                       "equals what the die and the screen pack need.",
                       -1},
    [OW_MAP_SEC] = {"Drive energy put into each unit "
                    "mass of resin (drive power over throughput).",
                    -1},
    [OW_MAP_ZONE_LOAD] = {"Largest share of a barrel zone's heating or "
                          "cooling power the point needs to hold the "
                          "set-points; above 100 % that zone cannot hold "
                          "its set-point and runs hotter (or colder).",
                          OW_CK_ZONE_CONTROL},
};

static void caption(struct rpt *r, enum ow_map_figure f)
{
	struct ow_doc_style st = {CAPTION_PT, 0, {0.2, 0.2, 0.22, 1.0}, 0.0};
	char text[600], lim[200];
	int c = captions[f].check;

	snprintf(text, sizeof text, "%s", captions[f].says);
	if (c >= 0 && ow_check_active(&r->s->line.limits, (enum ow_check)c)) {
		ow_report_limit_text(r, (enum ow_check)c, lim, sizeof lim);
		strncat(text, " Limit: ", sizeof text - strlen(text) - 1);
		strncat(text, lim, sizeof text - strlen(text) - 1);
		strncat(text, ".", sizeof text - strlen(text) - 1);
	}
	ow_doc_para(&r->doc, text, &st, 6.0);
}

/* One map in a box h high, centred in the column, then its caption. */
static void one_map(struct rpt *r, enum ow_map_figure f, double h)
{
	struct ow_maps_options mo;
	struct ow_rect box;

	if (r->doc.st != OW_OK)
		return;
	box = ow_report_map_box(r, h);
	ow_report_map_options(r, &mo);
	r->doc.st =
	    ow_maps_draw_figure(r->doc.cv, &box, f, r->m, &mo, r->doc.d);
	r->doc.y += h + 4.0;
	ow_doc_check(&r->doc);
	caption(r, f);
}

void ow_report_map_pages(struct rpt *r)
{
	double cw = r->doc.x1 - r->doc.x0, room, h;
	int f;

	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "Maps over the swept range", 300.0);
	/* two maps and their captions (about 3 lines each) per page */
	room = r->doc.y1 - r->doc.y -
	       2.0 * (4.0 + 4.0 * CAPTION_PT * OW_DOC_LINE + 6.0);
	h = fmin(cw / MAP_ASPECT, room / 2.0);
	for (f = 0; f < OW_MAP_COUNT && r->doc.st == OW_OK; f++) {
		if (f && f % 2 == 0)
			ow_doc_new_page(&r->doc);
		one_map(r, (enum ow_map_figure)f, h);
	}
}

/* ---- profiles ---------------------------------------------------------- */

static void centre_words(struct rpt *r, char *buf, size_t n)
{
	char rpm[32], set[48], zn[48];

	ow_report_format_bound(rpm, sizeof rpm, r->w->centre.rpm,
	                       OW_REPORT_RPM_DECIMALS, OW_ROUND_NEAREST);
	ow_report_format_bound(
	    set, sizeof set,
	    ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, r->w->centre_set_K),
	    OW_REPORT_TEMP_DECIMALS, OW_ROUND_NEAREST);
	snprintf(buf, n, "centre: %s rpm, %s at %s %s", rpm,
	         ow_report_zone_name(r, ow_line_reference_zone(&r->s->line), zn,
	                             sizeof zn),
	         set, ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
}

void ow_report_profile_page(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	struct ow_maps_options mo;
	struct ow_rect box;
	char sub[160], text[600];

	if (r->doc.st != OW_OK)
		return;
	if (r->w->empty || !r->m->profile || r->m->n_profile < 2) {
		ow_doc_heading(&r->doc, "Along the screw", 40.0);
		ow_doc_para(&r->doc,
		            r->w->empty
		                ? "No profile: the window is empty, so "
		                  "there is no centre point to show."
		                : "No profile was computed for this report.",
		            &st, 4.0);
		return;
	}
	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "Along the screw at the centre point", 400.0);
	centre_words(r, sub, sizeof sub);
	snprintf(text, sizeof text,
	         "Computed at the window's %s. From the "
	         "hopper (0 D) to the screw tip: pressure, bulk and peak melt "
	         "temperature, solid bed ratio (width of the solid bed over "
	         "the channel width) and unmelted fraction; the screw's "
	         "sections are drawn under the axis.",
	         sub);
	ow_doc_para(&r->doc, text, &st, 6.0);
	box.x = r->doc.x0;
	box.y = r->doc.y;
	box.w = r->doc.x1 - r->doc.x0;
	box.h = fmin(r->doc.y1 - r->doc.y, box.w * 1.25);
	ow_report_map_options(r, &mo);
	r->doc.st = ow_maps_draw_profile(r->doc.cv, &box, r->s, r->m->profile,
	                                 r->m->n_profile, sub, &mo, r->doc.d);
	r->doc.y = box.y + box.h;
	ow_doc_check(&r->doc);
}
