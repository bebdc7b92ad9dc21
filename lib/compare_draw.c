/* compare_draw.c - placeholder while the drawing is written. */
#include "ow_compare.h"

void ow_compare_draw_default(struct ow_compare_draw_options *o)
{
	o->units = OW_SYS_SI;
	o->label[0] = "A";
	o->label[1] = "B";
	o->font_pt = 0.0;
	o->date = NULL;
}

enum ow_status ow_compare_write_maps(const struct ow_compare *cmp,
				     const struct ow_compare_draw_options *o,
				     const char *dir, struct ow_diag *d)
{
	(void)cmp; (void)o; (void)dir; (void)d;
	return OW_OK;
}

enum ow_status ow_compare_write_pdf(const struct ow_compare *cmp,
				    const struct ow_compare_draw_options *o,
				    const char *pdf_path, struct ow_diag *d)
{
	(void)cmp; (void)o; (void)pdf_path; (void)d;
	return OW_OK;
}
