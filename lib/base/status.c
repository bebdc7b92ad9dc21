/* status.c - status texts and the first-failure diagnostic buffer. */
#include "ow_status.h"

#include <stdarg.h>
#include <stdio.h>

static const char *const status_text[] = {
#define OW_STATUS_TEXT(name, text) text,
    OW_STATUS_LIST(OW_STATUS_TEXT)
#undef OW_STATUS_TEXT
};

const char *ow_strerror(enum ow_status st)
{
	if ((int)st < 0 || st >= OW_STATUS_COUNT)
		return "unknown status";
	return status_text[st];
}

enum ow_status ow_diag_set(struct ow_diag *d, enum ow_status st,
                           const char *fmt, ...)
{
	va_list ap;

	if (!d || d->msg[0])
		return st; /* keep the first failure: it is the cause */
	va_start(ap, fmt);
	vsnprintf(d->msg, sizeof d->msg, fmt, ap);
	va_end(ap);
	return st;
}

void ow_diag_clear(struct ow_diag *d)
{
	if (d)
		d->msg[0] = '\0';
}
