/* mapdir_csv.c - the text side of a map folder: points-si.csv (every solved
 * point in SI, exact) and reading profile.csv back. */
#include "mapdir_impl.h"

#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_classify.h"
#include "ow_const.h"

/* ---- small helpers ------------------------------------------------------ */

void ow_mapdir_add(struct ow_buf *t, const char *s)
{
	ow_buf_adds(t, s);
}

void ow_mapdir_addf(struct ow_buf *t, const char *fmt, ...)
{
	char buf[256];
	va_list ap;

	va_start(ap, fmt);
	vsnprintf(buf, sizeof buf, fmt, ap);
	va_end(ap);
	ow_mapdir_add(t, buf);
}

void ow_mapdir_num(struct ow_buf *t, double x)
{
	/* The program never calls setlocale: "%.17g" prints '.' and 17
	 * significant digits round-trip a double. */
	if (isnan(x))
		ow_mapdir_add(t, "nan");
	else if (isinf(x))
		ow_mapdir_add(t, x > 0 ? "inf" : "-inf");
	else
		ow_mapdir_addf(t, "%.17g", x);
}

int ow_mapdir_parse_num(const char *text, double *x)
{
	char *end = NULL;

	if (!*text)
		return 0;
	errno = 0;
	*x = strtod(text, &end);
	return end && !*end && errno != ERANGE;
}

int ow_mapdir_slurp(const char *path, char **buf, size_t *len)
{
	return ow_io_slurp(path, MD_MAX_FILE_BYTES, buf, len);
}

enum ow_status ow_mapdir_path(char *out, size_t n, const char *dir,
                              const char *name, struct ow_diag *d)
{
	size_t l = strlen(dir);
	const char *sep = l && dir[l - 1] == '/' ? "" : "/";

	if ((size_t)snprintf(out, n, "%s%s%s", dir, sep, name) >= n)
		return ow_diag_set(d, OW_EINPUT,
		                   "%.60s...: the path is too "
		                   "long",
		                   dir);
	return OW_OK;
}

/* ---- points-si.csv --------------------------------------------------------
 */

/* The figures of struct ow_point kept, by name (the CSV header). */
#define FIELD(f)                                                               \
	{                                                                      \
#f, offsetof(struct ow_point, f)                               \
	}
static const struct {
	const char *name;
	size_t off;
} fields[] = {
    FIELD(rpm),
    FIELD(output_kg_s),
    FIELD(discharge_pressure_Pa),
    FIELD(max_pressure_Pa),
    FIELD(max_pressure_at_m),
    FIELD(discharge_bulk_K),
    FIELD(discharge_peak_K),
    FIELD(peak_K),
    FIELD(peak_at_m),
    FIELD(unmelt_frac),
    FIELD(melt_start_m),
    FIELD(melt_complete_m),
    FIELD(max_sbr),
    FIELD(max_sbr_at_m),
    FIELD(plug_ratio),
    FIELD(plugging_at_m),
    FIELD(power_W),
    FIELD(torque_Nm),
    FIELD(sec_J_kg),
    FIELD(barrel_heat_W),
    FIELD(residence_s),
    FIELD(energy_residual),
    FIELD(feed_capacity_kg_s),
    FIELD(zone_load),
    FIELD(root_heat_W),
    FIELD(enthalpy_rise_W),
    FIELD(flow_work_W),
};
#undef FIELD
#define N_FIELDS ((int)(sizeof fields / sizeof fields[0]))

static double *field_at(struct ow_point *p, int k)
{
	return (double *)(void *)((char *)p + fields[k].off);
}

int ow_mapdir_n_fields(void)
{
	return N_FIELDS;
}

const char *ow_mapdir_field_name(int k)
{
	return fields[k].name;
}

double *ow_mapdir_field(struct ow_point *p, int k)
{
	return field_at(p, k);
}

static void points_header(struct ow_buf *t, int n_zones)
{
	int k;

	ow_mapdir_add(t, "rpm_index,barrel_index,failed_checks_bitmask,"
	                 "solver_flags_bitmask,iterations");
	for (k = 0; k < OW_CK_LIMITS; k++)
		ow_mapdir_addf(t, ",margin_%s", ow_check_key((enum ow_check)k));
	for (k = 0; k < N_FIELDS; k++)
		ow_mapdir_addf(t, ",%s", fields[k].name);
	for (k = 0; k < n_zones; k++)
		ow_mapdir_addf(t, ",set_K_%d", k + 1);
	for (k = 0; k < n_zones; k++)
		ow_mapdir_addf(t, ",zone_heat_W_%d", k + 1);
	for (k = 0; k < n_zones; k++)
		ow_mapdir_addf(t, ",zone_demand_W_%d", k + 1);
	for (k = 0; k < n_zones; k++)
		ow_mapdir_addf(t, ",zone_control_K_%d", k + 1);
	ow_mapdir_add(t, "\n");
}

static void point_row(struct ow_buf *t, const struct ow_grid *g, int i,
                      int n_zones)
{
	struct ow_grid_point *p = &g->pts[i];
	int k;

	ow_mapdir_addf(t, "%d,%d,%u,%u,%d", i % g->n_rpm, i / g->n_rpm,
	               p->v.bits, p->pt.flags, p->pt.n_iter);
	for (k = 0; k < OW_CK_LIMITS; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, p->v.margin[k]);
	}
	for (k = 0; k < N_FIELDS; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, *field_at(&p->pt, k));
	}
	for (k = 0; k < n_zones; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, p->pt.set_K[k]);
	}
	for (k = 0; k < n_zones; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, p->pt.zone_heat_W[k]);
	}
	for (k = 0; k < n_zones; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, p->pt.zone_demand_W[k]);
	}
	for (k = 0; k < n_zones; k++) {
		ow_mapdir_add(t, ",");
		ow_mapdir_num(t, p->pt.zone_control_K[k]);
	}
	ow_mapdir_add(t, "\n");
}

enum ow_status ow_mapdir_points_csv(const struct ow_grid *g, int n_zones,
                                    char **out, struct ow_diag *d)
{
	struct ow_buf t = {0};
	int i;

	points_header(&t, n_zones);
	for (i = 0; i < g->n_rpm * g->n_axis; i++)
		if (g->pts[i].solved == 1)
			point_row(&t, g, i, n_zones);
	if (t.oom) {
		ow_buf_free(&t);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	*out = t.data;
	return OW_OK;
}

/* Split line (modified in place) at commas into at most max cells. */
static int split(char *line, char **cells, int max)
{
	int n = 0;
	char *c = line;

	for (;;) {
		if (n == max)
			return max + 1;
		cells[n++] = c;
		c = strchr(c, ',');
		if (!c)
			return n;
		*c++ = '\0';
	}
}

/* Next line of *cur (CR-LF accepted), NULL at the end. */
static char *next_line(char **cur, int *lineno)
{
	char *l = *cur, *e;

	if (!l || !*l)
		return NULL;
	e = strchr(l, '\n');
	*cur = e ? e + 1 : NULL;
	if (e)
		*e = '\0';
	if (e && e > l && e[-1] == '\r')
		e[-1] = '\0';
	++*lineno;
	return l;
}

/* Integer cell in lo..hi. */
static int int_cell(const char *c, long lo, long hi, long *v)
{
	char *end = NULL;

	errno = 0;
	*v = strtol(c, &end, 10);
	return *c && !*end && !errno && *v >= lo && *v <= hi;
}

static enum ow_status bad(struct ow_diag *d, const char *file, int line,
                          const char *what)
{
	return ow_diag_set(d, OW_EINPUT, "%s: line %d: %s", file, line, what);
}

/* Cells of one row -> the lattice point it names. */
static enum ow_status point_read(char **c, const char *file, int line,
                                 int n_zones, struct ow_grid *g,
                                 struct ow_diag *d)
{
	struct ow_grid_point *p;
	long ir, ia, bits, flags, iter;
	int k, at = 5;

	if (!int_cell(c[0], 0, g->n_rpm - 1, &ir) ||
	    !int_cell(c[1], 0, g->n_axis - 1, &ia) ||
	    !int_cell(c[2], 0, (1L << OW_CK_COUNT) - 1, &bits) ||
	    !int_cell(c[3], 0, 0xFFFF, &flags) ||
	    !int_cell(c[4], 0, 1000000, &iter))
		return bad(d, file, line,
		           "lattice indices, bits, flags or "
		           "iterations out of range");
	p = ow_grid_at(g, (int)ir, (int)ia);
	if (p->solved == 1)
		return bad(d, file, line, "a lattice point listed twice");
	if (p->v.bits != (unsigned)bits)
		return bad(d, file, line,
		           "status bits differ from those in "
		           "points-si.json");
	p->solved = 1;
	p->v.bits = (unsigned)bits;
	p->pt.flags = (unsigned)flags;
	p->pt.n_iter = (int)iter;
	for (k = 0; k < OW_CK_LIMITS; k++)
		if (!ow_mapdir_parse_num(c[at++], &p->v.margin[k]))
			goto num;
	for (k = 0; k < N_FIELDS; k++)
		if (!ow_mapdir_parse_num(c[at++], field_at(&p->pt, k)))
			goto num;
	for (k = 0; k < n_zones; k++)
		if (!ow_mapdir_parse_num(c[at++], &p->pt.set_K[k]))
			goto num;
	for (k = 0; k < n_zones; k++)
		if (!ow_mapdir_parse_num(c[at++], &p->pt.zone_heat_W[k]))
			goto num;
	for (k = 0; k < n_zones; k++)
		if (!ow_mapdir_parse_num(c[at++], &p->pt.zone_demand_W[k]))
			goto num;
	for (k = 0; k < n_zones; k++) {
		if (!ow_mapdir_parse_num(c[at++], &p->pt.zone_control_K[k]))
			goto num;
		if (p->pt.zone_control_K[k] != p->pt.set_K[k])
			p->pt.zone_floating |= 1u << k;
	}
	return OW_OK;
num:
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: line %d, column %d: expected "
	                   "a number, got \"%.40s\"",
	                   file, line, at, c[at - 1]);
}

enum ow_status ow_mapdir_points_read(char *text, const char *file, int n_zones,
                                     struct ow_grid *g, int *n_solved,
                                     struct ow_diag *d)
{
	int n_cols = 5 + OW_CK_LIMITS + N_FIELDS + 4 * n_zones, line = 0;
	struct ow_buf want = {0};
	char *cur = text, *l, **cells = NULL;
	enum ow_status st = OW_OK;

	*n_solved = 0;
	points_header(&want, n_zones);
	cells = malloc(sizeof *cells * (size_t)(n_cols + 1));
	if (want.oom || !cells) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto fail;
	}
	want.data[want.len - 1] = '\0'; /* no newline */
	l = next_line(&cur, &line);
	if (!l || strcmp(l, want.data)) {
		st = bad(d, file, 1,
		         "unexpected header: the folder was "
		         "written by another version of opwin or edited");
		goto fail;
	}
	while (st == OW_OK && (l = next_line(&cur, &line)) != NULL) {
		if (split(l, cells, n_cols) != n_cols)
			st = bad(d, file, line, "wrong number of cells");
		else
			st = point_read(cells, file, line, n_zones, g, d);
		++*n_solved;
	}
fail:
	ow_buf_free(&want);
	free(cells);
	return st;
}

/* ---- profile.csv -------------------------------------------------------- */

#define PROFILE_HEADER                                                         \
	"axial_D,pressure_MPa,bulk_temp_C,peak_temp_C,sbr,"                    \
	"unmelt_fraction,depth_mm,barrel_C,shear_max_1_s"

static int cell_or_nan(const char *c, double *x)
{
	if (!*c) {
		*x = NAN; /* a figure that does not exist there */
		return 1;
	}
	return ow_mapdir_parse_num(c, x);
}

/* One row of ow_results_profile_csv back in SI. */
static int profile_row(char **c, double D, struct ow_profile_row *r)
{
	double v[9];
	int k;

	for (k = 0; k < 9; k++)
		if (!cell_or_nan(c[k], &v[k]))
			return 0;
	r->axial_m = v[0] * D;
	r->pressure_Pa = v[1] * 1e6;
	r->bulk_K = v[2] + OW_ZERO_C_K;
	r->peak_K = v[3] + OW_ZERO_C_K;
	r->sbr = v[4];
	r->unmelt_frac = v[5];
	r->depth_m = v[6] * 1e-3;
	r->barrel_K = v[7] + OW_ZERO_C_K;
	r->shear_max_1_s = v[8];
	return 1;
}

enum ow_status ow_mapdir_profile_read(char *text, const char *file,
                                      double diameter_m,
                                      struct ow_profile_row **rows, int *n_rows,
                                      struct ow_diag *d)
{
	size_t cap = 1;
	int line = 0, n = 0;
	char *cur = text, *l, *cells[10];
	struct ow_profile_row *r;

	for (l = text; *l; l++)
		cap += *l == '\n';
	r = calloc(cap, sizeof *r);
	if (!r)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	l = next_line(&cur, &line);
	if (!l || strcmp(l, PROFILE_HEADER)) {
		free(r);
		return bad(d, file, 1,
		           "unexpected header: expected " PROFILE_HEADER);
	}
	while ((l = next_line(&cur, &line)) != NULL) {
		if (split(l, cells, 9) != 9 ||
		    !profile_row(cells, diameter_m, &r[n])) {
			free(r);
			return bad(d, file, line, "expected 9 numbers");
		}
		n++;
	}
	*rows = r;
	*n_rows = n;
	return OW_OK;
}
