/* fuzz_units.c - libFuzzer target: the unit reader. The input, as text,
 * is read as a quantity of every dimension, as a bare number, and as a
 * power-law consistency's power of s. Any text must give a value or a
 * message, never a read outside its buffer (a 255-character unit once
 * did) or undefined behaviour. */
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "opwin.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	static struct ow_units *u;
	struct ow_diag d = {{0}};
	char *text = malloc(size + 1);
	double x, n;
	int dim;

	if (!u && ow_units_create(&u, NULL) != OW_OK)
		abort();
	if (!text)
		return 0;
	memcpy(text, data, size);
	text[size] = '\0';
	for (dim = 0; dim < OW_DIM_COUNT; dim++) {
		ow_diag_clear(&d);
		(void)ow_units_parse(u, text, (enum ow_dim)dim, 0.0635, &x, &d);
	}
	(void)ow_units_parse_number(text, &x, NULL);
	(void)ow_units_consistency_power(text, &n);
	free(text);
	return 0;
}
