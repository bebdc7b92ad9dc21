/* map.c - one study's map (ow_map.h): the sweep, the window, the centre
 * point solved alone and the spread, run one after the other. */
#include "map_impl.h"

#include <stdlib.h>
#include <string.h>

void ow_map_default(struct ow_map_config *c)
{
	memset(c, 0, sizeof *c);
	ow_sweep_default(&c->sweep);
	ow_spread_config_default(&c->spread);
	c->centre = 1;
	c->spread_run = 1;
}

enum ow_status ow_map_centre(const struct ow_study *s,
                             const struct ow_window *w,
                             struct ow_profile_row **rows, int *n,
                             struct ow_point *pt, struct ow_diag *d)
{
	struct ow_solver *sv = NULL;
	struct ow_point p;
	double set_K[OW_MAX_ZONES];
	const struct ow_profile_row *r;
	enum ow_status st;
	int m = 0;

	if (!s || !w || !rows || !n)
		return ow_diag_set(d, OW_EARG, "centre profile: NULL argument");
	*rows = NULL;
	*n = 0;
	if (w->empty)
		return ow_diag_set(d, OW_EINPUT,
		                   "centre profile: the window "
		                   "is empty, there is no centre");
	st = ow_solver_create(s, &sv, d);
	if (st != OW_OK)
		return st;
	ow_line_apply_axis(&s->line, w->centre.axis, set_K);
	st = ow_solver_run(sv, w->centre.rpm, set_K, 0.0, &p, d);
	if (st != OW_OK)
		goto fail;
	r = ow_solver_profile(sv, &m);
	if (m > 0) {
		*rows = malloc((size_t)m * sizeof **rows);
		if (!*rows) {
			st = ow_diag_set(d, OW_ENOMEM, "out of memory");
			goto fail;
		}
		memcpy(*rows, r, (size_t)m * sizeof **rows);
	}
	*n = m;
	if (pt)
		*pt = p;
fail:
	ow_solver_destroy(sv);
	return st;
}

enum ow_status ow_map_robust(struct ow_map *m, struct ow_diag *d)
{
	enum ow_status st =
	    ow_spread_robust_grid(m->grid, m->spread, &m->robust_grid, d);

	if (st == OW_OK)
		st = ow_window_extract(m->study, m->robust_grid, &m->robust, d);
	if (st == OW_OK)
		ow_spread_clip_window(m->robust, m->window);
	return st;
}

enum ow_status ow_map_run(const struct ow_study *s,
                          const struct ow_map_config *c, struct ow_map **out,
                          struct ow_diag *d)
{
	struct ow_map *m;
	enum ow_status st;

	if (!s || !c || !out)
		return ow_diag_set(d, OW_EARG, "ow_map_run: NULL argument");
	*out = NULL;
	m = calloc(1, sizeof *m);
	if (!m)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	m->study = s;
	st = ow_sweep_run(s, &c->sweep, &m->grid, d);
	if (st == OW_OK)
		st = ow_window_extract(s, m->grid, &m->window, d);
	if (st == OW_OK && c->centre && !m->window->empty) {
		st = ow_map_centre(s, m->window, &m->profile, &m->n_profile,
		                   &m->centre, d);
		m->has_centre = st == OW_OK;
	}
	if (st == OW_OK && c->spread_run && s->spread.present) {
		st = ow_spread_run(s, m->grid, &c->spread, &m->spread, d);
		if (st == OW_OK)
			st = ow_map_robust(m, d);
	}
	if (st != OW_OK) {
		ow_map_destroy(m);
		return st;
	}
	*out = m;
	return OW_OK;
}

void ow_map_destroy(struct ow_map *m)
{
	if (!m)
		return;
	ow_window_destroy(m->robust);
	ow_grid_destroy(m->robust_grid);
	ow_spread_result_destroy(m->spread);
	free(m->profile);
	ow_window_destroy(m->window);
	ow_grid_destroy(m->grid);
	free(m->own_study);
	free(m);
}
