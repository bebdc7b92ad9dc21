/* results.c - machine-readable outputs (JSON via cJSON, CSV) and atomic file
 * writing. Units are those the keys name, never display units. */
#include "ow_results.h"

#include <cjson/cJSON.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#define OW_PI 3.14159265358979323846

char *ow_fmt_double(char *buf, size_t n, double x, int json)
{
	/* The program never calls setlocale, so printf uses the "C" locale's
	 * decimal point; 17 significant digits round-trip a double. */
	if (!isfinite(x))
		snprintf(buf, n, "%s", json ? "null" : "");
	else
		snprintf(buf, n, "%.17g", x);
	return buf;
}

enum ow_status ow_results_write_file(const char *path, const char *text,
				     size_t len, struct ow_diag *d)
{
	size_t plen = strlen(path) + 32;
	char *tmp = malloc(plen);
	FILE *f = NULL;
	enum ow_status st = OW_OK;

	if (!tmp)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	snprintf(tmp, plen, "%s.tmp%ld", path, (long)getpid());
	f = fopen(tmp, "wb");
	if (!f) {
		st = ow_diag_set(d, OW_EIO, "%s: cannot write: %s", path,
				 strerror(errno));
		goto fail;
	}
	if (fwrite(text, 1, len, f) != len || fflush(f) != 0) {
		st = ow_diag_set(d, OW_EIO, "%s: write failed: %s", path,
				 strerror(errno));
		fclose(f);
		remove(tmp);
		goto fail;
	}
	if (fclose(f) != 0 || rename(tmp, path) != 0) {
		st = ow_diag_set(d, OW_EIO, "%s: cannot complete: %s", path,
				 strerror(errno));
		remove(tmp);
	}
fail:
	free(tmp);
	return st;
}

static int put_num(cJSON *o, const char *key, double v)
{
	cJSON *item = isfinite(v) ? cJSON_CreateNumber(v) : cJSON_CreateNull();

	return item && cJSON_AddItemToObject(o, key, item);
}

static cJSON *section_json(const struct ow_screw *s, int i)
{
	const struct ow_section *sec = &s->sections[i];
	double D = s->diameter_m;
	cJSON *o = cJSON_CreateObject();
	int ok = o && cJSON_AddStringToObject(o, "type",
					      ow_section_name(sec->type));

	ok = ok && put_num(o, "start_D", sec->start_m / D);
	ok = ok && put_num(o, "end_D", sec->end_m / D);
	if (sec->type == OW_SEC_MIXER) {
		ok = ok && put_num(o, "depth_start_mm", sec->gap_m * 1e3);
		ok = ok && put_num(o, "depth_end_mm", sec->gap_m * 1e3);
	} else {
		ok = ok && put_num(o, "depth_start_mm",
				   sec->depth_start_m * 1e3);
		ok = ok && put_num(o, "depth_end_mm", sec->depth_m * 1e3);
	}
	if (sec->type == OW_SEC_BARRIER) {
		ok = ok && put_num(o, "melt_depth_start_mm",
				   sec->melt_depth_start_m * 1e3);
		ok = ok && put_num(o, "melt_depth_end_mm",
				   sec->melt_depth_end_m * 1e3);
		ok = ok && put_num(o, "melt_share_start", sec->melt_share_start);
		ok = ok && put_num(o, "melt_share_end", sec->melt_share_end);
	}
	ok = ok && put_num(o, "clearance_mm",
			   ow_screw_clearance(s, 0.5 * (sec->start_m +
							sec->end_m)) * 1e3);
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
	ok = ok && put_num(r, "diameter_mm", D * 1e3);
	ok = ok && put_num(r, "lead_mm", s->lead_m * 1e3);
	ok = ok && put_num(r, "flights", s->flights);
	ok = ok && put_num(r, "length_D", ow_screw_ld(s));
	ok = ok && put_num(r, "helix_angle_deg",
			   ow_screw_helix(s, D) * 180.0 / OW_PI);
	ok = ok && put_num(r, "compression_ratio",
			   ow_screw_compression_depth(s));
	ok = ok && put_num(r, "compression_ratio_area",
			   ow_screw_compression_area(s));
	ok = ok && put_num(r, "feed_depth_mm", hf * 1e3);
	ok = ok && put_num(r, "metering_depth_mm", hm * 1e3);
	ok = ok && put_num(r, "channel_width_mm", ow_screw_width(s, D) * 1e3);
	ok = ok && put_num(r, "clearance_mm", s->clearance_m * 1e3);
	ok = ok && put_num(r, "feed_turn_volume_cm3",
			   ow_screw_free_area(s, 0.0) * s->lead_m * 1e6);
	ok = ok && put_num(r, "metering_turn_volume_cm3",
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
