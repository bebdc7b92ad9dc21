/* map_impl.h - inside the map module (not public): what the run
 * (map.c) shares with reading a map folder back (map_folder.c). */
#ifndef OW_MAP_IMPL_H
#define OW_MAP_IMPL_H

#include "ow_map.h"

/* m->robust_grid and m->robust from m->spread: the points safe in too
 * few samples marked unsafe (ow_spread_robust_grid), the window of that
 * lattice clipped to the nominal window m->window. */
enum ow_status ow_map_robust(struct ow_map *m, struct ow_diag *d);

#endif
