/* test_io_catalog.c - reading part catalogs: the example, and refusals
 * that point at the line and the field. */
#include "model/catalog.h"
#include "testkit.h"

#include <stdio.h>
#include <string.h>

static int load(const char *xml, br_catalog **out, br_error *err)
{
    br_error_clear(err);
    return br_catalog_load_memory(xml, strlen(xml), "test.xml", out, err);
}

/* The example catalog: twelve capacitors, eight diodes (and three
 * isolated supply modules), each with its
 * offer; parts read with the design file's rules (tolerances, bias
 * tables, forward points, recovery charge). */
static void test_example(void)
{
    br_catalog *cat;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(BR_SOURCE_DIR "/examples/parts/catalog.xml", &cat, &err),
                          BR_OK);
    CU_ASSERT_STRING_EQUAL(cat->name, "generic-stock");
    CU_ASSERT_EQUAL(cat->ncaps, 12);
    CU_ASSERT_EQUAL(cat->ndiodes, 8);
    CU_ASSERT_EQUAL(cat->nmodules, 3);
    CU_ASSERT_STRING_EQUAL(cat->caps[0].id, "x7r-1u0-25v");
    BR_ASSERT_NEAR(cat->caps[0].c.min, 0.9e-6, 1e-15);
    BR_ASSERT_NEAR(cat->cap_offer[0].cost, 0.012, 1e-12);
    BR_ASSERT_NEAR(cat->cap_offer[0].area, 1.6, 1e-12);
    CU_ASSERT_EQUAL(cat->caps[0].nbias, 3);
    CU_ASSERT_TRUE(cat->cap_offer[0].line > 0);
    int sic = -1, fast = -1;
    for (int i = 0; i < cat->ndiodes; i++) {
        sic = strcmp(cat->diodes[i].id, "sic-schottky-650v-1a") == 0 ? i : sic;
        fast = strcmp(cat->diodes[i].id, "fast-600v-1a") == 0 ? i : fast;
    }
    CU_ASSERT_TRUE_FATAL(sic >= 0 && fast >= 0);
    BR_ASSERT_NEAR(cat->diodes[sic].vrrm.nom, 650.0, 1e-9);
    CU_ASSERT_TRUE(cat->diodes[sic].is.nom > 0); /* fitted from its forward points */
    /* tau = qrr / if = 60 nC / 0.5 A (charge control, Lauritzen & Ma 1991) */
    BR_ASSERT_REL(cat->diodes[fast].tau.nom, 120e-9, 1e-12);
    BR_ASSERT_NEAR(cat->diode_offer[fast].cost, 0.045, 1e-12);
    /* the repetitive and I2t ratings of the inrush checks */
    BR_ASSERT_NEAR(cat->diodes[fast].ifrm.nom, 6.0, 1e-12);
    BR_ASSERT_NEAR(cat->diodes[fast].i2t.nom, 1.6, 1e-12);
    BR_ASSERT_NEAR(cat->diodes[sic].ifsm.nom, 12.0, 1e-12);
    br_catalog_free(cat);
}

static const char HEAD[] = "<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\">\n";

static void expect_fail(const char *body, int line, const char *field, const char *words)
{
    char xml[2048];
    snprintf(xml, sizeof xml, "%s%s</bootrung-catalog>\n", HEAD, body);
    br_catalog *cat = (br_catalog *)1;
    br_error err;
    CU_ASSERT_EQUAL(load(xml, &cat, &err), BR_EINPUT);
    CU_ASSERT_PTR_NULL(cat);
    CU_ASSERT_STRING_EQUAL(err.file, "test.xml");
    if (line)
        CU_ASSERT_EQUAL(err.line, line);
    if (field)
        CU_ASSERT_STRING_EQUAL(err.field, field);
    if (!strstr(err.msg, words))
        fprintf(stderr, "message was: %s\n", err.msg);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, words));
}

/* Each refusal names the file, the line, the field and what was expected. */
static void test_refusals(void)
{
    expect_fail("<capacitor id=\"c1\" c=\"1 uF\" rating=\"25 V\" cost=\"-1\" area-mm2=\"2\"/>\n", 3,
                "capacitor c1: cost", "expected a number from 0 to 1e12");
    /* out of every sane range, but not negative: the message says the range */
    expect_fail("<capacitor id=\"c1\" c=\"1 uF\" rating=\"25 V\" cost=\"1e307\" "
                "area-mm2=\"2\"/>\n",
                3, "capacitor c1: cost", "got '1e307', expected a number from 0 to 1e12");
    expect_fail("<capacitor id=\"c1\" c=\"1 uF\" rating=\"25 V\" area-mm2=\"2\"/>\n", 3, NULL,
                "catalog schema");
    expect_fail("<capacitor id=\"c1\" c=\"1 uF\" cost=\"1\" area-mm2=\"2\" colour=\"red\"/>\n", 3,
                NULL, "catalog schema");
    expect_fail("<diode id=\"d1\" vrrm=\"600 uF\" cost=\"1\" area-mm2=\"2\"/>\n", 3,
                "diode d1: vrrm", "expected a voltage");
    expect_fail("<capacitor id=\"c1\" c=\"1 uF\" cost=\"1\" area-mm2=\"2\"/>\n"
                "<diode id=\"c1\" cost=\"1\" area-mm2=\"2\"/>\n",
                4, "diode c1: id", "already the id of a capacitor");
    expect_fail("<driver id=\"x\"/>\n", 3, NULL, "catalog schema");
}

/* The switch catalog: three switches by voltage class, each naming its
 * driver, two drivers and four diodes, each with its offer. */
static void test_switches(void)
{
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(br_catalog_load(BR_SOURCE_DIR "/examples/parts/switches.xml", &cat, &err),
                          BR_OK);
    CU_ASSERT_EQUAL(cat->nswitches, 3);
    CU_ASSERT_EQUAL(cat->ndrivers, 2);
    CU_ASSERT_EQUAL(cat->ndiodes, 4);
    CU_ASSERT_EQUAL(cat->ncaps, 0);
    static const double rating[3] = {200.0, 400.0, 650.0};
    static const char *const driver[3] = {"iso-drv-basic", "iso-drv-basic", "iso-drv-reinf"};
    for (int i = 0; i < 3; i++) {
        BR_ASSERT_NEAR(cat->switch_rating[i], rating[i], 1e-9);
        CU_ASSERT_TRUE_FATAL(cat->switch_driver[i] >= 0);
        CU_ASSERT_STRING_EQUAL(cat->drivers[cat->switch_driver[i]].id, driver[i]);
    }
    CU_ASSERT_STRING_EQUAL(cat->switches[1].id, "gan-400v-g");
    BR_ASSERT_NEAR(cat->switch_offer[1].cost, 4.1, 1e-12);
    BR_ASSERT_NEAR(cat->switches[1].qg.nom, 9e-9, 1e-18);
    BR_ASSERT_NEAR(cat->driver_offer[1].cost, 1.6, 1e-12);
    BR_ASSERT_NEAR(cat->drivers[1].iq_on.nom, 1.6e-3, 1e-12);
    br_catalog_free(cat);
}

static void test_switch_refusals(void)
{
    expect_fail("<switch id=\"q1\" rating=\"200 V\" driver=\"nobody\" cost=\"1\" "
                "area-mm2=\"2\"/>\n",
                3, "switch q1: driver", "names no <driver> of this catalog");
    expect_fail("<switch id=\"q1\" rating=\"200 uF\" cost=\"1\" area-mm2=\"2\"/>\n", 3,
                "switch q1: rating", "expected a voltage");
    expect_fail("<switch id=\"q1\" cost=\"1\" area-mm2=\"2\"/>\n", 3, NULL, "catalog schema");
    expect_fail("<switch id=\"q1\" rating=\"0 V\" cost=\"1\" area-mm2=\"2\"/>\n", 3,
                "switch q1: rating", "above 0 V");
}

/* Isolated supply modules: the output as an injection's (voltage with
 * its tolerance, resistance, limit), the rated current, the offer. */
static void test_modules(void)
{
    br_catalog *cat = NULL;
    br_error err;
    CU_ASSERT_EQUAL_FATAL(
        br_catalog_load(BR_SOURCE_DIR "/tests/data/switches-modules.xml", &cat, &err), BR_OK);
    CU_ASSERT_EQUAL(cat->nswitches, 3);
    CU_ASSERT_EQUAL_FATAL(cat->nmodules, 4);
    CU_ASSERT_STRING_EQUAL(cat->module_id[0], "iso-15v-20ma");
    BR_ASSERT_NEAR(cat->modules[0].v.min, 14.25, 1e-12);
    BR_ASSERT_NEAR(cat->modules[0].v.max, 15.75, 1e-12);
    BR_ASSERT_NEAR(cat->modules[0].r.nom, 1.0, 1e-12);
    CU_ASSERT_EQUAL(cat->modules[0].limit_mode, BR_SUPPLY_CONSTANT);
    BR_ASSERT_NEAR(cat->module_rating[0], 20e-3, 1e-15);
    CU_ASSERT_EQUAL(cat->modules[1].limit_mode, BR_SUPPLY_UNLIMITED);
    CU_ASSERT_EQUAL(cat->modules[2].limit_mode, BR_SUPPLY_HICCUP);
    BR_ASSERT_NEAR(cat->modules[2].ilimit.min, 0.135, 1e-12);
    BR_ASSERT_NEAR(cat->modules[2].hiccup_off.nom, 20e-3, 1e-15);
    BR_ASSERT_NEAR(cat->module_offer[2].cost, 3.2, 1e-12);
    BR_ASSERT_NEAR(cat->module_offer[3].area, 120.0, 1e-12);
    br_catalog_free(cat);
}

static void test_module_refusals(void)
{
    expect_fail("<isolated-supply id=\"m1\" voltage=\"15\" rating=\"50 mA\" cost=\"1\" "
                "area-mm2=\"2\"/>\n",
                3, "isolated-supply m1: voltage", "without a unit");
    expect_fail("<isolated-supply id=\"m1\" voltage=\"15 V\" rating=\"0 A\" cost=\"1\" "
                "area-mm2=\"2\"/>\n",
                3, "isolated-supply m1: rating", "got '0 A', expected a value > 0");
    expect_fail("<isolated-supply id=\"m1\" voltage=\"15 V\" cost=\"1\" area-mm2=\"2\"/>\n", 3,
                NULL, "catalog schema");
    expect_fail("<isolated-supply id=\"m1\" voltage=\"15 V\" rating=\"50 mA\" "
                "current-limit=\"80 mA\" limit-mode=\"foldback\" cost=\"1\" area-mm2=\"2\"/>\n",
                3, "isolated-supply m1: foldback-current", "missing");
    expect_fail("<capacitor id=\"m1\" c=\"1 uF\" cost=\"1\" area-mm2=\"2\"/>\n"
                "<isolated-supply id=\"m1\" voltage=\"15 V\" rating=\"50 mA\" cost=\"1\" "
                "area-mm2=\"2\"/>\n",
                4, "isolated-supply m1: id", "already the id of a capacitor");
    expect_fail("<isolated-supply id=\"m1\" voltage=\"15 V\" rating=\"50 mA\" cost=\"1\" "
                "area-mm2=\"2\"/>\n"
                "<isolated-supply id=\"m1\" voltage=\"12 V\" rating=\"50 mA\" cost=\"1\" "
                "area-mm2=\"2\"/>\n",
                4, "isolated-supply m1: id", "already the id of an isolated-supply");
}

static void test_document_refusals(void)
{
    br_catalog *cat;
    br_error err;
    CU_ASSERT_EQUAL(load("<?xml version=\"1.0\"?>\n<!DOCTYPE x [<!ENTITY a \"b\">]>\n"
                         "<bootrung-catalog version=\"1\"/>\n",
                         &cat, &err),
                    BR_EINPUT);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "DOCTYPE"));
    CU_ASSERT_EQUAL(load("<bootrung-design version=\"1\"/>", &cat, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(load("<bootrung-catalog version=\"2\"><capacitor id=\"c\" c=\"1u\" cost=\"1\" "
                         "area-mm2=\"1\"/></bootrung-catalog>",
                         &cat, &err),
                    BR_EINPUT);
    CU_ASSERT_EQUAL(load("<bootrung-catalog", &cat, &err), BR_EINPUT);
    CU_ASSERT_PTR_NOT_NULL(strstr(err.msg, "well-formed"));
    CU_ASSERT_EQUAL(br_catalog_load_memory("", 0, "e.xml", &cat, &err), BR_EINPUT);
    CU_ASSERT_EQUAL(br_catalog_load("no/such/catalog.xml", &cat, &err), BR_EIO);
    CU_ASSERT_STRING_EQUAL(err.file, "no/such/catalog.xml");
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the example catalog", test_example},
        {"part refusals with line and field", test_refusals},
        {"document refusals", test_document_refusals},
        {"the switch catalog", test_switches},
        {"switch refusals with line and field", test_switch_refusals},
        {"isolated supply modules", test_modules},
        {"isolated supply refusals with line and field", test_module_refusals},
        {NULL, NULL},
    };
    return br_test_main("io_catalog", cases);
}
