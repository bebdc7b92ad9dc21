/* report_spread.c - the report's page on the window that holds across the
 * spread of the inputs: what was varied and how, the robust window beside
 * the nominal one, the inputs that shrink it the most, the map of the
 * share of safe samples, and what the sampling does not cover. Only when
 * the map was run with a spread. */
#include "report_impl.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_spread.h"

#define MAP_ASPECT (OW_MAPS_WIDTH_PT / OW_MAPS_HEIGHT_PT)

/* "0.85 - 1.15", "-3 - +3 K", in the reader's units. */
static void input_range(struct rpt *r, const struct ow_spread_input *in,
                        char *buf, size_t n)
{
	double lo, hi;
	char a[48], b[48];

	ow_spread_extent(in, &lo, &hi);
	if (in->kind == OW_SK_MELTING || in->kind == OW_SK_FEED_TEMP) {
		ow_doc_qty(&r->doc, a, sizeof a, OW_DIM_TEMP_DIFF, lo, 3);
		ow_doc_qty(&r->doc, b, sizeof b, OW_DIM_TEMP_DIFF, hi, 3);
		snprintf(buf, n, "shift %s to %s", a, b);
	} else if (in->kind == OW_SK_CLEARANCE) {
		ow_doc_qty(&r->doc, a, sizeof a, OW_DIM_LENGTH, lo, 3);
		ow_doc_qty(&r->doc, b, sizeof b, OW_DIM_LENGTH, hi, 3);
		snprintf(buf, n, "%s to %s", a, b);
	} else {
		snprintf(buf, n, "x %s to x %s", ow_doc_num(a, sizeof a, lo, 3),
		         ow_doc_num(b, sizeof b, hi, 3));
	}
}

static void inputs_table(struct rpt *r)
{
	const struct ow_spread *sp = &r->s->spread;
	struct ow_doc_table t = {3,
	                         {"input", "distribution", "range"},
	                         {0.4, 0.25, 0.35},
	                         {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         1};
	char range[128], dist[64];
	int i;

	ow_doc_table_head(&r->doc, &t);
	for (i = 0; i < sp->n && r->doc.st == OW_OK; i++) {
		const char *cells[3] = {sp->in[i].name, dist, range};

		input_range(r, &sp->in[i], range, sizeof range);
		snprintf(dist, sizeof dist, "%s",
		         sp->in[i].normal ? "normal, cut at 3 sd" : "uniform");
		ow_doc_table_row(&r->doc, &t, cells, 0);
	}
	ow_doc_table_end(&r->doc);
}

static void window_row(struct rpt *r, const struct ow_doc_table *t,
                       const char *name, const struct ow_window *w)
{
	char rpm[3][32], set[3][32], share[32], a[72], b[72];
	const char *cells[4] = {name, a, b, share};

	snprintf(share, sizeof share, "%.0f %%", 100.0 * w->safe_fraction);
	if (w->empty) {
		cells[1] = cells[2] = "empty";
	} else {
		ow_report_range(r, OW_DIM_ROT_SPEED, w->rpm_min, w->rpm_max,
		                NAN, OW_REPORT_RPM_DECIMALS, rpm);
		ow_report_range(r, OW_DIM_TEMPERATURE, w->set_min_K,
		                w->set_max_K, NAN, OW_REPORT_TEMP_DECIMALS,
		                set);
		snprintf(a, sizeof a, "%s – %s %s", rpm[0], rpm[1],
		         ow_doc_unit(&r->doc, OW_DIM_ROT_SPEED));
		snprintf(b, sizeof b, "%s – %s %s", set[0], set[1],
		         ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	}
	ow_doc_table_row(&r->doc, t, cells, 0);
}

static void windows_table(struct rpt *r)
{
	struct ow_doc_table t = {
	    4,
	    {"window", "screw speed", "axis set-point", "share of the map"},
	    {0.3, 0.25, 0.25, 0.2},
	    {OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT},
	    OW_DOC_SMALL_PT,
	    1};
	char name[64];

	snprintf(name, sizeof name, "robust (%.0f %% of samples safe)",
	         100.0 * r->m->spread->level);
	ow_doc_table_head(&r->doc, &t);
	window_row(r, &t, "nominal", r->w);
	window_row(r, &t, name, r->m->robust);
	ow_doc_table_end(&r->doc);
}

static void ranking_words(struct rpt *r)
{
	const struct ow_spread_result *res = r->m->spread;
	struct ow_doc_style st = ow_doc_body();
	char text[1200];
	size_t used;
	int i;

	used = (size_t)snprintf(text, sizeof text,
	                        "Inputs by how strongly they move the "
	                        "smallest margin where the samples disagree "
	                        "(correlation over those samples):");
	for (i = 0; i < res->n_rank && used < sizeof text; i++)
		used += (size_t)snprintf(
		    text + used, sizeof text - used, "%s %s %+.2f (%s)",
		    i ? ";" : "", r->s->spread.in[res->rank[i].input].name,
		    res->rank[i].corr,
		    res->rank[i].corr < 0 ? "a higher value shrinks the "
		                            "window"
		                          : "a lower value shrinks the "
		                            "window");
	if (!res->n_rank)
		snprintf(text + used, sizeof text - used,
		         " none moves it within the sampled range.");
	else if (used < sizeof text)
		snprintf(text + used, sizeof text - used, ".");
	ow_doc_para(&r->doc, text, &st, 6.0);
}

static void share_map(struct rpt *r)
{
	struct ow_maps_options mo;
	double cw = r->doc.x1 - r->doc.x0, h = fmin(cw / MAP_ASPECT, 300.0);
	struct ow_rect box;

	ow_doc_need(&r->doc, h);
	if (r->doc.st != OW_OK)
		return;
	box = ow_report_map_box(r, h);
	ow_report_map_options(r, &mo);
	r->doc.st = ow_maps_draw_share(r->doc.cv, &box, r->m, &mo, r->doc.d);
	r->doc.y += h + 6.0;
	ow_doc_check(&r->doc);
}

void ow_report_spread_page(struct rpt *r)
{
	const struct ow_spread_result *res = r->m->spread;
	struct ow_doc_style st = ow_doc_body();
	char text[900];

	if (!res || !r->m->robust || r->doc.st != OW_OK)
		return;
	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "The window across the spread of the inputs",
	               200.0);
	snprintf(text, sizeof text,
	         "Each grid point was solved again for %d samples of the "
	         "inputs below (a Latin hypercube, seed %lu: the same seed "
	         "gives the same samples). Points whose margins are larger "
	         "than the spread can move them were not sampled (%d of %d "
	         "sample solves saved). The robust window is the largest "
	         "rectangle in which at least %.0f %% of the samples are "
	         "safe at every point.",
	         res->samples, res->seed, res->solves_saved,
	         res->solves_saved + res->solves, 100.0 * res->level);
	ow_doc_para(&r->doc, text, &st, 6.0);
	inputs_table(r);
	windows_table(r);
	ranking_words(r);
	share_map(r);
	ow_doc_para(
	    &r->doc,
	    "Caution: the samples cover only the inputs listed, over the "
	    "ranges stated; a resin lot, a worn screw or a season outside "
	    "them can move the limits further. Hot melt and head "
	    "pressure can injure: confirm a new setting on the line with "
	    "the pressure and temperature alarms armed.",
	    &st, 6.0);
}
