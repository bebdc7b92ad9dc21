/* compare_pdf_impl.h - inside the comparison PDF (not public): one
 * document being laid out, a flowing cursor with page breaks, wrapped
 * paragraphs, headings and tables (compare_pdf.c), and the pages'
 * content (compare_pages.c). Every helper returns at once when the
 * document already holds a failure, so a section is written straight
 * through and checked once. */
#ifndef OW_COMPARE_PDF_IMPL_H
#define OW_COMPARE_PDF_IMPL_H

#include <hpdf.h>
#include <stddef.h>

#include "ow_compare.h"

#define MAX_PAGES 32
#define BODY_PT   9.0  /* body text */
#define SMALL_PT  8.0  /* tables */
#define LINE      1.32 /* line height per point of font size */
#define MAX_LINES 24   /* lines of one paragraph */
#define LINE_LEN  256
#define MAX_COLS  6

struct cpdf {
	const struct ow_compare *cmp;
	const struct ow_compare_draw_options *o;
	HPDF_Doc pdf;
	struct ow_canvas_fonts fonts;
	HPDF_Page pages[MAX_PAGES];
	int n_pages;
	struct ow_canvas *cv;  /* the current page's canvas */
	double pw, ph;         /* page size, pt */
	double x0, x1, y0, y1; /* text column and its top and bottom */
	double y;              /* cursor: top of the next block */
	enum ow_status st;     /* first failure */
	struct ow_diag *d;
	HPDF_STATUS hpdf_error; /* first libharu error */
};

struct table {
	int n;
	const char *head[MAX_COLS];
	double frac[MAX_COLS]; /* share of the column width */
	enum ow_halign align[MAX_COLS];
};

/* Short name of case k ("A" unless given). */
const char *cpdf_label(const struct cpdf *r, int k);
struct ow_rgba cpdf_ink(void);

void cpdf_new_page(struct cpdf *r);
/* Room for h points below the cursor, or a new page. */
void cpdf_need(struct cpdf *r, double h);
double cpdf_width_of(struct cpdf *r, const char *s, double size, int bold);

/* A wrapped paragraph at indent from the left edge, after points below. */
void cpdf_para(struct cpdf *r, const char *text, double size, int bold,
               double indent, double after);
/* A section heading kept with at least follow points of content. */
void cpdf_heading(struct cpdf *r, const char *text, double follow);

void cpdf_table_head(struct cpdf *r, const struct table *t);
/* One row: t->n cells wrapping in their columns (first column bold);
 * shade: a light background; bold: the whole row bold. */
void cpdf_table_row(struct cpdf *r, const struct table *t,
                    const char *const *cells, int shade, int bold);

/* v with dec decimals, U+2212 minus, "—" for NAN. Returns buf. */
char *cpdf_fix(char *buf, size_t n, double v, int dec);
/* A set-point in the reader's unit, and that unit's label. */
double cpdf_temp(const struct cpdf *r, double K);
const char *cpdf_tunit(const struct cpdf *r);

/* Every page's content (compare_pages.c). */
void cpdf_pages(struct cpdf *r);

#endif
