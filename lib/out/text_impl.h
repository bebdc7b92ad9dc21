/* text_impl.h - a growing text buffer for the CSV writers (results and
 * compare modules). Not a public header. */
#ifndef OW_TEXT_IMPL_H
#define OW_TEXT_IMPL_H

#include <stddef.h>

#include "ow_classify.h"
#include "ow_io.h"
#include "ow_status.h"

struct ow_text {
	struct ow_buf b; /* after a failed allocation later adds do nothing */
};

/* Append str. */
void ow_text_add(struct ow_text *t, const char *str);

/* Append x round-trippably (empty for NaN), after a comma when sep. */
void ow_text_num(struct ow_text *t, double x, int sep);

/* Append ",name;name" for the checks verdict v fails (just "," if safe). */
void ow_text_status(struct ow_text *t, const struct ow_verdict *v);

/* Hand the text to *out (caller frees), or OW_ENOMEM. */
enum ow_status ow_text_done(struct ow_text *t, char **out, struct ow_diag *d);

#endif
