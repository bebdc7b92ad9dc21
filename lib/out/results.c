/* results.c - machine-readable outputs (JSON via cJSON, CSV) and atomic file
 * writing. Units are those the keys name, never display units. */
#include "ow_results.h"
#include "text_impl.h"
#include "ow_io.h"
#include "ow_const.h"
#include "json_num.h"

#include <cjson/cJSON.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static cJSON *section_json(const struct ow_screw *s, int i)
{
	const struct ow_section *sec = &s->sections[i];
	double D = s->diameter_m;
	cJSON *o = cJSON_CreateObject();
	int ok =
	    o && cJSON_AddStringToObject(o, "type", ow_section_name(sec->type));

	ok = ok && ow_json_put_num(o, "start_D", sec->start_m / D);
	ok = ok && ow_json_put_num(o, "end_D", sec->end_m / D);
	if (sec->type == OW_SEC_MIXER) {
		ok = ok &&
		     ow_json_put_num(o, "depth_start_mm", sec->gap_m * 1e3);
		ok = ok && ow_json_put_num(o, "depth_end_mm", sec->gap_m * 1e3);
		ok = ok && ow_json_put_num(o, "lands", sec->lands);
	} else {
		ok = ok && ow_json_put_num(o, "depth_start_mm",
		                           sec->depth_start_m * 1e3);
		ok = ok &&
		     ow_json_put_num(o, "depth_end_mm", sec->depth_m * 1e3);
	}
	if (sec->type == OW_SEC_BARRIER) {
		ok = ok && ow_json_put_num(o, "melt_depth_start_mm",
		                           sec->melt_depth_start_m * 1e3);
		ok = ok && ow_json_put_num(o, "melt_depth_end_mm",
		                           sec->melt_depth_end_m * 1e3);
		ok = ok && ow_json_put_num(o, "melt_share_start",
		                           sec->melt_share_start);
		ok = ok &&
		     ow_json_put_num(o, "melt_share_end", sec->melt_share_end);
	}
	ok =
	    ok &&
	    ow_json_put_num(
	        o, "clearance_mm",
	        ow_screw_clearance(s, 0.5 * (sec->start_m + sec->end_m)) * 1e3);
	if (!ok) {
		cJSON_Delete(o);
		return NULL;
	}
	return o;
}

static int add_sections(cJSON *root, const struct ow_screw *s)
{
	cJSON *arr = cJSON_AddArrayToObject(root, "sections");
	int i;

	for (i = 0; arr && i < s->n_sections; i++) {
		cJSON *o = section_json(s, i);

		if (!o || !cJSON_AddItemToArray(arr, o))
			return 0;
	}
	return arr != NULL;
}

static int add_warnings(cJSON *root, const struct ow_screw *s)
{
	struct ow_warning w[OW_MAX_WARNINGS];
	int n = ow_advise_screw(s, w, OW_MAX_WARNINGS), i;
	cJSON *arr = cJSON_AddArrayToObject(root, "warnings");

	for (i = 0; arr && i < n; i++) {
		cJSON *o = cJSON_CreateObject();

		if (!o || !cJSON_AddItemToArray(arr, o) ||
		    !cJSON_AddStringToObject(o, "code", w[i].code) ||
		    !cJSON_AddStringToObject(o, "text", w[i].text))
			return 0;
	}
	return arr != NULL;
}

/* Mid-point of the last conveying (non-mixer) section. */
static double last_conveying_x(const struct ow_screw *s)
{
	int i = s->n_sections - 1;

	while (i > 0 && s->sections[i].type == OW_SEC_MIXER)
		i--;
	return 0.5 * (s->sections[i].start_m + s->sections[i].end_m);
}

static int add_screw_figures(cJSON *r, const struct ow_screw *s)
{
	double D = s->diameter_m, hf = ow_screw_feed_depth(s);
	double hm = ow_screw_meter_depth(s);
	int ok = 1;

	ok = ok && cJSON_AddStringToObject(r, "screw", s->name);
	ok = ok && ow_json_put_num(r, "diameter_mm", D * 1e3);
	ok = ok && ow_json_put_num(r, "lead_mm", s->lead_m * 1e3);
	ok = ok && ow_json_put_num(r, "flights", s->flights);
	ok = ok && ow_json_put_num(r, "length_D", ow_screw_ld(s));
	ok = ok && ow_json_put_num(r, "helix_angle_deg",
	                           ow_screw_helix(s, D) * 180.0 / OW_PI);
	ok = ok && ow_json_put_num(r, "compression_ratio",
	                           ow_screw_compression_depth(s));
	ok = ok && ow_json_put_num(r, "compression_ratio_area",
	                           ow_screw_compression_area(s));
	ok = ok && ow_json_put_num(r, "feed_depth_mm", hf * 1e3);
	ok = ok && ow_json_put_num(r, "metering_depth_mm", hm * 1e3);
	ok = ok &&
	     ow_json_put_num(r, "channel_width_mm", ow_screw_width(s, D) * 1e3);
	ok = ok && ow_json_put_num(r, "clearance_mm", s->clearance_m * 1e3);
	ok =
	    ok && ow_json_put_num(r, "feed_turn_volume_cm3",
	                          ow_screw_free_area(s, 0.0) * s->lead_m * 1e6);
	ok = ok && ow_json_put_num(r, "metering_turn_volume_cm3",
	                           ow_screw_free_area(s, last_conveying_x(s)) *
	                               s->lead_m * 1e6);
	return ok;
}

enum ow_status ow_results_check_json(const struct ow_study *st, char **out,
                                     struct ow_diag *d)
{
	cJSON *root = cJSON_CreateObject();
	int ok = root != NULL;

	*out = NULL;
	ok = ok && cJSON_AddStringToObject(root, "title", st->title);
	ok = ok && add_screw_figures(root, &st->screw);
	ok = ok && add_sections(root, &st->screw);
	ok = ok && add_warnings(root, &st->screw);
	if (ok)
		*out = cJSON_Print(root);
	cJSON_Delete(root);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	return OW_OK;
}

/* ---- figures of a point ------------------------------------------------ */

#define C_OF_K(k) ((k)-OW_ZERO_C_K)

static double per_D(const struct ow_study *s, double x)
{
	return x / s->screw.diameter_m;
}

static double fig(const struct ow_study *s, const struct ow_point *p, int i)
{
	switch (i) {
	case 0:
		return p->output_kg_s * 3600.0;
	case 1:
		return p->discharge_pressure_Pa * 1e-6;
	case 2:
		return p->max_pressure_Pa * 1e-6;
	case 3:
		return C_OF_K(p->discharge_bulk_K);
	case 4:
		return C_OF_K(p->discharge_peak_K);
	case 5:
		return C_OF_K(p->peak_K);
	case 6:
		return p->unmelt_frac;
	case 7:
		return per_D(s, p->melt_complete_m);
	case 8:
		return p->max_sbr;
	case 9:
		return p->power_W * 1e-3;
	case 10:
		return p->torque_Nm;
	case 11:
		return p->sec_J_kg / 3.6e6;
	case 12:
		return p->barrel_heat_W * 1e-3;
	case 13:
		return p->residence_s;
	case 14:
		return per_D(s, p->melt_start_m);
	case 15:
		return per_D(s, p->max_pressure_at_m);
	case 16:
		return per_D(s, p->peak_at_m);
	case 17:
		return p->energy_residual;
	case 18:
		return p->feed_capacity_kg_s * 3600.0;
	case 19:
		return p->plug_ratio;
	case 20:
		return p->zone_load;
	case 21:
		return p->root_heat_W * 1e-3;
	case 22:
		return p->enthalpy_rise_W * 1e-3;
	case 23:
		return p->flow_work_W * 1e-3;
	default:
		return NAN;
	}
}

static const char *const fig_keys[] = {
    "output_kg_h",
    "discharge_pressure_MPa",
    "max_pressure_MPa",
    "discharge_bulk_temp_C",
    "discharge_peak_temp_C",
    "peak_temp_C",
    "unmelt_fraction",
    "melt_complete_D",
    "max_sbr",
    "power_kW",
    "torque_Nm",
    "sec_kWh_kg",
    "barrel_heat_kW",
    "residence_s",
    "melt_start_D",
    "max_pressure_D",
    "peak_temp_D",
    "energy_residual",
    "feed_capacity_kg_h",
    "plug_ratio",
    "zone_load",
    "root_heat_kW",
    "enthalpy_rise_kW",
    "flow_work_kW",
};

int ow_results_n_figures(void)
{
	return (int)(sizeof fig_keys / sizeof fig_keys[0]);
}

const char *ow_results_figure_key(int i)
{
	return i >= 0 && i < ow_results_n_figures() ? fig_keys[i] : "?";
}

double ow_results_figure(const struct ow_study *s, const struct ow_point *pt,
                         int i)
{
	return fig(s, pt, i);
}

static int add_names(cJSON *o, const char *key, const char **names, int n)
{
	cJSON *arr = cJSON_AddArrayToObject(o, key);
	int i;

	for (i = 0; arr && i < n; i++)
		if (!cJSON_AddItemToArray(arr, cJSON_CreateString(names[i])))
			return 0;
	return arr != NULL;
}

static int add_zones(cJSON *o, const struct ow_study *s,
                     const struct ow_point *pt)
{
	cJSON *arr = cJSON_AddArrayToObject(o, "zones");
	int i, ok = arr != NULL;

	for (i = 0; ok && i < s->line.n_zones; i++) {
		cJSON *z = cJSON_CreateObject();

		ok = z && cJSON_AddItemToArray(arr, z);
		ok = ok && ow_json_put_num(z, "to_D",
		                           per_D(s, s->line.zones[i].to_m));
		ok = ok && ow_json_put_num(z, "set_C", C_OF_K(pt->set_K[i]));
		ok = ok &&
		     ow_json_put_num(z, "heat_kW", pt->zone_heat_W[i] * 1e-3);
		ok = ok && ow_json_put_num(z, "demand_kW",
		                           pt->zone_demand_W[i] * 1e-3);
		ok = ok && ow_json_put_num(z, "heating_kW",
		                           s->line.zones[i].heating_W * 1e-3);
		ok = ok && ow_json_put_num(z, "cooling_kW",
		                           s->line.zones[i].cooling_W * 1e-3);
		ok = ok && ow_json_put_num(z, "control_C",
		                           C_OF_K(pt->zone_control_K[i]));
		ok = ok && cJSON_AddBoolToObject(
		               z, "holds_set",
		               !(pt->zone_floating & (1u << i))) != NULL;
	}
	return ok;
}

/* "zone N cannot hold set-point" for every zone that floats. */
static int add_zone_notes(cJSON *notes, const struct ow_study *s,
                          const struct ow_point *pt)
{
	char t[64];
	int i, ok = notes != NULL;

	for (i = 0; ok && i < s->line.n_zones; i++) {
		if (!(pt->zone_floating & (1u << i)))
			continue;
		snprintf(t, sizeof t, "zone %d cannot hold set-point", i + 1);
		ok = cJSON_AddItemToArray(notes, cJSON_CreateString(t));
	}
	return ok;
}

static int add_margins(cJSON *o, const struct ow_verdict *v)
{
	cJSON *m = cJSON_AddObjectToObject(o, "margins");
	int c, ok = m != NULL;

	for (c = 0; ok && c < OW_CK_LIMITS; c++)
		if (!isnan(v->margin[c]))
			ok = ow_json_put_num(m, ow_check_key((enum ow_check)c),
			                     v->margin[c]);
	return ok;
}

enum ow_status ow_results_point_json(const struct ow_study *s,
                                     const struct ow_point *pt,
                                     const struct ow_verdict *v, char **out,
                                     struct ow_diag *d)
{
	const char *names[OW_CK_COUNT + 8];
	cJSON *root = cJSON_CreateObject();
	int ok = root != NULL, i, n;

	*out = NULL;
	ok = ok && ow_json_put_num(root, "rpm", pt->rpm);
	for (i = 0; ok && i < ow_results_n_figures(); i++)
		ok = ow_json_put_num(root, fig_keys[i], fig(s, pt, i));
	n = ow_classify_names(v, names, OW_CK_COUNT);
	ok = ok && add_names(root, "status", names, n);
	n = ow_solver_flag_names(
	    pt->flags &
	        (OW_FLAG_BACKFLOW | OW_FLAG_NO_MELTING | OW_FLAG_UNHEATED_MELT),
	    names, 8);
	ok = ok && add_names(root, "notes", names, n);
	ok = ok && add_zone_notes(cJSON_GetObjectItem(root, "notes"), s, pt);
	ok = ok && ow_json_put_num(root, "iterations", pt->n_iter);
	ok = ok && add_zones(root, s, pt);
	ok = ok && add_margins(root, v);
	if (ok)
		*out = cJSON_Print(root);
	cJSON_Delete(root);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	return OW_OK;
}

enum ow_status ow_results_profile_csv(const struct ow_study *s,
                                      const struct ow_profile_row *rows, int n,
                                      char **out, struct ow_diag *d)
{
	struct ow_text t = {0};
	int i;

	ow_text_add(&t, "axial_D,pressure_MPa,bulk_temp_C,peak_temp_C,sbr,"
	                "unmelt_fraction,depth_mm,barrel_C,shear_max_1_s\n");
	for (i = 0; i < n; i++) {
		const struct ow_profile_row *r = &rows[i];

		ow_text_num(&t, per_D(s, r->axial_m), 0);
		ow_text_num(&t, r->pressure_Pa * 1e-6, 1);
		ow_text_num(&t, C_OF_K(r->bulk_K), 1);
		ow_text_num(&t, C_OF_K(r->peak_K), 1);
		ow_text_num(&t, r->sbr, 1);
		ow_text_num(&t, r->unmelt_frac, 1);
		ow_text_num(&t, r->depth_m * 1e3, 1);
		ow_text_num(&t, C_OF_K(r->barrel_K), 1);
		ow_text_num(&t, r->shear_max_1_s, 1);
		ow_text_add(&t, "\n");
	}
	return ow_text_done(&t, out, d);
}

/* ---- map outputs --------------------------------------------------------- */

enum ow_status ow_results_grid_csv(const struct ow_study *s,
                                   const struct ow_grid *g, char **out,
                                   struct ow_diag *d)
{
	struct ow_text t = {0};
	int i, f, nf = ow_results_n_figures();

	ow_text_add(&t, "rpm,axis_value,set_C");
	for (f = 0; f < nf; f++) {
		ow_text_add(&t, ",");
		ow_text_add(&t, fig_keys[f]);
	}
	for (f = 0; f < s->line.n_zones; f++) {
		char h[40];

		snprintf(h, sizeof h, ",zone_%d_demand_kW", f + 1);
		ow_text_add(&t, h);
	}
	/* the contract's leading columns stay first and status last */
	ow_text_add(&t, ",barrel_setting_K,status\n");
	for (i = 0; i < g->n_rpm * g->n_axis; i++) {
		const struct ow_grid_point *p = &g->pts[i];

		if (p->solved != 1)
			continue;
		ow_text_num(&t, p->rpm, 0);
		ow_text_num(&t, p->axis, 1);
		ow_text_num(&t, C_OF_K(p->set_ref_K), 1);
		for (f = 0; f < nf; f++)
			ow_text_num(&t, fig(s, &p->pt, f), 1);
		for (f = 0; f < s->line.n_zones; f++)
			ow_text_num(&t, p->pt.zone_demand_W[f] * 1e-3, 1);
		ow_text_num(&t, p->axis, 1); /* barrel_setting_K */
		ow_text_status(&t, &p->v);
		ow_text_add(&t, "\n");
	}
	return ow_text_done(&t, out, d);
}

static const char *axis_mode_name(enum ow_axis_mode m)
{
	return m == OW_AXIS_SET ? "set"
	                        : (m == OW_AXIS_ZONE ? "zone" : "shift");
}

static int add_window_zones(cJSON *o, const struct ow_study *s,
                            const struct ow_window *w)
{
	cJSON *arr = cJSON_AddArrayToObject(o, "zones");
	int z, ok = arr != NULL;

	for (z = 0; ok && z < s->line.n_zones; z++) {
		cJSON *e = cJSON_CreateObject();

		ok = e && cJSON_AddItemToArray(arr, e);
		ok = ok && ow_json_put_num(e, "zone", z + 1);
		ok = ok && ow_json_put_num(e, "to_D",
		                           per_D(s, s->line.zones[z].to_m));
		ok = ok &&
		     ow_json_put_num(e, "set_min_C",
		                     w->empty ? NAN : C_OF_K(w->zone_min_K[z]));
		ok = ok &&
		     ow_json_put_num(e, "set_max_C",
		                     w->empty ? NAN : C_OF_K(w->zone_max_K[z]));
	}
	return ok;
}

static cJSON *polyline_json(const struct ow_study *s,
                            const struct ow_polyline *pl)
{
	cJSON *arr = cJSON_CreateArray();
	int i, ok = arr != NULL;

	for (i = 0; ok && i < pl->n; i++) {
		double v[3] = {
		    pl->p[i].rpm, pl->p[i].axis,
		    C_OF_K(ow_line_axis_ref_K(&s->line, pl->p[i].axis))};
		cJSON *pt = cJSON_CreateDoubleArray(v, 3);

		ok = pt && cJSON_AddItemToArray(arr, pt);
	}
	if (!ok) {
		cJSON_Delete(arr);
		return NULL;
	}
	return arr;
}

static int add_boundaries(cJSON *o, const struct ow_study *s,
                          const struct ow_window *w)
{
	cJSON *arr = cJSON_AddArrayToObject(o, "boundaries");
	int b, l, ok = arr != NULL;

	for (b = 0; ok && b < w->n_boundaries; b++) {
		const struct ow_boundary *bd = &w->bounds[b];
		cJSON *e = cJSON_CreateObject(), *lines;

		ok = e && cJSON_AddItemToArray(arr, e);
		ok = ok && cJSON_AddStringToObject(
		               e, "limit", ow_window_boundary_key(bd->check));
		lines = ok ? cJSON_AddArrayToObject(e, "lines") : NULL;
		ok = lines != NULL;
		for (l = 0; ok && l < bd->n_lines; l++) {
			cJSON *pl = polyline_json(s, &bd->lines[l]);

			ok = pl && cJSON_AddItemToArray(lines, pl);
		}
	}
	return ok;
}

static int add_binding(cJSON *o, const struct ow_window *w)
{
	enum ow_check order[OW_CK_COUNT];
	int n = ow_window_binding(w, order), i, ok;
	cJSON *arr = cJSON_AddArrayToObject(o, "binding");

	ok = arr != NULL;
	for (i = 0; ok && i < n; i++) {
		cJSON *e = cJSON_CreateObject();

		ok = e && cJSON_AddItemToArray(arr, e);
		ok = ok && cJSON_AddStringToObject(e, "limit",
		                                   ow_check_key(order[i]));
		ok = ok && ow_json_put_num(e, "points_excluded",
		                           w->fail_count[order[i]]);
	}
	return ok;
}

/* One bound: its value, what sets it (a check key or "sweep_edge") and in
 * words, and how finely it is located (0 at the sweep's edge). */
static int add_setter(cJSON *o, const char *key, const char *unit,
                      const char *res_unit, double value,
                      const struct ow_window_bound *b)
{
	cJSON *e = cJSON_AddObjectToObject(o, key);
	char why[160], k[32];
	int ok = e != NULL;

	snprintf(k, sizeof k, "value_%s", unit);
	ok = ok && ow_json_put_num(e, k, value);
	ok = ok && cJSON_AddStringToObject(e, "set_by",
	                                   ow_window_setter_key(b->check));
	ok = ok &&
	     cJSON_AddStringToObject(
	         e, "reason", ow_window_setter_text(b->check, why, sizeof why));
	ok = ok && cJSON_AddBoolToObject(e, "is_limit",
	                                 b->check != OW_WINDOW_SWEEP_EDGE);
	snprintf(k, sizeof k, "resolution_%s", res_unit);
	ok = ok && ow_json_put_num(e, k, b->resolution);
	return ok;
}

/* "bounds": what sets each bound; "at_sweep_edge" and its note. */
static int add_setters(cJSON *r, const struct ow_window *w)
{
	cJSON *o;
	int ok;

	if (w->empty)
		return cJSON_AddNullToObject(r, "bounds") &&
		       cJSON_AddBoolToObject(r, "at_sweep_edge", 0);
	o = cJSON_AddObjectToObject(r, "bounds");
	ok = o != NULL;
	ok = ok && add_setter(o, "rpm_min", "rpm", "rpm", w->rpm_min,
	                      &w->bound[OW_WB_RPM_MIN]);
	ok = ok && add_setter(o, "rpm_max", "rpm", "rpm", w->rpm_max,
	                      &w->bound[OW_WB_RPM_MAX]);
	ok = ok && add_setter(o, "set_min_C", "C", "K", C_OF_K(w->set_min_K),
	                      &w->bound[OW_WB_SET_MIN]);
	ok = ok && add_setter(o, "set_max_C", "C", "K", C_OF_K(w->set_max_K),
	                      &w->bound[OW_WB_SET_MAX]);
	ok = ok && ow_json_put_num(o, "rpm_step_rpm", w->rpm_step);
	ok = ok && ow_json_put_num(o, "set_step_K", w->temp_step_K);
	ok = ok && cJSON_AddBoolToObject(r, "at_sweep_edge", w->at_sweep_edge);
	if (ok && w->at_sweep_edge)
		ok = cJSON_AddStringToObject(r, "sweep_edge_note",
		                             OW_WINDOW_SWEEP_EDGE_NOTE) != NULL;
	return ok;
}

static int add_bounds(cJSON *r, const struct ow_window *w)
{
	int e = w->empty, ok = 1;
	cJSON *c;

	ok = ok && ow_json_put_num(r, "rpm_min", e ? NAN : w->rpm_min);
	ok = ok && ow_json_put_num(r, "rpm_max", e ? NAN : w->rpm_max);
	ok = ok &&
	     ow_json_put_num(r, "set_min_C", e ? NAN : C_OF_K(w->set_min_K));
	ok = ok &&
	     ow_json_put_num(r, "set_max_C", e ? NAN : C_OF_K(w->set_max_K));
	ok = ok && ow_json_put_num(r, "axis_min", e ? NAN : w->axis_min);
	ok = ok && ow_json_put_num(r, "axis_max", e ? NAN : w->axis_max);
	ok = ok &&
	     ow_json_put_num(r, "barrel_setting_min_K", e ? NAN : w->axis_min);
	ok = ok &&
	     ow_json_put_num(r, "barrel_setting_max_K", e ? NAN : w->axis_max);
	if (e) {
		ok = ok && cJSON_AddNullToObject(r, "centre");
	} else {
		c = cJSON_AddObjectToObject(r, "centre");
		ok = ok && c && ow_json_put_num(c, "rpm", w->centre.rpm);
		ok = ok && ow_json_put_num(c, "set_C", C_OF_K(w->centre_set_K));
		ok = ok && ow_json_put_num(c, "axis_value", w->centre.axis);
		ok = ok &&
		     ow_json_put_num(c, "barrel_setting_K", w->centre.axis);
		ok = ok && ow_json_put_num(c, "distance_to_edge_fraction",
		                           w->centre_clearance);
	}
	ok = ok && ow_json_put_num(r, "output_kg_h_min",
	                           e ? NAN : w->output_min_kg_s * 3600.0);
	ok = ok && ow_json_put_num(r, "output_kg_h_max",
	                           e ? NAN : w->output_max_kg_s * 3600.0);
	ok = ok && ow_json_put_num(r, "melt_temp_C_min",
	                           e ? NAN : C_OF_K(w->melt_min_K));
	ok = ok && ow_json_put_num(r, "melt_temp_C_max",
	                           e ? NAN : C_OF_K(w->melt_max_K));
	ok = ok && ow_json_put_num(r, "peak_temp_C_max",
	                           e ? NAN : C_OF_K(w->peak_max_K));
	return ok && add_setters(r, w);
}

enum ow_status ow_results_window_json(const struct ow_study *s,
                                      const struct ow_grid *g,
                                      const struct ow_window *w, char **out,
                                      struct ow_diag *d)
{
	cJSON *r = cJSON_CreateObject(), *ax;
	int ok = r != NULL;

	*out = NULL;
	ok = ok && cJSON_AddStringToObject(r, "title", s->title);
	ok = ok && cJSON_AddBoolToObject(r, "empty", w->empty);
	ok = ok && add_bounds(r, w);
	ok = ok && ow_json_put_num(r, "safe_fraction", w->safe_fraction);
	ok = ok && add_window_zones(r, s, w);
	ax = ok ? cJSON_AddObjectToObject(r, "axis") : NULL;
	ok = ax != NULL;
	ok = ok && cJSON_AddStringToObject(ax, "mode",
	                                   axis_mode_name(s->line.axes.mode));
	ok = ok && ow_json_put_num(ax, "reference_zone",
	                           ow_line_reference_zone(&s->line) + 1);
	ok = ok && ow_json_put_num(ax, "from", s->line.axes.axis_from);
	ok = ok && ow_json_put_num(ax, "to", s->line.axes.axis_to);
	ok = ok && ow_json_put_num(ax, "from_K", s->line.axes.axis_from);
	ok = ok && ow_json_put_num(ax, "to_K", s->line.axes.axis_to);
	ok = ok && ow_json_put_num(r, "solves", g->solves);
	ok = ok && ow_json_put_num(r, "grid_points_rpm", g->n_rpm);
	ok = ok && ow_json_put_num(r, "grid_points_barrel", g->n_axis);
	ok = ok && add_binding(r, w);
	ok = ok && add_boundaries(r, s, w);
	if (ok)
		*out = cJSON_Print(r);
	cJSON_Delete(r);
	if (!*out)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	return OW_OK;
}
