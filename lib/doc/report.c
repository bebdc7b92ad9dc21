/* report.c - the single-study report on the document layer (doc.c):
 * its options, the order of its sections, its footer with the inputs'
 * CRC-32, its bounds as printed, and the report written beside the map
 * images. The sections are in report_front.c, report_pages.c,
 * report_calib.c, report_spread.c, report_inputs.c and report_basis.c. */
#include "report_impl.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "ow_version.h"

void ow_report_default(struct ow_report_options *o)
{
	memset(o, 0, sizeof *o);
	o->paper = OW_PAPER_A4;
	o->units = OW_SYS_SI;
}

enum ow_status ow_report_paper_parse(const char *s, enum ow_paper *out)
{
	if (s && !strcasecmp(s, "a4"))
		*out = OW_PAPER_A4;
	else if (s && !strcasecmp(s, "letter"))
		*out = OW_PAPER_LETTER;
	else
		return OW_EARG;
	return OW_OK;
}

char *ow_report_format_bound(char *buf, size_t n, double v, int decimals,
                             enum ow_round dir)
{
	double f = pow(10.0, decimals), x = v * f;
	char tmp[64];

	if (!isfinite(v))
		return ow_doc_fix(buf, n, v, 0);
	/* a hair of slack, so 185.0000000001 is not taken up to 186 */
	if (dir == OW_ROUND_UP)
		x = ceil(x - 1e-6);
	else if (dir == OW_ROUND_DOWN)
		x = floor(x + 1e-6);
	else
		x = round(x);
	snprintf(tmp, sizeof tmp, "%.*f", decimals, x / f);
	ow_doc_trim_zeros(tmp);
	return ow_doc_minus(buf, n, tmp);
}

const char *ow_report_source(const struct rpt *r, const char *key,
                             unsigned char *shown)
{
	int k;

	for (k = 0; k < r->s->n_sources; k++)
		if (!strcmp(r->s->sources[k].key, key)) {
			if (shown)
				shown[k] = 1;
			return r->s->sources[k].text;
		}
	return NULL;
}

enum ow_status ow_report_write(const struct ow_map *m,
                               const struct ow_report_options *o,
                               const char *pdf_path, struct ow_diag *d)
{
	const struct ow_study *s = m ? m->study : NULL;
	struct rpt r;

	if (!s || !m->grid || !m->window || !o || !pdf_path)
		return ow_diag_set(d, OW_EARG,
		                   "ow_report_write: NULL "
		                   "argument");
	if (!ow_doc_valid_date(o->date))
		return ow_diag_set(d, OW_EARG,
		                   "report date \"%s\": expected "
		                   "YYYY-MM-DD",
		                   o->date ? o->date : "");
	memset(&r, 0, sizeof r);
	r.m = m;
	r.s = s;
	r.g = m->grid;
	r.w = m->window;
	r.o = o;
	r.doc.sys = o->units;
	r.doc.d = d;
	snprintf(r.doc.foot_title, sizeof r.doc.foot_title, "%s", s->title);
	snprintf(r.doc.foot_line, sizeof r.doc.foot_line,
	         "%s   ·   inputs CRC-32 %08lX   ·   "
	         "opwin %s",
	         o->date, s->input_crc, OW_VERSION);
	if (ow_doc_open(&r.doc, "report", o->paper, o->date) == OW_OK) {
		ow_report_front_page(&r);
		ow_report_map_pages(&r);
		ow_report_profile_page(&r);
		ow_report_calib_page(&r);
		ow_report_spread_page(&r);
		ow_report_inputs(&r);
		ow_report_basis(&r);
	}
	return ow_doc_close(&r.doc, pdf_path);
}

struct folder_report {
	const struct ow_map *m;
	const struct ow_report_options *o;
	const char *path;
};

static enum ow_status report_piece(void *ctx, struct ow_diag *d)
{
	const struct folder_report *f = ctx;

	return ow_report_write(f->m, f->o, f->path, d);
}

enum ow_status ow_report_write_folder(const struct ow_map *m,
                                      const struct ow_report_options *o,
                                      const struct ow_maps_options *mo,
                                      const char *dir, struct ow_diag *d)
{
	struct folder_report f = {m, o, NULL};
	size_t n = dir ? strlen(dir) + sizeof "/report.pdf" : 0;
	char *path = n ? malloc(n) : NULL;
	enum ow_status st;

	if (!path)
		return ow_diag_set(d, dir ? OW_ENOMEM : OW_EARG,
		                   dir ? "out of memory"
		                       : "ow_report_write_folder: NULL folder");
	snprintf(path, n, "%s/report.pdf", dir);
	f.path = path;
	st = ow_maps_write_beside(m, mo, dir, report_piece, &f, d);
	free(path);
	return st;
}
