/* mapdir_impl.h - internals of the map folder module (not public): a
 * growing text buffer, whole-file reading (both ow_io.h), folder paths, exact
 * number texts, and the points-si.csv writer and reader. */
#ifndef OW_MAPDIR_IMPL_H
#define OW_MAPDIR_IMPL_H

#include <stddef.h>

#include "ow_io.h"
#include "ow_mapdir.h"

/* The files `opwin report` reads back: every solved point in SI base
 * units (beside grid.csv, which is in the trade's units), and the grid's
 * description. Folders written before these names used the old ones,
 * still read. */
#define MD_POINTS_CSV      "points-si.csv"
#define MD_POINTS_JSON     "points-si.json"
#define MD_OLD_POINTS_CSV  "lattice.csv"
#define MD_OLD_POINTS_JSON "lattice.json"

/* Largest map folder file read back (a 1000 x 1000 lattice refined
 * twice is some hundreds of MB of points-si.csv). */
#define MD_MAX_FILE_BYTES ((size_t)1 << 30)

/* Appending to a growing text (struct ow_buf, ow_io.h). */
void ow_mapdir_add(struct ow_buf *t, const char *s);
void ow_mapdir_addf(struct ow_buf *t, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));
/* x with 17 significant digits (round trip), "nan", "inf" or "-inf". */
void ow_mapdir_num(struct ow_buf *t, double x);

/* Whole file into a NUL-terminated malloc'd buffer; 0 or an errno. */
int ow_mapdir_slurp(const char *path, char **buf, size_t *len);

/* "dir/name" into out (n bytes); OW_EINPUT when too long. */
enum ow_status ow_mapdir_path(char *out, size_t n, const char *dir,
                              const char *name, struct ow_diag *d);

/* Read a number written by ow_mapdir_num ("nan" and "inf" included); 0 when the
 * whole text is not one number. */
int ow_mapdir_parse_num(const char *text, double *x);

/* The figures of struct ow_point kept in a map folder, by name. */
int ow_mapdir_n_fields(void);
const char *ow_mapdir_field_name(int k);
double *ow_mapdir_field(struct ow_point *p, int k);

/* points-si.csv: one row per solved point (indices, bits, flags, margins,
 * figures in SI). n_zones columns of set-points and zone heats. */
enum ow_status ow_mapdir_points_csv(const struct ow_grid *g, int n_zones,
                                    char **out, struct ow_diag *d);

/* Read points-si.csv text (named file in messages) into the solved points
 * of g (lattice already sized, rpm and axis set); *n_solved counts rows. */
enum ow_status ow_mapdir_points_read(char *text, const char *file, int n_zones,
                                     struct ow_grid *g, int *n_solved,
                                     struct ow_diag *d);

/* profile.csv text (ow_results_profile_csv columns) back into rows in SI;
 * empty cells are NAN. */
enum ow_status ow_mapdir_profile_read(char *text, const char *file,
                                      double diameter_m,
                                      struct ow_profile_row **rows, int *n_rows,
                                      struct ow_diag *d);

#endif
