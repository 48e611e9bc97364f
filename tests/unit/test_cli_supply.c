/* test_cli_supply.c - the verb supply as a user meets it: its help
 * (golden), the report and the XML read back, quiet mode, the exit
 * status, and bad usage.  The numbers are the analysis' business
 * (test_analyses_supply). */
#include "runbin.h"
#include "testkit.h"

#include <libxml/parser.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

/* A small invented design without tolerances (so the nominal point is
 * its only corner): a 2-level leg on a supply with a bypass and a
 * constant-current limit. */
static const char DESIGN[] =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<bootrung-design version=\"1\" name=\"supply-test\">\n"
    "  <operating-point vin=\"400 V\" fsw=\"100 kHz\" duty=\"0.5\" dead-time=\"100 ns\"\n"
    "                   current=\"none\" edge-time=\"20 ns\"/>\n"
    "  <supply voltage=\"12 V\" resistance=\"0.1 ohm\" bypass=\"10 uF\" current-limit=\"200 "
    "mA\"/>\n"
    "  <topology><fcml levels=\"2\"/></topology>\n"
    "  <parts>\n"
    "    <diode id=\"d1\" is=\"10 nA\" n=\"1.2\" rs=\"0.2 ohm\" ref-temp=\"25 C\"/>\n"
    "    <capacitor id=\"c1\" c=\"2.2 uF\" esr=\"10 mohm\" rating=\"25 V\"/>\n"
    "    <driver id=\"g1\" uvlo-rise=\"8 V\" uvlo-fall=\"7.3 V\" iq-run=\"1.6 mA\"\n"
    "            iq-uvlo=\"0.4 mA\"/>\n"
    "    <switch id=\"s1\" qg=\"28 nC\" qg-at=\"10 V\" gate-pulse=\"30 ns\" vgs-max=\"20 "
    "V\"/>\n"
    "  </parts>\n"
    "  <stages diode=\"d1\" capacitor=\"c1\" driver=\"g1\" switch=\"s1\" link-resistor=\"2.2 "
    "ohm\"/>\n"
    "  <analysis max-startup=\"5 ms\"/>\n"
    "</bootrung-design>\n";

static int count(const char *s, const char *needle)
{
    int n = 0;
    for (const char *p = strstr(s, needle); p; p = strstr(p + 1, needle))
        n++;
    return n;
}

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("supply"));
}

/* The report answers the three questions, ends with its verdict and the
 * caution; the XML has the three answers and parses. */
static void test_report_and_xml(void)
{
    char dir[] = "/tmp/br-sup-XXXXXX", design[96], xml[96];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(design, sizeof design, "%s/d.xml", dir);
    snprintf(xml, sizeof xml, "%s/r.xml", dir);
    FILE *f = fopen(design, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs(DESIGN, f);
    fclose(f);
    run_result r = run((const char *[]){"supply", "--xml", xml, "--threads", "2", design, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "smallest current limit (from "));
    CU_ASSERT_TRUE(has(r.out, "lowest supply voltage (from 12 V down to 6 V"));
    CU_ASSERT_TRUE(has(r.out, "highest supply voltage (from 12 V up to 24 V"));
    CU_ASSERT_TRUE(has(r.out, "verdict: PASS at the design's own supply (12 V, current limit "
                              "200 mA)"));
    CU_ASSERT_TRUE(has(r.out, "lethal voltages"));
    done(&r);
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlFreeDoc(doc);
    char *text = br_test_slurp(xml, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_EQUAL(count(text, "<answer "), 3);
    CU_ASSERT_TRUE(has(text, "name=\"current-limit\""));
    CU_ASSERT_TRUE(has(text, "outcome=\"pass\""));
    free(text);
    r = run((const char *[]){"supply", "--quiet", design, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(strncmp(r.out, "verdict: PASS", 13) == 0);
    CU_ASSERT_EQUAL(count(r.out, "\n"), 1);
    done(&r);
    unlink(xml);
    unlink(design);
    rmdir(dir);
}

static void test_bad_usage(void)
{
    run_result r = run((const char *[]){"supply", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    done(&r);
    r = run((const char *[]){"supply", "--threads", "0", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
    r = run((const char *[]){"supply", "tests/bad/cap-zero.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "bootrung: tests/bad/cap-zero.xml:11: capacitor c1: c:"));
    done(&r);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"help is golden", test_help_golden},
        {"report and XML", test_report_and_xml},
        {"bad usage and input", test_bad_usage},
        {NULL, NULL},
    };
    return br_test_main("cli_supply", cases);
}
