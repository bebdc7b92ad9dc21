/* calib_read.c - a line's logged readings (CSV, units in the header) ->
 * struct ow_readings in SI. */
#include "ow_calib.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_csv.h"

static const char *const text_cols[] = {"notes", NULL};

/* Header examples for messages. */
static const char *const examples[OW_CQ_COUNT] = {
    "output_kg/h", "head_pressure_MPa", "melt_temp_degC", "drive_power_kW",
    "torque_N m"};

/* "zone<N>_<unit>": N (1-based), or 0 when the name is not of that form. */
static int zone_number(const char *name, const char **unit)
{
	const char *p = name + 4;
	int n = 0;

	if (strncmp(name, "zone", 4) != 0 || !isdigit((unsigned char)*p))
		return 0;
	while (isdigit((unsigned char)*p) && n < 1000)
		n = n * 10 + (*p++ - '0');
	if (*p != '_' && *p != '\0')
		return 0;
	*unit = *p ? p + 1 : p;
	return n;
}

/* What each column of the table is. */
struct layout {
	int rpm_col;
	const char *rpm_unit;
	int qty_col[OW_CQ_COUNT];
	const char *qty_unit[OW_CQ_COUNT];
	int zone_col[OW_MAX_ZONES];
	const char *zone_unit[OW_MAX_ZONES];
	int notes_col;
};

/* One known column of name `what`: unique, with a unit of dim. */
static enum ow_status known_col(const struct ow_units *u,
                                const struct ow_csv *c, const char *what,
                                enum ow_dim dim, const char *example, int *col,
                                const char **unit, struct ow_diag *d)
{
	int count;

	*col = ow_csv_find(c, what, unit, &count);
	if (count > 1)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d: more than one "
		                   "%s column",
		                   c->name, c->header_line, what);
	if (*col < 0)
		return OW_OK;
	return ow_csv_unit_check(u, c, *col, *unit, dim, example, d);
}

static enum ow_status zone_col(const struct ow_units *u, const struct ow_csv *c,
                               int i, int n_zones, struct layout *L,
                               struct ow_diag *d)
{
	const char *unit = "";
	int z = zone_number(c->cols[i], &unit);

	if (z < 1)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): "
		                   "unknown column: expected screw_speed_rpm, "
		                   "zone1_degC ..., output_kg/h, "
		                   "head_pressure_MPa, melt_temp_degC, "
		                   "drive_power_kW, torque_N m or notes",
		                   c->name, c->header_line, i + 1, c->cols[i]);
	if (z > n_zones)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): "
		                   "the study has %d barrel zone%s",
		                   c->name, c->header_line, i + 1, c->cols[i],
		                   n_zones, n_zones == 1 ? "" : "s");
	if (L->zone_col[z - 1] >= 0)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d: more than one "
		                   "zone%d column",
		                   c->name, c->header_line, z);
	L->zone_col[z - 1] = i;
	L->zone_unit[z - 1] = unit;
	return ow_csv_unit_check(u, c, i, unit, OW_DIM_TEMPERATURE,
	                         "zone1_degC", d);
}

static int is_known(const struct layout *L, int i)
{
	int k;

	if (i == L->rpm_col || i == L->notes_col)
		return 1;
	for (k = 0; k < OW_CQ_COUNT; k++)
		if (i == L->qty_col[k])
			return 1;
	return 0;
}

static enum ow_status read_layout(const struct ow_units *u,
                                  const struct ow_csv *c, int n_zones,
                                  struct layout *L, struct ow_diag *d)
{
	enum ow_status st;
	int k, i, any = 0;

	memset(L, 0, sizeof *L);
	for (k = 0; k < OW_MAX_ZONES; k++)
		L->zone_col[k] = -1;
	L->notes_col = ow_csv_find(c, "notes", NULL, NULL);
	st = known_col(u, c, "screw_speed", OW_DIM_ROT_SPEED, "screw_speed_rpm",
	               &L->rpm_col, &L->rpm_unit, d);
	if (st == OW_OK && L->rpm_col < 0)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line %d: no screw speed "
		                 "column: expected a header cell such as "
		                 "screw_speed_rpm",
		                 c->name, c->header_line);
	for (k = 0; st == OW_OK && k < OW_CQ_COUNT; k++) {
		enum ow_calib_qty q = (enum ow_calib_qty)k;

		st = known_col(u, c, ow_calib_qty_name(q), ow_calib_qty_dim(q),
		               examples[k], &L->qty_col[k], &L->qty_unit[k], d);
		any |= L->qty_col[k] >= 0;
	}
	for (i = 0; st == OW_OK && i < c->n_cols; i++)
		if (!is_known(L, i))
			st = zone_col(u, c, i, n_zones, L, d);
	if (st == OW_OK && !any)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line %d: no measured "
		                 "quantity: expected at least one of "
		                 "output_kg/h, head_pressure_MPa, "
		                 "melt_temp_degC, drive_power_kW, torque_N m",
		                 c->name, c->header_line);
	return st;
}

/* A value a line can show: positive (temperatures above 0 K). */
static enum ow_status positive(const struct ow_csv *c, size_t row, int col,
                               double si, struct ow_diag *d)
{
	if (si > 0.0)
		return OW_OK;
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: line %d, column %d (%s): %g: "
	                   "expected a value > 0",
	                   c->name, c->lines[row], col + 1, c->cols[col],
	                   ow_csv_cell(c, row, col));
}

static enum ow_status cell(const struct ow_units *u, const struct ow_csv *c,
                           size_t row, int col, const char *unit,
                           enum ow_dim dim, double *si, struct ow_diag *d)
{
	enum ow_status st;

	*si = NAN;
	if (col < 0 || isnan(ow_csv_cell(c, row, col)))
		return OW_OK;
	st = ow_csv_cell_si(u, c, row, col, unit, dim, si, d);
	return st == OW_OK ? positive(c, row, col, *si, d) : st;
}

static enum ow_status read_row(const struct ow_units *u, const struct ow_csv *c,
                               const struct layout *L, size_t row,
                               struct ow_reading *r, struct ow_diag *d)
{
	enum ow_status st;
	int k, any = 0;

	r->line = c->lines[row];
	st = cell(u, c, row, L->rpm_col, L->rpm_unit, OW_DIM_ROT_SPEED, &r->rpm,
	          d);
	if (st == OW_OK && isnan(r->rpm))
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line %d, column %d (%s): "
		                 "empty cell: every reading needs its screw "
		                 "speed",
		                 c->name, r->line, L->rpm_col + 1,
		                 c->cols[L->rpm_col]);
	for (k = 0; st == OW_OK && k < OW_MAX_ZONES; k++) {
		st = cell(u, c, row, L->zone_col[k], L->zone_unit[k],
		          OW_DIM_TEMPERATURE, &r->set_K[k], d);
		r->set_given[k] = !isnan(r->set_K[k]);
		r->n_set += r->set_given[k];
	}
	for (k = 0; st == OW_OK && k < OW_CQ_COUNT; k++) {
		enum ow_calib_qty q = (enum ow_calib_qty)k;

		st = cell(u, c, row, L->qty_col[k], L->qty_unit[k],
		          ow_calib_qty_dim(q), &r->value[k], d);
		any |= !isnan(r->value[k]);
	}
	if (st == OW_OK && !any)
		st = ow_diag_set(d, OW_EINPUT,
		                 "%s: line %d: no measured value "
		                 "in this row",
		                 c->name, r->line);
	if (L->notes_col >= 0)
		snprintf(r->notes, sizeof r->notes, "%s",
		         ow_csv_text(c, row, L->notes_col));
	return st;
}

static enum ow_status load(const struct ow_units *u, struct ow_csv *c,
                           int n_zones, struct ow_readings **out,
                           struct ow_diag *d)
{
	struct ow_readings *r = calloc(1, sizeof *r);
	struct layout L;
	enum ow_status st;
	size_t row;
	int k;

	*out = NULL;
	if (!r) {
		ow_csv_destroy(c);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	snprintf(r->source, sizeof r->source, "%s", c->name);
	st = read_layout(u, c, n_zones, &L, d);
	if (st == OW_OK && c->n_rows > OW_CALIB_MAX_READINGS)
		st = ow_diag_set(d, OW_EINPUT, "%s: %zu readings: at most %d",
		                 c->name, c->n_rows, OW_CALIB_MAX_READINGS);
	for (row = 0; st == OW_OK && row < c->n_rows; row++)
		st = read_row(u, c, &L, row, &r->r[r->n++], d);
	for (k = 0; st == OW_OK && k < OW_CQ_COUNT; k++)
		snprintf(r->unit[k], sizeof r->unit[k], "%s",
		         L.qty_col[k] >= 0 ? L.qty_unit[k] : "");
	ow_csv_destroy(c);
	if (st != OW_OK) {
		free(r);
		return st;
	}
	*out = r;
	return OW_OK;
}

enum ow_status ow_calib_readings_read(const struct ow_units *u,
                                      const char *path, int n_zones,
                                      struct ow_readings **out,
                                      struct ow_diag *d)
{
	struct ow_csv *c = NULL;
	enum ow_status st = ow_csv_read_with(path, text_cols, 1, &c, d);

	*out = NULL;
	return st == OW_OK ? load(u, c, n_zones, out, d) : st;
}

enum ow_status ow_calib_readings_parse(const struct ow_units *u,
                                       const char *text, size_t len,
                                       const char *name, int n_zones,
                                       struct ow_readings **out,
                                       struct ow_diag *d)
{
	struct ow_csv *c = NULL;
	enum ow_status st =
	    ow_csv_parse_with(text, len, name, text_cols, 1, &c, d);

	*out = NULL;
	return st == OW_OK ? load(u, c, n_zones, out, d) : st;
}
