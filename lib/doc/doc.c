/* doc.c - the PDF document layer under the report and the comparison:
 * set-up (libharu, compressed, DejaVu Sans embedded with the UTF-8
 * encoder), pages with one full-page canvas each, the cursor, footers
 * with "page N of M", and writing the file atomically. */
#include "doc_impl.h"

#include <ctype.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_io.h"
#include "ow_version.h"

/* ISO 216 A4 is 210 x 297 mm; US Letter 8.5 x 11 in; 72 pt per inch. */
#define MM_PT         (72.0 / 25.4)
#define MARGIN_X      54.0 /* 0.75 in */
#define MARGIN_TOP    48.0
#define MARGIN_BOTTOM 64.0 /* room for the footer */

struct ow_rgba ow_doc_ink(void)
{
	return ow_rgb(0.08, 0.08, 0.10);
}

struct ow_rgba ow_doc_grey(double level)
{
	return ow_rgb(level, level, level);
}

enum ow_status ow_doc_fail(struct ow_doc *r, enum ow_status st,
                           const char *what)
{
	if (r->st == OW_OK) {
		r->st = st;
		ow_diag_set(r->d, st, "%s: %s", r->name, what);
	}
	return r->st;
}

/* libharu calls this on every failure; errors are sticky in the document,
 * so only the first says what went wrong. */
static void on_hpdf_error(HPDF_STATUS error_no, HPDF_STATUS detail_no,
                          void *user_data)
{
	struct ow_doc *r = user_data;

	if (!r->hpdf_error) {
		r->hpdf_error = error_no;
		r->hpdf_detail = detail_no;
	}
}

void ow_doc_check(struct ow_doc *r)
{
	char msg[160];

	if (r->cv && r->st == OW_OK)
		r->st = ow_canvas_status(r->cv, r->d);
	if (r->hpdf_error && r->st == OW_OK) {
		snprintf(msg, sizeof msg,
		         "libharu error 0x%04X (detail %u) "
		         "while drawing page %d",
		         (unsigned)r->hpdf_error, (unsigned)r->hpdf_detail,
		         r->n_pages);
		ow_doc_fail(r, OW_EIO, msg);
	}
}

static void close_canvas(struct ow_doc *r)
{
	ow_doc_check(r);
	ow_canvas_destroy(r->cv);
	r->cv = NULL;
}

/* A full-page canvas on page k (y down from the page's top). */
static void open_canvas(struct ow_doc *r, int k)
{
	struct ow_canvas_place at = {0.0, 0.0, 1.0};

	if (r->st != OW_OK)
		return;
	r->st = ow_canvas_create_pdf(r->pdf, r->pages[k], &r->fonts, &at, r->pw,
	                             r->ph, &r->cv, r->d);
}

void ow_doc_new_page(struct ow_doc *r)
{
	HPDF_Page p;

	close_canvas(r);
	if (r->st != OW_OK)
		return;
	if (r->n_pages == OW_DOC_MAX_PAGES) {
		ow_doc_fail(r, OW_ECOMPUTE, "too many pages");
		return;
	}
	p = HPDF_AddPage(r->pdf);
	if (!p || HPDF_Page_SetWidth(p, (HPDF_REAL)r->pw) != HPDF_OK ||
	    HPDF_Page_SetHeight(p, (HPDF_REAL)r->ph) != HPDF_OK) {
		ow_doc_check(r);
		return;
	}
	r->pages[r->n_pages++] = p;
	open_canvas(r, r->n_pages - 1);
	r->y = r->y0;
}

int ow_doc_need(struct ow_doc *r, double h)
{
	if (r->st != OW_OK || r->y + h <= r->y1)
		return 0;
	ow_doc_new_page(r);
	return 1;
}

/* Fit utf8 into width at size, cutting it with an ellipsis. */
static void fit_text(struct ow_doc *r, const char *utf8, double width,
                     double size, char *out, size_t n)
{
	size_t len;

	snprintf(out, n, "%s", utf8);
	len = strlen(out);
	while (len > 0 && ow_doc_text_width(r, out, size, 0) > width) {
		do /* back over one UTF-8 character */
			len--;
		while (len > 0 && ((unsigned char)out[len] & 0xC0) == 0x80);
		while (len > 0 && out[len - 1] == ' ')
			len--;
		if (len + 4 > n)
			break;
		memcpy(out + len, "…", 4); /* U+2026, 3 bytes + NUL */
	}
}

/* The footer of page k of n: a rule, the title and "page k of n", then
 * the second line. */
static void footer(struct ow_doc *r, int k, int n)
{
	char title[320], page[40];
	double y = r->ph - MARGIN_BOTTOM + 22.0, w = r->x1 - r->x0;

	open_canvas(r, k);
	if (r->st != OW_OK)
		return;
	snprintf(page, sizeof page, "page %d of %d", k + 1, n);
	fit_text(r, r->foot_title,
	         w - ow_doc_text_width(r, page, 7.5, 0) - 24.0, 7.5, title,
	         sizeof title);
	ow_canvas_set_colour(r->cv, ow_doc_grey(0.55));
	ow_canvas_set_line_width(r->cv, 0.5);
	ow_canvas_move_to(r->cv, r->x0, y);
	ow_canvas_line_to(r->cv, r->x1, y);
	ow_canvas_stroke(r->cv);
	ow_canvas_set_colour(r->cv, ow_doc_grey(0.25));
	ow_canvas_set_font(r->cv, 7.5, 0);
	ow_canvas_text(r->cv, r->x0, y + 11.0, title, OW_ALIGN_LEFT,
	               OW_VALIGN_BASELINE, 0.0);
	if (*r->foot_line)
		ow_canvas_text(r->cv, r->x0, y + 21.0, r->foot_line,
		               OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0.0);
	ow_canvas_set_font(r->cv, 8.0, 1);
	ow_canvas_text(r->cv, r->x1, y + 11.0, page, OW_ALIGN_RIGHT,
	               OW_VALIGN_BASELINE, 0.0);
	close_canvas(r);
}

int ow_doc_valid_date(const char *s)
{
	int k;

	if (!s || strlen(s) != 10 || s[4] != '-' || s[7] != '-')
		return 0;
	for (k = 0; k < 10; k++)
		if (k != 4 && k != 7 && !isdigit((unsigned char)s[k]))
			return 0;
	k = atoi(s + 5);
	return k >= 1 && k <= 12 && atoi(s + 8) >= 1 && atoi(s + 8) <= 31;
}

/* Creator and the given date in the document information. */
static void doc_info(struct ow_doc *r, const char *ymd)
{
	HPDF_Date date;

	memset(&date, 0, sizeof date);
	date.year = atoi(ymd);
	date.month = atoi(ymd + 5);
	date.day = atoi(ymd + 8);
	date.ind = 'Z';
	HPDF_SetInfoAttr(r->pdf, HPDF_INFO_CREATOR, "opwin " OW_VERSION);
	HPDF_SetInfoDateAttr(r->pdf, HPDF_INFO_CREATION_DATE, date);
}

enum ow_status ow_doc_open(struct ow_doc *r, const char *name,
                           enum ow_paper paper, const char *date)
{
	int a4 = paper == OW_PAPER_A4;

	r->name = name;
	r->head_fill = ow_doc_grey(0.90);
	r->shade_fill = ow_doc_grey(0.955);
	r->row_pad = 3.5;
	r->pdf = HPDF_New(on_hpdf_error, r);
	if (!r->pdf)
		return ow_doc_fail(r, OW_ENOMEM, "out of memory");
	HPDF_SetCompressionMode(r->pdf, HPDF_COMP_ALL);
	r->st = ow_canvas_pdf_fonts(r->pdf, &r->fonts, r->d);
	if (r->st != OW_OK)
		return r->st;
	doc_info(r, date);
	r->pw = a4 ? 210.0 * MM_PT : 8.5 * 72.0;
	r->ph = a4 ? 297.0 * MM_PT : 11.0 * 72.0;
	r->x0 = MARGIN_X;
	r->x1 = r->pw - MARGIN_X;
	r->y0 = MARGIN_TOP;
	r->y1 = r->ph - MARGIN_BOTTOM;
	ow_doc_check(r);
	return r->st;
}

/* The finished document as bytes, written atomically. */
static void save(struct ow_doc *r, const char *path)
{
	HPDF_UINT32 len;
	HPDF_BYTE *buf;

	if (r->st != OW_OK)
		return;
	if (HPDF_SaveToStream(r->pdf) != HPDF_OK) {
		ow_doc_check(r);
		return;
	}
	len = HPDF_GetStreamSize(r->pdf);
	buf = malloc(len ? len : 1);
	if (!buf) {
		ow_doc_fail(r, OW_ENOMEM, "out of memory");
		return;
	}
	if (HPDF_ReadFromStream(r->pdf, buf, &len) != HPDF_OK &&
	    !r->hpdf_error) /* end of stream is reported as an error */
		HPDF_ResetError(r->pdf);
	ow_doc_check(r);
	{
		unsigned char *p = buf;
		size_t n = len;

		if (r->st == OW_OK)
			r->st = ow_doc_fix_to_unicode(&p, &n, r->d);
		buf = p;
		if (r->st == OW_OK)
			r->st =
			    ow_io_write_file(path, (const char *)buf, n, r->d);
	}
	free(buf);
}

enum ow_status ow_doc_close(struct ow_doc *r, const char *path)
{
	int k;

	close_canvas(r);
	for (k = 0; k < r->n_pages && r->st == OW_OK; k++)
		footer(r, k, r->n_pages);
	save(r, path);
	ow_canvas_destroy(r->cv);
	r->cv = NULL;
	if (r->pdf)
		HPDF_Free(r->pdf);
	r->pdf = NULL;
	return r->st;
}
