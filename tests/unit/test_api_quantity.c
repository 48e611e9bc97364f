/* test_api_quantity.c - quantities with units through the public API
 * (bootrung/report.h): the design file's rules, values worked out by hand
 * (SI prefixes: m = 1e-3, k = 1e3, u = 1e-6). */
#include "bootrung/bootrung.h"
#include "bootrung/parts.h"
#include "bootrung/report.h"

#include "testkit.h"

#include <string.h>

static void test_values(void)
{
    br_error err;
    double v = 0;
    CU_ASSERT_EQUAL(br_unit_parse("50 mV", BR_KIND_VOLTAGE, &v, &err), BR_OK);
    BR_ASSERT_REL(v, 0.05, 1e-12);
    CU_ASSERT_EQUAL(br_unit_parse("120k", BR_KIND_FREQUENCY, &v, &err), BR_OK);
    BR_ASSERT_REL(v, 120e3, 1e-12);
    CU_ASSERT_EQUAL(br_unit_parse("80 %", BR_KIND_FRACTION, &v, &err), BR_OK);
    BR_ASSERT_REL(v, 0.8, 1e-12);
    CU_ASSERT_EQUAL(br_unit_parse("4.7 uF", BR_KIND_CAPACITANCE, &v, &err), BR_OK);
    BR_ASSERT_REL(v, 4.7e-6, 1e-12);
    CU_ASSERT_EQUAL(br_unit_parse("25 C", BR_KIND_TEMPERATURE, &v, &err), BR_OK);
    BR_ASSERT_REL(v, 298.15, 1e-12); /* 25 degC in kelvin */
    CU_ASSERT_EQUAL(br_unit_parse("0", BR_KIND_TIME, &v, &err), BR_OK);
    CU_ASSERT_EQUAL(v, 0);
}

static void test_refused(void)
{
    br_error err;
    double v = 7;
    br_error_clear(&err);
    /* a bare number is refused for a voltage, and says what is expected */
    CU_ASSERT_EQUAL(br_unit_parse("-1", BR_KIND_VOLTAGE, &v, &err), BR_EINPUT);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "expected a voltage"));
    CU_ASSERT_EQUAL(v, 7); /* untouched */
    CU_ASSERT_EQUAL(br_unit_parse("5 A", BR_KIND_VOLTAGE, &v, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(br_unit_parse("12 V +-5%", BR_KIND_VOLTAGE, &v, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(br_unit_parse("1 V", BR_KIND_COUNT, &v, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_unit_parse("1 V", -1, &v, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_unit_parse(NULL, BR_KIND_VOLTAGE, &v, &err), BR_EINPUT); /* empty */
    CU_ASSERT_EQUAL(br_unit_parse("1 V", BR_KIND_VOLTAGE, NULL, &err), BR_EUSAGE);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"values by hand", test_values}, {"refused, with the reason", test_refused}, {NULL, NULL}};
    return br_test_main("api_quantity", cases);
}
