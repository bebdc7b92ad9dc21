/* compare_folder.c - every file of `opwin compare -o DIR` written from a
 * comparison (ow_compare.h, ow_compare_save). */
#include "ow_compare.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_io.h"

/* text (malloc'd, freed here) into dir/name when st is OW_OK. */
static enum ow_status put(const char *dir, const char *name, char *text,
                          enum ow_status st, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32];

	if (st == OW_OK && text) {
		snprintf(path, sizeof path, "%s/%s", dir, name);
		st = ow_io_write_file(path, text, strlen(text), d);
	}
	free(text);
	return st;
}

enum ow_status ow_compare_save(const struct ow_compare *cmp,
                               const struct ow_compare_draw_options *o,
                               const char *dir, struct ow_diag *d)
{
	char *text = NULL, path[OW_PATH_LEN + 32];
	enum ow_status st;

	if (!cmp || !o || !dir)
		return ow_diag_set(d, OW_EARG,
		                   "ow_compare_save: NULL argument");
	st = ow_compare_json(cmp, &text, d);
	st = put(dir, "compare.json", text, st, d);
	if (st == OW_OK) {
		text = NULL;
		st = ow_compare_csv(cmp, &text, d);
		st = put(dir, "compare.csv", text, st, d);
	}
	if (st == OW_OK)
		st = ow_compare_write_maps(cmp, o, dir, d);
	snprintf(path, sizeof path, "%s/compare.pdf", dir);
	if (st == OW_OK)
		st = ow_compare_write_pdf(cmp, o, path, d);
	return st;
}
