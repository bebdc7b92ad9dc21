/* ow_advise.h - rules of thumb about a screw, as warnings an engineer reads
 * next to the derived data. Each is common practice, not a published limit,
 * and says so. */
#ifndef OW_ADVISE_H
#define OW_ADVISE_H

#include "ow_screw.h"

#define OW_MAX_WARNINGS 24

struct ow_warning {
	char code[32];  /* stable key: "abrupt_compression", "worn", ... */
	char text[256]; /* one sentence, units in mm and D */
};

/* Fill up to max warnings about screw s; returns how many. Rules (common
 * practice): compression spread over less than one diameter; radial
 * clearance above twice the usual new clearance of about 0.001 D (worn);
 * feed depth outside about 0.1..0.25 D; depth compression ratio outside
 * about 1.5..4.5. */
int ow_advise_screw(const struct ow_screw *s, struct ow_warning *out, int max);

#endif
