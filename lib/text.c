/* text.c - a growing text buffer for the CSV writers. */
#include "text_impl.h"

#include <stdlib.h>
#include <string.h>

#include "ow_results.h"

void ow_text_add(struct ow_text *t, const char *str)
{
	size_t n = strlen(str);

	if (t->oom)
		return;
	if (t->len + n + 1 > t->cap) {
		size_t cap = t->cap ? 2 * t->cap : 8192;
		char *nb;

		while (cap < t->len + n + 1)
			cap *= 2;
		nb = realloc(t->buf, cap);
		if (!nb) {
			t->oom = 1;
			return;
		}
		t->buf = nb;
		t->cap = cap;
	}
	memcpy(t->buf + t->len, str, n + 1);
	t->len += n;
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
	int n = ow_results_status_names(v, names, OW_CK_COUNT), k;

	ow_text_add(t, ",");
	for (k = 0; k < n; k++) {
		ow_text_add(t, k ? ";" : "");
		ow_text_add(t, names[k]);
	}
}

enum ow_status ow_text_done(struct ow_text *t, char **out, struct ow_diag *d)
{
	if (t->oom || !t->buf) {
		free(t->buf);
		*out = NULL;
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	*out = t->buf;
	return OW_OK;
}
