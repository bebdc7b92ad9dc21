/* canvas_impl.h - inside the canvas: the state every back-end reads and
 * the table of back-end operations (lib/canvas.c dispatches; back-ends in
 * canvas_cairo.c (PNG), canvas_svg.c (SVG) and canvas_pdf.c (libharu)). */
#ifndef OW_CANVAS_IMPL_H
#define OW_CANVAS_IMPL_H

#include "ow_canvas.h"

#define CANVAS_MAX_DASH  8
#define CANVAS_MAX_DEPTH 16 /* libharu allows 28 nested GSave */

/* DejaVu Sans metrics as fractions of the em (its 'OS/2' and 'hhea'
 * tables: cap height 1493, descender 483 of 2048 units), used to place
 * text by its capitals the same way in every back-end. */
#define CANVAS_CAP_EM  0.729
#define CANVAS_DESC_EM 0.236

struct canvas_state {
	struct ow_rgba colour;
	double line_width;
	double dash[CANVAS_MAX_DASH];
	int n_dash;
	double font_pt;
	int bold;
};

enum canvas_op { CANVAS_MOVE, CANVAS_LINE, CANVAS_CURVE, CANVAS_CLOSE };

struct canvas_seg {
	enum canvas_op op;
	double p[6]; /* x, y (move, line); x1 y1 x2 y2 x3 y3 (curve) */
};

enum canvas_paint { CANVAS_FILL, CANVAS_STROKE, CANVAS_CLIP };

struct ow_canvas;

struct canvas_ops {
	/* paint the current path (cv->path) with the current state */
	void (*paint)(struct ow_canvas *cv, enum canvas_paint op);
	void (*save)(struct ow_canvas *cv);
	void (*restore)(struct ow_canvas *cv);
	/* show s with its origin at (dx, dy) in a frame translated to
	 * (x, y) and rotated by angle_rad counter-clockwise as seen */
	void (*text)(struct ow_canvas *cv, double x, double y, double angle_rad,
	             double dx, double dy, const char *s);
	double (*text_width)(struct ow_canvas *cv, const char *s);
	/* image back-ends: finish and hand out the encoded bytes */
	enum ow_status (*encode)(struct ow_canvas *cv, unsigned char **bytes,
	                         size_t *len, struct ow_diag *d);
	void (*destroy)(struct ow_canvas *cv);
};

struct ow_canvas {
	const struct canvas_ops *ops;
	void *impl; /* back-end data */
	double width_pt, height_pt;
	int finished;
	enum ow_status st; /* first failure */
	struct ow_diag diag;
	struct canvas_state gs;
	struct canvas_state stack[CANVAS_MAX_DEPTH];
	int depth;
	struct canvas_seg *path;
	int n_path, cap_path;
};

/* A canvas with default state for a back-end (impl filled by caller). */
struct ow_canvas *ow_canvas_new(const struct canvas_ops *ops, double width_pt,
                                double height_pt);

/* Record a failure (the first one is kept). */
void ow_canvas_fail(struct ow_canvas *cv, enum ow_status st, const char *fmt,
                    ...) __attribute__((format(printf, 3, 4)));

/* FreeType faces of DejaVu Sans regular and bold as cairo font faces,
 * for the cairo back-end and the SVG back-end's text measure
 * (canvas_cairo.c). */
struct canvas_ft;
enum ow_status ow_canvas_ft_open(struct canvas_ft **out, struct ow_diag *d);
void ow_canvas_ft_close(struct canvas_ft *f);
/* Select the face and size on a cairo_t (unhinted). */
void ow_canvas_ft_select(void *cairo_cr, struct canvas_ft *f, int bold,
                         double size);

/* Back-end constructors. */
enum ow_status ow_canvas_cairo_png(double width_pt, double height_pt,
                                   double scale, struct ow_canvas **out,
                                   struct ow_diag *d);
enum ow_status ow_canvas_svg(double width_pt, double height_pt,
                             struct ow_canvas **out, struct ow_diag *d);

#endif
