/* test_api_catalog.c - the part catalog through the public API
 * (bootrung/parts.h): loading, the parts by role with their ids, costs,
 * areas and ratings as the example catalogs give them, and bad arguments
 * refused. */
#include "bootrung/bootrung.h"
#include "bootrung/parts.h"

#include "testkit.h"

#include <math.h>
#include <string.h>

static const char *const stock = "examples/parts/catalog.xml";
static const char *const switches = "examples/parts/switches.xml";

/* The first capacitor of examples/parts/catalog.xml, as written there:
 * x7r-1u0-25v, rating 25 V, cost 0.012, 1.6 mm2. */
static void test_stock(void)
{
    br_catalog *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(stock, &c, &err), BR_OK);
    const char *s = NULL;
    CU_ASSERT_EQUAL(br_catalog_name(c, &s), BR_OK);
    CU_ASSERT_STRING_EQUAL(s, "generic-stock");
    CU_ASSERT_EQUAL(br_catalog_path(c, &s), BR_OK);
    CU_ASSERT_STRING_EQUAL(s, stock);
    int ncap = -1, ndiode = -1, nsw = -1;
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_CAPACITOR, &ncap), BR_OK);
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_DIODE, &ndiode), BR_OK);
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_SWITCH, &nsw), BR_OK);
    /* its heading: twelve ceramic rail capacitors and eight link diodes */
    CU_ASSERT_EQUAL(ncap, 12);
    CU_ASSERT_EQUAL(ndiode, 8);
    CU_ASSERT_EQUAL(nsw, 0);
    CU_ASSERT_EQUAL(br_catalog_part_id(c, BR_CATALOG_CAPACITOR, 0, &s), BR_OK);
    CU_ASSERT_STRING_EQUAL(s, "x7r-1u0-25v");
    double v = 0;
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_CAPACITOR, 0, BR_OFFER_COST, &v), BR_OK);
    BR_ASSERT_REL(v, 0.012, 1e-12);
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_CAPACITOR, 0, BR_OFFER_AREA, &v), BR_OK);
    BR_ASSERT_REL(v, 1.6e-6, 1e-12); /* 1.6 mm2 in m2 */
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_CAPACITOR, 0, BR_OFFER_RATING, &v), BR_OK);
    BR_ASSERT_REL(v, 25.0, 1e-12);
    br_catalog_free(c);
}

/* examples/parts/switches.xml: gan-200v-g is rated 200 V; a driver has
 * no voltage rating (NaN). */
static void test_switches(void)
{
    br_catalog *c = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(switches, &c, &err), BR_OK);
    int n = 0;
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_SWITCH, &n), BR_OK);
    CU_ASSERT_TRUE_FATAL(n >= 3);
    const char *s = NULL;
    CU_ASSERT_EQUAL(br_catalog_part_id(c, BR_CATALOG_SWITCH, 0, &s), BR_OK);
    CU_ASSERT_STRING_EQUAL(s, "gan-200v-g");
    double v = 0;
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_SWITCH, 0, BR_OFFER_RATING, &v), BR_OK);
    BR_ASSERT_REL(v, 200.0, 1e-12);
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_DRIVER, &n), BR_OK);
    CU_ASSERT_TRUE_FATAL(n >= 1);
    CU_ASSERT_EQUAL(br_catalog_part_id(c, BR_CATALOG_DRIVER, 0, &s), BR_OK);
    CU_ASSERT_STRING_EQUAL(s, "iso-drv-basic");
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_DRIVER, 0, BR_OFFER_RATING, &v), BR_OK);
    CU_ASSERT_TRUE(isnan(v));
    br_catalog_free(c);
}

static void test_bad(void)
{
    br_catalog *c = (br_catalog *)&c; /* must come back NULL */
    br_error err;
    static const char junk[] = "<bootrung-catalog version=\"1\"><capacitor/></bootrung-catalog>";
    CU_ASSERT_EQUAL(br_catalog_load_memory(junk, strlen(junk), "junk.xml", &c, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_STRING_EQUAL(err.file, "junk.xml");
    CU_ASSERT_NOT_EQUAL(br_catalog_load("no/such/catalog.xml", &c, &err), BR_OK);
    CU_ASSERT_PTR_NULL(c);
    CU_ASSERT_TRUE(strstr(br_catalog_schema(), "bootrung-catalog") != NULL);
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(stock, &c, &err), BR_OK);
    int n;
    double v;
    const char *s;
    CU_ASSERT_EQUAL(br_catalog_parts(c, BR_CATALOG_ROLE_COUNT, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_catalog_parts(NULL, BR_CATALOG_DIODE, &n), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_catalog_part_id(c, BR_CATALOG_DIODE, 8, &s), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_catalog_part_id(c, BR_CATALOG_DIODE, -1, &s), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_catalog_part_value(c, BR_CATALOG_DIODE, 0, BR_OFFER_KEY_COUNT, &v),
                    BR_EUSAGE);
    CU_ASSERT_EQUAL(br_catalog_name(c, NULL), BR_EUSAGE);
    br_catalog_free(c);
    br_catalog_free(NULL);
}

int main(void)
{
    static const br_test_case cases[] = {{"the example stock", test_stock},
                                         {"switches and drivers", test_switches},
                                         {"bad input and bad arguments", test_bad},
                                         {NULL, NULL}};
    return br_test_main("api_catalog", cases);
}
