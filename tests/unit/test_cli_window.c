/* test_cli_window.c - the verbs window and map as a user meets them:
 * exit statuses, the report, the XML, CSV and SVG files parsed back, bad
 * usage and output that cannot be written.  The numbers are the
 * analyses' business (test_analyses_window); here the checks are
 * structural, and the help texts are golden (tests/golden/). */
#include "runbin.h"
#include "testkit.h"

#include <fcntl.h>
#include <libxml/parser.h>
#include <math.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

/* A small invented design that holds at its design point: a 3-level leg,
 * one part of each kind, a minimum drive of 9 V. */
static const char DESIGN[] =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<bootrung-design version=\"1\" name=\"window-test\">\n"
    "  <operating-point vin=\"400 V\" fsw=\"100 kHz\" duty=\"0.5\" dead-time=\"100 ns\"\n"
    "                   ambient=\"25 C\" current=\"both\" edge-time=\"20 ns\" overshoot=\"10 "
    "%\"/>\n"
    "  <supply voltage=\"12 V\" resistance=\"0.1 ohm\" ramp=\"100 us\"/>\n"
    "  <topology><fcml levels=\"3\"/></topology>\n"
    "  <parts>\n"
    "    <diode id=\"d1\" is=\"10 nA\" n=\"1.2\" rs=\"0.2 ohm\" ref-temp=\"25 C\" vrrm=\"600 "
    "V\"/>\n"
    "    <capacitor id=\"c1\" c=\"2.2 uF\" esr=\"10 mohm\" rating=\"25 V\"/>\n"
    "    <driver id=\"g1\" uvlo-rise=\"8 V\" uvlo-fall=\"7.3 V\" iq-run=\"1.6 mA\"\n"
    "            iq-uvlo=\"0.4 mA\" iq-isolator=\"1.2 mA\"/>\n"
    "    <switch id=\"s1\" rds-on=\"45 mohm\" qg=\"28 nC\" qg-at=\"10 V\" gate-pulse=\"30 ns\"\n"
    "            vsd=\"0.9 V\" vgs-rec=\"12 V\" vgs-max=\"20 V\"/>\n"
    "  </parts>\n"
    "  <stages diode=\"d1\" capacitor=\"c1\" driver=\"g1\" switch=\"s1\" link-resistor=\"2.2 "
    "ohm\"/>\n"
    "  <analysis min-drive=\"9 V\" max-startup=\"5 ms\"/>\n"
    "</bootrung-design>\n";

static int lines(const char *s)
{
    int n = 0;
    for (; *s; s++)
        n += *s == '\n';
    return n;
}

/* A temporary directory with the test design in it. */
typedef struct scratch {
    char dir[64];
    char design[128];
} scratch;

static void scratch_make(scratch *s)
{
    snprintf(s->dir, sizeof s->dir, "/tmp/br-win-XXXXXX");
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(s->dir));
    snprintf(s->design, sizeof s->design, "%s/design.xml", s->dir);
    FILE *f = fopen(s->design, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fputs(DESIGN, f);
    fclose(f);
}

static void scratch_path(const scratch *s, const char *name, char *buf, size_t cap)
{
    snprintf(buf, cap, "%s/%s", s->dir, name);
}

static void scratch_free(scratch *s)
{
    unlink(s->design);
    rmdir(s->dir);
}

/* ---- window ------------------------------------------------------------ */

static xmlNode *child(xmlNode *n, const char *name)
{
    for (n = n ? n->children : NULL; n; n = n->next)
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            return n;
    return NULL;
}

static int count_children(xmlNode *n, const char *name)
{
    int k = 0;
    for (n = n ? n->children : NULL; n; n = n->next)
        k += n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0;
    return k;
}

static int attr_is(xmlNode *n, const char *name, const char *want)
{
    xmlChar *v = n ? xmlGetProp(n, (const xmlChar *)name) : NULL;
    int ok = v && strcmp((const char *)v, want) == 0;
    xmlFree(v);
    return ok;
}

static double attr_num(xmlNode *n, const char *name)
{
    xmlChar *v = n ? xmlGetProp(n, (const xmlChar *)name) : NULL;
    double x = v ? strtod((const char *)v, NULL) : NAN;
    xmlFree(v);
    return x;
}

/* The report and the XML of a design that holds: limits on both axes,
 * a hold-up per direction, exit status 0. */
static void test_window_holds(void)
{
    scratch s;
    scratch_make(&s);
    char xml[160];
    scratch_path(&s, "window.xml", xml, sizeof xml);
    run_result r = run((const char *[]){"window", s.design, "--xml", xml, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "hold window of design window-test"));
    CU_ASSERT_TRUE(has(r.out, "design point: holds"));
    CU_ASSERT_TRUE(has(r.out, "duty at 100 kHz: holds from"));
    CU_ASSERT_TRUE(has(r.out, "frequency at duty 50.00 %: holds from"));
    CU_ASSERT_TRUE(has(r.out, "minimum drive, rail A"));
    CU_ASSERT_TRUE(has(r.out, "step-down"));
    CU_ASSERT_TRUE(has(r.out, "These circuits carry lethal voltages."));
    CU_ASSERT_STRING_EQUAL(r.err, "");
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    CU_ASSERT_STRING_EQUAL((const char *)root->name, "bootrung-window");
    CU_ASSERT_TRUE(attr_is(child(root, "design-point"), "holds", "true"));
    CU_ASSERT_EQUAL(count_children(root, "sweep"), 2);
    CU_ASSERT_EQUAL(count_children(root, "hold-up"), 2); /* current="both" */
    CU_ASSERT_PTR_NOT_NULL(child(root, "caution"));
    xmlNode *sw = child(root, "sweep");
    CU_ASSERT_TRUE(attr_is(sw, "axis", "duty"));
    xmlNode *lim = child(child(sw, "holds"), "limit");
    CU_ASSERT_TRUE(attr_is(lim, "kind", "found"));
    double in = attr_num(lim, "holds-at"), out = attr_num(lim, "fails-at");
    CU_ASSERT_TRUE(out < in && in - out <= 0.001 + 1e-12); /* the minimum, to 0.1 % of duty */
    CU_ASSERT_TRUE(attr_num(child(root, "hold-up"), "time-s") > 0);
    xmlFreeDoc(doc);
    unlink(xml);
    done(&r);
    scratch_free(&s);
}

/* The element under `parent` named name whose attribute attr is want. */
static xmlNode *child_with(xmlNode *parent, const char *name, const char *attr, const char *want)
{
    for (xmlNode *n = parent ? parent->children : NULL; n; n = n->next)
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0 &&
            attr_is(n, attr, want))
            return n;
    return NULL;
}

/* One end of the start-up window in the XML: the value found starting,
 * and beyond it (further from the design point) the one found failing. */
static void check_su_end(xmlNode *sw, const char *end, const char *suffix, double design)
{
    char in[32], out[32];
    snprintf(in, sizeof in, "starts-at%s", suffix);
    snprintf(out, sizeof out, "fails-at%s", suffix);
    xmlNode *lim = child_with(sw, "limit", "end", end);
    CU_ASSERT_PTR_NOT_NULL_FATAL(lim);
    CU_ASSERT_TRUE(attr_is(lim, "kind", "found"));
    double a = attr_num(lim, in), b = attr_num(lim, out);
    int max = strcmp(end, "max") == 0;
    CU_ASSERT_TRUE(max ? design < a && a < b : b < a && a < design);
}

/* --startup searches the start-up window both ways from the design point:
 * the test design stops starting at a low and at a high duty, and at a
 * low and a high frequency (a high frequency shortens the charging
 * windows against the dead time and raises the gate charge drawn each
 * second); the text and the XML give all four. */
static void test_window_startup(void)
{
    scratch s;
    scratch_make(&s);
    char xml[160];
    scratch_path(&s, "window.xml", xml, sizeof xml);
    run_result r = run((const char *[]){"window", "--startup", s.design, "--xml", xml, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "start-up window: the cold start completes within 5 ms"));
    CU_ASSERT_TRUE(has(r.out, "  lowest duty: "));
    CU_ASSERT_TRUE(has(r.out, "  highest duty: "));
    CU_ASSERT_TRUE(has(r.out, "  lowest switching frequency: "));
    CU_ASSERT_TRUE(has(r.out, "  highest switching frequency: "));
    CU_ASSERT_TRUE(has(r.out, "never starts for good)"));
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    xmlNode *root = xmlDocGetRootElement(doc);
    CU_ASSERT_EQUAL(count_children(root, "startup-window"), 2);
    xmlNode *duty = child_with(root, "startup-window", "axis", "duty");
    xmlNode *fsw = child_with(root, "startup-window", "axis", "frequency");
    CU_ASSERT_TRUE(attr_is(duty, "design-starts", "true"));
    check_su_end(duty, "min", "", 0.5);
    check_su_end(duty, "max", "", 0.5);
    check_su_end(fsw, "min", "-Hz", 100e3);
    check_su_end(fsw, "max", "-Hz", 100e3);
    CU_ASSERT_TRUE(attr_num(fsw, "to-Hz") > 100e3);
    xmlFreeDoc(doc);
    unlink(xml);
    done(&r);
    scratch_free(&s);
}

/* demo-3level asks for a 10 V minimum drive its top rail cannot give:
 * exit status 1, said plainly. */
static void test_window_fails(void)
{
    run_result r = run((const char *[]){"window", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(has(r.out, "design point: FAILS"));
    CU_ASSERT_TRUE(has(r.out, "NEVER holds in the range searched") ||
                   has(r.out, "FAILS at the design point"));
    done(&r);
}

static void test_window_bad(void)
{
    run_result r = run((const char *[]){"window", "no/such/design.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_EQUAL(lines(r.err), 1);
    CU_ASSERT_TRUE(has(r.err, "bootrung: no/such/design.xml"));
    done(&r);
    r = run((const char *[]){"window", "--fmin", "fast", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_EQUAL(lines(r.err), 1);
    CU_ASSERT_TRUE(has(r.err, "--fmin"));
    done(&r);
    /* a range that leaves the design frequency out */
    r = run((const char *[]){"window", "--fmin", "200k", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_TRUE(has(r.err, "fmin < fsw < fmax"));
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
    /* a top frequency above what the dead time allows is the option's
     * fault: by hand, two dead times of 100 ns fill the bottom on-time
     * (1 - 0.5) / f at f = 0.5 / 200 ns = 2.5 MHz */
    r = run((const char *[]){"window", "--fmax", "3M", "examples/demo-3level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_EQUAL(lines(r.err), 1);
    CU_ASSERT_TRUE(has(r.err, "bootrung: window: --fmax: "));
    CU_ASSERT_TRUE(has(r.err, "2.5e+06 Hz"));
    CU_ASSERT_PTR_NULL(strstr(r.err, "dead-time:"));
    CU_ASSERT_STRING_EQUAL(r.out, "");
    done(&r);
}

/* ---- map --------------------------------------------------------------- */

/* Fields of a CSV line (commas + 1). */
static int fields(const char *line)
{
    int n = 1;
    for (; *line && *line != '\n'; line++)
        n += *line == ',';
    return n;
}

static void test_map_files(void)
{
    scratch s;
    scratch_make(&s);
    char csv[160], svg[160];
    scratch_path(&s, "map.csv", csv, sizeof csv);
    scratch_path(&s, "map.svg", svg, sizeof svg);
    run_result r = run((const char *[]){"map", s.design, "--duty", "20%:80%:4", "--freq",
                                        "20k:500k:3", "--csv", csv, "--svg", svg, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "hold map of design window-test"));
    CU_ASSERT_TRUE(has(r.out, "12 points:"));
    CU_ASSERT_TRUE(has(r.out, "design point: holds"));
    CU_ASSERT_TRUE(has(r.out, "These circuits carry lethal voltages."));
    char *text = br_test_slurp(csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_EQUAL(
        strncmp(text, "duty,fsw_Hz,margin_V,holds,stage,switch,criterion,direction\n", 60), 0);
    CU_ASSERT_EQUAL(lines(text), 1 + 12);
    for (const char *p = text; *p; p = strchr(p, '\n') + 1)
        CU_ASSERT_EQUAL(fields(p), 8);
    CU_ASSERT_TRUE(has(text, "\n0.2,20000,"));
    CU_ASSERT_TRUE(has(text, "\n0.8,500000,"));
    free(text);
    xmlDoc *doc = xmlReadFile(svg, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    CU_ASSERT_STRING_EQUAL((const char *)xmlDocGetRootElement(doc)->name, "svg");
    xmlFreeDoc(doc);
    text = br_test_slurp(svg, NULL);
    CU_ASSERT_TRUE(has(text, ">design</text>"));
    CU_ASSERT_TRUE(has(text, ">duty</text>"));
    CU_ASSERT_TRUE(has(text, ">switching frequency</text>"));
    free(text);
    unlink(csv);
    unlink(svg);
    done(&r);
    scratch_free(&s);
}

/* The SVG can go to stdout in place of the summary. */
static void test_map_stdout(void)
{
    run_result r = run((const char *[]){"map", "examples/demo-3level.xml", "--duty", "0.5:0.5:1",
                                        "--freq", "100k:100k:1", "--svg", "-", NULL});
    CU_ASSERT_EQUAL(r.status, 1); /* demo-3level fails at its design point */
    CU_ASSERT_EQUAL(strncmp(r.out, "<?xml", 5), 0);
    CU_ASSERT_TRUE(has(r.out, "</svg>"));
    CU_ASSERT_FALSE(strstr(r.out, "hold map of") != NULL);
    done(&r);
}

static void expect_usage(const char *const *args, const char *what)
{
    run_result r = run(args);
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_EQUAL(lines(r.err), 1);
    CU_ASSERT_TRUE(has(r.err, what));
    done(&r);
}

static void test_map_bad(void)
{
    const char *f = "examples/demo-3level.xml";
    expect_usage((const char *[]){"map", f, "--freq", "10k:1M:3", NULL}, "--duty and --freq");
    expect_usage((const char *[]){"map", f, "--duty", "0.2:0.8", "--freq", "10k:1M:3", NULL},
                 "FROM:TO:N");
    expect_usage((const char *[]){"map", f, "--duty", "0.2:0.8:x", "--freq", "10k:1M:3", NULL},
                 "whole number");
    expect_usage((const char *[]){"map", f, "--duty", "0.8:0.2:3", "--freq", "10k:1M:3", NULL},
                 "--duty");
    expect_usage((const char *[]){"map", f, "--duty", "0.2:0.8:3", "--freq", "1M:10k:3", NULL},
                 "--freq");
    expect_usage((const char *[]){"map", f, "--duty", "0.2:0.8:3", "--freq", "10k:1M:3",
                                  "--threads", "0", NULL},
                 "--threads");
    expect_usage((const char *[]){"map", f, "--duty", "0.2:0.8:3", "--freq", "10k:1M:3", "--csv",
                                  "-", "--svg", "-", NULL},
                 "standard output");
}

/* An output that cannot be written: status 2, one line, nothing on
 * stdout (files are written before the summary). */
static void test_map_unwritable(void)
{
    run_result r =
        run((const char *[]){"map", "examples/demo-3level.xml", "--duty", "0.5:0.5:1", "--freq",
                             "100k:100k:1", "--csv", "/nonexistent-dir/map.csv", NULL});
    CU_ASSERT_EQUAL(r.status, 2);
    CU_ASSERT_STRING_EQUAL(r.out, "");
    CU_ASSERT_EQUAL(lines(r.err), 1);
    CU_ASSERT_TRUE(has(r.err, "/nonexistent-dir/map.csv"));
    done(&r);
}

static void test_help(void)
{
    run_result r = run((const char *[]){"window", "--help", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(same_as_golden("tests/golden/window-help.txt", r.out));
    done(&r);
    r = run((const char *[]){"help", "map", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(same_as_golden("tests/golden/map-help.txt", r.out));
    done(&r);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"window on a design that holds, with XML", test_window_holds},
        {"window on a design that fails", test_window_fails},
        {"window --startup: both ends of each axis", test_window_startup},
        {"window: bad input and usage", test_window_bad},
        {"map: summary, CSV and SVG", test_map_files},
        {"map: SVG to standard output", test_map_stdout},
        {"map: bad usage", test_map_bad},
        {"map: unwritable output", test_map_unwritable},
        {"help texts", test_help},
        {NULL, NULL},
    };
    /* paths in the tests are relative to the source tree */
    if (chdir(BR_SOURCE_DIR) != 0)
        return 2;
    return br_test_main("cli_window", cases);
}
