/* ow_csv.h - a small reader for numeric tables in comma-separated form:
 * one header line of column names (a name may carry its unit after an
 * underscore, "temperature_degC", "viscosity_Pa s"), then rows of numbers.
 *
 * Blank lines are skipped, CR-LF line ends and a UTF-8 byte-order mark are
 * accepted, cells are trimmed and may be wrapped in double quotes. Every data
 * cell must be a finite number, read whole (a cell longer than 256 bytes
 * or holding a NUL byte is refused, never cut), and every row must have as
 * many cells as the header (at most 1024). Column names must be UTF-8. Numbers
 * are read with strtod: the program never calls setlocale, so the decimal point
 * is always ".". Errors are OW_EINPUT with
 * "<file>: line <n>[, column <k> (<name>)]: <what was expected>". */
#ifndef OW_CSV_H
#define OW_CSV_H

#include <stddef.h>

#include "ow_status.h"
#include "ow_units.h"

struct ow_csv {
	char *name; /* file name as given, for messages (owned) */
	int n_cols;
	char **cols;     /* header cells, trimmed, quotes removed (owned) */
	int header_line; /* line number of the header, 1-based */
	size_t n_rows;
	double *cells; /* n_rows x n_cols, row-major (owned) */
	int *lines;    /* file line number of each row, 1-based (owned) */
	const char *const *text_names; /* columns kept as text (borrowed) */
	int empty_nan; /* 1: an empty numeric cell reads as NAN */
	char **texts;  /* n_rows x n_cols, text cells only (owned) */
};

/* Parse len bytes of text; name is used in messages only. The caller frees
 * *out with ow_csv_destroy. */
enum ow_status ow_csv_parse(const char *text, size_t len, const char *name,
                            struct ow_csv **out, struct ow_diag *d);

/* Read and parse the file at path. A file that cannot be read is an input
 * rejection (OW_EINPUT) naming the path and the system's reason. */
enum ow_status ow_csv_read(const char *path, struct ow_csv **out,
                           struct ow_diag *d);

/* The same, with the columns named in text_cols (NULL-terminated, may be
 * NULL; borrowed while parsing) kept as text (ow_csv_text; their numeric
 * cells are NAN) and, when empty_nan, an empty cell of a numeric column
 * read as NAN (a value not measured) instead of rejected. */
enum ow_status ow_csv_parse_with(const char *text, size_t len, const char *name,
                                 const char *const *text_cols, int empty_nan,
                                 struct ow_csv **out, struct ow_diag *d);
enum ow_status ow_csv_read_with(const char *path, const char *const *text_cols,
                                int empty_nan, struct ow_csv **out,
                                struct ow_diag *d);

/* The text of a cell of a text column ("" for any other cell). */
const char *ow_csv_text(const struct ow_csv *c, size_t row, int col);

/* NULL-safe. */
void ow_csv_destroy(struct ow_csv *c);

/* The cell at row (0-based data row) and col. */
double ow_csv_cell(const struct ow_csv *c, size_t row, int col);

/* The first column named exactly `quantity` or `quantity` + "_" + unit.
 * Returns its index and points *unit at the unit text ("" when none), or
 * returns -1. *count (may be NULL) receives the number of such columns, so a
 * caller can reject duplicates. */
int ow_csv_find(const struct ow_csv *c, const char *quantity, const char **unit,
                int *count);

/* Columns with their unit in the header (csv_units.c). The unit text of
 * column col must be present and convert to dim; example is a header cell
 * to show when it is missing. OW_EINPUT "<file>: line <n>, column <k>
 * (<name>): ..." otherwise. */
enum ow_status ow_csv_unit_check(const struct ow_units *u,
                                 const struct ow_csv *c, int col,
                                 const char *unit, enum ow_dim dim,
                                 const char *example, struct ow_diag *d);

/* The cell at row, col converted from unit to SI of dim. */
enum ow_status ow_csv_cell_si(const struct ow_units *u, const struct ow_csv *c,
                              size_t row, int col, const char *unit,
                              enum ow_dim dim, double *si, struct ow_diag *d);

#endif
