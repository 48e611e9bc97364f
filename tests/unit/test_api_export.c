/* test_api_export.c - the netlist and the chain's description through
 * the public API (bootrung/export.h): the text the internal renderer
 * writes, the defaults it picks, bad arguments refused. */
#include "bootrung/bootrung.h"
#include "bootrung/export.h"

#include "model/chain.h"
#include "report/caution.h"
#include "report/netlist.h"
#include "testkit.h"

#include <string.h>

static void open_demo(br_design **d, br_chain **c)
{
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_design_load("examples/demo-3level.xml", d, &err), BR_OK);
    CU_ASSERT_EQUAL_FATAL(br_chain_build(*d, c, &err), BR_OK);
}

/* Each direction and a period count: the renderer's text, byte for byte. */
static void test_same_text(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    open_demo(&d, &c);
    const int dirs[] = {BR_CURRENT_NONE, BR_CURRENT_STEP_DOWN, BR_CURRENT_STEP_UP};
    for (int i = 0; i < 3; i++) {
        br_text *a = br_text_create(), *b = br_text_create();
        br_error err;
        long used = 0;
        CU_ASSERT_EQUAL_FATAL(br_netlist_write(c, dirs[i], 7, a, &used, &err), BR_OK);
        CU_ASSERT_EQUAL(used, 7);
        br_netlist_opts o = {dirs[i], 7, br_version()};
        CU_ASSERT_EQUAL_FATAL(br_netlist_render(c, &o, b, &err), BR_OK);
        CU_ASSERT_TRUE(br_text_len(a) > 500);
        CU_ASSERT_STRING_EQUAL(br_text_data(a), br_text_data(b));
        br_text_free(a);
        br_text_free(b);
    }
    br_chain_free(c);
    br_design_free(d);
}

/* The defaults are the renderer's: the start-up limit in periods, and the
 * direction it picks for the design (the demo carries a load current). */
static void test_defaults_and_description(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    open_demo(&d, &c);
    br_text *a = br_text_create(), *b = br_text_create();
    br_error err;
    long used = 0;
    CU_ASSERT_EQUAL_FATAL(br_netlist_write(c, BR_CURRENT_DEFAULT, 0, a, &used, &err), BR_OK);
    CU_ASSERT_EQUAL(used, br_netlist_default_periods(c));
    br_netlist_opts o = {br_netlist_default_dir(c), used, br_version()};
    CU_ASSERT_EQUAL(o.dir, BR_CURRENT_STEP_DOWN);
    CU_ASSERT_EQUAL_FATAL(br_netlist_render(c, &o, b, &err), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(a), br_text_data(b));
    CU_ASSERT_EQUAL(br_chain_stages(c), 4);                   /* a 3-level leg: four switches */
    CU_ASSERT_DOUBLE_EQUAL(br_chain_period(c), 10e-6, 1e-15); /* 100 kHz */
    CU_ASSERT_STRING_EQUAL(br_chain_name(c), "demo-3level");
    br_text_reset(a);
    br_text_reset(b);
    CU_ASSERT_EQUAL(br_text_caution(a), BR_OK);
    CU_ASSERT_EQUAL(br_report_caution(b), BR_OK);
    CU_ASSERT_STRING_EQUAL(br_text_data(a), br_text_data(b));
    br_text_free(a);
    br_text_free(b);
    br_chain_free(c);
    br_design_free(d);
}

static void test_bad_arguments(void)
{
    br_design *d = NULL;
    br_chain *c = NULL;
    open_demo(&d, &c);
    br_text *t = br_text_create();
    br_error err;
    CU_ASSERT_EQUAL(br_netlist_write(NULL, BR_CURRENT_NONE, 1, t, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_netlist_write(c, BR_CURRENT_NONE, 1, NULL, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_netlist_write(c, 2, 1, t, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_netlist_write(c, -3, 1, t, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_netlist_write(c, BR_CURRENT_NONE, -1, t, NULL, &err), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_netlist_write(c, BR_CURRENT_NONE, BR_NETLIST_PERIODS_MAX + 1, t, NULL, &err),
                    BR_EUSAGE);
    CU_ASSERT_TRUE(strstr(err.msg, "periods") != NULL);
    CU_ASSERT_EQUAL(br_text_len(t), 0); /* nothing half-written */
    CU_ASSERT_EQUAL(br_text_caution(NULL), BR_EUSAGE);
    CU_ASSERT_EQUAL(br_chain_stages(NULL), 0);
    CU_ASSERT_TRUE(isnan(br_chain_period(NULL)));
    CU_ASSERT_STRING_EQUAL(br_chain_name(NULL), "");
    br_text_free(t);
    br_chain_free(c);
    br_design_free(d);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the renderer's text", test_same_text},
        {"defaults and the chain's description", test_defaults_and_description},
        {"bad arguments are refused", test_bad_arguments},
        {NULL, NULL}};
    return br_test_main("api_export", cases);
}
