/* config.c - study, screw and resin files (JSON) -> ow_screw, ow_material
 * and ow_line. The file formats are documented in README.md ("Input
 * files"); the generic reading lives in json_in.c. Parsing checks types,
 * units and key sets; ow_screw_prepare, ow_material_validate and
 * ow_line_validate then check the values, and their messages are prefixed
 * with the file (and "screw." / "resin." for embedded parts). */
#include "ow_config.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "json_in.h"

typedef enum ow_status (*part_fn)(const struct ow_jin *j, const cJSON *obj,
                                  const char *path, void *out);

/* One value of a fixed table of quantities. */
struct qty_field {
	const char *key;
	enum ow_dim dim;
	double *out;
};

static enum ow_status get_fields(const struct ow_jin *j, const cJSON *obj,
                                 const char *path, const struct qty_field *f,
                                 size_t n, int flags)
{
	enum ow_status st = OW_OK;
	size_t i;

	for (i = 0; st == OW_OK && i < n; i++)
		st = ow_jin_qty(j, obj, path, f[i].key, f[i].dim, flags,
		                f[i].out);
	return st;
}

/* An object under key (required or not); *o NULL when optional and
 * absent. Its keys are checked against allowed. */
static enum ow_status get_object(const struct ow_jin *j, const cJSON *obj,
                                 const char *path, const char *key,
                                 const char *const *allowed, int required,
                                 const cJSON **o, char *sub)
{
	enum ow_status st;

	*o = ow_jin_get(obj, key);
	ow_jin_key(sub, path, key);
	if (!*o)
		return required ? ow_jin_fail(j, sub, "required key is missing")
		                : OW_OK;
	st = ow_jin_object(j, *o, sub);
	if (st == OW_OK && allowed)
		st = ow_jin_keys(j, *o, sub, allowed);
	return st;
}

/* ---- screw ---------------------------------------------------------- */

static const char *const section_types[] = {"feed",    "taper", "metering",
                                            "barrier", "mixer", NULL};

static const char *const *section_keys(enum ow_section_type t)
{
	static const char *const depth[] = {"type", "length", "depth", NULL};
	static const char *const mixer[] = {"type", "length", "gap", "lands",
	                                    NULL};
	static const char *const barrier[] = {"type",
	                                      "length",
	                                      "solids_depth_start",
	                                      "solids_depth_end",
	                                      "melt_depth_start",
	                                      "melt_depth_end",
	                                      "melt_share_start",
	                                      "melt_share_end",
	                                      "barrier_clearance",
	                                      NULL};

	if (t == OW_SEC_MIXER)
		return mixer;
	return t == OW_SEC_BARRIER ? barrier : depth;
}

static enum ow_status parse_barrier(const struct ow_jin *j, const cJSON *o,
                                    const char *path, struct ow_section *s)
{
	const struct qty_field f[] = {
	    {"solids_depth_start", OW_DIM_LENGTH, &s->solids_depth_start_m},
	    {"solids_depth_end", OW_DIM_LENGTH, &s->solids_depth_end_m},
	    {"melt_depth_start", OW_DIM_LENGTH, &s->melt_depth_start_m},
	    {"melt_depth_end", OW_DIM_LENGTH, &s->melt_depth_end_m},
	    {"melt_share_start", OW_DIM_NONE, &s->melt_share_start},
	    {"melt_share_end", OW_DIM_NONE, &s->melt_share_end},
	    {"barrier_clearance", OW_DIM_LENGTH, &s->barrier_clearance_m},
	};
	enum ow_status st = get_fields(j, o, path, f, sizeof f / sizeof f[0],
	                               OW_JIN_REQUIRED | OW_JIN_IN_D);

	s->depth_m = s->solids_depth_end_m; /* the solids channel leads on */
	return st;
}

/* A mixer's barrier lands: a whole number 2..64, plain or as
 * {"value", "source"} like every value. */
static enum ow_status parse_lands(const struct ow_jin *j, const cJSON *o,
                                  const char *path, struct ow_section *s)
{
	char p[OW_JPATH_LEN];
	double n = 0.0;
	enum ow_status st = ow_jin_qty(j, o, path, "lands", OW_DIM_NONE, 0, &n);

	if (st != OW_OK || !ow_jin_get(o, "lands"))
		return st;
	if (!(n == floor(n) && n >= 2.0 && n <= 64.0))
		return ow_jin_fail(j, ow_jin_key(p, path, "lands"),
		                   "expected a whole number of barrier lands "
		                   "2..64, got %g",
		                   n);
	s->lands = (int)n;
	return OW_OK;
}

static enum ow_status parse_section(const struct ow_jin *j, const cJSON *o,
                                    const char *path, struct ow_section *s)
{
	const int req = OW_JIN_REQUIRED | OW_JIN_IN_D;
	enum ow_status st = ow_jin_object(j, o, path);
	int t = 0;

	if (st == OW_OK)
		st = ow_jin_choice(j, o, path, "type", section_types,
		                   OW_JIN_REQUIRED, &t);
	s->type = (enum ow_section_type)t;
	if (st == OW_OK)
		st = ow_jin_keys(j, o, path, section_keys(s->type));
	if (st == OW_OK)
		st = ow_jin_qty(j, o, path, "length", OW_DIM_LENGTH, req,
		                &s->length_m);
	if (st != OW_OK)
		return st;
	if (s->type == OW_SEC_BARRIER)
		return parse_barrier(j, o, path, s);
	if (s->type == OW_SEC_MIXER) {
		st = ow_jin_qty(j, o, path, "gap", OW_DIM_LENGTH, req,
		                &s->gap_m);
		if (st == OW_OK) /* optional: 0 takes the screw's default */
			st = parse_lands(j, o, path, s);
		return st;
	}
	return ow_jin_qty(j, o, path, "depth", OW_DIM_LENGTH, req, &s->depth_m);
}

static enum ow_status parse_wear(const struct ow_jin *j, const cJSON *o,
                                 const char *path, struct ow_wear *w)
{
	static const char *const keys[] = {"from", "to", "clearance", NULL};
	const struct qty_field f[] = {
	    {"from", OW_DIM_LENGTH, &w->from_m},
	    {"to", OW_DIM_LENGTH, &w->to_m},
	    {"clearance", OW_DIM_LENGTH, &w->clearance_m},
	};
	enum ow_status st = ow_jin_object(j, o, path);

	if (st == OW_OK)
		st = ow_jin_keys(j, o, path, keys);
	if (st == OW_OK)
		st = get_fields(j, o, path, f, sizeof f / sizeof f[0],
		                OW_JIN_REQUIRED | OW_JIN_IN_D);
	return st;
}

/* An array under key into a fixed array of n_max elements of size bytes
 * each, one parse call per element; *n counts them. */
static enum ow_status get_list(const struct ow_jin *j, const cJSON *o,
                               const char *path, const char *key, int n_min,
                               int n_max, int flags, void *first, size_t size,
                               int *n, part_fn one)
{
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN];
	const cJSON *a = ow_jin_get(o, key), *e;
	enum ow_status st;

	ow_jin_key(p, path, key);
	if (!a)
		return (flags & OW_JIN_REQUIRED)
		           ? ow_jin_fail(j, p, "required key is missing")
		           : OW_OK;
	st = ow_jin_array(j, a, p, n_min, n_max);
	for (e = a->child; st == OW_OK && e; e = e->next, ++*n)
		st = one(j, e, ow_jin_index(q, p, *n),
		         (char *)first + (size_t)*n * size);
	return st;
}

static enum ow_status section_one(const struct ow_jin *j, const cJSON *o,
                                  const char *path, void *out)
{
	return parse_section(j, o, path, out);
}

static enum ow_status wear_one(const struct ow_jin *j, const cJSON *o,
                               const char *path, void *out)
{
	return parse_wear(j, o, path, out);
}

/* A free-text "notes" string is allowed at the top of every file. */
static enum ow_status check_notes(const struct ow_jin *j, const cJSON *o,
                                  const char *path)
{
	char p[OW_JPATH_LEN];
	const cJSON *v = ow_jin_get(o, "notes");

	if (!v || cJSON_IsString(v))
		return OW_OK;
	return ow_jin_fail(j, ow_jin_key(p, path, "notes"),
	                   "expected a string of free text");
}

static enum ow_status parse_screw_body(const struct ow_jin *j, const cJSON *o,
                                       const char *path, struct ow_screw *s)
{
	const int req = OW_JIN_REQUIRED | OW_JIN_IN_D;
	const struct qty_field f[] = {
	    {"lead", OW_DIM_LENGTH, &s->lead_m},
	    {"flight_width", OW_DIM_LENGTH, &s->flight_width_m},
	    {"clearance", OW_DIM_LENGTH, &s->clearance_m},
	};
	enum ow_status st;

	st = ow_jin_int(j, o, path, "flights", 1, 4, OW_JIN_OPTIONAL,
	                &s->flights);
	if (st == OW_OK)
		st = get_fields(j, o, path, f, sizeof f / sizeof f[0], req);
	if (st == OW_OK)
		st = get_list(j, o, path, "sections", 1, OW_MAX_SECTIONS,
		              OW_JIN_REQUIRED, s->sections,
		              sizeof s->sections[0], &s->n_sections,
		              section_one);
	if (st == OW_OK)
		st = get_list(j, o, path, "wear", 0, OW_MAX_WEAR,
		              OW_JIN_OPTIONAL, s->wear, sizeof s->wear[0],
		              &s->n_wear, wear_one);
	return st;
}

static enum ow_status parse_screw(const struct ow_jin *j0, const cJSON *o,
                                  const char *path, void *out)
{
	static const char *const keys[] = {
	    "notes",        "name",      "diameter", "lead", "flights",
	    "flight_width", "clearance", "sections", "wear", NULL};
	struct ow_screw *s = out;
	struct ow_jin j = *j0;
	char p[OW_JPATH_LEN];
	enum ow_status st;

	memset(s, 0, sizeof *s);
	s->flights = 1;
	st = ow_jin_keys(&j, o, path, keys);
	if (st == OW_OK)
		st = check_notes(&j, o, path);
	if (st == OW_OK)
		st = ow_jin_str(&j, o, path, "name", OW_JIN_OPTIONAL, s->name,
		                sizeof s->name);
	if (st == OW_OK)
		st = ow_jin_qty(&j, o, path, "diameter", OW_DIM_LENGTH,
		                OW_JIN_REQUIRED, &s->diameter_m);
	if (st != OW_OK)
		return st;
	/* Lengths in D need the diameter: reject a useless one here, before
	 * it shows up as a puzzling error on "lead": "1 D". */
	if (!(s->diameter_m > 0.0))
		return ow_jin_fail(&j, ow_jin_key(p, path, "diameter"),
		                   "%g mm must be a positive length",
		                   s->diameter_m * 1e3);
	j.diameter_m = s->diameter_m;
	return parse_screw_body(&j, o, path, s);
}

/* ---- resin ---------------------------------------------------------- */

static const char *const *visc_keys(enum ow_visc_model m)
{
	static const char *const pl[] = {"model", "consistency",
	                                 "index", "reference_temperature",
	                                 "shift", NULL};
	static const char *const cross[] = {"model",
	                                    "zero_shear",
	                                    "critical_stress",
	                                    "index",
	                                    "reference_temperature",
	                                    "shift",
	                                    NULL};
	static const char *const cy[] = {
	    "model", "zero_shear", "time_constant",
	    "index", "a",          "reference_temperature",
	    "shift", NULL};

	if (m == OW_VISC_POWER_LAW)
		return pl;
	return m == OW_VISC_CROSS ? cross : cy;
}

static enum ow_status parse_shift(const struct ow_jin *j, const cJSON *o,
                                  const char *path, struct ow_viscosity *v)
{
	static const char *const types[] = {"arrhenius", "wlf", NULL};
	static const char *const arr[] = {"type", "activation_energy", NULL};
	static const char *const wlf[] = {"type", "c1", "c2", NULL};
	const int req = OW_JIN_REQUIRED;
	char p[OW_JPATH_LEN];
	const cJSON *s;
	int t = 0;
	enum ow_status st = get_object(j, o, path, "shift", NULL, 1, &s, p);

	if (st == OW_OK)
		st = ow_jin_choice(j, s, p, "type", types, req, &t);
	if (st != OW_OK)
		return st;
	v->shift = (enum ow_shift_type)t;
	st = ow_jin_keys(j, s, p, v->shift == OW_SHIFT_WLF ? wlf : arr);
	if (st != OW_OK)
		return st;
	if (v->shift == OW_SHIFT_ARRHENIUS)
		return ow_jin_qty(j, s, p, "activation_energy",
		                  OW_DIM_MOLAR_ENERGY, req,
		                  &v->activation_J_mol);
	st = ow_jin_qty(j, s, p, "c1", OW_DIM_NONE, req, &v->wlf_c1);
	if (st == OW_OK)
		st = ow_jin_qty(j, s, p, "c2", OW_DIM_TEMP_DIFF, req,
		                &v->wlf_c2_K);
	return st;
}

/* A power-law consistency is in Pa s^n: a power of s written in its unit
 * must be the index, else the unit says another model than the one fitted
 * ("8000 Pa s^7" with n = 0.45). Tolerance: the index written to three
 * decimals. */
static enum ow_status check_consistency_power(const struct ow_jin *j,
                                              const cJSON *vo, const char *path,
                                              const struct ow_viscosity *v)
{
	const cJSON *c = ow_jin_get(vo, "consistency");
	char p[OW_JPATH_LEN];
	double power;

	if (cJSON_IsObject(c))
		c = ow_jin_get(c, "value");
	if (ow_viscosity_validate(v, "", NULL) != OW_OK) /* said later */
		return OW_OK;
	if (!cJSON_IsString(c) ||
	    !ow_units_consistency_power(c->valuestring, &power) ||
	    fabs(power - v->index) <= 5e-4)
		return OW_OK;
	return ow_jin_fail(j, ow_jin_key(p, path, "consistency"),
	                   "\"%s\": the power of s (%g) is not the index "
	                   "(%g); write Pa s^n or Pa s^%g",
	                   c->valuestring, power, v->index, v->index);
}

static enum ow_status parse_viscosity(const struct ow_jin *j, const cJSON *o,
                                      const char *path, struct ow_viscosity *v)
{
	static const char *const models[] = {"power-law", "cross",
	                                     "carreau-yasuda", NULL};
	const struct qty_field f[] = {
	    {"consistency", OW_DIM_CONSISTENCY, &v->consistency_Pa_sn},
	    {"zero_shear", OW_DIM_VISCOSITY, &v->zero_shear_Pa_s},
	    {"critical_stress", OW_DIM_PRESSURE, &v->critical_stress_Pa},
	    {"time_constant", OW_DIM_TIME, &v->time_constant_s},
	    {"index", OW_DIM_NONE, &v->index},
	    {"a", OW_DIM_NONE, &v->a},
	    {"reference_temperature", OW_DIM_TEMPERATURE, &v->ref_temp_K},
	};
	char p[OW_JPATH_LEN];
	const cJSON *vo;
	const char *const *keys;
	enum ow_status st =
	    get_object(j, o, path, "viscosity", NULL, 1, &vo, p);
	size_t i;
	int m = 0;

	if (st == OW_OK)
		st = ow_jin_choice(j, vo, p, "model", models, OW_JIN_REQUIRED,
		                   &m);
	v->model = (enum ow_visc_model)m;
	keys = visc_keys(v->model);
	if (st == OW_OK)
		st = ow_jin_keys(j, vo, p, keys);
	/* every key of this model but "model" and "shift" is a quantity */
	for (i = 0; st == OW_OK && i < sizeof f / sizeof f[0]; i++) {
		size_t k;

		for (k = 0; keys[k] && strcmp(keys[k], f[i].key); k++)
			;
		if (keys[k])
			st = ow_jin_qty(j, vo, p, f[i].key, f[i].dim,
			                OW_JIN_REQUIRED, f[i].out);
	}
	if (st == OW_OK)
		st = parse_shift(j, vo, p, v);
	if (st == OW_OK && v->model == OW_VISC_POWER_LAW)
		st = check_consistency_power(j, vo, p, v);
	return st;
}

static const char *const resin_keys[] = {"notes",
                                         "name",
                                         "solid_density",
                                         "bulk_density",
                                         "melt_density",
                                         "solid_heat_capacity",
                                         "melt_heat_capacity",
                                         "solid_conductivity",
                                         "melt_conductivity",
                                         "melting_point",
                                         "heat_of_fusion",
                                         "friction_barrel",
                                         "friction_screw",
                                         "viscosity",
                                         NULL};

const char *const *ow_config_resin_keys(void)
{
	return resin_keys;
}

static enum ow_status parse_resin(const struct ow_jin *j, const cJSON *o,
                                  const char *path, void *out)
{
	const char *const *keys = resin_keys;
	struct ow_material *m = out;
	const struct qty_field f[] = {
	    {"solid_density", OW_DIM_DENSITY, &m->solid_density_kg_m3},
	    {"bulk_density", OW_DIM_DENSITY, &m->bulk_density_kg_m3},
	    {"melt_density", OW_DIM_DENSITY, &m->melt_density_kg_m3},
	    {"solid_heat_capacity", OW_DIM_SPECIFIC_HEAT, &m->solid_cp_J_kgK},
	    {"melt_heat_capacity", OW_DIM_SPECIFIC_HEAT, &m->melt_cp_J_kgK},
	    {"solid_conductivity", OW_DIM_CONDUCTIVITY, &m->solid_k_W_mK},
	    {"melt_conductivity", OW_DIM_CONDUCTIVITY, &m->melt_k_W_mK},
	    {"melting_point", OW_DIM_TEMPERATURE, &m->melt_temp_K},
	    {"heat_of_fusion", OW_DIM_SPECIFIC_ENERGY, &m->fusion_J_kg},
	    {"friction_barrel", OW_DIM_NONE, &m->friction_barrel},
	    {"friction_screw", OW_DIM_NONE, &m->friction_screw},
	};
	enum ow_status st;

	memset(m, 0, sizeof *m);
	st = ow_jin_keys(j, o, path, keys);
	if (st == OW_OK)
		st = check_notes(j, o, path);
	if (st == OW_OK)
		st = ow_jin_str(j, o, path, "name", OW_JIN_OPTIONAL, m->name,
		                sizeof m->name);
	if (st == OW_OK)
		st = get_fields(j, o, path, f, sizeof f / sizeof f[0],
		                OW_JIN_REQUIRED);
	if (st == OW_OK)
		st = parse_viscosity(j, o, path, &m->visc);
	return st;
}

/* ---- line: feed, barrel, die, screen pack, limits, sweep, numerics ---- */

static enum ow_status parse_feed(const struct ow_jin *j, const cJSON *o,
                                 struct ow_line *l)
{
	static const char *const keys[] = {"temperature", "pressure", NULL};
	char p[OW_JPATH_LEN];
	const cJSON *f;
	enum ow_status st = get_object(j, o, "", "feed", keys, 0, &f, p);

	if (st != OW_OK || !f)
		return st;
	st = ow_jin_qty(j, f, p, "temperature", OW_DIM_TEMPERATURE, 0,
	                &l->feed_temp_K);
	if (st == OW_OK)
		st = ow_jin_qty(j, f, p, "pressure", OW_DIM_PRESSURE, 0,
		                &l->numerics.feed_pressure_Pa);
	return st;
}

/* One zone: where it ends, its set-point and (optional, defaults from
 * ow_line_zone_defaults) its control: heating and cooling power and the
 * wall's heat-transfer coefficient. */
static enum ow_status zone_one(const struct ow_jin *j, const cJSON *o,
                               const char *path, void *out)
{
	static const char *const keys[] = {
	    "to", "set", "heating_power", "cooling_power", "heat_transfer",
	    NULL};
	struct ow_zone *z = out;
	const struct qty_field f[] = {
	    {"heating_power", OW_DIM_POWER, &z->heating_W},
	    {"cooling_power", OW_DIM_POWER, &z->cooling_W},
	    {"heat_transfer", OW_DIM_HEAT_TRANSFER, &z->wall_h_W_m2K},
	};
	enum ow_status st = ow_jin_object(j, o, path);

	if (st == OW_OK)
		st = ow_jin_keys(j, o, path, keys);
	if (st == OW_OK)
		st = ow_jin_qty(j, o, path, "to", OW_DIM_LENGTH,
		                OW_JIN_REQUIRED | OW_JIN_IN_D, &z->to_m);
	if (st == OW_OK)
		st = ow_jin_qty(j, o, path, "set", OW_DIM_TEMPERATURE,
		                OW_JIN_REQUIRED, &z->set_K);
	if (st == OW_OK)
		st = get_fields(j, o, path, f, sizeof f / sizeof f[0],
		                OW_JIN_OPTIONAL);
	return st;
}

/* Does text start like a number ("200 degC", "-5 K", ".5")? */
static int starts_numeric(const char *t)
{
	while (*t == ' ' || *t == '\t')
		t++;
	if (*t == '+' || *t == '-')
		t++;
	return (*t >= '0' && *t <= '9') || *t == '.';
}

static enum ow_status parse_barrel(const struct ow_jin *j, const cJSON *o,
                                   struct ow_line *l)
{
	static const char *const keys[] = {"zones", "screw_root",
	                                   "heat_transfer_factor", NULL};
	char p[OW_JPATH_LEN], q[OW_JPATH_LEN];
	const cJSON *b, *root;
	enum ow_status st = get_object(j, o, "", "barrel", keys, 1, &b, p);

	if (st == OW_OK)
		st = get_list(j, b, p, "zones", 1, OW_MAX_ZONES,
		              OW_JIN_REQUIRED, l->zones, sizeof l->zones[0],
		              &l->n_zones, zone_one);
	if (st == OW_OK)
		st = ow_jin_qty(j, b, p, "heat_transfer_factor", OW_DIM_NONE,
		                OW_JIN_OPTIONAL, &l->heat_transfer_factor);
	if (st == OW_OK)
		ow_line_zone_defaults(l, j->diameter_m);
	if (st != OW_OK || !(root = ow_jin_get(b, "screw_root")))
		return st;
	if (cJSON_IsString(root) && !strcmp(root->valuestring, "adiabatic")) {
		l->root_adiabatic = 1;
		return OW_OK;
	}
	l->root_adiabatic = 0;
	ow_jin_key(q, p, "screw_root");
	if (cJSON_IsString(root) && !starts_numeric(root->valuestring))
		return ow_jin_fail(j, q,
		                   "\"%.40s\": expected \"adiabatic\" "
		                   "or %s",
		                   root->valuestring,
		                   ow_dim_expect(OW_DIM_TEMPERATURE));
	return ow_jin_qty_node(j, root, q, OW_DIM_TEMPERATURE, 0,
	                       &l->root_temp_K);
}

/* The die block: its type, then every field of that type (ow_die_fields),
 * each required. */
static enum ow_status parse_die(const struct ow_jin *j, const cJSON *o,
                                struct ow_die *die)
{
	const char *types[OW_DIE_TYPES + 1], *keys[OW_DIE_FIELDS + 2];
	const struct ow_die_field *f = ow_die_fields();
	int i, k, t;
	char p[OW_JPATH_LEN];
	const cJSON *d;
	enum ow_status st = get_object(j, o, "", "die", NULL, 1, &d, p);

	for (t = 0; t < OW_DIE_TYPES; t++)
		types[t] = ow_die_type_name((enum ow_die_type)t);
	types[OW_DIE_TYPES] = NULL;
	t = 0; /* the choice's index */
	if (st == OW_OK)
		st = ow_jin_choice(j, d, p, "type", types, OW_JIN_REQUIRED, &t);
	if (st != OW_OK)
		return st;
	die->type = (enum ow_die_type)t;
	keys[0] = "type";
	for (i = 0, k = 1; i < OW_DIE_FIELDS; i++)
		if (ow_die_has(die->type, &f[i]))
			keys[k++] = f[i].key;
	keys[k] = NULL;
	st = ow_jin_keys(j, d, p, keys);
	for (i = 0; st == OW_OK && i < OW_DIE_FIELDS; i++)
		if (ow_die_has(die->type, &f[i]))
			st = ow_jin_qty(j, d, p, f[i].key, f[i].dim,
			                OW_JIN_REQUIRED,
			                ow_die_slot(die, &f[i]));
	return st;
}

static enum ow_status parse_screen(const struct ow_jin *j, const cJSON *o,
                                   struct ow_line *l)
{
	static const char *const keys[] = {"pressure_drop", NULL};
	char p[OW_JPATH_LEN];
	const cJSON *s;
	enum ow_status st = get_object(j, o, "", "screen_pack", keys, 0, &s, p);

	if (st != OW_OK || !s)
		return st;
	return ow_jin_qty(j, s, p, "pressure_drop", OW_DIM_PRESSURE,
	                  OW_JIN_REQUIRED, &l->screen_pressure_Pa);
}

/* limits.zone_control: true (every zone must hold its set-point: the
 * default), false (off), or the largest share of a zone's heating or
 * cooling power a point may need ("90 %"). */
static enum ow_status parse_zone_control(const struct ow_jin *j, const cJSON *s,
                                         const char *path, struct ow_limits *m)
{
	const cJSON *v = ow_jin_get(s, "zone_control");

	if (v && cJSON_IsBool(v)) {
		m->zone_load = cJSON_IsTrue(v) ? 1.0 : NAN;
		return OW_OK;
	}
	return ow_jin_qty(j, s, path, "zone_control", OW_DIM_NONE,
	                  OW_JIN_OPTIONAL, &m->zone_load);
}

static enum ow_status parse_limits(const struct ow_jin *j, const cJSON *o,
                                   struct ow_limits *m)
{
	static const char *const keys[] = {
	    "peak_temp", "unmelt",        "pressure",   "power",
	    "torque",    "min_melt_temp", "min_output", "max_output",
	    "max_sbr",   "zone_control",  NULL};
	const struct qty_field f[] = {
	    {"peak_temp", OW_DIM_TEMPERATURE, &m->peak_temp_K},
	    {"unmelt", OW_DIM_NONE, &m->unmelt_frac},
	    {"pressure", OW_DIM_PRESSURE, &m->pressure_Pa},
	    {"power", OW_DIM_POWER, &m->power_W},
	    {"torque", OW_DIM_TORQUE, &m->torque_Nm},
	    {"min_melt_temp", OW_DIM_TEMPERATURE, &m->min_melt_temp_K},
	    {"min_output", OW_DIM_MASS_FLOW, &m->min_output_kg_s},
	    {"max_output", OW_DIM_MASS_FLOW, &m->max_output_kg_s},
	    {"max_sbr", OW_DIM_NONE, &m->max_sbr},
	};
	char p[OW_JPATH_LEN];
	const cJSON *s;
	enum ow_status st = get_object(j, o, "", "limits", keys, 0, &s, p);

	if (st != OW_OK || !s)
		return st;
	st = get_fields(j, s, p, f, sizeof f / sizeof f[0], OW_JIN_OPTIONAL);
	return st == OW_OK ? parse_zone_control(j, s, p, m) : st;
}

static enum ow_status parse_rpm_axis(const struct ow_jin *j, const cJSON *sw,
                                     const char *path, struct ow_axes *a)
{
	static const char *const keys[] = {"from", "to", "steps", NULL};
	const int req = OW_JIN_REQUIRED;
	char p[OW_JPATH_LEN];
	const cJSON *r;
	enum ow_status st = get_object(j, sw, path, "rpm", keys, 1, &r, p);

	if (st == OW_OK)
		st = ow_jin_qty(j, r, p, "from", OW_DIM_ROT_SPEED, req,
		                &a->rpm_from);
	if (st == OW_OK)
		st = ow_jin_qty(j, r, p, "to", OW_DIM_ROT_SPEED, req,
		                &a->rpm_to);
	if (st == OW_OK)
		st = ow_jin_int(j, r, p, "steps", 2, 1000, req, &a->rpm_steps);
	return st;
}

static const char *const *barrel_axis_keys(enum ow_axis_mode m)
{
	static const char *const shift[] = {"mode", "from", "to", "steps",
	                                    NULL};
	static const char *const set[] = {"mode",  "from",       "to",
	                                  "steps", "zones_from", NULL};
	static const char *const zone[] = {"mode",  "from", "to",
	                                   "steps", "zone", NULL};

	if (m == OW_AXIS_SHIFT)
		return shift;
	return m == OW_AXIS_SET ? set : zone;
}

/* Zones are counted from 1 in files and from 0 in struct ow_axes. */
static enum ow_status parse_barrel_axis(const struct ow_jin *j, const cJSON *sw,
                                        const char *path, int n_zones,
                                        struct ow_axes *a)
{
	static const char *const modes[] = {"shift", "set", "zone", NULL};
	const int req = OW_JIN_REQUIRED;
	char p[OW_JPATH_LEN];
	const cJSON *b;
	enum ow_dim dim;
	int m = 0, first = 1, zone = 0;
	enum ow_status st = get_object(j, sw, path, "barrel", NULL, 1, &b, p);

	if (st == OW_OK)
		st = ow_jin_choice(j, b, p, "mode", modes, req, &m);
	a->mode = (enum ow_axis_mode)m;
	if (st == OW_OK)
		st = ow_jin_keys(j, b, p, barrel_axis_keys(a->mode));
	dim = a->mode == OW_AXIS_SHIFT ? OW_DIM_TEMP_DIFF : OW_DIM_TEMPERATURE;
	if (st == OW_OK)
		st = ow_jin_qty(j, b, p, "from", dim, req, &a->axis_from);
	if (st == OW_OK)
		st = ow_jin_qty(j, b, p, "to", dim, req, &a->axis_to);
	if (st == OW_OK)
		st = ow_jin_int(j, b, p, "steps", 2, 1000, req, &a->axis_steps);
	if (st == OW_OK && a->mode == OW_AXIS_SET)
		st = ow_jin_int(j, b, p, "zones_from", 1, n_zones, 0, &first);
	if (st == OW_OK && a->mode == OW_AXIS_ZONE)
		st = ow_jin_int(j, b, p, "zone", 1, n_zones, req, &zone);
	a->zones_from = first - 1;
	a->zone = a->mode == OW_AXIS_ZONE ? zone - 1 : 0;
	return st;
}

static enum ow_status parse_sweep(const struct ow_jin *j, const cJSON *o,
                                  struct ow_line *l)
{
	static const char *const keys[] = {"rpm", "barrel", NULL};
	char p[OW_JPATH_LEN];
	const cJSON *s;
	enum ow_status st = get_object(j, o, "", "sweep", keys, 0, &s, p);

	l->axes.rpm_steps = 0; /* no sweep unless the study asks */
	l->axes.axis_steps = 0;
	if (st != OW_OK || !s)
		return st;
	st = parse_rpm_axis(j, s, p, &l->axes);
	if (st == OW_OK)
		st = parse_barrel_axis(j, s, p, l->n_zones, &l->axes);
	return st;
}

static enum ow_status parse_numerics(const struct ow_jin *j, const cJSON *o,
                                     struct ow_numerics *n)
{
	static const char *const keys[] = {"stations_per_turn", "depth_nodes",
	                                   NULL};
	char p[OW_JPATH_LEN];
	const cJSON *s;
	enum ow_status st = get_object(j, o, "", "numerics", keys, 0, &s, p);

	if (st != OW_OK || !s)
		return st;
	st = ow_jin_int(j, s, p, "stations_per_turn", 4, 400, 0,
	                &n->stations_per_turn);
	if (st == OW_OK)
		st = ow_jin_int(j, s, p, "depth_nodes", 9, 401, 0,
		                &n->depth_nodes);
	return st;
}

/* The line's parts of a study, in file order; the screw is known, so
 * zone ends may be written in D. */
static enum ow_status parse_line(const struct ow_jin *j0, const cJSON *o,
                                 double diameter_m, struct ow_line *l)
{
	struct ow_jin j = *j0;
	enum ow_status st;

	ow_line_default(l);
	j.diameter_m = diameter_m;
	st = parse_feed(&j, o, l);
	if (st == OW_OK)
		st = parse_barrel(&j, o, l);
	j.diameter_m = 0.0; /* nothing else is measured on the screw */
	if (st == OW_OK)
		st = parse_die(&j, o, &l->die);
	if (st == OW_OK)
		st = parse_screen(&j, o, l);
	if (st == OW_OK)
		st = parse_limits(&j, o, &l->limits);
	if (st == OW_OK)
		st = parse_sweep(&j, o, l);
	if (st == OW_OK)
		st = parse_numerics(&j, o, &l->numerics);
	return st;
}

/* ---- files and parts ------------------------------------------------ */

/* A check's message ("sections[2].depth: ...") placed under its file and,
 * for an embedded part, its key: "<file>: screw.sections[2].depth: ...". */
static enum ow_status checked(enum ow_status st, const struct ow_diag *tmp,
                              const char *file, const char *prefix,
                              struct ow_diag *d)
{
	if (st == OW_OK)
		return OW_OK;
	return ow_diag_set(d, st, "%s: %s%s", file, prefix,
	                   tmp->msg[0] ? tmp->msg : ow_strerror(st));
}

static enum ow_status check_screw(struct ow_screw *s, const char *file,
                                  const char *prefix, struct ow_diag *d)
{
	struct ow_diag tmp = {{0}};

	return checked(ow_screw_prepare(s, &tmp), &tmp, file, prefix, d);
}

static enum ow_status check_resin(const struct ow_material *m, const char *file,
                                  const char *prefix, struct ow_diag *d)
{
	struct ow_diag tmp = {{0}};

	return checked(ow_material_validate(m, &tmp), &tmp, file, prefix, d);
}

/* ref relative to the folder of the file that names it. */
static enum ow_status resolve(const struct ow_jin *j, const char *key,
                              const char *ref, char *out)
{
	const char *slash = strrchr(j->file, '/');
	int dir = ref[0] == '/' || !slash ? 0 : (int)(slash - j->file) + 1;

	if (!ref[0])
		return ow_jin_fail(j, key,
		                   "expected a file name or an "
		                   "object, got an empty string");
	if (snprintf(out, OW_PATH_LEN, "%.*s%s", dir, j->file, ref) >=
	    OW_PATH_LEN)
		return ow_jin_fail(j, key, "the path \"%.60s...\" is too long",
		                   ref);
	return OW_OK;
}

/* One part of a study (screw or resin): a file name or an embedded
 * object. file_out receives the resolved file name ("" when embedded). */
static enum ow_status load_part(const struct ow_jin *study, const cJSON *o,
                                const char *key, part_fn parse,
                                unsigned long *crc, char *file_out, void *out)
{
	char root[OW_JPATH_LEN];
	const cJSON *v = ow_jin_get(o, key);
	struct ow_jin j = *study;
	cJSON *doc = NULL;
	enum ow_status st;

	file_out[0] = '\0';
	if (!v)
		return ow_jin_fail(study, key, "required key is missing");
	if (cJSON_IsObject(v))
		return parse(study, v, key, out);
	if (!cJSON_IsString(v))
		return ow_jin_fail(study, key,
		                   "expected a file name or an "
		                   "embedded object {...}");
	st = resolve(study, key, v->valuestring, file_out);
	if (st != OW_OK)
		return st;
	j.file = file_out;
	snprintf(root, sizeof root, "%s.", key); /* "resin.melt_density" */
	j.src_root = root;
	st = ow_jin_load(&j, study->file, key, crc, &doc);
	if (st == OW_OK)
		st = parse(&j, doc, "", out);
	cJSON_Delete(doc);
	return st;
}

/* A part file on its own: ow_config_load_screw / _resin. */
static enum ow_status load_alone(const struct ow_units *u, const char *path,
                                 part_fn parse, void *out, struct ow_diag *d)
{
	struct ow_jin j = {u, path, "", NULL, 0.0, d};
	unsigned long crc = 0;
	cJSON *doc = NULL;
	enum ow_status st = ow_jin_load(&j, NULL, NULL, &crc, &doc);

	if (st == OW_OK)
		st = parse(&j, doc, "", out);
	cJSON_Delete(doc);
	return st;
}

enum ow_status ow_config_load_screw(const struct ow_units *u, const char *path,
                                    struct ow_screw *out, struct ow_diag *d)
{
	enum ow_status st = load_alone(u, path, parse_screw, out, d);

	return st == OW_OK ? check_screw(out, path, "", d) : st;
}

enum ow_status ow_config_load_resin(const struct ow_units *u, const char *path,
                                    struct ow_material *out, struct ow_diag *d)
{
	enum ow_status st = load_alone(u, path, parse_resin, out, d);

	return st == OW_OK ? check_resin(out, path, "", d) : st;
}

/* Screw then resin, each checked in its own file's terms. */
static enum ow_status load_parts(const struct ow_jin *j, const cJSON *o,
                                 struct ow_study *s)
{
	const char *scr = "screw.", *res = "resin.";
	enum ow_status st;

	st = load_part(j, o, "screw", parse_screw, &s->input_crc, s->screw_path,
	               &s->screw);
	if (st == OW_OK)
		st = check_screw(&s->screw,
		                 s->screw_path[0] ? s->screw_path : s->path,
		                 s->screw_path[0] ? "" : scr, j->d);
	if (st == OW_OK)
		st = load_part(j, o, "resin", parse_resin, &s->input_crc,
		               s->resin_path, &s->resin);
	if (st == OW_OK)
		st = check_resin(&s->resin,
		                 s->resin_path[0] ? s->resin_path : s->path,
		                 s->resin_path[0] ? "" : res, j->d);
	return st;
}

/* The unit system the study is written in, read from its first barrel
 * zone's set-point: US when in degrees Fahrenheit ("400 degF", "400 °F"),
 * else SI. (Bare numbers on the command line are read in it.) */
static enum ow_unit_system study_units(const cJSON *o)
{
	const cJSON *b = cJSON_GetObjectItemCaseSensitive(o, "barrel");
	const cJSON *z =
	    cJSON_GetArrayItem(cJSON_GetObjectItemCaseSensitive(b, "zones"), 0);
	const cJSON *set = cJSON_GetObjectItemCaseSensitive(z, "set");
	const char *t;

	if (cJSON_IsObject(set))
		set = cJSON_GetObjectItemCaseSensitive(set, "value");
	t = cJSON_IsString(set) ? set->valuestring : "";
	return strstr(t, "degF") || strstr(t, "°F") || strstr(t, "deg_F")
	           ? OW_SYS_US
	           : OW_SYS_SI;
}

static enum ow_status parse_study(const struct ow_jin *j, const cJSON *o,
                                  struct ow_study *s)
{
	static const char *const keys[] = {
	    "notes",    "title",       "screw",       "resin",  "feed",
	    "barrel",   "die",         "screen_pack", "limits", "sweep",
	    "numerics", "calibration", "spread",      NULL};
	struct ow_diag tmp = {{0}};
	enum ow_status st = ow_jin_keys(j, o, "", keys);

	if (st == OW_OK)
		st = check_notes(j, o, "");
	if (st == OW_OK)
		st = ow_jin_str(j, o, "", "title", OW_JIN_REQUIRED, s->title,
		                sizeof s->title);
	if (st == OW_OK)
		st = load_parts(j, o, s);
	if (st == OW_OK)
		st = parse_line(j, o, s->screw.diameter_m, &s->line);
	s->own_units = study_units(o);
	if (st == OW_OK)
		st = checked(ow_line_validate(&s->line,
		                              ow_screw_length(&s->screw), &tmp),
		             &tmp, s->path, "", j->d);
	if (st == OW_OK)
		st = ow_config_calibration(j, o, s);
	if (st == OW_OK && ow_calib_active(&s->calib)) {
		ow_calib_apply(s, NULL); /* the model the study asks for */
		st = check_resin(&s->resin, s->path,
		                 "calibration applied: "
		                 "resin.",
		                 j->d);
	}
	if (st == OW_OK)
		st = ow_config_spread(j, o, s);
	return st;
}

enum ow_status ow_config_load_study(const struct ow_units *u, const char *path,
                                    struct ow_study *out, struct ow_diag *d)
{
	struct ow_jin j = {u, out->path, "", out, 0.0, d};
	cJSON *doc = NULL;
	enum ow_status st;

	memset(out, 0, sizeof *out);
	if (snprintf(out->path, sizeof out->path, "%s", path) >=
	    (int)sizeof out->path)
		return ow_diag_set(d, OW_EINPUT,
		                   "%.60s...: the path is too "
		                   "long",
		                   path);
	st = ow_jin_load(&j, NULL, NULL, &out->input_crc, &doc);
	if (st == OW_OK)
		st = parse_study(&j, doc, out);
	cJSON_Delete(doc);
	return st;
}
