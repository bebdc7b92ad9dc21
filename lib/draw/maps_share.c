/* maps_share.c - the map of the share of safe samples across the spread:
 * filled bands of the share in per cent, labelled contour lines at 50, 90
 * and 99 %, the nominal window's rectangle (thin) and the robust one
 * (bold). */
#include "maps_impl.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_spread.h"

struct share_ctx {
	const struct ow_grid *g;
	const struct ow_spread_result *r;
};

static double share_value(const struct ow_grid_point *p, const void *ctx)
{
	const struct share_ctx *c = ctx;

	return 100.0 * c->r->pts[p - c->g->pts].share;
}

static void share_levels(struct ow_ticks *fill, struct ow_ticks *iso)
{
	static const double lines[] = {50.0, 90.0, 99.0};
	int k;

	memset(fill, 0, sizeof *fill);
	for (k = 0; k <= 10; k++)
		fill->v[k] = 10.0 * k;
	fill->n = 11;
	fill->step = 10.0;
	memset(iso, 0, sizeof *iso);
	for (k = 0; k < 3; k++)
		iso->v[k] = lines[k];
	iso->n = 3;
	iso->step = 1.0;
}

static enum ow_status
draw_share(const struct ow_plot *p, const struct ow_study *s,
           const struct ow_window *w, const struct ow_window *rw,
           const struct ow_maps_options *o, const struct ow_field *fd,
           const struct ow_ticks *fill, const struct ow_ticks *iso,
           struct ow_diag *d)
{
	enum ow_status st;

	ow_canvas_rect(p->cv, p->area.x, p->area.y, p->area.w, p->area.h);
	ow_canvas_set_colour(p->cv, ow_rgb(0.75, 0.75, 0.75));
	ow_canvas_fill(p->cv);
	st = ow_plot_contour_fill(p, fd, fill, OW_CMAP_CIVIDIS, d);
	if (st == OW_OK)
		st = ow_plot_isolines(p, fd, iso, 1, ow_rgb(0, 0, 0), 0.9, d);
	if (st != OW_OK)
		return st;
	ow_maps_draw_rectangle(p, s, w, o->units, 0.8);
	ow_maps_draw_rectangle(p, s, rw, o->units, 2.2);
	return OW_OK;
}

enum ow_status ow_maps_draw_share(struct ow_canvas *cv,
                                  const struct ow_rect *box,
                                  const struct ow_map *m,
                                  const struct ow_maps_options *o,
                                  struct ow_diag *d)
{
	const struct ow_study *s = m->study;
	const struct ow_grid *g = m->grid;
	const struct ow_window *w = m->window, *rw = m->robust;
	const struct ow_spread_result *r = m->spread;
	struct share_ctx ctx = {g, r};
	struct maps_field mf;
	struct ow_plot_axis x, y;
	struct ow_plot p;
	struct ow_ticks fill, iso;
	char ytitle[128], sub[256], title[400];
	double fs = ow_maps_font(o);
	enum ow_status st;

	if (!r || !rw)
		return ow_diag_set(d, OW_EARG, "share map: no spread");
	st = ow_maps_field_create(s, g, o->units, &mf, d);
	if (st != OW_OK)
		return st;
	ow_maps_fill(g, share_value, &ctx, mf.z);
	share_levels(&fill, &iso);
	snprintf(title, sizeof title, "Share of safe samples — %s", s->title);
	snprintf(sub, sizeof sub,
	         "%d samples a point, seed %lu. Lines: 50, "
	         "90, 99 %%. Thin box: nominal window; bold: robust (%.0f %%).",
	         r->samples, r->seed, 100.0 * r->level);
	if (ow_maps_frame(cv, box, s, g, o->units, title, sub, fs, &p, &x, &y,
	                  ytitle, sizeof ytitle) != OW_OK) {
		ow_maps_field_free(&mf);
		return ow_diag_set(d, OW_EARG, "share map: box too small");
	}
	st = draw_share(&p, s, w, rw, o, &mf.f, &fill, &iso, d);
	ow_maps_field_free(&mf);
	if (st != OW_OK)
		return st;
	ow_plot_axes(&p, &x, &y);
	ow_maps_colour_bar(&p, &fill, OW_CMAP_CIVIDIS, "safe samples (%)", fs);
	return ow_canvas_status(cv, d);
}

enum ow_status ow_maps_write_share(const struct ow_map *m,
                                   const struct ow_maps_options *o,
                                   const char *dir, struct ow_diag *d)
{
	static const enum ow_canvas_format fmt[2] = {OW_CANVAS_PNG,
	                                             OW_CANVAS_SVG};
	struct ow_rect box = {0, 0, OW_MAPS_WIDTH_PT, OW_MAPS_HEIGHT_PT};
	enum ow_status st = OW_OK;
	int k;

	for (k = 0; k < 2 && st == OW_OK; k++) {
		struct ow_canvas *cv = NULL;
		char path[OW_PATH_LEN];

		if (!(k ? o->svg : o->png))
			continue;
		snprintf(path, sizeof path, "%s/map-safe-share.%s", dir,
		         k ? "svg" : "png");
		st = ow_canvas_create_image(fmt[k], OW_MAPS_WIDTH_PT,
		                            OW_MAPS_HEIGHT_PT,
		                            OW_MAPS_PNG_SCALE, &cv, d);
		if (st == OW_OK)
			st = ow_maps_draw_share(cv, &box, m, o, d);
		if (st == OW_OK)
			st = ow_canvas_write_file(cv, path, d);
		ow_canvas_destroy(cv);
	}
	return st;
}
