/* pdfutil.c - shell commands from tests, and PDFs read back with
 * poppler. */
#include "pdfutil.h"
#include "testutil.h"

#include "ow_io.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

char *ow_test_run(const char *cmd, int *rc)
{
	FILE *p = popen(cmd, "r");
	struct ow_buf b = {0};
	char chunk[4096], *out = NULL;
	size_t got;

	assert_non_null(p);
	while ((got = fread(chunk, 1, sizeof chunk, p)) > 0)
		ow_buf_add(&b, chunk, got);
	assert_int_equal(ow_buf_take(&b, &out, NULL, NULL), OW_OK);
	*rc = pclose(p);
	return out;
}

void ow_test_squeeze(char *s)
{
	char *o = s;
	int space = 0;

	for (; *s; s++) {
		if (*s == ' ' || *s == '\n' || *s == '\t' || *s == '\f') {
			space = 1;
			continue;
		}
		if (space && o != s)
			*o++ = ' ';
		space = 0;
		*o++ = *s;
	}
	*o = '\0';
}

char *ow_test_pdf_text(const char *pdf)
{
	char cmd[256], *t;
	int rc;

	snprintf(cmd, sizeof cmd, "pdftotext -q '%s' - 2>/dev/null", pdf);
	t = ow_test_run(cmd, &rc);
	assert_int_equal(rc, 0);
	ow_test_squeeze(t);
	return t;
}

int ow_test_pdf_pages(const char *pdf, char *size, size_t n)
{
	char cmd[256], *out, *p;
	int rc, pages = -1;

	snprintf(cmd, sizeof cmd, "pdfinfo '%s' 2>/dev/null", pdf);
	out = ow_test_run(cmd, &rc);
	assert_int_equal(rc, 0);
	p = strstr(out, "Pages:");
	assert_non_null(p);
	pages = atoi(p + 6);
	p = strstr(out, "Page size:");
	assert_non_null(p);
	snprintf(size, n, "%.*s", (int)strcspn(p + 10, "\n"), p + 10);
	ow_test_squeeze(size);
	free(out);
	return pages;
}
