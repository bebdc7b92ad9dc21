/* pdfutil.h - shell commands from tests, and PDFs read back with poppler
 * (pdftotext, pdfinfo). */
#ifndef OW_PDFUTIL_H
#define OW_PDFUTIL_H

#include <stddef.h>

/* Standard output of the shell command cmd (malloc'd, NUL-terminated,
 * any length); its pclose() status in *rc. */
char *ow_test_run(const char *cmd, int *rc);

/* Whitespace runs (newlines from table cells) -> one space, in place. */
void ow_test_squeeze(char *s);

/* The text of pdf (pdftotext), whitespace squeezed; malloc'd. Fails the
 * test when pdftotext fails. */
char *ow_test_pdf_text(const char *pdf);

/* Page count of pdf (pdfinfo); its page size ("595.276 x 841.89 pts
 * (A4)", squeezed) into size. Fails the test when pdfinfo fails. */
int ow_test_pdf_pages(const char *pdf, char *size, size_t n);

#endif
