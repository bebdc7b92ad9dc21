/* ow_plot.h - charts on an ow_canvas: a plot frame with axes and "nice"
 * 1-2-5 ticks, a perceptually uniform colour map and its colour bar,
 * filled contours without seams, iso-lines (returned as polylines, and
 * drawn with labels), line charts with a legend, polylines and hatched
 * regions in data coordinates.
 *
 * A plot (struct ow_plot) is a plain value: a canvas it borrows, the
 * rectangle of its data area, and the data ranges mapped onto it. The same
 * calls draw into a PNG, an SVG or a PDF page. Drawing errors are kept in
 * the canvas (ow_canvas_status); functions that allocate return a status. */
#ifndef OW_PLOT_H
#define OW_PLOT_H

#include "ow_canvas.h"
#include "ow_status.h"

#define OW_PLOT_MAX_TICKS  24
#define OW_PLOT_MAX_LEVELS 32
#define OW_PLOT_MAX_MINOR  (8 * (OW_PLOT_MAX_TICKS + 1))

/* A rectangle in canvas points (top-left origin, y down). */
struct ow_rect {
	double x, y, w, h;
};

/* A point in data coordinates. */
struct ow_pt2 {
	double x, y;
};

/* --- ticks ----------------------------------------------------------- */

/* Tick positions at a 1-2-5 step (x 10^k) covering [lo, hi]. */
struct ow_ticks {
	int n;
	double v[OW_PLOT_MAX_TICKS];
	double step;
	int decimals; /* digits after the point that show the step exactly */
};

/* Choose the step 1, 2 or 5 x 10^k giving at most max_ticks (>= 2) ticks
 * and the most ticks under that, then the ticks from floor(lo/step) to
 * ceil(hi/step) (the range widened to whole steps: 0..117 with 7 ticks ->
 * 0, 20, ..., 120). Heckbert, "Nice numbers for graph labels", Graphics
 * Gems (1990). OW_EARG for a non-finite or empty range. */
enum ow_status ow_plot_nice_ticks(double lo, double hi, int max_ticks,
                                  struct ow_ticks *t);

/* Format v with decimals digits, "-0" printed as "0", U+2212 minus sign.
 * Returns buf. */
char *ow_plot_format(char *buf, size_t n, double v, int decimals);

/* Ticks of a base-10 logarithmic axis over [lo, hi]: a value v sits at
 * log10(v), so each decade 10^k .. 10^(k+1) takes the same length and
 * m x 10^k lies log10(m) of a decade above 10^k. */
struct ow_log_ticks {
	int n_major; /* decades 10^k inside [lo, hi] */
	double major[OW_PLOT_MAX_TICKS];
	int n_minor; /* m x 10^k, m = 2..9, inside */
	double minor[OW_PLOT_MAX_MINOR];
	int plain; /* 1: every decade label written as a plain decimal */
};

/* Decade and minor ticks over [lo, hi] (0 < lo < hi), widened first to
 * whole decades when nice (3..4700 -> 1..10000). Minor ticks only while
 * the range spans at most 12 decades. plain when all decades lie within
 * 0.001..10000. OW_EARG for a non-finite, non-positive or empty range,
 * or more decades than OW_PLOT_MAX_TICKS. */
enum ow_status ow_plot_log_ticks(double lo, double hi, int nice,
                                 struct ow_log_ticks *t);

/* The label of tick v on a log axis: a decade 10^k as a plain decimal
 * ("0.01", "10", "1000") when plain or 0.01 <= v <= 1000, else as "1e4",
 * "1e−5" (U+2212 minus); other values (m x 10^k) as plain decimals.
 * Returns buf. */
char *ow_plot_format_log(char *buf, size_t n, double v, int plain);

/* --- colour maps ----------------------------------------------------- */

enum ow_cmap {
	OW_CMAP_VIRIDIS, /* van der Walt & Smith (2015), matplotlib _cm_listed
	                  */
	OW_CMAP_CIVIDIS  /* Nunez, Anderton & Renslow, PLoS ONE 13 (2018) */
};

/* Colour at t in 0..1 (clamped), interpolated linearly between the
 * published table's 256 entries (kept here at every 16th entry plus the
 * last, which is exact at the end points). Opaque. */
struct ow_rgba ow_cmap_at(enum ow_cmap map, double t);

/* --- the plot frame -------------------------------------------------- */

struct ow_plot_axis {
	double min, max;   /* data range (min < max) */
	const char *title; /* with its unit: "screw speed (rpm)"; NULL: none */
	int nice;          /* 1: widen min..max to whole tick steps */
	int max_ticks;     /* 0: about one tick per 5 font sizes across,
	                      3.2 font sizes up (log: labelled decades) */
};

struct ow_plot {
	struct ow_canvas *cv;       /* borrowed */
	struct ow_rect area;        /* data area on the canvas */
	double x0, x1, y0, y1;      /* data ranges mapped onto area */
	struct ow_ticks xt, yt;     /* ticks chosen */
	double font_pt;             /* base text size */
	struct ow_rgba ink;         /* axes and text colour */
	int hide_x_labels;          /* 1: ticks without numbers on x (a panel
	                               above another sharing its x axis) */
	int xlog, ylog;             /* 1: that axis is base-10 logarithmic; xt,
	                               yt then hold its labelled ticks */
	struct ow_log_ticks xl, yl; /* all decade and minor ticks (log) */
};

/* Lay out a plot in box (the whole chart, labels included): margins for
 * tick labels and titles from font_pt, data area inside; ranges (widened
 * when nice) and ticks chosen. right_pt reserves space on the right
 * (colour bar, legend). Draws nothing. OW_EARG for an empty range or a
 * box too small for the margins. */
enum ow_status ow_plot_init(struct ow_plot *p, struct ow_canvas *cv,
                            const struct ow_rect *box,
                            const struct ow_plot_axis *x,
                            const struct ow_plot_axis *y, double font_pt,
                            double right_pt);

/* Axes of ow_plot_init_log that are base-10 logarithmic (a flag kept
 * out of struct ow_plot_axis so its brace-initialised users stay
 * complete). */
enum { OW_PLOT_LOG_X = 1, OW_PLOT_LOG_Y = 2 };

/* ow_plot_init with the axes named in log_axes (OW_PLOT_LOG_X |
 * OW_PLOT_LOG_Y, 0: both linear, as ow_plot_init) on base-10 logarithmic
 * scales: ranges must be > 0, nice widens to whole decades, ticks from
 * ow_plot_log_ticks, labels from ow_plot_format_log, and max_ticks caps
 * the labelled decades (every n-th labelled when there are more). */
enum ow_status ow_plot_init_log(struct ow_plot *p, struct ow_canvas *cv,
                                const struct ow_rect *box,
                                const struct ow_plot_axis *x,
                                const struct ow_plot_axis *y, double font_pt,
                                double right_pt, int log_axes);

/* Data -> canvas coordinates (through log10 on a log axis, where a
 * value <= 0 gives NAN). */
double ow_plot_px(const struct ow_plot *p, double x);
double ow_plot_py(const struct ow_plot *p, double y);

/* Light grid lines at the ticks (draw before the data). */
void ow_plot_grid(const struct ow_plot *p);

/* Frame, ticks, tick labels and axis titles (draw after the data). */
void ow_plot_axes(const struct ow_plot *p, const struct ow_plot_axis *x,
                  const struct ow_plot_axis *y);

/* Clip later drawing to the data area (pair with ow_canvas_restore). */
void ow_plot_clip(const struct ow_plot *p);

/* --- fields and contours --------------------------------------------- */

/* Values z on a rectilinear grid: z[j * nx + i] at (x[i], y[j]); x and y
 * increasing; NAN marks a missing value (cells touching it are left
 * out). Borrowed arrays. */
struct ow_field {
	int nx, ny;
	const double *x, *y, *z;
};

/* One iso-line: n points in data coordinates, closed when the last point
 * equals the first. */
struct ow_isoline {
	int n;
	struct ow_pt2 *p;
};

struct ow_isolines {
	double level;
	int n;
	struct ow_isoline *lines;
};

/* The iso-lines z = level of field f: each cell split into two triangles
 * along the diagonal from (i, j) to (i+1, j+1), z linear in each
 * (so a linear field is contoured exactly), segments joined into
 * polylines. *out owned by the caller (ow_isolines_destroy). */
enum ow_status ow_contour_lines(const struct ow_field *f, double level,
                                struct ow_isolines **out, struct ow_diag *d);
void ow_isolines_destroy(struct ow_isolines *l);

/* Levels for a filled contour of f: nice ticks over its finite range
 * (at most max_levels + 1 boundaries). OW_EARG when f has no finite
 * value; a constant field gives one level. */
enum ow_status ow_contour_levels(const struct ow_field *f, int max_levels,
                                 struct ow_ticks *levels);

/* Colour of band k of n bands (between levels[k] and levels[k+1]). */
struct ow_rgba ow_contour_band_colour(enum ow_cmap map, int k, int n);

/* Filled contours: for each level v (ascending), the region {z >= v}
 * painted in the colour of the band above v, stacked bottom-up, each
 * region filled as one path (triangles merged under the non-zero rule), so
 * bands show no seams. The area below levels->v[0] in band 0's colour.
 * Clipped to the data area. */
enum ow_status ow_plot_contour_fill(const struct ow_plot *p,
                                    const struct ow_field *f,
                                    const struct ow_ticks *levels,
                                    enum ow_cmap map, struct ow_diag *d);

/* The region {z >= level} of f (the one ow_plot_contour_fill paints for
 * that level) filled with tint (alpha 0: none), then hatched with h (NULL:
 * none); clipped to the data area. */
enum ow_status ow_plot_field_region(const struct ow_plot *p,
                                    const struct ow_field *f, double level,
                                    struct ow_rgba tint,
                                    const struct ow_hatch *h,
                                    struct ow_diag *d);

/* Iso-lines at the levels (every `every`-th, from the first) in colour
 * width, each labelled once along its longest piece with the level
 * (decimals digits), the label on a small clear box. */
enum ow_status ow_plot_isolines(const struct ow_plot *p,
                                const struct ow_field *f,
                                const struct ow_ticks *levels, int every,
                                struct ow_rgba colour, double width_pt,
                                struct ow_diag *d);

/* The direction angle_deg of a line (degrees, counter-clockwise) turned
 * by 180 where needed so text along it reads left to right, or upwards
 * on steep lines: the result lies in (-80, 100]. */
double ow_plot_upright(double angle_deg);

/* text (font_pt, colour ink) centred at canvas point (X, Y) rotated ang
 * degrees counter-clockwise, on a small white box: a label on a line. */
void ow_plot_label_on_line(struct ow_canvas *cv, double X, double Y, double ang,
                           const char *text, double font_pt,
                           struct ow_rgba ink);

/* A vertical colour bar in box (bands of the levels, tick labels on the
 * right, title with unit rotated along it). */
void ow_plot_colour_bar(struct ow_canvas *cv, const struct ow_rect *box,
                        const struct ow_ticks *levels, enum ow_cmap map,
                        const char *title, double font_pt);

/* --- lines, regions, legends ----------------------------------------- */

enum ow_dash_style {
	OW_DASH_SOLID,
	OW_DASH_DASHED,
	OW_DASH_DOTTED,
	OW_DASH_DASH_DOT,
	OW_DASH_LONG
};

enum ow_marker {
	OW_MARK_NONE,
	OW_MARK_CIRCLE,
	OW_MARK_SQUARE,
	OW_MARK_TRIANGLE,
	OW_MARK_DIAMOND,
	OW_MARK_CROSS
};

struct ow_line_style {
	struct ow_rgba colour;
	double width_pt;
	enum ow_dash_style dash;
	enum ow_marker marker; /* drawn at each point, or none */
};

/* Set the canvas dash for style d at line width w. */
void ow_plot_set_dash(struct ow_canvas *cv, enum ow_dash_style d, double w);

/* A distinct style for series k (colour-blind-safe colour, Okabe & Ito
 * 2008, plus a dash and a marker so series differ in greyscale too). */
struct ow_line_style ow_plot_series_style(int k);

/* A polyline through n data points (NAN points break it), clipped to the
 * data area. */
void ow_plot_polyline(const struct ow_plot *p, const struct ow_pt2 *pts, int n,
                      const struct ow_line_style *s);

/* A marker of style m, size_pt across, at data point (x, y). */
void ow_plot_marker(const struct ow_plot *p, double x, double y,
                    enum ow_marker m, double size_pt, struct ow_rgba fill,
                    struct ow_rgba edge);

/* Closed polygon(s) in data coordinates: n_rings rings, ring k has
 * counts[k] points; filled under the non-zero rule with tint (alpha 0:
 * none) and then hatched with h (NULL: none); clipped to the data area. */
void ow_plot_region(const struct ow_plot *p, const struct ow_pt2 *pts,
                    const int *counts, int n_rings, struct ow_rgba tint,
                    const struct ow_hatch *h);

/* One entry of a legend: a line sample (style), or a filled swatch with an
 * optional hatch (swatch = 1). */
struct ow_legend_entry {
	const char *label;
	int swatch;
	struct ow_line_style line;
	struct ow_rgba fill;          /* the swatch; on a line sample the
	                                 marker's fill (alpha 0: white) */
	const struct ow_hatch *hatch; /* NULL: none */
	enum ow_marker marker;        /* an extra marker in the sample */
};

/* Size a legend of n entries would take at font_pt (width, height). */
void ow_plot_legend_size(struct ow_canvas *cv, const struct ow_legend_entry *e,
                         int n, double font_pt, double *w, double *h);

/* Draw the legend with its top-left corner at (x, y), on a white box. */
void ow_plot_legend(struct ow_canvas *cv, double x, double y,
                    const struct ow_legend_entry *e, int n, double font_pt);

/* The same legend in cols columns (filled column by column), and its
 * size: for a legend under a plot rather than beside it. */
void ow_plot_legend_grid_size(struct ow_canvas *cv,
                              const struct ow_legend_entry *e, int n,
                              double font_pt, int cols, double *w, double *h);
void ow_plot_legend_grid(struct ow_canvas *cv, double x, double y,
                         const struct ow_legend_entry *e, int n, double font_pt,
                         int cols);

/* A series of a line chart. */
struct ow_series {
	const char *name;
	int n;
	const double *x, *y; /* n values each; NAN breaks the line */
	struct ow_line_style style;
};

/* Grid, series, axes and (when legend is set) a legend in the upper right
 * of the data area: a complete line chart on an initialised plot. */
void ow_plot_lines(const struct ow_plot *p, const struct ow_plot_axis *x,
                   const struct ow_plot_axis *y, const struct ow_series *s,
                   int n, int legend);

/* Range of the finite values of n series (x or y), for axis set-up;
 * returns 0 when there is none. */
int ow_plot_series_range(const struct ow_series *s, int n, int use_y,
                         double *lo, double *hi);

#endif
