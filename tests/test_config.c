/* test_config.c - study, screw and resin files: good files load with the
 * expected SI values, every case of the bad-input corpus is rejected with
 * a message naming its file, JSON path and reason. Run from the
 * repository root (paths are relative to it). */
#include "testutil.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "ow_advise.h"
#include "ow_config.h"
#include "ow_io.h"

#define DATA "tests/data/"
#define BAD  "tests/bad/"

/* Exact factors of NIST Special Publication 811 (2008), appendix B. */
#define IN_M   0.0254
#define LB_KG  0.45359237
#define PSI_PA (LB_KG * 9.80665 / (IN_M * IN_M))

struct fixture {
	struct ow_units *u;
	struct ow_study *a, *b;
	struct ow_diag d;
};

static int setup(void **state)
{
	struct fixture *f = calloc(1, sizeof *f);

	if (!f || ow_units_create(&f->u, &f->d) != OW_OK)
		return -1;
	f->a = malloc(sizeof *f->a);
	f->b = malloc(sizeof *f->b);
	*state = f;
	return f->a && f->b ? 0 : -1;
}

static int teardown(void **state)
{
	struct fixture *f = *state;

	ow_units_destroy(f->u);
	free(f->a);
	free(f->b);
	free(f);
	return 0;
}

/* Load path into s, failing the test with the message when rejected. */
static void load_ok(struct fixture *f, const char *path, struct ow_study *s)
{
	enum ow_status st;

	ow_diag_clear(&f->d);
	st = ow_config_load_study(f->u, path, s, &f->d);
	if (st != OW_OK)
		fail_msg("%s rejected: %s", path, f->d.msg);
}

/* Load path expecting OW_EINPUT; the message stays in f->d. */
static void load_bad(struct fixture *f, const char *path)
{
	ow_diag_clear(&f->d);
	assert_int_equal(ow_config_load_study(f->u, path, f->a, &f->d),
	                 OW_EINPUT);
	assert_true(f->d.msg[0] != '\0');
}

static void message_has(const struct fixture *f, const char *text)
{
	if (!strstr(f->d.msg, text))
		fail_msg("message \"%s\" lacks \"%s\"", f->d.msg, text);
}

static const struct ow_source *source(const struct ow_study *s, const char *key)
{
	int i;

	for (i = 0; i < s->n_sources; i++)
		if (!strcmp(s->sources[i].key, key))
			return &s->sources[i];
	return NULL;
}

/* ---- good files ----------------------------------------------------- */

static void full_study_loads_screw_in_si(void **state)
{
	struct fixture *f = *state;
	const struct ow_screw *s = &f->a->screw;

	load_ok(f, DATA "study-full.json", f->a);
	assert_string_equal(f->a->title,
	                    "Full study: 63.5 mm screw, HDPE, annular die");
	assert_string_equal(f->a->screw_path, DATA "parts/screw-sf63.json");
	assert_string_equal(f->a->resin_path, DATA "parts/resin-hdpe.json");
	assert_rel(s->diameter_m, 0.0635, 1e-12);
	assert_rel(s->lead_m, 0.0635, 1e-12);          /* "1 D" */
	assert_rel(s->flight_width_m, 0.00635, 1e-12); /* "0.1 D" */
	assert_rel(s->clearance_m, 0.08e-3, 1e-12);
	assert_int_equal(s->flights, 1);
	assert_int_equal(s->n_sections, 4);
	assert_int_equal(s->sections[1].type, OW_SEC_TAPER);
	assert_int_equal(s->sections[3].type, OW_SEC_MIXER);
	assert_rel(s->sections[0].length_m, 6 * 0.0635, 1e-12);
	assert_rel(s->sections[0].depth_m, 9.5e-3, 1e-12);
	assert_rel(s->sections[2].depth_m, 3.2e-3, 1e-12);
	assert_rel(s->sections[3].gap_m, 1.0e-3, 1e-12);
	assert_int_equal(s->sections[3].lands, 6);
	/* prepared: sections laid end to end, 30 D in all */
	assert_rel(s->sections[2].start_m, 14 * 0.0635, 1e-12);
	assert_rel(ow_screw_length(s), 30 * 0.0635, 1e-12);
	assert_int_equal(s->n_wear, 1);
	assert_rel(s->wear[0].from_m, 12 * 0.0635, 1e-12);
	assert_rel(s->wear[0].to_m, 24 * 0.0635, 1e-12);
	assert_rel(s->wear[0].clearance_m, 0.5e-3, 1e-12);
}

/* A mixer without its lands takes one barrier land per 25 mm of barrel
 * circumference (common practice: 8 on 63.5 mm) and check says so. */
static void mixer_without_lands_takes_the_stated_default(void **state)
{
	struct fixture *f = *state;
	struct ow_warning w[OW_MAX_WARNINGS];
	const struct ow_section *mx;
	int n, k, found = 0;

	load_ok(f, DATA "study-full.json", f->a);
	mx = &f->a->screw.sections[3];
	assert_int_equal(mx->type, OW_SEC_MIXER);
	assert_int_equal(mx->lands, 6);
	assert_true(mx->lands_given);
	f->a->screw.sections[3].lands = 0;
	assert_int_equal(ow_screw_prepare(&f->a->screw, NULL), OW_OK);
	assert_int_equal(mx->lands, 8);
	assert_false(mx->lands_given);
	assert_int_equal(ow_screw_default_lands(0.1143), 14); /* 4.5 in */
	n = ow_advise_screw(&f->a->screw, w, OW_MAX_WARNINGS);
	for (k = 0; k < n; k++)
		found |= !strcmp(w[k].code, "mixer_lands");
	assert_true(found);
}

static void full_study_loads_resin_in_si(void **state)
{
	struct fixture *f = *state;
	const struct ow_material *m = &f->a->resin;

	load_ok(f, DATA "study-full.json", f->a);
	assert_string_equal(m->name, "pipe-grade HDPE (test data)");
	assert_rel(m->solid_density_kg_m3, 950.0, 1e-12);
	assert_rel(m->bulk_density_kg_m3, 560.0, 1e-12);
	assert_rel(m->melt_density_kg_m3, 760.0, 1e-12);
	assert_rel(m->solid_cp_J_kgK, 2300.0, 1e-12);
	assert_rel(m->melt_cp_J_kgK, 2600.0, 1e-12);
	assert_rel(m->solid_k_W_mK, 0.35, 1e-12);
	assert_rel(m->melt_k_W_mK, 0.25, 1e-12);
	assert_rel(m->melt_temp_K, 403.15, 1e-12);
	assert_rel(m->fusion_J_kg, 2.0e5, 1e-12);
	assert_rel(m->friction_barrel, 0.45, 1e-12);
	assert_rel(m->friction_screw, 0.25, 1e-12);
	assert_int_equal(m->visc.model, OW_VISC_CARREAU_YASUDA);
	assert_rel(m->visc.zero_shear_Pa_s, 9000.0, 1e-12);
	assert_rel(m->visc.time_constant_s, 0.8, 1e-12);
	assert_rel(m->visc.index, 0.4, 1e-12);
	assert_rel(m->visc.a, 0.7, 1e-12);
	assert_rel(m->visc.ref_temp_K, 463.15, 1e-12);
	assert_int_equal(m->visc.shift, OW_SHIFT_ARRHENIUS);
	assert_rel(m->visc.activation_J_mol, 28000.0, 1e-12);
}

static void full_study_loads_line_in_si(void **state)
{
	struct fixture *f = *state;
	const struct ow_line *l = &f->a->line;

	load_ok(f, DATA "study-full.json", f->a);
	assert_rel(l->feed_temp_K, 303.15, 1e-12);
	assert_rel(l->numerics.feed_pressure_Pa, 2.0e4, 1e-12);
	assert_int_equal(l->n_zones, 3);
	assert_rel(l->zones[0].to_m, 6 * 0.0635, 1e-12); /* "6 D" */
	assert_rel(l->zones[2].to_m, 30 * 0.0635, 1e-12);
	assert_rel(l->zones[1].set_K, 463.15, 1e-12);
	assert_int_equal(l->root_adiabatic, 0);
	assert_rel(l->root_temp_K, 353.15, 1e-12);
	assert_int_equal(l->die.type, OW_DIE_ANNULUS);
	assert_rel(l->die.outer_diameter_m, 0.060, 1e-12);
	assert_rel(l->die.inner_diameter_m, 0.052, 1e-12);
	assert_rel(l->die.length_m, 0.090, 1e-12);
	assert_rel(l->screen_pressure_Pa, 1.5e6, 1e-12);
	/* zone control: as written, or the stated defaults for a 63.5 mm
	 * bore (50 kW/m2 of bore heating, 40 % of it cooling, 2000
	 * W/(m2 K)) */
	assert_rel(l->zones[1].heating_W, 4e3, 1e-12);
	assert_rel(l->zones[1].cooling_W, 1.2e3, 1e-12);
	assert_rel(l->zones[1].wall_h_W_m2K, 1500.0, 1e-12);
	assert_int_equal(l->zones[1].defaulted, 0);
	assert_rel(l->zones[0].heating_W, 50e3 * OW_PI * 0.0635 * 6 * 0.0635,
	           1e-12);
	assert_rel(l->zones[0].cooling_W, 0.4 * l->zones[0].heating_W, 1e-12);
	assert_rel(l->zones[2].wall_h_W_m2K, 2000.0, 1e-12);
	assert_int_equal(l->zones[2].defaulted, OW_ZONE_DEF_HEATING |
	                                            OW_ZONE_DEF_COOLING |
	                                            OW_ZONE_DEF_WALL);
	assert_rel(l->heat_transfer_factor, 1.25, 1e-12);
}

static void full_study_loads_limits_sweep_and_numerics(void **state)
{
	struct fixture *f = *state;
	const struct ow_line *l = &f->a->line;

	load_ok(f, DATA "study-full.json", f->a);
	assert_rel(l->limits.peak_temp_K, 513.15, 1e-12);
	assert_rel(l->limits.unmelt_frac, 0.005, 1e-12); /* "0.5 %" */
	assert_rel(l->limits.pressure_Pa, 35e6, 1e-12);
	assert_rel(l->limits.power_W, 40e3, 1e-12);
	assert_rel(l->limits.torque_Nm, 5e3, 1e-12);
	assert_rel(l->limits.min_melt_temp_K, 453.15, 1e-12);
	assert_rel(l->limits.min_output_kg_s, 20.0 / 3600.0, 1e-12);
	assert_rel(l->limits.max_output_kg_s, 150.0 / 3600.0, 1e-12);
	assert_rel(l->limits.max_sbr, 0.9, 1e-12);
	assert_rel(l->limits.zone_load, 0.9, 1e-12); /* "90 %" */
	assert_rel(l->axes.rpm_from, 20.0, 1e-12);   /* rev/min inside */
	assert_rel(l->axes.rpm_to, 120.0, 1e-12);
	assert_int_equal(l->axes.rpm_steps, 41);
	assert_int_equal(l->axes.mode, OW_AXIS_SET);
	assert_rel(l->axes.axis_from, 453.15, 1e-12);
	assert_rel(l->axes.axis_to, 503.15, 1e-12);
	assert_int_equal(l->axes.axis_steps, 26);
	assert_int_equal(l->axes.zones_from, 1); /* file counts from 1 */
	assert_int_equal(l->numerics.stations_per_turn, 24);
	assert_int_equal(l->numerics.depth_nodes, 31);
}

static void value_source_objects_record_their_sources(void **state)
{
	struct fixture *f = *state;
	const struct ow_source *s;

	load_ok(f, DATA "study-full.json", f->a);
	assert_int_equal(f->a->n_sources, 8);
	s = source(f->a, "screw.diameter");
	assert_non_null(s);
	assert_string_equal(s->value, "63.5 mm");
	assert_string_equal(s->text, "common practice: the 2.5 in screw size");
	s = source(f->a, "screw.sections[2].depth");
	assert_non_null(s);
	assert_string_equal(s->value, "3.2 mm");
	s = source(f->a, "resin.melt_density");
	assert_non_null(s);
	assert_string_equal(s->value, "760 kg/m3");
	assert_string_equal(s->text, "from memory");
	s = source(f->a, "resin.friction_screw"); /* a bare number value */
	assert_non_null(s);
	assert_string_equal(s->value, "0.25");
	s = source(f->a, "barrel.zones[2].set"); /* in the study itself */
	assert_non_null(s);
	assert_string_equal(s->value, "200 degC");
	assert_string_equal(s->text, "invented test value");
	s = source(f->a, "barrel.zones[1].cooling_power");
	assert_non_null(s);
	assert_string_equal(s->value, "1.2 kW");
}

static void absent_optional_parts_take_their_defaults(void **state)
{
	struct fixture *f = *state;
	const struct ow_line *l;
	struct ow_line def;

	load_ok(f, DATA "sub/study-relative.json", f->a);
	l = &f->a->line;
	ow_line_default(&def);
	assert_rel(l->feed_temp_K, 298.15, 1e-12);            /* 25 degC */
	assert_rel(l->numerics.feed_pressure_Pa, 1e4, 1e-12); /* 0.01 MPa */
	assert_int_equal(l->root_adiabatic, 1);
	assert_rel(l->screen_pressure_Pa, 0.0, 0.0);
	assert_true(isnan(l->limits.peak_temp_K));
	assert_true(isnan(l->limits.max_sbr));
	assert_rel(l->limits.zone_load, 1.0, 0.0); /* zones must hold */
	assert_rel(l->heat_transfer_factor, 1.0, 0.0);
	assert_int_equal(l->axes.rpm_steps, 0); /* no sweep */
	assert_int_equal(l->numerics.stations_per_turn,
	                 def.numerics.stations_per_turn);
	assert_int_equal(l->numerics.depth_nodes, def.numerics.depth_nodes);
	assert_int_equal(f->a->n_sources, 6); /* all from the part files */
}

static void relative_paths_resolve_from_the_referencing_folder(void **state)
{
	struct fixture *f = *state;

	load_ok(f, DATA "sub/study-relative.json", f->a);
	assert_string_equal(f->a->screw_path,
	                    DATA "sub/../parts/screw-sf63.json");
	assert_string_equal(f->a->resin_path,
	                    DATA "sub/../parts/resin-hdpe.json");
	load_ok(f, DATA "study-full.json", f->b);
	assert_memory_equal(&f->a->screw, &f->b->screw, sizeof f->a->screw);
	assert_memory_equal(&f->a->resin, &f->b->resin, sizeof f->a->resin);
}

static void embedded_screw_and_resin_load_from_the_study(void **state)
{
	struct fixture *f = *state;

	load_ok(f, DATA "study-si.json", f->a);
	assert_string_equal(f->a->screw_path, "");
	assert_string_equal(f->a->resin_path, "");
	assert_string_equal(f->a->screw.name, "2.5 in test screw");
	assert_int_equal(f->a->screw.n_sections, 3);
	assert_int_equal(f->a->resin.visc.model, OW_VISC_POWER_LAW);
	assert_int_equal(f->a->resin.visc.shift, OW_SHIFT_WLF);
	assert_rel(f->a->resin.friction_screw, 0.25, 1e-12); /* "25 %" */
	assert_int_equal(f->a->n_sources, 0);
}

/* ---- US and SI: the same study, field by field ---------------------- */

static void same(double a, double b, const char *what)
{
	double scale = fmax(fabs(a), fabs(b));

	if (isnan(a) && isnan(b))
		return;
	if (!(fabs(a - b) <= 1e-9 * scale))
		fail_msg("%s: %.17g (US) differs from %.17g (SI)", what, a, b);
}

static void same_screw(const struct ow_screw *a, const struct ow_screw *b)
{
	int i;

	same(a->diameter_m, b->diameter_m, "diameter");
	same(a->lead_m, b->lead_m, "lead");
	same(a->flight_width_m, b->flight_width_m, "flight_width");
	same(a->clearance_m, b->clearance_m, "clearance");
	assert_int_equal(a->flights, b->flights);
	assert_int_equal(a->n_sections, b->n_sections);
	for (i = 0; i < a->n_sections; i++) {
		const struct ow_section *s = &a->sections[i],
		                        *t = &b->sections[i];

		assert_int_equal(s->type, t->type);
		same(s->length_m, t->length_m, "section length");
		same(s->depth_m, t->depth_m, "section depth");
		same(s->depth_start_m, t->depth_start_m, "depth_start");
		same(s->start_m, t->start_m, "section start");
		same(s->end_m, t->end_m, "section end");
	}
}

static void same_resin(const struct ow_material *a, const struct ow_material *b)
{
	same(a->solid_density_kg_m3, b->solid_density_kg_m3, "solid_density");
	same(a->bulk_density_kg_m3, b->bulk_density_kg_m3, "bulk_density");
	same(a->melt_density_kg_m3, b->melt_density_kg_m3, "melt_density");
	same(a->solid_cp_J_kgK, b->solid_cp_J_kgK, "solid cp");
	same(a->melt_cp_J_kgK, b->melt_cp_J_kgK, "melt cp");
	same(a->solid_k_W_mK, b->solid_k_W_mK, "solid k");
	same(a->melt_k_W_mK, b->melt_k_W_mK, "melt k");
	same(a->melt_temp_K, b->melt_temp_K, "melting_point");
	same(a->fusion_J_kg, b->fusion_J_kg, "heat_of_fusion");
	same(a->friction_barrel, b->friction_barrel, "friction_barrel");
	same(a->friction_screw, b->friction_screw, "friction_screw");
	assert_int_equal(a->visc.model, b->visc.model);
	same(a->visc.consistency_Pa_sn, b->visc.consistency_Pa_sn,
	     "consistency");
	same(a->visc.index, b->visc.index, "index");
	same(a->visc.ref_temp_K, b->visc.ref_temp_K, "reference_temperature");
	assert_int_equal(a->visc.shift, b->visc.shift);
	same(a->visc.wlf_c1, b->visc.wlf_c1, "c1");
	same(a->visc.wlf_c2_K, b->visc.wlf_c2_K, "c2");
}

static void same_line(const struct ow_line *a, const struct ow_line *b)
{
	const double *la = &a->limits.peak_temp_K, *lb = &b->limits.peak_temp_K;
	int i;

	same(a->feed_temp_K, b->feed_temp_K, "feed temperature");
	same(a->numerics.feed_pressure_Pa, b->numerics.feed_pressure_Pa,
	     "feed pressure");
	assert_int_equal(a->n_zones, b->n_zones);
	for (i = 0; i < a->n_zones; i++) {
		same(a->zones[i].to_m, b->zones[i].to_m, "zone end");
		same(a->zones[i].set_K, b->zones[i].set_K, "zone set");
	}
	assert_int_equal(a->root_adiabatic, b->root_adiabatic);
	assert_int_equal(a->die.type, b->die.type);
	same(a->die.width_m, b->die.width_m, "die width");
	same(a->die.gap_m, b->die.gap_m, "die gap");
	same(a->die.length_m, b->die.length_m, "die length");
	same(a->screen_pressure_Pa, b->screen_pressure_Pa, "screen pack");
	/* struct ow_limits holds nine doubles and nothing else */
	for (i = 0; i < (int)(sizeof a->limits / sizeof(double)); i++)
		same(la[i], lb[i], "limit");
	same(a->axes.rpm_from, b->axes.rpm_from, "rpm from");
	same(a->axes.rpm_to, b->axes.rpm_to, "rpm to");
	assert_int_equal(a->axes.rpm_steps, b->axes.rpm_steps);
	assert_int_equal(a->axes.mode, b->axes.mode);
	same(a->axes.axis_from, b->axes.axis_from, "axis from");
	same(a->axes.axis_to, b->axes.axis_to, "axis to");
	assert_int_equal(a->axes.axis_steps, b->axes.axis_steps);
}

/* study-si.json is study-us.json converted with the exact NIST SP 811
 * factors (recomputed to 12 significant digits), so both must agree to
 * 1e-9 relative in every field. */
static void us_and_si_versions_give_the_same_structs(void **state)
{
	struct fixture *f = *state;

	load_ok(f, DATA "study-us.json", f->a);
	load_ok(f, DATA "study-si.json", f->b);
	same_screw(&f->a->screw, &f->b->screw);
	same_resin(&f->a->resin, &f->b->resin);
	same_line(&f->a->line, &f->b->line);
}

/* Spot values of the US study against the NIST SP 811 factors. */
static void us_units_convert_with_exact_factors(void **state)
{
	struct fixture *f = *state;
	const struct ow_study *s = f->a;

	load_ok(f, DATA "study-us.json", f->a);
	assert_rel(s->screw.diameter_m, 2.5 * IN_M, 1e-12);
	assert_rel(s->screw.clearance_m, 0.004 * IN_M, 1e-12); /* 4 thou */
	assert_rel(s->line.zones[1].set_K, 473.15, 1e-12);     /* 392 degF */
	assert_rel(s->line.limits.pressure_Pa, 5000.0 * PSI_PA, 1e-12);
	assert_rel(s->line.limits.min_output_kg_s, 44.0 * LB_KG / 3600.0,
	           1e-12);
	assert_rel(s->line.axes.axis_from, -10.0, 1e-12); /* -18 degF */
	assert_rel(s->resin.visc.consistency_Pa_sn, 2.9 * PSI_PA, 1e-12);
	/* 1 Btu_IT/(lb degF) = 4186.8 J/(kg K) exactly (NIST SP 811) */
	assert_rel(s->resin.solid_cp_J_kgK, 0.55 * 4186.8, 1e-12);
}

/* ---- parts on their own --------------------------------------------- */

static void barrier_screw_file_loads_its_channels(void **state)
{
	struct fixture *f = *state;
	struct ow_screw s;
	const struct ow_section *b = &s.sections[1];

	ow_diag_clear(&f->d);
	if (ow_config_load_screw(f->u, DATA "parts/screw-barrier.json", &s,
	                         &f->d) != OW_OK)
		fail_msg("%s", f->d.msg);
	assert_int_equal(b->type, OW_SEC_BARRIER);
	assert_rel(b->solids_depth_start_m, 9.5e-3, 1e-12);
	assert_rel(b->solids_depth_end_m, 2.0e-3, 1e-12);
	assert_rel(b->melt_depth_start_m, 2.0e-3, 1e-12);
	assert_rel(b->melt_depth_end_m, 4.5e-3, 1e-12);
	assert_rel(b->melt_share_start, 0.10, 1e-12);
	assert_rel(b->melt_share_end, 0.70, 1e-12);
	assert_rel(b->barrier_clearance_m, 0.8e-3, 1e-12);
	assert_rel(b->depth_m, 2.0e-3, 1e-12); /* the solids channel's end */
}

static void cross_resin_file_loads_its_model(void **state)
{
	struct fixture *f = *state;
	struct ow_material m;

	ow_diag_clear(&f->d);
	if (ow_config_load_resin(f->u, DATA "parts/resin-cross.json", &m,
	                         &f->d) != OW_OK)
		fail_msg("%s", f->d.msg);
	assert_int_equal(m.visc.model, OW_VISC_CROSS);
	assert_rel(m.visc.zero_shear_Pa_s, 3000.0, 1e-12);
	assert_rel(m.visc.critical_stress_Pa, 25e3, 1e-12);
	assert_rel(m.visc.index, 0.3, 1e-12);
	assert_rel(m.visc.activation_J_mol, 40e3, 1e-12);
}

/* ---- messages and checksums (temporary files) ----------------------- */

struct tmpdir {
	char dir[64];
	char path[4][128];
	int n;
};

/* Write (or rewrite) name in the temporary folder; its full path. */
static const char *put(struct tmpdir *t, const char *name, const char *text)
{
	char p0[128];
	char *p = NULL;
	FILE *fp;
	int i;

	snprintf(p0, sizeof p0, "%s/%s", t->dir, name);
	for (i = 0; i < t->n && !p; i++)
		if (!strcmp(t->path[i], p0))
			p = t->path[i];
	if (!p) {
		assert_true(t->n < 4);
		p = t->path[t->n++];
		memcpy(p, p0, sizeof p0);
	}
	fp = fopen(p, "wb");
	assert_non_null(fp);
	fputs(text, fp);
	fclose(fp);
	return p;
}

static void tmp_open(struct tmpdir *t)
{
	char sub[96];

	memset(t, 0, sizeof *t);
	snprintf(t->dir, sizeof t->dir, "/tmp/ow-config-XXXXXX");
	assert_non_null(mkdtemp(t->dir));
	snprintf(sub, sizeof sub, "%s/parts", t->dir);
	assert_int_equal(mkdir(sub, 0700), 0);
}

static void tmp_close(struct tmpdir *t)
{
	char sub[96];
	int i;

	for (i = 0; i < t->n; i++)
		unlink(t->path[i]);
	snprintf(sub, sizeof sub, "%s/parts", t->dir);
	rmdir(sub);
	rmdir(t->dir);
}

static const char screw_text[] =
    "{ \"diameter\": \"63.5 mm\", \"lead\": \"1 D\", \"flight_width\": "
    "\"0.1 D\", \"clearance\": \"0.1 mm\",\n"
    "  \"sections\": [ { \"type\": \"feed\", \"length\": \"24 D\", "
    "\"depth\": \"%s\" } ] }\n";

/* A fault inside a referenced file is reported under that file's name,
 * with the path inside it. */
static void faults_in_part_files_name_the_part_file(void **state)
{
	struct fixture *f = *state;
	char text[512], want[256];
	struct tmpdir t;
	const char *study, *screw;

	tmp_open(&t);
	/* the resin path climbs out of the temporary folder to the data */
	assert_non_null(getcwd(want, sizeof want));
	snprintf(text, sizeof text,
	         "{ \"title\": \"t\", \"screw\": \"parts/s.json\",\n"
	         "  \"resin\": \"%s/" DATA "parts/resin-hdpe.json\",\n"
	         "  \"barrel\": { \"zones\": [ { \"to\": \"24 D\", \"set\": "
	         "\"200 degC\" } ] },\n"
	         "  \"die\": { \"type\": \"circle\", \"diameter\": \"5 mm\", "
	         "\"length\": \"20 mm\" } }\n",
	         want);
	study = put(&t, "study.json", text);
	snprintf(text, sizeof text, screw_text, "-3 mm");
	screw = put(&t, "parts/s.json", text);
	load_bad(f, study);
	snprintf(want, sizeof want, "%s: sections[0].depth: ", screw);
	if (strncmp(f->d.msg, want, strlen(want)))
		fail_msg("\"%s\" does not start with \"%s\"", f->d.msg, want);
	snprintf(text, sizeof text, screw_text, "9.5 mm\" }, ] }");
	put(&t, "parts/s.json", text);
	load_bad(f, study);
	snprintf(want, sizeof want, "%s: line 2, column ", screw);
	if (strncmp(f->d.msg, want, strlen(want)))
		fail_msg("\"%s\" does not start with \"%s\"", f->d.msg, want);
	tmp_close(&t);
}

static void malformed_json_names_line_and_column(void **state)
{
	struct fixture *f = *state;
	struct tmpdir t;
	char want[160];
	const char *p;

	tmp_open(&t);
	/* the parser stops at the comma of line 3, column 12 */
	p = put(&t, "bad.json", "{\n  \"title\": \"x\",\n  \"screw\": ,\n}\n");
	load_bad(f, p);
	snprintf(want, sizeof want, "%s: line 3, column 12: malformed JSON", p);
	if (strncmp(f->d.msg, want, strlen(want)))
		fail_msg("\"%s\" does not start with \"%s\"", f->d.msg, want);
	tmp_close(&t);
}

/* Editors that write a UTF-8 byte order mark produce loadable files. */
static void byte_order_mark_is_skipped(void **state)
{
	struct fixture *f = *state;
	struct tmpdir t;
	const char *p;

	tmp_open(&t);
	p = put(&t, "bom.json", "\xEF\xBB\xBF{ \"title\": 1 }\n");
	load_bad(f, p); /* parsed: the complaint is about the title */
	message_has(f, ": title: expected a string");
	tmp_close(&t);
}

static void missing_study_file_is_an_input_error(void **state)
{
	struct fixture *f = *state;

	load_bad(f, DATA "no-such-study.json");
	message_has(f, DATA "no-such-study.json: cannot open");
	/* no diag buffer: same status, nothing written anywhere */
	assert_int_equal(
	    ow_config_load_study(f->u, BAD "key-duplicate.json", f->a, NULL),
	    OW_EINPUT);
}

/* Table-driven CRC-32 (the textbook form, independent of the library's
 * bitwise one); check value CRC("123456789") = 0xCBF43926 from Williams,
 * "A painless guide to CRC error detection algorithms" (1993), ch. 17. */
static unsigned long crc_table_update(unsigned long crc, const char *p,
                                      size_t n)
{
	unsigned long table[256];
	unsigned long c;
	int i, k;

	for (i = 0; i < 256; i++) {
		c = (unsigned long)i;
		for (k = 0; k < 8; k++)
			c = c & 1 ? 0xEDB88320UL ^ (c >> 1) : c >> 1;
		table[i] = c;
	}
	crc ^= 0xFFFFFFFFUL;
	while (n--)
		crc = table[(crc ^ (unsigned char)*p++) & 0xFF] ^ (crc >> 8);
	return crc ^ 0xFFFFFFFFUL;
}

static unsigned long crc_of_file(unsigned long crc, const char *path)
{
	char *buf = NULL;
	size_t n = 0;

	assert_int_equal(ow_io_slurp(path, (size_t)1 << 20, &buf, &n), 0);
	crc = crc_table_update(crc, buf, n);
	free(buf);
	return crc;
}

static void input_crc_covers_every_file_in_reading_order(void **state)
{
	struct fixture *f = *state;
	unsigned long crc;

	assert_int_equal(crc_table_update(0, "123456789", 9), 0xCBF43926UL);
	load_ok(f, DATA "study-full.json", f->a);
	crc = crc_of_file(0, DATA "study-full.json");
	crc = crc_of_file(crc, DATA "parts/screw-sf63.json");
	crc = crc_of_file(crc, DATA "parts/resin-hdpe.json");
	assert_int_equal(f->a->input_crc, crc);
	load_ok(f, DATA "study-si.json", f->b); /* one file, parts embedded */
	assert_int_equal(f->b->input_crc, crc_of_file(0, DATA "study-si.json"));
}

/* ---- the bad-input corpus ------------------------------------------- */

/* "<file>: <path>: ..." (path "-": "<file>: ...") containing want. */
static int corpus_case(struct fixture *f, char *line)
{
	char *file = strtok(line, "\t"), *path = strtok(NULL, "\t"),
	     *want = strtok(NULL, "\t\n");
	char full[256], head[512];

	if (!file || !path || !want)
		fail_msg("MANIFEST line without three fields: %s", line);
	snprintf(full, sizeof full, BAD "%s", file);
	ow_diag_clear(&f->d);
	if (ow_config_load_study(f->u, full, f->a, &f->d) != OW_EINPUT)
		fail_msg("%s: accepted (or not OW_EINPUT)", full);
	if (strcmp(path, "-"))
		snprintf(head, sizeof head, "%s: %s: ", full, path);
	else
		snprintf(head, sizeof head, "%s: ", full);
	if (strncmp(f->d.msg, head, strlen(head)) || !strstr(f->d.msg, want))
		fail_msg("%s: message \"%s\" should start \"%s\" and contain "
		         "\"%s\"",
		         full, f->d.msg, head, want);
	return 1;
}

static void
every_corpus_case_is_rejected_with_file_path_and_reason(void **state)
{
	struct fixture *f = *state;
	FILE *m = fopen(BAD "MANIFEST", "r");
	char line[512];
	int n = 0;

	assert_non_null(m);
	while (fgets(line, sizeof line, m))
		if (line[0] != '#' && line[0] != '\n')
			n += corpus_case(f, line);
	fclose(m);
	assert_true(n >= 30);
}

/* The corpus breaks one thing of a valid study: its bases load. */
static void corpus_base_studies_are_valid(void **state)
{
	struct fixture *f = *state;

	load_ok(f, DATA "corpus-base.json", f->a);
	load_ok(f, DATA "corpus-base-embedded.json", f->b);
	same_screw(&f->a->screw, &f->b->screw);
	same_resin(&f->a->resin, &f->b->resin);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(full_study_loads_screw_in_si),
	    cmocka_unit_test(full_study_loads_resin_in_si),
	    cmocka_unit_test(mixer_without_lands_takes_the_stated_default),
	    cmocka_unit_test(full_study_loads_line_in_si),
	    cmocka_unit_test(full_study_loads_limits_sweep_and_numerics),
	    cmocka_unit_test(value_source_objects_record_their_sources),
	    cmocka_unit_test(absent_optional_parts_take_their_defaults),
	    cmocka_unit_test(
	        relative_paths_resolve_from_the_referencing_folder),
	    cmocka_unit_test(embedded_screw_and_resin_load_from_the_study),
	    cmocka_unit_test(us_and_si_versions_give_the_same_structs),
	    cmocka_unit_test(us_units_convert_with_exact_factors),
	    cmocka_unit_test(barrier_screw_file_loads_its_channels),
	    cmocka_unit_test(cross_resin_file_loads_its_model),
	    cmocka_unit_test(faults_in_part_files_name_the_part_file),
	    cmocka_unit_test(malformed_json_names_line_and_column),
	    cmocka_unit_test(byte_order_mark_is_skipped),
	    cmocka_unit_test(missing_study_file_is_an_input_error),
	    cmocka_unit_test(input_crc_covers_every_file_in_reading_order),
	    cmocka_unit_test(
	        every_corpus_case_is_rejected_with_file_path_and_reason),
	    cmocka_unit_test(corpus_base_studies_are_valid),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
