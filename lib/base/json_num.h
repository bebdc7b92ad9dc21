/* json_num.h - numbers into cJSON documents, for every JSON writer: a
 * finite double as a number, NaN and the infinities as null (JSON has no
 * NaN). Not a public header (it names cJSON); it uses nothing of opwin. */
#ifndef OW_JSON_NUM_H
#define OW_JSON_NUM_H

#include <cjson/cJSON.h>

/* A new number item for v, or a null item when v is not finite; NULL when
 * out of memory. The caller owns it (or hands it to an array or object). */
cJSON *ow_json_num(double v);

/* Add key: v (number or null) to object o: 1 done, 0 out of memory. */
int ow_json_put_num(cJSON *o, const char *key, double v);

#endif
