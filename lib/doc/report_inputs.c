/* report_inputs.c - the inputs behind the report, each value with its
 * source where the input files gave one: the files and their CRC-32, the
 * screw (sections, wear, derived data, rule-of-thumb warnings), the resin,
 * barrel and feed, die and screen pack, limits and the sweep. */
#include "report_impl.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "ow_advise.h"
#include "ow_const.h"

/* A Quantity | Value | Source table. */
static const struct ow_doc_table qvs = {
    3,
    {"Quantity", "Value", "Source"},
    {0.27, 0.19, 0.54},
    {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT},
    OW_DOC_SMALL_PT,
    0};

struct inputs {
	struct rpt *r;
	unsigned char shown[OW_MAX_SOURCES];
};

/* A row: the value in the reader's units and the source of key. */
static void qty_row(struct inputs *in, const char *what, const char *key,
                    enum ow_dim dim, double si, int sig)
{
	char val[96];
	const char *src = ow_report_source(in->r, key, in->shown);
	const char *cells[3] = {what, val, src ? src : "not given"};

	ow_doc_qty(&in->r->doc, val, sizeof val, dim, si, sig);
	ow_doc_table_row(&in->r->doc, &qvs, cells, 0);
}

static void text_row(struct inputs *in, const char *what, const char *val,
                     const char *key)
{
	const char *src = key ? ow_report_source(in->r, key, in->shown) : NULL;
	const char *cells[3] = {what, val, src ? src : ""};

	ow_doc_table_row(&in->r->doc, &qvs, cells, 0);
}

static void files(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	const struct ow_study *s = r->s;
	char text[3 * OW_PATH_LEN + 200];

	snprintf(text, sizeof text,
	         "Study file: %s. Screw: %s. Resin: %s. "
	         "CRC-32 of the input files, in reading order: %08lX (printed "
	         "in every page's footer; a changed file gives another sum).",
	         s->path, s->screw_path[0] ? s->screw_path : "in the study",
	         s->resin_path[0] ? s->resin_path : "in the study",
	         s->input_crc);
	st.size_pt = OW_DOC_SMALL_PT;
	ow_doc_para(&r->doc, text, &st, 4.0);
}

/* ---- screw ----------------------------------------------------------------
 */

static void screw_main(struct inputs *in)
{
	const struct ow_screw *sc = &in->r->s->screw;
	char n[16], head[200];

	snprintf(head, sizeof head, "Screw: %s", sc->name);
	ow_doc_subheading(&in->r->doc, head, 60.0);
	ow_doc_table_head(&in->r->doc, &qvs);
	qty_row(in, "Barrel bore (diameter)", "screw.diameter", OW_DIM_LENGTH,
	        sc->diameter_m, 4);
	qty_row(in, "Lead", "screw.lead", OW_DIM_LENGTH, sc->lead_m, 4);
	snprintf(n, sizeof n, "%d", sc->flights);
	text_row(in, "Flights", n, "screw.flights");
	qty_row(in, "Flight land width", "screw.flight_width", OW_DIM_LENGTH,
	        sc->flight_width_m, 4);
	qty_row(in, "Radial flight clearance (new)", "screw.clearance",
	        OW_DIM_LENGTH, sc->clearance_m, 3);
	ow_doc_table_end(&in->r->doc);
}

/* Extra words of a mixer or barrier section. */
static void section_note(struct rpt *r, const struct ow_section *x, char *buf,
                         size_t n)
{
	char a[48], b[48], c[48], e[48];

	buf[0] = '\0';
	if (x->type == OW_SEC_MIXER) {
		ow_doc_qty(&r->doc, a, sizeof a, OW_DIM_LENGTH, x->gap_m, 3);
		snprintf(buf, n, "gap over the lands %s, %d lands", a,
		         x->lands);
	} else if (x->type == OW_SEC_BARRIER) {
		ow_doc_qty(&r->doc, a, sizeof a, OW_DIM_LENGTH,
		           x->melt_depth_start_m, 3);
		ow_doc_qty(&r->doc, b, sizeof b, OW_DIM_LENGTH,
		           x->melt_depth_end_m, 3);
		ow_doc_qty(&r->doc, c, sizeof c, OW_DIM_LENGTH,
		           x->barrier_clearance_m, 3);
		snprintf(e, sizeof e, "%.0f–%.0f %%",
		         100.0 * x->melt_share_start,
		         100.0 * x->melt_share_end);
		snprintf(buf, n,
		         "melt channel %s to %s deep, %s of the width; "
		         "barrier clearance %s",
		         a, b, e, c);
	}
}

static void sections(struct inputs *in)
{
	struct ow_doc_table t = {7,
	                         {"#", "Type", "From (D)", "To (D)",
	                          "Depth at start", "Depth at end", "Notes"},
	                         {0.05, 0.12, 0.10, 0.10, 0.14, 0.14, 0.35},
	                         {OW_ALIGN_RIGHT, OW_ALIGN_LEFT, OW_ALIGN_RIGHT,
	                          OW_ALIGN_RIGHT, OW_ALIGN_RIGHT,
	                          OW_ALIGN_RIGHT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         0};
	struct rpt *r = in->r;
	const struct ow_screw *sc = &r->s->screw;
	char k[16], a[32], b[32], c[48], e[48], note[320];
	int i;

	ow_doc_table_head(&r->doc, &t);
	for (i = 0; i < sc->n_sections; i++) {
		const struct ow_section *x = &sc->sections[i];
		int mixer = x->type == OW_SEC_MIXER;
		const char *cells[7] = {
		    k,   ow_section_name(x->type), a,
		    b,   mixer ? "" : c,           mixer ? "" : e,
		    note};

		snprintf(k, sizeof k, "%d", i + 1);
		ow_doc_num(a, sizeof a, x->start_m / sc->diameter_m, 4);
		ow_doc_num(b, sizeof b, x->end_m / sc->diameter_m, 4);
		ow_doc_qty(&r->doc, c, sizeof c, OW_DIM_LENGTH,
		           x->type == OW_SEC_BARRIER ? x->solids_depth_start_m
		                                     : x->depth_start_m,
		           4);
		ow_doc_qty(&r->doc, e, sizeof e, OW_DIM_LENGTH,
		           x->type == OW_SEC_BARRIER ? x->solids_depth_end_m
		                                     : x->depth_m,
		           4);
		section_note(r, x, note, sizeof note);
		ow_doc_table_row(&r->doc, &t, cells, 0);
	}
	ow_doc_table_end(&r->doc);
}

static void wear(struct inputs *in)
{
	struct ow_doc_table t = {
	    3,
	    {"Worn from (D)", "To (D)", "Radial clearance there"},
	    {0.2, 0.2, 0.6},
	    {OW_ALIGN_RIGHT, OW_ALIGN_RIGHT, OW_ALIGN_LEFT},
	    OW_DOC_SMALL_PT,
	    0};
	const struct ow_screw *sc = &in->r->s->screw;
	char a[32], b[32], c[48];
	int i;

	if (!sc->n_wear)
		return;
	ow_doc_table_head(&in->r->doc, &t);
	for (i = 0; i < sc->n_wear; i++) {
		const char *cells[3] = {a, b, c};

		ow_doc_num(a, sizeof a, sc->wear[i].from_m / sc->diameter_m, 4);
		ow_doc_num(b, sizeof b, sc->wear[i].to_m / sc->diameter_m, 4);
		ow_doc_qty(&in->r->doc, c, sizeof c, OW_DIM_LENGTH,
		           sc->wear[i].clearance_m, 3);
		ow_doc_table_row(&in->r->doc, &t, cells, 0);
	}
	ow_doc_table_end(&in->r->doc);
}

/* A Quantity | Value table for derived data. */
static const struct ow_doc_table two = {2,
                                        {"Quantity", "Value"},
                                        {0.46, 0.54},
                                        {OW_ALIGN_LEFT, OW_ALIGN_LEFT},
                                        OW_DOC_SMALL_PT,
                                        0};

static void two_row(struct rpt *r, const char *what, const char *val)
{
	const char *cells[2] = {what, val};

	ow_doc_table_row(&r->doc, &two, cells, 0);
}

static void derived(struct inputs *in)
{
	struct rpt *r = in->r;
	const struct ow_screw *sc = &r->s->screw;
	struct ow_warning warn[OW_MAX_WARNINGS];
	struct ow_doc_style st = ow_doc_body();
	char v[96], len[48], ld[24];
	int n, k;

	ow_doc_subheading(&r->doc, "Derived screw data", 60.0);
	ow_doc_table_head(&r->doc, &two);
	ow_doc_qty(&r->doc, len, sizeof len, OW_DIM_LENGTH, ow_screw_length(sc),
	           4);
	snprintf(v, sizeof v, "%s (L/D %s)", len,
	         ow_doc_num(ld, sizeof ld, ow_screw_ld(sc), 4));
	two_row(r, "Length", v);
	ow_doc_num(v, sizeof v,
	           ow_screw_helix(sc, sc->diameter_m) * 180.0 / OW_PI, 4);
	strcat(v, "°");
	two_row(r, "Helix angle at the bore", v);
	two_row(r, "Channel width at the bore",
	        ow_doc_qty(&r->doc, v, sizeof v, OW_DIM_LENGTH,
	                   ow_screw_width(sc, sc->diameter_m), 4));
	two_row(r, "Compression ratio (depths)",
	        ow_doc_num(v, sizeof v, ow_screw_compression_depth(sc), 3));
	two_row(r, "Compression ratio (cross-sections)",
	        ow_doc_num(v, sizeof v, ow_screw_compression_area(sc), 3));
	ow_doc_table_end(&r->doc);
	n = ow_advise_screw(sc, warn, OW_MAX_WARNINGS);
	st.size_pt = OW_DOC_SMALL_PT;
	ow_doc_para(
	    &r->doc,
	    n ? "Rule-of-thumb warnings (common practice, not "
	        "published limits):"
	      : "No rule-of-thumb warnings about "
	        "this screw (common practice checks of compression, feed "
	        "depth and clearance).",
	    &st, 2.0);
	for (k = 0; k < n; k++)
		ow_doc_bullet(&r->doc, warn[k].text, &st);
}

/* ---- resin ----------------------------------------------------------------
 */

static const char *model_name(enum ow_visc_model m)
{
	return m == OW_VISC_POWER_LAW ? "power law"
	       : m == OW_VISC_CROSS   ? "Cross"
	                              : "Carreau-Yasuda";
}

static void viscosity(struct inputs *in)
{
	const struct ow_viscosity *v = &in->r->s->resin.visc;
	char key[64];

	text_row(in, "Viscosity model", model_name(v->model), NULL);
	if (v->model == OW_VISC_POWER_LAW)
		qty_row(in, "Consistency", "resin.viscosity.consistency",
		        OW_DIM_CONSISTENCY, v->consistency_Pa_sn, 4);
	else
		qty_row(in, "Zero-shear viscosity",
		        "resin.viscosity.zero_shear", OW_DIM_VISCOSITY,
		        v->zero_shear_Pa_s, 4);
	if (v->model == OW_VISC_CROSS)
		qty_row(in, "Critical shear stress",
		        "resin.viscosity.critical_stress", OW_DIM_PRESSURE,
		        v->critical_stress_Pa, 4);
	if (v->model == OW_VISC_CARREAU_YASUDA)
		qty_row(in, "Time constant", "resin.viscosity.time_constant",
		        OW_DIM_TIME, v->time_constant_s, 4);
	qty_row(in, "Power-law index", "resin.viscosity.index", OW_DIM_NONE,
	        v->index, 4);
	if (v->model == OW_VISC_CARREAU_YASUDA)
		qty_row(in, "Yasuda parameter a", "resin.viscosity.a",
		        OW_DIM_NONE, v->a, 4);
	qty_row(in, "Reference temperature",
	        "resin.viscosity.reference_temperature", OW_DIM_TEMPERATURE,
	        v->ref_temp_K, 4);
	snprintf(key, sizeof key, "resin.viscosity.shift.%s",
	         v->shift == OW_SHIFT_ARRHENIUS ? "activation_energy" : "c1");
	if (v->shift == OW_SHIFT_ARRHENIUS) {
		qty_row(in, "Shift: Arrhenius flow activation energy", key,
		        OW_DIM_MOLAR_ENERGY, v->activation_J_mol, 4);
		return;
	}
	qty_row(in, "Shift: WLF C1", key, OW_DIM_NONE, v->wlf_c1, 4);
	qty_row(in, "Shift: WLF C2", "resin.viscosity.shift.c2",
	        OW_DIM_TEMP_DIFF, v->wlf_c2_K, 4);
}

/* Heat of fusion in kJ/kg or BTU/lb (the display unit of specific energy,
 * kWh/kg or hp h/lb, suits drive energy, not latent heat). 1 BTU (IT) =
 * 1055.05585262 J, 1 lb = 0.45359237 kg: NIST SP 811 (2008) App. B. */
static void fusion_row(struct inputs *in, double J_kg)
{
	const char *src =
	    ow_report_source(in->r, "resin.heat_of_fusion", in->shown);
	int us = in->r->doc.sys == OW_SYS_US;
	char val[64];
	const char *cells[3] = {"Heat of fusion", val, src ? src : "not given"};

	ow_doc_num(val, sizeof val,
	           us ? J_kg * 0.45359237 / 1055.05585262 : J_kg * 1e-3, 3);
	strcat(val, us ? " BTU/lb" : " kJ/kg");
	ow_doc_table_row(&in->r->doc, &qvs, cells, 0);
}

static void resin(struct inputs *in)
{
	const struct ow_material *m = &in->r->s->resin;

	char head[200];

	snprintf(head, sizeof head, "Resin: %s", m->name);
	ow_doc_subheading(&in->r->doc, head, 60.0);
	ow_doc_table_head(&in->r->doc, &qvs);
	qty_row(in, "Solid density", "resin.solid_density", OW_DIM_DENSITY,
	        m->solid_density_kg_m3, 4);
	qty_row(in, "Bulk density (hopper)", "resin.bulk_density",
	        OW_DIM_DENSITY, m->bulk_density_kg_m3, 4);
	qty_row(in, "Melt density", "resin.melt_density", OW_DIM_DENSITY,
	        m->melt_density_kg_m3, 4);
	qty_row(in, "Heat capacity, solid", "resin.solid_heat_capacity",
	        OW_DIM_SPECIFIC_HEAT, m->solid_cp_J_kgK, 3);
	qty_row(in, "Heat capacity, melt", "resin.melt_heat_capacity",
	        OW_DIM_SPECIFIC_HEAT, m->melt_cp_J_kgK, 3);
	qty_row(in, "Thermal conductivity, solid", "resin.solid_conductivity",
	        OW_DIM_CONDUCTIVITY, m->solid_k_W_mK, 3);
	qty_row(in, "Thermal conductivity, melt", "resin.melt_conductivity",
	        OW_DIM_CONDUCTIVITY, m->melt_k_W_mK, 3);
	qty_row(in, "Melting point", "resin.melting_point", OW_DIM_TEMPERATURE,
	        m->melt_temp_K, 4);
	fusion_row(in, m->fusion_J_kg);
	qty_row(in, "Friction on the barrel", "resin.friction_barrel",
	        OW_DIM_NONE, m->friction_barrel, 3);
	qty_row(in, "Friction on the screw", "resin.friction_screw",
	        OW_DIM_NONE, m->friction_screw, 3);
	viscosity(in);
	ow_doc_table_end(&in->r->doc);
}

/* ---- the line -------------------------------------------------------------
 */

/* A zone's control value, "unlimited" when not set, "(typical)" when
 * the file left it to the default. */
static void zone_value(struct rpt *r, char *buf, size_t n, enum ow_dim dim,
                       double v, unsigned defaulted)
{
	size_t len;

	if (!isfinite(v)) {
		snprintf(buf, n, "unlimited");
		return;
	}
	ow_doc_qty(&r->doc, buf, n, dim, v, 3);
	len = strlen(buf);
	if (defaulted && len < n)
		snprintf(buf + len, n - len, " (typical)");
}

static void barrel(struct inputs *in)
{
	struct ow_doc_table t = {5,
	                         {"Barrel zone", "Set-point in the study",
	                          "Heating power", "Cooling power",
	                          "Control point to bore"},
	                         {0.24, 0.19, 0.19, 0.19, 0.19},
	                         {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT,
	                          OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         0};
	struct rpt *r = in->r;
	const struct ow_line *l = &r->s->line;
	char zn[48], v[48], hp[64], cp[64], hw[64];
	int z;

	ow_doc_subheading(&r->doc, "Barrel and feed", 60.0);
	ow_doc_table_head(&r->doc, &t);
	for (z = 0; z < l->n_zones; z++) {
		const struct ow_zone *zo = &l->zones[z];
		const char *cells[5] = {zn, v, hp, cp, hw};

		ow_report_zone_name(r, z, zn, sizeof zn);
		zn[0] = 'Z';
		ow_doc_qty(&r->doc, v, sizeof v, OW_DIM_TEMPERATURE, zo->set_K,
		           4);
		zone_value(r, hp, sizeof hp, OW_DIM_POWER, zo->heating_W,
		           zo->defaulted & OW_ZONE_DEF_HEATING);
		zone_value(r, cp, sizeof cp, OW_DIM_POWER, zo->cooling_W,
		           zo->defaulted & OW_ZONE_DEF_COOLING);
		zone_value(r, hw, sizeof hw, OW_DIM_HEAT_TRANSFER,
		           zo->wall_h_W_m2K * l->heat_transfer_factor,
		           zo->defaulted & OW_ZONE_DEF_WALL);
		ow_doc_table_row(&r->doc, &t, cells, 0);
	}
	ow_doc_table_end(&r->doc);
	ow_doc_table_head(&r->doc, &qvs);
	qty_row(in, "Feed temperature", "feed.temperature", OW_DIM_TEMPERATURE,
	        l->feed_temp_K, 4);
	if (l->root_adiabatic)
		text_row(in, "Screw root",
		         "adiabatic (no heat through the "
		         "root)",
		         NULL);
	else
		qty_row(in, "Screw root temperature", "barrel.screw_root",
		        OW_DIM_TEMPERATURE, l->root_temp_K, 4);
	ow_doc_table_end(&r->doc);
}

static void die(struct inputs *in)
{
	static const char *names[] = {"circular", "slit", "annular",
	                              "measured operating point"};
	const struct ow_die *d = &in->r->s->line.die;
	const struct ow_die_field *f = ow_die_fields();
	char key[48];
	int i;

	ow_doc_subheading(&in->r->doc, "Die and screen pack", 60.0);
	ow_doc_table_head(&in->r->doc, &qvs);
	text_row(in, "Die", names[d->type], NULL);
	for (i = 0; i < OW_DIE_FIELDS; i++)
		if (ow_die_has(d->type, &f[i])) {
			snprintf(key, sizeof key, "die.%s", f[i].key);
			qty_row(in, f[i].label, key, f[i].dim,
			        ow_die_value(d, &f[i]), f[i].digits);
		}
	qty_row(in, "Screen pack and adapter pressure drop",
	        "screen_pack.pressure_drop", OW_DIM_PRESSURE,
	        in->r->s->line.screen_pressure_Pa, 4);
	ow_doc_table_end(&in->r->doc);
}

static void limits(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	char text[200];
	int c;

	ow_doc_subheading(&r->doc, "Limits", 40.0);
	st.size_pt = OW_DOC_SMALL_PT;
	for (c = 0; c < OW_CK_COUNT; c++)
		if (ow_check_active(&r->s->line.limits, (enum ow_check)c))
			ow_doc_bullet(&r->doc,
			              ow_report_limit_text(r, (enum ow_check)c,
			                                   text, sizeof text),
			              &st);
}

static void sweep(struct rpt *r)
{
	static const char *modes[] = {"shift of every heated zone",
	                              "common set-point of zones",
	                              "set-point of one zone"};
	const struct ow_axes *a = &r->s->line.axes;
	enum ow_dim dim =
	    a->mode == OW_AXIS_SHIFT ? OW_DIM_TEMP_DIFF : OW_DIM_TEMPERATURE;
	struct ow_doc_style st = ow_doc_body();
	char lo[48], hi[48], r0[32], r1[32], fine[120], text[700];

	ow_doc_subheading(&r->doc, "Sweep", 40.0);
	ow_doc_qty(&r->doc, lo, sizeof lo, dim, a->axis_from, 4);
	ow_doc_qty(&r->doc, hi, sizeof hi, dim, a->axis_to, 4);
	ow_doc_exact(r0, sizeof r0, a->rpm_from);
	ow_doc_exact(r1, sizeof r1, a->rpm_to);
	if (r->g->stride > 1)
		snprintf(fine, sizeof fine,
		         ", refined %d times finer where "
		         "a limit's boundary crosses a cell",
		         r->g->stride);
	else
		fine[0] = '\0';
	snprintf(text, sizeof text,
	         "Screw speed %s to %s rpm; barrel axis: "
	         "%s, %s to %s. Lattice of %d speeds × %d set-points%s; %d "
	         "points were solved, the others lie in cells whose corners "
	         "all gave the same verdict.",
	         r0, r1, modes[a->mode], lo, hi, r->g->n_rpm, r->g->n_axis,
	         fine, r->g->solves);
	st.size_pt = OW_DOC_SMALL_PT;
	ow_doc_para(&r->doc, text, &st, 4.0);
}

/* Every source not yet shown beside its value. */
static void other_sources(struct inputs *in)
{
	struct ow_doc_table t = {3,
	                         {"Input", "As written", "Source"},
	                         {0.27, 0.19, 0.54},
	                         {OW_ALIGN_LEFT, OW_ALIGN_LEFT, OW_ALIGN_LEFT},
	                         OW_DOC_SMALL_PT,
	                         0};
	const struct ow_study *s = in->r->s;
	int k, head = 0;

	for (k = 0; k < s->n_sources; k++) {
		const char *cells[3] = {s->sources[k].key, s->sources[k].value,
		                        s->sources[k].text};

		if (in->shown[k])
			continue;
		if (!head++) {
			ow_doc_subheading(&in->r->doc,
			                  "Other inputs with a source", 40.0);
			ow_doc_table_head(&in->r->doc, &t);
		}
		ow_doc_table_row(&in->r->doc, &t, cells, 0);
	}
	if (head)
		ow_doc_table_end(&in->r->doc);
}

void ow_report_inputs(struct rpt *r)
{
	struct inputs in;

	memset(&in, 0, sizeof in);
	in.r = r;
	ow_doc_new_page(&r->doc);
	ow_doc_heading(&r->doc, "Inputs", 80.0);
	files(r);
	screw_main(&in);
	sections(&in);
	wear(&in);
	derived(&in);
	resin(&in);
	barrel(&in);
	die(&in);
	limits(r);
	sweep(r);
	other_sources(&in);
	ow_doc_check(&r->doc);
}
