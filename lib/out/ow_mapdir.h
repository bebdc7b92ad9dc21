/* ow_mapdir.h - a saved map folder: what `opwin map -o DIR` leaves beside
 * grid.csv, window.json, the maps and report.pdf, so that `opwin report DIR`
 * can draw everything again without solving a single point.
 *
 *   DIR/study.json    the study with its screw and resin embedded as JSON
 *                     objects (every {value, source} object kept): a
 *                     self-contained copy of the inputs that loads with
 *                     ow_config_load_study;
 *   DIR/points-si.json the grid (size, stride, solves, the rpm and
 *                     barrel-axis values of every column and row, the
 *                     status bits of every lattice point), the input
 *                     files' names and their CRC-32, the order of the
 *                     status bits;
 *   DIR/points-si.csv  one row per solved point: lattice indices, status
 *                     bits, flags, signed margins and every figure of
 *                     struct ow_point in SI, 17 significant digits (exact
 *                     round trip; "nan" where a figure does not exist);
 *   DIR/profile.csv   the centre point's axial profile
 *                     (ow_results_profile_csv), absent when the window is
 *                     empty; its figures are in points-si.json ("centre").
 *   DIR/manifest.json every other file's size and CRC-32, written last
 *                     (ow_mapdir_seal): a folder without it, or whose
 *                     files do not match it, is not read back.
 *
 * Every file is written atomically (ow_io_write_file), and the folder as a
 * whole: into a sibling temporary folder that ow_mapdir_replace puts in
 * place of the previous one in one rename. */
#ifndef OW_MAPDIR_H
#define OW_MAPDIR_H

#include "ow_study.h"
#include "ow_solver.h"
#include "ow_status.h"
#include "ow_sweep.h"
#include "ow_units.h"

/* The window's centre point as solved for the profile page: its figures
 * and its axial profile (hopper to tip). */
struct ow_mapdir_centre {
	int valid;                   /* 0: none saved (empty window) */
	struct ow_point pt;          /* SI, as ow_solver_run gave it */
	struct ow_profile_row *rows; /* malloc'd by ow_mapdir_load */
	int n_rows;
};

/* Save study s (as loaded by ow_config_load_study: its files are read again
 * and must still hold the bytes that were loaded, checked by CRC-32),
 * lattice g, and the centre point (centre: its figures, rows/n_rows: its
 * profile; NULL/0 when there is none, e.g. an empty window) into the
 * existing folder dir. OW_EINPUT when an input file is gone or changed
 * since it was loaded, OW_EIO naming the file when a write fails,
 * OW_ENOMEM. */
enum ow_status ow_mapdir_save(const struct ow_study *s, const struct ow_grid *g,
                              const struct ow_point *centre,
                              const struct ow_profile_row *rows, int n_rows,
                              const char *dir, struct ow_diag *d);

/* Load the map folder dir: the study from DIR/study.json (its path fields
 * and input_crc set back to the original files' names and CRC-32, so the
 * report traces to them), the lattice into *grid (owned by the caller:
 * ow_grid_destroy) with every point as the sweep left it, and the centre
 * point into *centre (may be NULL when not wanted; free its rows with
 * ow_mapdir_centre_free). Re-extracting the window (ow_window_extract)
 * gives the window of the original run. OW_EINPUT when dir does not exist
 * or is not a map folder ("... is not a map folder: points-si.json is
 * missing"), or a file in it is damaged (the message names the file and
 * the line or key); OW_ENOMEM. */
enum ow_status ow_mapdir_load(const struct ow_units *u, const char *dir,
                              struct ow_study *study, struct ow_grid **grid,
                              struct ow_mapdir_centre *centre,
                              struct ow_diag *d);

/* Write DIR/manifest.json: the size and CRC-32 of every regular file in
 * dir (names starting with '.' left out). OW_EIO when a write fails. */
enum ow_status ow_mapdir_seal(const char *dir, struct ow_diag *d);

/* Check that dir is a complete map folder as opwin wrote it: its manifest
 * is there and every file it lists has its size and CRC-32. OW_EINPUT
 * naming the folder and the file otherwise. */
enum ow_status ow_mapdir_verify(const char *dir, struct ow_diag *d);

/* Before solving: can a map folder be written at dir? Its parent must be
 * a writable folder and dir absent, an empty folder, or a map folder
 * (never a folder of other files, which replacing would hide). OW_EIO
 * naming dir and why not. */
enum ow_status ow_mapdir_check_target(const char *dir, struct ow_diag *d);

/* Put the finished folder tmp (sealed; from ow_io_dir_begin) in place of
 * dir in one rename. The previous folder's files that opwin writes are
 * deleted; anything else in it moves into the new folder. When something
 * could not be moved or deleted, the previous folder stays at the path
 * put into left[n] ("" otherwise). OW_EIO when the rename fails (tmp is
 * then untouched). */
enum ow_status ow_mapdir_replace(const char *tmp, const char *dir, char *left,
                                 size_t n, struct ow_diag *d);

/* Copy the data files of map folder `from` (all but the drawings and the
 * manifest) into folder `to`, so the drawings can be made again there. */
enum ow_status ow_mapdir_copy_data(const char *from, const char *to,
                                   struct ow_diag *d);

/* Free the rows of a loaded centre and mark it invalid (NULL-safe). */
void ow_mapdir_centre_free(struct ow_mapdir_centre *c);

#endif
