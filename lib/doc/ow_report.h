/* ow_report.h - the PDF report of a study's operating window, for a
 * process engineer to sign and a quality team to attach to a work
 * instruction (libharu; every chart drawn by lib/maps on a PDF canvas).
 *
 * Page 1: title block (title, screw, resin, date, revision, prepared by,
 * approved by), the recommended window as a table (screw speed, reference
 * zone and every zone's set-point range, throughput, melt temperature at
 * discharge, hottest peak, centre point, the current point if given) and
 * the window map; an empty window says so and names the limits that
 * exclude the most points. Then the figure maps, the profiles at the
 * centre point, the inputs with their sources, the model basis and what it
 * leaves out, and the cautions. Every page carries "page N of M" and a
 * footer with the title, the date and the inputs' CRC-32.
 *
 * Text is DejaVu Sans (embedded TTF, UTF-8); streams are compressed. */
#ifndef OW_REPORT_H
#define OW_REPORT_H

#include <stddef.h>

#include "ow_map.h"
#include "ow_status.h"
#include "ow_units.h"

enum ow_paper {
	OW_PAPER_A4,    /* 210 x 297 mm (595.28 x 841.89 pt) */
	OW_PAPER_LETTER /* 8.5 x 11 in (612 x 792 pt) */
};

struct ow_report_options {
	enum ow_paper paper;
	enum ow_unit_system units; /* what people read */
	const char *date;          /* "YYYY-MM-DD" (required: the caller
	                              gives it, so output is reproducible) */
	const char *revision;      /* NULL or "": a blank line to fill in */
	const char *prepared_by;   /* NULL or "": a blank line */
	const char *approved_by;   /* NULL or "": a blank line */
	int has_current;           /* 1: the line's current operating point */
	double current_rpm;        /* rev/min */
	double current_set_K;      /* reference zone's set-point, K */
};

/* Defaults: A4, SI, no date, blank revision and names, no current
 * point. */
void ow_report_default(struct ow_report_options *o);

/* "a4" or "letter" (any case) -> *out; OW_EARG otherwise. */
enum ow_status ow_report_paper_parse(const char *s, enum ow_paper *out);

/* Decimals of the window table: screw speed to 0.1 rpm, set-points to
 * whole degrees (°C or °F), as drives and controllers are set. When the
 * inward rounding below would empty a range, that range gets one more. */
#define OW_REPORT_RPM_DECIMALS  0
#define OW_REPORT_TEMP_DECIMALS 0

/* Which way a printed bound is rounded: towards the inside of the window,
 * so every printed range lies within the computed one. */
enum ow_round {
	OW_ROUND_NEAREST, /* centre and other single values */
	OW_ROUND_UP,      /* a lower bound */
	OW_ROUND_DOWN     /* an upper bound */
};

/* A window bound as the report prints it: v (already in display units)
 * rounded to `decimals` places in direction dir, trailing zeros dropped,
 * U+2212 for a minus sign. Returns buf. Tests use it to find the bounds
 * of window.json in the report's text. */
char *ow_report_format_bound(char *buf, size_t n, double v, int decimals,
                             enum ow_round dir);

/* Write the report of map m to pdf_path (the centre column and the
 * profile page from m's centre, taken from the lattice where m has none
 * and the sweep solved it there; the page on the spread when m has one):
 * built in memory, then written to a temporary file in the same folder
 * and renamed, so a failure leaves nothing behind (and no half-written
 * file in place of a good one). OW_EARG for a missing or malformed date
 * or NULL arguments; OW_EIO naming the path when the file cannot be
 * written, the font files are missing, or libharu fails (its first error
 * code in the message); OW_ENOMEM. */
enum ow_status ow_report_write(const struct ow_map *m,
                               const struct ow_report_options *o,
                               const char *pdf_path, struct ow_diag *d);

/* report.pdf and the map images (ow_maps_write_all with mo) into the
 * existing folder dir, drawn side by side on mo->jobs threads: the report
 * and every image file are separate pieces of work, and the files are the
 * same for any thread count. Errors as the two functions give them (an
 * image's before the report's). */
struct ow_maps_options;
enum ow_status ow_report_write_folder(const struct ow_map *m,
                                      const struct ow_report_options *o,
                                      const struct ow_maps_options *mo,
                                      const char *dir, struct ow_diag *d);

#endif
