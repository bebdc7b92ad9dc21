/* report_front.c - page 1 of the report: title block, the recommended
 * window as a table (or, for an empty window, the limits that exclude the
 * most points), the line's current point, and the window map. */
#include "report_impl.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_classify.h"

#define MAP_ASPECT (OW_MAPS_WIDTH_PT / OW_MAPS_HEIGHT_PT)
#define MAP_MIN_H  250.0 /* below this the map goes to the next page */

void ow_report_map_options(const struct rpt *r, struct ow_maps_options *mo)
{
	ow_maps_default(mo);
	mo->units = r->doc.sys;
	mo->has_current = r->o->has_current;
	mo->current_rpm = r->o->current_rpm;
	mo->current_set_K = r->o->current_set_K;
}

struct ow_rect ow_report_map_box(const struct rpt *r, double h)
{
	double cw = r->doc.x1 - r->doc.x0;
	struct ow_rect box;

	box.w = fmin(cw, h * MAP_ASPECT);
	box.h = h;
	box.x = r->doc.x0 + (cw - box.w) / 2.0;
	box.y = r->doc.y;
	return box;
}

char *ow_report_zone_name(const struct rpt *r, int z, char *buf, size_t n)
{
	const struct ow_line *l = &r->s->line;
	double D = r->s->screw.diameter_m;
	double from = z ? l->zones[z - 1].to_m : 0.0;
	char a[32], b[32];

	ow_doc_num(a, sizeof a, from / D, 3);
	ow_doc_num(b, sizeof b, l->zones[z].to_m / D, 3);
	snprintf(buf, n, "zone %d (%s–%s D)", z + 1, a, b);
	return buf;
}

/* ---- banner and title block ------------------------------------------ */

static void banner(struct rpt *r)
{
	struct ow_doc_style kind = {7.5, 1, ow_doc_grey(0.40), 0.0};
	struct ow_doc_style title = {14.0, 1, ow_doc_ink(), 0.0};
	struct ow_doc_style note = {7.5, 0, ow_doc_grey(0.25), 0.0};

	ow_doc_para(&r->doc,
	            "OPERATING WINDOW REPORT  ·  SINGLE-SCREW EXTRUDER", &kind,
	            3.0);
	ow_doc_para(&r->doc, r->s->title, &title, 2.0);
	ow_doc_para(&r->doc,
	            "Estimates from published engineering models, not "
	            "measurements. Read the cautions at the end of this report "
	            "before setting the line.",
	            &note, 6.0);
	ow_report_calib_note(r);
}

/* One labelled cell of the title block: a small label, then the value
 * (or room to write one by hand). */
static void field(struct rpt *r, double x, double y, double w, double h,
                  const char *label, const char *value)
{
	struct ow_canvas *cv = r->doc.cv;
	char buf[512];
	const char *lines[3];
	int n, k;

	ow_canvas_set_colour(cv, ow_doc_grey(0.45));
	ow_canvas_set_line_width(cv, 0.6);
	ow_canvas_rect(cv, x, y, w, h);
	ow_canvas_stroke(cv);
	ow_canvas_set_font(cv, 6.5, 1);
	ow_canvas_text(cv, x + 4.0, y + 8.5, label, OW_ALIGN_LEFT,
	               OW_VALIGN_BASELINE, 0.0);
	if (!value || !*value)
		return; /* left blank to fill in */
	n = ow_doc_wrap(&r->doc, value, w - 8.0, 9.0, 0, buf, sizeof buf, lines,
	                2);
	ow_canvas_set_colour(cv, ow_doc_ink());
	ow_canvas_set_font(cv, 9.0, 0);
	for (k = 0; k < n; k++)
		ow_canvas_text(cv, x + 4.0, y + 19.0 + 10.5 * k, lines[k],
		               OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0.0);
}

static void title_block(struct rpt *r)
{
	double x = r->doc.x0, w = r->doc.x1 - r->doc.x0, y, q = w / 4.0;
	const struct ow_report_options *o = r->o;

	ow_doc_need(&r->doc, 64.0);
	y = r->doc.y;
	field(r, x, y, w / 2.0, 34.0, "SCREW", r->s->screw.name);
	field(r, x + w / 2.0, y, w / 2.0, 34.0, "RESIN", r->s->resin.name);
	y += 34.0;
	field(r, x, y, q, 30.0, "DATE", o->date);
	field(r, x + q, y, q, 30.0, "REVISION", o->revision);
	field(r, x + 2 * q, y, q, 30.0, "PREPARED BY", o->prepared_by);
	field(r, x + 3 * q, y, q, 30.0, "APPROVED BY", o->approved_by);
	r->doc.y = y + 30.0;
	ow_doc_check(&r->doc);
}

/* ---- the window table --------------------------------------------------- */

/* The centre point's figures: as the map solved it alone, else the lattice
 * point's when the sweep solved it; NULL when neither. */
static const struct ow_point *centre_point(const struct rpt *r)
{
	int i;

	if (r->m->has_centre)
		return &r->m->centre;
	for (i = 0; i < r->g->n_rpm * r->g->n_axis; i++) {
		const struct ow_grid_point *p = &r->g->pts[i];

		if (p->rpm == r->w->centre.rpm && p->axis == r->w->centre.axis)
			return p->solved == 1 ? &p->pt : NULL;
	}
	return NULL;
}

void ow_report_range(const struct rpt *r, enum ow_dim dim, double lo, double hi,
                     double centre, int decimals, char out[3][32])
{
	double a = ow_doc_shown(&r->doc, dim, lo),
	       b = ow_doc_shown(&r->doc, dim, hi);
	int dec;

	/* inwards, so the printed range lies inside the computed one; one
	 * more decimal while that would turn the range over */
	for (dec = decimals; dec <= decimals + 2; dec++) {
		ow_report_format_bound(out[0], 32, a, dec, OW_ROUND_UP);
		ow_report_format_bound(out[1], 32, b, dec, OW_ROUND_DOWN);
		if (ceil(a * pow(10.0, dec) - 1e-6) <=
		    floor(b * pow(10.0, dec) + 1e-6))
			break;
	}
	ow_report_format_bound(out[2], 32, ow_doc_shown(&r->doc, dim, centre),
	                       dec > decimals + 2 ? decimals + 2 : dec,
	                       OW_ROUND_NEAREST);
}

static void row5(struct rpt *r, const struct ow_doc_table *t, const char *what,
                 const char *lo, const char *hi, const char *unit,
                 const char *centre, int shade)
{
	const char *cells[5] = {what, lo, hi, unit, centre};

	ow_doc_table_row(&r->doc, t, cells, shade);
}

static void zone_rows(struct rpt *r, const struct ow_doc_table *t)
{
	const struct ow_line *l = &r->s->line;
	int ref = ow_line_reference_zone(l), z;
	double set_K[OW_MAX_ZONES];
	char what[96], zn[48], v[3][32];

	ow_line_apply_axis(l, r->w->centre.axis, set_K);
	for (z = 0; z < l->n_zones; z++) {
		snprintf(what, sizeof what, "Barrel %s set-point%s",
		         ow_report_zone_name(r, z, zn, sizeof zn),
		         z == ref ? ", map axis" : "");
		ow_report_range(r, OW_DIM_TEMPERATURE, r->w->zone_min_K[z],
		                r->w->zone_max_K[z], set_K[z],
		                OW_REPORT_TEMP_DECIMALS, v);
		row5(r, t, what, v[0], v[1],
		     ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE), v[2], z == ref);
	}
}

/* Expected results over the rectangle, and at its centre. */
static void result_rows(struct rpt *r, const struct ow_doc_table *t)
{
	const struct ow_point *cp = centre_point(r);
	const struct ow_window *w = r->w;
	const char *T = ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE);
	char lo[32], hi[32], c[32];

	ow_doc_fix(lo, sizeof lo,
	           ow_doc_shown(&r->doc, OW_DIM_MASS_FLOW, w->output_min_kg_s),
	           1);
	ow_doc_fix(hi, sizeof hi,
	           ow_doc_shown(&r->doc, OW_DIM_MASS_FLOW, w->output_max_kg_s),
	           1);
	ow_doc_fix(c, sizeof c,
	           cp ? ow_doc_shown(&r->doc, OW_DIM_MASS_FLOW, cp->output_kg_s)
	              : NAN,
	           1);
	row5(r, t, "Throughput (expected)", lo, hi,
	     ow_doc_unit(&r->doc, OW_DIM_MASS_FLOW), c, 0);
	ow_doc_fix(lo, sizeof lo,
	           ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->melt_min_K), 0);
	ow_doc_fix(hi, sizeof hi,
	           ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->melt_max_K), 0);
	ow_doc_fix(
	    c, sizeof c,
	    cp ? ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, cp->discharge_bulk_K)
	       : NAN,
	    0);
	row5(r, t, "Melt temperature at discharge (bulk, expected)", lo, hi, T,
	     c, 0);
	ow_doc_fix(hi, sizeof hi,
	           ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->peak_max_K), 0);
	ow_doc_fix(c, sizeof c,
	           cp ? ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, cp->peak_K)
	              : NAN,
	           0);
	row5(r, t, "Hottest melt anywhere (peak, expected)", "", hi, T, c, 0);
}

char *ow_report_limit_text(struct rpt *r, enum ow_check c, char *buf, size_t n)
{
	static const enum ow_dim dims[OW_CK_LIMITS] = {
	    OW_DIM_TEMPERATURE, OW_DIM_NONE,      OW_DIM_PRESSURE,
	    OW_DIM_POWER,       OW_DIM_TORQUE,    OW_DIM_TEMPERATURE,
	    OW_DIM_MASS_FLOW,   OW_DIM_MASS_FLOW, OW_DIM_NONE,
	    OW_DIM_NONE};
	double v = ow_check_limit(&r->s->line.limits, c);
	char q[64];

	if ((int)c >= OW_CK_LIMITS || !isfinite(v)) {
		snprintf(buf, n, "%s (always unsafe)", ow_check_text(c));
		return buf;
	}
	if (c == OW_CK_UNMELT || c == OW_CK_ZONE_CONTROL) {
		ow_doc_num(q, sizeof q, v * 100.0, 3);
		strcat(q, " %");
	} else {
		ow_doc_qty(&r->doc, q, sizeof q, dims[c], v, 4);
	}
	if (c == OW_CK_ZONE_CONTROL) /* the limit is on the zone load */
		snprintf(buf, n, "%s %s %s of its heating or cooling power",
		         ow_check_text(c), ow_check_relation(c), q);
	else
		snprintf(buf, n, "%s %s %s", ow_check_text(c),
		         ow_check_relation(c), q);
	return buf;
}

/* The limits that are set, as one sentence. */
static void limits_sentence(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	char buf[1024], one[160];
	int c, n = 0;

	snprintf(buf, sizeof buf, "Limits applied: ");
	for (c = 0; c < OW_CK_LIMITS; c++) {
		if (!ow_check_active(&r->s->line.limits, (enum ow_check)c))
			continue;
		ow_report_limit_text(r, (enum ow_check)c, one, sizeof one);
		strncat(buf, n++ ? "; " : "", sizeof buf - strlen(buf) - 1);
		strncat(buf, one, sizeof buf - strlen(buf) - 1);
	}
	strncat(buf,
	        n ? ". Solid bed plugging, a starved feed and a point "
	            "that did not converge are always unsafe."
	          : "none set; only plugging, a starved feed and "
	            "non-convergence count as unsafe.",
	        sizeof buf - strlen(buf) - 1);
	st.size_pt = 7.5;
	ow_doc_para(&r->doc, buf, &st, 2.0);
}

static const char *axis_words(const struct rpt *r, char *buf, size_t n)
{
	const struct ow_axes *a = &r->s->line.axes;
	char zn[48];

	if (a->mode == OW_AXIS_SHIFT)
		snprintf(buf, n,
		         "The map's set-point axis moves every heated "
		         "zone by the same amount; the table gives each "
		         "zone's resulting range.");
	else if (a->mode == OW_AXIS_SET)
		snprintf(buf, n,
		         "The map's set-point axis sets zones %d to %d "
		         "to one common value; the other zones keep their "
		         "set-points.",
		         a->zones_from + 1, r->s->line.n_zones);
	else
		snprintf(buf, n,
		         "The map's set-point axis varies %s only; the "
		         "other zones keep their set-points.",
		         ow_report_zone_name(r, a->zone, zn, sizeof zn));
	return buf;
}

/* One row of the bounds table: which bound, its value as the window table
 * prints it, what sets it and how finely it is located. */
static void setter_row(struct rpt *r, const struct ow_doc_table *t,
                       const char *what, const char *value,
                       enum ow_window_side side)
{
	const struct ow_window_bound *b = &r->w->bound[side];
	int rpm = side == OW_WB_RPM_MIN || side == OW_WB_RPM_MAX;
	char why[300], lim[160], res[48];
	const char *cells[4] = {what, value, why, res};

	ow_window_setter_text(b->check, why, sizeof why);
	if (b->check >= 0 && b->check < OW_CK_LIMITS) {
		ow_report_limit_text(r, (enum ow_check)b->check, lim,
		                     sizeof lim);
		snprintf(why + strlen(why), sizeof why - strlen(why), " (%s)",
		         lim);
	}
	if (b->check == OW_WINDOW_SWEEP_EDGE)
		snprintf(res, sizeof res, "—");
	else if (rpm)
		snprintf(res, sizeof res, "%g rpm", b->resolution);
	else
		ow_doc_qty(&r->doc, res, sizeof res, OW_DIM_TEMP_DIFF,
		           b->resolution, 2);
	ow_doc_table_row(&r->doc, t, cells, b->check == OW_WINDOW_SWEEP_EDGE);
}

/* What sets each bound (shaded: the sweep's edge, not a limit) and, when
 * the window touches the sweep's edge, the note saying so. */
static void setters_table(struct rpt *r, const char (*v)[32],
                          const char (*z)[32])
{
	struct ow_doc_table t = {
	    4,
	    {"Bound", "Value", "Set by", "Located within"},
	    {0.27, 0.11, 0.46, 0.16},
	    {OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_LEFT, OW_ALIGN_RIGHT},
	    8.0,
	    0};
	struct ow_doc_style st = ow_doc_body();
	char a[160], b[160];
	const char *T = ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE);

	r->doc.y -= 2.0;
	ow_doc_table_head(&r->doc, &t);
	snprintf(a, sizeof a, "%s rpm", v[0]);
	snprintf(b, sizeof b, "%s rpm", v[1]);
	setter_row(r, &t, "Screw speed, lowest", a, OW_WB_RPM_MIN);
	setter_row(r, &t, "Screw speed, highest", b, OW_WB_RPM_MAX);
	snprintf(a, sizeof a, "%s %s", z[0], T);
	snprintf(b, sizeof b, "%s %s", z[1], T);
	setter_row(r, &t, "Map-axis set-point, lowest", a, OW_WB_SET_MIN);
	setter_row(r, &t, "Map-axis set-point, highest", b, OW_WB_SET_MAX);
	ow_doc_table_end(&r->doc);
	if (!r->w->at_sweep_edge)
		return;
	st.bold = 1;
	st.colour = ow_rgb(0.55, 0.05, 0.05);
	st.size_pt = 8.0;
	ow_doc_para(&r->doc, OW_WINDOW_SWEEP_EDGE_NOTE, &st, 2.0);
}

static void window_table(struct rpt *r)
{
	struct ow_doc_table t = {5,
	                         {"Setting or expected result", "Minimum",
	                          "Maximum", "Unit", "Centre point"},
	                         {0.52, 0.12, 0.12, 0.08, 0.16},
	                         {OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT,
	                          OW_ALIGN_LEFT, OW_ALIGN_RIGHT},
	                         8.5,
	                         0};
	struct ow_doc_style st = ow_doc_body();
	char v[3][32], z[3][32], text[1100], ax[300];

	ow_doc_heading(&r->doc, "Recommended operating window", 120.0);
	r->doc.y -= 4.0;
	t.first_bold = 1;
	ow_doc_table_head(&r->doc, &t);
	ow_report_range(r, OW_DIM_ROT_SPEED, r->w->rpm_min, r->w->rpm_max,
	                r->w->centre.rpm, OW_REPORT_RPM_DECIMALS, v);
	row5(r, &t, "Screw speed", v[0], v[1], "rpm", v[2], 1);
	zone_rows(r, &t);
	t.first_bold = 0;
	result_rows(r, &t);
	ow_doc_table_end(&r->doc);
	ow_report_range(r, OW_DIM_TEMPERATURE, r->w->set_min_K, r->w->set_max_K,
	                r->w->centre_set_K, OW_REPORT_TEMP_DECIMALS, z);
	setters_table(r, (const char(*)[32])v, (const char(*)[32])z);
	snprintf(text, sizeof text,
	         "Every setting inside this window "
	         "passes every limit (%.0f %% of the swept points do). Each "
	         "bound is placed where the limit that sets it is crossed, "
	         "found between the solved points, and rounded towards the "
	         "inside to a whole rpm and a whole degree of the map-axis "
	         "zone, so it does not depend on the grid of the map. Start "
	         "at the centre point: of the whole-step settings in the "
	         "window it lies farthest from the window's edge. %s",
	         100.0 * r->w->safe_fraction, axis_words(r, ax, sizeof ax));
	st.size_pt = 7.5;
	ow_doc_para(&r->doc, text, &st, 2.0);
	limits_sentence(r);
}

/* ---- an empty window ---------------------------------------------------- */

static void no_window(struct rpt *r)
{
	struct ow_doc_table t = {
	    3,
	    {"Limit", "Points failing", "Share"},
	    {0.64, 0.18, 0.18},
	    {OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT},
	    9.0,
	    0};
	struct ow_doc_style big = {12.0, 1, ow_rgb(0.55, 0.05, 0.05), 0.0};
	struct ow_doc_style st = ow_doc_body();
	enum ow_check order[OW_CK_COUNT];
	int n = ow_window_binding(r->w, order), total, k;
	char text[400], lim[200], cnt[32], pct[32];

	total = r->g->n_rpm * r->g->n_axis;
	ow_doc_heading(&r->doc, "Recommended operating window", 120.0);
	ow_doc_para(&r->doc,
	            "No safe operating point exists in the swept range.", &big,
	            4.0);
	snprintf(text, sizeof text,
	         "None of the %d mapped points passes every "
	         "limit, so this report recommends no settings. The limits "
	         "that exclude the most points:",
	         total);
	ow_doc_para(&r->doc, text, &st, 4.0);
	ow_doc_table_head(&r->doc, &t);
	for (k = 0; k < n; k++) {
		const char *cells[3] = {lim, cnt, pct};

		ow_report_limit_text(r, order[k], lim, sizeof lim);
		snprintf(cnt, sizeof cnt, "%d", r->w->fail_count[order[k]]);
		snprintf(pct, sizeof pct, "%.0f %%",
		         100.0 * r->w->fail_count[order[k]] / total);
		ow_doc_table_row(&r->doc, &t, cells, k == 0);
	}
	ow_doc_table_end(&r->doc);
	st.size_pt = OW_DOC_SMALL_PT;
	ow_doc_para(&r->doc,
	            "A point can fail several limits at once, so the shares "
	            "add up to more than 100 %. To find a window: sweep other "
	            "speeds or set-points, or change the die, the screw or the "
	            "resin. Raise a limit only where the machine builder's "
	            "ratings allow it.",
	            &st, 4.0);
}

/* ---- the current operating point ---------------------------------------- */

/* The verdict at the current point from the margins interpolated between
 * solved points (never a neighbour's), or that it lies off the map. */
static void verdict_words(struct rpt *r, double rpm, double set_K, char *buf,
                          size_t n)
{
	const struct ow_grid *g = r->g;
	const struct ow_grid_point *a = &g->pts[0];
	const struct ow_grid_point *b = &g->pts[g->n_rpm * g->n_axis - 1];
	char x[3][32];
	unsigned bits = 0;
	int inside = 0, c, k = 0;

	if (ow_window_verdict_at(r->s, g, rpm, set_K, &inside, &bits,
	                         r->doc.d) != OW_OK)
		r->doc.st = OW_ENOMEM;
	if (!inside) {
		ow_report_range(r, OW_DIM_TEMPERATURE, a->set_ref_K,
		                b->set_ref_K, a->set_ref_K,
		                OW_REPORT_TEMP_DECIMALS, x);
		snprintf(buf, n,
		         "it lies outside the swept range (%.0f–%.0f rpm, "
		         "%s–%s %s), where the map says nothing: widen the "
		         "sweep to judge it",
		         a->rpm, b->rpm, x[0], x[1],
		         ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
		return;
	}
	if (!bits) {
		snprintf(buf, n, "it passes every limit there");
		return;
	}
	snprintf(buf, n, "there it fails: ");
	for (c = 0; c < OW_CK_COUNT; c++)
		if (bits >> c & 1u) {
			strncat(buf, k++ ? ", " : "", n - strlen(buf) - 1);
			strncat(buf, ow_check_failure((enum ow_check)c),
			        n - strlen(buf) - 1);
		}
}

static void current_point(struct rpt *r)
{
	const struct ow_report_options *o = r->o;
	const struct ow_window *w = r->w;
	struct ow_doc_style st = ow_doc_body();
	char rpm[32], set[48], verdict[300], text[600];
	int inside;

	if (!o->has_current || r->doc.st != OW_OK)
		return;
	inside = !w->empty && o->current_rpm >= w->rpm_min - 1e-9 &&
	         o->current_rpm <= w->rpm_max + 1e-9 &&
	         o->current_set_K >= w->set_min_K - 1e-9 &&
	         o->current_set_K <= w->set_max_K + 1e-9;
	verdict_words(r, o->current_rpm, o->current_set_K, verdict,
	              sizeof verdict);
	ow_doc_exact(rpm, sizeof rpm, o->current_rpm);
	ow_doc_exact(
	    set, sizeof set,
	    ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, o->current_set_K));
	strcat(set, " ");
	strcat(set, ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	snprintf(text, sizeof text,
	         "Current operating point: %s rpm with the "
	         "map-axis zone at %s — %s the recommended window; %s.",
	         rpm, set, inside ? "inside" : "outside", verdict);
	st.bold = 1;
	ow_doc_para(&r->doc, text, &st, 4.0);
}

/* ---- the window map ----------------------------------------------------- */

static void window_map(struct rpt *r)
{
	struct ow_maps_options mo;
	struct ow_rect box;
	double w = r->doc.x1 - r->doc.x0, h = w / MAP_ASPECT;

	if (r->doc.st != OW_OK)
		return;
	if (r->doc.y1 - r->doc.y - 4.0 < fmin(MAP_MIN_H, h)) {
		/* a page of its own: the map fills it, not a third of it */
		ow_doc_new_page(&r->doc);
		h = fmax(h, fmin(r->doc.y1 - r->doc.y - 4.0, 1.15 * w));
	}
	h = fmin(h, r->doc.y1 - r->doc.y - 4.0);
	box.x = r->doc.x0;
	box.y = r->doc.y + 4.0;
	box.w = fmin(w, fmax(h, w / MAP_ASPECT) * MAP_ASPECT * 1.08);
	box.x += (w - box.w) / 2.0;
	box.h = h;
	ow_report_map_options(r, &mo);
	if (r->doc.st == OW_OK)
		r->doc.st =
		    ow_maps_draw_window(r->doc.cv, &box, r->m, &mo, r->doc.d);
	r->doc.y = box.y + box.h + 6.0;
	ow_doc_check(&r->doc);
}

void ow_report_front_page(struct rpt *r)
{
	ow_doc_new_page(&r->doc);
	banner(r);
	title_block(r);
	if (r->w->empty)
		no_window(r);
	else
		window_table(r);
	current_point(r);
	window_map(r);
	ow_doc_check(&r->doc);
}
