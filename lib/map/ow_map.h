/* ow_map.h - one study's map as a result: the swept lattice, the
 * recommended window, the window's centre point solved alone with its
 * axial profile, and, for a study with a spread of inputs, the sampled
 * result with its robust lattice and window.
 *
 * ow_map_run computes a map; ow_map_save writes the map folder (every
 * file of the output contract: grid.csv, window.json, the maps, report.pdf
 * and the data `opwin report` reads back); ow_map_load reads a saved map
 * folder back without solving; ow_map_draw draws its images and report
 * again. The renderers (ow_maps.h, ow_report.h) take a map as a const
 * view: a caller holding a lattice and a window of its own can fill the
 * fields of a struct ow_map on the stack and pass that.
 *
 * The type and its run sit at the window level (map.c: sweep, window,
 * solver, spread); saving, loading and drawing are at the top
 * (map_folder.c: results, map folder, maps, report). */
#ifndef OW_MAP_H
#define OW_MAP_H

#include "ow_config.h"
#include "ow_solver.h"
#include "ow_spread.h"
#include "ow_status.h"
#include "ow_sweep.h"
#include "ow_units.h"
#include "ow_window.h"

struct ow_map {
	/* the study: borrowed from the caller of ow_map_run (it must
	 * outlive the map); owned by the map after ow_map_load */
	const struct ow_study *study;
	struct ow_grid *grid;     /* the swept lattice */
	struct ow_window *window; /* the recommended window */
	/* the window's centre point solved alone (as `opwin point` would)
	 * and its profile rows, hopper to tip; has_centre 0 and profile
	 * NULL when the window is empty or the centre was not asked for */
	int has_centre;
	struct ow_point centre;         /* SI */
	struct ow_profile_row *profile; /* n_profile rows */
	int n_profile;
	/* across the study's spread of inputs; all NULL without one */
	struct ow_spread_result *spread; /* samples, shares, ranking */
	struct ow_grid *robust_grid;     /* points safe in too few samples
	                                    marked unsafe */
	struct ow_window *robust;        /* its window, clipped to the
	                                    nominal one */
	struct ow_study *own_study;      /* the loaded study (freed with the
	                                    map); NULL after ow_map_run */
};

struct ow_map_config {
	struct ow_sweep_config sweep; /* grid, refinement, threads, progress */
	struct ow_spread_config spread; /* samples, seed, level, progress */
	int centre; /* 1: solve the window's centre alone with its profile */
	int spread_run; /* 1: sample the study's spread when it has one */
};

/* Defaults: ow_sweep_default, ow_spread_config_default, centre and
 * spread on. */
void ow_map_default(struct ow_map_config *c);

/* Sweep study s (ow_sweep_run with c->sweep), extract the window, solve
 * its centre alone (c->centre, a window that is not empty) and, when s
 * has a spread (c->spread_run), sample it (ow_spread_run with c->spread)
 * into the robust lattice and window. *out owned by the caller
 * (ow_map_destroy); s must outlive it. Errors as the steps give them. */
enum ow_status ow_map_run(const struct ow_study *s,
                          const struct ow_map_config *c, struct ow_map **out,
                          struct ow_diag *d);

/* Solve study s alone at the centre of window w: the point into *pt (may
 * be NULL) and a copy of its profile rows in *rows (malloc'd, the caller
 * frees; *n rows). OW_EINPUT when the window is empty; the solver's
 * errors otherwise. */
enum ow_status ow_map_centre(const struct ow_study *s,
                             const struct ow_window *w,
                             struct ow_profile_row **rows, int *n,
                             struct ow_point *pt, struct ow_diag *d);

/* NULL-safe. */
void ow_map_destroy(struct ow_map *m);

/* ---- the map folder (map_folder.c) ---- */

struct ow_report_options;

/* Write map m into the existing folder dir: grid.csv and window.json
 * (with the spread's columns and keys when m has a spread), the data
 * `opwin report` reads back (ow_mapdir_save; spread.json), then
 * ow_map_draw. Each file atomically; dir is meant to be a temporary
 * folder (ow_io_dir_begin) that ow_mapdir_seal and ow_mapdir_replace then
 * put in place whole. o: the report's options (its units govern every
 * image); jobs: threads drawing (0: all cores). OW_EINPUT when an input
 * file changed since the study was loaded, OW_EIO naming a file that
 * cannot be written, OW_ENOMEM. */
enum ow_status ow_map_save(const struct ow_map *m,
                           const struct ow_report_options *o, int jobs,
                           const char *dir, struct ow_diag *d);

/* The drawings of map m into the existing folder dir: the safe-share map
 * (with a spread), report.pdf and the map images (ow_report_write_folder).
 * Errors as ow_map_save. */
enum ow_status ow_map_draw(const struct ow_map *m,
                           const struct ow_report_options *o, int jobs,
                           const char *dir, struct ow_diag *d);

/* Read the map folder dir back (as `opwin map -o dir` wrote it): checked
 * against its manifest (ow_mapdir_verify), the study, lattice and centre
 * (ow_mapdir_load), the window extracted again, and the spread of
 * spread.json when there is one with its robust lattice and window. A
 * folder whose window is not empty but that holds no centre (written
 * before the centre was saved) gets its centre solved. *out owned by the
 * caller (ow_map_destroy). Errors as ow_mapdir_verify and ow_mapdir_load
 * give them; OW_EINPUT naming spread.json when it is damaged. */
enum ow_status ow_map_load(const struct ow_units *u, const char *dir,
                           struct ow_map **out, struct ow_diag *d);

#endif
