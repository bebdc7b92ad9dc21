/* report_calib.c - the report's page on a calibrated model: which factors
 * multiply which inputs, their values and standard errors and where they
 * come from, how well the model reproduces the line's readings (table and
 * chart of modelled against measured values), and what that does not
 * prove. Only for a study whose calibration block sets a factor. */
#include "report_impl.h"

#include "ow_calib_plot.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static const char *const qty_words[OW_CQ_COUNT] = {
    "output", "head pressure", "melt temperature", "drive power", "torque"};

/* One line on the front page under the banner. */
void ow_report_calib_note(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	struct ow_doc_style note = {7.5, 1, ow_doc_grey(0.25), 0.0};
	char text[512];

	if (!ow_calib_active(c))
		return;
	if (c->has_fit)
		snprintf(text, sizeof text,
		         "Model calibrated to %d values measured on the line "
		         "(%.200s): see \"Calibration to the line\".",
		         c->n_resid, c->fit_readings);
	else
		snprintf(text, sizeof text,
		         "Model factors set in the study's calibration block "
		         "(no fit record): see \"Calibration to the line\".");
	ow_doc_para(&r->doc, text, &note, 6.0);
}

static void factor_table(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	struct ow_doc_table t = {
	    5,
	    {"factor", "multiplies", "value", "std. error", "source"},
	    {0.18, 0.37, 0.1, 0.12, 0.23},
	    {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_RIGHT, OW_ALIGN_RIGHT,
	     OW_ALIGN_LEFT},
	    OW_DOC_SMALL_PT,
	    1};
	char v[32], se[32];
	int k;

	ow_doc_table_head(&r->doc, &t);
	for (k = 0; k < OW_CF_COUNT; k++) {
		const struct ow_calib_factor *f = ow_calib_factor(k);
		const char *cells[5];

		if (c->value[k] == 1.0)
			continue;
		ow_doc_num(v, sizeof v, c->value[k], 4);
		if (isfinite(c->std_error[k]))
			ow_doc_num(se, sizeof se, c->std_error[k], 2);
		else
			snprintf(se, sizeof se, "not stated");
		cells[0] = f->name;
		cells[1] = f->what;
		cells[2] = v;
		cells[3] = se;
		cells[4] = c->source[k][0] ? c->source[k] : "entered by hand";
		ow_doc_table_row(&r->doc, &t, cells, 0);
	}
	ow_doc_table_end(&r->doc);
}

static void fit_words(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	struct ow_doc_style st = ow_doc_body();
	char text[900], corr[300] = "", rho[32];
	size_t used = 0;
	int k, l;

	for (k = 0; k < c->n_fit; k++)
		for (l = k + 1; l < c->n_fit && used < sizeof corr; l++)
			used += (size_t)snprintf(
			    corr + used, sizeof corr - used,
			    " The fitted %s and %s are correlated at %s%s",
			    ow_calib_factor(c->fit_ids[k])->name,
			    ow_calib_factor(c->fit_ids[l])->name,
			    ow_doc_fix(rho, sizeof rho, c->corr[k][l], 2),
			    fabs(c->corr[k][l]) > 0.9
			        ? ": the readings fix mainly their "
			          "combination."
			        : ".");
	snprintf(text, sizeof text,
	         "The factors were fitted by weighted least squares to %d "
	         "values measured on the line (%s), each weighted by its "
	         "stated uncertainty. The sum of squared residuals in "
	         "standard deviations is %.1f for %d degrees of freedom: %s%s",
	         c->n_resid, c->fit_readings, c->chi2, c->dof,
	         c->dof > 0 && c->chi2 / c->dof > 2.0
	             ? "the model misses the readings by more than their "
	               "stated uncertainties, and the standard errors "
	               "were enlarged to match."
	             : "the model reproduces the readings within their "
	               "stated uncertainties.",
	         corr);
	ow_doc_para(&r->doc, text, &st, 6.0);
}

static void resid_table(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	struct ow_doc_table t = {6,
	                         {"line", "rpm", "quantity", "measured",
	                          "modelled", "residual (sd)"},
	                         {0.08, 0.1, 0.3, 0.17, 0.17, 0.18},
	                         {OW_ALIGN_RIGHT, OW_ALIGN_RIGHT, OW_ALIGN_LEFT,
	                          OW_ALIGN_RIGHT, OW_ALIGN_RIGHT,
	                          OW_ALIGN_RIGHT},
	                         OW_DOC_SMALL_PT,
	                         0};
	char ln[16], rpm[16], q[64], m[48], mo[48], sd[32];
	int i;

	ow_doc_table_head(&r->doc, &t);
	for (i = 0; i < c->n_resid && r->doc.st == OW_OK; i++) {
		const struct ow_calib_resid *e = &c->resid[i];
		enum ow_dim dim = ow_calib_qty_dim(e->qty);
		const char *cells[6] = {ln, rpm, q, m, mo, sd};

		snprintf(ln, sizeof ln, "%d", e->line);
		ow_doc_num(rpm, sizeof rpm, e->rpm, 4);
		snprintf(q, sizeof q, "%s", qty_words[e->qty]);
		ow_doc_qty(&r->doc, m, sizeof m, dim, e->measured, 4);
		ow_doc_qty(&r->doc, mo, sizeof mo, dim, e->modelled, 4);
		sd[0] = '+';
		ow_doc_fix(sd + (ow_calib_resid_sd(e) > 0), sizeof sd - 1,
		           ow_calib_resid_sd(e), 2);
		ow_doc_table_row(&r->doc, &t, cells,
		                 fabs(ow_calib_resid_sd(e)) > 2.0);
	}
	ow_doc_table_end(&r->doc);
}

static void chart(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	double w = r->doc.x1 - r->doc.x0,
	       h = 0.42 * w * ow_calib_plot_rows(c->resid, c->n_resid);

	ow_doc_need(&r->doc, h + 8.0);
	if (r->doc.st != OW_OK)
		return;
	ow_calib_draw(r->doc.cv, r->doc.x0, r->doc.y, w, h, c->resid,
	              c->n_resid, r->doc.sys, NULL);
	r->doc.y += h + 8.0;
	ow_doc_check(&r->doc);
}

void ow_report_calib_page(struct rpt *r)
{
	const struct ow_calibration *c = &r->s->calib;
	struct ow_doc_style st = ow_doc_body();

	if (r->doc.st != OW_OK || !ow_calib_active(c))
		return;
	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "Calibration to the line", 200.0);
	ow_doc_para(
	    &r->doc,
	    "The study multiplies these model inputs by factors, so that "
	    "the model reproduces what the line showed. Every figure in "
	    "this report is computed with them, and the inputs listed "
	    "at the end show the resin's viscosity and friction with "
	    "the factors applied.",
	    &st, 6.0);
	factor_table(r);
	if (!c->has_fit) {
		ow_doc_para(&r->doc,
		            "No record of a fit comes with these factors: they "
		            "were set by hand, and nothing here shows how well "
		            "the model reproduces the line.",
		            &st, 6.0);
		return;
	}
	fit_words(r);
	ow_doc_subheading(&r->doc, "Readings against the calibrated model",
	                  120.0);
	resid_table(r);
	ow_doc_para(
	    &r->doc,
	    "Shaded rows miss by more than two standard deviations. The "
	    "chart plots each modelled value against the measured one "
	    "(bars: two standard deviations of the reading either way; "
	    "dashed: model equals measurement).",
	    &st, 6.0);
	chart(r);
	ow_doc_para(
	    &r->doc,
	    "A calibrated model reproduces these readings; between and "
	    "beyond the settings they cover it is still an estimate. "
	    "Calibrate again after a change of screw, die, screen pack or "
	    "resin grade, and check the window on the line step by step.",
	    &st, 6.0);
}
