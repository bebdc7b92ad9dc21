/* ow_mapdir.h - a saved map folder: what `opwin map -o DIR` leaves beside
 * grid.csv, window.json, the maps and report.pdf, so that `opwin report DIR`
 * can draw everything again without solving a single point.
 *
 *   DIR/study.json    the study with its screw and resin embedded as JSON
 *                     objects (every {value, source} object kept): a
 *                     self-contained copy of the inputs that loads with
 *                     ow_config_load_study;
 *   DIR/lattice.json  the lattice (size, stride, solves, the rpm and
 *                     barrel-axis values of every column and row, the
 *                     status bits of every lattice point), the input
 *                     files' names and their CRC-32, the order of the
 *                     status bits;
 *   DIR/lattice.csv   one row per solved point: lattice indices, status
 *                     bits, flags, signed margins and every figure of
 *                     struct ow_point in SI, 17 significant digits (exact
 *                     round trip; "nan" where a figure does not exist);
 *   DIR/profile.csv   the centre point's axial profile
 *                     (ow_results_profile_csv), absent when the window is
 *                     empty.
 *
 * Every file is written atomically (ow_results_write_file). */
#ifndef OW_MAPDIR_H
#define OW_MAPDIR_H

#include "ow_config.h"
#include "ow_solver.h"
#include "ow_status.h"
#include "ow_sweep.h"
#include "ow_units.h"

/* Save study s (as loaded by ow_config_load_study: its files are read again
 * and must still hold the bytes that were loaded, checked by CRC-32),
 * lattice g and the centre profile (n_rows rows; rows NULL or n_rows 0:
 * no profile, e.g. an empty window) into the existing folder dir.
 * OW_EINPUT when an input file is gone or changed since it was loaded,
 * OW_EIO naming the file when a write fails, OW_ENOMEM. */
enum ow_status ow_mapdir_save(const struct ow_study *s,
			      const struct ow_grid *g,
			      const struct ow_profile_row *rows, int n_rows,
			      const char *dir, struct ow_diag *d);

/* Load the map folder dir: the study from DIR/study.json (its input_crc
 * set back to the original files' CRC-32, so the report traces to them),
 * the lattice into *grid (owned by the caller: ow_grid_destroy) with every
 * point as the sweep left it, and the centre profile into *rows (malloc'd,
 * the caller frees; NULL with *n_rows = 0 when none was saved). rows and
 * n_rows may both be NULL when the profile is not wanted. Re-extracting
 * the window (ow_window_extract) gives the window of the original run.
 * OW_EINPUT when dir does not exist or is not a map folder ("... is not a
 * map folder: lattice.json is missing"), or a file in it is damaged
 * (message names the file and the line or key); OW_ENOMEM. */
enum ow_status ow_mapdir_load(const struct ow_units *u, const char *dir,
			      struct ow_study *study, struct ow_grid **grid,
			      struct ow_profile_row **rows, int *n_rows,
			      struct ow_diag *d);

#endif
