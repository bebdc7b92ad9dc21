/* compare_pdf.c - the comparison PDF (libharu, A4, DejaVu Sans embedded
 * with the UTF-8 encoder, compressed): a title block naming both studies,
 * the three windows side by side, the overlay map, why the windows
 * differ, both cases at the centres, the input fields that differ, both
 * inputs echoed, and cautions. Every page is one full-page canvas, so
 * text, tables and the map go through the same drawing layer; every page
 * carries "page N of M", the date and the program version. */
#include "compare_pdf_impl.h"

#include "opwin.h"
#include "ow_maps.h"
#include "ow_results.h"

#include <hpdf.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MM_PT         (72.0 / 25.4)
#define MARGIN_X      54.0
#define MARGIN_TOP    48.0
#define MARGIN_BOTTOM 64.0

const char *cpdf_label(const struct cpdf *r, int k)
{
	const char *l = r->o->label[k];

	return l && *l ? l : (k ? "B" : "A");
}

struct ow_rgba cpdf_ink(void)
{
	return ow_rgb(0.08, 0.08, 0.10);
}

/* ---- document, pages, cursor ------------------------------------------ */

static void fail(struct cpdf *r, enum ow_status st, const char *what)
{
	if (r->st == OW_OK) {
		r->st = st;
		ow_diag_set(r->d, st, "%s", what);
	}
}

static void on_error(HPDF_STATUS e, HPDF_STATUS detail, void *user)
{
	struct cpdf *r = user;

	(void)detail;
	if (!r->hpdf_error)
		r->hpdf_error = e;
}

static void check(struct cpdf *r)
{
	char msg[96];

	if (r->cv && r->st == OW_OK)
		r->st = ow_canvas_status(r->cv, r->d);
	if (r->hpdf_error && r->st == OW_OK) {
		snprintf(msg, sizeof msg, "compare.pdf: libharu error 0x%04X",
		         (unsigned)r->hpdf_error);
		fail(r, OW_EIO, msg);
	}
}

static void close_canvas(struct cpdf *r)
{
	check(r);
	ow_canvas_destroy(r->cv);
	r->cv = NULL;
}

static void open_canvas(struct cpdf *r, int k)
{
	struct ow_canvas_place at = {0.0, 0.0, 1.0};

	if (r->st == OW_OK)
		r->st = ow_canvas_create_pdf(r->pdf, r->pages[k], &r->fonts,
		                             &at, r->pw, r->ph, &r->cv, r->d);
}

void cpdf_new_page(struct cpdf *r)
{
	HPDF_Page p;

	close_canvas(r);
	if (r->st != OW_OK)
		return;
	if (r->n_pages == MAX_PAGES) {
		fail(r, OW_ECOMPUTE, "compare.pdf: too many pages");
		return;
	}
	p = HPDF_AddPage(r->pdf);
	if (!p || HPDF_Page_SetWidth(p, (HPDF_REAL)r->pw) != HPDF_OK ||
	    HPDF_Page_SetHeight(p, (HPDF_REAL)r->ph) != HPDF_OK) {
		check(r);
		return;
	}
	r->pages[r->n_pages++] = p;
	open_canvas(r, r->n_pages - 1);
	r->y = r->y0;
}

/* Room for h points below the cursor, or a new page. */
void cpdf_need(struct cpdf *r, double h)
{
	if (r->st == OW_OK && r->y + h > r->y1)
		cpdf_new_page(r);
}

/* ---- text --------------------------------------------------------------- */

double cpdf_width_of(struct cpdf *r, const char *s, double size, int bold)
{
	if (!r->cv)
		return 0.0;
	ow_canvas_set_font(r->cv, size, bold);
	return ow_canvas_text_width(r->cv, s);
}

/* Greedy word wrap of text into lines no wider than width (a single word
 * wider than that keeps its own line); returns the count. */
static int wrap(struct cpdf *r, const char *text, double width, double size,
                int bold, char (*lines)[LINE_LEN], int max)
{
	char try[LINE_LEN];
	const char *p = text;
	int n = 0;

	lines[0][0] = '\0';
	while (*p && n < max) {
		const char *e = p;
		size_t len = strlen(lines[n]);

		while (*e && *e != ' ')
			e++;
		snprintf(try, sizeof try, "%s%s%.*s", lines[n], len ? " " : "",
		         (int)(e - p), p);
		if (len && cpdf_width_of(r, try, size, bold) > width) {
			if (++n == max)
				break;
			snprintf(lines[n], LINE_LEN, "%.*s", (int)(e - p), p);
		} else {
			snprintf(lines[n], LINE_LEN, "%s", try);
		}
		p = *e ? e + 1 : e;
	}
	return n < max ? n + 1 : max;
}

void cpdf_para(struct cpdf *r, const char *text, double size, int bold,
               double indent, double after)
{
	char lines[MAX_LINES][LINE_LEN];
	double h = size * LINE;
	int n = wrap(r, text, r->x1 - r->x0 - indent, size, bold, lines,
	             MAX_LINES),
	    i;

	for (i = 0; i < n && r->st == OW_OK; i++) {
		cpdf_need(r, h);
		if (r->st != OW_OK)
			return;
		ow_canvas_set_colour(r->cv, cpdf_ink());
		ow_canvas_set_font(r->cv, size, bold);
		ow_canvas_text(r->cv, r->x0 + indent, r->y + 0.8 * size,
		               lines[i], OW_ALIGN_LEFT, OW_VALIGN_BASELINE, 0);
		r->y += h;
	}
	r->y += after;
}

/* A heading kept with at least follow points of what comes after it. */
void cpdf_heading(struct cpdf *r, const char *text, double follow)
{
	cpdf_need(r, 30.0 + follow);
	if (r->st != OW_OK)
		return;
	r->y += 8.0;
	ow_canvas_set_colour(r->cv, cpdf_ink());
	ow_canvas_set_font(r->cv, 12.0, 1);
	ow_canvas_text(r->cv, r->x0, r->y + 10.0, text, OW_ALIGN_LEFT,
	               OW_VALIGN_BASELINE, 0);
	ow_canvas_set_line_width(r->cv, 0.6);
	ow_canvas_move_to(r->cv, r->x0, r->y + 14.5);
	ow_canvas_line_to(r->cv, r->x1, r->y + 14.5);
	ow_canvas_stroke(r->cv);
	r->y += 21.0;
}

/* ---- tables ------------------------------------------------------------ */

static double col_x(const struct cpdf *r, const struct table *t, int c)
{
	double x = r->x0;
	int k;

	for (k = 0; k < c; k++)
		x += t->frac[k] * (r->x1 - r->x0);
	return x;
}

static void row_text(struct cpdf *r, const struct table *t, int c, double y,
                     const char *s)
{
	double x = col_x(r, t, c) + 3.0, w = t->frac[c] * (r->x1 - r->x0);

	if (t->align[c] == OW_ALIGN_RIGHT)
		x += w - 6.0;
	ow_canvas_text(r->cv, x, y, s, t->align[c], OW_VALIGN_BASELINE, 0);
}

void cpdf_table_head(struct cpdf *r, const struct table *t)
{
	char lines[MAX_COLS][3][LINE_LEN];
	double lh = SMALL_PT * LINE, h;
	int n[MAX_COLS], c, i, most = 1;

	for (c = 0; c < t->n; c++) {
		n[c] = wrap(r, t->head[c] ? t->head[c] : "",
		            t->frac[c] * (r->x1 - r->x0) - 6.0, SMALL_PT, 1,
		            lines[c], 3);
		most = n[c] > most ? n[c] : most;
	}
	h = most * lh + 4.0;
	cpdf_need(r, h + 2.0 * lh + 6.0);
	if (r->st != OW_OK)
		return;
	ow_canvas_rect(r->cv, r->x0, r->y, r->x1 - r->x0, h);
	ow_canvas_set_colour(r->cv, ow_rgb(0.86, 0.88, 0.91));
	ow_canvas_fill(r->cv);
	ow_canvas_set_colour(r->cv, cpdf_ink());
	ow_canvas_set_font(r->cv, SMALL_PT, 1);
	for (c = 0; c < t->n; c++)
		for (i = 0; i < n[c]; i++)
			row_text(r, t, c, r->y + 2.0 + (i + 0.8) * lh,
			         lines[c][i]);
	r->y += h;
}

/* One row; cells wrap in their column; shade: a light background; bold:
 * the whole row in bold. The header is repeated after a page break. */
void cpdf_table_row(struct cpdf *r, const struct table *t,
                    const char *const *cells, int shade, int bold)
{
	char lines[MAX_COLS][4][LINE_LEN];
	int n[MAX_COLS], c, i, most = 1;
	double lh = SMALL_PT * LINE, h;

	for (c = 0; c < t->n; c++) {
		n[c] = wrap(r, cells[c] ? cells[c] : "",
		            t->frac[c] * (r->x1 - r->x0) - 6.0, SMALL_PT,
		            bold || c == 0, lines[c], 4);
		most = n[c] > most ? n[c] : most;
	}
	h = most * lh + 3.0;
	if (r->st == OW_OK && r->y + h > r->y1) {
		cpdf_new_page(r);
		cpdf_table_head(r, t);
	}
	if (r->st != OW_OK)
		return;
	if (shade) {
		ow_canvas_rect(r->cv, r->x0, r->y, r->x1 - r->x0, h);
		ow_canvas_set_colour(r->cv, ow_rgb(1.0, 0.95, 0.84));
		ow_canvas_fill(r->cv);
	}
	ow_canvas_set_colour(r->cv, cpdf_ink());
	for (c = 0; c < t->n; c++) {
		ow_canvas_set_font(r->cv, SMALL_PT, bold || c == 0);
		for (i = 0; i < n[c]; i++)
			row_text(r, t, c, r->y + 1.5 + (i + 0.8) * lh,
			         lines[c][i]);
	}
	ow_canvas_set_colour(r->cv, ow_rgb(0.8, 0.8, 0.8));
	ow_canvas_set_line_width(r->cv, 0.4);
	ow_canvas_move_to(r->cv, r->x0, r->y + h);
	ow_canvas_line_to(r->cv, r->x1, r->y + h);
	ow_canvas_stroke(r->cv);
	r->y += h;
}

/* ---- numbers ------------------------------------------------------------ */

#define MINUS "\xE2\x88\x92" /* U+2212 */

/* v with dec decimals, U+2212 for a minus sign, "-0" as "0". */
char *cpdf_fix(char *buf, size_t n, double v, int dec)
{
	char tmp[64];

	if (!isfinite(v)) {
		snprintf(buf, n, "—");
		return buf;
	}
	snprintf(tmp, sizeof tmp, "%.*f", dec, v);
	if (tmp[0] == '-' && strspn(tmp + 1, "0.") == strlen(tmp + 1))
		snprintf(buf, n, "%s", tmp + 1);
	else if (tmp[0] == '-')
		snprintf(buf, n, MINUS "%s", tmp + 1);
	else
		snprintf(buf, n, "%s", tmp);
	return buf;
}

double cpdf_temp(const struct cpdf *r, double K)
{
	return ow_display_value(r->o->units, OW_DIM_TEMPERATURE, K);
}

const char *cpdf_tunit(const struct cpdf *r)
{
	return ow_display_label(r->o->units, OW_DIM_TEMPERATURE);
}

/* ---- footer, saving ------------------------------------------------------ */

static void footer(struct cpdf *r, int k)
{
	char left[320], right[48];
	double y = r->ph - MARGIN_BOTTOM + 22.0;

	open_canvas(r, k);
	if (r->st != OW_OK)
		return;
	snprintf(left, sizeof left,
	         "Comparison: %s and %s   ·   %s   ·   "
	         "opwin %s",
	         cpdf_label(r, 0), cpdf_label(r, 1), r->o->date, OW_VERSION);
	snprintf(right, sizeof right, "page %d of %d", k + 1, r->n_pages);
	ow_canvas_set_colour(r->cv, ow_rgb(0.55, 0.55, 0.55));
	ow_canvas_set_line_width(r->cv, 0.5);
	ow_canvas_move_to(r->cv, r->x0, y);
	ow_canvas_line_to(r->cv, r->x1, y);
	ow_canvas_stroke(r->cv);
	ow_canvas_set_colour(r->cv, ow_rgb(0.25, 0.25, 0.25));
	ow_canvas_set_font(r->cv, 7.5, 0);
	ow_canvas_text(r->cv, r->x0, y + 11.0, left, OW_ALIGN_LEFT,
	               OW_VALIGN_BASELINE, 0);
	ow_canvas_set_font(r->cv, 8.0, 1);
	ow_canvas_text(r->cv, r->x1, y + 11.0, right, OW_ALIGN_RIGHT,
	               OW_VALIGN_BASELINE, 0);
	close_canvas(r);
}

static void save(struct cpdf *r, const char *path)
{
	HPDF_UINT32 len;
	HPDF_BYTE *buf;

	if (r->st != OW_OK)
		return;
	if (HPDF_SaveToStream(r->pdf) != HPDF_OK) {
		check(r);
		return;
	}
	len = HPDF_GetStreamSize(r->pdf);
	buf = malloc(len ? len : 1);
	if (!buf) {
		fail(r, OW_ENOMEM, "out of memory");
		return;
	}
	if (HPDF_ReadFromStream(r->pdf, buf, &len) != HPDF_OK &&
	    !r->hpdf_error) /* the end of the stream is reported as an error */
		HPDF_ResetError(r->pdf);
	check(r);
	if (r->st == OW_OK)
		r->st =
		    ow_results_write_file(path, (const char *)buf, len, r->d);
	free(buf);
}

static int valid_date(const char *s)
{
	int y, m, dd;
	char tail;

	return s && strlen(s) == 10 &&
	       sscanf(s, "%4d-%2d-%2d%c", &y, &m, &dd, &tail) == 3 && m >= 1 &&
	       m <= 12 && dd >= 1 && dd <= 31;
}

static enum ow_status open_doc(struct cpdf *r)
{
	HPDF_Date date;

	r->pdf = HPDF_New(on_error, r);
	if (!r->pdf) {
		fail(r, OW_ENOMEM, "out of memory");
		return r->st;
	}
	HPDF_SetCompressionMode(r->pdf, HPDF_COMP_ALL);
	r->st = ow_canvas_pdf_fonts(r->pdf, &r->fonts, r->d);
	memset(&date, 0, sizeof date);
	date.year = atoi(r->o->date);
	date.month = atoi(r->o->date + 5);
	date.day = atoi(r->o->date + 8);
	date.ind = 'Z';
	HPDF_SetInfoAttr(r->pdf, HPDF_INFO_CREATOR, "opwin " OW_VERSION);
	HPDF_SetInfoDateAttr(r->pdf, HPDF_INFO_CREATION_DATE, date);
	r->pw = 210.0 * MM_PT; /* ISO 216 A4 */
	r->ph = 297.0 * MM_PT;
	r->x0 = MARGIN_X;
	r->x1 = r->pw - MARGIN_X;
	r->y0 = MARGIN_TOP;
	r->y1 = r->ph - MARGIN_BOTTOM;
	check(r);
	return r->st;
}

enum ow_status ow_compare_write_pdf(const struct ow_compare *cmp,
                                    const struct ow_compare_draw_options *o,
                                    const char *pdf_path, struct ow_diag *d)
{
	struct cpdf r;
	int k;

	if (!cmp || !o || !pdf_path)
		return ow_diag_set(d, OW_EARG, "compare.pdf: NULL argument");
	if (!valid_date(o->date))
		return ow_diag_set(d, OW_EARG,
		                   "compare.pdf: date \"%s\": "
		                   "expected YYYY-MM-DD",
		                   o->date ? o->date : "");
	memset(&r, 0, sizeof r);
	r.cmp = cmp;
	r.o = o;
	r.d = d;
	if (open_doc(&r) == OW_OK) {
		cpdf_pages(&r);
		close_canvas(&r);
	}
	for (k = 0; k < r.n_pages && r.st == OW_OK; k++)
		footer(&r, k);
	if (r.st != OW_OK)
		ow_diag_set(d, r.st, "%s: not written", pdf_path);
	save(&r, pdf_path);
	ow_canvas_destroy(r.cv);
	if (r.pdf)
		HPDF_Free(r.pdf);
	return r.st;
}
