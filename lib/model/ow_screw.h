/* ow_screw.h - screw geometry: sections along the screw, depth, width and
 * clearance (with wear) at any axial position, helix angles, compression.
 *
 * Geometry of the unwound helical channel after Tadmor & Klein, Engineering
 * Principles of Plasticating Extrusion (1970), and Tadmor & Gogos, Principles
 * of Polymer Processing, 2nd ed. (2006), ch. 9:
 *   tan phi(D) = L_s / (pi D)
 *   W(D)       = (L_s / p) cos phi(D) - e     (e: flight land normal to flight)
 *   Z          = L / sin phi(D)               (down-channel length)
 * All lengths in metres; axial positions measured from the hopper end of the
 * first section. */
#ifndef OW_SCREW_H
#define OW_SCREW_H

#include "ow_status.h"

#define OW_MAX_SECTIONS 32
#define OW_MAX_WEAR     16

enum ow_section_type {
	OW_SEC_FEED,     /* constant depth, solids conveying */
	OW_SEC_TAPER,    /* depth linear from previous section's to its own */
	OW_SEC_METERING, /* constant depth */
	OW_SEC_BARRIER,  /* solids channel + melt channel, barrier flight */
	OW_SEC_MIXER,    /* short dispersive/distributive element */
};

struct ow_section {
	enum ow_section_type type;
	double length_m; /* axial length */
	double depth_m;  /* end depth (feed/metering: the depth) */
	/* mixer: gap over its barrier lands, and the number of barrier lands
	 * the melt can cross (0 in a file without it: ow_screw_prepare puts
	 * in the common-practice default of ow_screw_default_lands and
	 * clears lands_given) */
	double gap_m;
	int lands;
	int lands_given;
	/* barrier: both channels' depths at start and end, the melt channel's
	 * share of the total channel width at start and end (0..1), and the
	 * radial clearance over the barrier flight */
	double solids_depth_start_m, solids_depth_end_m;
	double melt_depth_start_m, melt_depth_end_m;
	double melt_share_start, melt_share_end;
	double barrier_clearance_m;
	/* derived by ow_screw_prepare */
	double start_m, end_m; /* axial extent */
	double depth_start_m;  /* depth at start (taper: previous depth) */
};

struct ow_wear {
	double from_m, to_m; /* axial extent of the worn flights */
	double clearance_m;  /* radial clearance there */
};

struct ow_screw {
	char name[128];
	double diameter_m;     /* barrel bore D_b */
	double lead_m;         /* axial advance per revolution L_s */
	int flights;           /* parallel flights p */
	double flight_width_m; /* land width e, normal to the flight */
	double clearance_m;    /* new radial clearance delta */
	int n_sections;
	struct ow_section sections[OW_MAX_SECTIONS];
	int n_wear;
	struct ow_wear wear[OW_MAX_WEAR];
};

/* Fill the derived fields (start_m, end_m, depth_start_m) and check the
 * geometry: depths positive and below the radius, clearance below the depth,
 * the flight land narrower than the lead, a first section with a depth, wear
 * inside the screw. Messages name the JSON path ("sections[2].depth"). */
enum ow_status ow_screw_prepare(struct ow_screw *s, struct ow_diag *d);

/* Total axial length in m, and in diameters. */
double ow_screw_length(const struct ow_screw *s);
double ow_screw_ld(const struct ow_screw *s);

/* Helix angle in rad at diameter dia_m. */
double ow_screw_helix(const struct ow_screw *s, double dia_m);

/* Channel width normal to the flights at diameter dia_m, m. */
double ow_screw_width(const struct ow_screw *s, double dia_m);

/* Index of the section holding axial position x_m (clamped to the screw). */
int ow_screw_section_at(const struct ow_screw *s, double x_m);

/* Channel depth at axial position x_m (for a barrier section: the solids
 * channel; for a mixer: its gap). */
double ow_screw_depth(const struct ow_screw *s, double x_m);

/* Radial flight clearance at x_m, the largest wear entry covering it or the
 * new clearance. */
double ow_screw_clearance(const struct ow_screw *s, double x_m);

/* Depth of the first (feed) and last conveying section, used by the
 * compression ratios below. */
double ow_screw_feed_depth(const struct ow_screw *s);
double ow_screw_meter_depth(const struct ow_screw *s);

/* Compression ratio as depth ratio H_f/H_m and as cross-section ratio
 * H_f (D_b - H_f) / (H_m (D_b - H_m)) (Tadmor & Gogos 2006, ch. 9). */
double ow_screw_compression_depth(const struct ow_screw *s);
double ow_screw_compression_area(const struct ow_screw *s);

/* Free channel cross-section normal to the axis at x_m, m^2:
 * A = pi H (D_b - H) - p e H / sin(phi_mean)  (Darnell & Mol, SPE J. 12
 * (1956) 20, in the Tadmor-Klein form); volume of one turn = A L_s. */
double ow_screw_free_area(const struct ow_screw *s, double x_m);

/* Name of a section type as written in screw files ("feed", "taper", ...). */
const char *ow_section_name(enum ow_section_type t);

/* Barrier lands of a fluted mixer on a barrel of diameter_m when the
 * screw file does not say: one per 25 mm of barrel circumference, at least
 * 2 (common practice; 8 on a 63.5 mm screw). */
int ow_screw_default_lands(double diameter_m);

#endif
