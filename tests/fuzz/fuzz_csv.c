/* fuzz_csv.c - libFuzzer target: the lab table reader, from the CSV
 * cells (never cut, NUL refused) through the column units to the values
 * a fit takes. Any bytes must give a table or a message naming line and
 * column, never a crash or undefined behaviour. */
#include <stdint.h>
#include <stdlib.h>

#include "opwin.h"
#include "ow_csv.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	static struct ow_units *u;
	struct ow_fit_data *fd = NULL;
	struct ow_csv *c = NULL;
	struct ow_diag d = {{0}};

	if (!u && ow_units_create(&u, NULL) != OW_OK)
		abort();
	if (ow_csv_parse((const char *)data, size, "fuzz.csv", &c, &d) == OW_OK)
		(void)ow_csv_find(c, "viscosity", NULL, NULL);
	ow_csv_destroy(c);
	ow_diag_clear(&d);
	(void)ow_fit_data_parse(u, (const char *)data, size, "fuzz.csv", &fd,
	                        &d);
	ow_fit_data_destroy(fd);
	return 0;
}
