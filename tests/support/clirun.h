/* clirun.h - run the built opwin (path in $OPWIN, default build/opwin)
 * from end-to-end tests and capture its output. */
#ifndef OW_CLIRUN_H
#define OW_CLIRUN_H

#include <cjson/cJSON.h>
#include <stddef.h>

struct cli_result {
	int code;  /* exit code, -1 if it did not exit normally */
	char *out; /* stdout, malloc'd, NUL-terminated */
	char *err; /* stderr, malloc'd */
};

/* Run `opwin <args>` (args is one shell-quoted string). */
void cli_run(const char *args, struct cli_result *r);
void cli_result_free(struct cli_result *r);

/* Path of the opwin binary under test. */
const char *cli_binary(void);

/* Read a whole file (malloc'd) or NULL. */
char *cli_slurp(const char *path);

/* `opwin <args>`, which must exit 0, its standard output parsed as JSON
 * (cJSON_Delete it); otherwise the test fails, after printing opwin's
 * standard error. */
cJSON *cli_run_json(const char *args);
/* The JSON file at path, parsed (cJSON_Delete it); the test fails when it
 * cannot be read or parsed. */
cJSON *cli_read_json(const char *path);
/* The number under key in object o; the test fails when it is not one. */
double cli_json_num(const cJSON *o, const char *key);

#endif
