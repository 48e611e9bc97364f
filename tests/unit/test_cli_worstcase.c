/* test_cli_worstcase.c - corners, yield and pick as a user meets them:
 * exit statuses, the reports' rows, the XML and CSV files, the same
 * numbers whatever the thread count, bad input, and the help texts.
 * Figures move as the engine is tuned, so the checks are structural. */
#include "analyses/figures.h"
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

#define DEMO "examples/demo-3level.xml"
#define CLAMPED "tests/data/fcml5-clamped.xml" /* slow to settle, every corner passes */

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

/* The first element called name under n (depth first), or NULL. */
static xmlNode *find_element(xmlNode *n, const char *name)
{
    for (; n; n = n->next) {
        if (n->type == XML_ELEMENT_NODE && strcmp((const char *)n->name, name) == 0)
            return n;
        xmlNode *in = find_element(n->children, name);
        if (in)
            return in;
    }
    return NULL;
}

/* Attribute attr of the first element called name, as a number (NAN when
 * either is missing). */
static double xml_num(xmlDoc *doc, const char *name, const char *attr)
{
    xmlNode *n = find_element(xmlDocGetRootElement(doc), name);
    xmlChar *v = n ? xmlGetProp(n, BAD_CAST attr) : NULL;
    double x = v ? strtod((const char *)v, NULL) : NAN;
    xmlFree(v);
    return x;
}

/* Attribute attr of the first element called name is want. */
static int xml_is(xmlDoc *doc, const char *name, const char *attr, const char *want)
{
    xmlNode *n = find_element(xmlDocGetRootElement(doc), name);
    xmlChar *v = n ? xmlGetProp(n, BAD_CAST attr) : NULL;
    int same = v && strcmp((const char *)v, want) == 0;
    if (!same)
        fprintf(stderr, "<%s %s> is '%s', expected '%s'\n", name, attr, v ? (char *)v : "(none)",
                want);
    xmlFree(v);
    return same;
}

/* The line of text that starts with prefix (a static copy), or "". */
static const char *line_of(const char *text, const char *prefix)
{
    static char line[512];
    const char *at = strstr(text, prefix);
    line[0] = '\0';
    if (at) {
        size_t n = strcspn(at, "\n");
        snprintf(line, sizeof line, "%.*s", (int)(n < sizeof line ? n : sizeof line - 1), at);
    }
    return line;
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
        CU_ASSERT_TRUE(has(r.out, br_crit_title(c)));
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

/* The line of text that starts with prefix, copied into line (1 when found). */
static int line_starting(const char *text, const char *prefix, char *line, size_t cap)
{
    for (const char *p = text; p && *p;) {
        const char *nl = strchr(p, '\n');
        size_t n = nl ? (size_t)(nl - p) : strlen(p);
        if (strncmp(p, prefix, strlen(prefix)) == 0) {
            snprintf(line, cap, "%.*s", (int)n, p);
            return 1;
        }
        p = nl ? nl + 1 : NULL;
    }
    line[0] = '\0';
    return 0;
}

/* The demo with the first `from` in its text replaced by `to`, written to
 * path. */
static void write_demo(const char *path, const char *from, const char *to)
{
    char *src = br_test_slurp(DEMO, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(src);
    char *at = strstr(src, from);
    CU_ASSERT_PTR_NOT_NULL_FATAL(at);
    FILE *f = fopen(path, "w");
    CU_ASSERT_PTR_NOT_NULL_FATAL(f);
    fprintf(f, "%.*s%s%s", (int)(at - src), src, to, at + strlen(from));
    fclose(f);
    free(src);
}

/* The demo with <analysis max-dropouts="0">: every stage must start
 * without a hiccup.  corners (with its cold starts) and yield --startup
 * judge the dropouts row like the other start-up rows: it fails at the
 * worst corner and in every sample. */
static void test_dropouts_judged(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", path[64], row[200];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(path, sizeof path, "%s/d.xml", dir);
    write_demo(path, "<analysis ", "<analysis max-dropouts=\"0\" ");
    run_result r = run((const char *[]){"corners", path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(line_starting(r.out, "  start-up dropouts ", row, sizeof row));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " FAIL "));
    CU_ASSERT_TRUE(has(r.out, " stepped over along the"));
    done(&r);
    r = run((const char *[]){"yield", "--startup", "--samples", "4", path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(line_starting(r.out, "  start-up dropouts ", row, sizeof row));
    long fails = -1;
    CU_ASSERT_EQUAL(sscanf(row, " start-up dropouts %ld", &fails), 1);
    CU_ASSERT_EQUAL(fails, 4);
    /* its cold starts by envelope following: the report says how */
    CU_ASSERT_TRUE(has(r.out, " stepped over along the"));
    done(&r);
    /* every period integrated: the same verdict on every sample */
    r = run((const char *[]){"yield", "--startup", "--samples", "4", "--startup-method", "periods",
                             path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(line_starting(r.out, "  start-up dropouts ", row, sizeof row));
    CU_ASSERT_EQUAL(sscanf(row, " start-up dropouts %ld", &fails), 1);
    CU_ASSERT_EQUAL(fails, 4);
    CU_ASSERT_TRUE(has(r.out, ", every one integrated."));
    done(&r);
    r = run((const char *[]){"corners", "--startup-method", "periods", path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(line_starting(r.out, "  start-up dropouts ", row, sizeof row));
    CU_ASSERT_PTR_NOT_NULL(strstr(row, " FAIL "));
    CU_ASSERT_TRUE(has(r.out, " Their periods: "));
    CU_ASSERT_PTR_NULL(strstr(r.out, "stepped over"));
    done(&r);
    unlink(path);
    rmdir(dir);
}

/* The demo on an 8.8 V supply: its top rails never start.  yield --startup
 * counts every sample as failing the start-up, prints "never starts" in
 * place of margins it does not have (no NaN, no infinity), and leaves
 * the CSV cell empty. */
static void test_yield_never_starts(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", path[64], csv[64], row[200];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(path, sizeof path, "%s/d.xml", dir);
    snprintf(csv, sizeof csv, "%s/y.csv", dir);
    write_demo(path, "voltage=\"12 V +-5%\"", "voltage=\"8.8 V +-5%\"");
    run_result r =
        run((const char *[]){"yield", "--startup", "--samples", "3", "--csv", csv, path, NULL});
    CU_ASSERT_EQUAL(r.status, 1);
    CU_ASSERT_TRUE(line_starting(r.out, "  start-up time ", row, sizeof row));
    long fails = -1;
    CU_ASSERT_EQUAL(sscanf(row, " start-up time %ld", &fails), 1);
    CU_ASSERT_EQUAL(fails, 3);
    CU_ASSERT_PTR_NOT_NULL(strstr(row, "never starts"));
    CU_ASSERT_PTR_NULL(strstr(r.out, "nan"));
    CU_ASSERT_PTR_NULL(strstr(r.out, "inf "));
    done(&r);
    char *text = br_test_slurp(csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(text);
    CU_ASSERT_PTR_NULL(strstr(text, "inf"));
    CU_ASSERT_PTR_NULL(strstr(text, "nan"));
    /* sample 1: result fail, then the 3 parameters, then an empty start-up margin */
    const char *line = strchr(text, '\n');
    CU_ASSERT_PTR_NOT_NULL_FATAL(line);
    CU_ASSERT_TRUE(strncmp(line + 1, "1,fail,", 7) == 0);
    const char *cell = line + 1;
    for (int c = 0; c < 5 && cell; c++) {
        cell = strchr(cell, ',');
        cell = cell ? cell + 1 : NULL;
    }
    CU_ASSERT_PTR_NOT_NULL_FATAL(cell);
    CU_ASSERT_EQUAL(*cell, ',');
    free(text);
    unlink(csv);
    unlink(path);
    rmdir(dir);
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

/* A run depends on its inputs alone: pick on one thread or two gives the
 * same bytes (an option field left unset once made the one-thread run
 * start its steady states from the stack's leftovers). */
static void test_pick_threads(void)
{
    const char *cat = "examples/parts/catalog.xml";
    run_result a = run((const char *[]){"pick", "--catalog", cat, "--threads", "1", DEMO, NULL});
    run_result b = run((const char *[]){"pick", "--catalog", cat, "--threads", "2", DEMO, NULL});
    CU_ASSERT_EQUAL(a.status, b.status);
    CU_ASSERT_STRING_EQUAL(a.out, b.out);
    CU_ASSERT_TRUE(has(a.out, "as the only diode"));
    done(&a);
    done(&b);
}

/* The CSV file: a header and one row per sample; --min-yield judges the
 * lower confidence bound: the 7-level example passes in every sample, the
 * 3-level demo (its top rails short of the minimum drive stepping up at
 * 10 A) in none. */
static void test_yield_files(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", csv[64], xml[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(csv, sizeof csv, "%s/y.csv", dir);
    snprintf(xml, sizeof xml, "%s/y.xml", dir);
    run_result f =
        run((const char *[]){"yield", "--samples", "30", "--min-yield", "1%", DEMO, NULL});
    CU_ASSERT_EQUAL(f.status, 1);
    CU_ASSERT_TRUE(has(f.out, "is below the minimum 1 %"));
    done(&f);
    run_result r = run((const char *[]){"yield", "--samples", "30", "--min-yield", "1%", "--csv",
                                        csv, "--xml", xml, "examples/leg-7level.xml", NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "is at or above the minimum 1 %"));
    char *c = br_test_slurp(csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    CU_ASSERT_EQUAL(strncmp(c, "sample,result,\"operating-point: ambient\"", 40), 0);
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

/* ---- points the solver does not settle ---------------------------------------- */

/* A leg whose step-up steady state settles by a slow mode at the top of
 * its supply range: every corner really passes, and the search says so
 * (it used to call the unsettled corner a failure of every criterion,
 * with positive margins).  The steady state is a status: no margin. */
static void test_corners_settles(void)
{
    run_result r = run((const char *[]){"corners", "--no-startup", CLAMPED, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "verdict at the worst corners: PASS"));
    const char *st = line_of(r.out, "  periodic steady state ");
    CU_ASSERT_TRUE(has(st, "pass"));
    CU_ASSERT_FALSE(strstr(st, "V ") || strstr(st, "uV")); /* no figure shown as a margin */
    done(&r);
}

/* Held to one Newton iteration and one plain period the solver settles no
 * point: corners, yield and pick say undetermined (status 3) in every
 * output, never FAIL, and the nominal point that did not settle does not
 * stop them (no status 2). */
static void test_corners_undetermined(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", xml[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(xml, sizeof xml, "%s/c.xml", dir);
    run_result r = run((const char *[]){"corners", "--no-startup", "--solver-limit", "1", "--xml",
                                        xml, CLAMPED, NULL});
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "verdict at the worst corners: UNDETERMINED"));
    CU_ASSERT_TRUE(has(r.out, "not decided: at "));
    CU_ASSERT_TRUE(has(line_of(r.out, "  above UVLO falling "), "UNDETERMINED"));
    CU_ASSERT_FALSE(strstr(r.out, "FAIL") != NULL);
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    CU_ASSERT_TRUE(xml_is(doc, "worst", "result", "undetermined"));
    CU_ASSERT_TRUE(xml_num(doc, "method", "undetermined") > 0);
    CU_ASSERT_TRUE(xml_num(doc, "method", "undetermined") == xml_num(doc, "method", "points"));
    xmlFreeDoc(doc);
    unlink(xml);
    rmdir(dir);
    done(&r);
}

static void test_yield_undetermined(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", csv[64], xml[64], html[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(csv, sizeof csv, "%s/y.csv", dir);
    snprintf(xml, sizeof xml, "%s/y.xml", dir);
    snprintf(html, sizeof html, "%s/y.html", dir);
    run_result r = run((const char *[]){"yield", "--samples", "8", "--solver-limit", "1", "--csv",
                                        csv, "--xml", xml, "--report", html, CLAMPED, NULL});
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "0 of 8 samples pass, 0 fail, 8 undetermined"));
    CU_ASSERT_TRUE(has(r.out, "verdict: UNDETERMINED"));
    /* the steady state is a status: counted, never given quantiles */
    const char *st = line_of(r.out, "  periodic steady state ");
    CU_ASSERT_TRUE(has(st, " 0 ") && has(st, " 8 "));
    CU_ASSERT_FALSE(strstr(st, "V") != NULL);
    char *c = br_test_slurp(csv, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(c);
    CU_ASSERT_TRUE(has(c, "\n1,undetermined,"));
    CU_ASSERT_TRUE(has(c, ",steady-state,"));
    CU_ASSERT_FALSE(strstr(c, "margin_steady-state") != NULL);
    xmlDoc *doc = xmlReadFile(xml, NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    CU_ASSERT_TRUE(xml_is(doc, "yield", "result", "undetermined"));
    CU_ASSERT_TRUE(xml_num(doc, "yield", "undetermined") == 8);
    CU_ASSERT_TRUE(xml_num(doc, "yield", "fail") == 0);
    CU_ASSERT_TRUE(xml_num(doc, "yield", "upper") == 1);
    char *h = br_test_slurp(html, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(h);
    CU_ASSERT_TRUE(has(h, "badge undet"));
    CU_ASSERT_TRUE(has(h, "8 undetermined of 8"));
    for (const char *t[] = {r.out, c, h, NULL}, **p = t; *p; p++)
        CU_ASSERT_FALSE(strstr(*p, "nan") || strstr(*p, "NaN"));
    xmlFreeDoc(doc);
    free(c);
    free(h);
    unlink(csv);
    unlink(xml);
    unlink(html);
    rmdir(dir);
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
    CU_ASSERT_TRUE(has(r.out, "cap-2u2 (capacitor): as the only capacitor, on every rail: "
                              "fails drive"));
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

/* A design that loads but that the chain model refuses (a switching edge
 * longer than the shortest on-time) is reported before anything about the
 * catalog, whether the catalog reads or not: one line naming the design's
 * operating-point, status 2. */
static void test_pick_chain_first(void)
{
    char dir[] = "/tmp/br-wc-XXXXXX", design[64], cat[64], prefix[160];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(design, sizeof design, "%s/d.xml", dir);
    snprintf(cat, sizeof cat, "%s/c.xml", dir);
    /* 6 us > 4.8 us, the shortest on-time */
    write_demo(design, "edge-time=\"20 ns\"", "edge-time=\"6 us\"");
    write_file(cat, "<?xml version=\"1.0\"?>\n<bootrung-catalog version=\"1\">\n");
    snprintf(prefix, sizeof prefix, "bootrung: %s:22: operating-point: edge-time:", design);
    const char *const cats[] = {cat, "examples/parts/catalog.xml"};
    for (int i = 0; i < 2; i++) {
        run_result r = run((const char *[]){"pick", "--catalog", cats[i], design, NULL});
        CU_ASSERT_EQUAL(r.status, 2);
        one_line(&r, prefix);
        CU_ASSERT_STRING_EQUAL(r.out, "");
        done(&r);
    }
    unlink(design);
    unlink(cat);
    rmdir(dir);
}

/* The demo's passing choices against the example catalog have thin
 * margins (4.7 mV ranked first): the ranking now asks for a minimum
 * margin, states it, and names what sets each choice's margin. */
static void test_pick_min_margin(void)
{
    const char *cat = "examples/parts/catalog.xml";
    /* the demo fails its 10 V minimum drive under its load current; at
     * 7.5 V choices pass, so the ranking has something to rank */
    char dir[] = "/tmp/br-wc-XXXXXX", design[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(design, sizeof design, "%s/demo.xml", dir);
    write_demo(design, "min-drive=\"10 V\"", "min-drive=\"7.5 V\"");
    run_result r = run((const char *[]){"pick", "--catalog", cat, "--xml", "-", design, NULL});
    xmlDoc *doc = xmlReadMemory(r.out, (int)strlen(r.out), "pick.xml", NULL, XML_PARSE_NONET);
    CU_ASSERT_PTR_NOT_NULL_FATAL(doc);
    double min = xml_num(doc, "search", "min-margin-V");
    /* a quarter of the demo drivers' hysteresis, 8.0 V - 7.3 V */
    BR_ASSERT_NEAR(min, 0.25 * 0.7, 1e-9);
    int ranked = 0;
    for (xmlNode *n = find_element(xmlDocGetRootElement(doc), "choice"); n; n = n->next) {
        xmlChar *rank = xmlGetProp(n, BAD_CAST "rank"), *m = xmlGetProp(n, BAD_CAST "margin-V");
        if (rank)
            CU_ASSERT_TRUE(m && strtod((const char *)m, NULL) >= min);
        ranked += rank != NULL;
        xmlFree(rank);
        xmlFree(m);
    }
    CU_ASSERT_TRUE(ranked > 0);
    xmlFreeDoc(doc);
    done(&r);
    r = run((const char *[]){"pick", "--catalog", cat, "--min-margin", "20 mV", design, NULL});
    CU_ASSERT_EQUAL(r.status, 0);
    CU_ASSERT_TRUE(has(r.out, "minimum margin: 20 mV (--min-margin)"));
    const char *first = line_of(r.out, "   1  cost");
    CU_ASSERT_TRUE(has(first, ", set by "));
    const char *m = strstr(first, "margin ");
    CU_ASSERT_TRUE_FATAL(m != NULL);
    double v = strtod(m + 7, NULL);
    CU_ASSERT_TRUE(has(m, " mV") ? v >= 20.0 : v >= 0.02);
    done(&r);
    unlink(design);
    rmdir(dir);
}

/* The half-bridge of docs/design-file.md at 100 MHz with no dead time
 * (and 1 ns edges: the default 10 ns outlast the 5 ns on-time and are
 * refused at load): margins that once printed as NaN.  No NaN reaches the
 * report or the XML; a choice that could not be decided is shown as
 * such. */
static void test_pick_no_nan(void)
{
    static const char DESIGN[] =
        "<?xml version=\"1.0\"?>\n"
        "<bootrung-design version=\"1\" name=\"half-bridge\">\n"
        "  <operating-point vin=\"400 V\" fsw=\"100 MHz\" duty=\"0.5\" ambient=\"40 C\"\n"
        "                   edge-time=\"1 ns\"/>\n"
        "  <supply voltage=\"12 V +-5%\" resistance=\"0.2 ohm\"/>\n"
        "  <topology><fcml levels=\"2\"/></topology>\n"
        "  <parts>\n"
        "    <diode id=\"fast-600v\" is=\"100 nA\" n=\"1.5\" rs=\"0.5 ohm\" cj0=\"40 pF\"\n"
        "           qrr=\"30 nC\" if=\"1 A\" vrrm=\"600 V\"/>\n"
        "    <capacitor id=\"x7r-1u-25v\" c=\"1 uF +-10%\" esr=\"10 mohm\" rating=\"25 V\">\n"
        "      <bias v=\"0 V\" factor=\"1\"/><bias v=\"12 V\" factor=\"0.7\"/>\n"
        "      <bias v=\"25 V\" factor=\"0.45\"/>\n"
        "    </capacitor>\n"
        "    <driver id=\"driver-a\" uvlo-rise=\"7.5 V\" uvlo-fall=\"7.0 V\" iq-run=\"2 mA\"\n"
        "            iq-uvlo=\"0.2 mA\"/>\n"
        "    <switch id=\"sw-a\" qg=\"10 nC\" qg-at=\"12 V\" gate-pulse=\"20 ns\"/>\n"
        "  </parts>\n"
        "  <stages diode=\"fast-600v\" capacitor=\"x7r-1u-25v\" driver=\"driver-a\"\n"
        "          switch=\"sw-a\" link-resistor=\"1 ohm\"/>\n"
        "  <analysis min-drive=\"10 V\"/>\n"
        "</bootrung-design>\n";
    static const char CAT[] =
        "<?xml version=\"1.0\"?>\n"
        "<bootrung-catalog version=\"1\" name=\"small\">\n"
        "  <capacitor id=\"cap-2u2\" c=\"2.2 uF +-10%\" rating=\"25 V\" cost=\"0.02\" "
        "area-mm2=\"2\"/>\n"
        "  <capacitor id=\"cap-10u\" c=\"10 uF +-10%\" rating=\"25 V\" cost=\"0.04\" "
        "area-mm2=\"3\"/>\n"
        "  <diode id=\"d-600v\" is=\"1 nA\" n=\"1.8\" rs=\"0.25 ohm\" cj0=\"12 pF\" "
        "vrrm=\"600 V\" cost=\"0.05\" area-mm2=\"3\"/>\n"
        "</bootrung-catalog>\n";
    char dir[] = "/tmp/br-wc-XXXXXX", des[64], cat[64], xml[64];
    CU_ASSERT_PTR_NOT_NULL_FATAL(mkdtemp(dir));
    snprintf(des, sizeof des, "%s/hb.xml", dir);
    snprintf(cat, sizeof cat, "%s/c.xml", dir);
    snprintf(xml, sizeof xml, "%s/p.xml", dir);
    write_file(des, DESIGN);
    write_file(cat, CAT);
    run_result r =
        run((const char *[]){"pick", "--catalog", cat, "--no-startup", "--xml", xml, des, NULL});
    CU_ASSERT_TRUE(r.status == 1 || r.status == 3);
    CU_ASSERT_TRUE(has(r.out, r.status == 3 ? "verdict: UNDETERMINED" : "verdict: FAIL"));
    char *x = br_test_slurp(xml, NULL);
    CU_ASSERT_PTR_NOT_NULL_FATAL(x);
    for (const char *t[] = {r.out, x, NULL}, **p = t; *p; p++)
        CU_ASSERT_FALSE(strstr(*p, "nan") || strstr(*p, "NaN") || strstr(*p, "inf"));
    free(x);
    done(&r);
    /* held to one iteration, nothing settles: undetermined, status 3 */
    r = run((const char *[]){"pick", "--catalog", cat, "--no-startup", "--solver-limit", "1",
                             CLAMPED, NULL});
    CU_ASSERT_EQUAL(r.status, 3);
    CU_ASSERT_TRUE(has(r.out, "undetermined choices: "));
    CU_ASSERT_TRUE(has(r.out, "verdict: UNDETERMINED"));
    done(&r);
    unlink(des);
    unlink(cat);
    unlink(xml);
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
        {"yield", "--solver-limit", "0", DEMO, NULL},
        {"corners", "--solver-limit", "x", DEMO, NULL},
        {"pick", "--catalog", "examples/parts/catalog.xml", "--min-margin", "-1 V", DEMO, NULL},
        {"pick", "--catalog", "examples/parts/catalog.xml", "--min-margin", "3 A", DEMO, NULL},
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

static void test_help_golden(void)
{
    CU_ASSERT_TRUE(help_is_golden("corners"));
    CU_ASSERT_TRUE(help_is_golden("yield"));
    CU_ASSERT_TRUE(help_is_golden("pick"));
}

int main(void)
{
    static const br_test_case cases[] = {
        {"corners: the report", test_corners_report},
        {"corners: the XML document", test_corners_xml},
        {"corners and yield judge the start-up dropouts", test_dropouts_judged},
        {"yield: samples where a rail never starts", test_yield_never_starts},
        {"yield: same seed, 1 or 2 threads, same report", test_yield_threads},
        {"pick: 1 or 2 threads, same report", test_pick_threads},
        {"yield: CSV and XML files, --min-yield", test_yield_files},
        {"corners: a slow steady state settles", test_corners_settles},
        {"corners: unsettled points are undetermined", test_corners_undetermined},
        {"yield: unsettled samples are undetermined", test_yield_undetermined},
        {"pick: rejections, no passing choice, a broken catalog", test_pick},
        {"pick: a refused chain reported before the catalog", test_pick_chain_first},
        {"pick: a minimum margin", test_pick_min_margin},
        {"pick: no NaN, undetermined choices", test_pick_no_nan},
        {"bad input: status 2, one line", test_bad_input},
        {"help texts", test_help_golden},
        {NULL, NULL},
    };
    return br_test_main("cli_worstcase", cases);
}
