/* fitplot.c - the rheology fit as a PNG: data points and the fitted curve
 * per temperature on log-log axes (cairo, DejaVu Sans through FreeType so
 * the picture does not depend on the machine's font configuration). Small
 * and self-contained; a general plot module may take its place. */
#include "ow_fit.h"

#include <cairo-ft.h>
#include <cairo.h>
#include <ft2build.h>
#include FT_FREETYPE_H
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ow_results.h"

#ifndef OW_FONT_PATH
#define OW_FONT_PATH "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf"
#endif

#define OW_PI 3.14159265358979323846
#define IMG_W 1000
#define IMG_H 700
#define CURVE_STEPS 240

/* Plot area in pixels and its log10 data ranges. */
struct frame {
	double x, y, w, h;
	double lx0, lx1, ly0, ly1;
};

/* Colour-blind-safe qualitative palette (Okabe & Ito, Color Universal
 * Design, 2008), most distinct first. */
static const double palette[][3] = {
	{0.000, 0.447, 0.698}, {0.835, 0.369, 0.000}, {0.000, 0.620, 0.451},
	{0.800, 0.475, 0.655}, {0.902, 0.624, 0.000}, {0.337, 0.706, 0.914},
	{0.000, 0.000, 0.000}, {0.941, 0.894, 0.259}};
#define N_COLOURS (sizeof palette / sizeof palette[0])

struct ftfont {
	FT_Library lib;
	FT_Face face;
};

static const cairo_user_data_key_t font_key; /* its address is the key */

static void ftfont_free(void *p)
{
	struct ftfont *f = p;

	FT_Done_Face(f->face);
	FT_Done_FreeType(f->lib);
	free(f);
}

/* DejaVu Sans as a cairo font face that owns its FreeType face. */
static cairo_font_face_t *load_font(struct ow_diag *d)
{
	struct ftfont *f = calloc(1, sizeof *f);
	cairo_font_face_t *ff;

	if (!f || FT_Init_FreeType(&f->lib) != 0) {
		free(f);
		ow_diag_set(d, OW_EIO, "FreeType could not be started");
		return NULL;
	}
	if (FT_New_Face(f->lib, OW_FONT_PATH, 0, &f->face) != 0) {
		FT_Done_FreeType(f->lib);
		free(f);
		ow_diag_set(d, OW_EIO, "font %s is missing (Debian package "
			    "fonts-dejavu-core)", OW_FONT_PATH);
		return NULL;
	}
	ff = cairo_ft_font_face_create_for_ft_face(f->face, 0);
	if (cairo_font_face_set_user_data(ff, &font_key, f, ftfont_free) !=
	    CAIRO_STATUS_SUCCESS) {
		cairo_font_face_destroy(ff);
		ftfont_free(f);
		ow_diag_set(d, OW_EIO, "font could not be loaded");
		return NULL;
	}
	return ff;
}

static void set_font(cairo_t *cr, cairo_font_face_t *ff)
{
	cairo_font_options_t *o = cairo_font_options_create();

	cairo_font_options_set_hint_style(o, CAIRO_HINT_STYLE_NONE);
	cairo_font_options_set_hint_metrics(o, CAIRO_HINT_METRICS_OFF);
	cairo_font_options_set_antialias(o, CAIRO_ANTIALIAS_GRAY);
	cairo_set_font_options(cr, o);
	cairo_font_options_destroy(o);
	cairo_set_font_face(cr, ff);
}

/* Text with its anchor at (x, y): ax, ay in 0..1 (0.5 = centred). */
static void text_at(cairo_t *cr, double x, double y, double ax, double ay,
		    double size, double angle, const char *s)
{
	cairo_text_extents_t e;

	cairo_save(cr);
	cairo_set_font_size(cr, size);
	cairo_text_extents(cr, s, &e);
	cairo_translate(cr, x, y);
	cairo_rotate(cr, angle);
	cairo_move_to(cr, -ax * e.x_advance, ay * size * 0.72);
	cairo_show_text(cr, s);
	cairo_restore(cr);
}

static double px(const struct frame *f, double v)
{
	return f->x + (log10(v) - f->lx0) / (f->lx1 - f->lx0) * f->w;
}

static double py(const struct frame *f, double v)
{
	return f->y + f->h - (log10(v) - f->ly0) / (f->ly1 - f->ly0) * f->h;
}

/* "0.001" .. "100000" as plain numbers, else 10 with a superscript. */
static void decade_label(int k, char *buf, size_t len)
{
	static const char *sup[] = {"⁰", "¹", "²", "³", "⁴",
				    "⁵", "⁶", "⁷", "⁸", "⁹"};
	int a = abs(k);

	if (k >= -3 && k <= 5) {
		snprintf(buf, len, "%g", pow(10.0, k));
		return;
	}
	snprintf(buf, len, "10%s%s%s", k < 0 ? "⁻" : "",
		 a >= 10 ? sup[a / 10 % 10] : "", sup[a % 10]);
}

static void grid_and_ticks(cairo_t *cr, const struct frame *f, int xaxis)
{
	double lo = xaxis ? f->lx0 : f->ly0, hi = xaxis ? f->lx1 : f->ly1;
	int k, m;
	char buf[32];

	for (k = (int)floor(lo); k <= (int)ceil(hi); k++)
		for (m = 1; m <= 9; m++) {
			double v = m * pow(10.0, k), l = log10(v);

			if (l < lo - 1e-9 || l > hi + 1e-9)
				continue;
			cairo_set_source_rgb(cr, m == 1 ? 0.80 : 0.92,
					     m == 1 ? 0.80 : 0.92,
					     m == 1 ? 0.80 : 0.92);
			if (xaxis) {
				cairo_move_to(cr, px(f, v), f->y);
				cairo_line_to(cr, px(f, v), f->y + f->h);
			} else {
				cairo_move_to(cr, f->x, py(f, v));
				cairo_line_to(cr, f->x + f->w, py(f, v));
			}
			cairo_stroke(cr);
			if (m != 1)
				continue;
			decade_label(k, buf, sizeof buf);
			cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
			if (xaxis)
				text_at(cr, px(f, v), f->y + f->h + 20, 0.5,
					0.5, 15, 0, buf);
			else
				text_at(cr, f->x - 10, py(f, v), 1.0, 0.5, 15,
					0, buf);
		}
}

/* The band of shear rates screw channels and dies see, roughly 10..1000 1/s
 * (common practice), lightly shaded so gaps in the data show. */
static void rate_band(cairo_t *cr, const struct frame *f)
{
	double x0 = fmax(px(f, 10.0), f->x), x1 = fmin(px(f, 1000.0), f->x + f->w);

	if (x1 <= x0)
		return;
	cairo_set_source_rgb(cr, 0.985, 0.965, 0.90);
	cairo_rectangle(cr, x0, f->y, x1 - x0, f->h);
	cairo_fill(cr);
	cairo_set_source_rgb(cr, 0.55, 0.50, 0.40);
	text_at(cr, 0.5 * (x0 + x1), f->y + 14, 0.5, 0.5, 12, 0,
		"typical channel and die shear rates");
}

static void axes(cairo_t *cr, const struct frame *f, int cox_merz)
{
	rate_band(cr, f);
	cairo_set_line_width(cr, 1.0);
	grid_and_ticks(cr, f, 1);
	grid_and_ticks(cr, f, 0);
	cairo_set_source_rgb(cr, 0.2, 0.2, 0.2);
	cairo_rectangle(cr, f->x, f->y, f->w, f->h);
	cairo_stroke(cr);
	text_at(cr, f->x + f->w / 2, f->y + f->h + 52, 0.5, 0.5, 16, 0,
		cox_merz ? "shear rate, or angular frequency (Cox–Merz) (1/s)"
			 : "shear rate (1/s)");
	text_at(cr, f->x - 72, f->y + f->h / 2, 0.5, 0.5, 16, -OW_PI / 2,
		cox_merz ? "viscosity, or complex viscosity (Pa·s)"
			 : "viscosity (Pa·s)");
}

/* Marker shapes cycle with the temperature: circle, square, triangle,
 * diamond, inverted triangle. */
static void marker(cairo_t *cr, double x, double y, int shape)
{
	double r = 5.0;

	switch (shape % 5) {
	case 0:
		cairo_new_sub_path(cr);
		cairo_arc(cr, x, y, r, 0, 2 * OW_PI);
		break;
	case 1:
		cairo_rectangle(cr, x - r, y - r, 2 * r, 2 * r);
		break;
	case 2:
	case 4:
		r *= shape % 5 == 2 ? 1.2 : -1.2;
		cairo_move_to(cr, x, y - r);
		cairo_line_to(cr, x + 0.87 * r, y + 0.5 * r);
		cairo_line_to(cr, x - 0.87 * r, y + 0.5 * r);
		cairo_close_path(cr);
		break;
	default:
		r *= 1.3;
		cairo_move_to(cr, x, y - r);
		cairo_line_to(cr, x + r, y);
		cairo_line_to(cr, x, y + r);
		cairo_line_to(cr, x - r, y);
		cairo_close_path(cr);
	}
	cairo_fill(cr);
}

static void curve(cairo_t *cr, const struct frame *f,
		  const struct ow_viscosity *v, double T)
{
	int i;

	cairo_set_line_width(cr, 2.0);
	for (i = 0; i <= CURVE_STEPS; i++) {
		double l = f->lx0 + (f->lx1 - f->lx0) * i / CURVE_STEPS;
		double eta = ow_viscosity_eval(v, pow(10.0, l), T);

		if (!isfinite(eta) || eta <= 0)
			continue;
		if (i == 0)
			cairo_move_to(cr, px(f, pow(10.0, l)), py(f, eta));
		else
			cairo_line_to(cr, px(f, pow(10.0, l)), py(f, eta));
	}
	cairo_stroke(cr);
}

/* The temperature group of a point: the nearest fitted temperature. */
static int group_of(const struct ow_fit_result *fit, double T)
{
	int k, best = 0;

	for (k = 1; k < fit->n_temps; k++)
		if (fabs(fit->temps[k].temp_K - T) <
		    fabs(fit->temps[best].temp_K - T))
			best = k;
	return best;
}

/* Decade-aligned ranges around the data; the curves may extend the
 * viscosity range by at most one decade either way. */
static void ranges(const struct ow_fit_data *data,
		   const struct ow_fit_result *fit, struct frame *f)
{
	double x0 = INFINITY, x1 = 1e-300, y0 = INFINITY, y1 = 1e-300, c0, c1;
	size_t i;
	int k, e;

	for (i = 0; i < data->n; i++) {
		x0 = fmin(x0, data->points[i].shear_rate_1_s);
		x1 = fmax(x1, data->points[i].shear_rate_1_s);
		y0 = fmin(y0, data->points[i].viscosity_Pa_s);
		y1 = fmax(y1, data->points[i].viscosity_Pa_s);
	}
	f->lx0 = floor(log10(x0) - 0.15);
	f->lx1 = ceil(log10(x1) + 0.15);
	c0 = y0;
	c1 = y1;
	for (k = 0; k < fit->n_temps; k++)
		for (e = 0; e < 2; e++) {
			double eta = ow_viscosity_eval(
				&fit->visc, pow(10.0, e ? f->lx1 : f->lx0),
				fit->temps[k].temp_K);

			if (isfinite(eta) && eta > 0) {
				c0 = fmin(c0, fmax(eta, y0 / 10));
				c1 = fmax(c1, fmin(eta, y1 * 10));
			}
		}
	f->ly0 = floor(log10(c0) - 0.05);
	f->ly1 = ceil(log10(c1) + 0.05);
}

static void temp_label(enum ow_unit_system sys, double T, char *buf,
		       size_t len)
{
	double t = ow_display_value(sys, OW_DIM_TEMPERATURE, T);
	int whole = fabs(t - round(t)) < 0.05;

	snprintf(buf, len, "%.*f %s", whole ? 0 : 1, t,
		 ow_display_label(sys, OW_DIM_TEMPERATURE));
}

static void legend(cairo_t *cr, const struct frame *f,
		   const struct ow_fit_result *fit, enum ow_unit_system sys)
{
	double x = f->x + f->w + 24, y = f->y + 14;
	char buf[64];
	int k;

	cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
	text_at(cr, x, y, 0, 0.5, 15, 0, "temperature");
	for (k = 0; k < fit->n_temps; k++) {
		const double *c = palette[(size_t)k % N_COLOURS];

		y += 28;
		cairo_set_source_rgb(cr, c[0], c[1], c[2]);
		cairo_set_line_width(cr, 2.0);
		cairo_move_to(cr, x, y);
		cairo_line_to(cr, x + 36, y);
		cairo_stroke(cr);
		marker(cr, x + 18, y, k);
		temp_label(sys, fit->temps[k].temp_K, buf, sizeof buf);
		cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
		text_at(cr, x + 46, y, 0, 0.5, 15, 0, buf);
	}
	cairo_set_source_rgb(cr, 0.35, 0.35, 0.35);
	text_at(cr, x, y + 40, 0, 0.5, 13, 0, "markers: lab data");
	text_at(cr, x, y + 60, 0, 0.5, 13, 0, "lines: fitted model");
}

static void titles(cairo_t *cr, const struct ow_fit_data *data,
		   const struct ow_fit_result *fit, enum ow_unit_system sys)
{
	const char *base = strrchr(data->source, '/');
	char buf[400], t[64];

	base = base ? base + 1 : data->source;
	snprintf(buf, sizeof buf, "Viscosity fit to %s: %s model, %s shift",
		 base, ow_fit_model_name(fit->visc.model),
		 fit->visc.shift == OW_SHIFT_WLF ? "WLF" : "Arrhenius");
	cairo_set_source_rgb(cr, 0.05, 0.05, 0.05);
	text_at(cr, 100, 28, 0, 0.5, 19, 0, buf);
	temp_label(sys, fit->visc.ref_temp_K, t, sizeof t);
	snprintf(buf, sizeof buf, "RMS error %.4f in log10 viscosity (about "
		 "%.1f %%), %zu points; reference temperature %s",
		 fit->rms_log10, 100.0 * (pow(10.0, fit->rms_log10) - 1.0),
		 fit->n_points, t);
	cairo_set_source_rgb(cr, 0.3, 0.3, 0.3);
	text_at(cr, 100, 54, 0, 0.5, 14, 0, buf);
}

static void series(cairo_t *cr, const struct frame *f,
		   const struct ow_fit_data *data,
		   const struct ow_fit_result *fit)
{
	size_t i;
	int k;

	cairo_save(cr);
	cairo_rectangle(cr, f->x, f->y, f->w, f->h);
	cairo_clip(cr);
	for (k = 0; k < fit->n_temps; k++) {
		const double *c = palette[(size_t)k % N_COLOURS];

		cairo_set_source_rgb(cr, c[0], c[1], c[2]);
		curve(cr, f, &fit->visc, fit->temps[k].temp_K);
	}
	for (i = 0; i < data->n; i++) {
		const struct ow_fit_point *p = &data->points[i];
		int g = group_of(fit, p->temp_K);
		const double *c = palette[(size_t)g % N_COLOURS];

		cairo_set_source_rgb(cr, c[0], c[1], c[2]);
		marker(cr, px(f, p->shear_rate_1_s), py(f, p->viscosity_Pa_s),
		       g);
	}
	cairo_restore(cr);
}

/* PNG bytes gathered in memory, written to the file in one atomic step. */
struct png_buf {
	unsigned char *b;
	size_t len, cap;
};

static cairo_status_t png_write(void *closure, const unsigned char *data,
				unsigned int length)
{
	struct png_buf *p = closure;

	if (p->len + length > p->cap) {
		size_t cap = 2 * (p->len + length);
		unsigned char *nb = realloc(p->b, cap);

		if (!nb)
			return CAIRO_STATUS_NO_MEMORY;
		p->b = nb;
		p->cap = cap;
	}
	memcpy(p->b + p->len, data, length);
	p->len += length;
	return CAIRO_STATUS_SUCCESS;
}

static void draw(cairo_t *cr, const struct ow_fit_data *data,
		 const struct ow_fit_result *fit, enum ow_unit_system sys)
{
	struct frame f = {100, 80, IMG_W - 100 - 200, IMG_H - 80 - 90,
			  0, 0, 0, 0};

	ranges(data, fit, &f);
	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_paint(cr);
	titles(cr, data, fit, sys);
	axes(cr, &f, data->cox_merz);
	series(cr, &f, data, fit);
	legend(cr, &f, fit, sys);
}

enum ow_status ow_fit_plot_png(const struct ow_fit_data *data,
			       const struct ow_fit_result *fit,
			       enum ow_unit_system sys, const char *path,
			       struct ow_diag *d)
{
	cairo_font_face_t *ff = load_font(d);
	cairo_surface_t *s = NULL;
	cairo_t *cr = NULL;
	struct png_buf png = {NULL, 0, 0};
	enum ow_status st = OW_EIO;

	if (!ff)
		return OW_EIO;
	if (data->n == 0 || fit->n_temps == 0) {
		st = ow_diag_set(d, OW_EARG, "nothing to plot");
		goto fail;
	}
	s = cairo_image_surface_create(CAIRO_FORMAT_RGB24, IMG_W, IMG_H);
	cr = cairo_create(s);
	set_font(cr, ff);
	draw(cr, data, fit, sys);
	if (cairo_status(cr) != CAIRO_STATUS_SUCCESS ||
	    cairo_surface_write_to_png_stream(s, png_write, &png) !=
		    CAIRO_STATUS_SUCCESS) {
		ow_diag_set(d, OW_EIO, "%s: the plot could not be drawn: %s",
			    path, cairo_status_to_string(cairo_status(cr)));
		goto fail;
	}
	st = ow_results_write_file(path, (const char *)png.b, png.len, d);
fail:
	cairo_destroy(cr);
	cairo_surface_destroy(s);
	cairo_font_face_destroy(ff);
	free(png.b);
	return st;
}
