/* ow_classify.h - an operating point against the line's limits: a status
 * bit per violated limit or unsafe flag, and a signed margin per limit
 * (positive inside, negative outside, zero on the boundary) so boundaries
 * can be placed between grid points by interpolation. */
#ifndef OW_CLASSIFY_H
#define OW_CLASSIFY_H

#include "ow_line.h"
#include "ow_solver.h"

/* One X-macro list of every check: status bit order, key in outputs, the
 * quantity or condition it judges in words, and its kind: MAX (a limit the
 * quantity must stay at or below), MIN (at or above) or FLAG (a condition
 * that is always unsafe). Every text people read is made from these by
 * one phrasing per kind (ow_check_failure, ow_check_relation). */
#define OW_CHECK_LIST(X)                                                       \
	X(OW_CK_PEAK_TEMP, "peak_temp", "peak melt temperature", MAX)          \
	X(OW_CK_UNMELT, "unmelt", "unmelted solids at discharge", MAX)         \
	X(OW_CK_PRESSURE, "pressure", "pressure on the screw", MAX)            \
	X(OW_CK_POWER, "power", "drive power", MAX)                            \
	X(OW_CK_TORQUE, "torque", "drive torque", MAX)                         \
	X(OW_CK_MIN_MELT_TEMP, "min_melt_temp",                                \
	  "melt temperature at discharge", MIN)                                \
	X(OW_CK_MIN_OUTPUT, "min_output", "throughput", MIN)                   \
	X(OW_CK_MAX_OUTPUT, "max_output", "throughput", MAX)                   \
	X(OW_CK_MAX_SBR, "max_sbr", "solid bed ratio", MAX)                    \
	X(OW_CK_ZONE_CONTROL, "zone_control",                                  \
	  "power a barrel zone needs to hold its set-point", MAX)              \
	X(OW_CK_PLUGGING, "plugging", "solid bed plugging", FLAG)              \
	X(OW_CK_FEED, "feed_limited", "starved feed", FLAG)                    \
	X(OW_CK_PARTIAL_FILL, "partial_fill",                                  \
	  "partial filling of the channel (pressure below zero)", FLAG)        \
	X(OW_CK_NOCONV, "not_converged", "non-convergence", FLAG)

/* The failure phrase of each kind, appended to the quantity's words. */
#define OW_CK_FAIL_MAX  " above its limit"
#define OW_CK_FAIL_MIN  " below its limit"
#define OW_CK_FAIL_FLAG ""

enum ow_check {
#define OW_CHECK_ENUM(id, key, text, kind) id,
	OW_CHECK_LIST(OW_CHECK_ENUM)
#undef OW_CHECK_ENUM
	    OW_CK_COUNT
};

/* Number of checks that are limits with margins (the first ones). */
#define OW_CK_LIMITS (OW_CK_ZONE_CONTROL + 1)

struct ow_verdict {
	unsigned bits;               /* 1u << check, for each violated */
	double margin[OW_CK_LIMITS]; /* NAN for limits not set */
};

/* Classify point pt against limits; screw_len_m is used by the unmelt
 * margin (where melting completes). */
void ow_classify(const struct ow_point *pt, const struct ow_limits *lim,
                 double screw_len_m, struct ow_verdict *v);

/* Key ("peak_temp") of a check, and what it judges in words ("peak melt
 * temperature", "throughput", "solid bed plugging"). */
const char *ow_check_key(enum ow_check c);

/* Names (ow_check_key) of the checks verdict v fails (violated limits and
 * unsafe flags) into names[]; returns the count (0: safe). */
int ow_classify_names(const struct ow_verdict *v, const char **names, int max);
const char *ow_check_text(enum ow_check c);

/* A point failing check c in words: "peak melt temperature above its
 * limit", "throughput below its limit", "solid bed plugging". */
const char *ow_check_failure(enum ow_check c);

/* How the quantity must relate to the limit: "at most" (MAX), "at least"
 * (MIN); NULL for a flag. A limit reads "<text> <relation> <value>". */
const char *ow_check_relation(enum ow_check c);

/* Is the limit of check c set in lim? (flags are always "set") */
int ow_check_active(const struct ow_limits *lim, enum ow_check c);

/* Value of the limit of check c in SI (NAN if not set or a flag). */
double ow_check_limit(const struct ow_limits *lim, enum ow_check c);

#endif
