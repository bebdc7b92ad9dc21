/* testmap.h - a real map for tests of the map folder and the report:
 * demo/study-si.json swept on a small grid, its window and the profile
 * at the window's centre. */
#ifndef OW_TESTMAP_H
#define OW_TESTMAP_H

#include "opwin.h"

struct ow_test_map {
	struct ow_units *u;
	struct ow_study *s;
	struct ow_grid *g;
	struct ow_window *w;
	struct ow_point centre;      /* solved at the window's centre */
	struct ow_profile_row *rows; /* its profile along the screw */
	int n_rows;
	struct ow_map map; /* a view of all of the above */
};

/* Load the demo study, sweep it on rpm_steps x axis_steps with refine
 * levels of refinement, extract its window (which must not be empty) and
 * solve its centre. Fails the test on any error. */
void ow_test_map_make(struct ow_test_map *m, int rpm_steps, int axis_steps,
                      int refine);
void ow_test_map_free(struct ow_test_map *m);

#endif
