/* fitdata.c - lab viscosity tables (temperature, shear rate, viscosity with
 * units in the header) -> SI points for the rheology fit. */
#include "ow_fit.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_csv.h"

/* One quantity the table must hold, with the header names accepted. */
struct role {
	const char *what;     /* for messages */
	const char *names[3]; /* accepted quantity names, NULL-ended */
	const char *example;  /* a header cell to show */
	enum ow_dim dim;
};

static const struct role roles[3] = {
    {"temperature",
     {"temperature", NULL, NULL},
     "temperature_degC",
     OW_DIM_TEMPERATURE},
    {"shear-rate",
     {"shear_rate", "angular_frequency", NULL},
     "shear_rate_1/s (or angular_frequency_rad/s)",
     OW_DIM_SHEAR_RATE},
    {"viscosity",
     {"viscosity", "complex_viscosity", NULL},
     "viscosity_Pa s (or complex_viscosity_Pa s)",
     OW_DIM_VISCOSITY},
};

/* Plausible melt temperatures, the reference range the resin check takes. */
#define TEMP_MIN_K 200.0
#define TEMP_MAX_K 800.0

enum ow_status ow_fit_data_create(size_t n, const char *source,
                                  struct ow_fit_data **out, struct ow_diag *d)
{
	struct ow_fit_data *data = calloc(1, sizeof *data);

	*out = NULL;
	if (!data ||
	    !(data->points = calloc(n ? n : 1, sizeof(struct ow_fit_point)))) {
		free(data);
		return ow_diag_set(d, OW_ENOMEM, "%s: out of memory", source);
	}
	data->n = n;
	snprintf(data->source, sizeof data->source, "%s", source);
	*out = data;
	return OW_OK;
}

void ow_fit_data_destroy(struct ow_fit_data *data)
{
	if (!data)
		return;
	free(data->points);
	free(data);
}

/* Find the one column of a role; *name_used tells which name matched. */
static enum ow_status find_role(const struct ow_csv *c, const struct role *r,
                                int *col, const char **unit, int *name_used,
                                struct ow_diag *d)
{
	int i, count, total = 0, k;

	*col = -1;
	for (i = 0; r->names[i]; i++) {
		const char *un = NULL;

		k = ow_csv_find(c, r->names[i], &un, &count);
		total += count;
		if (k >= 0 && *col < 0) {
			*col = k;
			*unit = un;
			*name_used = i;
		}
	}
	if (*col < 0)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d: no %s column: expected a "
		                   "header cell such as %s",
		                   c->name, c->header_line, r->what,
		                   r->example);
	if (total > 1)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d: more than one %s column",
		                   c->name, c->header_line, r->what);
	return OW_OK;
}

/* Convert one cell to SI and check it is a positive (plausible) value. */
static enum ow_status convert_cell(const struct ow_units *u,
                                   const struct ow_csv *c, size_t row,
                                   const struct role *r, int col,
                                   const char *unit, double *si,
                                   struct ow_diag *d)
{
	double x = ow_csv_cell(c, row, col);
	int line = c->lines[row];
	enum ow_status st = ow_csv_cell_si(u, c, row, col, unit, r->dim, si, d);

	if (st != OW_OK)
		return st;
	if (r->dim == OW_DIM_TEMPERATURE &&
	    (*si < TEMP_MIN_K || *si > TEMP_MAX_K))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): %g %s is "
		                   "%.1f K, outside the melt range %g..%g K",
		                   c->name, line, col + 1, c->cols[col], x,
		                   unit, *si, TEMP_MIN_K, TEMP_MAX_K);
	if (!(*si > 0.0))
		return ow_diag_set(d, OW_EINPUT,
		                   "%s: line %d, column %d (%s): %g %s must "
		                   "be positive",
		                   c->name, line, col + 1, c->cols[col], x,
		                   unit);
	return OW_OK;
}

static enum ow_status from_csv(const struct ow_units *u, const struct ow_csv *c,
                               struct ow_fit_data *data, struct ow_diag *d)
{
	int col[3], used[3], k;
	const char *unit[3];
	double si[3];
	size_t row;
	enum ow_status st;

	for (k = 0; k < 3; k++) {
		st = find_role(c, &roles[k], &col[k], &unit[k], &used[k], d);
		if (st == OW_OK)
			st = ow_csv_unit_check(u, c, col[k], unit[k],
			                       roles[k].dim, roles[k].example,
			                       d);
		if (st != OW_OK)
			return st;
	}
	/* Cox-Merz: an angular frequency (rad/s) or a complex viscosity */
	data->cox_merz =
	    used[1] == 1 || used[2] == 1 || strstr(unit[1], "rad") != NULL;
	for (row = 0; row < c->n_rows; row++) {
		for (k = 0; k < 3; k++) {
			st = convert_cell(u, c, row, &roles[k], col[k], unit[k],
			                  &si[k], d);
			if (st != OW_OK)
				return st;
		}
		data->points[row].temp_K = si[0];
		data->points[row].shear_rate_1_s = si[1];
		data->points[row].viscosity_Pa_s = si[2];
		data->points[row].line = c->lines[row];
	}
	return OW_OK;
}

static enum ow_status load(const struct ow_units *u, struct ow_csv *c,
                           struct ow_fit_data **out, struct ow_diag *d)
{
	enum ow_status st = ow_fit_data_create(c->n_rows, c->name, out, d);

	if (st == OW_OK)
		st = from_csv(u, c, *out, d);
	if (st != OW_OK) {
		ow_fit_data_destroy(*out);
		*out = NULL;
	}
	ow_csv_destroy(c);
	return st;
}

enum ow_status ow_fit_data_read(const struct ow_units *u, const char *path,
                                struct ow_fit_data **out, struct ow_diag *d)
{
	struct ow_csv *c = NULL;
	enum ow_status st = ow_csv_read(path, &c, d);

	*out = NULL;
	if (st != OW_OK)
		return st;
	return load(u, c, out, d);
}

enum ow_status ow_fit_data_parse(const struct ow_units *u, const char *text,
                                 size_t len, const char *name,
                                 struct ow_fit_data **out, struct ow_diag *d)
{
	struct ow_csv *c = NULL;
	enum ow_status st = ow_csv_parse(text, len, name, &c, d);

	*out = NULL;
	if (st != OW_OK)
		return st;
	return load(u, c, out, d);
}
