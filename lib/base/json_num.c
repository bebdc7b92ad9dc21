/* json_num.c - numbers into cJSON documents (json_num.h). */
#include "json_num.h"

#include <math.h>

cJSON *ow_json_num(double v)
{
	return isfinite(v) ? cJSON_CreateNumber(v) : cJSON_CreateNull();
}

int ow_json_put_num(cJSON *o, const char *key, double v)
{
	cJSON *item = ow_json_num(v);

	if (item && cJSON_AddItemToObject(o, key, item))
		return 1;
	cJSON_Delete(item);
	return 0;
}
