/* solver_flags.c - names of the solver's point flags, as outputs print
 * them. */
#include "ow_solver.h"

#include <stddef.h>

static const struct {
	unsigned bit;
	const char *name;
} flag_names[] = {
    {OW_FLAG_FEED_LIMITED, "feed_limited"},
    {OW_FLAG_PLUGGING, "plugging"},
    {OW_FLAG_NOT_CONVERGED, "not_converged"},
    {OW_FLAG_BACKFLOW, "backflow"},
    {OW_FLAG_NO_MELTING, "no_melting"},
    {OW_FLAG_PARTIAL_FILL, "partial_fill"},
    {OW_FLAG_ZONE_FLOAT, "zone_floating"},
    {OW_FLAG_UNHEATED_MELT, "unheated_melt"},
};

int ow_solver_flag_names(unsigned flags, const char **names, int max)
{
	int n = 0;
	size_t i;

	for (i = 0; i < sizeof flag_names / sizeof flag_names[0]; i++)
		if ((flags & flag_names[i].bit) && n < max)
			names[n++] = flag_names[i].name;
	return n;
}
