/* common.c - option handling, study loading and error reporting shared by
 * the subcommands. */
#include "cli.h"

#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>

int cli_exit_code(enum ow_status st)
{
	switch (st) {
	case OW_OK:
		return CLI_OK;
	case OW_EINPUT:
		return CLI_INPUT;
	case OW_EARG:
		return CLI_USAGE;
	case OW_EIO:
		return CLI_OUTPUT;
	default:
		return CLI_COMPUTE;
	}
}

int cli_fail(const char *cmd, enum ow_status st, const struct ow_diag *d)
{
	fprintf(stderr, "opwin %s: %s\n", cmd,
	        d && d->msg[0] ? d->msg : ow_strerror(st));
	return cli_exit_code(st);
}

int cli_usage_error(const char *cmd, const char *msg)
{
	fprintf(stderr, "opwin %s: %s\nTry 'opwin %s --help'.\n", cmd, msg,
	        cmd);
	return CLI_USAGE;
}

void cli_version(void)
{
	printf("opwin %s\n", OW_VERSION);
}

int cli_common_option(const char *cmd, struct cli_common *c, int id,
                      const char *arg)
{
	char *end = NULL;
	long j;

	switch (id) {
	case 'u':
		if (ow_unit_system_parse(arg, &c->units) != OW_OK)
			return cli_usage_error(cmd, "--units takes si or us");
		return 0;
	case 'j':
		j = strtol(arg, &end, 10);
		if (!*arg || *end || j < 0 || j > 1024)
			return cli_usage_error(cmd, "--jobs takes a count "
			                            "0..1024 (0: all cores)");
		c->jobs = (int)j;
		return 0;
	case 'q':
		c->quiet = 1;
		return 0;
	default:
		return cli_usage_error(cmd, "unknown option");
	}
}

int cli_options(const struct cli_spec *sp, int argc, char **argv, void *ctx,
                struct cli_common *c, char ***args)
{
	int id, rc;

	optind = 1;
	while ((id = getopt_long(argc, argv, sp->shorts, sp->opts, NULL)) !=
	       -1) {
		if (id == 'h' || id == 'V') {
			id == 'h' ? sp->help() : cli_version();
			return CLI_OK;
		}
		rc = sp->option ? sp->option(ctx, id, optarg) : CLI_NOT_MINE;
		if (rc == CLI_NOT_MINE)
			rc = cli_common_option(sp->cmd, c, id, optarg);
		if (rc)
			return rc;
	}
	if (optind != argc - sp->n_args)
		return cli_usage_error(sp->cmd, sp->expects);
	*args = argv + optind;
	return CLI_GO_ON;
}

int cli_load_study(const char *cmd, const char *path, struct ow_units **u,
                   struct ow_study **study)
{
	struct ow_diag d = {{0}};
	int own = *u == NULL;
	enum ow_status st = own ? ow_units_create(u, &d) : OW_OK;

	*study = NULL;
	if (st != OW_OK)
		return cli_fail(cmd, st, &d);
	*study = calloc(1, sizeof **study);
	st = *study ? ow_config_load_study(*u, path, *study, &d) : OW_ENOMEM;
	if (st != OW_OK) {
		free(*study);
		*study = NULL;
		if (own) {
			ow_units_destroy(*u);
			*u = NULL;
		}
		return cli_fail(cmd, st, st == OW_ENOMEM ? NULL : &d);
	}
	return CLI_OK;
}

int cli_parse_grid(const char *s, int *n, int *m)
{
	char *end;
	long a = strtol(s, &end, 10), b;

	if (end == s || (*end != 'x' && *end != 'X'))
		return -1;
	b = strtol(end + 1, &end, 10);
	if (*end || a < 2 || b < 2 || a > 1000 || b > 1000)
		return -1;
	*n = (int)a;
	*m = (int)b;
	return 0;
}

/* Days in month m of year y, Gregorian calendar: a leap year is divisible
 * by 4, except centuries not divisible by 400 (ISO 8601:2004, 3.2.1). */
static int month_days(int y, int m)
{
	static const int days[12] = {31, 28, 31, 30, 31, 30,
	                             31, 31, 30, 31, 30, 31};
	int leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;

	return days[m - 1] + (m == 2 && leap);
}

int cli_valid_date(const char *s)
{
	int y, m, d, n = 0, i;

	for (i = 0; i < 10; i++) /* digits and dashes only: no signs, spaces */
		if (!s[i] ||
		    (i == 4 || i == 7 ? s[i] != '-' : s[i] < '0' || s[i] > '9'))
			return 0;
	return !s[10] && sscanf(s, "%4d-%2d-%2d%n", &y, &m, &d, &n) == 3 &&
	       n == 10 && y >= 1 && m >= 1 && m <= 12 && d >= 1 &&
	       d <= month_days(y, m);
}

void cli_today(char *buf, size_t n)
{
	const char *e = getenv("SOURCE_DATE_EPOCH");
	time_t t = e && *e ? (time_t)strtoll(e, NULL, 10) : time(NULL);
	struct tm tm;

	gmtime_r(&t, &tm);
	strftime(buf, n, "%Y-%m-%d", &tm);
}

void cli_make_parents(const char *dir)
{
	char p[OW_PATH_LEN];
	char *s;

	if (snprintf(p, sizeof p, "%s", dir) >= (int)sizeof p)
		return;
	for (s = p + 1; *s; s++)
		if (*s == '/') {
			*s = '\0';
			(void)mkdir(p, 0777);
			*s = '/';
		}
}

int cli_make_dir(const char *cmd, const char *dir)
{
	struct stat st;

	cli_make_parents(dir);
	if ((mkdir(dir, 0777) == 0 || errno == EEXIST) && stat(dir, &st) == 0 &&
	    S_ISDIR(st.st_mode))
		return CLI_OK;
	fprintf(stderr, "opwin %s: %s: cannot create the output folder: %s\n",
	        cmd, dir,
	        errno == EEXIST ? "a file has that name" : strerror(errno));
	return CLI_OUTPUT;
}

static double seconds_since(const struct timespec *t0)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)(t.tv_sec - t0->tv_sec) +
	       1e-9 * (double)(t.tv_nsec - t0->tv_nsec);
}

void cli_progress_start(struct cli_progress *p, const char *name)
{
	p->name = name;
	clock_gettime(CLOCK_MONOTONIC, &p->t0);
}

void cli_progress_show(void *ctx, int done, int total)
{
	const struct cli_progress *p = ctx;
	double t = seconds_since(&p->t0), rate = t > 0.0 ? done / t : 0.0;
	int width = 30, fill = total ? (int)((long)width * done / total) : 0;
	char bar[32];

	memset(bar, '#', (size_t)fill);
	memset(bar + fill, '.', (size_t)(width - fill));
	bar[width] = '\0';
	fprintf(stderr, "\r%s [%s] %d/%d points, %.0f/s, %.0f s left ", p->name,
	        bar, done, total, rate,
	        rate > 0.0 ? (total - done) / rate : 0.0);
	if (done >= total)
		fprintf(stderr, "\n");
}
