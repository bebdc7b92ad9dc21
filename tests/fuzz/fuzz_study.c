/* fuzz_study.c - libFuzzer target: the study loader (JSON, keys, units,
 * values, part files) on arbitrary bytes. The input is written to a file
 * of its own because the loader reads studies by path, in the folder
 * $OPWIN_FUZZ_DIR (make fuzz puts the corpus' part files around it:
 * parts/, ../screws/, ../resins/), else /tmp. Any input must give OW_OK or a
 * message, never a crash, a hang, a leak or undefined behaviour. */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <unistd.h>

#include "opwin.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	static struct ow_units *u;
	static struct ow_study study;
	static char path[1024];
	struct ow_diag d = {{0}};
	FILE *f;

	if (!u && ow_units_create(&u, NULL) != OW_OK)
		abort();
	if (!path[0]) {
		const char *dir = getenv("OPWIN_FUZZ_DIR");

		snprintf(path, sizeof path, "%s/input.%ld.json",
		         dir && *dir ? dir : "/tmp", (long)getpid());
	}
	f = fopen(path, "wb");
	if (!f || fwrite(data, 1, size, f) != size || fclose(f) != 0)
		abort();
	(void)ow_config_load_study(u, path, &study, &d);
	return 0;
}
