/* pngutil.h - decode PNG bytes (from ow_canvas_encode) into a cairo image
 * surface so tests can read pixels. */
#ifndef OW_PNGUTIL_H
#define OW_PNGUTIL_H

#include <stddef.h>

#include <cairo.h>

/* Decode n bytes of PNG; fails the running test on a decoding error. The
 * caller destroys the surface. */
cairo_surface_t *ow_test_png_decode(const unsigned char *b, size_t n);

#endif
