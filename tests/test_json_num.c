/* test_json_num.c - numbers into JSON documents: JSON has no NaN and no
 * infinity (RFC 8259, section 6: "Numeric values that cannot be
 * represented in the grammar below (such as Infinity and NaN) are not
 * permitted"), so those become null; finite numbers stay numbers. */
#include "testutil.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "json_num.h"

static void finite_numbers_stay_numbers_and_the_rest_is_null(void **state)
{
	cJSON *o = cJSON_CreateObject();
	char *text;

	(void)state;
	assert_non_null(o);
	assert_int_equal(ow_json_put_num(o, "a", 0.25), 1);
	assert_int_equal(ow_json_put_num(o, "b", NAN), 1);
	assert_int_equal(ow_json_put_num(o, "c", -INFINITY), 1);
	text = cJSON_PrintUnformatted(o);
	assert_non_null(text);
	assert_string_equal(text, "{\"a\":0.25,\"b\":null,\"c\":null}");
	free(text);
	cJSON_Delete(o);
}

static void an_array_item_of_nan_is_null(void **state)
{
	cJSON *a = ow_json_num(NAN), *b = ow_json_num(-3.5);

	(void)state;
	assert_true(cJSON_IsNull(a));
	assert_true(cJSON_IsNumber(b));
	assert_true(b->valuedouble == -3.5);
	cJSON_Delete(a);
	cJSON_Delete(b);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(finite_numbers_stay_numbers_and_the_rest_is_null),
	    cmocka_unit_test(an_array_item_of_nan_is_null),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
