/* csv_units.c - columns of a table whose header carries the unit
 * ("temperature_degC", "output_kg/h"): checking the unit and converting
 * cells to SI, with messages naming the file, line and column. */
#include "ow_csv.h"

enum ow_status ow_csv_unit_check(const struct ow_units *u,
                                 const struct ow_csv *c, int col,
                                 const char *unit, enum ow_dim dim,
                                 const char *example, struct ow_diag *d)
{
	struct ow_diag why = {{0}};
	double x;

	if (!unit[0])
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): the column "
		                   "name must carry its unit, e.g. %s",
		                   c->name, c->header_line, col + 1,
		                   c->cols[col], example);
	if (ow_units_convert(u, 1.0, unit, dim, &x, &why) == OW_OK)
		return OW_OK;
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: line %d, column %d (%s): unit \"%s\": %s",
	                   c->name, c->header_line, col + 1, c->cols[col], unit,
	                   why.msg[0] ? why.msg : "not understood");
}

enum ow_status ow_csv_cell_si(const struct ow_units *u, const struct ow_csv *c,
                              size_t row, int col, const char *unit,
                              enum ow_dim dim, double *si, struct ow_diag *d)
{
	double x = ow_csv_cell(c, row, col);
	struct ow_diag why = {{0}};

	if (ow_units_convert(u, x, unit, dim, si, &why) == OW_OK)
		return OW_OK;
	return ow_diag_set(d, OW_EINPUT, "%s: line %d, column %d (%s): %g: %s",
	                   c->name, c->lines[row], col + 1, c->cols[col], x,
	                   why.msg);
}
