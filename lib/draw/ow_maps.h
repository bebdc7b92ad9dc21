/* ow_maps.h - the map images of a study: the operating window map (safe
 * region, every limit's boundary labelled with its name and value, unsafe
 * regions tinted and hatched, the recommended rectangle, the robust centre
 * and optionally the line's current point), one filled-contour map per
 * figure (peak temperature, unmelt, pressure, throughput, specific
 * energy), and the axial profiles at the centre point over a silhouette of
 * the screw's sections.
 *
 * Each chart is drawn by a function that takes a canvas and a box, so the
 * same code fills the PNG and SVG files and the PDF report's pages
 * (lib/report). Every chart of a study takes its map (ow_map.h) as a
 * const view and only draws: nothing here solves a point. Everything
 * people read is in the options' unit system. */
#ifndef OW_MAPS_H
#define OW_MAPS_H

#include "ow_canvas.h"
#include "ow_study.h"
#include "ow_map.h"
#include "ow_plot.h"
#include "ow_solver.h"
#include "ow_units.h"

/* The image files: 600 x 433.3 pt, PNG at 1.5 px/pt (900 x 650 px). */
#define OW_MAPS_WIDTH_PT  600.0
#define OW_MAPS_HEIGHT_PT 433.3333333333333
#define OW_MAPS_PNG_SCALE 1.5

struct ow_maps_options {
	enum ow_unit_system units;
	int has_current;      /* 1: mark the line's current point */
	double current_rpm;   /* rev/min */
	double current_set_K; /* reference zone's absolute set-point, K */
	int png, svg;         /* formats to write (default both) */
	double font_pt;       /* base text size; 0: 9 pt */
	int jobs;             /* threads drawing files at once; 0: all cores */
};

/* Defaults: SI, no current point, PNG and SVG, 9 pt, all cores. */
void ow_maps_default(struct ow_maps_options *o);

/* The figure maps, in file order. */
enum ow_map_figure {
	OW_MAP_PEAK_TEMP, /* map-peak-temp: hottest melt anywhere */
	OW_MAP_UNMELT,    /* map-unmelt: unmelted fraction at discharge */
	OW_MAP_PRESSURE,  /* map-pressure: highest pressure on the screw */
	OW_MAP_OUTPUT,    /* map-output: throughput */
	OW_MAP_SEC,       /* map-sec: specific energy (drive) */
	OW_MAP_ZONE_LOAD, /* map-zone-load: largest share of a barrel zone's
	                     heating or cooling power needed */
	OW_MAP_COUNT
};

/* File stem ("map-peak-temp") and a title ("Peak melt temperature"). */
const char *ow_maps_figure_file(enum ow_map_figure f);
const char *ow_maps_figure_title(enum ow_map_figure f);

/* Label of the barrel axis as a set-point of the reference zone, without
 * unit: "last zone set-point" (mode shift), "zones 3-5 set-point" (set),
 * "zone 2 set-point" (zone). Writes into buf, returns it. */
char *ow_maps_axis_label(const struct ow_study *s, char *buf, size_t n);

/* Draw the window map of map m into box of cv. */
enum ow_status ow_maps_draw_window(struct ow_canvas *cv,
                                   const struct ow_rect *box,
                                   const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   struct ow_diag *d);

/* The plot frame (data area, ranges) the window map uses in box, without
 * drawing: for placing annotations over it, and for tests. */
enum ow_status ow_maps_window_frame(struct ow_canvas *cv,
                                    const struct ow_rect *box,
                                    const struct ow_map *m,
                                    const struct ow_maps_options *o,
                                    struct ow_plot *p, struct ow_diag *d);

/* Draw the map of figure f of map m into box of cv (filled contours of
 * the solved coarse grid points, colour bar, labelled iso-lines, the
 * window's rectangle and safe-region boundaries overlaid thinly). */
enum ow_status ow_maps_draw_figure(struct ow_canvas *cv,
                                   const struct ow_rect *box,
                                   enum ow_map_figure f, const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   struct ow_diag *d);

/* Draw the axial profiles of rows (n rows, hopper to tip, as from
 * ow_solver_profile) into box: stacked panels sharing x = axial position
 * in D (pressure; bulk and peak temperature; solid bed ratio and unmelted
 * fraction) over a depth silhouette of the screw's sections. subtitle
 * (NULL: none) says which point ("centre: 62 rpm, 205 °C"). */
enum ow_status ow_maps_draw_profile(
    struct ow_canvas *cv, const struct ow_rect *box, const struct ow_study *s,
    const struct ow_profile_row *rows, int n, const char *subtitle,
    const struct ow_maps_options *o, struct ow_diag *d);

/* The map of the share of safe samples of map m across its spread (bands
 * in per cent, contour lines at 50, 90 and 99 %, the nominal window thin
 * and the robust window bold) into box of cv. OW_EARG when m has no
 * spread. */
enum ow_status ow_maps_draw_share(struct ow_canvas *cv,
                                  const struct ow_rect *box,
                                  const struct ow_map *m,
                                  const struct ow_maps_options *o,
                                  struct ow_diag *d);

/* The same map as dir/map-safe-share.png and .svg (as o asks). OW_EIO
 * naming the file when it cannot be written. */
enum ow_status ow_maps_write_share(const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   const char *dir, struct ow_diag *d);

/* Write window.png/.svg, map-*.png/.svg and profile.png/.svg (the
 * profile of m's centre, only when the window is not empty) of map m into
 * the existing folder dir, each file atomically, o->jobs files at once
 * (the files are the same for any count). OW_EIO naming the file on a
 * write failure; with several failures, the first file's in the order
 * above. */
enum ow_status ow_maps_write_all(const struct ow_map *m,
                                 const struct ow_maps_options *o,
                                 const char *dir, struct ow_diag *d);

/* The same one file at a time, for a caller that draws other things
 * beside them: ow_maps_file_count files, ow_maps_write_file writes file k
 * (0 <= k < count, in the order above). */
int ow_maps_file_count(const struct ow_map *m, const struct ow_maps_options *o);
enum ow_status ow_maps_write_file(const struct ow_map *m,
                                  const struct ow_maps_options *o,
                                  const char *dir, int k, struct ow_diag *d);

/* ow_maps_write_all with one more piece of work, beside(ctx, d) (the
 * report), drawn in the same pool of o->jobs threads as the image files.
 * Its failure is reported after the files'. */
enum ow_status
ow_maps_write_beside(const struct ow_map *m, const struct ow_maps_options *o,
                     const char *dir,
                     enum ow_status (*beside)(void *ctx, struct ow_diag *d),
                     void *ctx, struct ow_diag *d);

#endif
