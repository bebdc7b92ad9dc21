/* map_folder.c - a map and its folder (ow_map.h): every file of
 * `opwin map -o DIR` written from a map, the drawings made again, and a
 * saved folder read back into a map. */
#include "map_impl.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "ow_io.h"
#include "ow_mapdir.h"
#include "ow_maps.h"
#include "ow_report.h"
#include "ow_results.h"
#include "ow_spread_out.h"

/* Largest spread.json read back. */
#define SPREAD_MAX_BYTES ((size_t)1 << 30)

/* text (malloc'd, freed here) into dir/name when st is OW_OK. */
static enum ow_status put(const char *dir, const char *name, char *text,
                          enum ow_status st, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32];

	if (st == OW_OK) {
		snprintf(path, sizeof path, "%s/%s", dir, name);
		st = ow_io_write_file(path, text, strlen(text), d);
	}
	free(text);
	return st;
}

/* The nominal *text replaced by the spread's version of it, out. */
static void take(char **text, char *out)
{
	free(*text);
	*text = out;
}

static enum ow_status grid_csv(const struct ow_map *m, const char *dir,
                               struct ow_diag *d)
{
	char *text = NULL, *out = NULL;
	enum ow_status st = ow_results_grid_csv(m->study, m->grid, &text, d);

	if (st == OW_OK && m->spread) {
		st = ow_spread_grid_csv(m->study, m->grid, m->spread, text,
		                        &out, d);
		take(&text, out);
	}
	return put(dir, "grid.csv", text, st, d);
}

static enum ow_status window_json(const struct ow_map *m, const char *dir,
                                  struct ow_diag *d)
{
	char *text = NULL, *out = NULL;
	enum ow_status st =
	    ow_results_window_json(m->study, m->grid, m->window, &text, d);

	if (st == OW_OK && m->spread) {
		st = ow_spread_window_json(m->study, m->robust_grid, m->robust,
		                           m->spread, text, &out, d);
		take(&text, out);
	}
	return put(dir, "window.json", text, st, d);
}

enum ow_status ow_map_save(const struct ow_map *m,
                           const struct ow_report_options *o, int jobs,
                           const char *dir, struct ow_diag *d)
{
	char *text = NULL;
	enum ow_status st;

	if (!m || !o || !dir)
		return ow_diag_set(d, OW_EARG, "ow_map_save: NULL argument");
	st = grid_csv(m, dir, d);
	if (st == OW_OK)
		st = window_json(m, dir, d);
	if (st == OW_OK)
		st = ow_mapdir_save(m->study, m->grid,
		                    m->has_centre ? &m->centre : NULL,
		                    m->profile, m->n_profile, dir, d);
	if (st == OW_OK && m->spread) {
		st = ow_spread_save_json(m->study, m->spread, &text, d);
		st = put(dir, "spread.json", text, st, d);
	}
	if (st == OW_OK)
		st = ow_map_draw(m, o, jobs, dir, d);
	return st;
}

enum ow_status ow_map_draw(const struct ow_map *m,
                           const struct ow_report_options *o, int jobs,
                           const char *dir, struct ow_diag *d)
{
	struct ow_maps_options mo;
	enum ow_status st = OW_OK;

	if (!m || !o || !dir)
		return ow_diag_set(d, OW_EARG, "ow_map_draw: NULL argument");
	ow_maps_default(&mo);
	mo.units = o->units;
	if (m->spread)
		st = ow_maps_write_share(m, &mo, dir, d);
	mo.has_current = o->has_current;
	mo.current_rpm = o->current_rpm;
	mo.current_set_K = o->current_set_K;
	mo.jobs = jobs;
	if (st == OW_OK)
		st = ow_report_write_folder(m, o, &mo, dir, d);
	return st;
}

/* spread.json of folder dir, when there is one, into m's study and
 * m->spread, with the robust lattice and window. */
static enum ow_status load_spread(struct ow_map *m, const char *dir,
                                  struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], *text = NULL;
	size_t len;
	enum ow_status st;

	snprintf(path, sizeof path, "%s/spread.json", dir);
	if (access(path, F_OK) != 0)
		return OW_OK; /* a map without a spread */
	st = ow_io_read_file(path, SPREAD_MAX_BYTES, &text, &len, d);
	if (st == OW_OK)
		st = ow_spread_load_json(text, path, m->grid,
		                         &m->own_study->spread, &m->spread, d);
	free(text);
	if (st == OW_OK)
		st = ow_map_robust(m, d);
	return st;
}

/* The folder's centre point and profile into m; solved again when the
 * folder holds none for a window that has a centre. */
static enum ow_status load_centre(struct ow_map *m, struct ow_mapdir_centre *c,
                                  struct ow_diag *d)
{
	if (m->window->empty)
		return OW_OK;
	if (!c->valid) {
		enum ow_status st =
		    ow_map_centre(m->study, m->window, &m->profile,
		                  &m->n_profile, &m->centre, d);

		m->has_centre = st == OW_OK;
		return st;
	}
	m->has_centre = 1;
	m->centre = c->pt;
	m->profile = c->rows; /* taken over */
	m->n_profile = c->n_rows;
	c->rows = NULL;
	return OW_OK;
}

enum ow_status ow_map_load(const struct ow_units *u, const char *dir,
                           struct ow_map **out, struct ow_diag *d)
{
	struct ow_mapdir_centre c;
	struct ow_map *m;
	enum ow_status st;

	if (!u || !dir || !out)
		return ow_diag_set(d, OW_EARG, "ow_map_load: NULL argument");
	*out = NULL;
	memset(&c, 0, sizeof c);
	m = calloc(1, sizeof *m);
	if (m)
		m->own_study = calloc(1, sizeof *m->own_study);
	if (!m || !m->own_study) {
		free(m);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	m->study = m->own_study;
	st = ow_mapdir_verify(dir, d);
	if (st == OW_OK)
		st = ow_mapdir_load(u, dir, m->own_study, &m->grid, &c, d);
	if (st == OW_OK)
		st = ow_window_extract(m->study, m->grid, &m->window, d);
	if (st == OW_OK)
		st = load_centre(m, &c, d);
	if (st == OW_OK)
		st = load_spread(m, dir, d);
	ow_mapdir_centre_free(&c);
	if (st != OW_OK) {
		ow_map_destroy(m);
		return st;
	}
	*out = m;
	return OW_OK;
}
