/* text.c - a growing text buffer for the CSV writers. */
#include "text_impl.h"

#include <stdlib.h>
#include <string.h>

void ow_text_add(struct ow_text *t, const char *str)
{
	ow_buf_adds(&t->b, str);
}

void ow_text_num(struct ow_text *t, double x, int sep)
{
	char b[40];

	if (sep)
		ow_text_add(t, ",");
	ow_text_add(t, ow_fmt_double(b, sizeof b, x, 0));
}

void ow_text_status(struct ow_text *t, const struct ow_verdict *v)
{
	const char *names[OW_CK_COUNT];
	int n = ow_classify_names(v, names, OW_CK_COUNT), k;

	ow_text_add(t, ",");
	for (k = 0; k < n; k++) {
		ow_text_add(t, k ? ";" : "");
		ow_text_add(t, names[k]);
	}
}

enum ow_status ow_text_done(struct ow_text *t, char **out, struct ow_diag *d)
{
	return ow_buf_take(&t->b, out, NULL, d);
}
