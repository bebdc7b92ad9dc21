/* maps_impl.h - inside the maps module: the lattice as a rectilinear field
 * in display units, limit texts, label placement and the window overlay
 * shared by the window map (maps_window.c), the figure maps
 * (maps_figure.c) and the profiles (maps_profile.c). */
#ifndef OW_MAPS_IMPL_H
#define OW_MAPS_IMPL_H

#include "ow_maps.h"

#define MAPS_MAX_LABELS 48

/* The lattice as a field: x = rpm, y = reference set-point shown in the
 * unit system, z filled by ow_maps_fill. */
struct maps_field {
	struct ow_field f;
	double *x, *y, *z;
};

enum ow_status ow_maps_field_create(const struct ow_study *s,
                                    const struct ow_grid *g,
                                    enum ow_unit_system u,
                                    struct maps_field *mf, struct ow_diag *d);
void ow_maps_field_free(struct maps_field *mf);

/* z at every lattice point: get() at solved points; at the others (inside
 * cells no boundary crosses) bilinear between the corners of the smallest
 * enclosing cell whose corners were all solved, so signs of margins carry
 * over unchanged; NAN where get() is NAN at a corner. */
typedef double (*maps_get)(const struct ow_grid_point *p, const void *ctx);
void ow_maps_fill(const struct ow_grid *g, maps_get get, const void *ctx,
                  double *z);

/* Shown value of a reference set-point (K). */
double ow_maps_temp(enum ow_unit_system u, double K);

/* "peak melt 240 °C", "unmelt 0.5 %", "pressure 35 MPa", "plugging";
 * op goes between name and value (NULL: a space; " > " for a legend). */
char *ow_maps_limit_text(const struct ow_study *s, int check,
                         enum ow_unit_system u, const char *op, char *buf,
                         size_t n);

/* A value with a sensible number of digits for a label. */
char *ow_maps_num(char *buf, size_t n, double v);

/* "screw speed (rpm)" and "<axis label> (°C)". */
char *ow_maps_y_title(const struct ow_study *s, enum ow_unit_system u,
                      char *buf, size_t n);

/* text shortened with "…" to fit max_w at the canvas's current font. */
char *ow_maps_fit_text(struct ow_canvas *cv, const char *text, double max_w,
                       char *buf, size_t n);

/* Boxes already taken by labels, so later labels can avoid them. */
struct maps_labels {
	int n;
	double x0[MAPS_MAX_LABELS], y0[MAPS_MAX_LABELS];
	double x1[MAPS_MAX_LABELS], y1[MAPS_MAX_LABELS];
};

int ow_maps_labels_free(const struct maps_labels *l, double x0, double y0,
                        double x1, double y1);
void ow_maps_labels_take(struct maps_labels *l, double x0, double y0, double x1,
                         double y1);

/* The window's recommended rectangle (width_pt; bold on the window map,
 * thin on the figure maps) and, when thin, its safe-region edge. */
/* Sides of the window's rectangle (plot coordinates x0..x1, y0 bottom of
 * the lowest set-point, y1 the highest) that lie on the sweep's edge,
 * marked dashed: they are no limit. */
void ow_maps_mark_sweep_edges(const struct ow_plot *p,
                              const struct ow_window *w, double x0, double x1,
                              double y0, double y1, double width_pt);
void ow_maps_draw_rectangle(const struct ow_plot *p, const struct ow_study *s,
                            const struct ow_window *w, enum ow_unit_system u,
                            double width_pt);
void ow_maps_draw_edge(const struct ow_plot *p, const struct ow_study *s,
                       const struct ow_window *w, enum ow_unit_system u);

/* A boundary polyline of w in plot coordinates. */
void ow_maps_boundary_points(const struct ow_study *s,
                             const struct ow_polyline *l, enum ow_unit_system u,
                             struct ow_pt2 *out);

/* Each line of boundary bd: a halo stroke, then the line's own stroke. */
void ow_maps_stroke_boundary(const struct ow_plot *p, const struct ow_study *s,
                             const struct ow_boundary *bd,
                             enum ow_unit_system u,
                             const struct ow_line_style *halo,
                             const struct ow_line_style *ln);

/* The centre and the current point, marked and labelled with their
 * speed and set-point (brief: with their names only). */
void ow_maps_draw_points(const struct ow_plot *p, const struct ow_study *s,
                         const struct ow_window *w,
                         const struct ow_maps_options *o, int brief,
                         struct maps_labels *taken);

/* Canvas white, a shortened title at the top. */
void ow_maps_paper(struct ow_canvas *cv, const struct ow_rect *box,
                   const char *title, const char *subtitle, double font_pt);

/* Axes of a map: x rpm, y reference set-point, from the lattice. */
void ow_maps_axes(const struct ow_study *s, const struct ow_grid *g,
                  enum ow_unit_system u, struct ow_plot_axis *x,
                  struct ow_plot_axis *y, char *ytitle, size_t n);

double ow_maps_font(const struct ow_maps_options *o);

/* Paper, title and subtitle of a filled-contour map in box, and its plot
 * frame below them (x rpm, y the reference set-point; the y title into
 * ytitle). OW_EARG when the box is too small. */
enum ow_status ow_maps_frame(struct ow_canvas *cv, const struct ow_rect *box,
                             const struct ow_study *s, const struct ow_grid *g,
                             enum ow_unit_system u, const char *title,
                             const char *sub, double font_pt, struct ow_plot *p,
                             struct ow_plot_axis *x, struct ow_plot_axis *y,
                             char *ytitle, size_t n);

/* The colour bar of a filled-contour map, right of p's data area. */
void ow_maps_colour_bar(const struct ow_plot *p, const struct ow_ticks *lv,
                        enum ow_cmap map, const char *title, double font_pt);

#endif
