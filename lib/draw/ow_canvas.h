/* ow_canvas.h - one small 2-D drawing interface with two back-ends, so
 * every chart is drawn by one piece of plot code:
 *   - cairo: a PNG (raster) or an SVG (vector) image held in memory and
 *     written atomically to a file, or handed out as bytes;
 *   - libharu: vector paths and text drawn onto a rectangle of an
 *     HPDF_Page that the caller's document owns (lib/report).
 *
 * Coordinates are points (1/72 in), origin at the top-left of the canvas,
 * y pointing down, in both back-ends (the PDF back-end flips and places).
 * Text is UTF-8 in DejaVu Sans (regular and bold), loaded from its TTF
 * file (FreeType for cairo; a UTF-8 TTF font for libharu), so the output
 * does not depend on the machine's font configuration.
 *
 * Drawing calls return nothing: the first failure is kept in the canvas
 * and read with ow_canvas_status() (like cairo's own sticky status), so
 * plot code can draw a whole chart and check once. A canvas is used by
 * one thread at a time. Public header: no third-party headers, libharu
 * handles are passed as opaque pointers. */
#ifndef OW_CANVAS_H
#define OW_CANVAS_H

#include <stddef.h>

#include "ow_status.h"

#ifndef OW_FONT_DIR
#define OW_FONT_DIR "/usr/share/fonts/truetype/dejavu"
#endif
#define OW_FONT_REGULAR_FILE OW_FONT_DIR "/DejaVuSans.ttf"
#define OW_FONT_BOLD_FILE    OW_FONT_DIR "/DejaVuSans-Bold.ttf"

struct ow_canvas;

/* A colour, components 0..1, alpha 1 = opaque. */
struct ow_rgba {
	double r, g, b, a;
};

enum ow_canvas_format {
	OW_CANVAS_PNG, /* ARGB raster, scale pixels per point */
	OW_CANVAS_SVG  /* vector, sized in points */
};

/* Horizontal anchor of a text: x is its left end, centre or right end. */
enum ow_halign { OW_ALIGN_LEFT, OW_ALIGN_CENTRE, OW_ALIGN_RIGHT };

/* Vertical anchor: y is the baseline, the middle of the capitals, the top
 * of the capitals, or the bottom of the descenders. */
enum ow_valign {
	OW_VALIGN_BASELINE,
	OW_VALIGN_MIDDLE,
	OW_VALIGN_TOP,
	OW_VALIGN_BOTTOM
};

/* A fill made of parallel lines (readable in greyscale print), drawn over
 * whatever lies under the path. angle_deg counter-clockwise from the x
 * axis as seen; spacing between lines and line width in points. */
struct ow_hatch {
	double angle_deg;
	double spacing_pt;
	double width_pt;
	struct ow_rgba colour;
};

/* An image canvas (PNG or SVG) of width_pt x height_pt points. PNG: scale
 * pixels per point (1.5 gives a 900 x 650 px image from 600 x 433.3 pt);
 * SVG ignores scale. The background starts transparent: fill it white if
 * you want paper. Loads both fonts; OW_EIO with the file name when a font
 * is missing ("font .../DejaVuSans.ttf is missing: install the Debian
 * package fonts-dejavu-core"). Free with ow_canvas_destroy. */
enum ow_status ow_canvas_create_image(enum ow_canvas_format fmt,
                                      double width_pt, double height_pt,
                                      double scale, struct ow_canvas **out,
                                      struct ow_diag *d);

/* Fonts of a libharu document: HPDF_Font handles (regular, bold), loaded
 * once per document. */
struct ow_canvas_fonts {
	void *regular;
	void *bold;
};

/* Load DejaVu Sans and DejaVu Sans Bold into the HPDF_Doc hpdf_doc as
 * embedded TTF fonts with the UTF-8 encoder (it calls HPDF_UseUTFEncodings
 * and makes "UTF-8" the current encoder). OW_EIO naming the file when a
 * font file is missing or libharu refuses it. */
enum ow_status ow_canvas_pdf_fonts(void *hpdf_doc, struct ow_canvas_fonts *out,
                                   struct ow_diag *d);

/* Where a PDF canvas lies on its page: its top-left corner at (x_pt, y_pt)
 * measured from the page's top-left corner (y down), and scale page
 * points per canvas point (1: same size; 0.8 shrinks a 600 pt wide chart
 * to 480 pt). */
struct ow_canvas_place {
	double x_pt, y_pt;
	double scale;
};

/* A canvas of width_pt x height_pt (canvas points) drawing onto the
 * HPDF_Page hpdf_page of the HPDF_Doc hpdf_doc, at place, with fonts (from
 * ow_canvas_pdf_fonts). Doc, page and fonts are borrowed: they must
 * outlive the canvas; the canvas writes only inside GSave/GRestore pairs
 * it opens itself and leaves the page's graphics state as it found it.
 * Failed libharu calls (non-zero HPDF_STATUS) become OW_EIO in the
 * canvas status; the document's error handler stays the caller's. */
enum ow_status ow_canvas_create_pdf(void *hpdf_doc, void *hpdf_page,
                                    const struct ow_canvas_fonts *fonts,
                                    const struct ow_canvas_place *place,
                                    double width_pt, double height_pt,
                                    struct ow_canvas **out, struct ow_diag *d);

/* Free the canvas (NULL-safe). An image not yet written is discarded; a
 * PDF canvas closes any graphics states still open on the page. */
void ow_canvas_destroy(struct ow_canvas *cv);

/* The first failure of any drawing call so far (OW_OK if none), its
 * message copied into d. */
enum ow_status ow_canvas_status(const struct ow_canvas *cv, struct ow_diag *d);

/* Image canvases only: finish drawing and write the PNG or SVG to path
 * atomically (temporary file in the same folder, then rename). After this
 * the canvas accepts no more drawing. OW_EIO naming the path on failure,
 * OW_EARG for a PDF canvas; a drawing failure recorded earlier is
 * returned instead of writing. */
enum ow_status ow_canvas_write_file(struct ow_canvas *cv, const char *path,
                                    struct ow_diag *d);

/* Image canvases only: finish drawing and return the encoded PNG or SVG
 * bytes in *bytes (malloc'd, the caller frees), their count in *len.
 * Same inputs give byte-identical PNGs (no timestamps). */
enum ow_status ow_canvas_encode(struct ow_canvas *cv, unsigned char **bytes,
                                size_t *len, struct ow_diag *d);

/* --- graphics state (saved and restored together) -------------------- */

void ow_canvas_save(struct ow_canvas *cv);
void ow_canvas_restore(struct ow_canvas *cv);

/* Colour of every later fill, stroke, hatch and text. */
void ow_canvas_set_colour(struct ow_canvas *cv, struct ow_rgba c);
void ow_canvas_set_line_width(struct ow_canvas *cv, double width_pt);

/* Dash pattern: n lengths in points, on-off-on-...; n = 0: solid.
 * At most 8 lengths. (The PDF back-end rounds lengths to whole points,
 * at least 1.) */
void ow_canvas_set_dash(struct ow_canvas *cv, const double *lengths_pt, int n);

/* Font size in points and weight (bold 1) of later text. */
void ow_canvas_set_font(struct ow_canvas *cv, double size_pt, int bold);

/* --- paths ----------------------------------------------------------- */

void ow_canvas_move_to(struct ow_canvas *cv, double x, double y);
void ow_canvas_line_to(struct ow_canvas *cv, double x, double y);
/* Cubic Bezier from the current point through controls 1, 2 to 3. */
void ow_canvas_curve_to(struct ow_canvas *cv, double x1, double y1, double x2,
                        double y2, double x3, double y3);
void ow_canvas_close_path(struct ow_canvas *cv);
/* A closed rectangle sub-path. */
void ow_canvas_rect(struct ow_canvas *cv, double x, double y, double w,
                    double h);
/* A closed circle sub-path (four Bezier arcs). */
void ow_canvas_circle(struct ow_canvas *cv, double cx, double cy, double r);
/* Forget the current path without drawing it. */
void ow_canvas_new_path(struct ow_canvas *cv);

/* Fill (non-zero winding) or stroke the current path, which is then
 * cleared; the _preserve forms keep it for a second operation. */
void ow_canvas_fill(struct ow_canvas *cv);
void ow_canvas_fill_preserve(struct ow_canvas *cv);
void ow_canvas_stroke(struct ow_canvas *cv);
void ow_canvas_stroke_preserve(struct ow_canvas *cv);

/* Fill the current path with hatch lines h (clears the path). The lines
 * are drawn over what lies below; tint first with ow_canvas_fill_preserve
 * if the region should also carry a colour. */
void ow_canvas_hatch(struct ow_canvas *cv, const struct ow_hatch *h);

/* Intersect the clip region with the current path (clears the path) or
 * with a rectangle. Undone by ow_canvas_restore. */
void ow_canvas_clip(struct ow_canvas *cv);
void ow_canvas_clip_rect(struct ow_canvas *cv, double x, double y, double w,
                         double h);

/* --- text ------------------------------------------------------------ */

/* Draw utf8 anchored at (x, y) by ha, va, rotated angle_deg
 * counter-clockwise as seen (90: reading upwards) about the anchor. */
void ow_canvas_text(struct ow_canvas *cv, double x, double y, const char *utf8,
                    enum ow_halign ha, enum ow_valign va, double angle_deg);

/* Advance width of utf8 in points at the current font and size. */
double ow_canvas_text_width(struct ow_canvas *cv, const char *utf8);

/* Useful constants. */
struct ow_rgba ow_rgb(double r, double g, double b);
struct ow_rgba ow_rgba_with_alpha(struct ow_rgba c, double a);

#endif
