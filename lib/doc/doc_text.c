/* doc_text.c - flowing text for both PDF documents: wrapped paragraphs,
 * bullets, headings and tables that break across pages, and numbers in
 * the reader's units. */
#include "doc_impl.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MINUS "\xE2\x88\x92" /* U+2212 */

struct ow_doc_style ow_doc_body(void)
{
	struct ow_doc_style s = {
	    OW_DOC_BODY_PT, 0, {0.08, 0.08, 0.10, 1.0}, 0.0};

	return s;
}

double ow_doc_text_width(struct ow_doc *r, const char *utf8, double size_pt,
                         int bold)
{
	if (!r->cv)
		return 0.0;
	ow_canvas_set_font(r->cv, size_pt, bold);
	return ow_canvas_text_width(r->cv, utf8);
}

/* Bytes of the UTF-8 character starting at s. */
static size_t char_len(const char *s)
{
	unsigned char c = (unsigned char)*s;
	size_t n = 1;

	if (c >= 0xC0)
		while ((((unsigned char)s[n]) & 0xC0) == 0x80)
			n++;
	return n;
}

/* Longest prefix of word (len bytes) that fits width; at least one
 * character. */
static size_t fit_prefix(struct ow_doc *r, const char *word, size_t len,
                         double width, double size, int bold, char *tmp)
{
	size_t k = 0, next;

	for (;;) {
		next = k + char_len(word + k);
		if (next > len)
			return k ? k : len;
		memcpy(tmp, word, next);
		tmp[next] = '\0';
		if (k && ow_doc_text_width(r, tmp, size, bold) > width)
			return k;
		k = next;
	}
}

struct wrap {
	char *buf;
	size_t n, used;
	const char **lines;
	int max, count;
	char *cur; /* the line being built (inside buf) */
};

static void wrap_flush(struct wrap *w)
{
	if (w->cur && w->count < w->max)
		w->lines[w->count++] = w->cur;
	w->cur = NULL;
}

/* Append text (len bytes) to the current line, with a space before it
 * when the line has text. */
static void wrap_put(struct wrap *w, const char *text, size_t len)
{
	int space = w->cur && *w->cur;

	if (w->used + len + 2 > w->n)
		return; /* buffer full: the rest is dropped */
	if (!w->cur) {
		w->cur = w->buf + w->used;
		*w->cur = '\0';
		w->used++;
	}
	w->used--; /* over the NUL */
	if (space)
		w->buf[w->used++] = ' ';
	memcpy(w->buf + w->used, text, len);
	w->used += len;
	w->buf[w->used++] = '\0';
}

/* Would the current line plus word still fit? */
static int fits(struct ow_doc *r, struct wrap *w, const char *word, size_t len,
                double width, double size, int bold)
{
	char tmp[1024];
	int k;

	if (!w->cur || !*w->cur)
		return 1;
	k = snprintf(tmp, sizeof tmp, "%s %.*s", w->cur, (int)len, word);
	return k < (int)sizeof tmp &&
	       ow_doc_text_width(r, tmp, size, bold) <= width;
}

/* Width of the first len bytes of word. */
static double span_width(struct ow_doc *r, const char *word, size_t len,
                         double size, int bold, char *tmp)
{
	memcpy(tmp, word, len);
	tmp[len] = '\0';
	return ow_doc_text_width(r, tmp, size, bold);
}

static void wrap_word(struct ow_doc *r, struct wrap *w, const char *word,
                      size_t len, double width, double size, int bold)
{
	char tmp[1024];
	size_t k;

	if (len >= sizeof tmp)
		len = sizeof tmp - 1; /* no real word is this long */
	if (!fits(r, w, word, len, width, size, bold))
		wrap_flush(w);
	/* a word longer than a whole line is broken between characters */
	while (len > 0 && (!w->cur || !*w->cur) &&
	       span_width(r, word, len, size, bold, tmp) > width) {
		k = fit_prefix(r, word, len, width, size, bold, tmp);
		wrap_put(w, word, k);
		wrap_flush(w);
		word += k;
		len -= k;
	}
	if (len)
		wrap_put(w, word, len);
}

int ow_doc_wrap(struct ow_doc *r, const char *utf8, double width,
                double size_pt, int bold, char *buf, size_t n,
                const char **lines, int max)
{
	struct wrap w = {buf, n, 0, lines, max, 0, NULL};
	const char *p = utf8 ? utf8 : "";

	while (*p) {
		size_t len;

		if (*p == '\n') { /* an explicit line break */
			if (!w.cur)
				wrap_put(&w, "", 0);
			wrap_flush(&w);
			p++;
			continue;
		}
		if (*p == ' ') {
			p++;
			continue;
		}
		len = strcspn(p, " \n");
		wrap_word(r, &w, p, len, width, size_pt, bold);
		p += len;
	}
	wrap_flush(&w);
	return w.count;
}

static void draw_line(struct ow_doc *r, double x, double y, const char *text,
                      const struct ow_doc_style *st)
{
	ow_canvas_set_colour(r->cv, st->colour);
	ow_canvas_set_font(r->cv, st->size_pt, st->bold);
	ow_canvas_text(r->cv, x, y, text, OW_ALIGN_LEFT, OW_VALIGN_BASELINE,
	               0.0);
}

/* Lines of a wrapped text at x, breaking pages between lines. */
static void flow(struct ow_doc *r, const char *utf8, double x, double width,
                 const struct ow_doc_style *st)
{
	char buf[4096];
	const char *lines[96];
	double lh = st->size_pt * OW_DOC_LINE;
	int n, k;

	if (r->st != OW_OK)
		return;
	n = ow_doc_wrap(r, utf8, width, st->size_pt, st->bold, buf, sizeof buf,
	                lines, 96);
	for (k = 0; k < n && r->st == OW_OK; k++) {
		ow_doc_need(r, lh);
		draw_line(r, x, r->y + st->size_pt, lines[k], st);
		r->y += lh;
	}
}

void ow_doc_para(struct ow_doc *r, const char *utf8,
                 const struct ow_doc_style *st, double after_pt)
{
	double x = r->x0 + st->indent_pt;

	flow(r, utf8, x, r->x1 - x, st);
	r->y += after_pt;
}

void ow_doc_bullet(struct ow_doc *r, const char *utf8,
                   const struct ow_doc_style *st)
{
	double x = r->x0 + st->indent_pt, lh = st->size_pt * OW_DOC_LINE;

	if (r->st != OW_OK)
		return;
	ow_doc_need(r, lh);
	ow_canvas_set_colour(r->cv, st->colour);
	ow_canvas_circle(r->cv, x + 3.0, r->y + st->size_pt * 0.62, 1.5);
	ow_canvas_fill(r->cv);
	flow(r, utf8, x + 11.0, r->x1 - x - 11.0, st);
	r->y += st->size_pt * 0.35;
}

void ow_doc_heading(struct ow_doc *r, const char *utf8, double min_follow_pt)
{
	struct ow_doc_style st = {12.5, 1, ow_doc_ink(), 0.0};

	if (r->st != OW_OK)
		return;
	if (r->y > r->y0)
		r->y += 10.0;
	ow_doc_need(r, 26.0 + min_follow_pt);
	draw_line(r, r->x0, r->y + 12.5, utf8, &st);
	r->y += 18.5;
	ow_canvas_set_colour(r->cv, ow_doc_grey(0.35));
	ow_canvas_set_line_width(r->cv, 0.8);
	ow_canvas_move_to(r->cv, r->x0, r->y);
	ow_canvas_line_to(r->cv, r->x1, r->y);
	ow_canvas_stroke(r->cv);
	r->y += 8.0;
}

void ow_doc_subheading(struct ow_doc *r, const char *utf8, double min_follow_pt)
{
	struct ow_doc_style st = {10.0, 1, ow_doc_ink(), 0.0};

	if (r->st != OW_OK)
		return;
	r->y += 5.0;
	ow_doc_need(r, 16.0 + min_follow_pt);
	draw_line(r, r->x0, r->y + 10.0, utf8, &st);
	r->y += 16.0;
}

/* ---- tables ----------------------------------------------------------- */

#define CELL_PAD 3.5 /* left and right of a cell's text */

struct cell_lines {
	char buf[2048];
	const char *lines[40];
	int n;
};

static double col_x(const struct ow_doc *r, const struct ow_doc_table *t, int c)
{
	double x = r->x0;
	int k;

	for (k = 0; k < c; k++)
		x += t->frac[k] * (r->x1 - r->x0);
	return x;
}

/* Draw wrapped lines of cell c in a row starting at y. */
static void cell_draw(struct ow_doc *r, const struct ow_doc_table *t, int c,
                      const struct cell_lines *cl, double y, int bold)
{
	double w = t->frac[c] * (r->x1 - r->x0), x = col_x(r, t, c);
	double lh = t->size_pt * OW_DOC_LINE;
	int k;

	ow_canvas_set_colour(r->cv, ow_doc_ink());
	ow_canvas_set_font(r->cv, t->size_pt, bold);
	if (t->align[c] == OW_ALIGN_RIGHT)
		x += w - CELL_PAD;
	else if (t->align[c] == OW_ALIGN_CENTRE)
		x += w / 2.0;
	else
		x += CELL_PAD;
	for (k = 0; k < cl->n; k++)
		ow_canvas_text(r->cv, x, y + r->row_pad + t->size_pt + k * lh,
		               cl->lines[k], t->align[c], OW_VALIGN_BASELINE,
		               0.0);
}

/* Wrap every cell; returns the row height. */
static double row_layout(struct ow_doc *r, const struct ow_doc_table *t,
                         const char *const *cells, struct cell_lines *cl,
                         int head)
{
	double h = 0.0;
	int c;

	for (c = 0; c < t->n; c++) {
		double w = t->frac[c] * (r->x1 - r->x0) - 2.0 * CELL_PAD;
		int bold = head || (c == 0 && t->first_bold);

		cl[c].n = ow_doc_wrap(r, cells[c] ? cells[c] : "", w,
		                      t->size_pt, bold, cl[c].buf,
		                      sizeof cl[c].buf, cl[c].lines, 40);
		h = fmax(h, cl[c].n * t->size_pt * OW_DOC_LINE);
	}
	return h + 2.0 * r->row_pad;
}

static void row_draw(struct ow_doc *r, const struct ow_doc_table *t,
                     const struct cell_lines *cl, double h,
                     const struct ow_rgba *fill, int head)
{
	int c;

	if (fill) {
		ow_canvas_set_colour(r->cv, *fill);
		ow_canvas_rect(r->cv, r->x0, r->y, r->x1 - r->x0, h);
		ow_canvas_fill(r->cv);
	}
	for (c = 0; c < t->n; c++)
		cell_draw(r, t, c, &cl[c], r->y,
		          head || (c == 0 && t->first_bold));
	r->y += h;
	ow_canvas_set_colour(r->cv, ow_doc_grey(head ? 0.35 : 0.78));
	ow_canvas_set_line_width(r->cv, head ? 0.8 : 0.4);
	ow_canvas_move_to(r->cv, r->x0, r->y);
	ow_canvas_line_to(r->cv, r->x1, r->y);
	ow_canvas_stroke(r->cv);
}

/* Room for the wrapped cells of one row; NULL after a failure. */
static struct cell_lines *cells_new(struct ow_doc *r)
{
	struct cell_lines *cl;

	if (r->st != OW_OK)
		return NULL;
	cl = malloc(sizeof *cl * OW_DOC_MAX_COLS);
	if (!cl)
		ow_doc_fail(r, OW_ENOMEM, "out of memory");
	return cl;
}

void ow_doc_table_head(struct ow_doc *r, const struct ow_doc_table *t)
{
	struct cell_lines *cl;
	double h;

	cl = cells_new(r);
	if (!cl)
		return;
	h = row_layout(r, t, t->head, cl, 1);
	ow_doc_need(r,
	            h + 2.0 * t->size_pt * OW_DOC_LINE); /* keep with a row */
	row_draw(r, t, cl, h, &r->head_fill, 1);
	free(cl);
}

void ow_doc_table_row(struct ow_doc *r, const struct ow_doc_table *t,
                      const char *const *cells, int shade)
{
	struct cell_lines *cl;
	double h;

	cl = cells_new(r);
	if (!cl)
		return;
	h = row_layout(r, t, cells, cl, 0);
	if (ow_doc_need(r, h))
		ow_doc_table_head(r, t); /* the header again on the new page */
	row_draw(r, t, cl, h, shade ? &r->shade_fill : NULL, 0);
	free(cl);
}

void ow_doc_table_end(struct ow_doc *r)
{
	r->y += 8.0;
}

/* ---- cautions --------------------------------------------------------- */

/* Height of n cautions set width wide: each lead one line, its text
 * wrapped, 7 pt after each. */
static double cautions_height(struct ow_doc *r, const struct ow_doc_caution *c,
                              int n, double width)
{
	char buf[2048];
	const char *lines[40];
	double h = 0.0;
	int k;

	for (k = 0; k < n; k++) {
		h += OW_DOC_BODY_PT * OW_DOC_LINE *
		     (1 + ow_doc_wrap(r, c[k].text, width, OW_DOC_BODY_PT, 0,
		                      buf, sizeof buf, lines, 40));
		h += 7.0;
	}
	return h;
}

void ow_doc_cautions(struct ow_doc *r, const struct ow_doc_caution *c, int n,
                     enum ow_doc_caution_form form)
{
	int barred = form == OW_DOC_CAUTIONS_BARRED, k;
	double indent = barred ? 14.0 : 0.0, top;
	struct ow_doc_style lead = {OW_DOC_BODY_PT, 1, ow_doc_ink(), indent};
	struct ow_doc_style st = ow_doc_body();

	st.indent_pt = indent;
	ow_doc_heading(r, "Cautions", barred ? 0.0 : 60.0);
	if (barred)
		ow_doc_need(r,
		            cautions_height(r, c, n, r->x1 - r->x0 - indent));
	top = r->y;
	for (k = 0; k < n; k++) {
		ow_doc_para(r, c[k].lead, &lead, barred ? 0.0 : 1.0);
		ow_doc_para(r, c[k].text, &st, barred ? 7.0 : 6.0);
	}
	if (!barred || r->st != OW_OK || r->y < top)
		return; /* no bar, or a page break (text longer than a page) */
	ow_canvas_set_colour(r->cv, ow_doc_ink());
	ow_canvas_rect(r->cv, r->x0, top, 4.0, r->y - top - 7.0);
	ow_canvas_fill(r->cv);
}

/* ---- numbers ---------------------------------------------------------- */

void ow_doc_trim_zeros(char *s)
{
	char *e;

	if (!strchr(s, '.'))
		return;
	e = s + strlen(s) - 1;
	while (*e == '0')
		*e-- = '\0';
	if (*e == '.')
		*e = '\0';
}

/* "-1.5" -> "−1.5"; "-0" -> "0". */
char *ow_doc_minus(char *buf, size_t n, const char *txt)
{
	if (txt[0] == '-' && strspn(txt + 1, "0.") != strlen(txt + 1))
		snprintf(buf, n, MINUS "%s", txt + 1);
	else
		snprintf(buf, n, "%s", txt[0] == '-' ? txt + 1 : txt);
	return buf;
}

char *ow_doc_fix(char *buf, size_t n, double v, int decimals)
{
	char tmp[64];

	if (!isfinite(v)) {
		snprintf(buf, n, "—");
		return buf;
	}
	snprintf(tmp, sizeof tmp, "%.*f", decimals, v);
	return ow_doc_minus(buf, n, tmp);
}

char *ow_doc_num(char *buf, size_t n, double v, int sig)
{
	char tmp[64];
	int dec;

	if (!isfinite(v)) {
		snprintf(buf, n, "—");
		return buf;
	}
	dec = v == 0.0 ? 0 : sig - 1 - (int)floor(log10(fabs(v)));
	if (dec < 0)
		dec = 0;
	if (dec > 12)
		dec = 12;
	snprintf(tmp, sizeof tmp, "%.*f", dec, v);
	ow_doc_trim_zeros(tmp);
	return ow_doc_minus(buf, n, tmp);
}

char *ow_doc_exact(char *buf, size_t n, double v)
{
	int dec = 0;

	while (dec < 2 &&
	       fabs(v * pow(10.0, dec) - nearbyint(v * pow(10.0, dec))) >
	           0.0005 * pow(10.0, dec))
		dec++;
	return ow_doc_fix(buf, n, v, dec);
}

double ow_doc_shown(const struct ow_doc *r, enum ow_dim dim, double si)
{
	return ow_display_value(r->sys, dim, si);
}

const char *ow_doc_unit(const struct ow_doc *r, enum ow_dim dim)
{
	return ow_display_label(r->sys, dim);
}

char *ow_doc_qty(struct ow_doc *r, char *buf, size_t n, enum ow_dim dim,
                 double si, int sig)
{
	char num[64];
	const char *u = ow_doc_unit(r, dim);

	if (!isfinite(si)) {
		snprintf(buf, n, "%s", "");
		return buf;
	}
	ow_doc_num(num, sizeof num, ow_doc_shown(r, dim, si), sig);
	snprintf(buf, n, "%s%s%s", num, *u ? " " : "", u);
	return buf;
}
