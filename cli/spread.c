/* spread.c - `opwin map` across a spread of inputs (see spread.h). */
#include "spread.h"

#include "cli.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

void cli_spread_init(struct cli_spread *sp)
{
	memset(sp, 0, sizeof *sp);
	ow_spread_config_default(&sp->cfg);
	sp->cmd = "map";
	sp->save = 1;
}

void cli_spread_free(struct cli_spread *sp)
{
	ow_window_destroy(sp->w);
	ow_grid_destroy(sp->robust);
	ow_spread_result_destroy(sp->r);
	sp->w = NULL;
	sp->robust = NULL;
	sp->r = NULL;
}

int cli_spread_option(struct cli_spread *sp, int id, const char *arg)
{
	char *end;
	double v;

	switch (id) {
	case CLI_SP_SPREAD:
		sp->spec = arg;
		return 0;
	case CLI_SP_SAMPLES:
		v = strtod(arg, &end);
		if (*end || !*arg || v != floor(v) || v < 2 ||
		    v > OW_SPREAD_MAX_SAMPLES)
			return cli_usage_error("map", "--samples takes "
						      "2..1024");
		sp->cfg.samples = (int)v;
		return 0;
	case CLI_SP_SEED:
		v = strtod(arg, &end);
		if (*end || !*arg || v != floor(v) || v < 0 ||
		    v > 4294967295.0)
			return cli_usage_error("map", "--seed takes an "
						      "integer 0..4294967295");
		sp->cfg.seed = (long)v;
		return 0;
	case CLI_SP_LEVEL:
		v = strtod(arg, &end);
		if (*end == '%')
			v /= 100.0, end++;
		if (*end || !*arg || !(v > 0.0 && v <= 1.0))
			return cli_usage_error("map", "--level takes a share "
						      "in (0, 1] or (0, 100]%");
		sp->cfg.level = v;
		return 0;
	default:
		return -1;
	}
}

/* "name=A..B" -> "name":{"from":"A","to":"B"}; "name=+-W" -> plus_minus;
 * "name=sd W" -> sd. 0, or -1 when an item is not of these forms. */
static int short_item(const char *item, char *out, size_t n)
{
	const char *eq = strchr(item, '='), *v, *dots;
	int len;

	if (!eq || eq == item || strpbrk(item, "\"\\"))
		return -1;
	len = (int)(eq - item);
	v = eq + 1;
	if ((dots = strstr(v, "..")))
		return snprintf(out, n, "\"%.*s\":{\"from\":\"%.*s\",\"to\":"
				"\"%s\"}", len, item, (int)(dots - v), v,
				dots + 2) < (int)n ? 0 : -1;
	if (strncmp(v, "+-", 2) == 0)
		return snprintf(out, n, "\"%.*s\":{\"plus_minus\":\"%s\"}", len,
				item, v + 2) < (int)n ? 0 : -1;
	if (strncmp(v, "sd ", 3) == 0)
		return snprintf(out, n, "\"%.*s\":{\"sd\":\"%s\"}", len, item,
				v + 3) < (int)n ? 0 : -1;
	return -1;
}

/* The short form as the JSON of a spread block (NULL when malformed). */
static char *short_json(const char *spec)
{
	size_t n = strlen(spec) * 2 + 64, used = 1;
	char *out = malloc(n), *copy = strdup(spec), *save = NULL, *item;
	char buf[512];
	int ok = out && copy;

	if (ok)
		strcpy(out, "{");
	for (item = ok ? strtok_r(copy, ",", &save) : NULL; ok && item;
	     item = strtok_r(NULL, ",", &save)) {
		ok = short_item(item, buf, sizeof buf) == 0 &&
		     used + strlen(buf) + 3 < n;
		if (ok) {
			if (used > 1)
				strcat(out, ",");
			strcat(out, buf);
			used = strlen(out);
		}
	}
	free(copy);
	if (ok && used > 1) {
		strcat(out, "}");
		return out;
	}
	free(out);
	return NULL;
}

int cli_spread_load(const struct ow_units *u, struct cli_spread *sp,
		    struct ow_study *s)
{
	struct ow_diag d = {{0}};
	char *json;
	enum ow_status st;

	if (!sp->spec && !s->spread.present &&
	    (sp->cfg.samples > 0 || sp->cfg.seed >= 0 || sp->cfg.level > 0))
		return cli_usage_error("map", "--samples, --seed and --level "
				       "need a spread (the study's spread "
				       "block or --spread)");
	if (!sp->spec)
		return CLI_OK;
	json = sp->spec[0] == '{' ? strdup(sp->spec) : short_json(sp->spec);
	if (!json)
		return cli_usage_error("map", "--spread takes the spread block "
				       "as JSON or name=FROM..TO, name=+-W, "
				       "name=sd W joined by commas");
	st = ow_config_spread_text(u, json, "--spread", s, &d);
	free(json);
	return st == OW_OK ? CLI_OK : cli_fail("map", st, &d);
}

int cli_spread_run(const struct ow_study *s, const struct ow_grid *g,
		   const struct ow_window *nominal, int jobs, int quiet,
		   struct cli_spread *sp)
{
	struct cli_progress pr;
	struct ow_diag d = {{0}};
	enum ow_status st;

	if (!s->spread.present)
		return CLI_OK;
	sp->cfg.jobs = jobs;
	cli_progress_start(&pr, "spread");
	if (!quiet && isatty(STDERR_FILENO)) {
		sp->cfg.progress = cli_progress_show;
		sp->cfg.progress_ctx = &pr;
	}
	st = ow_spread_run(s, g, &sp->cfg, &sp->r, &d);
	if (st == OW_OK)
		st = ow_spread_robust_grid(g, sp->r, &sp->robust, &d);
	if (st == OW_OK)
		st = ow_window_extract(s, sp->robust, &sp->w, &d);
	if (st == OW_OK)
		ow_spread_clip_window(sp->w, nominal);
	return st == OW_OK ? CLI_OK : cli_fail("map", st, &d);
}

enum ow_status cli_spread_grid(const struct ow_study *s,
			       const struct ow_grid *g,
			       const struct cli_spread *sp, char **text,
			       struct ow_diag *d)
{
	char *out = NULL;
	enum ow_status st;

	if (!sp->r)
		return OW_OK;
	st = ow_spread_grid_csv(s, g, sp->r, *text, &out, d);
	free(*text);
	*text = out;
	return st;
}

enum ow_status cli_spread_window(const struct ow_study *s,
				 const struct cli_spread *sp, char **text,
				 struct ow_diag *d)
{
	char *out = NULL;
	enum ow_status st;

	if (!sp->r)
		return OW_OK;
	st = ow_spread_window_json(s, sp->robust, sp->w, sp->r, *text, &out,
				   d);
	free(*text);
	*text = out;
	return st;
}

/* "lo - hi unit", rounded inwards as the nominal window's bounds are. */
static void bounds(enum ow_unit_system units, enum ow_dim dim, double lo,
		   double hi, int decimals)
{
	char a[32], b[32];

	ow_report_format_bound(a, sizeof a, ow_display_value(units, dim, lo),
			       decimals, OW_ROUND_UP);
	ow_report_format_bound(b, sizeof b, ow_display_value(units, dim, hi),
			       decimals, OW_ROUND_DOWN);
	printf("%s - %s %s", a, b, ow_display_label(units, dim));
}

void cli_spread_print(const struct ow_study *s, const struct ow_window *nom,
		      const struct cli_spread *sp, enum ow_unit_system units)
{
	const struct ow_window *w = sp->w;
	int i;

	if (!sp->r)
		return;
	printf("Across the spread (%d input%s, %d samples a point, seed %lu):"
	       "\n", s->spread.n, s->spread.n == 1 ? "" : "s",
	       sp->r->samples, sp->r->seed);
	printf("  robust window (%.0f %% of samples safe)", 100.0 * sp->r->level);
	if (w->empty) {
		printf(": empty\n");
	} else {
		printf("\n    screw speed       ");
		bounds(units, OW_DIM_ROT_SPEED, w->rpm_min, w->rpm_max,
		       OW_REPORT_RPM_DECIMALS);
		printf("\n    axis set-point    ");
		bounds(units, OW_DIM_TEMPERATURE, w->set_min_K, w->set_max_K,
		       OW_REPORT_TEMP_DECIMALS);
		printf("\n");
	}
	printf("  robust share of the map %.0f %% (nominal %.0f %%)\n",
	       100.0 * w->safe_fraction, 100.0 * nom->safe_fraction);
	for (i = 0; i < sp->r->n_rank && i < 4; i++)
		printf("  %-26s moves the margins at the edge, r = %+.2f%s\n",
		       s->spread.in[sp->r->rank[i].input].name,
		       sp->r->rank[i].corr,
		       sp->r->rank[i].corr < 0 ? " (higher shrinks)"
					       : " (lower shrinks)");
	printf("  %d sample solves, %d saved where every sample agrees\n",
	       sp->r->solves, sp->r->solves_saved);
}

int cli_spread_files(const struct ow_study *s, const struct ow_grid *g,
		     const struct ow_window *w, const struct cli_spread *sp,
		     enum ow_unit_system units, const char *dir)
{
	struct ow_maps_options mo;
	struct ow_diag d = {{0}};
	enum ow_status st;

	if (!sp->r)
		return CLI_OK;
	ow_maps_default(&mo);
	mo.units = units;
	st = ow_maps_write_share(s, g, w, sp->w, sp->r, &mo, dir, &d);
	if (st == OW_OK && sp->save) {
		char path[OW_PATH_LEN + 16], *text = NULL;

		snprintf(path, sizeof path, "%s/spread.json", dir);
		st = ow_spread_save_json(s, sp->r, &text, &d);
		if (st == OW_OK)
			st = ow_io_write_file(path, text, strlen(text), &d);
		free(text);
	}
	return st == OW_OK ? CLI_OK : cli_fail(sp->cmd, st, &d);
}

int cli_spread_reload(struct ow_study *s, const struct ow_grid *g,
		      const struct ow_window *nominal, const char *dir,
		      struct cli_spread *sp)
{
	char path[OW_PATH_LEN + 16], *text = NULL;
	struct ow_diag d = {{0}};
	size_t len;
	enum ow_status st;

	sp->cmd = "report";
	snprintf(path, sizeof path, "%s/spread.json", dir);
	if (access(path, F_OK) != 0)
		return CLI_OK; /* a map without a spread */
	st = ow_io_read_file(path, (size_t)1 << 30, &text, &len, &d);
	if (st == OW_OK)
		st = ow_spread_load_json(text, path, g, &s->spread, &sp->r, &d);
	free(text);
	if (st == OW_OK)
		st = ow_spread_robust_grid(g, sp->r, &sp->robust, &d);
	if (st == OW_OK)
		st = ow_window_extract(s, sp->robust, &sp->w, &d);
	if (st == OW_OK)
		ow_spread_clip_window(sp->w, nominal);
	return st == OW_OK ? CLI_OK : cli_fail("report", st, &d);
}
