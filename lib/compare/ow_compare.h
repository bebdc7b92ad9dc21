/* ow_compare.h - two cases on one screw or one line (two resins, or a new
 * and a worn screw): both studies swept on the same lattice, each case's
 * window, the common window, where the two differ and why, the figures of
 * both cases at the common centre and at each case's own centre, and the
 * input fields that differ between the two studies.
 *
 * The common window is not a second algorithm: the two lattices are
 * combined point by point into one whose verdict is "unsafe if unsafe in A
 * or in B" (status bits OR-ed, signed margins min-ed), and the window
 * module extracts the largest safe rectangle and its robust centre from
 * that lattice exactly as it does for one study.
 *
 * Outputs: compare.json and compare.csv (lib/compare_out.c), the overlay
 * map and the comparison PDF (lib/compare_draw.c). */
#ifndef OW_COMPARE_H
#define OW_COMPARE_H

#include <stddef.h>

#include "ow_canvas.h"
#include "ow_study.h"
#include "ow_map.h"
#include "ow_plot.h"
#include "ow_solver.h"
#include "ow_sweep.h"
#include "ow_units.h"
#include "ow_window.h"

/* The two cases. */
enum { OW_CMP_A = 0, OW_CMP_B = 1 };

/* Where a lattice point is safe. */
enum ow_cmp_class {
	OW_CMP_NEITHER = 0,
	OW_CMP_A_ONLY = 1,
	OW_CMP_B_ONLY = 2,
	OW_CMP_BOTH = 3, /* (bit 0: safe in A, bit 1: safe in B) */
	OW_CMP_CLASSES
};

/* The points where the figures of both cases are put side by side. */
enum ow_cmp_at {
	OW_CMP_AT_COMMON, /* centre of the common window */
	OW_CMP_AT_A,      /* centre of case A's own window */
	OW_CMP_AT_B,      /* centre of case B's own window */
	OW_CMP_AT_COUNT
};

/* Both cases solved alone (as `opwin point` would) at one point of the
 * shared axes. */
struct ow_cmp_point {
	int valid;             /* 0: that window is empty: no point */
	double rpm;            /* rev/min */
	double axis;           /* barrel axis value (K or K difference) */
	double set_ref_K[2];   /* each case's reference zone set-point */
	struct ow_point pt[2]; /* [OW_CMP_A], [OW_CMP_B] */
	struct ow_verdict v[2];
};

struct ow_compare {
	const struct ow_study *study[2]; /* borrowed: must outlive this */
	/* each case's map: its lattice and window (ow_map_run without the
	 * centre solve or a spread: at[] holds both cases at the centres) */
	struct ow_map *map[2];
	/* The combined lattice, once with A's and once with B's figures
	 * (same verdicts, so the same rectangle and centre), and the common
	 * window extracted from each: common[k] carries case k's throughput
	 * and melt temperature ranges over the common rectangle. */
	struct ow_grid *common_grid[2];
	struct ow_window *common[2];
	/* 1: the cases' reference set-points differ (mode shift): they are
	 * aligned on the shift from each case's own set-points, the maps'
	 * vertical axis is that shift, and each case's set-point ranges are
	 * its own zones' (ow_compare_alignment says so in words). */
	int by_shift;
	unsigned char *cls;        /* [ia * n_rpm + ir]: ow_cmp_class */
	int n_rpm, n_axis;         /* lattice size */
	int count[OW_CMP_CLASSES]; /* lattice points per class */
	/* Where only A is safe, how many points fail each check in B (and
	 * the other way round): which limit costs which case its window. */
	int lost[2][OW_CK_COUNT]; /* [k]: safe only in k, fails in 1-k */
	struct ow_cmp_point at[OW_CMP_AT_COUNT];
};

/* Refuse two studies that cannot share one lattice: the screw speed
 * range and steps, the barrel axis mode, range and steps and the zone(s)
 * the axis drives (mode set: zones_from; mode zone: zone) must be equal.
 * Different set-points (two resins, each at its own) are accepted with
 * mode shift: the cases are then aligned on the shift from their own
 * set-points. Steps are not compared when the sweep config c overrides
 * them (--grid). OW_EINPUT with "<A file> and <B file>: <field> differs
 * (A: x, B: y): ..." naming the study field and what to change. */
enum ow_status ow_compare_check_axes(const struct ow_study *a,
                                     const struct ow_study *b,
                                     const struct ow_sweep_config *c,
                                     struct ow_diag *d);

/* Combine lattices a and b (same size) into *out: bits OR-ed, margins
 * min-ed (fmin: a limit set in one study only keeps that study's margin),
 * a point solved only when solved in both; rpm, axis and set-point from
 * a, figures from a (take_b 0) or b (take_b 1). Owned by the caller
 * (ow_grid_destroy). OW_EARG when the sizes differ. */
enum ow_status ow_compare_combine(const struct ow_grid *a,
                                  const struct ow_grid *b, int take_b,
                                  struct ow_grid **out, struct ow_diag *d);

/* A copy of study s whose limits are those of s and, where s sets none,
 * those of other: the limits the combined lattice is judged by (window
 * edges and boundaries). malloc'd; the caller frees it with free(). */
struct ow_study *ow_compare_merged_study(const struct ow_study *s,
                                         const struct ow_study *other);

/* Check the axes, sweep both studies with config c (its progress callback
 * sees both sweeps as one count: A's points, then B's), combine, extract the
 * three windows, classify every lattice point and solve both cases at the three
 * centres. *out owned by the caller (ow_compare_destroy); a and b must outlive
 * it. */
enum ow_status ow_compare_run(const struct ow_study *a,
                              const struct ow_study *b,
                              const struct ow_sweep_config *c,
                              struct ow_compare **out, struct ow_diag *d);
void ow_compare_destroy(struct ow_compare *cmp);

/* How the two cases share the barrel axis, in words, into buf: with equal
 * reference set-points "both cases at the same set-points"; aligned on
 * the shift, "each case at its own set-points shifted by the same amount
 * (A: zone 5 at 200 degC, B: 180 degC)" in system sys. Returns buf. */
char *ow_compare_alignment(const struct ow_compare *cmp,
                           enum ow_unit_system sys, char *buf, size_t n);

/* Class of lattice point (ir, ia). */
enum ow_cmp_class ow_compare_class_at(const struct ow_compare *cmp, int ir,
                                      int ia);

/* Key ("common_centre", "a_centre", "b_centre") and description of a
 * comparison point. */
const char *ow_compare_at_key(enum ow_cmp_at at);
const char *ow_compare_at_text(enum ow_cmp_at at);

/* The figures compared at the centres, in one order: indices into the
 * figures of ow_results_figure (output, discharge and highest pressure,
 * bulk temperature at discharge, peak temperature, unmelted fraction,
 * drive power, specific energy). */
int ow_compare_n_figures(void);
int ow_compare_figure_index(int i);
/* What figure i is in people's terms, and its dimension (OW_DIM_NONE
 * for the unmelted fraction). */
const char *ow_compare_figure_text(int i);
enum ow_dim ow_compare_figure_dim(int i);
/* Figure i of point pt as people read it in system sys (kg/h or lb/h,
 * MPa or psi, degC or degF, kW or hp, kWh/kg or hp h/lb; the unmelted
 * fraction in %), its unit label and the decimals to print it with. A
 * difference B - A of two shown values is a temperature difference in K
 * or degF (the offsets cancel). */
double ow_compare_figure_shown(const struct ow_study *s,
                               const struct ow_point *pt, int i,
                               enum ow_unit_system sys);
const char *ow_compare_figure_unit(int i, enum ow_unit_system sys);
int ow_compare_figure_decimals(int i, enum ow_unit_system sys);

/* One input field whose value differs between the two studies, both
 * values written with their units in the display system ("0.06 mm",
 * "0.5 mm"; "-" where a field does not exist in one study). */
struct ow_input_diff {
	char field[96]; /* "screw.wear[0].clearance", "resin.melt_density" */
	char a[264], b[264]; /* a title (256) fits whole */
};

/* Compare studies a and b field by field (title, screw geometry and
 * wear, resin data and viscosity model, feed, zones, screw root, die,
 * screen pack, limits, numerics) and write each differing field to
 * out[] (at most max); returns how many differ (may exceed max). */
int ow_compare_inputs(const struct ow_study *a, const struct ow_study *b,
                      enum ow_unit_system sys, struct ow_input_diff *out,
                      int max);

/* The same walk over every field (all 1: also those that are equal, for
 * echoing both inputs side by side; all 0: ow_compare_inputs). */
int ow_compare_fields(const struct ow_study *a, const struct ow_study *b,
                      enum ow_unit_system sys, int all,
                      struct ow_input_diff *out, int max);

/* ---- outputs (compare_out.c) ---- */

/* compare.json: "a" and "b" (each study's path and its window, keys as
 * window.json), "common" (the same keys over the combined lattice; its
 * throughput and melt temperature ranges span both cases, each case's
 * own under "common.a"/"common.b"), "differences" (lattice point counts
 * per class, binding limits per case, the limits that fail where only
 * one case is safe, the figures of A, B and B-A at the three centres)
 * and "inputs" (the differing input fields, SI display). malloc'd text. */
enum ow_status ow_compare_json(const struct ow_compare *cmp, char **out,
                               struct ow_diag *d);

/* compare.csv: one row per lattice point solved in both cases: rpm,
 * axis_value, set_C, then each figure of point --json for A and for B
 * side by side (<key>_a,<key>_b), status_a, status_b (names joined by
 * ';', empty when safe). malloc'd text. */
enum ow_status ow_compare_csv(const struct ow_compare *cmp, char **out,
                              struct ow_diag *d);

/* ---- drawing (compare_draw.c) ---- */

struct ow_compare_draw_options {
	enum ow_unit_system units; /* what people read */
	const char *label[2];      /* short case names ("A", "B"); NULL: A/B */
	double font_pt;            /* 0: 9 pt */
	const char *date;          /* PDF: "YYYY-MM-DD" (required there) */
	/* PDF title block, as the single report's: NULL or "" leaves a
	 * line to fill in by hand */
	const char *revision, *prepared_by, *approved_by;
	int paper; /* enum ow_paper; 0: A4 */
};

/* "lo–hi" of a window bound pair (already in display units) as the
 * single report prints its window: rounded towards the inside to
 * `decimals` places (OW_REPORT_RPM_DECIMALS, OW_REPORT_TEMP_DECIMALS),
 * one more while that would turn the range over; U+2212 minus, U+2013
 * dash. Returns buf. */
char *ow_compare_format_range(char *buf, size_t n, double lo, double hi,
                              int decimals);

/* Defaults: SI, labels "A" and "B", 9 pt, no date. */
void ow_compare_draw_default(struct ow_compare_draw_options *o);

/* The overlay map into box of cv: where only A, only B or both are safe
 * (tints and hatches), each case's window edge (its own colour, dash and
 * label), both recommended rectangles thinly, the common rectangle bold,
 * the three centres with distinct markers, and a legend. */
enum ow_status ow_compare_draw_overlay(struct ow_canvas *cv,
                                       const struct ow_rect *box,
                                       const struct ow_compare *cmp,
                                       const struct ow_compare_draw_options *o,
                                       struct ow_diag *d);

/* compare.png and compare.svg into the existing folder dir, atomically. */
enum ow_status ow_compare_write_maps(const struct ow_compare *cmp,
                                     const struct ow_compare_draw_options *o,
                                     const char *dir, struct ow_diag *d);

/* compare.pdf at pdf_path (built in memory, written atomically): title
 * block, both inputs echoed, the input fields that differ, the overlay
 * map, the windows and the comparison table at the centres, cautions.
 * OW_EARG without a date; OW_EIO naming the path or the missing font. */
enum ow_status ow_compare_write_pdf(const struct ow_compare *cmp,
                                    const struct ow_compare_draw_options *o,
                                    const char *pdf_path, struct ow_diag *d);

/* ---- the folder (compare_folder.c) ---- */

/* compare.json, compare.csv, compare.png, compare.svg and compare.pdf
 * into the existing folder dir, each atomically, in that order (a
 * failure stops there). Errors as the writers above give them. */
enum ow_status ow_compare_save(const struct ow_compare *cmp,
                               const struct ow_compare_draw_options *o,
                               const char *dir, struct ow_diag *d);

#endif
