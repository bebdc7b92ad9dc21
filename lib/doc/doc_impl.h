/* doc_impl.h - the PDF document layer (not public) under both PDFs, the
 * report (report*.c) and the comparison (compare_pdf.c): the state of
 * one document being laid out, pages each drawn through one full-page
 * ow_canvas (so text, tables and charts share one drawing layer), a
 * flowing text cursor with page breaks, wrapped paragraphs, headings,
 * tables, the title block, the cautions, footers, and numbers in the
 * reader's units.
 *
 * Every helper returns at once when doc->st already holds a failure: a
 * section can be written straight through and checked once. */
#ifndef OW_DOC_IMPL_H
#define OW_DOC_IMPL_H

#include <hpdf.h>
#include <stddef.h>

#include "ow_canvas.h"
#include "ow_report.h"
#include "ow_status.h"
#include "ow_units.h"

#define OW_DOC_MAX_PAGES 64
#define OW_DOC_BODY_PT   9.0  /* body text */
#define OW_DOC_SMALL_PT  8.0  /* tables, captions */
#define OW_DOC_LINE      1.32 /* line height per point of font size */

struct ow_doc {
	enum ow_unit_system sys; /* what people read */
	HPDF_Doc pdf;
	struct ow_canvas_fonts fonts;
	HPDF_Page pages[OW_DOC_MAX_PAGES];
	int n_pages;
	struct ow_canvas *cv; /* the current page's canvas */
	double pw, ph;        /* page size, pt */
	double x0, x1;        /* text column: left and right edges */
	double y0, y1;        /* top of the text area, bottom of it */
	double y;             /* cursor: top of the next block */
	enum ow_status st;    /* first failure */
	struct ow_diag *d;
	HPDF_STATUS hpdf_error, hpdf_detail; /* first libharu error */
	const char *name;          /* the document in messages: "report" */
	char foot_title[320];      /* footer, first line (cut to fit) */
	char foot_line[200];       /* footer, second line ("": none) */
	struct ow_rgba head_fill;  /* table header background */
	struct ow_rgba shade_fill; /* background of a shaded table row */
	double row_pad;            /* above and below a table row's text, pt */
};

/* Grey levels and the accent used by the text pages. */
struct ow_rgba ow_doc_ink(void);
struct ow_rgba ow_doc_grey(double level);

/* ---- the document, pages and the cursor (doc.c) ---- */

/* Is s a date "YYYY-MM-DD"? */
int ow_doc_valid_date(const char *s);
/* Start the document in r (zeroed, with r->d set): libharu with an error
 * handler, compressed, DejaVu Sans embedded, creator and date (valid
 * YYYY-MM-DD) in its information, page size of paper and the margins;
 * name ("report") begins every message. Grey table fills, 3.5 pt row padding.
 * Returns r->st. */
enum ow_status ow_doc_open(struct ow_doc *r, const char *name,
                           enum ow_paper paper, const char *date);
/* Finish the document: close the last page, a footer on every page (a
 * rule, r->foot_title and "page N of M", then r->foot_line), write it
 * atomically to path (nothing on a failure) and free it. Returns the
 * first failure. */
enum ow_status ow_doc_close(struct ow_doc *r, const char *path);

/* Start a new page (closing the previous page's canvas). */
void ow_doc_new_page(struct ow_doc *r);
/* Make room for h points below the cursor: a new page when they do not
 * fit. Returns 1 when a page was started. */
int ow_doc_need(struct ow_doc *r, double h);
/* Record a failure (the first one is kept; its message is "name: what")
 * and return it. */
enum ow_status ow_doc_fail(struct ow_doc *r, enum ow_status st,
                           const char *what);
/* Check the canvas and libharu after drawing a block. */
void ow_doc_check(struct ow_doc *r);

/* ---- text (doc_text.c) ---- */

struct ow_doc_style {
	double size_pt;
	int bold;
	struct ow_rgba colour;
	double indent_pt; /* from the left edge of the column */
};

struct ow_doc_style ow_doc_body(void);

/* Width of utf8 at size and weight. */
double ow_doc_text_width(struct ow_doc *r, const char *utf8, double size_pt,
                         int bold);

/* Break utf8 into lines no wider than width: the lines go one after the
 * other into buf (each NUL-terminated), their starts into lines[];
 * returns the count (at most max). Breaks at spaces; a word wider than a
 * line is broken between characters. */
int ow_doc_wrap(struct ow_doc *r, const char *utf8, double width,
                double size_pt, int bold, char *buf, size_t n,
                const char **lines, int max);

/* A wrapped paragraph at the cursor, breaking pages between lines; space
 * after it: after_pt. */
void ow_doc_para(struct ow_doc *r, const char *utf8,
                 const struct ow_doc_style *st, double after_pt);
/* A bulleted paragraph. */
void ow_doc_bullet(struct ow_doc *r, const char *utf8,
                   const struct ow_doc_style *st);
/* A section heading (kept with the next min_follow_pt of content). */
void ow_doc_heading(struct ow_doc *r, const char *utf8, double min_follow_pt);
/* A smaller heading inside a section. */
void ow_doc_subheading(struct ow_doc *r, const char *utf8,
                       double min_follow_pt);

/* ---- tables (doc_text.c) ---- */

#define OW_DOC_MAX_COLS 8

struct ow_doc_table {
	int n;
	const char *head[OW_DOC_MAX_COLS];
	double frac[OW_DOC_MAX_COLS]; /* share of the column width */
	enum ow_halign align[OW_DOC_MAX_COLS];
	double size_pt;
	int first_bold; /* first column in bold */
};

/* Header row (repeated after a page break by ow_doc_table_row). */
void ow_doc_table_head(struct ow_doc *r, const struct ow_doc_table *t);
/* One row: t->n cells (NULL: empty); cells wrap inside their column.
 * shade: a light background (0 none). */
void ow_doc_table_row(struct ow_doc *r, const struct ow_doc_table *t,
                      const char *const *cells, int shade);
/* Space after a table. */
void ow_doc_table_end(struct ow_doc *r);

/* ---- cautions (doc_text.c) ---- */

/* One caution: a bold lead sentence and the paragraph after it. */
struct ow_doc_caution {
	const char *lead, *text;
};

/* How a document sets its cautions. */
enum ow_doc_caution_form {
	/* indented beside a solid bar (visible in greyscale print), kept
	 * on one page with it */
	OW_DOC_CAUTIONS_BARRED,
	/* flush with the column, each lead close to its paragraph */
	OW_DOC_CAUTIONS_PLAIN
};

/* The n cautions c under the heading "Cautions", in the given form. */
void ow_doc_cautions(struct ow_doc *r, const struct ow_doc_caution *c, int n,
                     enum ow_doc_caution_form form);

/* ---- numbers in the reader's units (doc_text.c) ---- */

/* v with sig significant digits, trailing zeros dropped, U+2212 minus. */
char *ow_doc_num(char *buf, size_t n, double v, int sig);
/* v with the fewest decimals (0 to 2) that show it to 0.0005. */
char *ow_doc_exact(char *buf, size_t n, double v);
/* v with a fixed number of decimals, U+2212 minus. */
char *ow_doc_fix(char *buf, size_t n, double v, int decimals);
/* A printed number txt with U+2212 for its minus sign ("-0" -> "0")
 * into buf; returns buf. */
char *ow_doc_minus(char *buf, size_t n, const char *txt);
/* Drop trailing zeros (and a bare point) of a fixed-point text. */
void ow_doc_trim_zeros(char *s);
/* SI value of dim in the document's units: "63.5 mm" (sig digits), ""
 * for NAN. */
char *ow_doc_qty(struct ow_doc *r, char *buf, size_t n, enum ow_dim dim,
                 double si, int sig);
/* SI value of dim in the document's units as a number only. */
double ow_doc_shown(const struct ow_doc *r, enum ow_dim dim, double si);
const char *ow_doc_unit(const struct ow_doc *r, enum ow_dim dim);

/* Give the finished PDF in *buf (malloc'd, *len bytes) a valid ToUnicode
 * map for its fonts by an incremental update (doc_unicode.c); *buf
 * may be reallocated. OW_ENOMEM leaves *buf holding the document as it
 * was. */
enum ow_status ow_doc_fix_to_unicode(unsigned char **buf, size_t *len,
                                     struct ow_diag *d);

#endif
