/* pngutil.c - PNG bytes to a cairo image surface for pixel checks. */
#include "pngutil.h"
#include "testutil.h"

#include <string.h>

struct reader {
	const unsigned char *b;
	size_t n, at;
};

static cairo_status_t read_fn(void *c, unsigned char *data, unsigned len)
{
	struct reader *r = c;

	if (r->at + len > r->n)
		return CAIRO_STATUS_READ_ERROR;
	memcpy(data, r->b + r->at, len);
	r->at += len;
	return CAIRO_STATUS_SUCCESS;
}

cairo_surface_t *ow_test_png_decode(const unsigned char *b, size_t n)
{
	struct reader r = {b, n, 0};
	cairo_surface_t *s =
	    cairo_image_surface_create_from_png_stream(read_fn, &r);

	assert_int_equal(cairo_surface_status(s), CAIRO_STATUS_SUCCESS);
	return s;
}
