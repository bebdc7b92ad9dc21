/* report_impl.h - internals of the PDF documents (not public): the state
 * of one document being laid out, a flowing text cursor with page breaks,
 * wrapped paragraphs, headings, tables, and number formatting in the
 * reader's units. Every page is one full-page ow_canvas, so text, tables
 * and charts go through the same drawing layer. The report uses all of
 * it; the comparison PDF (compare_pdf.c) uses the document layer and
 * leaves the report's own fields (s, g, w, o) NULL.
 *
 * Every helper returns at once when r->st already holds a failure: a
 * section can be written straight through and checked once. */
#ifndef OW_REPORT_IMPL_H
#define OW_REPORT_IMPL_H

#include <hpdf.h>

#include "ow_canvas.h"
#include "ow_classify.h"
#include "ow_maps.h"
#include "ow_plot.h"
#include "ow_report.h"

#define RPT_MAX_PAGES 64
#define RPT_BODY_PT   9.0  /* body text */
#define RPT_SMALL_PT  8.0  /* tables, captions */
#define RPT_LINE      1.32 /* line height per point of font size */

struct rpt {
	/* the report's inputs (NULL in other documents): the map, and its
	 * study, lattice and window */
	const struct ow_map *m;
	const struct ow_study *s;
	const struct ow_grid *g;
	const struct ow_window *w;
	const struct ow_report_options *o;
	enum ow_unit_system sys;
	HPDF_Doc pdf;
	struct ow_canvas_fonts fonts;
	HPDF_Page pages[RPT_MAX_PAGES];
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
struct ow_rgba rpt_ink(void);
struct ow_rgba rpt_grey(double level);

/* ---- the document, pages and the cursor (report.c) ---- */

/* Is s a date "YYYY-MM-DD"? */
int rpt_valid_date(const char *s);
/* Start the document in r (zeroed, with r->d set): libharu with an error
 * handler, compressed, DejaVu Sans embedded, creator and date (valid
 * YYYY-MM-DD) in its information, page size of paper and the margins;
 * name ("report") begins every message. Grey table fills, 3.5 pt row padding.
 * Returns r->st. */
enum ow_status rpt_open(struct rpt *r, const char *name, enum ow_paper paper,
                        const char *date);
/* Finish the document: close the last page, a footer on every page (a
 * rule, r->foot_title and "page N of M", then r->foot_line), write it
 * atomically to path (nothing on a failure) and free it. Returns the
 * first failure. */
enum ow_status rpt_close(struct rpt *r, const char *path);

/* Start a new page (closing the previous page's canvas). */
void rpt_new_page(struct rpt *r);
/* Make room for h points below the cursor: a new page when they do not
 * fit. Returns 1 when a page was started. */
int rpt_need(struct rpt *r, double h);
/* Record a failure (the first one is kept; its message is "name: what")
 * and return it. */
enum ow_status rpt_fail(struct rpt *r, enum ow_status st, const char *what);
/* Check the canvas and libharu after drawing a block. */
void rpt_check(struct rpt *r);

/* ---- text (report_text.c) ---- */

struct rpt_style {
	double size_pt;
	int bold;
	struct ow_rgba colour;
	double indent_pt; /* from the left edge of the column */
};

struct rpt_style rpt_body(void);

/* Width of utf8 at size and weight. */
double rpt_text_width(struct rpt *r, const char *utf8, double size_pt,
                      int bold);

/* Break utf8 into lines no wider than width: the lines go one after the
 * other into buf (each NUL-terminated), their starts into lines[];
 * returns the count (at most max). Breaks at spaces; a word wider than a
 * line is broken between characters. */
int rpt_wrap(struct rpt *r, const char *utf8, double width, double size_pt,
             int bold, char *buf, size_t n, const char **lines, int max);

/* A wrapped paragraph at the cursor, breaking pages between lines; space
 * after it: after_pt. */
void rpt_para(struct rpt *r, const char *utf8, const struct rpt_style *st,
              double after_pt);
/* A bulleted paragraph. */
void rpt_bullet(struct rpt *r, const char *utf8, const struct rpt_style *st);
/* A section heading (kept with the next min_follow_pt of content). */
void rpt_heading(struct rpt *r, const char *utf8, double min_follow_pt);
/* A smaller heading inside a section. */
void rpt_subheading(struct rpt *r, const char *utf8, double min_follow_pt);

/* ---- tables (report_text.c) ---- */

#define RPT_MAX_COLS 8

struct rpt_table {
	int n;
	const char *head[RPT_MAX_COLS];
	double frac[RPT_MAX_COLS]; /* share of the column width */
	enum ow_halign align[RPT_MAX_COLS];
	double size_pt;
	int first_bold; /* first column in bold */
};

/* Header row (repeated after a page break by rpt_table_row). */
void rpt_table_head(struct rpt *r, const struct rpt_table *t);
/* One row: t->n cells (NULL: empty); cells wrap inside their column.
 * shade: a light background (0 none). */
void rpt_table_row(struct rpt *r, const struct rpt_table *t,
                   const char *const *cells, int shade);
/* Space after a table. */
void rpt_table_end(struct rpt *r);

/* ---- numbers in the reader's units (report_text.c) ---- */

/* v with sig significant digits, trailing zeros dropped, U+2212 minus. */
char *rpt_num(char *buf, size_t n, double v, int sig);
/* v with the fewest decimals (0 to 2) that show it to 0.0005. */
char *rpt_exact(char *buf, size_t n, double v);
/* A range lo..hi (SI) of dim in the report's units, rounded inwards to
 * decimals (more when that would empty it), and its centre (SI, NAN:
 * none) rounded to the same decimals. */
void rpt_range(const struct rpt *r, enum ow_dim dim, double lo, double hi,
               double centre, int decimals, char out[3][32]);
/* v with a fixed number of decimals, U+2212 minus. */
char *rpt_fix(char *buf, size_t n, double v, int decimals);
/* SI value of dim in the report's units: "63.5 mm" (sig digits), "" for
 * NAN. */
char *rpt_qty(struct rpt *r, char *buf, size_t n, enum ow_dim dim, double si,
              int sig);
/* SI value of dim in the report's units as a number only. */
double rpt_shown(const struct rpt *r, enum ow_dim dim, double si);
const char *rpt_unit(const struct rpt *r, enum ow_dim dim);

/* The source text of input key ("resin.melt_density"), or NULL; marks it
 * shown (shown[] has OW_MAX_SOURCES flags). */
const char *rpt_source(const struct rpt *r, const char *key,
                       unsigned char *shown);

/* ---- the sections ---- */

void rpt_front_page(struct rpt *r);   /* report_front.c */
void rpt_map_pages(struct rpt *r);    /* report_pages.c */
void rpt_profile_page(struct rpt *r); /* report_pages.c */
void rpt_inputs(struct rpt *r);       /* report_inputs.c */
void rpt_basis(struct rpt *r);        /* report_basis.c */
void rpt_calib_page(struct rpt *r);   /* report_calib.c */
void rpt_calib_note(struct rpt *r);   /* report_calib.c: front page line */
void rpt_spread_page(struct rpt *r);  /* report_spread.c */

/* The window-map options for the report's units and current point. */
void rpt_map_options(const struct rpt *r, struct ow_maps_options *mo);
/* A map box h high at the current line, as wide as the map's aspect
 * allows, centred in the column. */
struct ow_rect rpt_map_box(const struct rpt *r, double h);
/* "peak melt temperature ≤ 240 °C" for check c (a flag: "... (always
 * unsafe)"). */
char *rpt_limit_text(struct rpt *r, enum ow_check c, char *buf, size_t n);
/* "zone 5" style name of the reference zone ("zone 5 (24–30 D)"). */
char *rpt_zone_name(const struct rpt *r, int z, char *buf, size_t n);

/* Give the finished PDF in *buf (malloc'd, *len bytes) a valid ToUnicode
 * map for its fonts by an incremental update (report_unicode.c); *buf
 * may be reallocated. OW_ENOMEM leaves *buf holding the document as it
 * was. */
enum ow_status rpt_fix_to_unicode(unsigned char **buf, size_t *len,
				  struct ow_diag *d);

#endif
