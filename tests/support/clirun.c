/* clirun.c - run the opwin binary for end-to-end tests. */
#include "clirun.h"
#include "testutil.h"

#include "ow_io.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

const char *cli_binary(void)
{
	const char *b = getenv("OPWIN");

	return b && *b ? b : "build/opwin";
}

char *cli_slurp(const char *path)
{
	char *buf = NULL;

	return ow_io_slurp(path, (size_t)1 << 30, &buf, NULL) == 0 ? buf : NULL;
}

void cli_run(const char *args, struct cli_result *r)
{
	char outp[] = "/tmp/opwin-test-outXXXXXX";
	char errp[] = "/tmp/opwin-test-errXXXXXX";
	int fo = mkstemp(outp), fe = mkstemp(errp), st;
	size_t n = strlen(args) + strlen(cli_binary()) + 2 * sizeof outp + 32;
	char *cmd = malloc(n);

	snprintf(cmd, n, "%s %s >%s 2>%s", cli_binary(), args, outp, errp);
	st = system(cmd);
	r->code = WIFEXITED(st) ? WEXITSTATUS(st) : -1;
	r->out = cli_slurp(outp);
	r->err = cli_slurp(errp);
	close(fo);
	close(fe);
	unlink(outp);
	unlink(errp);
	free(cmd);
}

void cli_result_free(struct cli_result *r)
{
	free(r->out);
	free(r->err);
	r->out = r->err = NULL;
}

cJSON *cli_run_json(const char *args)
{
	struct cli_result r;
	cJSON *j;

	cli_run(args, &r);
	if (r.code != 0)
		fprintf(stderr, "opwin %s: %s\n", args, r.err);
	assert_int_equal(r.code, 0);
	j = cJSON_Parse(r.out);
	assert_non_null(j);
	cli_result_free(&r);
	return j;
}

cJSON *cli_read_json(const char *path)
{
	char *text = cli_slurp(path);
	cJSON *j;

	assert_non_null(text);
	j = cJSON_Parse(text);
	free(text);
	assert_non_null(j);
	return j;
}

double cli_json_num(const cJSON *o, const char *key)
{
	const cJSON *v = cJSON_GetObjectItemCaseSensitive(o, key);

	if (!cJSON_IsNumber(v))
		fail_msg("key %s is not a number", key);
	return v->valuedouble;
}
