/* compare_pdf.c - the comparison PDF (A4, laid out on the document
 * layer, doc_impl.h): a title block naming both studies, the
 * three windows side by side, the overlay map, where and why the windows
 * differ, both cases at the centre points, the input fields that differ,
 * both inputs side by side, and cautions. Every page carries "page N of
 * M", the date and the program version. */
#include "doc_impl.h"

#include "ow_compare.h"
#include "ow_maps.h"
#include "ow_report.h"
#include "ow_version.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MAX_FIELDS 400

/* One comparison being laid out: the document and what it shows. */
struct cpdf {
	struct ow_doc doc;
	const struct ow_compare *cmp;
	const struct ow_compare_draw_options *o;
};

/* Short name of case k ("A" unless given). */
static const char *label(const struct cpdf *r, int k)
{
	const char *l = r->o->label[k];

	return l && *l ? l : (k ? "B" : "A");
}

/* A wrapped paragraph in the text colour, after points below it. */
static void para(struct cpdf *r, const char *text, double size, int bold,
                 double after)
{
	struct ow_doc_style st = {size, bold, ow_doc_ink(), 0.0};

	ow_doc_para(&r->doc, text, &st, after);
}

/* One line as written (ow_doc_para would fold its runs of spaces), space
 * after it: after points. */
static void line_as_is(struct cpdf *r, const char *text, double after)
{
	ow_doc_need(&r->doc, OW_DOC_BODY_PT * OW_DOC_LINE);
	if (r->doc.st != OW_OK)
		return;
	ow_canvas_set_colour(r->doc.cv, ow_doc_ink());
	ow_canvas_set_font(r->doc.cv, OW_DOC_BODY_PT, 0);
	ow_canvas_text(r->doc.cv, r->doc.x0, r->doc.y + OW_DOC_BODY_PT, text,
	               OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0.0);
	r->doc.y += OW_DOC_BODY_PT * OW_DOC_LINE + after;
}

/* ---- title block ----------------------------------------------------------
 */

/* A title block entry, or the line to fill it in by hand. */
static const char *filled(const char *v, const char *blank)
{
	return v && *v ? v : blank;
}

static void title_block(struct cpdf *r)
{
	const struct ow_compare *c = r->cmp;
	struct ow_doc_table t = {3,
	                         {"", "", ""},
	                         {0.16, 0.42, 0.42},
	                         {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         1};
	char head[2][96], line[400], axis[96];
	const char *cells[3];
	int k;

	para(r, "Operating windows compared", 18.0, 1, 4.0);
	snprintf(line, sizeof line,
	         "%s and %s, swept on one grid of screw "
	         "speed and %s",
	         label(r, 0), label(r, 1),
	         ow_maps_axis_label(c->study[0], axis, sizeof axis));
	para(r, line, 10.0, 0, 8.0);
	for (k = 0; k < 2; k++) {
		if (strcmp(label(r, k), k ? "B" : "A"))
			snprintf(head[k], sizeof head[k], "%s  (case %s)",
			         label(r, k), k ? "B" : "A");
		else
			snprintf(head[k], sizeof head[k], "case %s",
			         k ? "B" : "A");
		t.head[k + 1] = head[k];
	}
	ow_doc_table_head(&r->doc, &t);
	cells[0] = "study";
	cells[1] = c->study[0]->title;
	cells[2] = c->study[1]->title;
	ow_doc_table_row(&r->doc, &t, cells, 0);
	cells[0] = "file";
	cells[1] = c->study[0]->path;
	cells[2] = c->study[1]->path;
	ow_doc_table_row(&r->doc, &t, cells, 0);
	cells[0] = "screw";
	cells[1] = c->study[0]->screw.name;
	cells[2] = c->study[1]->screw.name;
	ow_doc_table_row(&r->doc, &t, cells, 0);
	cells[0] = "resin";
	cells[1] = c->study[0]->resin.name;
	cells[2] = c->study[1]->resin.name;
	ow_doc_table_row(&r->doc, &t, cells, 0);
	snprintf(line, sizeof line,
	         "Date %s      Revision %s      Prepared by %s      "
	         "Approved by %s",
	         r->o->date, filled(r->o->revision, "________"),
	         filled(r->o->prepared_by, "______________"),
	         filled(r->o->approved_by, "______________"));
	r->doc.y += 6.0;
	line_as_is(r, line, 4.0);
}

/* ---- the windows ------------------------------------------------------------
 */

static void range(char *buf, size_t n, double lo, double hi, int dec)
{
	char a[32], b[32];

	snprintf(buf, n, "%s – %s", ow_doc_fix(a, sizeof a, lo, dec),
	         ow_doc_fix(b, sizeof b, hi, dec));
}

static void output_range(const struct cpdf *r, const struct ow_window *w,
                         char *buf, size_t n)
{
	enum ow_unit_system u = r->o->units;

	range(buf, n, ow_display_value(u, OW_DIM_MASS_FLOW, w->output_min_kg_s),
	      ow_display_value(u, OW_DIM_MASS_FLOW, w->output_max_kg_s), 1);
}

static void window_row(struct cpdf *r, const struct ow_doc_table *t,
                       const char *name, const struct ow_window *w,
                       const char *output)
{
	char rpm[64], set[64], ctr[96], safe[32], a[32], b[32];
	const char *cells[6] = {name, rpm, set, ctr, output, safe};

	snprintf(safe, sizeof safe, "%.0f %%", 100.0 * w->safe_fraction);
	if (w->empty) {
		const char *none[6] = {name, "no safe point", "", "", "", safe};

		ow_doc_table_row(&r->doc, t, none, 0);
		return;
	}
	ow_compare_format_range(rpm, sizeof rpm, w->rpm_min, w->rpm_max,
	                        OW_REPORT_RPM_DECIMALS);
	ow_compare_format_range(
	    set, sizeof set,
	    ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->set_min_K),
	    ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->set_max_K),
	    OW_REPORT_TEMP_DECIMALS);
	snprintf(ctr, sizeof ctr, "%s rpm, %s %s",
	         ow_report_format_bound(a, sizeof a, w->centre.rpm,
	                                OW_REPORT_RPM_DECIMALS,
	                                OW_ROUND_NEAREST),
	         ow_report_format_bound(
	             b, sizeof b,
	             ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, w->centre_set_K),
	             OW_REPORT_TEMP_DECIMALS + 1, OW_ROUND_NEAREST),
	         ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	ow_doc_table_row(&r->doc, t, cells, !strcmp(name, "common"));
}

static void windows(struct cpdf *r)
{
	const struct ow_compare *c = r->cmp;
	char h2[96], h4[64], out[3][64], both[160], axis[64];
	struct ow_doc_table t = {
	    6,
	    {"", "screw speed, rpm", h2, "centre", h4, "safe share of the map"},
	    {0.13, 0.15, 0.19, 0.18, 0.20, 0.15},
	    {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT,
	     OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	    OW_DOC_SMALL_PT,
	    1};
	int k;

	snprintf(h2, sizeof h2, "%s, %s",
	         ow_maps_axis_label(c->study[0], axis, sizeof axis),
	         ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	snprintf(h4, sizeof h4, "throughput, %s",
	         ow_display_label(r->o->units, OW_DIM_MASS_FLOW));
	ow_doc_heading(&r->doc, "Recommended windows", 80.0);
	ow_doc_table_head(&r->doc, &t);
	for (k = 0; k < 2; k++) {
		output_range(r, c->map[k]->window, out[k], sizeof out[k]);
		window_row(r, &t, label(r, k), c->map[k]->window, out[k]);
	}
	output_range(r, c->common[0], out[0], sizeof out[0]);
	output_range(r, c->common[1], out[1], sizeof out[1]);
	snprintf(both, sizeof both, "%s: %s; %s: %s", label(r, 0), out[0],
	         label(r, 1), out[1]);
	window_row(r, &t, "common", c->common[0], both);
	r->doc.y += 4.0;
	para(r,
	     "Each window is the largest rectangle in which every limit of "
	     "that study is met, its bounds placed where a limit is crossed "
	     "between the solved points and rounded inwards to whole rpm and "
	     "whole degrees, as in the single report. The common window is "
	     "the largest rectangle safe in both cases, and its centre the "
	     "setting of it farthest from the edge of either window: the "
	     "setting to start from when the line must run either case.",
	     OW_DOC_BODY_PT, 0, 4.0);
	{
		char how[320], text[400];

		snprintf(text, sizeof text, "Barrel set-points: %s.%s",
		         ow_compare_alignment(c, r->o->units, how, sizeof how),
		         c->by_shift
		             ? " The map's vertical axis is that shift; "
		               "the common window's set-points are "
		               "case A's."
		             : "");
		para(r, text, OW_DOC_BODY_PT, 0, 4.0);
	}
}

/* The overlay map at full column width. */
static void overlay(struct cpdf *r)
{
	double s = (r->doc.x1 - r->doc.x0) / OW_MAPS_WIDTH_PT;
	struct ow_canvas_place at;
	struct ow_rect box = {0.0, 0.0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	struct ow_canvas *cv = NULL;

	ow_doc_need(&r->doc, s * OW_MAPS_HEIGHT_PT + 8.0);
	if (r->doc.st != OW_OK)
		return;
	at = (struct ow_canvas_place){r->doc.x0, r->doc.y + 4.0, s};
	r->doc.st = ow_canvas_create_pdf(
	    r->doc.pdf, r->doc.pages[r->doc.n_pages - 1], &r->doc.fonts, &at,
	    box.w, box.h, &cv, r->doc.d);
	if (r->doc.st == OW_OK)
		r->doc.st =
		    ow_compare_draw_overlay(cv, &box, r->cmp, r->o, r->doc.d);
	if (r->doc.st == OW_OK)
		r->doc.st = ow_canvas_status(cv, r->doc.d);
	ow_canvas_destroy(cv);
	r->doc.y += s * OW_MAPS_HEIGHT_PT + 8.0;
}

/* ---- why they differ ---------------------------------------------------- */

/* "pressure on the screw (16 points), ..." for counts[]; "none". */
static void limit_list(const int *counts, char *buf, size_t n)
{
	enum ow_check order[OW_CK_COUNT];
	struct ow_window tmp;
	int c, m;

	memset(&tmp, 0, sizeof tmp);
	for (c = 0; c < OW_CK_COUNT; c++)
		tmp.fail_count[c] = counts[c];
	m = ow_window_binding(&tmp, order);
	snprintf(buf, n, "%s", m ? "" : "none");
	for (c = 0; c < m; c++)
		snprintf(buf + strlen(buf), n - strlen(buf), "%s%s (%d points)",
		         c ? ", " : "", ow_check_failure(order[c]),
		         counts[order[c]]);
}

static void why(struct cpdf *r)
{
	const struct ow_compare *c = r->cmp;
	int n = c->n_rpm * c->n_axis, k;
	char text[640], list[400];

	ow_doc_heading(&r->doc, "Where and why the windows differ", 60.0);
	snprintf(text, sizeof text,
	         "Of the %d grid points (%d speeds × %d "
	         "set-points), both cases are safe at %d, only %s at %d, only "
	         "%s at %d, and neither at %d.",
	         n, c->n_rpm, c->n_axis, c->count[OW_CMP_BOTH], label(r, 0),
	         c->count[OW_CMP_A_ONLY], label(r, 1), c->count[OW_CMP_B_ONLY],
	         c->count[OW_CMP_NEITHER]);
	para(r, text, OW_DOC_BODY_PT, 0, 5.0);
	for (k = 0; k < 2; k++) {
		if (!c->count[k ? OW_CMP_B_ONLY : OW_CMP_A_ONLY])
			continue;
		limit_list(c->lost[k], list, sizeof list);
		snprintf(text, sizeof text,
		         "Where only %s is safe, %s exceeds: "
		         "%s.",
		         label(r, k), label(r, 1 - k), list);
		para(r, text, OW_DOC_BODY_PT, 0, 5.0);
	}
	for (k = 0; k < 2; k++) {
		limit_list(c->map[k]->window->fail_count, list, sizeof list);
		snprintf(text, sizeof text,
		         "Limits that shape %s's window "
		         "(grid points each excludes): %s.",
		         label(r, k), list);
		para(r, text, OW_DOC_BODY_PT, 0, 5.0);
	}
}

/* ---- both cases at the centres --------------------------------------------
 */

/* A difference: "+" before a positive value that does not print as 0. */
static char *signed_fix(char *buf, size_t n, double v, int dec)
{
	char tmp[40]; /* leaves room for the sign in any 48-byte buf */

	ow_doc_fix(tmp, sizeof tmp, v, dec);
	snprintf(buf, n, "%s%s",
	         v > 0.0 && strspn(tmp, "0.") != strlen(tmp) ? "+" : "", tmp);
	return buf;
}

static void figure_row(struct cpdf *r, const struct ow_doc_table *t,
                       const struct ow_cmp_point *p, int i)
{
	const struct ow_compare *c = r->cmp;
	enum ow_unit_system u = r->o->units;
	const char *unit = ow_compare_figure_unit(i, u);
	int dec = ow_compare_figure_decimals(i, u), k;
	char name[96], v[3][48];
	const char *cells[4] = {name, v[0], v[1], v[2]};
	double x[2];

	snprintf(name, sizeof name, "%s%s%s", ow_compare_figure_text(i),
	         *unit ? ", " : "", unit);
	for (k = 0; k < 2; k++) {
		x[k] = ow_compare_figure_shown(c->study[k], &p->pt[k], i, u);
		ow_doc_fix(v[k], sizeof v[k], x[k], dec);
	}
	signed_fix(v[2], sizeof v[2], x[1] - x[0], dec);
	ow_doc_table_row(&r->doc, t, cells, 0);
}

/* Which earlier point (index) is the same as at, or -1. */
static int same_as(const struct ow_compare *c, int at)
{
	int k;

	for (k = 0; k < at; k++)
		if (c->at[k].valid && c->at[k].rpm == c->at[at].rpm &&
		    c->at[k].axis == c->at[at].axis)
			return k;
	return -1;
}

static void verdict_cell(const struct ow_verdict *v, char *buf, size_t n)
{
	int c;

	snprintf(buf, n, "%s", v->bits ? "UNSAFE:" : "safe");
	for (c = 0; c < OW_CK_COUNT; c++)
		if (v->bits & (1u << c))
			snprintf(buf + strlen(buf), n - strlen(buf), " %s",
			         ow_check_key((enum ow_check)c));
}

static void centre_table(struct cpdf *r, int at)
{
	const struct ow_cmp_point *p = &r->cmp->at[at];
	char diff[96], title[200], va[160], vb[160];
	struct ow_doc_table t = {
	    4,
	    {"", label(r, 0), label(r, 1), diff},
	    {0.46, 0.18, 0.18, 0.18},
	    {OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT},
	    OW_DOC_SMALL_PT,
	    1};
	const char *cells[4] = {"verdict", va, vb, ""};
	int i;

	snprintf(diff, sizeof diff, "%s − %s", label(r, 1), label(r, 0));
	snprintf(title, sizeof title, "At the %s: %s rpm, %s %s",
	         ow_compare_at_text((enum ow_cmp_at)at),
	         ow_report_format_bound(va, sizeof va, p->rpm,
	                                OW_REPORT_RPM_DECIMALS,
	                                OW_ROUND_NEAREST),
	         ow_report_format_bound(
	             vb, sizeof vb,
	             ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, p->set_ref_K[0]),
	             OW_REPORT_TEMP_DECIMALS + 1, OW_ROUND_NEAREST),
	         ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	if (r->cmp->by_shift)
		snprintf(
		    title + strlen(title), sizeof title - strlen(title),
		    " (%s at %.0f %s)", label(r, 1),
		    ow_doc_shown(&r->doc, OW_DIM_TEMPERATURE, p->set_ref_K[1]),
		    ow_doc_unit(&r->doc, OW_DIM_TEMPERATURE));
	ow_doc_need(&r->doc, 12.0 * OW_DOC_SMALL_PT * OW_DOC_LINE + 20.0);
	para(r, title, OW_DOC_BODY_PT + 1.0, 1, 3.0);
	ow_doc_table_head(&r->doc, &t);
	for (i = 0; i < ow_compare_n_figures(); i++)
		figure_row(r, &t, p, i);
	verdict_cell(&p->v[0], va, sizeof va);
	verdict_cell(&p->v[1], vb, sizeof vb);
	ow_doc_table_row(&r->doc, &t, cells, 0);
	r->doc.y += 8.0;
}

static void centres(struct cpdf *r)
{
	const struct ow_compare *c = r->cmp;
	char text[200];
	int at, k;

	ow_doc_heading(&r->doc, "Both cases at the centre points", 160.0);
	para(r,
	     "Each case solved alone at the point, as a single run "
	     "there gives it.",
	     OW_DOC_BODY_PT, 0, 5.0);
	for (at = 0; at < OW_CMP_AT_COUNT; at++) {
		if (!c->at[at].valid)
			continue;
		k = same_as(c, at);
		if (k >= 0) {
			snprintf(text, sizeof text, "The %s is the %s.",
			         ow_compare_at_text((enum ow_cmp_at)at),
			         ow_compare_at_text((enum ow_cmp_at)k));
			para(r, text, OW_DOC_BODY_PT, 0, 8.0);
			continue;
		}
		centre_table(r, at);
	}
}

/* ---- inputs ---------------------------------------------------------------
 */

static void input_table(struct cpdf *r, const struct ow_input_diff *e, int n,
                        const struct ow_input_diff *diff, int n_diff)
{
	struct ow_doc_table t = {3,
	                         {"input field", label(r, 0), label(r, 1)},
	                         {0.38, 0.31, 0.31},
	                         {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         1};
	int i, j;

	ow_doc_table_head(&r->doc, &t);
	for (i = 0; i < n && i < MAX_FIELDS; i++) {
		const char *cells[3] = {e[i].field, e[i].a, e[i].b};
		int differs = 0;

		for (j = 0; diff && j < n_diff && !differs; j++)
			differs = !strcmp(diff[j].field, e[i].field);
		ow_doc_table_row(&r->doc, &t, cells, differs);
	}
	r->doc.y += 6.0;
}

static void inputs(struct cpdf *r)
{
	const struct ow_compare *c = r->cmp;
	struct ow_input_diff *all = malloc(sizeof *all * MAX_FIELDS);
	struct ow_input_diff *diff = malloc(sizeof *diff * MAX_FIELDS);
	int na, nd;

	if (!all || !diff) {
		free(all);
		free(diff);
		ow_doc_fail(&r->doc, OW_ENOMEM, "out of memory");
		return;
	}
	nd = ow_compare_fields(c->study[0], c->study[1], r->o->units, 0, diff,
	                       MAX_FIELDS);
	na = ow_compare_fields(c->study[0], c->study[1], r->o->units, 1, all,
	                       MAX_FIELDS);
	ow_doc_heading(&r->doc, "Input fields that differ", 40.0);
	if (nd)
		input_table(r, diff, nd, NULL, 0);
	else
		para(r, "None: the two studies have the same inputs.",
		     OW_DOC_BODY_PT, 0, 6.0);
	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "Both inputs", 40.0);
	para(r,
	     "Every input of both studies as loaded (in the reader's "
	     "units; lengths along the screw in its diameters D); "
	     "shaded rows differ. The sources of the values are named "
	     "in the study files and in each study's own report.",
	     OW_DOC_BODY_PT, 0, 5.0);
	input_table(r, all, na, diff, nd);
	free(all);
	free(diff);
}

/* ---- cautions ----------------------------------------------------------- */

static const struct ow_doc_caution cautions[] = {
    {"Estimates, not measurements.",
     "Both cases are computed from "
     "published engineering models and the inputs listed above; a "
     "difference between them is only as good as the difference "
     "between their inputs. Where the inputs of a case are uncertain "
     "(a worn screw's clearance, a new grade's viscosity), treat its "
     "window as uncertain too."},
    {"Start at the common centre.",
     "When the line must run either "
     "case, start at the centre of the common window, change one "
     "setting at a time and watch melt pressure, melt temperature and "
     "drive load settle before going on. Stop and review if the line "
     "behaves differently from this comparison."},
    {"The machine's own ratings come first.",
     "The extruder builder's "
     "ratings for drive power, torque, speed, barrel pressure and "
     "temperature, and the rating of the rupture disc, govern wherever "
     "they are stricter than a limit used here."},
    {"Hot melt and pressure can injure.",
     "Melt at these temperatures "
     "burns on contact and can spray from the die or adapter when "
     "pressure is released. Never open the head while the barrel is hot "
     "and the melt may be under pressure. Local safety rules and the "
     "approval of a qualified engineer, where required, come first."},
};

static void pages(struct cpdf *r)
{
	ow_doc_new_page(&r->doc);
	title_block(r);
	windows(r);
	overlay(r);
	ow_doc_new_page(&r->doc);
	why(r);
	centres(r);
	inputs(r);
	ow_doc_cautions(&r->doc, cautions,
	                (int)(sizeof cautions / sizeof cautions[0]),
	                OW_DOC_CAUTIONS_PLAIN);
}

enum ow_status ow_compare_write_pdf(const struct ow_compare *cmp,
                                    const struct ow_compare_draw_options *o,
                                    const char *pdf_path, struct ow_diag *d)
{
	struct cpdf r;
	enum ow_status st;

	if (!cmp || !o || !pdf_path)
		return ow_diag_set(d, OW_EARG, "compare.pdf: NULL argument");
	if (!ow_doc_valid_date(o->date))
		return ow_diag_set(d, OW_EARG,
		                   "compare.pdf: date \"%s\": "
		                   "expected YYYY-MM-DD",
		                   o->date ? o->date : "");
	memset(&r, 0, sizeof r);
	r.cmp = cmp;
	r.o = o;
	r.doc.sys = o->units;
	r.doc.d = d;
	snprintf(r.doc.foot_title, sizeof r.doc.foot_title,
	         "Comparison: %s and %s   ·   %s   ·   "
	         "opwin %s",
	         label(&r, 0), label(&r, 1), o->date, OW_VERSION);
	snprintf(r.doc.foot_line, sizeof r.doc.foot_line,
	         "inputs CRC-32: %s %08lX, %s %08lX", label(&r, 0),
	         cmp->study[0]->input_crc, label(&r, 1),
	         cmp->study[1]->input_crc);
	if (ow_doc_open(&r.doc, "compare.pdf", (enum ow_paper)o->paper,
	                o->date) == OW_OK) {
		/* a blue-grey header; shaded rows (the differences) in
		 * amber; tight rows, so both inputs take few pages */
		r.doc.head_fill = ow_rgb(0.86, 0.88, 0.91);
		r.doc.shade_fill = ow_rgb(1.0, 0.95, 0.84);
		r.doc.row_pad = 1.5;
		pages(&r);
	}
	st = ow_doc_close(&r.doc, pdf_path);
	if (st != OW_OK)
		ow_diag_set(d, st, "%s: not written", pdf_path);
	return st;
}
