/* report_impl.h - inside the single-study report (not public): its state
 * (the document of doc_impl.h and the map it reports) and its sections. */
#ifndef OW_REPORT_IMPL_H
#define OW_REPORT_IMPL_H

#include "doc_impl.h"
#include "ow_classify.h"
#include "ow_map.h"
#include "ow_maps.h"
#include "ow_plot.h"
#include "ow_report.h"

struct rpt {
	struct ow_doc doc; /* the PDF being laid out */
	/* the map reported, and its study, lattice and window */
	const struct ow_map *m;
	const struct ow_study *s;
	const struct ow_grid *g;
	const struct ow_window *w;
	const struct ow_report_options *o;
};

/* A range lo..hi (SI) of dim in the report's units, rounded inwards to
 * decimals (more when that would empty it), and its centre (SI, NAN:
 * none) rounded to the same decimals. */
void ow_report_range(const struct rpt *r, enum ow_dim dim, double lo, double hi,
                     double centre, int decimals, char out[3][32]);

/* The source text of input key ("resin.melt_density"), or NULL; marks it
 * shown (shown[] has OW_MAX_SOURCES flags). */
const char *ow_report_source(const struct rpt *r, const char *key,
                             unsigned char *shown);

/* ---- the sections ---- */

void ow_report_front_page(struct rpt *r);   /* report_front.c */
void ow_report_map_pages(struct rpt *r);    /* report_pages.c */
void ow_report_profile_page(struct rpt *r); /* report_pages.c */
void ow_report_inputs(struct rpt *r);       /* report_inputs.c */
void ow_report_basis(struct rpt *r);        /* report_basis.c */
void ow_report_calib_page(struct rpt *r);   /* report_calib.c */
void ow_report_calib_note(struct rpt *r);   /* report_calib.c: front page */
void ow_report_spread_page(struct rpt *r);  /* report_spread.c */

/* The window-map options for the report's units and current point. */
void ow_report_map_options(const struct rpt *r, struct ow_maps_options *mo);
/* A map box h high at the current line, as wide as the map's aspect
 * allows, centred in the column. */
struct ow_rect ow_report_map_box(const struct rpt *r, double h);
/* "peak melt temperature ≤ 240 °C" for check c (a flag: "... (always
 * unsafe)"). */
char *ow_report_limit_text(struct rpt *r, enum ow_check c, char *buf, size_t n);
/* "zone 5" style name of the reference zone ("zone 5 (24–30 D)"). */
char *ow_report_zone_name(const struct rpt *r, int z, char *buf, size_t n);

#endif
