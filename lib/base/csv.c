/* csv.c - numeric comma-separated tables with a header line. */
#include "ow_csv.h"
#include "ow_io.h"

#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define CSV_MAX_BYTES                                                          \
	((size_t)64 * 1024 * 1024) /* a lab table is far smaller */
#define CSV_MAX_COLS 1024 /* a guard against a runaway line, not a limit */
#define CSV_MAX_CELL 256  /* bytes: a number written out in full is shorter */

/* One line of the text: [start, end) without its line break. */
struct span {
	const char *start, *end;
};

static void trim(struct span *s)
{
	while (s->start < s->end && (*s->start == ' ' || *s->start == '\t'))
		s->start++;
	while (s->end > s->start &&
	       (s->end[-1] == ' ' || s->end[-1] == '\t' || s->end[-1] == '\r'))
		s->end--;
	if (s->end - s->start >= 2 && *s->start == '"' && s->end[-1] == '"') {
		s->start++; /* a quoted cell: the quotes are not content */
		s->end--;
	}
}

static int is_blank(struct span s)
{
	trim(&s);
	return s.start == s.end;
}

/* Split a line at commas into at most max cells; returns the cell count
 * (max + 1 means "more than max"). */
static int split(struct span line, struct span *cells, int max)
{
	int n = 0;
	const char *p = line.start;

	for (;;) {
		const char *q = memchr(p, ',', (size_t)(line.end - p));
		const char *e = q ? q : line.end;

		if (n == max)
			return max + 1;
		cells[n].start = p;
		cells[n].end = e;
		trim(&cells[n]);
		n++;
		if (!q)
			return n;
		p = q + 1;
	}
}

static char *dup_span(struct span s)
{
	size_t len = (size_t)(s.end - s.start);
	char *t = malloc(len + 1);

	if (t) {
		memcpy(t, s.start, len);
		t[len] = '\0';
	}
	return t;
}

void ow_csv_destroy(struct ow_csv *c)
{
	int i;

	if (!c)
		return;
	for (i = 0; c->cols && i < c->n_cols; i++)
		free(c->cols[i]);
	free(c->cols);
	for (i = 0; c->texts && (size_t)i < c->n_rows * (size_t)c->n_cols; i++)
		free(c->texts[i]);
	free(c->texts);
	free(c->cells);
	free(c->lines);
	free(c->name);
	free(c);
}

static enum ow_status read_header(struct ow_csv *c, struct span line,
                                  int lineno, struct ow_diag *d)
{
	struct span cells[CSV_MAX_COLS + 1];
	int n = split(line, cells, CSV_MAX_COLS), i;

	if (n > CSV_MAX_COLS)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d: more than %d columns", c->name,
		                   lineno, CSV_MAX_COLS);
	c->cols = calloc((size_t)n, sizeof *c->cols);
	if (!c->cols)
		return ow_diag_set(d, OW_ENOMEM, "%s: out of memory", c->name);
	c->n_cols = n;
	c->header_line = lineno;
	for (i = 0; i < n; i++) {
		if (memchr(cells[i].start, '\0',
		           (size_t)(cells[i].end - cells[i].start)))
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: line %d, column %d: a NUL byte "
			                   "in the column name",
			                   c->name, lineno, i + 1);
		if (cells[i].start == cells[i].end)
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: line %d, column %d: empty "
			                   "column name in the header",
			                   c->name, lineno, i + 1);
		if (ow_io_utf8_check(cells[i].start,
		                     (size_t)(cells[i].end - cells[i].start)) !=
		    (size_t)(cells[i].end - cells[i].start))
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: line %d, column %d: the column "
			                   "name is not UTF-8 text",
			                   c->name, lineno, i + 1);
		c->cols[i] = dup_span(cells[i]);
		if (!c->cols[i])
			return ow_diag_set(d, OW_ENOMEM, "%s: out of memory",
			                   c->name);
	}
	return OW_OK;
}

/* One data cell -> a finite number, or a message naming line and column. */
static enum ow_status read_number(const struct ow_csv *c, struct span s,
                                  int lineno, int col, double *x,
                                  struct ow_diag *d)
{
	char buf[CSV_MAX_CELL + 1], *end;
	size_t len = (size_t)(s.end - s.start);

	if (len == 0)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): empty cell: "
		                   "expected a number",
		                   c->name, lineno, col + 1, c->cols[col]);
	if (memchr(s.start, '\0', len))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): a NUL byte in "
		                   "the cell: expected a number",
		                   c->name, lineno, col + 1, c->cols[col]);
	if (len > CSV_MAX_CELL) /* never cut: a cut number is another one */
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): a cell of %zu "
		                   "bytes: a number is at most %d",
		                   c->name, lineno, col + 1, c->cols[col], len,
		                   CSV_MAX_CELL);
	memcpy(buf, s.start, len);
	buf[len] = '\0';
	errno = 0;
	*x = strtod(buf, &end);
	if (end == buf || *end != '\0' || !isfinite(*x) || errno == ERANGE)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): \"%s\" is not "
		                   "a finite number",
		                   c->name, lineno, col + 1, c->cols[col], buf);
	return OW_OK;
}

/* Is column col one of the text columns the caller named? */
static int is_text_col(const struct ow_csv *c, int col)
{
	const char *const *t;

	for (t = c->text_names; t && *t; t++)
		if (strcmp(c->cols[col], *t) == 0)
			return 1;
	return 0;
}

/* A cell: text kept as it is in a text column, NAN for an empty cell when
 * empty cells are allowed, otherwise a number. */
static enum ow_status read_cell(struct ow_csv *c, struct span s, int lineno,
                                int col, double *x, struct ow_diag *d)
{
	size_t at = c->n_rows * (size_t)c->n_cols + (size_t)col;

	size_t len = (size_t)(s.end - s.start);

	if (c->texts && is_text_col(c, col)) {
		*x = NAN;
		if (len > CSV_MAX_CELL || memchr(s.start, '\0', len) ||
		    ow_io_utf8_check(s.start, len) != len)
			return ow_diag_set(d, OW_EINPUT,
			                   "%s: line %d, column %d (%s): "
			                   "expected UTF-8 text of at most %d "
			                   "bytes",
			                   c->name, lineno, col + 1,
			                   c->cols[col], CSV_MAX_CELL);
		c->texts[at] = dup_span(s);
		return c->texts[at] ? OW_OK
		                    : ow_diag_set(d, OW_ENOMEM,
		                                  "%s: out of "
		                                  "memory",
		                                  c->name);
	}
	if (c->empty_nan && len == 0) {
		*x = NAN;
		return OW_OK;
	}
	return read_number(c, s, lineno, col, x, d);
}

static enum ow_status read_row(struct ow_csv *c, struct span line, int lineno,
                               struct ow_diag *d)
{
	struct span cells[CSV_MAX_COLS + 1];
	int n = split(line, cells, c->n_cols), i;
	double *row = c->cells + c->n_rows * (size_t)c->n_cols;
	enum ow_status st;

	if (n != c->n_cols)
		return ow_diag_set(
		    d, OW_EINPUT,
		    "%s: line %d: %s%d cells, but the header "
		    "(line %d) names %d columns",
		    c->name, lineno, n > c->n_cols ? "more than " : "",
		    n > c->n_cols ? c->n_cols : n, c->header_line, c->n_cols);
	for (i = 0; i < n; i++) {
		st = read_cell(c, cells[i], lineno, i, &row[i], d);
		if (st != OW_OK)
			return st;
	}
	c->lines[c->n_rows++] = lineno;
	return OW_OK;
}

/* Count lines so the row arrays are allocated once. */
static size_t count_lines(const char *text, size_t len)
{
	size_t n = 1, i;

	for (i = 0; i < len; i++)
		n += text[i] == '\n';
	return n;
}

static enum ow_status parse_lines(struct ow_csv *c, const char *text,
                                  size_t len, struct ow_diag *d)
{
	size_t max_rows = count_lines(text, len);
	const char *p = text, *end = text + len;
	int lineno = 0;
	enum ow_status st = OW_OK;

	while (p < end && st == OW_OK) {
		const char *nl = memchr(p, '\n', (size_t)(end - p));
		struct span line = {p, nl ? nl : end};

		lineno++;
		p = nl ? nl + 1 : end;
		if (is_blank(line))
			continue;
		if (!c->cols) {
			st = read_header(c, line, lineno, d);
			c->cells = malloc(max_rows * (size_t)c->n_cols *
			                  sizeof *c->cells);
			if (st == OW_OK && c->text_names)
				c->texts = calloc(max_rows * (size_t)c->n_cols,
				                  sizeof *c->texts);
			if (st == OW_OK && c->text_names && !c->texts)
				st = ow_diag_set(d, OW_ENOMEM,
				                 "%s: out of memory", c->name);
			if (st == OW_OK && !c->cells)
				st = ow_diag_set(d, OW_ENOMEM,
				                 "%s: out of memory", c->name);
		} else
			st = read_row(c, line, lineno, d);
	}
	if (st == OW_OK && !c->cols)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line 1: empty file: expected a header "
		                 "line of column names",
		                 c->name);
	else if (st == OW_OK && c->n_rows == 0)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line %d: no data rows after the header",
		                 c->name, lineno);
	return st;
}

enum ow_status ow_csv_parse(const char *text, size_t len, const char *name,
                            struct ow_csv **out, struct ow_diag *d)
{
	return ow_csv_parse_with(text, len, name, NULL, 0, out, d);
}

enum ow_status ow_csv_parse_with(const char *text, size_t len, const char *name,
                                 const char *const *text_cols, int empty_nan,
                                 struct ow_csv **out, struct ow_diag *d)
{
	struct ow_csv *c = calloc(1, sizeof *c);
	enum ow_status st = OW_ENOMEM;

	*out = NULL;
	if (!c)
		return ow_diag_set(d, OW_ENOMEM, "%s: out of memory", name);
	c->text_names = text_cols;
	c->empty_nan = empty_nan;
	c->name = strdup(name);
	c->lines = malloc(count_lines(text, len) * sizeof *c->lines);
	if (!c->name || !c->lines) {
		ow_diag_set(d, OW_ENOMEM, "%s: out of memory", name);
		goto fail;
	}
	if (len >= 3 && memcmp(text, "\xEF\xBB\xBF", 3) == 0) {
		text += 3; /* UTF-8 byte-order mark written by spreadsheets */
		len -= 3;
	}
	st = parse_lines(c, text, len, d);
	if (st != OW_OK)
		goto fail;
	*out = c;
	return OW_OK;
fail:
	ow_csv_destroy(c);
	return st;
}

enum ow_status ow_csv_read(const char *path, struct ow_csv **out,
                           struct ow_diag *d)
{
	return ow_csv_read_with(path, NULL, 0, out, d);
}

enum ow_status ow_csv_read_with(const char *path, const char *const *text_cols,
                                int empty_nan, struct ow_csv **out,
                                struct ow_diag *d)
{
	char *buf = NULL;
	size_t len = 0;
	enum ow_status st;

	*out = NULL;
	len = strlen(path);
	if (ow_io_utf8_check(path, len) != len) /* it is copied into outputs */
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: the file name is not "
		                   "UTF-8 text: rename the file",
		                   path);
	st = ow_io_read_file(path, CSV_MAX_BYTES, &buf, &len, d);
	if (st == OW_OK)
		st = ow_csv_parse_with(buf, len, path, text_cols, empty_nan,
		                       out, d);
	free(buf);
	return st;
}

double ow_csv_cell(const struct ow_csv *c, size_t row, int col)
{
	return c->cells[row * (size_t)c->n_cols + (size_t)col];
}

const char *ow_csv_text(const struct ow_csv *c, size_t row, int col)
{
	const char *t =
	    c->texts ? c->texts[row * (size_t)c->n_cols + (size_t)col] : NULL;

	return t ? t : "";
}

int ow_csv_find(const struct ow_csv *c, const char *quantity, const char **unit,
                int *count)
{
	size_t len = strlen(quantity);
	int i, found = -1, n = 0;

	for (i = 0; i < c->n_cols; i++) {
		const char *name = c->cols[i];

		if (strncmp(name, quantity, len) != 0 ||
		    (name[len] != '\0' && name[len] != '_'))
			continue;
		if (found < 0) {
			found = i;
			if (unit)
				*unit = name[len] ? name + len + 1 : "";
		}
		n++;
	}
	if (count)
		*count = n;
	return found;
}
