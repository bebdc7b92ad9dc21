/* spread.c - `opwin map` across a spread of inputs (see spread.h). */
#include "spread.h"

#include "cli.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void cli_spread_init(struct cli_spread *sp)
{
	memset(sp, 0, sizeof *sp);
	ow_spread_config_default(&sp->cfg);
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
		if (*end || !*arg || v != floor(v) || v < 0 || v > 4294967295.0)
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
		return snprintf(out, n,
		                "\"%.*s\":{\"from\":\"%.*s\",\"to\":"
		                "\"%s\"}",
		                len, item, (int)(dots - v), v,
		                dots + 2) < (int)n
		           ? 0
		           : -1;
	if (strncmp(v, "+-", 2) == 0)
		return snprintf(out, n, "\"%.*s\":{\"plus_minus\":\"%s\"}", len,
		                item, v + 2) < (int)n
		           ? 0
		           : -1;
	if (strncmp(v, "sd ", 3) == 0)
		return snprintf(out, n, "\"%.*s\":{\"sd\":\"%s\"}", len, item,
		                v + 3) < (int)n
		           ? 0
		           : -1;
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
		return cli_usage_error("map",
		                       "--samples, --seed and --level "
		                       "need a spread (the study's spread "
		                       "block or --spread)");
	if (!sp->spec)
		return CLI_OK;
	json = sp->spec[0] == '{' ? strdup(sp->spec) : short_json(sp->spec);
	if (!json)
		return cli_usage_error("map",
		                       "--spread takes the spread block "
		                       "as JSON or name=FROM..TO, name=+-W, "
		                       "name=sd W joined by commas");
	st = ow_config_spread_text(u, json, "--spread", s, &d);
	free(json);
	return st == OW_OK ? CLI_OK : cli_fail("map", st, &d);
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

void cli_spread_print(const struct ow_map *m, enum ow_unit_system units)
{
	const struct ow_study *s = m->study;
	const struct ow_spread_result *r = m->spread;
	const struct ow_window *w = m->robust;
	int i;

	if (!r)
		return;
	printf("Across the spread (%d input%s, %d samples a point, seed %lu):"
	       "\n",
	       s->spread.n, s->spread.n == 1 ? "" : "s", r->samples, r->seed);
	printf("  robust window (%.0f %% of samples safe)", 100.0 * r->level);
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
	       100.0 * w->safe_fraction, 100.0 * m->window->safe_fraction);
	for (i = 0; i < r->n_rank && i < 4; i++)
		printf("  %-26s moves the margins at the edge, r = %+.2f%s\n",
		       s->spread.in[r->rank[i].input].name, r->rank[i].corr,
		       r->rank[i].corr < 0 ? " (higher shrinks)"
		                           : " (lower shrinks)");
	printf("  %d sample solves, %d saved where every sample agrees\n",
	       r->solves, r->solves_saved);
}
