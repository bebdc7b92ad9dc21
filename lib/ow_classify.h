/* ow_classify.h - an operating point against the line's limits: a status
 * bit per violated limit or unsafe flag, and a signed margin per limit
 * (positive inside, negative outside, zero on the boundary) so boundaries
 * can be placed between grid points by interpolation. */
#ifndef OW_CLASSIFY_H
#define OW_CLASSIFY_H

#include "ow_line.h"
#include "ow_solver.h"

/* One X-macro list of every check: status bit order, names in outputs. */
#define OW_CHECK_LIST(X)                                                 \
	X(OW_CK_PEAK_TEMP, "peak_temp", "peak melt temperature")         \
	X(OW_CK_UNMELT, "unmelt", "unmelted solids at discharge")        \
	X(OW_CK_PRESSURE, "pressure", "pressure on the screw")           \
	X(OW_CK_POWER, "power", "drive power")                           \
	X(OW_CK_TORQUE, "torque", "drive torque")                        \
	X(OW_CK_MIN_MELT_TEMP, "min_melt_temp", "melt temperature below " \
						"minimum")                       \
	X(OW_CK_MIN_OUTPUT, "min_output", "throughput below minimum")    \
	X(OW_CK_MAX_OUTPUT, "max_output", "throughput above maximum")    \
	X(OW_CK_MAX_SBR, "max_sbr", "solid bed ratio")                   \
	X(OW_CK_ZONE_CONTROL, "zone_control", "zone cannot hold set-point") \
	X(OW_CK_PLUGGING, "plugging", "solid bed plugging")              \
	X(OW_CK_FEED, "feed_limited", "feed-limited (starved)")          \
	X(OW_CK_PARTIAL_FILL, "partial_fill", "channel partly filled "   \
						"(pressure below zero)")         \
	X(OW_CK_NOCONV, "not_converged", "solution did not converge")

enum ow_check {
#define OW_CHECK_ENUM(id, key, text) id,
	OW_CHECK_LIST(OW_CHECK_ENUM)
#undef OW_CHECK_ENUM
	OW_CK_COUNT
};

/* Number of checks that are limits with margins (the first ones). */
#define OW_CK_LIMITS (OW_CK_ZONE_CONTROL + 1)

struct ow_verdict {
	unsigned bits;                /* 1u << check, for each violated */
	double margin[OW_CK_LIMITS];  /* NAN for limits not set */
};

/* Classify point pt against limits; screw_len_m is used by the unmelt
 * margin (where melting completes). */
void ow_classify(const struct ow_point *pt, const struct ow_limits *lim,
		 double screw_len_m, struct ow_verdict *v);

/* Key ("peak_temp") and description of a check. */
const char *ow_check_key(enum ow_check c);
const char *ow_check_text(enum ow_check c);

/* Is the limit of check c set in lim? (flags are always "set") */
int ow_check_active(const struct ow_limits *lim, enum ow_check c);

/* Value of the limit of check c in SI (NAN if not set or a flag). */
double ow_check_limit(const struct ow_limits *lim, enum ow_check c);

#endif
