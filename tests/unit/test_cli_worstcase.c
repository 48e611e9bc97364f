/* test_cli_worstcase.c - corners, yield and pick as a user meets them:
 * exit statuses, the reports' rows, the XML and CSV files, the same
 * numbers whatever the thread count, bad input, and the help texts.
 * Figures move as the engine is tuned, so the checks are structural. */
#include "analyses/figures.h"
#include "runbin.h"
#include "testkit.h"

#include <fcntl.h>
#include <libxml/parser.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

#define DEMO "examples/demo-3level.xml"

/* Exactly one line on stderr, starting with prefix. */
static void one_line(const run_result *r, const char *prefix)
{
    size_t n = strlen(r->err);
    CU_ASSERT_TRUE(n > 0 && r->err[n - 1] == '\n' && strchr(r->err, '\n') == r->err + n - 1);
    if (strncmp(r->err, prefix, strlen(prefix)) != 0)
        fprintf(stderr, "stderr was [%s], expected it to start [%s]\n", r->err, prefix);
    CU_ASSERT_EQUAL(strncmp(r->err, prefix, strlen(prefix)), 0);
}

static int count_elements(xmlNode *n, const char *name)
{
    int k = 0;
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            k++;
        k += count_elements(n->children, name);
    }
    return k;
}

static int count_lines(const char *s)
{
    int n = 0;
    for (; *s; s++)
        n += *s == '\n';
    return n;
}

/* ---- corners ------------------------------------------------------------- */

/* The demo fails its minimum drive already at the nominal point: status 1,
 * every criterion listed, the method and the corner table stated. */
static void test_corners_report(void)
{
    run_result r = run((const char *[]){"corners", DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_STRING_EQUAL(r.err, "");
    CU_ASSERT_TRUE(has(r.out, "worst-case corners of design demo-3level"));
    CU_ASSERT_TRUE(has(r.out, "supply: voltage"));
    CU_ASSERT_TRUE(has(r.out, "method, steady-state criteria: every corner of the 3 parameters"));
    CU_ASSERT_TRUE(has(r.out, "method, start-up criteria: every corner (8)"));
    for (int c = 0; c < BR_CRIT_COUNT; c++)
        CU_ASSERT_TRUE(has(r.out, br_crit_name(c)));
    CU_ASSERT_TRUE(has(r.out, "verdict at the worst corners: FAIL"));
    CU_ASSERT_TRUE(has(r.out, "corners (the limit each parameter takes"));
    CU_ASSERT_TRUE(has(r.out, "These circuits carry lethal voltages."));
    done(&r);
}

/* The XML document parses and holds every criterion and parameter. */
static void test_corners_xml(void)
{
    run_result r = run((const char *[]){"corners", "--no-startup", "--xml", "-", DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "corners.xml", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    CU_ASSERT_STRING_EQUAL((const char *)root->name, "bootrung-results");
    xmlChar *verb = xmlGetProp(root, BAD_CAST "verb");
    CU_ASSERT_STRING_EQUAL((const char *)verb, "corners");
    xmlFree(verb);
    CU_ASSERT_EQUAL(count_elements(root, "criterion"), BR_CRIT_COUNT);
    CU_ASSERT_EQUAL(count_elements(root, "parameter"), 3);
    CU_ASSERT_TRUE(count_elements(root, "corner") >= 1);
    CU_ASSERT_EQUAL(count_elements(root, "caution"), 1);
    xmlFreeDoc(doc);
    done(&r);
}

/* ---- yield ----------------------------------------------------------------- */

/* Same seed, one thread or two: the same report, byte for byte. */
static void test_yield_threads(void)
{
    run_result a = run(
        (const char *[]){"yield", "--samples", "40", "--seed", "5", "--threads", "1", DEMO, NULL});
    run_result b = run(
        (const char *[]){"yield", "--samples", "40", "--seed", "5", "--threads", "2", DEMO, NULL});
    CU_ASSERT_EQUAL(a.status, 1); /* the demo fails its minimum drive in most samples */
    CU_ASSERT_EQUAL(b.status, 1);
    CU_ASSERT_STRING_EQUAL(a.out, b.out);
    CU_ASSERT_TRUE(has(a.out, "40 samples from seed 5"));
    CU_ASSERT_TRUE(has(a.out, "Clopper-Pearson"));
    CU_ASSERT_TRUE(has(a.out, "what moves the margins"));
    CU_ASSERT_TRUE(has(a.out, "These circuits carry lethal voltages."));
    CU_ASSERT_STRING_EQUAL(a.err, "");
    done(&a);
    done(&b);
}

/* The CSV file: a header and one row per sample; --min-yield judges the
 * lower confidence bound. */
static void test_yield_files(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", csv[64], xml[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(csv, sizeof csv, "%s/y.csv", dir);
    snprintf(xml, sizeof xml, "%s/y.xml", dir);
    run_result r = run((const char *[]){"yield", "--samples", "30", "--min-yield", "1%", "--csv",
                                        csv, "--xml", xml, DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    char *c = br_test_slurp(csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    CU_ASSERT_EQUAL(strncmp(c, "sample,pass,\"supply: voltage\"", 29), 0);
    CU_ASSERT_EQUAL(count_lines(c), 31);
    CU_ASSERT_TRUE(has(c, "margin_drive_V"));
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    CU_ASSERT_EQUAL(count_elements(xmlDocGetRootElement(doc), "yield"), 1);
    xmlFreeDoc(doc);
    free(c);
    unlink(csv);
    unlink(xml);
    rmdir(dir);
    done(&r);
    /* a minimum of 0 is a minimum like any other (every lower bound meets
     * it), not the absence of one, which would ask every sample to pass */
    r = run((const char *[]){"yield", "--samples", "20", "--min-yield", "0", DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "is at or above the minimum 0 %"));
    done(&r);
}

/* ---- pick --------------------------------------------------------------------- */

static const char CATALOG[] =
    "<?xml version=\"1.0\"?>\n"
    "<bootrung-catalog version=\"1\" name=\"tiny\">\n"
    "  <capacitor id=\"cap-2u2\" c=\"2.2 uF +-10%\" rating=\"25 V\" cost=\"0.02\" "
    "area-mm2=\"2\"/>\n"
    "  <capacitor id=\"cap-6v3\" c=\"10 uF\" rating=\"6.3 V\" cost=\"0.01\" area-mm2=\"2\"/>\n"
    "</bootrung-catalog>\n";

static void write_file(const char *path, const char *text)
{
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs(text, f);
    fclose(f);
}

/* The demo's Zener-clamped rails sit below its minimum drive whatever
 * capacitor they get: no choice passes (status 1); the low-voltage part
 * is rejected for its rating. */
static void test_pick(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", cat[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(cat, sizeof cat, "%s/c.xml", dir);
    write_file(cat, CATALOG);
    run_result r = run((const char *[]){"pick", "--catalog", cat, DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_STRING_EQUAL(r.err, "");
    CU_ASSERT_TRUE(has(r.out, "part pick of design demo-3level"));
    CU_ASSERT_TRUE(has(r.out, "cap-6v3 (capacitor): rated 6.3 V, below the supply's maximum"));
    CU_ASSERT_TRUE(has(r.out, "cap-2u2 (capacitor): on every rail: fails drive"));
    CU_ASSERT_TRUE(has(r.out, "no choice passes"));
    CU_ASSERT_TRUE(has(r.out, "These circuits carry lethal voltages."));
    done(&r);
    /* a broken catalog: one line naming the catalog, its line and field */
    write_file(cat, "<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\">\n"
                    "<capacitor id=\"c\" c=\"1 uF\" cost=\"cheap\" area-mm2=\"2\"/>\n"
                    "</bootrung-catalog>\n");
    r = run((const char *[]){"pick", "--catalog", cat, DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    char prefix[128];
    snprintf(prefix, sizeof prefix, "bootrung: %s:3: capacitor c: cost:", cat);
    one_line(&r, prefix);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
    unlink(cat);
    rmdir(dir);
}

/* ---- bad input and help ---------------------------------------------------------- */

static void test_bad_input(void)
{
    static const char *const cases[][8] = {
        {"pick", DEMO, NULL},
        {"yield", "--samples", "0", DEMO, NULL},
        {"yield", "--seed", "x", DEMO, NULL},
        {"yield", "--min-yield", "1.5", DEMO, NULL},
        {"corners", "--exhaustive", "20", DEMO, NULL},
        {"corners", "--threads", "0", DEMO, NULL},
        {"yield", "--xml", "-", "--csv", "-", DEMO, NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        run_result r = run(cases[i]);
        CU_ASSERT_EQUAL(r.status, 2);
        one_line(&r, "bootrung: ");
        CU_ASSERT_STRING_EQUAL(r.out, "");
        done(&r);
    }
    run_result r = run((const char *[]){"corners", "no/such/design.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    one_line(&r, "bootrung: no/such/design.xml");
    done(&r);
    /* a file that cannot be written: status 2 and no report */
    r = run(
        (const char *[]){"yield", "--samples", "5", "--csv", "/nonexistent-dir/y.csv", DEMO, NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

static int same_as_golden(const char *golden, const char *got)
{
    char *want = br_test_slurp(golden, NULL);
    int same = want && strcmp(want, got) == 0;
    if (!same)
        fprintf(stderr, "%s: output differs or is missing (see tests/golden/update.sh)\n", golden);
    free(want);
    return same;
}

static void test_help_golden(void)
{
    static const char *const verbs[] = {"corners", "yield", "pick"};
    for (int i = 0; i < 3; i++) {
        run_result r = run((const char *[]){verbs[i], "--help", NULL});
        char golden[64];
        snprintf(golden, sizeof golden, "tests/golden/%s-help.txt", verbs[i]);
        CU_ASSERT_EQUAL(r.status, 0);
        CU_ASSERT_TRUE(same_as_golden(golden, r.out));
        done(&r);
    }
}

int main(void)
{
    static const br_test_case cases[] = {
        {"corners: the report", test_corners_report},
        {"corners: the XML document", test_corners_xml},
        {"yield: same seed, 1 or 2 threads, same report", test_yield_threads},
        {"yield: CSV and XML files, --min-yield", test_yield_files},
        {"pick: rejections, no passing choice, a broken catalog", test_pick},
        {"bad input: status 2, one line", test_bad_input},
        {"help texts", test_help_golden},
        {NULL, NULL},
    };
    return br_test_main("cli_worstcase", cases);
}
